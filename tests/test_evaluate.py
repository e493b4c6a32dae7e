"""The evaluation object: what every front end shows, with structured warnings and cautions."""
import pytest
from solutions.evaluate import evaluate
from solutions.recipe import read_recipe


def ev(text, **kw):
    return evaluate(read_recipe("ingredient,amount,unit\n" + text), **kw).to_dict()


def test_recipe_rows_as_written():
    d = ev("sodium chloride,0.9,% w/v\nwater,q.s. to 1000,mL")
    assert d["recipe"] == [
        {"row": 1, "ingredient": "sodium chloride", "amount": 0.9, "unit": "% w/v"},
        {"row": 2, "ingredient": "water", "amount": "q.s. to 1000", "unit": "mL"}]


def test_warnings_say_what_they_are_about():
    """Each warning message appears once, with kind, component and the results it bears on."""
    d = ev("dimethyl sulfoxide,30,% w/w\nNaCl,25,% w/w\nwater,balance,", T=263.15)
    assert len(d["warnings"]) == len(d["warnings_detail"])
    about = {w["kind"]: w["about"] for w in d["warnings_detail"]}
    # DMSO has no solution-density data
    assert ("ideal-fallback", "density") in {(w["kind"], w["about"]) for w in d["warnings_detail"]}
    kinds = [w["kind"] for w in d["warnings_detail"]]
    assert "eutectic" in kinds and about["eutectic"] == "freezing"


def test_cautions_are_tagged():
    """Toxic glycol, freeze protection and sealed vessels each get their caution; a coolant at
    thousands of mOsm/kg gets no tonicity caution, a saline rinse does."""
    d = ev("ethylene glycol,40,% w/w\nwater,balance,")
    tags = {c["tag"] for c in d["cautions_detail"]}
    assert tags == {"ingredient", "freezing", "vessel"}
    assert any("toxic" in c for c in d["cautions"])
    saline = ev("sodium chloride,0.9,% w/v\nwater,q.s. to 1000,mL")
    assert {c["tag"] for c in saline["cautions_detail"]} == {"tonicity", "vessel"}


def test_equilibrium_relative_humidity_of_saturated_salt():
    """Greenspan (1977) J. Res. NBS 81A, 89, Table 2: the relative humidity over saturated
    NaCl at 25 °C is 75.29 ± 0.12 %; ERH = 100 a_w (definition, common practice)."""
    from solutions.recipe import read_recipe
    ev = evaluate(read_recipe("ingredient,amount,unit\nsodium chloride,35.9,g\nwater,100,g\n"))
    s = ev.to_dict()["solution"]
    assert s["equilibrium_relative_humidity_percent"] == pytest.approx(75.29, abs=0.3)
    assert s["equilibrium_relative_humidity_percent"] == pytest.approx(100 * s["water_activity"])


def test_equilibrium_relative_humidity_is_null_outside_water():
    from solutions.recipe import read_recipe
    ev = evaluate(read_recipe("ingredient,amount,unit\nglycerol,1,g\nethanol,q.s. to 100,mL\n"))
    assert ev.to_dict()["solution"]["equilibrium_relative_humidity_percent"] is None


def test_equilibrium_relative_humidity_target_round_trip():
    """A target of 90 % ERH is met at a_w = 0.900 (definition)."""
    from solutions.recipe import read_recipe
    from solutions.targeting import Target, solve_target
    recipe = read_recipe("ingredient,amount,unit\nsodium chloride,5,% w/w\nwater,balance,\n")
    r = solve_target(recipe, "sodium chloride", Target("equilibrium_relative_humidity", 0.90))
    assert r.evaluation.to_dict()["solution"]["water_activity"] == pytest.approx(0.90, abs=1e-8)


def test_water_row_bases_count_all_water():
    """The solvent row's g/L and mol/L both describe all the water in the solution (crystal
    water included), so g/L = M × mol/L (definitions); the water to add is weigh_g."""
    d = ev("calcium chloride dihydrate,300,g\nsodium chloride,50,g\nwater,1000,g")
    w = d["components"][-1]
    assert w["mass_per_volume_g_per_L"] == pytest.approx(
        w["molarity_mol_per_L"] * w["molar_mass_g_per_mol"], rel=1e-12)
    assert w["weigh_g"] == pytest.approx(1000.0, rel=1e-12)
    crystal = 300.0 * 2 * 18.015 / 147.01       # CaCl2·2H2O carries 2 waters (formula)
    assert w["mass_g"] == pytest.approx(1000.0 + crystal, rel=1e-3)
