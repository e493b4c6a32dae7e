"""Tests of the dashboard (streamlit_app.py) with Streamlit's AppTest, no browser.

Every number the page shows is compared with a direct call of the library under the same
conditions: the shown text, read back as a number, must be the library's value rounded
to the digits shown (never a retyped number).
"""
import re
from pathlib import Path

import pandas as pd
import pytest
from streamlit.testing.v1 import AppTest

from solutions.errors import RecipeError
from solutions.evaluate import evaluate
from solutions.ingredients import default_library, read_library_file
from solutions.recipe import parse_batch, read_recipe
from solutions.report import BASIS_LABELS, PROPERTY_LABELS
from solutions.ui.safe import plain
from solutions.ui.state import EDITOR_KEY, PRESSURE_PRESETS
from solutions.ui.tables import BASES, HEADLINE

ROOT = Path(__file__).resolve().parents[1]
APP = str(ROOT / "streamlit_app.py")
RECIPES = ROOT / "recipes"
TIMEOUT = 120



def result_metrics(at):
    """The headline metrics of the results section (the tool tabs below have their own)."""
    from solutions.properties import PROPERTIES
    labels = {q.label for q in PROPERTIES}
    return [m for m in at.metric if m.label in labels]

def run_app(**state) -> AppTest:
    at = AppTest.from_file(APP, default_timeout=TIMEOUT)
    for k, v in state.items():
        at.session_state[k] = v
    return at.run()


def library_dict(name, T_C=25.0, P_kPa=101.325, model="nonideal", table=None, **kw):
    lib = default_library()
    source = table if table is not None else RECIPES / f"{name}.csv"
    r = read_recipe(source, lib, name=name)
    return evaluate(r, T=T_C + 273.15, P=P_kPa * 1e3, model=model, **kw).to_dict()


_NUM = re.compile(r"[-+]?\d+(?:\.(\d+))?(?:e([-+]?\d+))?")


def assert_shows(text: str, value: float, what: str = ""):
    """``text`` shows ``value`` rounded to the digits in ``text`` (half an ulp of display)."""
    if value is None:
        assert text.strip() in ("—", ""), (what, text)
        return
    m = _NUM.search(text.replace("−", "-"))
    assert m, (what, text)
    shown = float(m.group(0))
    decimals = len(m.group(1) or "")
    exp = int(m.group(2) or 0)
    half_ulp = 0.5 * 10.0 ** (exp - decimals)
    assert abs(shown - value) <= half_ulp * (1 + 1e-9) + 1e-12, (what, text, value)


def property_table(at) -> pd.DataFrame:
    return next(t.value for t in at.table if "Property" in t.value.columns)


def composition_table(at) -> pd.DataFrame:
    return next(t.value for t in at.table if "Ingredient" in t.value.columns)


def check_page_against(at, d):
    """Every property row, every headline metric and every composition cell."""
    s = d["solution"]
    props = property_table(at)
    assert len(props) == len(PROPERTY_LABELS)
    for (key, _, unit), (_, row) in zip(PROPERTY_LABELS, props.iterrows()):
        assert_shows(row["Value"], s[key], key)
        if key in s["dilute_ideal"]:
            assert_shows(row["Dilute ideal"], s["dilute_ideal"][key], "dilute " + key)
        else:
            assert row["Dilute ideal"] == ""
    metrics = {m.label: m.value for m in at.metric}
    for key, label, _ in HEADLINE:
        (value,) = [v for lab, v in metrics.items() if lab.startswith(label)]
        assert_shows(value, s[key], key)
    comp = composition_table(at)
    assert len(comp) == len(d["components"])
    for c, (_, row) in zip(d["components"], comp.iterrows()):
        assert row["Ingredient"].startswith(c["ingredient"])
        for k in at.session_state["bases"]:
            assert_shows(row[BASES[k]], c.get(k), f"{c['ingredient']} {k}")


def test_bases_cover_every_library_basis():
    assert set(BASES) - {"weigh_g"} == {k for k, _, _ in BASIS_LABELS}


def test_default_page_matches_the_library():
    at = run_app()
    assert not at.exception
    check_page_against(at, library_dict("saline_rinse"))
    assert not at.error


def test_demo_temperature_and_model_change_match_the_library():
    at = run_app()
    at.selectbox(key="demo").select("cryo_medium").run()
    at.number_input(key="T_C").set_value(37.0).run()
    at.radio(key="model").set_value("ideal").run()
    assert not at.exception
    d = library_dict("cryo_medium", T_C=37.0, model="ideal")
    check_page_against(at, d)
    props = property_table(at)
    fp = props[props["Property"] == "Freezing point"].iloc[0]
    assert fp["Model"] == "ideal solution"
    # ...and the numbers really moved with the model and temperature
    d0 = library_dict("cryo_medium")
    assert abs(d["solution"]["osmotic_pressure_kPa"] - d0["solution"]["osmotic_pressure_kPa"]) > 1


def test_all_bases_ticked_show_library_values():
    at = run_app()
    at.selectbox(key="demo").select("buffered_eye_rinse").run()
    at.pills(key="bases_pick").set_value(list(BASES)).run()
    assert at.session_state["bases"] == list(BASES)
    check_page_against(at, library_dict("buffered_eye_rinse"))


def test_pressure_preset_sets_the_boiling_point():
    at = run_app()
    name = "Vacuum evaporator (20 kPa)"
    at.selectbox(key="pressure_preset").select(name).run()
    assert at.session_state["P_kPa"] == PRESSURE_PRESETS[name]
    d = library_dict("saline_rinse", P_kPa=PRESSURE_PRESETS[name])
    check_page_against(at, d)
    at.number_input(key="P_kPa").set_value(90.0).run()
    assert at.session_state["pressure_preset"] == "Other pressure…"
    check_page_against(at, library_dict("saline_rinse", P_kPa=90.0))


def test_batch_and_measured_density_reach_the_library():
    at = run_app(use_batch=True, batch_size=5.0, batch_unit="L",
                 use_measured_density=True, rho_measured=1.0050)
    d = library_dict("saline_rinse", batch=parse_batch("5 L"), rho_measured=1005.0)
    check_page_against(at, d)
    assert d["solution"]["density_method"].startswith("measured")
    props = property_table(at)
    assert props[props["Property"] == "Density"]["Model"].item() == d["solution"]["density_method"]
    assert d["components"][0]["weigh_g"] > 40  # 0.9 % w/v of 5 L: the batch really applied


def test_unknown_ingredient_row_is_reported_and_the_rest_computes():
    bad = {"ingredient": "unobtainium chloride", "amount": "5", "unit": "g"}
    at = AppTest.from_file(APP, default_timeout=TIMEOUT)
    at.session_state[EDITOR_KEY] = {"edited_rows": {}, "added_rows": [bad], "deleted_rows": []}
    at.run()
    assert not at.exception
    # the library's own message for that row, numbered as the table shows it (row 3)
    base = pd.read_csv(RECIPES / "saline_rinse.csv", dtype=str)
    table = pd.concat([base, pd.DataFrame([bad])], ignore_index=True)
    with pytest.raises(RecipeError) as exc:
        read_recipe(table, default_library())
    assert exc.value.row == 3 and exc.value.column == "ingredient"
    errors = [e.value for e in at.error]
    assert any(plain(str(exc.value)) in e for e in errors), errors
    assert any("not in the ingredient library" in e for e in errors)
    # the rest of the recipe is evaluated as if the bad row were absent
    check_page_against(at, library_dict("saline_rinse"))
    assert any("without row(s) 3" in i.value for i in at.info)


@pytest.mark.parametrize("unit", ["blorps", "furlong"])
def test_bad_unit_row_is_reported(unit):
    at = AppTest.from_file(APP, default_timeout=TIMEOUT)
    at.session_state[EDITOR_KEY] = {"edited_rows": {0: {"unit": unit}},
                                    "added_rows": [], "deleted_rows": []}
    at.run()
    assert not at.exception
    table = pd.read_csv(RECIPES / "saline_rinse.csv", dtype=str)
    table.loc[0, "unit"] = unit
    with pytest.raises(RecipeError) as exc:
        read_recipe(table, default_library())
    assert exc.value.row == 1 and exc.value.column == "unit"
    assert at.error[0].value == f"Left out of the results — {plain(str(exc.value))}"
    # the only solute is refused: no results for plain water, and the reason
    assert at.error[1].value.startswith("No results: every dissolved ingredient was left out")
    assert not result_metrics(at) and not [t for t in at.table if "Property" in t.value.columns]


def test_recipe_level_error_keeps_the_page_working():
    """A recipe that reads but does not resolve: the library's message, no results, and
    the page still answers the next change."""
    at = run_app()
    at.selectbox(key="demo").select("brine_bath").run()
    edit = {"amount": "q.s. to 100", "unit": "mL"}
    at.session_state[EDITOR_KEY] = {"edited_rows": {2: edit}, "added_rows": [],
                                    "deleted_rows": []}
    at.run()
    assert not at.exception
    table = pd.read_csv(RECIPES / "brine_bath.csv", dtype=str)
    table.loc[2, ["amount", "unit"]] = [edit["amount"], edit["unit"]]
    with pytest.raises(RecipeError) as exc:
        evaluate(read_recipe(table, default_library()))
    assert any(e.value == f"No results: {plain(str(exc.value))}" for e in at.error)
    assert not result_metrics(at)
    at.button(key="reload_demo").click().run()
    check_page_against(at, library_dict("brine_bath"))


def test_paste_block_with_decimal_comma():
    at = run_app()
    at.checkbox(key="decimal_comma").check().run()
    at.text_area(key="paste_text").input(
        "ingredient\tamount\tunit\nsucrose\t12,5\t% w/w\nsodium chloride\t0,45\t% w/w\n"
        "water\tbalance\t").run()
    at.button(key="paste_apply").click().run()
    assert not at.exception
    table = pd.DataFrame({"ingredient": ["sucrose", "sodium chloride", "water"],
                          "amount": ["12.5", "0.45", "balance"], "unit": ["% w/w", "% w/w", ""]})
    check_page_against(at, library_dict("pasted recipe", table=table))


def test_custom_ingredient_form_and_library_file(tmp_path, monkeypatch):
    path = tmp_path / "mine.csv"
    monkeypatch.setenv("SOLUTIONS_USER_LIBRARY", str(path))
    at = run_app()
    at.text_input(key="new_name").input("test osmolyte")
    at.number_input(key="new_molar_mass").set_value(150.0)
    at.number_input(key="new_ions").set_value(1.0)
    at.button(key="FormSubmitter:new_ingredient-Add for this session").click().run()
    assert [r["name"] for r in at.session_state["custom_ingredients"]] == ["test osmolyte"]
    row = {"ingredient": "test osmolyte", "amount": "10", "unit": "g"}
    at.session_state[EDITOR_KEY] = {"edited_rows": {}, "added_rows": [row], "deleted_rows": []}
    at.run()
    assert not at.error
    at.button(key="save_library").click().run()
    saved = read_library_file(path)
    assert [i.name for i in saved] == ["test osmolyte"]
    assert saved[0].M == pytest.approx(0.150, rel=1e-12)
    lib = default_library().with_file(path)
    table = pd.concat([pd.read_csv(RECIPES / "saline_rinse.csv", dtype=str),
                       pd.DataFrame([row])], ignore_index=True)
    d = evaluate(read_recipe(table, lib), T=298.15).to_dict()
    check_page_against(at, d)


def test_invalid_custom_ingredient_shows_the_library_reason():
    at = run_app()
    at.text_input(key="new_name").input("nameless mass")
    at.button(key="FormSubmitter:new_ingredient-Add for this session").click().run()
    assert at.session_state["custom_ingredients"] == []
    assert any("needs a formula or a molar mass" in e.value for e in at.error)


def test_every_caution_is_shown():
    at = run_app()
    at.selectbox(key="demo").select("cryo_medium").run()
    d = library_dict("cryo_medium")
    shown = " ".join(w.value for w in at.warning)
    assert d["cautions"]
    for c in d["cautions"]:
        assert plain(c) in shown


@pytest.mark.parametrize("name", sorted(p.stem for p in RECIPES.glob("*.csv")))
def test_every_demo_recipe_renders(name):
    at = run_app()
    at.selectbox(key="demo").select(name).run()
    assert not at.exception
    check_page_against(at, library_dict(name))
    d = library_dict(name)
    warn_text = " ".join(m.value for m in at.markdown)
    for w in d["warnings"]:
        assert plain(w) in warn_text


# ------------------------------------------------------------------ the page's helpers
def test_frame_from_text_with_and_without_header():
    from solutions.ui.tables import EDITOR_COLUMNS, frame_from_text
    df, notes = frame_from_text("Name\tQty\tUnits\tMW\nfoo\t1\tg\t100\n")
    assert list(df.columns) == EDITOR_COLUMNS and notes == []
    assert df.loc[0, ["ingredient", "amount", "unit", "molar_mass"]].tolist() == \
        ["foo", "1", "g", "100"]
    df, _ = frame_from_text("sucrose\t10\tg\r\nwater\t90\tg\r\n")
    assert df[["ingredient", "amount", "unit"]].values.tolist() == \
        [["sucrose", "10", "g"], ["water", "90", "g"]]
    df, _ = frame_from_text("sucrose;0,5;% w/w\nwater;balance;", decimal_comma=True)
    assert df.loc[0, "amount"] == "0,5" and df.loc[1, "amount"] == "balance"
    _, notes = frame_from_text("ingredient,amount,unit,colour\nsalt,1,g,white")
    assert notes == ["column(s) 'colour' not used"]


def test_frame_from_upload_reads_xlsx(tmp_path):
    from solutions.ui.tables import frame_from_upload
    path = tmp_path / "r.xlsx"
    pd.DataFrame({"ingredient": ["sodium chloride", "water"], "amount": ["0.9", "q.s. to 1000"],
                  "unit": ["% w/v", "mL"]}).to_excel(path, index=False)
    df, _ = frame_from_upload("r.xlsx", path.read_bytes())
    d = library_dict("saline_rinse")
    d2 = evaluate(read_recipe(df, default_library(), name="saline_rinse")).to_dict()
    assert d2["solution"]["freezing_point_C"] == d["solution"]["freezing_point_C"]


def test_read_table_numbers_rows_as_the_table_shows_them():
    from solutions.ui.compute import read_table
    table = pd.DataFrame({"ingredient": ["sucrose", "", "no such thing", "water", "salt"],
                          "amount": ["10", "", "1", "90", "1"],
                          "unit": ["g", "", "g", "g", "parsecs"]})
    read = read_table(table, default_library())
    assert [(p.row, p.column) for p in read.problems] == [(3, "ingredient"), (5, "unit")]
    assert read.problems[0].message.startswith("row 3, 'no such thing', column 'ingredient'")
    assert read.used_rows == [1, 4]
    assert [r["ingredient"] for r in read.written] == ["sucrose", "water"]


def test_sort_cautions_places_every_caution_once():
    from solutions.ui.tables import sort_cautions
    for name in ("walkway_deicer", "cryo_medium", "saline_rinse"):
        d = library_dict(name)
        groups = sort_cautions(d)
        placed = [c for g in groups.values() for c in g]
        assert sorted(placed) == sorted(d["cautions"])
        assert len(groups["vessels"]) == 1
