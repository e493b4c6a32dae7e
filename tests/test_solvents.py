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


def test_antoine_picks_the_row_that_contains_T():
    """Ethanol has two NIST rows; 400 K uses the 364.8-513.91 K row."""
    expected = 1e5 * 10 ** (4.92531 - 1432.526 / (400.0 - 61.819))
    assert antoine_vapor_pressure(400.0, "ethanol") == pytest.approx(expected, rel=1e-13)


@pytest.mark.parametrize("name", ["ethanol", "methanol", "acetone", "2-propanol"])
def test_inverse_round_trip(name):
    """antoine_boiling_temperature inverts antoine_vapor_pressure inside the fitted range."""
    rows = antoine_coefficients(name)
    T = np.linspace(rows[0].Tmin_K, rows[-1].Tmax_K, 25)
    assert antoine_boiling_temperature(antoine_vapor_pressure(T, name), name) == \
        pytest.approx(T, abs=1e-9)


def test_out_of_range_raises_and_names_solvent_and_range():
    """Below the lowest fitted temperature a ValueError subclass names the solvent and
    the range [292.77, 513.91] K."""
    with pytest.raises(AntoineRangeError) as info:
        antoine_vapor_pressure(np.array([300.0, 280.0]), "ethanol")
    err = info.value
    assert isinstance(err, ValueError) and isinstance(err, OutOfRangeError)
    assert err.solvent == "ethanol" and err.value == 280.0
    assert (err.low, err.high) == (292.77, 513.91)
    assert "ethanol" in str(err) and "292.77" in str(err) and "513.91" in str(err)


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
    (antoine_vapor_pressure, np.array([[300.0, 320.0], [340.0, 360.0], [400.0, 450.0]])),
    (antoine_boiling_temperature, np.array([[1e4, 2e4], [5e4, 1e5], [5e5, 1e6]])),
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
        assert float(row["Tmin_K"]) < float(row["Tmax_K"])
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
