"""Physical constants, each once, with its source.

Exact values are the defining constants of the SI (BIPM, SI Brochure 9th ed., 2019; CODATA
2018 lists them as exact); the water constants are those of the IAPWS releases named.
Nothing else in the package retypes them.
"""
from __future__ import annotations

# --- exact (SI defining constants) -----------------------------------------------------
#: Boltzmann constant [J/K] (exact)
K_BOLTZMANN = 1.380649e-23
#: Avogadro constant [1/mol] (exact)
N_AVOGADRO = 6.02214076e23
#: molar gas constant R = N_A k [J/(mol K)] (exact)
R = K_BOLTZMANN * N_AVOGADRO
#: standard atmosphere [Pa] (exact by definition)
P_ATM = 101325.0
#: 0 °C in kelvin (exact by definition of the Celsius scale)
T_ZERO_C = 273.15

# --- water (IAPWS) ---------------------------------------------------------------------
#: molar mass of water [kg/mol] (IAPWS R6-95(2018), also used by IAPWS-IF97)
M_WATER_IAPWS = 0.018015268
#: triple point of water [K] and [Pa] (IAPWS R14-08(2011) and IAPWS-IF97 values)
T_TRIPLE = 273.16
P_TRIPLE = 611.657
#: critical point of water [K], [Pa], [kg/m³] (IAPWS R2-83(1992), R6-95(2018))
T_CRIT = 647.096
P_CRIT = 22.064e6
RHO_CRIT = 322.0
#: melting point of ice Ih at 101.325 kPa [K] (common practice: the ice point, 0 °C)
T_MELT = T_ZERO_C

#: molar volume of an ideal gas at 0 °C and 101.325 kPa [m³/mol] = R T0 / P0
V_MOLAR_STP = R * T_ZERO_C / P_ATM
