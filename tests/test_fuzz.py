"""Fuzzing the recipe grammar and the command-line options (hypothesis).

Whatever is typed, the library either answers with numbers that can physically exist or
refuses with one of the package's errors whose message names what was wrong; nothing else
escapes, and no NaN or inf reaches the output.
"""
from __future__ import annotations

import json
import math

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from solutions.errors import SolutionsError
from solutions.evaluate import evaluate
from solutions.recipe import read_recipe
from solutions.units import vocabulary

NAMES = ["sodium chloride", "sucrose", "glycerol", "propylene glycol", "ethanol",
         "calcium chloride dihydrate", "potassium chloride", "urea", "Tris", "water",
         "unobtainium", "", "NaCl", "dextrose", "a#b", "x" * 300]
UNITS = sorted({s.text for s in vocabulary() if s.quantity not in ("temperature", "pressure")})
UNITS += ["", "furlong", "g g", "%%", "mg/", "1e5", "q.s.", "balance"]
AMOUNTS = st.one_of(
    st.floats(min_value=-1e3, max_value=1e6).map(repr),
    st.sampled_from(["NaN", "nan", "inf", "", "0", "-1", "1,000", "0,9", "1e308", "1e-300",
                     "q.s. to 100", "q.s. to 0", "balance", "abc", "1 000", "5e-7"]))

ROW = st.tuples(st.sampled_from(NAMES), AMOUNTS, st.sampled_from(UNITS))
WATER = st.sampled_from([("water", "q.s. to 1000", "mL"), ("water", "balance", ""),
                         ("water", "100", "g"), None])


def _csv(rows, water):
    lines = ["ingredient,amount,unit"]
    for name, amount, unit in rows:
        lines.append(",".join('"' + str(v).replace('"', "") + '"' for v in (name, amount, unit)))
    if water:
        lines.append(",".join(water))
    return "\n".join(lines) + "\n"


def _check(d: dict) -> None:
    json.dumps(d, allow_nan=False)  # no NaN or inf anywhere
    s = d["solution"]
    aw, osm, phi = s["water_activity"], s["osmolality_mOsm_per_kg"], s["osmotic_coefficient"]
    assert aw is None or 0.0 < aw <= 1.0
    assert osm is None or osm >= 0.0
    assert phi is None or phi >= 0.0
    assert s["freezing_point_C"] is None or s["freezing_point_C"] <= 0.005
    assert s["osmotic_pressure_kPa"] is None or s["osmotic_pressure_kPa"] >= 0.0
    assert s["density_g_per_mL"] > 0


def _clean(obj):
    if isinstance(obj, float):
        return obj if math.isfinite(obj) else float("nan")
    if isinstance(obj, dict):
        return {k: _clean(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_clean(v) for v in obj]
    return obj


@settings(max_examples=120, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(ROW, min_size=1, max_size=4), WATER)
def test_any_recipe_is_answered_or_refused(rows, water):
    text = _csv(rows, water)
    try:
        ev = evaluate(read_recipe(text))
    except SolutionsError as exc:
        assert str(exc).strip()
        return
    d = ev.to_dict()
    # the library returns floats; the JSON writer turns non-finite ones into null, but
    # none may be produced in the first place outside the nullable property values
    _check(json.loads(json.dumps(_clean(d), allow_nan=True).replace("NaN", "null")))
    for c in d["components"]:
        for k, v in c.items():
            if isinstance(v, float):
                assert math.isfinite(v), (k, v, text)


@settings(max_examples=60, deadline=None)
@given(st.text(max_size=12), st.text(max_size=12))
def test_any_option_text_is_answered_or_refused(t_text, p_text):
    from solutions.cli import main
    import contextlib
    import io
    err = io.StringIO()
    with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(err):
        try:
            code = main(["evaluate", "recipes/saline_rinse.csv", "-T", t_text or "25",
                         "--pressure", p_text or "101.325", "--json"])
        except SystemExit as exc:
            code = exc.code
    assert code in (0, 2), err.getvalue()
    if code == 2:
        assert err.getvalue().startswith(("error:", "usage:")), err.getvalue()


@pytest.mark.parametrize("unit", UNITS)
def test_every_listed_spelling_reads_or_refuses_cleanly(unit):
    try:
        read_recipe(f"ingredient,amount,unit\nsodium chloride,1,{unit}\nwater,q.s. to 100,mL\n")
    except SolutionsError as exc:
        assert str(exc)


SOLUTES = ["sodium chloride", "sucrose", "glycerol", "propylene glycol", "ethylene glycol",
           "ethanol", "methanol", "acetone", "urea", "potassium chloride", "calcium chloride dihydrate",
           "magnesium chloride hexahydrate", "glucose monohydrate", "dimethyl sulfoxide",
           "potassium carbonate", "sorbitol"]


@settings(max_examples=150, deadline=None)
@given(st.sampled_from(SOLUTES), st.floats(min_value=1e-6, max_value=95.0),
       st.floats(min_value=1e-6, max_value=95.0))
def test_concentrated_binaries_stay_physical(name, w1, w2):
    """Any built-in solute alone in water, dilute to concentrated: every reported number can
    exist, and the freezing point falls as the concentration rises (where both are reported)."""
    lo, hi = sorted((w1, w2))
    fps = []
    for w in (lo, hi):
        try:
            ev = evaluate(read_recipe(f'ingredient,amount,unit\n"{name}",{w!r},% w/w\nwater,balance,\n'))
        except SolutionsError:
            fps.append(None)
            continue
        d = ev.to_dict()
        _check(json.loads(json.dumps(_clean(d), allow_nan=True).replace("NaN", "null")))
        fps.append(d["solution"]["freezing_point_C"])
    if fps[0] is not None and fps[1] is not None and hi - lo > 1e-6:
        assert fps[1] <= fps[0] + 1e-6, (name, lo, hi, fps)
