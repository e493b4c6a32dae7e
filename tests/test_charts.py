"""Tests of solutions.charts: curve data agree with the library's own point values, and
the charts carry labelled axes, tooltips and the marks they promise."""
import json
from pathlib import Path

import numpy as np
import pytest

from solutions import charts as C
from solutions.colligative import vapor_pressure_pure
from solutions.evaluate import evaluate
from solutions.ingredients import default_library
from solutions.recipe import read_recipe
from solutions.water import saturation_pressure

RECIPES = Path(__file__).resolve().parents[1] / "recipes"


@pytest.fixture(scope="module")
def brine():
    r = read_recipe(RECIPES / "brine_bath.csv", default_library(), name="brine_bath")
    ev = evaluate(r, T=298.15)
    return ev, ev.to_dict()


@pytest.fixture(scope="module")
def conc(brine):
    ev, _ = brine
    return C.concentration_curve(ev.composition, ev.P, ev.model)


@pytest.fixture(scope="module")
def vap(brine):
    ev, d = brine
    lo, hi = C.vapor_pressure_range(d["solution"])
    return C.vapor_pressure_curve(ev.composition, ev.model, lo, hi)


def _spec(chart) -> dict:
    return json.loads(chart.to_json())


def _walk(spec):
    yield spec
    for k in ("layer", "hconcat", "vconcat", "concat"):
        for sub in spec.get(k, []):
            yield from _walk(sub)


def test_concentration_curve_at_factor_one_is_the_recipe(conc, brine):
    _, d = brine
    df = conc.data
    here = df[(df["factor"] == 1.0) & (df["model"] == "non-ideal model")]
    fp = here[here["property"] == "Freezing point"]["T_C"].item()
    bp = here[here["property"] == "Boiling point"]["T_C"].item()
    assert fp == pytest.approx(d["solution"]["freezing_point_C"], abs=1e-6)
    assert bp == pytest.approx(d["solution"]["boiling_point_C"], abs=1e-6)
    dil = df[(df["factor"] == 1.0) & (df["model"] == "dilute ideal")]
    assert dil[dil["property"] == "Freezing point"]["T_C"].item() == pytest.approx(
        d["solution"]["dilute_ideal"]["freezing_point_C"], abs=1e-9)


def test_concentration_curve_starts_at_pure_water_and_is_monotonic(conc):
    """Factor 0 is pure water: freezing at 0 °C (the reporting convention of
    solutions.colligative) and boiling at the normal boiling point on ITS-90,
    373.124 K = 99.974 °C (IAPWS; from memory)."""
    df = conc.data
    fp = df[(df["property"] == "Freezing point") & (df["model"] == "non-ideal model")]
    bp = df[(df["property"] == "Boiling point") & (df["model"] == "non-ideal model")]
    assert fp["T_C"].iloc[0] == pytest.approx(0.0, abs=1e-12)
    assert bp["T_C"].iloc[0] == pytest.approx(99.974, abs=0.0005)
    assert np.all(np.diff(fp["T_C"]) < 0) and np.all(np.diff(bp["T_C"]) > 0)
    assert len(fp) == len(C.FACTORS)


def test_vapor_pressure_curve_pure_solvent_is_the_saturation_line(vap, brine):
    df = vap.data
    pure = df[df["series"] == "pure water"]
    T = pure["T_C"].to_numpy() + 273.15
    warm = T >= 273.16
    np.testing.assert_allclose(pure["p_kPa"].to_numpy()[warm],
                               saturation_pressure(T[warm]) / 1e3, rtol=1e-12)
    assert np.allclose(pure["ln_p"], np.log(pure["p_kPa"]))
    assert np.allclose(pure["inv_T"], 1000.0 / T)


def test_solution_vapor_pressure_matches_the_evaluation(brine):
    ev, d = brine
    p, _ = C.solution_vapor_pressure(ev.composition, np.array([ev.T]), ev.model)
    assert p[0] / 1e3 == pytest.approx(d["solution"]["vapor_pressure_liquid_kPa"], rel=1e-12)


def test_solution_curve_meets_the_external_pressure_at_the_boiling_point(brine):
    ev, d = brine
    Tb = d["solution"]["boiling_point_C"] + 273.15
    p, _ = C.solution_vapor_pressure(ev.composition, np.array([Tb]), ev.model)
    assert p[0] == pytest.approx(ev.P, rel=1e-8)
    p_pure, _ = vapor_pressure_pure(ev.composition, np.array([Tb]))
    assert p_pure[0] > ev.P  # the pure solvent already boils there


def test_vapor_pressure_range_spans_the_boiling_point(brine):
    _, d = brine
    lo, hi = C.vapor_pressure_range(d["solution"])
    assert lo <= 273.15 and hi >= d["solution"]["boiling_point_C"] + 273.15 + 10


def test_concentration_chart_axes_tooltips_and_marker(conc, brine):
    _, d = brine
    spec = _spec(C.concentration_chart(conc, d["solution"]["freezing_point_C"],
                                       d["solution"]["boiling_point_C"]))
    assert len(spec["hconcat"]) == 2
    titles = [u["encoding"]["y"]["title"] for u in _walk(spec)
              if "encoding" in u and "title" in u["encoding"].get("y", {})]
    assert "Freezing point (°C)" in titles and "Boiling point (°C)" in titles
    xt = {u["encoding"]["x"].get("title") for u in _walk(spec) if "encoding" in u}
    assert "Concentration factor (× the recipe's solutes)" in xt
    assert all("tooltip" in u["encoding"] for u in _walk(spec) if "encoding" in u)
    text = json.dumps(spec)
    assert "this recipe" in text


def test_vapor_pressure_chart_has_the_pressure_rule(vap, brine):
    ev, d = brine
    marks = {"pure water": 99.97, "solution (non-ideal model)": d["solution"]["boiling_point_C"]}
    spec = _spec(C.vapor_pressure_chart(vap, 101.325, marks,
                                        (25.0, d["solution"]["vapor_pressure_kPa"])))
    kinds = [u["mark"]["type"] if isinstance(u.get("mark"), dict) else u.get("mark")
             for u in _walk(spec) if "mark" in u]
    assert "rule" in kinds and "line" in kinds
    text = json.dumps(spec)
    assert "Temperature (\\u00b0C)" in text or "Temperature (°C)" in text
    assert "Vapor pressure of the solvent (kPa)" in text
    assert "external pressure 101.325 kPa" in text


def test_clausius_clapeyron_chart_axes(vap):
    spec = _spec(C.clausius_clapeyron_chart(vap, 101.325))
    text = json.dumps(spec)
    assert "1000 / T (1/K)" in text and "ln(p / kPa)" in text


def test_charts_render_to_svg_offline(conc, brine):
    from solutions.report import chart_svg
    _, d = brine
    svg = chart_svg(C.concentration_chart(conc, d["solution"]["freezing_point_C"],
                                          d["solution"]["boiling_point_C"]))
    assert svg.startswith("<svg") and "Concentration factor" in svg
