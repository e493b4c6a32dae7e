"""Defects found in the dashboard's first hour of use, each reproduced, then fixed:
design inputs surviving a "no results" state, pasted columns mapped by header name,
no results when every solute is refused, wording that follows the solvent, the product
use choice, and the callbacks on a plain dict.
"""
from pathlib import Path

import pandas as pd
import pytest
from streamlit.testing.v1 import AppTest

from solutions.evaluate import evaluate
from solutions.ingredients import default_library
from solutions.recipe import read_recipe
from solutions.ui import state as S
from solutions.ui.compute import DECIMAL_HINT, Conditions, evaluate_table
from solutions.ui.safe import plain
from solutions.ui.tables import (EDITOR_COLUMNS, activity_label, frame_from_text, headline,
                                 property_frame, solvent_words)

ROOT = Path(__file__).resolve().parents[1]
APP = str(ROOT / "streamlit_app.py")
RECIPES = ROOT / "recipes"
TIMEOUT = 120



def result_metrics(at):
    """The headline metrics of the results section (the tool tabs below have their own)."""
    from solutions.properties import PROPERTIES
    labels = {q.label for q in PROPERTIES}
    return [m for m in at.metric if m.label in labels]

def saline_dict(**kw) -> dict:
    r = read_recipe(RECIPES / "saline_rinse.csv", default_library(), name="saline_rinse")
    return evaluate(r, **kw).to_dict()


# ------------------------------------------------------------------ design inputs survive
def test_design_inputs_survive_a_no_results_state():
    """Clear the table (no results: the design section is not drawn), paste a recipe:
    the batch size and the target value are still what was typed."""
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    at.number_input(key="tg_value_freezing_point").set_value(-12.0).run()
    at.segmented_control(key="design_tool").set_value("scale").run()
    at.number_input(key="wo_size").set_value(7.0).run()
    at.button(key="clear_table").click().run()
    assert any(e.value.startswith("No results") for e in at.error)
    at.text_area(key="paste_text").input("sucrose\t10\tg\nwater\t90\tg").run()
    at.button(key="paste_apply").click().run()
    assert not at.exception
    assert at.session_state["wo_size"] == 7.0
    assert any(m.value.startswith("**Weigh-out sheet for 7 L**") for m in at.markdown)
    at.segmented_control(key="design_tool").set_value("target").run()
    assert at.number_input(key="tg_value_freezing_point").value == -12.0


def test_keep_widget_values_writes_every_kept_key_back():
    state = {"wo_size": 7.0, "tg_value_freezing_point": -12.0, "other": 1}
    writes = []

    class Spy(dict):
        def __setitem__(self, k, v):
            writes.append(k)
            super().__setitem__(k, v)
    spy = Spy(state)
    S.keep_widget_values(spy)
    assert sorted(writes) == ["tg_value_freezing_point", "wo_size"]


# ------------------------------------------------------------------ columns by header
def test_foreign_headers_with_extra_columns_map_by_name():
    text = ("Zutat\tLieferant\tMenge\tEinheit\tCharge\tMolmasse (g/mol)\n"
            "Natriumchlorid-Ersatz\tHarrowgate\t0,9\tg\tL-17\t58,44\n")
    df, notes = frame_from_text(text, decimal_comma=True)
    assert list(df.columns) == EDITOR_COLUMNS
    assert df.loc[0, ["ingredient", "amount", "unit", "molar_mass", "formula"]].tolist() == \
        ["Natriumchlorid-Ersatz", "0,9", "g", "58,44", ""]
    assert notes == ["column(s) 'Lieferant', 'Charge' not used"]


@pytest.mark.parametrize("head", [
    "Ingrédient;Quantité;Unité;Fournisseur",          # fr
    "Ingrediente;Cantidad;Unidad;Proveedor",          # es
    "Ingrediente;Quantità;Unità;Fornitore",           # it
    "Ingrediënt;Hoeveelheid;Eenheid;Leverancier",     # nl
    "Ingrediente;Quantidade;Unidade;Fornecedor",      # pt
    "Name;Qty;UoM;Supplier",                          # en synonyms
])
def test_headers_in_other_languages(head):
    df, notes = frame_from_text(f"{head}\nsucrose;10;g;Harrowgate\nwater;90;g;tap\n")
    assert df[["ingredient", "amount", "unit"]].values.tolist() == \
        [["sucrose", "10", "g"], ["water", "90", "g"]]
    assert df["formula"].tolist() == ["", ""] and len(notes) == 1 and "not used" in notes[0]


def test_headerless_block_with_extra_columns_keeps_only_the_first_three():
    df, notes = frame_from_text("sucrose\t10\tg\tHarrowgate\tL-17\twhite\tbag\t1\t2\n")
    assert df.loc[0, ["ingredient", "amount", "unit", "formula", "molar_mass"]].tolist() == \
        ["sucrose", "10", "g", "", ""]
    assert "no header line" in notes[0] and "add a first line naming the columns" in notes[0]


def test_unrecognisable_header_asks():
    df, notes = frame_from_text("Stoffname X\tWieviel\tMass\nsucrose\t10\tg\n")
    assert (df == "").all().all()
    assert "neither a header the page knows nor an ingredient row" in notes[0]


# ------------------------------------------------------------------ every solute refused
def test_every_solute_refused_gives_no_results_and_the_decimal_comma_hint():
    table = pd.DataFrame({"ingredient": ["sodium chloride", "water"],
                          "amount": ["0,9", "q.s. to 1000"], "unit": ["% w/v", "mL"]})
    page = evaluate_table(table, default_library(), Conditions())
    assert not page.ok and page.read.recipe is None
    assert page.error.endswith(DECIMAL_HINT)
    at = AppTest.from_file(APP, default_timeout=TIMEOUT)
    at.session_state["recipe_table"] = table
    at.run()
    assert not at.exception and not result_metrics(at)
    (no,) = [e.value for e in at.error if e.value.startswith("No results")]
    assert "Numbers use a decimal comma" in no
    # with the box ticked the same table evaluates
    at.checkbox(key="decimal_comma").check().run()
    assert at.metric and not [e for e in at.error if e.value.startswith("No results")]


def test_one_refused_solute_of_two_still_gives_results():
    table = pd.DataFrame({"ingredient": ["sodium chloride", "sucrose", "water"],
                          "amount": ["0,9", "5", "100"], "unit": ["g", "g", "g"]})
    page = evaluate_table(table, default_library(), Conditions())
    assert page.ok and [p.row for p in page.read.problems] == [1]


# ------------------------------------------------------------------ solvent wording
def test_wording_follows_the_solvent():
    d = saline_dict()
    assert headline(d)[3][0] == "Water activity"
    d["solution"]["solvent"] = "Ethanol"
    labels = [h[0] for h in headline(d)] + property_frame(d)["Property"].tolist()
    assert "Solvent activity (Ethanol)" in labels
    assert not any("Water" in lab for lab in labels)
    words = solvent_words(d["solution"])
    assert words == {"solvent": "ethanol", "solid": "solid ethanol", "crystal": ""}
    assert activity_label({"solvent": "Water"}) == "Water activity"


# ------------------------------------------------------------------ product use
def test_technical_use_drops_only_the_tonicity_caution():
    body, tech = saline_dict(), saline_dict(use="technical")
    tags = lambda d: [c["tag"] for c in d["cautions_detail"]]  # noqa: E731
    assert "tonicity" in tags(body) and "tonicity" not in tags(tech)
    assert [t for t in tags(body) if t != "tonicity"] == tags(tech)
    assert tech["conditions"]["use"] == "technical"


def test_product_use_choice_reaches_the_library():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    tonicity = next(c["message"] for c in saline_dict()["cautions_detail"]
                    if c["tag"] == "tonicity")
    assert any(w.value == plain(tonicity) for w in at.warning)
    at.radio(key="use").set_value("technical").run()
    assert not at.exception
    assert not any(w.value == plain(tonicity) for w in at.warning)
    assert S.conditions_from(at.session_state).use == "technical"


# ------------------------------------------------------------------ callbacks on a dict
def test_callbacks_on_a_plain_dict():
    state: dict = {}
    S.init_state(state)
    assert state["recipe_name"] == S.FIRST_DEMO
    S.on_clear(state)
    assert state["demo"] is None and state["recipe_name"] == "my recipe"
    assert len(state["recipe_table"]) == 3
    state["paste_text"] = "sucrose\t10\tg\nwater\t90\tg"
    S.on_paste(state)
    assert state["recipe_table"]["ingredient"].tolist() == ["sucrose", "water"]
    state["paste_text"] = "x" * 300 + "\t1\tg"
    S.on_paste(state)                    # refused: the table stays, the reason is noted
    assert state["recipe_table"]["ingredient"].tolist() == ["sucrose", "water"]
    assert state["load_notes"][0].startswith("the pasted block was not read")
    state["pressure_preset"] = "Vacuum evaporator (20 kPa)"
    S.on_preset(state)
    assert state["P_kPa"] == 20.0
    state["P_kPa"] = 90.0
    S.on_pressure_typed(state)
    assert state["pressure_preset"] == S.CUSTOM_PRESSURE
    state["demo"] = "brine_bath"
    S.on_demo(state)
    assert state["recipe_name"] == "brine_bath"
    state.update(new_name="", new_formula="", new_molar_mass=None, new_density=None,
                 new_ions=1.0)
    S.on_add_ingredient(state)
    assert state["library_message"].startswith("error:")

    class Upload:
        name = "../../etc/recipe.csv"

        def getvalue(self):
            return b"ingredient,amount,unit\nsucrose,5,g\nwater,95,g\n"
    state["upload"] = Upload()
    S.on_upload(state)
    assert state["recipe_name"] == "recipe"
    assert state["recipe_table"]["amount"].tolist() == ["5", "95"]


def test_page_key_is_hashable_and_round_trips_the_table():
    state: dict = {}
    S.init_state(state)
    key = S.page_key(state, state["recipe_table"])
    assert hash(key) == hash(S.page_key(state, state["recipe_table"].copy()))
    assert key.table()[["ingredient", "amount", "unit"]].values.tolist() == \
        state["recipe_table"][["ingredient", "amount", "unit"]].values.tolist()
    state["T_C"] = 30.0
    assert S.page_key(state, state["recipe_table"]) != key


# ------------------------------------------------------------------ exports
def test_csv_export_has_no_float_noise_and_no_none():
    import csv
    import io

    from solutions.report import summary_csv
    d = saline_dict()
    d["components"][0]["mass_g"] = 9.000000000000004
    d["components"][0]["ions"] = None
    d["recipe"] = [{"ingredient": "sodium chloride", "amount": 0.1 + 0.2, "unit": "g"}]
    rows = list(csv.reader(io.StringIO(summary_csv(d))))
    cells = [c for r in rows for c in r]
    assert "9" in cells and "9.000000000000004" not in cells
    assert "0.3" in cells and "0.30000000000000004" not in cells
    assert "None" not in cells and "nan" not in cells


# ------------------------------------------------------------------ chart specifications
def test_cached_chart_specifications_equal_altairs_own_conversion():
    """The page's specification (structure built and schema-checked once, data added)
    is exactly what Altair's validated ``to_dict`` gives for the same chart with its
    data attached."""
    from solutions.charts import chart_spec
    from solutions.ui.compute import chart_curves, page_charts
    page = evaluate_table(pd.read_csv(RECIPES / "chiller_coolant.csv", dtype=str),
                          default_library(), Conditions())
    curves = chart_curves(page.evaluation, page.d)
    for name, chart in page_charts(page, curves).items():
        fresh = chart.structure.copy(deep=True)       # Altair's own chart, data attached
        fresh.datasets = chart.datasets
        assert chart_spec(chart) == fresh.to_dict(validate=True), name
    # a second recipe with the same structure reuses it but carries its own data
    page2 = evaluate_table(pd.read_csv(RECIPES / "brine_bath.csv", dtype=str),
                           default_library(), Conditions())
    c1 = page_charts(page, curves)["vapor"]
    c2 = page_charts(page2, chart_curves(page2.evaluation, page2.d))["vapor"]
    assert chart_spec(c1)["datasets"] != chart_spec(c2)["datasets"]
