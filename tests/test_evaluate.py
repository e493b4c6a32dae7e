"""The evaluation object: what every front end shows, with structured warnings and cautions."""
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
    d = ev("propylene glycol,30,% w/w\nNaCl,25,% w/w\nwater,balance,", T=263.15)
    assert len(d["warnings"]) == len(d["warnings_detail"])
    about = {w["kind"]: w["about"] for w in d["warnings_detail"]}
    assert about["ideal-fallback"] == "density"      # PG has no solution-density data
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
