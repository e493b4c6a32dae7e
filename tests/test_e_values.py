"""E-values (sodium chloride equivalents) in solutions/data/e_values.csv and the arithmetic of
the E-value method (solutions.targeting.e_value_isotonic) against published worked examples."""
import pandas as pd
import pytest

from solutions.ingredients import default_library
from solutions.recipe import read_recipe, resolve
from solutions.targeting import e_value_isotonic, e_values

LIB = default_library()
TAB = pd.read_csv("solutions/data/e_values.csv", dtype=str, keep_default_na=False)


def test_table_shape_sources_and_keys():
    """At least 40 substances, each with an E-value or a 1 % freezing-point depression and a
    source naming the table it was read from; every key is a library key."""
    assert len(TAB) >= 40
    keys = {i.key for i in LIB}
    for r in TAB.itertuples():
        assert r.E_value or r.freezing_point_depression_1pct_K, r.ingredient
        assert len(r.source) > 40 and ("table" in r.source.lower() or "example" in
                                        r.source.lower() or "problem" in r.source.lower()), r
        if r.key:
            assert r.key in keys, r.key
    assert sum(bool(k) for k in TAB.key) == len(set(k for k in TAB.key if k)), "one row per key"
    assert len(e_values()) >= 15


@pytest.mark.parametrize("key, published", [
    ("potassium_chloride", 0.76), ("potassium_iodide", 0.35), ("ascorbic_acid", 0.18),
    ("magnesium_sulfate_heptahydrate", 0.14), ("calcium_chloride_hexahydrate", 0.36),
    ("sodium_sulfate_decahydrate", 0.23), ("sodium_citrate_dihydrate", 0.30),
])
def test_compendial_values(key, published):
    """State Pharmacopoeia of the Russian Federation 13th ed., table of isotonic equivalents
    by sodium chloride (read in the reproduction named in e_values.csv)."""
    assert e_values()[key] == published


def test_sources_agree_with_each_other():
    """Independent sources for the same substance: boric acid 0.52 (teaching example) and
    0.53 (ГФ XIII) and 0.283/0.576 = 0.49 (Kazakh table); anhydrous dextrose 0.18 (ГФ XIII)
    and 0.1037/0.576 = 0.180 (exam page); potassium iodide 0.35 (ГФ XIII) and
    0.204/0.576 = 0.354 (Kazakh table)."""
    def E(name):
        r = TAB[TAB.ingredient == name].iloc[0]
        return float(r.E_value) if r.E_value else float(r.freezing_point_depression_1pct_K) / 0.576
    boric = [E("boric acid"), E("boric acid (second source)"), E("boric acid (third source)")]
    assert boric[:2] == [0.52, 0.53] and max(boric) - min(boric) <= 0.045
    assert e_values()["glucose_anhydrous"] == pytest.approx(E("dextrose (anhydrous) (second "
                                                              "source)"), abs=0.002)
    assert e_values()["potassium_iodide"] == pytest.approx(
        E("potassium iodide (second source)"), abs=0.005)


def test_hydrate_scaling_is_consistent():
    """E is per gram: the monohydrate's E is the anhydrous E times M_anh/M_hyd. Glucose:
    0.180 × 180.16/198.17 = 0.164 against the published 0.16 (phcalculator example)."""
    ev = e_values()
    anh, mono = LIB.get("glucose anhydrous"), LIB.get("glucose monohydrate")
    assert ev["glucose_monohydrate"] == pytest.approx(ev["glucose_anhydrous"] * anh.M / mono.M,
                                                      abs=0.005)


def _resolved(text):
    return resolve(read_recipe(text.strip() + "\n"))


def test_worked_example_tetracaine_pharmacopoeia():
    """State Pharmacopoeia of the Russian Federation 14th ed., vol. IV, p. 1818 (read at
    https://docs.rucml.ru/feml/pharma/v14/vol4/1818): tetracaine 3 g, E = 0.18, water for
    injection to 1 L: 9 g − 3 × 0.18 = 8.46 g sodium chloride."""
    res = _resolved("""ingredient,amount,unit,molar_mass,ions
tetracaine hydrochloride,3,g,300.83,2
sodium chloride,8,g,,
water,q.s. to 1000,mL,,""")
    row = next(r.row for r in res.recipe.rows if r.ingredient.key == "sodium_chloride")
    e = e_value_isotonic(res, row, {"tetracaine hydrochloride": 0.18})
    assert e["available"]
    assert e["g_in_batch"] == pytest.approx(8.46, abs=0.005)


def test_worked_example_zinc_sulfate_with_boric_acid():
    """rxistsource.blogspot.com 'Isotonicity' (2012; teaching page): zinc sulfate 0.08 g
    (E 0.16), boric acid q.s., purified water to 10 mL: 0.09 − 0.0128 = 0.0772 g NaCl
    equivalent, / 0.52 = 0.1485 g boric acid (E of boric acid from e_values.csv)."""
    res = _resolved("""ingredient,amount,unit
zinc sulfate heptahydrate,0.08,g
boric acid,0.15,g
water,q.s. to 10,mL""")
    row = next(r.row for r in res.recipe.rows if r.ingredient.key == "boric_acid")
    e = e_value_isotonic(res, row, {"zinc sulfate heptahydrate": 0.16})
    assert e["E_varied"] == 0.52
    assert e["g_in_batch"] == pytest.approx(0.1485, abs=0.0005)
