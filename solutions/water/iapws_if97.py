"""Water saturation line and compressed-liquid density from IAPWS-IF97.

Implements two pieces of IAPWS R7-97(2012), "Revised Release on the IAPWS
Industrial Formulation 1997 for the Thermodynamic Properties of Water and
Steam" (IAPWS, 2012; also W. Wagner et al., J. Eng. Gas Turbines Power 122,
150 (2000)):

* region 4, the saturation-pressure equation ``p_s(T)`` and its backward
  equation ``T_s(p)``;
* region 1, the specific Gibbs free energy of the liquid, from which the
  specific volume (and so the density) follows.

All functions take and return SI values (K, Pa, kg/m^3) and broadcast over
numpy arrays. Coefficients live in :mod:`solutions.water._if97_coefficients`.
"""
from __future__ import annotations

import numpy as np

from solutions.errors import OutOfRangeError
from solutions.water import _if97_coefficients as C

#: Validity of the region-4 equations [K]: 273.15 K to the critical point.
SATURATION_T_MIN = 273.15
SATURATION_T_MAX = C.T_CRIT
#: Validity of region 1 [K] (upper end: boundary with region 3).
REGION1_T_MIN = 273.15
REGION1_T_MAX = 623.15
#: Upper pressure limit of region 1 [Pa].
REGION1_P_MAX = 100.0e6


def _check_range(quantity: str, x: np.ndarray, low: float, high: float,
                 unit: str, detail: str = "") -> None:
    """Raise :class:`OutOfRangeError` for the first element of ``x`` outside [low, high].

    NaN is let through (it propagates to the result) so that masked data keep
    their shape; only real numbers outside the range are refused.
    """
    bad = (x < low) | (x > high)
    if np.any(bad):
        value = float(np.asarray(x)[bad].flat[0])
        raise OutOfRangeError(quantity, value, low, high, unit, detail)


def _as_result(y: np.ndarray, *inputs) -> float | np.ndarray:
    """Return a Python float when every input was a scalar, else the array."""
    if all(np.ndim(a) == 0 for a in inputs):
        return float(y)
    return y


def _psat_unchecked(T: np.ndarray) -> np.ndarray:
    n = C.REGION4_N
    theta = T / C.REGION4_T_STAR + n[8] / (T / C.REGION4_T_STAR - n[9])
    A = theta**2 + n[0] * theta + n[1]
    B = n[2] * theta**2 + n[3] * theta + n[4]
    Cc = n[5] * theta**2 + n[6] * theta + n[7]
    return C.REGION4_P_STAR * (2.0 * Cc / (-B + np.sqrt(B**2 - 4.0 * A * Cc)))**4


def saturation_pressure(T):
    """Vapor pressure of pure water (liquid-vapor saturation pressure).

    Parameters
    ----------
    T : float or array_like
        Temperature [K], 273.15 K <= T <= 647.096 K.

    Returns
    -------
    float or ndarray
        Saturation pressure p_s [Pa], same shape as ``T``.

    Equation
    --------
    IAPWS-IF97 region 4 saturation-pressure equation (R7-97(2012), Section 8.1)::

        theta = T/T* + n9 / (T/T* - n10)
        A = theta^2 + n1 theta + n2
        B = n3 theta^2 + n4 theta + n5
        C = n6 theta^2 + n7 theta + n8
        p_s / p* = [2C / (-B + (B^2 - 4AC)^0.5)]^4

    with T* = 1 K, p* = 1 MPa and n1..n10 from Table 34.

    Validity
    --------
    273.15 K to 647.096 K (the critical temperature). Outside that range an
    :class:`~solutions.errors.OutOfRangeError` is raised. Below 273.15 K use
    :func:`solutions.water.iapws_ice.supercooled_vapor_pressure`.

    References
    ----------
    IAPWS R7-97(2012), Eq. 30 and Table 34; check values Table 35.

    Examples
    --------
    IAPWS R7-97(2012) Table 35, check value at T = 300 K: p_s = 0.353658941e-2 MPa.

    >>> print(f"{saturation_pressure(300.0) / 1e6:.8e}")
    3.53658941e-03
    """
    T = np.asarray(T, dtype=float)
    _check_range("temperature", T, SATURATION_T_MIN, SATURATION_T_MAX, "K",
                 "IAPWS-IF97 saturation-pressure equation")
    return _as_result(_psat_unchecked(T), T)


def saturation_temperature(P):
    """Boiling temperature of pure water at pressure ``P`` (saturation temperature).

    Parameters
    ----------
    P : float or array_like
        Pressure [Pa], p_s(273.15 K) = 611.213 Pa <= P <= 22.064 MPa.

    Returns
    -------
    float or ndarray
        Saturation temperature T_s [K], same shape as ``P``.

    Equation
    --------
    IAPWS-IF97 region 4 backward equation (R7-97(2012), Section 8.2)::

        beta = (p/p*)^0.25
        E = beta^2 + n3 beta + n6
        F = n1 beta^2 + n4 beta + n7
        G = n2 beta^2 + n5 beta + n8
        D = 2G / (-F - (F^2 - 4EG)^0.5)
        T_s / T* = [n10 + D - ((n10 + D)^2 - 4(n9 + n10 D))^0.5] / 2

    It is the exact algebraic inverse of :func:`saturation_pressure`.

    Validity
    --------
    From the saturation pressure at 273.15 K (611.213 Pa) to the critical
    pressure 22.064 MPa; outside it an OutOfRangeError is raised.

    References
    ----------
    IAPWS R7-97(2012), Eq. 31 and Table 34; check values Table 36.

    Examples
    --------
    IAPWS R7-97(2012) Table 36, check value at p = 0.1 MPa: T_s = 0.372755919e3 K.

    >>> print(f"{saturation_temperature(0.1e6):.8e}")
    3.72755919e+02
    """
    P = np.asarray(P, dtype=float)
    p_min = float(_psat_unchecked(np.asarray(SATURATION_T_MIN)))
    _check_range("pressure", P, p_min, C.P_CRIT, "Pa",
                 "IAPWS-IF97 saturation-temperature equation")
    n = C.REGION4_N
    beta = (P / C.REGION4_P_STAR)**0.25
    E = beta**2 + n[2] * beta + n[5]
    F = n[0] * beta**2 + n[3] * beta + n[6]
    G = n[1] * beta**2 + n[4] * beta + n[7]
    D = 2.0 * G / (-F - np.sqrt(F**2 - 4.0 * E * G))
    T = C.REGION4_T_STAR * 0.5 * (n[9] + D - np.sqrt((n[9] + D)**2 - 4.0 * (n[8] + n[9] * D)))
    return _as_result(T, P)


def _region1_gamma_pi(T: np.ndarray, P: np.ndarray) -> np.ndarray:
    """d(gamma)/d(pi) of the region-1 Gibbs function at (T, P)."""
    pi = P / C.REGION1_P_STAR
    tau = C.REGION1_T_STAR / T
    # Coefficient axis last, so that any input shape broadcasts against the 34 terms.
    a = (7.1 - pi)[..., None]
    b = (tau - 1.222)[..., None]
    terms = -C.REGION1_N * C.REGION1_I * a**(C.REGION1_I - 1.0) * b**C.REGION1_J
    return terms.sum(axis=-1)


def specific_volume_liquid(T, P):
    """Specific volume of liquid water from the IF97 region-1 Gibbs function.

    Parameters
    ----------
    T : float or array_like
        Temperature [K], 273.15 K <= T <= 623.15 K.
    P : float or array_like
        Pressure [Pa], p_s(T) <= P <= 100 MPa (broadcast against ``T``).

    Returns
    -------
    float or ndarray
        Specific volume v [m^3/kg].

    Equation
    --------
    gamma(pi, tau) = sum_i n_i (7.1 - pi)^I_i (tau - 1.222)^J_i   (Eq. 7, Table 2)
    with pi = p / 16.53 MPa, tau = 1386 K / T, and

        v = (R T / p) * pi * d(gamma)/d(pi)

    where R = 0.461526 kJ/(kg K).

    Validity and references
    -----------------------
    IAPWS R7-97(2012), region 1: 273.15 K <= T <= 623.15 K and
    p_s(T) <= p <= 100 MPa; check values Table 5. Outside it an
    OutOfRangeError is raised (below p_s(T) the stable phase is vapor).

    Examples
    --------
    IAPWS R7-97(2012) Table 5, check value at T = 300 K, p = 3 MPa:
    v = 0.100215168e-2 m^3/kg.

    >>> print(f"{specific_volume_liquid(300.0, 3e6):.8e}")
    1.00215168e-03
    """
    T = np.asarray(T, dtype=float)
    P = np.asarray(P, dtype=float)
    _check_range("temperature", T, REGION1_T_MIN, REGION1_T_MAX, "K",
                 "IAPWS-IF97 region 1 (liquid)")
    _check_range("pressure", P, 0.0, REGION1_P_MAX, "Pa", "IAPWS-IF97 region 1 (liquid)")
    T, P = np.broadcast_arrays(T, P)
    psat = _psat_unchecked(T)
    below = P < psat
    if np.any(below):
        i = np.flatnonzero(below.ravel())[0]
        raise OutOfRangeError(
            "pressure", float(P.ravel()[i]), float(psat.ravel()[i]), REGION1_P_MAX, "Pa",
            f"water is vapor below its saturation pressure at T = {T.ravel()[i]:g} K "
            "(IAPWS-IF97 region 1 needs p >= p_s(T))")
    pi = P / C.REGION1_P_STAR
    v = C.R_SPECIFIC * T / P * pi * _region1_gamma_pi(T, P)
    return _as_result(v, T, P)


def liquid_density(T, P):
    """Density of liquid (compressed or saturated) water from IAPWS-IF97 region 1.

    Parameters
    ----------
    T : float or array_like
        Temperature [K], 273.15 K <= T <= 623.15 K.
    P : float or array_like
        Pressure [Pa], p_s(T) <= P <= 100 MPa (broadcast against ``T``).

    Returns
    -------
    float or ndarray
        Density rho = 1/v [kg/m^3], with v from :func:`specific_volume_liquid`.

    References
    ----------
    IAPWS R7-97(2012), region 1, Eq. 7 and Table 2.

    Examples
    --------
    The reciprocal of the IAPWS R7-97(2012) Table 5 check value at T = 300 K,
    p = 3 MPa (v = 0.100215168e-2 m^3/kg): 1/v = 997.853 kg/m^3.

    >>> print(f"{liquid_density(300.0, 3e6):.3f}")
    997.853
    """
    v = specific_volume_liquid(T, P)
    return 1.0 / v
