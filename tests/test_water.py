"""Tests of solutions.water: IAPWS-IF97, ice equilibria, water density.

Published check values are asserted at the digits of their source. The
``iapws`` package (IAPWS-95, IAPWS-IF97, IAPWS R10-06, IAPWS G12-15) is used
here only as an outside check; the implementation never imports it.
"""
import numpy as np
import pytest

from solutions.errors import OutOfRangeError
from solutions.water import (
    enthalpy_of_fusion,
    ice_water_activity,
    ice_water_activity_thermo,
    liquid_density,
    ln_ice_water_activity,
    saturation_pressure,
    saturation_temperature,
    specific_volume_liquid,
    sublimation_pressure,
    supercooled_vapor_pressure,
    water_density,
)



@pytest.fixture(scope="module")
def iapws_ref():
    """The iapws package, an outside reference used only in the checks that ask for it. Only
    those skip where it is missing; the published verification tables always run."""
    pytest.importorskip("iapws")
    from types import SimpleNamespace

    from iapws._iapws import _Ice, _Sublimation_Pressure, _Supercooled
    from iapws.iapws95 import IAPWS95
    return SimpleNamespace(IAPWS95=IAPWS95, _Ice=_Ice, _Supercooled=_Supercooled,
                           _Sublimation_Pressure=_Sublimation_Pressure)

MOLAR_MASS_WATER = 0.018015268  # kg/mol, IAPWS-95


def _digits9(x: float) -> float:
    """x rounded to 9 significant digits, the precision of the IF97 check tables."""
    return float(f"{x:.8e}")


# --------------------------------------------------------------------------
# IAPWS-IF97 verification tables
# --------------------------------------------------------------------------

@pytest.mark.parametrize("T, p_MPa", [
    (300.0, 0.353658941e-2),
    (500.0, 0.263889776e1),
    (600.0, 0.123443146e2),
])
def test_if97_table35_saturation_pressure(T, p_MPa):
    """IAPWS R7-97(2012) Table 35: p_s [MPa] at 300, 500, 600 K, to its 9 significant digits."""
    assert _digits9(saturation_pressure(T) / 1e6) == p_MPa


@pytest.mark.parametrize("p_MPa, T", [
    (0.1, 0.372755919e3),
    (1.0, 0.453035632e3),
    (10.0, 0.584149488e3),
])
def test_if97_table36_saturation_temperature(p_MPa, T):
    """IAPWS R7-97(2012) Table 36: T_s [K] at 0.1, 1, 10 MPa, to its 9 significant digits."""
    assert _digits9(saturation_temperature(p_MPa * 1e6)) == T


@pytest.mark.parametrize("T, p_MPa, v", [
    (300.0, 3.0, 0.100215168e-2),
    (300.0, 80.0, 0.971180894e-3),
    (500.0, 3.0, 0.120241800e-2),
])
def test_if97_table5_region1_specific_volume(T, p_MPa, v):
    """IAPWS R7-97(2012) Table 5: region-1 specific volume v [m^3/kg], to its 9 significant digits."""
    assert _digits9(specific_volume_liquid(T, p_MPa * 1e6)) == v
    assert liquid_density(T, p_MPa * 1e6) == pytest.approx(1.0 / v, rel=1e-8)


def test_backward_saturation_temperature_inverts_saturation_pressure():
    """IAPWS R7-97(2012): the backward equation T_s(p) inverts p_s(T) across the range."""
    T = np.linspace(273.15, 647.0, 60)
    assert saturation_temperature(saturation_pressure(T)) == pytest.approx(T, abs=1e-7)


# --------------------------------------------------------------------------
# Outside checks against the iapws package
# --------------------------------------------------------------------------

def test_saturation_pressure_matches_iapws95(iapws_ref):
    """Outside check: IF97 p_s within 0.02 % of IAPWS-95 (iapws package), 273.16-573.15 K."""
    T = np.linspace(273.16, 573.15, 31)
    ref = np.array([iapws_ref.IAPWS95(T=t, x=0).P * 1e6 for t in T])
    assert saturation_pressure(T) == pytest.approx(ref, rel=2e-4)


def test_density_at_normal_pressure_matches_iapws95(iapws_ref):
    """Outside check: density at 0.101325 MPa within 0.01 % of IAPWS-95, 278.15-333.15 K."""
    T = np.linspace(278.15, 333.15, 23)
    ref = np.array([iapws_ref.IAPWS95(T=t, P=0.101325).rho for t in T])
    assert water_density(T, 101325.0) == pytest.approx(ref, rel=1e-4)


def test_supercooled_density_matches_iapws_g12_15(iapws_ref):
    """Outside check: Hare & Sorensen fit within 0.02 % of IAPWS G12-15 (iapws), 239.15-273.1 K."""
    T = np.linspace(239.15, 273.1, 20)
    ref = np.array([iapws_ref._Supercooled(t, 0.101325)["rho"] for t in T])
    assert water_density(T) == pytest.approx(ref, rel=2e-4)


def test_sublimation_pressure_matches_iapws_package(iapws_ref):
    """Outside check: R14-08 sublimation pressure equals the iapws implementation, 50-273.16 K."""
    T = np.linspace(50.0, 273.16, 25)
    ref = np.array([iapws_ref._Sublimation_Pressure(t) * 1e6 for t in T])
    assert sublimation_pressure(T) == pytest.approx(ref, rel=1e-12)


def test_enthalpy_of_fusion_at_normal_melting_point(iapws_ref):
    """Delta_fus H(273.15 K) = 6007-6010 J/mol (handbook range); outside check against
    IAPWS-95 liquid minus IAPWS R10-06 ice Ih enthalpy (iapws) within 0.05 %."""
    dh = enthalpy_of_fusion(273.15)
    assert 6007.0 <= dh <= 6010.0
    h_liq = iapws_ref.IAPWS95(T=273.15, P=0.101325).h      # kJ/kg
    h_ice = iapws_ref._Ice(273.15, 0.101325)["h"]           # kJ/kg, same reference state
    assert dh == pytest.approx((h_liq - h_ice) * 1e3 * MOLAR_MASS_WATER, rel=5e-4)


def test_enthalpy_of_fusion_slope_is_heat_capacity_difference(iapws_ref):
    """Outside check: d(Delta_fus H)/dT at 273.15 K equals Cp(liquid) - Cp(ice) from
    IAPWS-95 and IAPWS R10-06 (38.2 J/(mol K)) within 2 %."""
    h = 0.01
    slope = (enthalpy_of_fusion(273.15 + h) - enthalpy_of_fusion(273.15 - h)) / (2 * h)
    cp_liq = iapws_ref.IAPWS95(T=273.15, P=0.101325).cp      # kJ/(kg K)
    cp_ice = iapws_ref._Ice(273.15, 0.101325)["cp"]           # kJ/(kg K)
    dcp = (cp_liq - cp_ice) * 1e3 * MOLAR_MASS_WATER
    assert slope == pytest.approx(dcp, rel=0.02)


# --------------------------------------------------------------------------
# Facts of the trade
# --------------------------------------------------------------------------

def test_common_vapor_pressures_of_water():
    """Common practice: water's vapor pressure is 0.611 kPa at 0 degC, 2.34 kPa at 20 degC
    and 101.3 kPa at 100 degC (the last is 1 atm; on ITS-90 p_s(100 degC) = 101.42 kPa,
    hence the 0.15 kPa tolerance)."""
    assert round(saturation_pressure(273.15) / 1e3, 3) == 0.611
    assert round(saturation_pressure(293.15) / 1e3, 2) == 2.34
    assert saturation_pressure(373.15) / 1e3 == pytest.approx(101.3, abs=0.15)


def test_normal_boiling_point_of_water():
    """Common practice: pure water boils at 100 degC at 101.325 kPa. On ITS-90 the
    IAPWS value is 373.124 K (99.974 degC), so the check is to 0.03 K of 373.15 K
    and to 1 mK of 373.124 K."""
    Tb = saturation_temperature(101325.0)
    assert abs(Tb - 373.15) < 0.03
    assert Tb == pytest.approx(373.124, abs=1e-3)


def test_vapor_pressures_at_minus_ten_celsius():
    """Common practice: at -10 degC supercooled water has a vapor pressure of 0.286 kPa
    and ice 0.260 kPa."""
    assert round(supercooled_vapor_pressure(263.15) / 1e3, 3) == 0.286
    assert round(sublimation_pressure(263.15) / 1e3, 3) == 0.260


def test_sublimation_pressure_at_triple_point():
    """IAPWS R14-08(2011): the sublimation pressure at T_t = 273.16 K is p_t = 611.657 Pa."""
    assert sublimation_pressure(273.16) == pytest.approx(611.657, rel=1e-12)


def test_supercooled_equation_meets_if97_above_freezing():
    """Murphy & Koop (2005) Eq. 10 represents the liquid vapor pressure above 273.16 K too;
    it agrees with IAPWS-IF97 within 0.05 % from 273.16 to 330 K."""
    T = np.linspace(273.16, 330.0, 30)
    assert supercooled_vapor_pressure(T) == pytest.approx(saturation_pressure(T), rel=5e-4)


# --------------------------------------------------------------------------
# Ice activity: two routes
# --------------------------------------------------------------------------

def test_ice_activity_vapor_pressure_ratio_and_thermodynamic_route_agree():
    """Koop et al. (2000) ratio p_ice/p_liq versus the Gibbs-Helmholtz integral of the
    Murphy & Koop (2005) enthalpy of fusion: equal within 1e-3 in ln a_w from
    273.15 K down to 236 K (the validity limit of Murphy & Koop Eq. 9)."""
    T = np.linspace(236.0, 273.15, 40)
    diff = np.log(ice_water_activity_thermo(T)) - np.log(ice_water_activity(T))
    assert np.max(np.abs(diff)) < 1e-3


def test_log_form_of_ice_activity():
    """ln a_w(ice) in log form (ln p_subl − ln p_liq from the two logarithmic equations)
    equals the logarithm of the ratio of the pressures (IAPWS R14-08 over Murphy & Koop
    2005 Eq. 10) to 1e-14 from 123 K to the triple point; −10 °C gives ln 0.907."""
    T = np.linspace(123.0, 273.16, 20001)
    d = ln_ice_water_activity(T) - np.log(sublimation_pressure(T) / supercooled_vapor_pressure(T))
    assert np.max(np.abs(d)) < 1e-14
    assert np.exp(ln_ice_water_activity(263.15)) == pytest.approx(0.907, abs=5e-4)


def test_supercooled_equation_as_printed():
    """Murphy & Koop (2005) Eq. (10) typed here as printed, with tanh; the implementation
    takes tanh y as 1 − 2/(e^(2y) + 1): the same pressures to the rounding of ln p (5e-15
    relative)."""
    T = np.linspace(123.0, 332.0, 2001)
    lnp = (54.842763 - 6763.22 / T - 4.210 * np.log(T) + 0.000367 * T
           + np.tanh(0.0415 * (T - 218.8))
           * (53.878 - 1331.22 / T - 9.44523 * np.log(T) + 0.014025 * T))
    np.testing.assert_allclose(supercooled_vapor_pressure(T), np.exp(lnp), rtol=5e-15, atol=0)


def test_ice_activity_is_one_at_melting_and_falls_with_temperature():
    """a_w(ice) = 1 at the melting point and decreases monotonically on cooling."""
    assert ice_water_activity_thermo(273.15) == pytest.approx(1.0, abs=1e-15)
    assert ice_water_activity(273.16) == pytest.approx(1.0, abs=1e-6)
    a = ice_water_activity(np.linspace(273.15, 200.0, 50))
    assert np.all(np.diff(a) < 0)


# --------------------------------------------------------------------------
# Ranges, errors and vectorization
# --------------------------------------------------------------------------

def test_supercooled_branch_joins_if97_at_freezing():
    """The Hare & Sorensen fit and IF97 meet at 273.15 K within 0.03 kg/m^3."""
    assert water_density(273.15 - 1e-9) == pytest.approx(water_density(273.15), abs=0.03)


@pytest.mark.parametrize("call", [
    lambda: saturation_pressure(270.0),
    lambda: saturation_pressure(650.0),
    lambda: saturation_temperature(500.0),
    lambda: saturation_temperature(23e6),
    lambda: liquid_density(650.0, 30e6),
    lambda: liquid_density(300.0, 101e6),
    lambda: water_density(373.15),            # vapor at 1 atm
    lambda: water_density(230.0),             # below the supercooled fit
    lambda: water_density(263.15, 1e6),       # fit is for normal pressure only
    lambda: sublimation_pressure(280.0),
    lambda: supercooled_vapor_pressure(100.0),
    lambda: ice_water_activity_thermo(230.0),
    lambda: ice_water_activity(274.0),
    lambda: ln_ice_water_activity(274.0),
])
def test_out_of_range_raises(call):
    """Outside each equation's published validity the functions raise, never extrapolate."""
    with pytest.raises(OutOfRangeError) as info:
        call()
    assert isinstance(info.value, ValueError)
    assert info.value.low is not None and info.value.high is not None


def test_out_of_range_error_reports_the_offending_value():
    """The error names the quantity, the offending value and the range."""
    with pytest.raises(OutOfRangeError) as info:
        water_density(np.array([280.0, 300.0, 200.0]))
    err = info.value
    assert err.quantity == "temperature" and err.value == 200.0
    assert (err.low, err.high) == (239.15, 623.15)


@pytest.mark.parametrize("func, arg", [
    (saturation_pressure, np.array([[280.0, 300.0, 350.0], [400.0, 450.0, 500.0]])),
    (saturation_temperature, np.array([[1e3, 1e4, 1e5], [1e6, 5e6, 1e7]])),
    (water_density, np.array([[250.0, 273.15, 300.0], [260.0, 280.0, 350.0]])),
    (sublimation_pressure, np.array([[200.0, 230.0, 250.0], [260.0, 270.0, 273.16]])),
    (supercooled_vapor_pressure, np.array([[200.0, 230.0, 250.0], [260.0, 270.0, 300.0]])),
    (ice_water_activity, np.array([[200.0, 230.0, 250.0], [260.0, 270.0, 273.0]])),
    (ln_ice_water_activity, np.array([[200.0, 230.0, 250.0], [260.0, 270.0, 273.0]])),
    (ice_water_activity_thermo, np.array([[240.0, 245.0, 250.0], [260.0, 270.0, 273.0]])),
    (enthalpy_of_fusion, np.array([[240.0, 245.0, 250.0], [260.0, 270.0, 273.0]])),
])
def test_array_in_array_out(func, arg):
    """Vectorization: an array argument returns an array of the same shape, equal
    element-wise to scalar calls; a scalar returns a float."""
    out = func(arg)
    assert isinstance(out, np.ndarray) and out.shape == arg.shape
    assert out[1, 2] == pytest.approx(func(float(arg[1, 2])), rel=1e-14)
    assert isinstance(func(float(arg[0, 0])), float)


def test_density_broadcasts_temperature_against_pressure():
    """T and P broadcast: a column of temperatures against a row of pressures."""
    T = np.array([[280.0], [300.0], [350.0]])
    P = np.array([1e5, 1e6, 1e7, 5e7])
    rho = liquid_density(T, P)
    assert rho.shape == (3, 4)
    assert rho[2, 3] == pytest.approx(liquid_density(350.0, 5e7), rel=1e-14)
    assert np.all(np.diff(rho, axis=1) > 0)  # compressible: denser at higher pressure


def test_triple_and_critical_points_end_the_liquid_vapor_curve():
    """Common practice (and IAPWS-IF97 constants): the liquid–vapor curve runs from the triple
    point (273.16 K, 611.657 Pa, i.e. 0.01 °C and 0.61 kPa) to the critical point (647.096 K,
    22.064 MPa, i.e. about 374 °C and 22 MPa) and stops there."""
    from solutions.errors import OutOfRangeError
    from solutions.water import saturation_pressure
    assert saturation_pressure(273.16) == pytest.approx(611.657, rel=1e-4)
    assert saturation_pressure(647.096) == pytest.approx(22.064e6, rel=1e-6)
    with pytest.raises(OutOfRangeError, match="647.096"):
        saturation_pressure(650.0)
