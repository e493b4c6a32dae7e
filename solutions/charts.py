"""Charts of a recipe's colligative behaviour: curve data from the library, Altair charts.

Two kinds of function, kept apart so the dashboard can cache the data and the report can
re-use the charts:

* ``*_curve`` functions call the library once, vectorized over every point of a curve,
  and return a :class:`Curve` (a tidy DataFrame in display units plus the caveats the
  library raised along the curve);
* ``*_chart`` functions are pure: from curve data and a few numbers of the evaluation
  they build an ``altair`` chart with labelled axes (units) and tooltips.

Charts:

(a) freezing and boiling point against a concentration factor 0–2× of the recipe's
    solutes in the same solvent (:meth:`Composition.concentrated`), the recipe marked;
(b) vapor pressure of the pure solvent and of the solution against temperature, with
    the external pressure as a horizontal rule: each curve crosses it at its boiling
    point;
(c) the same curves as ln p against 1000/T (the Clausius–Clapeyron view, nearly
    straight lines whose slope is −ΔH_vap/R).
"""
from __future__ import annotations

import copy
import functools
import json
import math
from dataclasses import dataclass, field

import altair as alt
import numpy as np
import pandas as pd

from .colligative import P_ATM, colligative, vapor_pressure_pure
from .composition import Composition

__all__ = ["Curve", "FACTORS", "concentration_curve", "vapor_pressure_curve",
           "vapor_pressure_range", "solution_vapor_pressure", "concentration_chart",
           "vapor_pressure_chart", "clausius_clapeyron_chart", "chart_spec", "DataChart", "COLORS"]

#: concentration factors of chart (a): 0 (pure solvent) to 2× the recipe's solutes
FACTORS = np.linspace(0.0, 2.0, 41)
#: temperature at which chart (a)'s compositions are evaluated [K]; what it draws
#: (freezing and boiling points) does not depend on it
T_CURVE = 298.15

#: the dashboard's own palette
COLORS = {"solution": "#9c3d1f", "solvent": "#2b6a8a", "dilute": "#8a8a72",
          "rule": "#555555", "mark": "#111111"}

_MODEL_LABEL = {"nonideal": "non-ideal model", "ideal": "ideal solution",
                "dilute": "dilute ideal"}


@dataclass(frozen=True)
class Curve:
    """Curve data in display units and the library's caveats along it (messages)."""

    data: pd.DataFrame
    notes: tuple[str, ...] = field(default=())

    @functools.cached_property
    def records(self) -> list[dict]:
        """``data`` as JSON records, as the charts carry them (converted once)."""
        return _records(self.data)


def _notes(caveats) -> tuple[str, ...]:
    return tuple(dict.fromkeys(c.message for c in caveats))


# ------------------------------------------------------------------ curve data
def concentration_curve(comp: Composition, P: float, model: str,
                        factors=FACTORS) -> Curve:
    """Freezing point (at 101.325 kPa) and boiling point (at ``P``) against concentration.

    comp : the recipe's composition (N = 1)
    P : external pressure [Pa] for the boiling point
    model : activity model; the dilute-ideal curve is added beside any other model
    factors : multiples of the recipe's solutes in the same solvent mass [1]

    Returns columns ``factor``, ``property`` ("Freezing point" / "Boiling point"),
    ``model`` (label), ``T_C`` [°C] and ``shift_K`` (depression / elevation) [K]; points
    the library cannot follow (NaN, with a caveat) are left out.
    """
    comps = comp.concentrated(factors)
    frames, caveats = [], []
    models = [model] + (["dilute"] if model != "dilute" else [])
    for m in models:
        # freezing and boiling points are found at their own temperatures; the
        # properties at 25 °C that come with them are not drawn
        r = colligative(comps, T_CURVE, P, m)
        caveats.extend(r.caveats)
        label = _MODEL_LABEL.get(r.model, r.model)
        for prop, t, dt in (("Freezing point", r.freezing_point, r.freezing_point_depression),
                            ("Boiling point", r.boiling_point, r.boiling_point_elevation)):
            frames.append(pd.DataFrame({"factor": np.asarray(factors, float), "property": prop,
                                        "model": label, "T_C": np.asarray(t) - 273.15,
                                        "shift_K": np.asarray(dt)}))
    df = pd.concat(frames, ignore_index=True)
    return Curve(df[np.isfinite(df["T_C"])].reset_index(drop=True), _notes(caveats))


def solution_vapor_pressure(comp: Composition, T, model: str = "nonideal"):
    """Vapor pressure of the solvent over the liquid solution [Pa], and caveats.

    comp : one composition (N = 1), evaluated at every temperature of ``T``
    T : temperatures [K], shape (n,)
    model : activity model

    The library's ``vapor_pressure_liquid`` of :func:`solutions.colligative.colligative`
    (p = a(T) · p*(T)) for n copies of the composition at once; over the liquid even
    below the freezing point, as a vapor-pressure curve is drawn. Valid where the
    activity model is (its caveats are returned) and for the solvent's liquid range.
    """
    T = np.atleast_1d(np.asarray(T, dtype=float))
    r = colligative(comp.concentrated(np.ones(T.shape[0])), T, P_ATM, model,
                    with_boiling=False, with_freezing=False)
    return np.asarray(r.vapor_pressure_liquid), list(r.caveats)


def vapor_pressure_range(s: dict) -> tuple[float, float]:
    """Temperature span [K] for charts (b) and (c) from an evaluation's ``solution`` dict.

    From 0 °C, or 5 K below the solution temperature if that is colder (never below
    −40 °C: the curves are of the liquid, supercooled below its freezing point), to 15 K
    above the solution's boiling point at the external pressure, or 10 K above the
    solution temperature if that is hotter (never above 640 K, short of the critical
    point).
    """
    T = s["temperature_C"] + 273.15
    lo = max(min(273.15, T - 5.0), 233.15)
    Tb = s.get("boiling_point_C")
    hi = max((Tb + 273.15 + 15.0) if Tb is not None else T + 40.0, T + 10.0)
    return lo, min(hi, 640.0)


def vapor_pressure_curve(comp: Composition, model: str, T_lo: float, T_hi: float,
                         n: int = 81) -> Curve:
    """Vapor pressure of the pure solvent and of the solution from ``T_lo`` to ``T_hi`` [K].

    Returns columns ``series`` (label), ``T_C`` [°C], ``p_kPa`` [kPa], ``inv_T`` = 1000/T
    [1/K × 1000] and ``ln_p`` = ln(p / kPa), for charts (b) and (c).
    """
    T = np.linspace(T_lo, T_hi, n)
    p_pure, cav_pure = vapor_pressure_pure(comp, T)
    p_sol, cav_sol = solution_vapor_pressure(comp, T, model)
    solvent = comp.solvent.name.lower()
    label_sol = f"solution ({_MODEL_LABEL.get(model, model)})"
    rows = []
    for label, p in ((f"pure {solvent}", np.asarray(p_pure)), (label_sol, np.asarray(p_sol))):
        rows.append(pd.DataFrame({"series": label, "T_C": T - 273.15, "p_kPa": p / 1e3,
                                  "inv_T": 1000.0 / T, "ln_p": np.log(p / 1e3)}))
    df = pd.concat(rows, ignore_index=True)
    df = df[np.isfinite(df["p_kPa"]) & (df["p_kPa"] > 0)].reset_index(drop=True)
    return Curve(df, _notes([*cav_pure, *cav_sol]))


# ------------------------------------------------------------------ charts
# Each chart is built in two parts: its data (small frames, turned into named JSON
# datasets) and its structure (marks, encodings, titles, scales), which depends only on
# a few labels and flags. Building the structure in Altair costs far more than the data
# (hundreds of ms against a few), so it is built once per structure and kept
# (:func:`_structure`); a chart is then that structure with this recipe's datasets.
def _records(df: pd.DataFrame) -> list:
    return json.loads(df.to_json(orient="records", double_precision=15))


def _named(i: int) -> alt.NamedData:
    return alt.NamedData(name=f"set_{i}")


@functools.lru_cache(maxsize=64)
def _structure(kind: str, key: tuple) -> alt.TopLevelMixin:
    """The chart of ``kind`` without data, for the structure ``key`` (see each chart)."""
    return _BUILD[kind](*key)


@dataclass(frozen=True)
class DataChart:
    """A chart of this module: a shared structure (an Altair chart without data, built
    once per structure) and this chart's datasets. ``to_dict``/``to_json`` give the
    Vega-Lite specification as Altair would, data inline."""

    kind: str
    key: tuple
    datasets: dict

    @property
    def structure(self):
        """The Altair chart without data (shared: do not change it)."""
        return _structure(self.kind, self.key)

    def to_dict(self, validate: bool = True) -> dict:
        """The Vega-Lite specification (a new dict). The structure is converted and
        checked against the schema once and kept; ``validate`` is accepted for Altair's
        signature (the check has been made)."""
        spec = copy.deepcopy(_structure_spec(self.kind, self.key))
        spec["datasets"] = {**spec.get("datasets", {}), **self.datasets}
        return spec

    def to_json(self, **kwargs) -> str:
        kwargs.pop("validate", None)
        return json.dumps(self.to_dict(), **kwargs)


def _chart(kind: str, key: tuple, frames: list) -> DataChart:
    """The structure of ``kind``/``key`` with ``frames`` (data frames, or records as
    :attr:`Curve.records` gives them) as its datasets."""
    return DataChart(kind, key, {f"set_{i}": f if isinstance(f, list) else _records(f)
                                 for i, f in enumerate(frames)})


@functools.lru_cache(maxsize=64)
def _structure_spec(kind: str, key: tuple) -> dict:
    """The Vega-Lite specification of a structure, checked against the schema once."""
    return _structure(kind, key).to_dict(validate=True)


def chart_spec(chart) -> dict:
    """A chart's Vega-Lite specification (a new dict, data inline): for a
    :class:`DataChart` its cached structure plus its data, else Altair's ``to_dict``."""
    return chart.to_dict()


def _width(width):
    return "container" if width is None else width


def _concentration_structure(models: tuple, marked: tuple, P_kPa: float, width, height):
    dash_range = [[1, 0], [5, 3]][:len(models)]
    color_range = [COLORS["solution"], COLORS["dilute"]][:len(models)]
    panels, i = [], 0
    for (prop, ttl), has_mark in zip((("Freezing point", "Freezing point at 101.325 kPa"),
                                      ("Boiling point", f"Boiling point at {P_kPa:g} kPa")),
                                     marked):
        shift = "depression" if prop.startswith("Freezing") else "elevation"
        base = alt.Chart(_named(i)).encode(
            x=alt.X("factor:Q", title="Concentration factor (× the recipe's solutes)",
                    scale=alt.Scale(domain=[0, 2])),
            y=alt.Y("T_C:Q", title=f"{prop} (°C)", scale=alt.Scale(zero=False)),
            color=alt.Color("model:N", title="Model",
                            scale=alt.Scale(domain=list(models), range=color_range)),
            strokeDash=alt.StrokeDash("model:N", title="Model",
                                      scale=alt.Scale(domain=list(models), range=dash_range)),
            tooltip=[alt.Tooltip("factor:Q", title="factor (×)", format=".2f"),
                     alt.Tooltip("model:N", title="model"),
                     alt.Tooltip("T_C:Q", title=f"{prop.lower()} (°C)", format=".3f"),
                     alt.Tooltip("shift_K:Q", title=f"{shift} (K)", format=".3f")])
        i += 1
        # invisible points carry the tooltips; the legend shows the lines only
        layer = base.mark_line(strokeWidth=2) + base.mark_point(size=40, opacity=0).encode(
            color=alt.value(COLORS["mark"]), strokeDash=alt.value([1, 0]))
        if has_mark:
            pt = alt.Chart(_named(i)).encode(
                x="factor:Q", y="T_C:Q",
                tooltip=[alt.Tooltip("label:N", title=""),
                         alt.Tooltip("T_C:Q", title=f"{prop.lower()} (°C)", format=".3f")])
            i += 1
            layer = layer + pt.mark_point(size=110, shape="diamond", filled=True,
                                          color=COLORS["mark"]) \
                + pt.mark_text(dx=8, dy=-10, align="left", fontSize=11,
                               color=COLORS["mark"]).encode(text="label:N")
        panels.append(layer.properties(title=ttl, width=_width(width), height=height))
    return alt.hconcat(*panels).resolve_scale(y="independent")


def concentration_chart(curve: Curve, freezing_C: float | None, boiling_C: float | None,
                        P_kPa: float = 101.325, width: int | None = 300,
                        height: int = 260) -> DataChart:
    """Chart (a): freezing point and boiling point against the concentration factor.

    freezing_C, boiling_C : the recipe's own values [°C], marked at factor 1.
    P_kPa : external pressure of the boiling points [kPa], for the title.
    """
    models = tuple(dict.fromkeys(curve.data["model"]))
    frames, marked = [], []
    for prop, value in (("Freezing point", freezing_C), ("Boiling point", boiling_C)):
        frames.append([r for r in curve.records if r["property"] == prop])
        marked.append(value is not None)
        if value is not None:
            frames.append(_marks(factor=1.0, T_C=value, label="this recipe"))
    return _chart("concentration", (models, tuple(marked), float(P_kPa), width, height),
                  frames)


def _boiling_marks_frame(boiling: dict[str, float], P_kPa: float) -> list[dict]:
    return [_mark(series=k, T_C=t, p_kPa=P_kPa, inv_T=1000.0 / (t + 273.15),
                  ln_p=math.log(P_kPa), label=f"boils at {t:.2f} °C")
            for k, t in boiling.items()]


def _mark(**fields) -> dict:
    """One record of a chart's marks (a non-finite number becomes null, as in JSON)."""
    return {k: (None if isinstance(v, float) and not math.isfinite(v) else v)
            for k, v in fields.items()}


def _marks(**fields) -> list[dict]:
    return [_mark(**fields)]


def _boiling_marks(data: alt.NamedData, x: str, y: str):
    return alt.Chart(data).encode(
        x=f"{x}:Q", y=f"{y}:Q",
        tooltip=[alt.Tooltip("series:N", title=""), alt.Tooltip("label:N", title="")])


def _series_scale(series: tuple):
    return alt.Scale(domain=list(series),
                     range=[COLORS["solvent"], COLORS["solution"]][:len(series)])


def _vapor_structure(series: tuple, has_boiling: bool, has_here: bool, width, height):
    base = alt.Chart(_named(0)).encode(
        x=alt.X("T_C:Q", title="Temperature (°C)", scale=alt.Scale(zero=False, nice=False)),
        y=alt.Y("p_kPa:Q", title="Vapor pressure of the solvent (kPa)"),
        color=alt.Color("series:N", title="", scale=_series_scale(series),
                        legend=alt.Legend(orient="top-left")),
        tooltip=[alt.Tooltip("series:N", title=""),
                 alt.Tooltip("T_C:Q", title="temperature (°C)", format=".1f"),
                 alt.Tooltip("p_kPa:Q", title="vapor pressure (kPa)", format=".4g")])
    rule = alt.Chart(_named(1)).encode(y="p_kPa:Q", tooltip=alt.Tooltip("label:N", title=""))
    layer = base.mark_line(strokeWidth=2) \
        + rule.mark_rule(strokeDash=[6, 4], color=COLORS["rule"]) \
        + rule.mark_text(align="left", dx=4, dy=-7, x=4, fontSize=11,
                         color=COLORS["rule"]).encode(text="label:N")
    i = 2
    if has_boiling:
        layer = layer + _boiling_marks(_named(i), "T_C", "p_kPa").mark_point(
            size=80, filled=True, color=COLORS["mark"])
        i += 1
    if has_here:
        hc = alt.Chart(_named(i)).encode(x="T_C:Q", y="p_kPa:Q",
                                         tooltip=alt.Tooltip("label:N", title="this solution"))
        layer = layer + hc.mark_point(size=110, shape="diamond", filled=True,
                                      color=COLORS["mark"]) \
            + hc.mark_text(align="left", dx=8, dy=-8, fontSize=11,
                           color=COLORS["mark"]).encode(text="label:N")
    return layer.properties(title="Vapor pressure and boiling", width=_width(width),
                            height=height)


def vapor_pressure_chart(curve: Curve, P_kPa: float, boiling: dict[str, float] | None = None,
                         at_T: tuple[float, float] | None = None, at_note: str = "",
                         width: int | None = None, height: int = 300) -> DataChart:
    """Chart (b): vapor pressure against temperature, external pressure as a rule.

    P_kPa : external pressure [kPa]
    boiling : ``{series label: boiling point °C}`` to mark where each curve meets the rule
    at_T : (temperature °C, vapor pressure kPa) of the solution as evaluated, marked
    at_note : words added to that mark's label (e.g. "supercooled liquid")
    """
    df = curve.data
    frames = [curve.records, _marks(p_kPa=float(P_kPa),
                                    label=f"external pressure {P_kPa:g} kPa")]
    if boiling:
        frames.append(_boiling_marks_frame(boiling, P_kPa))
    has_here = at_T is not None and all(v is not None for v in at_T)
    if has_here:
        frames.append(_marks(
            T_C=float(at_T[0]), p_kPa=float(at_T[1]),
            label=f"at {at_T[0]:g} °C{f' ({at_note})' if at_note else ''}: "
                  f"{at_T[1]:.4g} kPa"))
    key = (tuple(dict.fromkeys(df["series"])), bool(boiling), has_here, width, height)
    return _chart("vapor", key, frames)


def _clausius_structure(series: tuple, has_boiling: bool, width, height):
    base = alt.Chart(_named(0)).encode(
        x=alt.X("inv_T:Q", title="1000 / T (1/K)", scale=alt.Scale(zero=False, nice=False)),
        y=alt.Y("ln_p:Q", title="ln(p / kPa)", scale=alt.Scale(zero=False)),
        color=alt.Color("series:N", title="", scale=_series_scale(series),
                        legend=alt.Legend(orient="bottom-left")),
        tooltip=[alt.Tooltip("series:N", title=""),
                 alt.Tooltip("T_C:Q", title="temperature (°C)", format=".1f"),
                 alt.Tooltip("inv_T:Q", title="1000/T (1/K)", format=".4f"),
                 alt.Tooltip("p_kPa:Q", title="vapor pressure (kPa)", format=".4g"),
                 alt.Tooltip("ln_p:Q", title="ln(p / kPa)", format=".4f")])
    rule = alt.Chart(_named(1)).encode(y="ln_p:Q", tooltip=alt.Tooltip("label:N", title=""))
    layer = base.mark_line(strokeWidth=2) \
        + rule.mark_rule(strokeDash=[6, 4], color=COLORS["rule"])
    if has_boiling:
        layer = layer + _boiling_marks(_named(2), "inv_T", "ln_p").mark_point(
            size=80, filled=True, color=COLORS["mark"])
    return layer.properties(title="Clausius–Clapeyron view", width=_width(width),
                            height=height)


def clausius_clapeyron_chart(curve: Curve, P_kPa: float,
                             boiling: dict[str, float] | None = None,
                             width: int | None = None, height: int = 300) -> DataChart:
    """Chart (c): ln(p / kPa) against 1000/T, the Clausius–Clapeyron view of chart (b)."""
    df = curve.data
    frames = [curve.records, _marks(ln_p=math.log(P_kPa),
                                    label=f"external pressure {P_kPa:g} kPa")]
    if boiling:
        frames.append(_boiling_marks_frame(boiling, P_kPa))
    key = (tuple(dict.fromkeys(df["series"])), bool(boiling), width, height)
    return _chart("clausius", key, frames)


_BUILD = {"concentration": _concentration_structure, "vapor": _vapor_structure,
          "clausius": _clausius_structure}
