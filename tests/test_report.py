"""Tests of solutions.report's writers: CSV neutralisation, JSON, the printable HTML report,
the display precision and the linking of warnings to properties."""
import csv
import io
import json
import re
from pathlib import Path

import pytest

from solutions.evaluate import evaluate
from solutions.ingredients import default_library
from solutions.recipe import read_recipe
from solutions.report import (PROPERTY_LABELS, html_report, json_text, property_text,
                              safe_cell, summary_csv, warning_links)

RECIPES = Path(__file__).resolve().parents[1] / "recipes"


@pytest.fixture(scope="module")
def eye_rinse():
    """A demo recipe with warnings and cautions (ideal fallback, Pitzer range)."""
    r = read_recipe(RECIPES / "buffered_eye_rinse.csv", default_library(),
                    name="buffered_eye_rinse")
    return evaluate(r, T=298.15).to_dict()


# ------------------------------------------------------------------ CSV
@pytest.mark.parametrize("text", ["=1+2", "+1", "-1", "@SUM(A1)", "\tx", "\rx",
                                  "=HYPERLINK(\"http://x\",\"y\")"])
def test_safe_cell_neutralises_formula_starts(text):
    assert safe_cell(text) == "'" + text


@pytest.mark.parametrize("value", ["sodium chloride", "", "0.9", "1=1", -0.5, 3, None])
def test_safe_cell_leaves_other_cells(value):
    assert safe_cell(value) == value


def test_summary_csv_neutralises_every_injected_cell(eye_rinse):
    d = json.loads(json.dumps(eye_rinse))
    d["recipe_name"] = "=cmd|' /C calc'!A0"
    d["components"][0]["ingredient"] = "@SUM(1+1)*cmd"
    d["recipe"] = [{"ingredient": "+malicious", "amount": "-2+3", "unit": "=g"}]
    d["warnings"] = ["-danger"]
    rows = list(csv.reader(io.StringIO(summary_csv(d))))
    cells = [c for r in rows for c in r]
    for bad in ("=cmd|' /C calc'!A0", "@SUM(1+1)*cmd", "+malicious", "-2+3", "=g", "-danger"):
        assert bad not in cells
        assert "'" + bad in cells
    assert not [c for c in cells if c[:1] in ("=", "+", "@")]
    # numbers stay numbers: a negative freezing point is written as such, not quoted
    fp = next(r for r in rows if r[0] == "property" and r[2] == "Freezing point")
    assert float(fp[3]) == pytest.approx(d["solution"]["freezing_point_C"], rel=1e-12)


def test_summary_csv_has_every_property_and_the_recipe_rows(eye_rinse):
    d = {**eye_rinse, "recipe": [{"ingredient": "sodium chloride", "amount": "0.66",
                                   "unit": "% w/v"}]}
    rows = list(csv.reader(io.StringIO(summary_csv(d))))
    props = {r[2] for r in rows if r[0] == "property"}
    assert props == {lab for _, lab, _ in PROPERTY_LABELS}
    assert ["recipe row", "sodium chloride", "amount", "0.66", "% w/v", ""] in rows
    assert sum(r[0] == "caution" for r in rows) == len(d["cautions"])


# ------------------------------------------------------------------ JSON
def test_json_text_is_the_command_line_object(eye_rinse):
    from solutions.report import dumps
    assert json_text(eye_rinse) == dumps(eye_rinse)
    back = json.loads(json_text(eye_rinse))
    assert back["solution"]["osmolality_mOsm_per_kg"] == pytest.approx(
        eye_rinse["solution"]["osmolality_mOsm_per_kg"], rel=1e-15)


# ------------------------------------------------------------------ HTML
@pytest.fixture(scope="module")
def html(eye_rinse):
    from solutions import charts as C
    d = {**eye_rinse, "recipe": [{"ingredient": "sodium chloride", "amount": "0.66",
                                   "unit": "% w/v"},
                                  {"ingredient": "water for injection", "amount": "q.s. to 500",
                                   "unit": "mL"}]}
    r = read_recipe(RECIPES / "buffered_eye_rinse.csv", default_library())
    ev = evaluate(r, T=298.15)
    curve = C.concentration_curve(ev.composition, ev.P, ev.model, factors=[0, 1, 2])
    chart = C.concentration_chart(curve, d["solution"]["freezing_point_C"],
                                  d["solution"]["boiling_point_C"])
    return html_report(d, {"Freezing and boiling point against concentration": chart})


def test_html_is_self_contained(html):
    assert html.startswith("<!DOCTYPE html>")
    assert "<script" not in html.lower()
    assert not re.search(r"<link\b", html, re.I)
    assert not re.search(r"""(src|href)\s*=\s*["']?\s*(https?:)?//""", html, re.I)
    assert "@import" not in html
    assert not re.search(r"url\(\s*['\"]?https?://", html, re.I)


def test_html_embeds_the_chart_as_svg(html):
    assert html.count("<svg") == 1
    assert "Concentration factor" in html
    assert "Freezing and boiling point against concentration" in html


def test_html_has_recipe_properties_warnings_cautions_and_tool(html, eye_rinse):
    import html as h
    text = h.unescape(html)
    assert "water for injection" in text and "q.s. to 500" in text
    for key, label, _ in PROPERTY_LABELS:
        if key == "boiling_point_C":
            label += " at 101.325 kPa"
        assert f"<td>{label}</td>" in text, label
    for c in eye_rinse["components"]:
        assert c["ingredient"] in text
    for w in eye_rinse["warnings"]:
        assert w in text
    assert eye_rinse["cautions"]
    for c in eye_rinse["cautions"]:
        assert c in text
    tool = eye_rinse["tool"]
    assert tool["version"] in text and tool["date"] in text
    assert property_text(eye_rinse["solution"], "freezing_point_C") in text
    assert eye_rinse["solution"]["model_description"] in text


def test_html_escapes_recipe_text(eye_rinse):
    d = {**eye_rinse, "recipe_name": "<b>x</b>",
         "recipe": [{"ingredient": "<script>alert(1)</script>", "amount": "1", "unit": "g"}]}
    out = html_report(d)
    assert "<script>" not in out and "&lt;script&gt;" in out


# ------------------------------------------------------------------ display policy
def test_property_text_shows_a_point_to_the_decimals_of_its_shift():
    s = {"freezing_point_C": -16.576, "freezing_point_depression_K": 16.576,
         "boiling_point_C": 100.1171, "boiling_point_elevation_K": 0.1431,
         "density_g_per_mL": 1.003312, "osmolality_mOsm_per_kg": 9137.2,
         "water_activity": None}
    assert property_text(s, "freezing_point_C") == "-16.6"
    assert property_text(s, "freezing_point_depression_K") == "16.6"
    assert property_text(s, "boiling_point_C") == "100.117"
    assert property_text(s, "boiling_point_elevation_K") == "0.143"
    assert property_text(s, "density_g_per_mL") == "1.0033"
    assert property_text(s, "osmolality_mOsm_per_kg") == "9137"
    assert property_text(s, "water_activity") == "—"


def test_warning_links_follow_the_about_tags():
    """Each warning is linked by the ``about`` tag it carries (set where the caveat is made),
    never by reading its text."""
    tags = ["freezing", "boiling", "density", "", "recipe", "freezing", "vapor"]
    d = {"warnings": [f"w{i}" for i in range(1, 8)],
         "warnings_detail": [{"about": t, "kind": "model-range"} for t in tags]}
    links = warning_links(d)
    assert links["freezing_point_C"] == [1, 4, 6]
    assert links["vapor_pressure_kPa"] == [4, 7]
    assert links["boiling_point_elevation_K"] == [2, 4]
    assert links["water_activity"] == [4]
    assert links["density_g_per_mL"] == [3] and links["volume_mL"] == [3]
    assert all(5 not in v for v in links.values())
