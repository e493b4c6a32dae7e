"""Coefficients of IAPWS-IF97 used by :mod:`solutions.water.iapws_if97`.

Source: IAPWS R7-97(2012), "Revised Release on the IAPWS Industrial
Formulation 1997 for the Thermodynamic Properties of Water and Steam".
Table numbers below are those of the release. The verification values of
Tables 5, 35 and 36 are reproduced to the release's digits by
``tests/test_water.py``, which would fail on a mistyped coefficient.
"""
from __future__ import annotations

import numpy as np

# --- Constants as the release gives them ------------------------------------
#: Specific gas constant of ordinary water as IF97 specifies it [J/(kg K)]
#: (R = 0.461526 kJ/(kg K)).
R_SPECIFIC = 461.526
#: Critical temperature [K].
T_CRIT = 647.096
#: Critical pressure [Pa] (22.064 MPa).
P_CRIT = 22.064e6
#: Triple-point temperature [K] and pressure [Pa] (273.16 K, 611.657 Pa).
T_TRIPLE = 273.16
P_TRIPLE = 611.657

# --- Region 1: dimensionless Gibbs free energy, Eq. 7 ------------------------
#: Reducing pressure p* [Pa] and temperature T* [K] of Eq. 7.
REGION1_P_STAR = 16.53e6
REGION1_T_STAR = 1386.0

#: Table 2: exponents I_i, J_i and coefficients n_i, i = 1..34.
REGION1_I = np.array([
    0, 0, 0, 0, 0, 0, 0, 0,
    1, 1, 1, 1, 1, 1,
    2, 2, 2, 2, 2,
    3, 3, 3,
    4, 4, 4,
    5,
    8, 8,
    21, 23, 29, 30, 31, 32,
], dtype=float)

REGION1_J = np.array([
    -2, -1, 0, 1, 2, 3, 4, 5,
    -9, -7, -1, 0, 1, 3,
    -3, 0, 1, 3, 17,
    -4, 0, 6,
    -5, -2, 10,
    -8,
    -11, -6,
    -29, -31, -38, -39, -40, -41,
], dtype=float)

REGION1_N = np.array([
    0.14632971213167e0,
    -0.84548187169114e0,
    -0.37563603672040e1,
    0.33855169168385e1,
    -0.95791963387872e0,
    0.15772038513228e0,
    -0.16616417199501e-1,
    0.81214629983568e-3,
    0.28319080123804e-3,
    -0.60706301565874e-3,
    -0.18990068218419e-1,
    -0.32529748770505e-1,
    -0.21841717175414e-1,
    -0.52838357969930e-4,
    -0.47184321073267e-3,
    -0.30001780793026e-3,
    0.47661393906987e-4,
    -0.44141845330846e-5,
    -0.72694996297594e-15,
    -0.31679644845054e-4,
    -0.28270797985312e-5,
    -0.85205128120103e-9,
    -0.22425281908000e-5,
    -0.65171222895601e-6,
    -0.14341729937924e-12,
    -0.40516996860117e-6,
    -0.12734301741641e-8,
    -0.17424871230634e-9,
    -0.68762131295531e-18,
    0.14478307828521e-19,
    0.26335781662795e-22,
    -0.11947622640071e-22,
    0.18228094581404e-23,
    -0.93537087292458e-25,
])

# --- Region 4: saturation line (Section 8 of the release) -------------------
#: Table 34: coefficients n_1..n_10 of the saturation equation, used by both the
#: saturation-pressure equation p_s(T) and the backward equation T_s(p).
REGION4_N = np.array([
    0.11670521452767e4,
    -0.72421316703206e6,
    -0.17073846940092e2,
    0.12020824702470e5,
    -0.32325550322333e7,
    0.14915108613530e2,
    -0.48232657361591e4,
    0.40511340542057e6,
    -0.23855557567849e0,
    0.65017534844798e3,
])
#: Reducing quantities of the region-4 equations: p* = 1 MPa, T* = 1 K.
REGION4_P_STAR = 1.0e6
REGION4_T_STAR = 1.0

assert REGION1_I.shape == REGION1_J.shape == REGION1_N.shape == (34,)
assert REGION4_N.shape == (10,)
