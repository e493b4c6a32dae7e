"""Dashboard section "Gas in the formulation": inputs, results and two Altair charts.

:func:`render_gas` draws the section with a Streamlit module passed in (``render_gas(st,
recipe)``); everything it shows comes from :func:`gas_answer`, which calls
:mod:`solutions.gas` and needs no Streamlit (so it is unit-tested). Charts:

* dissolved gas against temperature at the chosen partial pressure (or in air);
* for a sealed container, pressure (absolute and gauge) against the temperature it reaches,
  with the container rating as a rule.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import altair as alt
import numpy as np
import pandas as pd

from ..charts import COLORS
from ..constants import T_ZERO_C
from ..errors import SolutionsError
from .safe import plain

__all__ = ["GasInputs", "GasAnswer", "gas_answer", "dissolved_chart", "sealed_chart",
           "result_frame", "render_gas", "GAS_CHOICES", "MODES"]

#: gases offered first in the picker (the library holds more, see solutions.gas.gases)
GAS_CHOICES = ("carbon-dioxide", "oxygen", "nitrogen", "argon", "helium", "hydrogen")
MODES = {"volumes": "Carbonation (volumes)", "partial-pressure": "Partial pressure",
         "air": "In air"}
#: points per chart curve
N_POINTS = 25


@dataclass(frozen=True)
class GasInputs:
    """What the section's widgets set, in the units they show (°C, kPa)."""

    gas: str = "carbon-dioxide"
    T_C: float = 4.0
    mode: str = "volumes"
    volumes: float = 2.5
    partial_kPa: float = 200.0
    total_kPa: float = 101.325
    sealed: bool = True
    headspace_fraction: float = 0.05
    warm_C: float = 35.0
    trapped_air_kPa: float = 0.0
    rating_kPa_gauge: float | None = None
    ambient_kPa: float = 101.325

    def kwargs(self) -> dict:
        """Keyword arguments of :func:`solutions.gas.dissolved_gas`, in SI."""
        kw = dict(ambient=self.ambient_kPa * 1e3)
        if self.mode == "volumes":
            kw["volumes"] = self.volumes
        elif self.mode == "partial-pressure":
            kw["partial_pressure"] = self.partial_kPa * 1e3
        else:
            kw["air"] = True
            kw["total_pressure"] = self.total_kPa * 1e3
        if self.sealed and self.mode != "air":
            kw.update(headspace_fraction=self.headspace_fraction,
                      warm_to=self.warm_C + T_ZERO_C, trapped_air=self.trapped_air_kPa * 1e3)
        if self.rating_kPa_gauge:
            kw["rating"] = self.rating_kPa_gauge * 1e3
        return kw


@dataclass
class GasAnswer:
    """The section's content: the result dict, the curves, and any error message."""

    result: dict | None = None
    dissolved: pd.DataFrame | None = None
    sealed: pd.DataFrame | None = None
    notes: list[str] = field(default_factory=list)
    error: str | None = None
    chart_errors: list[str] = field(default_factory=list)


def _span(T_C: float, lo: float, hi: float) -> np.ndarray:
    return np.linspace(max(lo, 0.0), hi, N_POINTS) + T_ZERO_C


def gas_answer(recipe, inp: GasInputs) -> GasAnswer:
    """Compute everything the section shows, from the library, for ``recipe``."""
    from ..gas import dissolved_curve, dissolved_gas, get_gas, sealed_pressure_curve
    ans = GasAnswer()
    try:
        from ..recipe import ResolvedRecipe, resolve
        res = recipe if isinstance(recipe, ResolvedRecipe) else resolve(recipe)
        r = dissolved_gas(res, inp.gas, inp.T_C + T_ZERO_C, **inp.kwargs())
    except (SolutionsError, ValueError) as exc:
        ans.error = str(exc)
        return ans
    d = r.to_dict()
    ans.result = d
    g = get_gas(inp.gas)
    t_hi = min(40.0, g.T_max - T_ZERO_C)
    try:
        kw = ({"air": True, "total_pressure": inp.total_kPa * 1e3} if inp.mode == "air"
              else {"partial_pressure": d["partial_pressure_kPa"] * 1e3})
        c = dissolved_curve(res, g.key, _span(inp.T_C, 0.0, t_hi), **kw)
        ans.dissolved = pd.DataFrame({"T_C": c["T_C"], "mg_per_L": c["mg_per_L"],
                                      "volumes": c["volumes"]})
        ans.notes.extend(c["notes"])
    except (SolutionsError, ValueError) as exc:
        ans.chart_errors.append(f"dissolved-gas curve: {exc}")
    if "warm_temperature_C" in d:
        try:
            hi = max(t_hi, inp.warm_C, inp.T_C)
            s = sealed_pressure_curve(
                res, g.key, inp.T_C + T_ZERO_C, _span(inp.T_C, 0.0, hi),
                headspace_fraction=inp.headspace_fraction,
                partial_pressure=d["partial_pressure_kPa"] * 1e3,
                trapped_air=inp.trapped_air_kPa * 1e3, ambient=inp.ambient_kPa * 1e3)
            ans.sealed = pd.DataFrame({"T_C": s["T_C"], "total_kPa": s["total_kPa"],
                                       "gauge_kPa": s["gauge_kPa"]})
            ans.notes.extend(s["notes"])
        except (SolutionsError, ValueError) as exc:
            ans.chart_errors.append(f"sealed-container curve: {exc}")
    ans.notes = [n for n in dict.fromkeys(ans.notes) if n not in d["warnings"]]
    return ans


def result_frame(d: dict) -> pd.DataFrame:
    """The result as a two-column table (quantity, value with unit)."""
    def f(x, unit="", fmt=".4g"):
        return "—" if x is None else f"{format(x, fmt)}{(' ' + unit) if unit else ''}"
    rows = [("Gas", f"{d['gas_name']} ({d['formula']})"),
            ("Temperature", f(d["temperature_C"], "°C")),
            ("Henry's constant in water (IAPWS G7-04)", f(d["henry_constant_GPa"], "GPa")),
            ("Salting-out factor", f(d["salting_out_factor"])),
            ("Partial pressure of the gas", f(d["partial_pressure_kPa"], "kPa")),
            ("Solution vapor pressure", f(d["vapor_pressure_kPa"], "kPa")),
            ("Total pressure", f(d["total_pressure_kPa"], "kPa")),
            ("Gauge pressure", f(d["gauge_pressure_kPa"], "kPa")),
            ("Dissolved", f(d["dissolved_mg_per_L"], "mg/L")),
            ("Dissolved per kg water", f(d["dissolved_mmol_per_kg"], "mmol/kg")),
            ("Dissolved mole fraction", f(d["dissolved_mole_fraction"])),
            ("Volumes (L gas at 0 °C, 101.325 kPa per L)", f(d["volumes"]))]
    if "warm_temperature_C" in d:
        rows += [("Sealed: headspace fraction", f(d["headspace_fraction"])),
                 ("Sealed: pressure at filling", f(d["fill_total_pressure_kPa"], "kPa")),
                 (f"Sealed: pressure at {d['warm_temperature_C']:g} °C",
                  f(d["warm_pressure_kPa"], "kPa")),
                 (f"Sealed: gauge pressure at {d['warm_temperature_C']:g} °C",
                  f(d["warm_gauge_pressure_kPa"], "kPa"))]
    return pd.DataFrame(rows, columns=["Quantity", "Value"])


def dissolved_chart(df: pd.DataFrame, d: dict, width=None, height: int = 260) -> alt.LayerChart:
    """Dissolved gas [mg/L] against temperature [°C], the result marked."""
    p = d["partial_pressure_kPa"]
    ttl = (f"Dissolved {d['formula']} in air at {d['total_pressure_kPa']:.4g} kPa"
           if d["mode"] == "air" else f"Dissolved {d['formula']} at {p:.4g} kPa partial pressure")
    base = alt.Chart(df).encode(
        x=alt.X("T_C:Q", title="Temperature (°C)"),
        y=alt.Y("mg_per_L:Q", title=f"Dissolved {d['formula']} (mg/L)",
                scale=alt.Scale(zero=False)),
        tooltip=[alt.Tooltip("T_C:Q", title="°C", format=".1f"),
                 alt.Tooltip("mg_per_L:Q", title="mg/L", format=".4g"),
                 alt.Tooltip("volumes:Q", title="volumes", format=".3f")])
    mark = pd.DataFrame({"T_C": [d["temperature_C"]], "mg_per_L": [d["dissolved_mg_per_L"]],
                         "label": ["this liquid"]})
    pt = alt.Chart(mark).encode(x="T_C:Q", y="mg_per_L:Q")
    return (base.mark_line(color=COLORS["solution"], strokeWidth=2)
            + base.mark_point(opacity=0, size=40)
            + pt.mark_point(shape="diamond", size=110, filled=True, color=COLORS["mark"])
            + pt.mark_text(dx=8, dy=-10, align="left", fontSize=11,
                           color=COLORS["mark"]).encode(text="label:N")
            ).properties(title=ttl, width="container" if width is None else width,
                         height=height)


def sealed_chart(df: pd.DataFrame, d: dict, width=None, height: int = 260) -> alt.LayerChart:
    """Sealed container: total and gauge pressure [kPa] against temperature reached [°C]."""
    long = df.melt("T_C", ["total_kPa", "gauge_kPa"], "series", "kPa").dropna()
    long["series"] = long["series"].map({"total_kPa": "absolute", "gauge_kPa": "gauge"})
    base = alt.Chart(long).encode(
        x=alt.X("T_C:Q", title="Temperature the container reaches (°C)"),
        y=alt.Y("kPa:Q", title="Pressure (kPa)"),
        color=alt.Color("series:N", title="Pressure",
                        scale=alt.Scale(domain=["absolute", "gauge"],
                                        range=[COLORS["solution"], COLORS["solvent"]])),
        tooltip=[alt.Tooltip("T_C:Q", title="°C", format=".1f"),
                 alt.Tooltip("series:N", title=""),
                 alt.Tooltip("kPa:Q", title="kPa", format=".4g")])
    layer = base.mark_line(strokeWidth=2) + base.mark_point(opacity=0, size=40)
    pts = [("filled", d["temperature_C"], d["fill_total_pressure_kPa"]),
           ("warmed", d["warm_temperature_C"], d["warm_pressure_kPa"])]
    marks = pd.DataFrame([p for p in pts if p[2] is not None], columns=["label", "T_C", "kPa"])
    if len(marks):
        m = alt.Chart(marks).encode(
            x="T_C:Q", y="kPa:Q",
            tooltip=[alt.Tooltip("label:N", title=""),
                     alt.Tooltip("T_C:Q", title="°C", format=".1f"),
                     alt.Tooltip("kPa:Q", title="kPa (absolute)", format=".4g")])
        layer = layer + m.mark_point(shape="diamond", size=110, filled=True,
                                     color=COLORS["mark"]) \
            + m.mark_text(dx=8, dy=-10, align="left", fontSize=11,
                          color=COLORS["mark"]).encode(text="label:N")
    if d.get("rating_kPa_gauge"):
        rule = pd.DataFrame({"kPa": [d["rating_kPa_gauge"]], "label": ["rating (gauge)"]})
        r = alt.Chart(rule).encode(y="kPa:Q")
        layer = layer + r.mark_rule(color=COLORS["rule"], strokeDash=[5, 3]) \
            + r.mark_text(align="left", dx=4, dy=-6, fontSize=11, color=COLORS["rule"]
                          ).encode(text="label:N", x=alt.value(0))
    ttl = (f"Sealed container filled at {d['temperature_C']:g} °C, headspace "
           f"{d['headspace_fraction']:.3g}")
    return layer.properties(title=ttl, width="container" if width is None else width,
                            height=height)


def render_gas(st, recipe, *, key: str = "gas") -> GasAnswer | None:
    """Draw the section for ``recipe`` (a Recipe, or None) with the Streamlit module ``st``."""
    from ..gas import gases
    st.header("Gas in the formulation")
    st.caption("Carbonation, dissolved oxygen and sealed headspaces: Henry's constants of "
               "IAPWS G7-04 (2004) in water, salting-out by the recipe's salts "
               "(Weisenberger & Schumpe 1996), the solution's own vapor pressure and density.")
    if recipe is None:
        st.info("Enter a recipe above to compute dissolved gas.")
        return None
    names = list(GAS_CHOICES) + [k for k in gases() if k not in GAS_CHOICES]
    c1, c2, c3 = st.columns(3)
    gas = c1.selectbox("Gas", names, key=f"{key}_gas",
                       format_func=lambda k: f"{gases()[k].name} ({gases()[k].formula})")
    T_C = c2.number_input("Liquid temperature (°C)", value=4.0, min_value=0.0, max_value=99.0,
                          step=1.0, key=f"{key}_T")
    mode = c3.radio("State the gas as", list(MODES), format_func=MODES.get, key=f"{key}_mode")
    kw = {}
    if mode == "volumes":
        kw["volumes"] = c1.number_input("Carbonation (volumes)", value=2.5, min_value=0.01,
                                        step=0.1, key=f"{key}_vol")
    elif mode == "partial-pressure":
        kw["partial_kPa"] = c1.number_input("Partial pressure (kPa)", value=200.0,
                                            min_value=0.01, step=10.0, key=f"{key}_pp")
    else:
        kw["total_kPa"] = c1.number_input("Total air pressure (kPa)", value=101.325,
                                          min_value=1.0, step=1.0, key=f"{key}_ptot",
                                          help="Lower at altitude, e.g. about 84 kPa at "
                                               "1500 m.")
    ambient = c2.number_input("Ambient pressure (kPa)", value=101.325, min_value=1.0,
                              step=1.0, key=f"{key}_amb")
    sealed = False
    if mode != "air":
        sealed = c3.checkbox("Sealed container", value=True, key=f"{key}_sealed")
    if sealed:
        s1, s2, s3, s4 = st.columns(4)
        kw["headspace_fraction"] = s1.number_input("Headspace fraction", value=0.05,
                                                   min_value=0.001, max_value=0.999,
                                                   step=0.01, format="%.3f", key=f"{key}_fh")
        kw["warm_C"] = s2.number_input("Warms to (°C)", value=35.0, min_value=0.0,
                                       max_value=99.0, step=1.0, key=f"{key}_warm")
        kw["trapped_air_kPa"] = s3.number_input("Air trapped at sealing (kPa)", value=0.0,
                                                min_value=0.0, step=1.0, key=f"{key}_air")
        rating = s4.number_input("Container rating (kPa gauge, 0 = none)", value=0.0,
                                 min_value=0.0, step=50.0, key=f"{key}_rating")
        kw["rating_kPa_gauge"] = rating or None
    inp = GasInputs(gas=gas, T_C=T_C, mode=mode, sealed=sealed, ambient_kPa=ambient, **kw)
    ans = gas_answer(recipe, inp)
    if ans.error:
        st.error(plain(ans.error), icon=":material/error:")
        return ans
    d = ans.result
    st.table(result_frame(d), hide_index=True)
    if d["warnings"]:
        with st.container(border=True):
            st.markdown("**⚠ Warnings**\n" + "".join(f"\n- {plain(w)}" for w in d["warnings"]))
    for c in d["cautions"]:
        st.warning(plain(c), icon=":material/warning:")
    for e in ans.chart_errors:
        st.error(plain(f"Chart not drawn: {e}"), icon=":material/error:")
    cols = st.columns(2, gap="large") if ans.sealed is not None else [st]
    if ans.dissolved is not None:
        cols[0].altair_chart(dissolved_chart(ans.dissolved, d), theme=None,
                             key=f"{key}_chart_dissolved")
    if ans.sealed is not None:
        cols[1].altair_chart(sealed_chart(ans.sealed, d), theme=None,
                             key=f"{key}_chart_sealed")
    if ans.notes:
        with st.expander(f"Model notes along these curves ({len(ans.notes)})"):
            for n in ans.notes:
                st.markdown(f"- {plain(n)}")
    return ans
