"""Dashboard gas section: what the page shows equals a library call; charts are drawn."""
from pathlib import Path

import pytest
from streamlit.testing.v1 import AppTest

from solutions.gas import dissolved_gas
from solutions.recipe import read_recipe
from solutions.ui.gas import (GasInputs, dissolved_chart, gas_answer, result_frame,
                              sealed_chart)

SCRIPT = """
import streamlit as st
from solutions.recipe import read_recipe
from solutions.ui.gas import render_gas
render_gas(st, read_recipe("recipes/saline_rinse.csv"))
"""


def value(frame, quantity):
    return frame.loc[frame["Quantity"] == quantity, "Value"].iloc[0]


@pytest.fixture(scope="module")
def app():
    return AppTest.from_string(SCRIPT, default_timeout=90).run()


def test_page_shows_the_library_result(app):
    assert not app.exception and not app.error
    shown = app.table[0].value
    lib = dissolved_gas(read_recipe("recipes/saline_rinse.csv"), "carbon-dioxide", 277.15,
                        volumes=2.5, headspace_fraction=0.05, warm_to=308.15).to_dict()
    assert value(shown, "Gauge pressure") == f"{lib['gauge_pressure_kPa']:.4g} kPa"
    assert value(shown, "Sealed: pressure at 35 °C") == f"{lib['warm_pressure_kPa']:.4g} kPa"
    assert len(app.get("vega_lite_chart")) == 2
    assert any("burst" in w.value for w in app.warning)


def test_rating_and_air_mode(app):
    app.number_input(key="gas_rating").set_value(100.0).run()
    assert any("exceeds the stated container rating" in w.value for w in app.warning)
    app.radio(key="gas_mode").set_value("air").run()
    app.selectbox(key="gas_gas").set_value("oxygen").run()
    shown = app.table[0].value
    lib = dissolved_gas(read_recipe("recipes/saline_rinse.csv"), "oxygen", 277.15,
                        air=True).to_dict()
    assert value(shown, "Dissolved") == f"{lib['dissolved_mg_per_L']:.4g} mg/L"
    assert len(app.get("vega_lite_chart")) == 1


def test_error_is_shown_not_raised():
    ans = gas_answer(read_recipe("recipes/saline_rinse.csv"),
                     GasInputs(mode="volumes", volumes=40.0))
    assert ans.error and "1000" in ans.error and ans.result is None


def test_answer_and_charts_without_streamlit():
    rec = read_recipe("recipes/saline_rinse.csv")
    ans = gas_answer(rec, GasInputs(rating_kPa_gauge=250.0))
    assert ans.error is None and len(ans.dissolved) > 10 and len(ans.sealed) > 10
    # the curve passes through the result at its own temperature
    row = ans.dissolved.iloc[(ans.dissolved["T_C"] - 4.0).abs().argmin()]
    assert row["volumes"] == pytest.approx(2.5, rel=0.05)
    # pressure rises with temperature along the sealed curve
    g = ans.sealed["gauge_kPa"].tolist()
    assert all(b > a for a, b in zip(g, g[1:]))
    spec1 = dissolved_chart(ans.dissolved, ans.result).to_dict()
    spec2 = sealed_chart(ans.sealed, ans.result).to_dict()
    assert "layer" in spec1 and "layer" in spec2
    assert "rating" in str(spec2)
    assert len(result_frame(ans.result)) == 16


def test_tools_on_the_full_page_are_drawn_only_when_picked():
    """On the whole page, "More tools" draws nothing until a tool is picked; the gas tool
    then shows the library's answer for the page's recipe, and its inputs survive a visit
    to another tool (a tool not drawn would otherwise forget them)."""
    at = AppTest.from_file(str(Path(__file__).resolve().parents[1] / "streamlit_app.py"),
                           default_timeout=120).run()
    assert not at.exception
    charts_without_tools = len(at.get("vega_lite_chart"))
    assert not [n for n in at.number_input if n.key and n.key.startswith("gas_")]
    at.button_group(key="more_tool").set_value("Gas in solution").run()
    assert len(at.get("vega_lite_chart")) == charts_without_tools + 2
    at.number_input(key="gas_rating").set_value(100.0).run()
    assert any("exceeds the stated container rating" in w.value for w in at.warning)
    at.button_group(key="more_tool").set_value("Vapor-pressure fit").run()
    assert not [n for n in at.number_input if n.key and n.key.startswith("gas_")]
    at.button_group(key="more_tool").set_value("Gas in solution").run()
    assert at.number_input(key="gas_rating").value == 100.0
    assert not at.exception
