"""De-icer and coolant salts (potassium formate, potassium acetate, sodium acetate) against
published freezing points, through the whole evaluation (recipe text -> Evaluation).

Sources:
- Potassium formate and potassium acetate: the freezing-point correlation of Melinder Å.
  (2010) Properties of Secondary Working Fluids for Indirect Systems, IIR, Paris
  (coefficients in solutions/data/tables/melinder2010_potassium_formate_acetate_freezing.csv,
  read in a public transcription; the book's tables were not seen). The Pitzer sets were
  fitted to points of this correlation every 2.5 % (tools/fit_pitzer.py) with 12.5, 27.5 and
  42.5 % held out, so the fitted points measure the fit's quality and the held-out points
  its interpolation; neither is an independent measurement. CoolProp's incompressible fluids
  "MKF"/"MKA" implement the same correlation and serve as an outside cross-check of the
  evaluation of the published coefficients.
- Sodium acetate: CRC Handbook 102nd ed. (2021), Concentrative Properties of Aqueous
  Solutions, freezing-point depressions to 9 % (solutions/data/tables/
  crc_aqueous_20C_electrolytes.csv). No published data were found above 9 % (the eutectic
  is not reached) nor for sodium formate.

Allowance: max(0.3 K, 3 % of the published depression).
"""
import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings, strategies as st

from solutions.activity.pitzer import load_pitzer_salts, load_salt_ions
from solutions.colligative import T_MELT
from solutions.evaluate import evaluate
from solutions.recipe import read_recipe


def recipe(salt: str, pct: float, extra: str = ""):
    return read_recipe(f"ingredient,amount,unit\n{salt},{pct},% w/w\n{extra}water,balance,\n")


def freezing_C(salt: str, pct: float, model: str = "nonideal") -> float:
    ev = evaluate(recipe(salt, pct), model=model)
    return float(np.asarray(ev.props.freezing_point).reshape(-1)[0]) - T_MELT


def assert_within(got_C, ref_C):
    dT_ref = -np.asarray(ref_C, float)
    err = np.abs(np.asarray(got_C, float) - np.asarray(ref_C, float))
    np.testing.assert_array_less(err, np.maximum(0.3, 0.03 * dT_ref))


# Melinder (2010) correlation, t_f / °C at mass % of anhydrous salt (published coefficients
# evaluated at these points; see the table file).
KF_MELINDER = {5.0: -2.25, 10.0: -4.91, 15.0: -8.00, 20.0: -11.63, 25.0: -15.95,
               30.0: -21.15, 35.0: -27.44, 40.0: -34.99, 45.0: -43.94, 47.5: -48.97}
KA_MELINDER = {5.0: -1.98, 10.0: -4.55, 15.0: -7.51, 20.0: -11.21, 25.0: -16.23,
               30.0: -23.10, 35.0: -31.93, 40.0: -42.12, 45.0: -52.01}
HELD_OUT = (12.5, 27.5, 42.5)
KF_HELD = [-6.40, -18.43, -39.28]
KA_HELD = [-5.97, -19.41, -47.26]


@pytest.mark.parametrize("pct, ref", KF_MELINDER.items())
def test_potassium_formate_freezing_points(pct, ref):
    """Potassium formate to 47.5 % w/w: Melinder (2010) correlation values, e.g. 40 % −34.99 °C
    (the ideal-solute treatment gave −25.7 °C there)."""
    assert_within(freezing_C("potassium formate", pct), ref)


@pytest.mark.parametrize("pct, ref", KA_MELINDER.items())
def test_potassium_acetate_freezing_points(pct, ref):
    """Potassium acetate to 45 % w/w (the correlation's upper limit): Melinder (2010), e.g.
    40 % −42.12 °C."""
    assert_within(freezing_C("potassium acetate (solid)", pct), ref)


def test_held_out_points():
    """12.5, 27.5 and 42.5 % were not used in the fits (Melinder 2010 correlation):
    potassium formate −6.40, −18.43, −39.28 °C; potassium acetate −5.97, −19.41, −47.26 °C."""
    assert_within([freezing_C("potassium formate", p) for p in HELD_OUT], KF_HELD)
    assert_within([freezing_C("potassium acetate (solid)", p) for p in HELD_OUT], KA_HELD)


@pytest.mark.parametrize("fluid, salt, pcts", [
    ("MKF", "potassium formate", (10.0, 20.0, 30.0, 40.0, 47.0)),
    ("MKA", "potassium acetate (solid)", (10.0, 20.0, 30.0, 40.0, 44.0)),
])
def test_against_coolprop_melinder_fluids(fluid, salt, pcts):
    """Outside cross-check: CoolProp's incompressible fluids MKF/MKA (Melinder 2010) give the
    freezing point at any mass fraction; our evaluation must agree within the allowance."""
    CP = pytest.importorskip("CoolProp.CoolProp")
    ref = [CP.PropsSI("T_freeze", "T", 300.0, "P", 101325.0, f"INCOMP::{fluid}[{p / 100}]")
           - T_MELT for p in pcts]
    assert_within([freezing_C(salt, p) for p in pcts], ref)


def test_coolprop_agrees_with_the_transcribed_coefficients():
    """The transcribed coefficient table reproduces CoolProp's MKF/MKA freezing points to
    0.01 K, so no digit was lost in transcription (40 %: −34.99 and −42.12 °C)."""
    CP = pytest.importorskip("CoolProp.CoolProp")
    from tools.fit_pitzer import melinder_points
    for key, fluid in (("KHCO2", "MKF"), ("KC2H3O2", "MKA")):
        x, dT = melinder_points(key)
        ref = [CP.PropsSI("T_freeze", "T", 300.0, "P", 101325.0, f"INCOMP::{fluid}[{p / 100}]")
               - T_MELT for p in x]
        np.testing.assert_allclose(-dT, ref, atol=0.01)
    assert KF_MELINDER[40.0] == pytest.approx(-34.99) and KA_MELINDER[40.0] == -42.12


def test_sodium_acetate_crc_rows():
    """Sodium acetate, CRC Handbook 102nd ed. (2021) Concentrative Properties: 0.5-9 %
    depressions 0.22, 0.43, 0.88, 1.34, 1.82, 2.32, 2.85, 3.40, 3.98, 4.57 K (1, 4, 7 % held
    out of the fit)."""
    pcts = [0.5, 1, 2, 3, 4, 5, 6, 7, 8, 9]
    ref = [0.22, 0.43, 0.88, 1.34, 1.82, 2.32, 2.85, 3.40, 3.98, 4.57]
    crc = pd.read_csv("solutions/data/tables/crc_aqueous_20C_electrolytes.csv")
    d = crc[crc.solute == "Sodium acetate"].dropna(subset=["freezing_point_depression_K"])
    assert d.freezing_point_depression_K.tolist() == ref
    assert_within([freezing_C("sodium acetate anhydrous", p) for p in pcts], -np.array(ref))


def test_ideal_treatment_fails_these_checks():
    """The test can fail: the ideal-solute model misses Melinder's 40 % points by far more than
    the allowance (potassium formate −34.99 °C, potassium acetate −42.12 °C)."""
    with pytest.raises(AssertionError):
        assert_within(freezing_C("potassium formate", 40.0, model="ideal"), -34.99)
    with pytest.raises(AssertionError):
        assert_within(freezing_C("potassium acetate (solid)", 40.0, model="ideal"), -42.12)


def test_a_wrong_parameter_fails(monkeypatch):
    """Break the model on purpose: β0 of potassium formate halved must fail the 40 % check
    (Melinder 2010: −34.99 °C)."""
    import dataclasses

    from solutions.activity import models, pitzer
    from solutions.activity.pitzer import TFunction
    good = load_pitzer_salts()
    s = good["KHCO2"]
    st0 = s.sets[0]
    broken = dataclasses.replace(st0, beta0=TFunction("const", (0.5 * st0.beta0.coeffs[0],)))
    bad = {**good, "KHCO2": dataclasses.replace(s, sets=(broken,))}
    caches = [models._pitzer_salts, getattr(pitzer.pitzer_mixture, "cache_clear", None) and
              pitzer.pitzer_mixture]
    monkeypatch.setattr(pitzer, "_load", lambda path: bad)
    for c in filter(None, caches):
        c.cache_clear()
    try:
        with pytest.raises(AssertionError):
            assert_within(freezing_C("potassium formate", 40.0), -34.99)
    finally:
        monkeypatch.undo()
        for c in filter(None, caches):
            c.cache_clear()


def test_parameter_rows_are_fitted_not_remembered():
    """KHCO2 and KC2H3O2 rows cite the fit to Melinder (2010), state the molality and
    temperature range of the fitted points, and have an ion row."""
    salts = load_pitzer_salts()
    ions = load_salt_ions()
    for key, b_max, T_lo in (("KHCO2", 10.86, 223.0), ("KC2H3O2", 8.42, 220.0)):
        s = salts[key]
        assert "memory" not in s.source and "Melinder" in s.source
        assert s.b_max == pytest.approx(b_max)
        assert s.T_min == pytest.approx(T_lo) and s.T_max == pytest.approx(273.0)
        assert (ions[key].z_cation, ions[key].z_anion) == (1, -1)


def test_beyond_the_data_is_flagged():
    """Potassium acetate at 49 % (the published eutectic composition, −60 °C: Texas DOT Snow
    and Ice Control manual) lies 16 % past the fitted molality: no freezing point is given,
    and a caveat says why. Potassium formate at 50 % (9 % past) carries a molality caveat."""
    ev = evaluate(recipe("potassium acetate (solid)", 49.0))
    assert not np.isfinite(np.asarray(ev.props.freezing_point, float)).any()
    assert any("8.42 mol/kg" in c.message for c in ev.warnings)
    ev = evaluate(recipe("potassium formate", 50.0))
    assert any("(KHCO2): molality" in c.message and "10.86" in c.message for c in ev.warnings)


def test_walkway_demo_uses_potassium_formate():
    """The demo de-icer is potassium formate 40 % + propylene glycol 5 %; its freezing point
    is below the 40 % binary value of Melinder (2010), −34.99 °C, and carries the freezing
    caution."""
    from pathlib import Path
    ev = evaluate(read_recipe(Path("recipes/walkway_deicer.csv").read_text()))
    text = Path("recipes/walkway_deicer.csv").read_text()
    assert "potassium formate,40" in text and "carbonate" not in text
    tf = float(np.asarray(ev.props.freezing_point).reshape(-1)[0]) - T_MELT
    assert tf < -34.99
    assert any(tag == "freezing" for tag, _ in ev.cautions)


@settings(max_examples=25, deadline=None)
@given(st.floats(1.0, 47.0), st.floats(0.2, 1.0))
def test_freezing_point_falls_with_concentration(pct, step):
    """Property: within the data the freezing point falls as potassium formate is added, and
    stays below 0 °C and above the −60 °C floor of the correlation's range."""
    a, b = freezing_C("potassium formate", pct), freezing_C("potassium formate", pct + step)
    assert b < a < 0.0
    assert b > -60.0


@pytest.mark.parametrize("salt, fluid, ref", [
    ("potassium formate", "MKF", {10: 1059.7, 20: 1122.0, 30: 1189.7, 40: 1261.9}),
    ("potassium acetate (solid)", "MKA", {10: 1050.9, 20: 1101.3, 30: 1157.7, 40: 1215.0}),
])
def test_density_against_melinder(salt, fluid, ref):
    """Densities at 20 °C (library: Laliberté 2009 apparent-volume model) against Melinder
    (2010) as implemented by CoolProp's MKF/MKA, within 0.5 % (0.3 % seen): potassium formate
    40 % 1261.9 kg/m³, potassium acetate 40 % 1215.0 kg/m³."""
    CP = pytest.importorskip("CoolProp.CoolProp")
    for pct, rho_ref in ref.items():
        cp = CP.PropsSI("D", "T", 293.15, "P", 101325.0, f"INCOMP::{fluid}[{pct / 100}]")
        assert cp == pytest.approx(rho_ref, abs=0.06)
        rho = evaluate(recipe(salt, pct), T=293.15).rho
        assert rho == pytest.approx(rho_ref, rel=0.005), (salt, pct)
