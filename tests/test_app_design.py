"""Tests of the dashboard's "Design and batch" section (target, scale-up, dilution) with
Streamlit's AppTest, and of the section's helpers in :mod:`solutions.ui.design`.

Every number the section shows is compared with a direct call of the library
(:func:`solutions.targeting.solve_target`, :func:`solutions.batch.weigh_out`,
:func:`solutions.batch.dilution_plan`) under the same conditions: the shown text, read back
as a number, must be the library's value rounded to the digits shown.
"""
import csv
import io
import json
import re
from pathlib import Path

import pandas as pd
import pytest
from streamlit.testing.v1 import AppTest

from solutions.batch import dilution_plan, weigh_out
from solutions.errors import TargetError
from solutions.evaluate import evaluate
from solutions.ingredients import default_library
from solutions.recipe import parse_batch, read_recipe
from solutions.targeting import Target, solve_target
from solutions.ui import design as D
from solutions.ui.compute import Conditions, read_table
from solutions.ui.safe import plain
from solutions.ui.tables import frame_from_text

ROOT = Path(__file__).resolve().parents[1]
APP = str(ROOT / "streamlit_app.py")
RECIPES = ROOT / "recipes"
TIMEOUT = 120
_NUM = re.compile(r"[-+]?\d+(?:\.(\d+))?(?:e([-+]?\d+))?")


def assert_shows(text: str, value: float, what: str = ""):
    """``text`` shows ``value`` rounded to the digits in ``text`` (half an ulp of display)."""
    m = _NUM.search(text.replace("−", "-"))
    assert m, (what, text)
    decimals = len(m.group(1) or "")
    half_ulp = 0.5 * 10.0 ** (int(m.group(2) or 0) - decimals)
    assert abs(float(m.group(0)) - value) <= half_ulp * (1 + 1e-9) + 1e-12, (what, text, value)


def recipe(name: str):
    return read_recipe(RECIPES / f"{name}.csv", default_library(), name=name)


def app(demo: str | None = None, **state) -> AppTest:
    at = AppTest.from_file(APP, default_timeout=TIMEOUT)
    for k, v in state.items():
        at.session_state[k] = v
    at.run()
    if demo:
        at.selectbox(key="demo").select(demo).run()
    assert not at.exception
    return at


def solve_on_page(at, vary, prop, value, **extra):
    at.selectbox(key="tg_vary").select(vary)
    at.selectbox(key="tg_property").select(prop)
    at.run()
    for k, v in extra.items():
        w = at.selectbox(key=k) if k in ("tg_add", "tg_component", "tg_basis") else None
        if w is not None:
            w.select(v)
            at.run()
    at.number_input(key=f"tg_value_{prop}").set_value(value)
    at.button(key="tg_solve").click().run()
    assert not at.exception
    return at


def metric(at, label_start: str) -> str:
    (m,) = [m for m in at.metric if m.label.startswith(label_start)]
    return m.value


def table_with(at, column: str) -> pd.DataFrame:
    return next(t.value for t in at.table if column in t.value.columns)


# ------------------------------------------------------------------ target
def test_target_freezing_point_matches_solve_target():
    at = app("chiller_coolant")
    solve_on_page(at, "propylene glycol", "freezing_point", -25.0)
    res = solve_target(recipe("chiller_coolant"), "propylene glycol",
                       Target.freezing_point(-25.0 + 273.15))
    d = res.to_dict()
    assert_shows(metric(at, "New amount of propylene glycol"), res.number, "amount")
    assert metric(at, "New amount of propylene glycol").endswith("% w/w")
    assert_shows(metric(at, "Mass of propylene glycol"), d["varied"]["mass_g"], "mass")
    assert_shows(metric(at, "Achieved freezing point"), d["target"]["achieved"], "achieved")
    assert any(c.value.startswith(plain(f"scipy.optimize.brentq: {res.iterations} iterations"))
               for c in at.caption)
    # the adjusted recipe table and the before/after comparison
    adj = table_with(at, "Change")
    assert adj["Ingredient"].tolist() == [r["ingredient"] for r in d["recipe"]]
    assert_shows(adj.loc[0, "Amount"], res.number, "table amount")
    assert adj.loc[0, "Change"] == "was 38 % w/w"
    comp = table_with(at, "Adjusted recipe")
    fp = comp[comp["Property"] == "Freezing point"].iloc[0]
    assert_shows(fp["Adjusted recipe"], d["solution"]["freezing_point_C"], "compared fp")
    # the freeze-protection caution of the result shows beside it
    freeze = [c for c in d["cautions"] if c.startswith("Freezing points are estimates")]
    assert freeze and sum(w.value == plain(freeze[0]) for w in at.warning) >= 1
    # ...and the amount really moved (38 % w/w as written)
    assert res.number > 40


def test_unreachable_target_shows_the_library_reason_and_nearest_value():
    at = app()                                   # saline_rinse, the first demo
    solve_on_page(at, "sodium chloride", "freezing_point", -30.0)
    with pytest.raises(TargetError) as exc:
        solve_target(recipe("saline_rinse"), "sodium chloride", Target.freezing_point(243.15))
    errors = [e.value for e in at.error]
    assert f"Target not reachable: {plain(exc.value.reason)}" in errors, errors
    (near,) = [w.value for w in at.warning if w.value.startswith("Nearest reachable")]
    assert_shows(near.split(":", 1)[1], exc.value.nearest, "nearest")
    assert near.endswith(plain(exc.value.unit))
    # the page keeps working: the results are still there and the next solve answers
    assert metric(at, "Freezing point")
    solve_on_page(at, "sodium chloride", "freezing_point", -1.0)
    res = solve_target(recipe("saline_rinse"), "sodium chloride", Target.freezing_point(272.15))
    assert_shows(metric(at, "New amount of sodium chloride"), res.number)
    assert not any(e.value.startswith("Target not reachable") for e in at.error)


def test_isotonic_target_with_a_changed_isotonic_value_and_e_values():
    at = app()
    solve_on_page(at, "sodium chloride", "isotonic", 300.0)
    res = solve_target(recipe("saline_rinse"), "sodium chloride",
                       Target.osmolality("isotonic", isotonic=0.300))
    d = res.to_dict()
    assert d["target"]["isotonic"] and d["target"]["value"] == pytest.approx(300.0, abs=1e-9)
    assert_shows(metric(at, "New amount of sodium chloride"), res.number)
    assert_shows(metric(at, "Achieved osmolality"), d["target"]["achieved"])
    (info,) = [i.value for i in at.info if "E-value" in i.value]
    e = d["e_value_method"]
    assert_shows(info.split(plain("E-value method:"), 1)[1], e["g_per_100_mL"], "E-value g/100 mL")
    assert_shows(info.split(plain("the model:"), 1)[1], e["model_g_per_100_mL"], "model g/100 mL")
    tonicity = next(c for c in d["cautions"] if c.startswith("Osmolality and tonicity"))
    assert any(w.value == plain(tonicity) for w in at.warning)


def test_adding_a_library_ingredient_matches_solve_target():
    at = app()
    solve_on_page(at, D.ADD_INGREDIENT, "osmolality", 400.0, tg_add="Glycerol")
    res = solve_target(recipe("saline_rinse"), "Glycerol", Target.osmolality(0.400))
    assert res.added
    assert_shows(metric(at, "New amount of Glycerol"), res.number)
    assert metric(at, "New amount of Glycerol").endswith("% w/v")
    adj = table_with(at, "Change")
    assert adj["Change"].iloc[-1] == "added"


def test_concentration_target_of_another_ingredient():
    at = app("chiller_coolant")
    solve_on_page(at, "propylene glycol", "concentration", 0.51,
                  tg_component="dipotassium phosphate", tg_basis="% w/v")
    res = solve_target(recipe("chiller_coolant"), "propylene glycol",
                       Target.concentration("dipotassium phosphate", "0.51 % w/v"))
    assert_shows(metric(at, "New amount of propylene glycol"), res.number)
    assert_shows(metric(at, "Achieved concentration"), res.to_dict()["target"]["achieved"])


def test_boiling_point_target_uses_the_sidebar_pressure():
    at = app("maple_glaze_syrup", P_kPa=80.0, pressure_preset="Other pressure…")
    solve_on_page(at, "sucrose", "boiling_point", 96.0)
    res = solve_target(recipe("maple_glaze_syrup"), "sucrose",
                       Target.boiling_point(96.0 + 273.15), P=80.0e3)
    assert_shows(metric(at, "New amount of sucrose"), res.number)


def test_vapor_pressure_target_uses_the_sidebar_temperature_and_model():
    at = app("maple_glaze_syrup", T_C=40.0, model="ideal")
    solve_on_page(at, "sucrose", "vapor_pressure", 6.6)
    res = solve_target(recipe("maple_glaze_syrup"), "sucrose", Target.vapor_pressure(6.6e3),
                       T=40.0 + 273.15, model="ideal")
    assert_shows(metric(at, "New amount of sucrose"), res.number)
    other = solve_target(recipe("maple_glaze_syrup"), "sucrose", Target.vapor_pressure(6.6e3),
                         T=40.0 + 273.15)
    assert abs(other.number - res.number) > 100     # the model choice matters here
    label = next(o for o in at.selectbox(key="tg_property").options if "Vapor" in o)
    assert label == "Vapor pressure at 40 °C (kPa)"


def test_load_adjusted_recipe_into_the_table():
    at = app("chiller_coolant")
    solve_on_page(at, "propylene glycol", "freezing_point", -25.0)
    at.button(key="tg_load").click().run()
    assert not at.exception
    res = solve_target(recipe("chiller_coolant"), "propylene glycol",
                       Target.freezing_point(248.15))
    d = evaluate(res.recipe).to_dict()
    assert_shows(metric(at, "Freezing point"), d["solution"]["freezing_point_C"])
    assert at.session_state["recipe_name"] == "chiller_coolant (adjusted)"
    assert at.session_state["target_request"] is None
    assert any("adjusted recipe loaded" in s.value for s in at.success)


def test_a_solve_is_tied_to_its_recipe():
    at = app("chiller_coolant")
    solve_on_page(at, "propylene glycol", "freezing_point", -25.0)
    at.selectbox(key="demo").select("walkway_deicer").run()
    assert not at.exception
    assert not [m for m in at.metric if m.label.startswith("New amount")]
    assert any("recipe has changed since the last Solve" in i.value for i in at.info)


# ------------------------------------------------------------------ weigh-out
def test_weigh_out_for_5_L_matches_weigh_out():
    at = app("buffered_eye_rinse", wo_size=5.0, wo_unit="L", design_tool="scale")
    d = weigh_out(recipe("buffered_eye_rinse"), parse_batch("5 L")).to_dict()
    sheet = table_with(at, "Weigh (g)")
    assert sheet["Ingredient"].tolist() == [r["ingredient"] for r in d["weigh_out"]]
    for r, (_, row) in zip(d["weigh_out"], sheet.iterrows()):
        assert_shows(row["Weigh (g)"], r["weigh_g"], r["ingredient"])
        assert row["Note"] == plain(r["note"])
    water = d["weigh_out"][-1]
    assert water["solvent"]
    assert_shows(sheet["Volume (mL)"].iloc[-1], water["volume_mL"], "water volume")
    f = d["final"]
    assert_shows(metric(at, "Final mass"), f["mass_g"])
    assert_shows(metric(at, "Final volume at 20 °C"), f["volume_mL"])
    assert_shows(metric(at, "Density at 20 °C"), f["density_g_per_mL"])
    assert_shows(metric(at, "Volume at 25 °C"), f["volume_mL_at_T"])
    # 0.58 % w/v NaCl in 5 L: the batch really applied
    assert d["weigh_out"][0]["weigh_g"] == pytest.approx(29.0, rel=1e-9)


def test_weigh_out_csv_holds_the_library_numbers():
    sheet = weigh_out(recipe("buffered_eye_rinse"), parse_batch("5 L"))
    d = sheet.to_dict()
    rows = list(csv.DictReader(io.StringIO(D.weigh_out_csv(d))))
    body = rows[:len(d["weigh_out"])]
    assert [float(r["weigh_g"]) for r in body] == \
        pytest.approx([r["weigh_g"] for r in d["weigh_out"]], rel=1e-9)
    assert float(body[-1]["volume_mL"]) == pytest.approx(d["weigh_out"][-1]["volume_mL"],
                                                         rel=1e-9)
    # rounded to significant figures: no binary noise such as 9.000000000000004
    assert all(len(re.sub(r"[^0-9]", "", r["weigh_g"]).lstrip("0")) <= 12 for r in body)
    final = rows[len(d["weigh_out"])]
    assert final["item"] == "final solution (expected)"
    assert float(final["volume_mL"]) == pytest.approx(d["final"]["volume_mL"], rel=1e-9)
    assert [r["note"] for r in rows if r["item"] == "caution"] == d["cautions"]


# ------------------------------------------------------------------ dilution
def test_dilution_matches_dilution_plan():
    at = app("chiller_coolant", dl_to_value=20.0, dl_to_unit="% w/w", dl_final_value=1.0,
             dl_final_unit="L", design_tool="dilute")
    at.selectbox(key="dl_ingredient").select("propylene glycol")
    at.button(key="dl_plan").click().run()
    assert not at.exception
    x = dilution_plan(recipe("chiller_coolant"), "propylene glycol", "20.0 % w/w",
                      "1.0 L").to_dict()["dilution"]
    t = table_with(at, "Mass (g)")
    vol = next(c for c in t.columns if c.startswith("Volume (mL"))
    dens = next(c for c in t.columns if c.startswith("Density"))
    for i, part in enumerate(("stock", "diluent", "final")):
        assert_shows(t["Mass (g)"].iloc[i], x[part]["mass_g"], part)
        assert_shows(t[vol].iloc[i], x[part]["volume_mL"], part)
        assert_shows(t[dens].iloc[i], x[part]["density_g_per_mL"], part)
    (mix,) = [i.value for i in at.info if "on mixing" in i.value]
    assert_shows(mix.split("change of", 1)[1], x["volume_change_on_mixing_mL"], "ΔV")
    stock_note = next(c.value for c in at.caption if c.value.startswith("The stock has"))
    assert_shows(stock_note, x["stock_concentration"], "stock concentration")


def test_dilution_above_the_stock_shows_the_library_reason():
    at = app(dl_to_value=2.0, dl_to_unit="% w/v", design_tool="dilute")          # saline 0.9 % w/v stock
    at.button(key="dl_plan").click().run()
    with pytest.raises(TargetError) as exc:
        dilution_plan(recipe("saline_rinse"), "sodium chloride", "2.0 % w/v", "1.0 L")
    assert f"No dilution: {plain(str(exc.value))}" in [e.value for e in at.error]


# ------------------------------------------------------------------ the helpers
def _page_read(name: str, table: pd.DataFrame | None = None):
    table = table if table is not None else frame_from_text(
        (RECIPES / f"{name}.csv").read_text())[0]
    return read_table(table, default_library(), name=name), table


def test_adjusted_recipe_csv_round_trips_through_read_recipe():
    read, table = _page_read("chiller_coolant")
    req = D.TargetRequest("propylene glycol", "freezing_point", -25.0)
    out = D.solve_request(read, table, req, default_library(), Conditions())
    res = solve_target(recipe("chiller_coolant"), "propylene glycol",
                       Target.freezing_point(-25.0 + 273.15))
    text = D.adjusted_recipe_csv(out.rows)
    assert text.splitlines()[0] == "ingredient,amount,unit"
    back = read_recipe(text, default_library())
    # the CSV holds the solved amounts exactly, not to display precision
    assert [(r["ingredient"], r["amount"], r["unit"]) for r in out.d["recipe"]] == \
        [(r.text, r.number if r.number is not None and not r.is_solvent_rule else "balance",
          r.amount.text if not r.is_solvent_rule else "") for r in back.rows]
    assert back.rows[0].number == out.d["varied"]["amount"]
    assert back.rows[0].number == res.number
    fp = evaluate(back).to_dict()["solution"]["freezing_point_C"]
    assert fp == pytest.approx(-25.0, abs=1e-6)
    assert json.loads(D.target_json(out.d))["varied"] == res.to_dict()["varied"]


def test_adjusted_recipe_keeps_inline_columns_and_added_rows():
    table = pd.DataFrame({"ingredient": ["my sugar", "sodium chloride", "water"],
                          "amount": ["1", "0.5", "q.s. to 100"], "unit": ["% w/v", "% w/v", "mL"],
                          "formula": ["C6H12O6", "", ""]})
    read, table = _page_read("inline", table)
    req = D.TargetRequest("Glycerol", "osmolality", 350.0)
    out = D.solve_request(read, table, req, default_library(), Conditions())
    assert out.ok, out.error
    text = D.adjusted_recipe_csv(out.rows)
    assert text.splitlines()[0] == "ingredient,amount,unit,formula"
    back = read_recipe(text, default_library())
    assert [r.text for r in back.rows] == ["my sugar", "sodium chloride", "water", "Glycerol"]
    assert back.rows[0].ingredient.formula == "C6H12O6"
    assert back.rows[-1].number == out.d["varied"]["amount"]
    # and the same rows go into the recipe editor, decimal comma honoured
    df = D.adjusted_table(out.rows, decimal=",")
    assert df.loc[1, "amount"] == "0,5" and df.loc[2, "amount"] == "q.s. to 100"
    assert df.loc[0, "formula"] == "C6H12O6"


def test_adjusted_recipe_csv_neutralises_formula_cells():
    rows = [{"ingredient": "=HYPERLINK(\"x\")", "amount": "1.0", "unit": "g"},
            {"ingredient": "water", "amount": "99.0", "unit": "g"}]
    line = D.adjusted_recipe_csv(rows).splitlines()[1]
    assert next(csv.reader([line]))[0] == "'=HYPERLINK(\"x\")"


def test_make_target_uses_the_library_display_units():
    """°C, mOsm/kg, kPa and g/mL typed on the page become the library's SI targets."""
    t = D.make_target(D.TargetRequest("x", "freezing_point", -25.0))
    assert t.quantity == "freezing_point" and t.value == pytest.approx(248.15, abs=1e-12)
    t = D.make_target(D.TargetRequest("x", "isotonic", 290.0))
    assert t.isotonic and t.value == pytest.approx(0.290, abs=1e-15)
    t = D.make_target(D.TargetRequest("x", "vapor_pressure", 3.0))
    assert t.value == pytest.approx(3000.0, rel=1e-12)
    t = D.make_target(D.TargetRequest("x", "density", 1.05))
    assert t.value == pytest.approx(1050.0, rel=1e-12)
    t = D.make_target(D.TargetRequest("x", "concentration", 0.9, "sodium chloride", "% w/v"))
    assert t.value == pytest.approx(9.0, rel=1e-12) and t.component == "sodium chloride"
    # every property of the library can be asked for on the page
    from solutions.targeting import PROPERTIES
    assert {c.quantity for c in D.TARGET_CHOICES.values()} == set(PROPERTIES)
