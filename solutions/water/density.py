"""Density of pure liquid water, including the supercooled range at normal pressure."""
from __future__ import annotations

import numpy as np

from solutions.errors import OutOfRangeError
from solutions.water.iapws_if97 import (
    REGION1_T_MAX,
    REGION1_T_MIN,
    _as_result,
    _check_range,
    liquid_density,
)

#: Lower temperature limit of the supercooled branch [K]: -34 degC, the lowest
#: temperature of the measurements the Hare & Sorensen (1987) fit represents
#: (the fit's coefficients were read from third-party copies; the original
#: paper was not seen). It agrees with IAPWS G12-15 within 1e-4 down to it.
SUPERCOOLED_T_MIN = 239.15
#: The supercooled fit is a 0.101325 MPa correlation; it is accepted for
#: P <= 0.2 MPa, where compression changes the density by < 5e-5 relative
#: (isothermal compressibility of cold water ~ 5e-10 1/Pa).
SUPERCOOLED_P_MAX = 0.2e6

#: Hare & Sorensen (1987) polynomial, rho [kg/m^3] = sum_k c_k t^k, t in degC
#: (their coefficients in g/cm^3 multiplied by 1000).
_HS_COEFFS = np.array([999.86, 6.690e-2, -8.486e-3, 1.518e-4,
                       -6.9484e-6, -3.6449e-7, -7.497e-9])


def _supercooled_density(T: np.ndarray) -> np.ndarray:
    t = T - 273.15
    return np.polynomial.polynomial.polyval(t, _HS_COEFFS)


def water_density(T, P=101325.0):
    """Density of pure liquid water.

    Parameters
    ----------
    T : float or array_like
        Temperature [K], 239.15 K <= T <= 623.15 K.
    P : float or array_like, optional
        Pressure [Pa], default 101325 Pa (broadcast against ``T``).
        For T >= 273.15 K: p_s(T) <= P <= 100 MPa.
        For T < 273.15 K: 0 < P <= 0.2 MPa (pressure dependence neglected).

    Returns
    -------
    float or ndarray
        Density [kg/m^3].

    Equation
    --------
    * T >= 273.15 K: IAPWS-IF97 region 1, rho = 1 / v(T, P)
      (:func:`solutions.water.iapws_if97.liquid_density`).
    * 239.15 K <= T < 273.15 K (supercooled liquid, metastable):
      Hare & Sorensen (1987) fit at atmospheric pressure,
      rho/(g cm^-3) = 0.99986 + 6.690e-5 t - 8.486e-6 t^2 + 1.518e-7 t^3
                      - 6.9484e-9 t^4 - 3.6449e-10 t^5 - 7.497e-12 t^6,
      t = T/K - 273.15. The two branches meet at 273.15 K within 0.02 kg/m^3.

    Validity
    --------
    Outside the ranges above an OutOfRangeError is raised; nothing is
    extrapolated. Below 273.15 K the liquid is metastable with respect to ice.

    References
    ----------
    IAPWS R7-97(2012), region 1. D. E. Hare and C. M. Sorensen, "The density
    of supercooled water. II. Bulk samples cooled to the homogeneous
    nucleation limit", J. Chem. Phys. 87, 4840-4845 (1987).

    Examples
    --------
    IAPWS-95 (R6-95(2018), as computed by the iapws package): 998.207 kg/m^3 at
    20 degC and 101.325 kPa; IF97 region 1 agrees to 0.001 kg/m^3.

    >>> print(f"{water_density(293.15):.2f}")
    998.21
    """
    T = np.asarray(T, dtype=float)
    P = np.asarray(P, dtype=float)
    _check_range("temperature", T, SUPERCOOLED_T_MIN, REGION1_T_MAX, "K",
                 "water density: IAPWS-IF97 region 1 above 273.15 K, "
                 "Hare & Sorensen (1987) supercooled fit from 239.15 K")
    Tb, Pb = np.broadcast_arrays(T, P)
    cold = Tb < REGION1_T_MIN
    rho = np.empty(Tb.shape, dtype=float)
    if np.any(cold):
        _check_range("pressure", Pb[cold], 0.0, SUPERCOOLED_P_MAX, "Pa",
                     "supercooled-water density fit (Hare & Sorensen 1987) is for "
                     "atmospheric pressure")
        if np.any(Pb[cold] <= 0.0):
            raise OutOfRangeError("pressure", float(Pb[cold][Pb[cold] <= 0.0][0]), 0.0,
                                  SUPERCOOLED_P_MAX, "Pa", "pressure must be positive")
        rho[cold] = _supercooled_density(Tb[cold])
    warm = ~cold
    if np.any(warm):
        rho[warm] = liquid_density(Tb[warm], Pb[warm])
    return _as_result(rho, T, P)
