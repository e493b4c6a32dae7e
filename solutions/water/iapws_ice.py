"""Ice Ih / supercooled-water equilibria: sublimation and vapor pressures, ice activity.

The water activity of an aqueous solution that is in equilibrium with ice at
temperature T equals the ratio of the vapor pressure of ice to that of pure
(supercooled) liquid water at the same T (Koop, Luo, Tsias & Peter, Nature
406, 611 (2000), who use this ratio): at the freezing point of a solution,
mu_w(solution) = mu_ice, so

    a_w = p_ice(T) / p_liq(T).

Two independent routes are given:

* :func:`ice_water_activity` divides the IAPWS R14-08(2011) sublimation
  pressure by the Murphy & Koop (2005) supercooled-liquid vapor pressure;
* :func:`ice_water_activity_thermo` integrates the Gibbs-Helmholtz equation
  with a temperature-dependent enthalpy of fusion.

References
----------
IAPWS R14-08(2011), "Revised Release on the Pressure along the Melting and
Sublimation Curves of Ordinary Water Substance"; W. Wagner, T. Riethmann,
R. Feistel and A. H. Harvey, J. Phys. Chem. Ref. Data 40, 043103 (2011).

D. M. Murphy and T. Koop, "Review of the vapour pressures of ice and
supercooled water for atmospheric applications", Q. J. R. Meteorol. Soc. 131,
1539-1565 (2005), doi:10.1256/qj.04.94.
"""
from __future__ import annotations

import numpy as np

from solutions.constants import P_TRIPLE, R as R_MOLAR, T_MELT, T_TRIPLE
from solutions.water.iapws_if97 import _as_result, _check_range

# --- IAPWS R14-08(2011), sublimation-pressure equation of ice Ih ---------------
#: Triple point used as reducing point [K], [Pa].
_T_T = T_TRIPLE
_P_T = P_TRIPLE
#: Coefficients a_i and exponents b_i of the sublimation-pressure equation.
_SUBL_A = np.array([-0.212144006e2, 0.273203819e2, -0.610598130e1])
_SUBL_B = np.array([0.333333333e-2, 0.120666667e1, 0.170333333e1])
_LN_T_T = float(np.log(_T_T))
_LN_P_T = float(np.log(_P_T))
SUBLIMATION_T_MIN = 50.0
SUBLIMATION_T_MAX = 273.16

# --- Murphy & Koop (2005), supercooled liquid, Eq. (10) --------------------------
SUPERCOOLED_T_MIN = 123.0
SUPERCOOLED_T_MAX = 332.0

# --- Thermodynamic route ----------------------------------------------------------
#: Lower end of the thermodynamic route [K]: the validity limit of Murphy &
#: Koop's enthalpy of vaporization of supercooled water, Eq. (9) (236 K as
#: recalled from the paper, not re-read; the equation itself was checked).
THERMO_T_MIN = 236.0
THERMO_T_MAX = T_MELT
# Gauss-Legendre nodes on [-1, 1]; the integrand is smooth over < 40 K, so 24
# nodes integrate it to rounding error.
_GL_X, _GL_W = np.polynomial.legendre.leggauss(24)


def sublimation_pressure(T):
    """Vapor pressure of ice Ih (sublimation pressure), IAPWS R14-08(2011).

    Parameters
    ----------
    T : float or array_like
        Temperature [K], 50 K <= T <= 273.16 K.

    Returns
    -------
    float or ndarray
        Sublimation pressure p_subl [Pa].

    Equation
    --------
    ln(p_subl / p_t) = theta^-1 * sum_{i=1..3} a_i theta^b_i,   theta = T / T_t

    with T_t = 273.16 K, p_t = 611.657 Pa and
    a = (-21.2144006, 27.3203819, -6.10598130),
    b = (0.00333333333, 1.20666667, 1.70333333).

    Validity
    --------
    50 K to 273.16 K (the triple point), else OutOfRangeError.

    References
    ----------
    IAPWS R14-08(2011), sublimation-pressure equation; Wagner et al.,
    J. Phys. Chem. Ref. Data 40, 043103 (2011).

    Examples
    --------
    At the triple point the equation returns p_t = 611.657 Pa (IAPWS R14-08(2011));
    at 230 K, 8.94735e-6 MPa (the R14-08 check value, from memory; the iapws package
    gives the same six digits).

    >>> print(f"{sublimation_pressure(273.16):.3f}")
    611.657
    >>> print(f"{sublimation_pressure(230.0) / 1e6:.5e}")
    8.94735e-06
    """
    T = np.asarray(T, dtype=float)
    _check_range("temperature", T, SUBLIMATION_T_MIN, SUBLIMATION_T_MAX, "K",
                 "IAPWS R14-08 sublimation-pressure equation of ice Ih")
    return _as_result(_P_T * np.exp(_ln_sublimation_ratio(T, np.log(T))), T)


def _ln_sublimation_ratio(T: np.ndarray, lnT: np.ndarray) -> np.ndarray:
    """ln(p_subl / p_t) of IAPWS R14-08, θ⁻¹ Σ a_i θ^b_i with θ^b = exp(b ln θ) (one
    logarithm, shared with the liquid's equation, instead of three powers)."""
    ln_theta = lnT - _LN_T_T
    s = _SUBL_A[0] * np.exp(_SUBL_B[0] * ln_theta)
    for a, b in zip(_SUBL_A[1:], _SUBL_B[1:]):
        s += a * np.exp(b * ln_theta)
    s *= _T_T
    s /= T
    return s


def supercooled_vapor_pressure(T):
    """Vapor pressure of (supercooled) liquid water, Murphy & Koop (2005) Eq. (10).

    Parameters
    ----------
    T : float or array_like
        Temperature [K], 123 K < T < 332 K (bounds accepted).

    Returns
    -------
    float or ndarray
        Vapor pressure of pure liquid water p_liq [Pa].

    Equation
    --------
    ln(p_liq/Pa) = 54.842763 - 6763.22/T - 4.210 ln T + 0.000367 T
                   + tanh(0.0415 (T - 218.8))
                     * (53.878 - 1331.22/T - 9.44523 ln T + 0.014025 T)

    Validity
    --------
    123-332 K as stated by the authors. Above 273.15 K prefer the IAPWS-IF97
    saturation pressure (:func:`solutions.water.saturation_pressure`); this
    equation exists for the supercooled range where IF97 is not defined.

    References
    ----------
    Murphy & Koop, Q. J. R. Meteorol. Soc. 131, 1539 (2005), Eq. (10).

    Examples
    --------
    Common practice (and the tests): supercooled water at -10 degC has a vapor
    pressure of 0.286 kPa.

    >>> print(f"{supercooled_vapor_pressure(263.15) / 1e3:.3f}")
    0.286
    """
    T = np.asarray(T, dtype=float)
    _check_range("temperature", T, SUPERCOOLED_T_MIN, SUPERCOOLED_T_MAX, "K",
                 "Murphy & Koop (2005) supercooled-water vapor pressure")
    return _as_result(np.exp(_ln_supercooled_vapor_pressure(T, np.log(T))), T)


def _ln_supercooled_vapor_pressure(T: np.ndarray, lnT: np.ndarray) -> np.ndarray:
    """ln(p_liq / Pa) of Murphy & Koop (2005) Eq. (10), given ln T; tanh y is taken as
    1 − 2/(e^(2y) + 1) (one exponential instead of tanh's cost; equal to rounding)."""
    th = 1.0 - 2.0 / (np.exp(0.083 * (T - 218.8)) + 1.0)
    return (54.842763 - 6763.22 / T - 4.210 * lnT + 0.000367 * T
            + th * (53.878 - 1331.22 / T - 9.44523 * lnT + 0.014025 * T))


def ice_water_activity(T):
    """Water activity of a solution in equilibrium with ice Ih at temperature T.

    Parameters
    ----------
    T : float or array_like
        Temperature [K], 123 K <= T <= 273.16 K.

    Returns
    -------
    float or ndarray
        a_w^ice = p_subl(T) / p_liq(T) [-].

    Equation
    --------
    a_w = p_subl(T) / p_liq(T), with p_subl from :func:`sublimation_pressure`
    (IAPWS R14-08) and p_liq from :func:`supercooled_vapor_pressure`
    (Murphy & Koop 2005, Eq. 10). The ratio refers each phase to its own
    saturation pressure, so a_w = 1 at the triple point 273.16 K (not at
    273.15 K, where it is 0.99990).

    Validity
    --------
    123 K (lower limit of Eq. 10) to 273.16 K.

    References
    ----------
    Koop et al., Nature 406, 611 (2000); IAPWS R14-08(2011); Murphy & Koop (2005).

    Examples
    --------
    Water activity of ice at -10 degC: 0.907 (tables of a_w at subfreezing
    temperatures, e.g. Fennema's Food Chemistry; from memory), the ratio of the
    common-practice vapor pressures of ice and supercooled water, 0.260/0.286 kPa.
    At the triple point it is 1.

    >>> print(f"{ice_water_activity(263.15):.3f}")
    0.907
    >>> print(f"{ice_water_activity(273.16):.6f}")
    1.000000
    """
    T = np.asarray(T, dtype=float)
    _check_range("temperature", T, SUPERCOOLED_T_MIN, SUBLIMATION_T_MAX, "K",
                 "ice-equilibrium water activity (sublimation / liquid vapor pressure)")
    return _as_result(np.asarray(sublimation_pressure(T)) / np.asarray(supercooled_vapor_pressure(T)), T)


def ln_ice_water_activity(T):
    """Natural logarithm of :func:`ice_water_activity`, in log form.

    Parameters
    ----------
    T : float or array_like
        Temperature [K], 123 K <= T <= 273.16 K.

    Returns
    -------
    float or ndarray
        ln a_w^ice = ln(p_subl / p_t) + ln(p_t / Pa) − ln(p_liq / Pa) [-].

    Equation
    --------
    The two published equations are logarithmic (IAPWS R14-08 gives ln(p_subl/p_t),
    Murphy & Koop Eq. 10 gives ln p_liq), so their difference is taken directly, with one
    ln T shared by both, instead of exponentiating each and taking the logarithm of the
    ratio; the same value to rounding (about 1e-14) at a third of the cost. This is the
    form the freezing-point solve evaluates.

    Validity, references
    --------------------
    As :func:`ice_water_activity`.

    Examples
    --------
    At −10 °C, ln 0.907 (from memory, see :func:`ice_water_activity`):

    >>> print(f"{np.exp(ln_ice_water_activity(263.15)):.3f}")
    0.907
    """
    T = np.asarray(T, dtype=float)
    _check_range("temperature", T, SUPERCOOLED_T_MIN, SUBLIMATION_T_MAX, "K",
                 "ice-equilibrium water activity (sublimation / liquid vapor pressure)")
    lnT = np.log(T)
    out = _ln_sublimation_ratio(T, lnT)
    out += _LN_P_T
    out -= _ln_supercooled_vapor_pressure(T, lnT)
    return _as_result(out, T)


def enthalpy_of_sublimation(T):
    """Molar enthalpy of sublimation of ice Ih, Murphy & Koop (2005) Eq. (5).

    Parameters
    ----------
    T : float or array_like
        Temperature [K], T > 30 K.

    Returns
    -------
    float or ndarray
        L_sub [J/mol] = 46782.5 + 35.8925 T - 0.07414 T^2 + 541.5 exp(-(T/123.75)^2).
    """
    T = np.asarray(T, dtype=float)
    _check_range("temperature", T, 30.0, 273.16, "K",
                 "Murphy & Koop (2005) enthalpy of sublimation of ice")
    return _as_result(46782.5 + 35.8925 * T - 0.07414 * T**2
                      + 541.5 * np.exp(-(T / 123.75)**2), T)


def enthalpy_of_vaporization_supercooled(T):
    """Molar enthalpy of vaporization of supercooled water, Murphy & Koop (2005) Eq. (9).

    Parameters
    ----------
    T : float or array_like
        Temperature [K], 236 K <= T <= 273.16 K.

    Returns
    -------
    float or ndarray
        L_vap [J/mol] = 56579 - 42.212 T + exp(0.1149 (281.6 - T)).
    """
    T = np.asarray(T, dtype=float)
    _check_range("temperature", T, THERMO_T_MIN, 273.16, "K",
                 "Murphy & Koop (2005) enthalpy of vaporization of supercooled water")
    return _as_result(56579.0 - 42.212 * T + np.exp(0.1149 * (281.6 - T)), T)


def _dh_fus(T: np.ndarray) -> np.ndarray:
    return ((46782.5 + 35.8925 * T - 0.07414 * T**2 + 541.5 * np.exp(-(T / 123.75)**2))
            - (56579.0 - 42.212 * T + np.exp(0.1149 * (281.6 - T))))


def enthalpy_of_fusion(T):
    """Molar enthalpy of fusion of ice Ih into (supercooled) liquid water.

    Parameters
    ----------
    T : float or array_like
        Temperature [K], 236 K <= T <= 273.16 K.

    Returns
    -------
    float or ndarray
        Delta_fus H(T) [J/mol] = L_sub(T) - L_vap(T) (Murphy & Koop 2005,
        Eqs. 5 and 9). It is 6007.6 J/mol at 273.15 K; its slope is the heat
        capacity difference Delta_Cp = Cp(liquid) - Cp(ice), which grows as the
        liquid is supercooled (about 38 J/(mol K) at 273 K).

    Examples
    --------
    Handbook enthalpy of fusion of ice at 0 degC: 6.01 kJ/mol (CRC Handbook,
    from memory; IAPWS-95 with R10-06 gives 6007-6010 J/mol).

    >>> print(f"{enthalpy_of_fusion(273.15) / 1e3:.2f}")
    6.01
    """
    T = np.asarray(T, dtype=float)
    _check_range("temperature", T, THERMO_T_MIN, 273.16, "K",
                 "enthalpy of fusion from Murphy & Koop (2005) Eqs. 5 and 9")
    return _as_result(_dh_fus(T), T)


def ice_water_activity_thermo(T):
    """Ice-equilibrium water activity from the enthalpy of fusion (Gibbs-Helmholtz).

    Parameters
    ----------
    T : float or array_like
        Temperature [K], 236 K <= T <= 273.15 K.

    Returns
    -------
    float or ndarray
        a_w^ice [-] at 101.325 kPa.

    Equation
    --------
    With Delta_fus G(T_m) = 0 at T_m = 273.15 K and d(DeltaG/T)/dT = -DeltaH/T^2,

        ln a_w(T) = -Delta_fus G(T) / (R T)
                  = -(1/R) * integral_T^T_m Delta_fus H(T') / T'^2 dT'

    where Delta_fus H(T) = L_sub(T) - L_vap(T) from Murphy & Koop (2005) Eqs. (5)
    and (9) carries the temperature dependence (Delta_Cp) of the enthalpy of
    fusion; the integral is evaluated by 24-point Gauss-Legendre quadrature.
    Referring to T_m = 273.15 K makes this the activity at normal pressure; the
    vapor-pressure ratio :func:`ice_water_activity` refers to the triple point
    instead, and the two differ by about 1e-4 in ln a_w near 273 K.

    Validity
    --------
    236 K (validity limit of Murphy & Koop Eq. 9) to 273.15 K; else
    OutOfRangeError. Within it this agrees with :func:`ice_water_activity` to
    better than 1e-3 in ln a_w.

    References
    ----------
    Murphy & Koop, Q. J. R. Meteorol. Soc. 131, 1539 (2005), Eqs. (5), (9);
    Koop et al., Nature 406, 611 (2000).

    Examples
    --------
    The same -10 degC value, 0.907 (from memory, see :func:`ice_water_activity`),
    by the enthalpy-of-fusion route.

    >>> print(f"{ice_water_activity_thermo(263.15):.3f}")
    0.907
    """
    T = np.asarray(T, dtype=float)
    _check_range("temperature", T, THERMO_T_MIN, THERMO_T_MAX, "K",
                 "ice activity from the enthalpy of fusion")
    half = 0.5 * (T_MELT - T)
    nodes = half[..., None] * _GL_X + (0.5 * (T_MELT + T))[..., None]
    integral = (half[..., None] * _GL_W * _dh_fus(nodes) / nodes**2).sum(axis=-1)
    return _as_result(np.exp(-integral / R_MOLAR), T)
