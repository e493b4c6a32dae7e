"""Tests of solutions.solvents: Antoine vapor pressures and solvent constants."""
import csv
import math
from importlib import resources

import numpy as np
import pytest

from solutions.errors import IngredientError, OutOfRangeError
from solutions.solvents import (
    AntoineExtrapolationWarning,
    AntoineRangeError,
    antoine_boiling_temperature,
    antoine_coefficients,
    antoine_vapor_pressure,
    known_solvents,
    solvent_constants,
)
from solutions.water import saturation_temperature

from solutions.colligative import R  # J/(mol K), the package's one CODATA value
ATM = 101325.0   # Pa


def _rows(name):
    with (resources.files("solutions.data") / name).open(encoding="utf-8", newline="") as fh:
        return list(csv.DictReader(fh))


# --------------------------------------------------------------------------
# Antoine equation
# --------------------------------------------------------------------------

def test_ethanol_normal_boiling_point_from_antoine():
    """NIST Chemistry WebBook, ethanol: Tboil = 351.5 +/- 0.2 K (average); the
    292.77-366.63 K Antoine row gives 351.4-351.5 K at 101.325 kPa."""
    Tb = antoine_boiling_temperature(ATM, "ethanol")
    assert 351.4 <= Tb <= 351.5
    assert abs(Tb - 351.5) <= 0.2


def test_acetone_normal_boiling_point_from_antoine():
    """NIST Chemistry WebBook, acetone: Tboil = 329.3 +/- 0.3 K (average)."""
    assert abs(antoine_boiling_temperature(ATM, "acetone") - 329.3) <= 0.3


@pytest.mark.parametrize("name", ["ethanol", "methanol", "acetone", "2-propanol"])
def test_antoine_boiling_point_matches_tabulated_boiling_point(name):
    """Data consistency: each Antoine fit reproduces the normal boiling point of
    solvent_constants.csv within 0.3 K."""
    Tb = solvent_constants(name).normal_boiling_point_K
    assert abs(antoine_boiling_temperature(ATM, name) - Tb) < 0.3


def test_ethanol_vapor_pressure_at_25C():
    """NIST WebBook Antoine row 292.77-366.63 K for ethanol, evaluated by hand:
    log10(P/bar) = 5.24677 - 1598.673/(298.15 - 46.424)."""
    expected = 1e5 * 10 ** (5.24677 - 1598.673 / (298.15 - 46.424))
    assert antoine_vapor_pressure(298.15, "ethanol") == pytest.approx(expected, rel=1e-13)


def test_ethanol_antoine_curve_has_no_step():
    """The ethanol curve used to jump 6.5 % at 366.63 K where two NIST rows met; it is
    now continuous and rising across 93.0-93.5 °C (the place of the old step)."""
    T = np.linspace(366.15, 366.63, 200)
    p = antoine_vapor_pressure(T, "ethanol")
    assert np.all(np.diff(p) > 0)
    assert np.max(np.diff(p) / p[1:]) < 1e-3


def test_antoine_overlap_blend_is_continuous():
    """Two overlapping rows are blended linearly in T: no step at either end of the
    overlap, and the inverse still round-trips (synthetic rows of the Antoine form)."""
    from solutions.solvents import AntoineCoefficients, _blend_overlaps
    r1 = AntoineCoefficients("x", 5.0, 1500.0, -50.0, 280.0, 370.0, "synthetic")
    r2 = AntoineCoefficients("x", 5.05, 1520.0, -50.0, 360.0, 450.0, "synthetic")
    T = np.array([359.999999, 360.0, 365.0, 370.0, 370.000001])
    base = np.where(T <= 370.0, r1.A - r1.B / (T + r1.C), r2.A - r2.B / (T + r2.C))
    out = _blend_overlaps((r1, r2), T, base)
    assert out[1] == pytest.approx(r1.A - r1.B / (360.0 + r1.C), abs=1e-12)
    assert out[3] == pytest.approx(r2.A - r2.B / (370.0 + r2.C), abs=1e-12)
    assert abs(out[4] - out[3]) < 1e-6 and abs(out[1] - out[0]) < 1e-6


@pytest.mark.parametrize("name", ["ethanol", "methanol", "acetone", "2-propanol"])
def test_inverse_round_trip(name):
    """antoine_boiling_temperature inverts antoine_vapor_pressure inside the fitted range."""
    rows = antoine_coefficients(name)
    T = np.linspace(rows[0].Tmin_K, rows[-1].Tmax_K, 25)
    assert antoine_boiling_temperature(antoine_vapor_pressure(T, name), name) == \
        pytest.approx(T, abs=1e-9)


def test_out_of_range_raises_and_names_solvent_and_range():
    """Below the lowest fitted temperature a ValueError subclass names the solvent and
    the range [292.77, 366.63] K."""
    with pytest.raises(AntoineRangeError) as info:
        antoine_vapor_pressure(np.array([300.0, 280.0]), "ethanol")
    err = info.value
    assert isinstance(err, ValueError) and isinstance(err, OutOfRangeError)
    assert err.solvent == "ethanol" and err.value == 280.0
    assert (err.low, err.high) == (292.77, 366.63)
    assert "ethanol" in str(err) and "292.77" in str(err) and "366.63" in str(err)


def test_out_of_range_pressure_raises_for_inverse():
    """2-propanol's only row covers 329.92-362.41 K, so 1 kPa is out of range."""
    with pytest.raises(AntoineRangeError) as info:
        antoine_boiling_temperature(1e3, "isopropanol")
    assert info.value.solvent == "2-propanol" and info.value.quantity.startswith("pressure")
    with pytest.raises(AntoineRangeError):
        antoine_boiling_temperature(-5.0, "ethanol")


def test_extrapolate_returns_value_and_warns():
    """extrapolate=True evaluates the nearest row and warns instead of raising."""
    with pytest.warns(AntoineExtrapolationWarning, match="2-propanol"):
        p = antoine_vapor_pressure(298.15, "2-propanol", extrapolate=True)
    expected = 1e5 * 10 ** (4.8610 - 1357.427 / (298.15 - 75.814))
    assert p == pytest.approx(expected, rel=1e-13)
    with pytest.warns(AntoineExtrapolationWarning):
        T = antoine_boiling_temperature(1e3, "2-propanol", extrapolate=True)
    assert T == pytest.approx(1357.427 / (4.8610 - math.log10(1e3 / 1e5)) + 75.814, rel=1e-13)


def test_no_warning_inside_range(recwarn):
    """Inside the fitted range nothing is warned."""
    antoine_vapor_pressure(np.linspace(300, 360, 7), "ethanol", extrapolate=True)
    assert not [w for w in recwarn if issubclass(w.category, AntoineExtrapolationWarning)]


def test_aliases_and_unknown_solvent():
    """Common names resolve; an unknown name raises IngredientError (a KeyError) with
    suggestions; water is sent to IAPWS-IF97."""
    assert antoine_vapor_pressure(340.0, "Isopropanol") == antoine_vapor_pressure(340.0, "2-propanol")
    assert solvent_constants("glycerin") == solvent_constants("glycerol")
    with pytest.raises(IngredientError) as info:
        antoine_vapor_pressure(300.0, "ethanoll")
    assert isinstance(info.value, KeyError) and "ethanol" in info.value.suggestions
    with pytest.raises(IngredientError, match="IAPWS-IF97"):
        antoine_vapor_pressure(300.0, "water")
    with pytest.raises(IngredientError):
        solvent_constants("benzyl benzoate")


@pytest.mark.parametrize("func, arg", [
    (antoine_vapor_pressure, np.array([[300.0, 320.0], [340.0, 360.0], [330.0, 350.0]])),
    (antoine_boiling_temperature, np.array([[1e4, 2e4], [5e4, 1e5], [1.2e5, 1.5e5]])),
])
def test_array_in_array_out(func, arg):
    """Vectorization: array in, same-shape array out; scalar in, float out."""
    out = func(arg, "ethanol")
    assert isinstance(out, np.ndarray) and out.shape == arg.shape
    assert out[2, 1] == pytest.approx(func(float(arg[2, 1]), "ethanol"), rel=1e-14)
    assert isinstance(func(float(arg[0, 0]), "ethanol"), float)


def test_required_solvents_present():
    """The Antoine table covers at least ethanol, 2-propanol, acetone and methanol."""
    assert {"ethanol", "2-propanol", "acetone", "methanol"} <= set(known_solvents())


def test_antoine_data_file_is_well_formed():
    """Every Antoine row has a source, Tmin < Tmax, and gives a rising P(T)."""
    for row in _rows("solvents.csv"):
        assert row["source"].strip()
        assert float(row["T_min_K"]) < float(row["T_max_K"])
        assert float(row["B"]) > 0


# --------------------------------------------------------------------------
# Solvent constants
# --------------------------------------------------------------------------

def test_water_cryoscopic_and_ebullioscopic_constants():
    """CRC Handbook, Section 15 tables 'Cryoscopic Constants' and 'Ebullioscopic
    Constants': water Kf = 1.86, Kb = 0.513 K kg/mol."""
    w = solvent_constants("water")
    assert w.Kf_K_kg_per_mol == 1.86
    assert w.Kb_K_kg_per_mol == 0.513


def test_crc_constants_of_organic_solvents():
    """CRC Handbook Section 15: Kb ethanol 1.23, methanol 0.86, acetone 1.80,
    2-propanol 1.58; Kf glycerol 3.56 (K kg/mol)."""
    assert solvent_constants("ethanol").Kb_K_kg_per_mol == 1.23
    assert solvent_constants("methanol").Kb_K_kg_per_mol == 0.86
    assert solvent_constants("acetone").Kb_K_kg_per_mol == 1.80
    assert solvent_constants("2-propanol").Kb_K_kg_per_mol == 1.58
    assert solvent_constants("glycerol").Kf_K_kg_per_mol == 3.56


@pytest.mark.parametrize("name", ["water", "ethanol", "methanol", "acetone", "2-propanol", "glycerol"])
def test_colligative_constants_follow_from_the_tabulated_enthalpies(name):
    """CRC defines Kb = R Tb^2 M / dvapH and Kf = R Tf^2 M / dfusH; the file's own
    Tb, Tm, dH and M reproduce its Kb, Kf within 1 % (catches a mistyped entry)."""
    c = solvent_constants(name)
    if c.Kb_K_kg_per_mol is not None:
        kb = R * c.normal_boiling_point_K**2 * c.molar_mass_kg_per_mol / c.enthalpy_of_vaporization_J_per_mol
        assert kb == pytest.approx(c.Kb_K_kg_per_mol, rel=0.01)
    if c.Kf_K_kg_per_mol is not None:
        kf = R * c.melting_point_K**2 * c.molar_mass_kg_per_mol / c.enthalpy_of_fusion_J_per_mol
        assert kf == pytest.approx(c.Kf_K_kg_per_mol, rel=0.01)


def test_water_constants_against_recorded_steam_tables():
    """Runs without the iapws package: Δh_vap at 100 °C = 2256.4 kJ/kg (IAPWS-95 steam
    tables, from memory; test_vpfit.py checks it against IAPWS-95 where iapws is installed)
    times the IAPWS-95 molar mass, within 0.01 %; the normal boiling point is the IAPWS-IF97
    saturation temperature at 101.325 kPa, 373.124 K, within 1 mK."""
    w = solvent_constants("water")
    assert w.enthalpy_of_vaporization_J_per_mol == pytest.approx(2256.4e3 * 0.018015268,
                                                                 rel=1e-4)
    assert w.normal_boiling_point_K == pytest.approx(373.124, abs=1e-3)


def test_water_constants_against_iapws():
    """Outside check (iapws package): water's enthalpy of fusion (IAPWS-95 liquid minus
    IAPWS R10-06 ice at 273.15 K, 0.101325 MPa) and of vaporization at the normal
    boiling point (IAPWS-95) agree with the file within 0.01 %; the boiling point
    equals the IF97 saturation temperature at 101.325 kPa within 1 mK."""
    iapws = pytest.importorskip("iapws")
    from iapws.iapws95 import IAPWS95
    from iapws._iapws import _Ice
    w = solvent_constants("water")
    M = w.molar_mass_kg_per_mol
    dh_fus = (IAPWS95(T=273.15, P=0.101325).h - _Ice(273.15, 0.101325)["h"]) * 1e3 * M
    assert w.enthalpy_of_fusion_J_per_mol == pytest.approx(dh_fus, rel=1e-4)
    sat = IAPWS95(P=0.101325, x=0.5)
    dh_vap = (sat.Vapor.h - sat.Liquid.h) * 1e3 * M
    assert w.enthalpy_of_vaporization_J_per_mol == pytest.approx(dh_vap, rel=1e-4)
    assert w.normal_boiling_point_K == pytest.approx(saturation_temperature(ATM), abs=1e-3)


def test_molar_masses_against_molmass():
    """Outside check (molmass package, IUPAC atomic weights): molar masses within 5e-5 (IUPAC conventional
    versus full standard atomic weights differ at the 1e-5 level)."""
    molmass = pytest.importorskip("molmass")
    formulas = {"water": "H2O", "ethanol": "C2H6O", "methanol": "CH4O", "acetone": "C3H6O",
                "2-propanol": "C3H8O", "glycerol": "C3H8O3"}
    for name, formula in formulas.items():
        expected = molmass.Formula(formula).mass / 1000.0
        assert solvent_constants(name).molar_mass_kg_per_mol == pytest.approx(expected, rel=5e-5)


def test_constants_file_rows_have_sources_and_positive_values():
    """Every row has a source and every given number is positive."""
    rows = _rows("solvent_constants.csv")
    assert {r["solvent"] for r in rows} >= {"water", "ethanol", "acetone", "2-propanol",
                                            "methanol", "glycerol"}
    for r in rows:
        assert r["source"].strip()
        for k, v in r.items():
            if k not in ("solvent", "source") and v.strip():
                assert float(v) > 0, (r["solvent"], k)


def test_tables_are_loaded_once():
    """The CSV files are parsed once and cached (functools.cache)."""
    from solutions import solvents
    assert solvents._antoine_table() is solvents._antoine_table()
    assert solvents._constants_table() is solvents._constants_table()


# --------------------------------------------------------------------------
# Wide-range pure-liquid vapor pressures (pure_vapor_pressure)
# --------------------------------------------------------------------------
from hypothesis import given, settings, strategies as st  # noqa: E402

from solutions.solvents import (  # noqa: E402
    VaporPressureExtrapolationWarning,
    VaporPressureRangeError,
    pure_vapor_pressure,
    pure_vapor_pressure_range,
    pure_vapor_pressure_source,
    volatile_keys,
)
from scipy.optimize import brentq  # noqa: E402

# CRC Handbook of Chemistry and Physics, "Physical Constants of Organic Compounds",
# normal boiling points [K] (digits as distributed in the chemicals package's open
# file Misc/Physical Constants of Organic Compounds.csv), and the tolerance each
# equation is held to [K]. Wider tolerances where handbooks scatter: DMSO's boiling
# point is given as 189-192 °C, glycerol decomposes near its boiling point.
CRC_TB = {
    "ethanol": (351.39, 0.3), "methanol": (337.65, 0.3), "2-propanol": (355.36, 0.3),
    "acetone": (329.23, 0.3), "ethylene glycol": (470.65, 0.6),
    "propylene glycol": (460.45, 0.6), "dimethyl sulfoxide": (465.05, 1.5),
    "acetic acid": (391.05, 0.3), "benzyl alcohol": (478.45, 0.3), "glycerol": (562.15, 1.5),
    "phenoxyethanol": (519.15, 1.5),
}


@pytest.mark.parametrize("key", list(CRC_TB))
def test_pure_vapor_pressure_normal_boiling_points(key):
    """CRC Handbook 'Physical Constants of Organic Compounds' normal boiling points:
    P(Tb) = 101.325 kPa within the stated tolerance in K."""
    Tb_crc, tol = CRC_TB[key]
    lo, hi = pure_vapor_pressure_range(key)
    Tb = brentq(lambda T: pure_vapor_pressure(T, key) - ATM, lo, hi - 1e-6)
    assert abs(Tb - Tb_crc) <= tol


def test_pure_vapor_pressure_water_is_iapws():
    """Water goes to IAPWS-IF97: saturation pressure 3.1699 kPa at 25 °C (IAPWS-95 steam
    tables, Wagner & Pruß 2002; value from memory), within 1e-4."""
    assert pure_vapor_pressure(298.15, "water") == pytest.approx(3169.9, rel=1e-4)


@pytest.mark.parametrize("key, T, P_pub, rtol", [
    # NIST WebBook Antoine rows (the solvents.csv rows, 293-357 K): independent fits
    ("ethanol", 298.15, 1e5 * 10 ** (5.24677 - 1598.673 / (298.15 - 46.424)), 0.01),
    ("methanol", 298.15, 1e5 * 10 ** (5.20409 - 1581.341 / (298.15 - 33.50)), 0.01),
    ("acetone", 298.15, 1e5 * 10 ** (4.42448 - 1312.253 / (298.15 - 32.445)), 0.01),
    ("2-propanol", 340.0, 1e5 * 10 ** (4.8610 - 1357.427 / (340.0 - 75.814)), 0.03),
])
def test_pure_vapor_pressure_against_nist_antoine(key, T, P_pub, rtol):
    """NIST Chemistry WebBook Antoine rows (Kretschmer & Wiebe 1949; Ambrose & Sprake
    1970; Ambrose et al. 1974; Stull 1947): the wide-range equations agree within 1 %
    (2-propanol: 3 %, Stull's 1947 row is the outlier)."""
    assert pure_vapor_pressure(T, key) == pytest.approx(P_pub, rel=rtol)


@pytest.mark.parametrize("key", ["ethanol", "methanol", "2-propanol", "acetone",
                                 "ethylene glycol", "acetic acid", "benzyl alcohol"])
def test_pure_vapor_pressure_against_vdi_ppds(key):
    """Outside check: the VDI Heat Atlas PPDS equations as implemented by the `thermo`
    package (a different source and equation) agree within 3 % from 300 to 400 K
    (glycols and benzyl alcohol: within 10 % below 0.5 kPa)."""
    thermo = pytest.importorskip("thermo")
    cas = {"ethanol": "64-17-5", "methanol": "67-56-1", "2-propanol": "67-63-0",
           "acetone": "67-64-1", "ethylene glycol": "107-21-1", "acetic acid": "64-19-7",
           "benzyl alcohol": "100-51-6"}[key]
    vp = thermo.VaporPressure(CASRN=cas)
    vp.method = "VDI_PPDS"
    for T in (300.0, 350.0, 400.0):
        ours = pure_vapor_pressure(T, key)
        tol = 0.10 if ours < 500.0 else 0.03
        assert ours == pytest.approx(vp(T), rel=tol)


def test_pure_vapor_pressure_range_error_and_extrapolation():
    """Outside the range: an OutOfRangeError (a ValueError) naming the liquid and the
    range; with extrapolate=True a value and a warning that names them."""
    with pytest.raises(VaporPressureRangeError) as info:
        pure_vapor_pressure(np.array([300.0, 280.0]), "dimethyl sulfoxide")
    err = info.value
    assert isinstance(err, OutOfRangeError) and isinstance(err, ValueError)
    assert err.key == "dimethyl sulfoxide" and err.value == 280.0
    assert (err.low, err.high) == (291.67, 729.0)
    assert "dimethyl sulfoxide" in str(err) and "291.67" in str(err)
    with pytest.warns(VaporPressureExtrapolationWarning, match=r"phenoxyethanol.*\[351, 518\]"):
        p = pure_vapor_pressure(298.15, "phenoxyethanol", extrapolate=True)
    assert 0.0 < p < 100.0
    with pytest.raises(VaporPressureRangeError):
        pure_vapor_pressure(700.0, "water", extrapolate=True)


def test_pure_vapor_pressure_unknown_key():
    with pytest.raises(IngredientError) as info:
        pure_vapor_pressure(300.0, "ethanoll")
    assert "ethanol" in info.value.suggestions


def test_volatile_keys_cover_the_library_liquids():
    """The keys the VLE code needs are all present, each with a cited source."""
    need = {"water", "ethanol", "methanol", "2-propanol", "acetone", "ethylene glycol",
            "propylene glycol", "glycerol", "dimethyl sulfoxide", "acetic acid",
            "benzyl alcohol", "phenoxyethanol"}
    assert need <= set(volatile_keys())
    for k in volatile_keys():
        assert len(pure_vapor_pressure_source(k)) > 30


def test_pure_vapor_pressure_vectorized():
    T = np.linspace(280.0, 360.0, 50).reshape(5, 10)
    P = pure_vapor_pressure(T, "ethanol")
    assert P.shape == (5, 10) and isinstance(pure_vapor_pressure(300.0, "ethanol"), float)
    assert P[2, 3] == pure_vapor_pressure(float(T[2, 3]), "ethanol")


@settings(max_examples=60, deadline=None)
@given(key=st.sampled_from(sorted(set(volatile_keys()) - {"water"})),
       f=st.floats(0.0, 1.0), df=st.floats(1e-3, 0.2))
def test_pure_vapor_pressure_positive_and_rising(key, f, df):
    """Property: inside its range every curve is finite, positive and rises with T."""
    lo, hi = pure_vapor_pressure_range(key)
    T1 = lo + f * (hi - lo) * 0.999
    T2 = min(T1 + df * (hi - lo), hi * 0.9999)
    p1, p2 = pure_vapor_pressure(T1, key), pure_vapor_pressure(T2, key)
    assert np.isfinite(p1) and p1 > 0.0
    assert T2 <= T1 or p2 > p1


def test_pure_vapor_pressure_water_below_the_triple_point():
    """Below 273.16 K water is the supercooled liquid (Murphy & Koop 2005, Eq. 10); the two
    equations meet at the triple point (611.657 Pa, IAPWS) within 0.05 %."""
    from solutions.water import supercooled_vapor_pressure
    assert pure_vapor_pressure(263.15, "water") == supercooled_vapor_pressure(263.15)
    lo = pure_vapor_pressure(273.16 - 1e-9, "water")
    hi = pure_vapor_pressure(273.16, "water")
    assert hi == pytest.approx(611.657, rel=1e-4)
    assert lo == pytest.approx(hi, rel=5e-4)
    with pytest.raises(VaporPressureRangeError):
        pure_vapor_pressure(100.0, "water")
