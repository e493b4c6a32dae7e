"""The dashboard's "Fit measured vapor pressures" section: one call into
:func:`solutions.vpfit.fit_vapor_pressure` on a pasted or uploaded table, with the
Clausius–Clapeyron plot (fitted line and residuals) and the Antoine curve against the points.

:func:`fit_table` does the work without Streamlit (testable); ``*_chart`` build Altair charts;
:func:`render_vpfit` draws the section with the Streamlit module it is given.
"""
from __future__ import annotations

from dataclasses import dataclass

import altair as alt
import numpy as np
import pandas as pd

from ..constants import T_ZERO_C
from ..errors import SolutionsError
from ..vpfit import antoine_pressure, fit_vapor_pressure, read_vapor_pressure_table
from .safe import plain

__all__ = ["FitOutcome", "example_table", "fit_table", "cc_chart", "antoine_chart",
           "render_vpfit"]


def example_table() -> str:
    """An example table: water between 20 and 100 °C computed from IAPWS-IF97 (5 figures)."""
    from ..water import saturation_pressure
    t = np.array([20.0, 30.0, 40.0, 50.0, 60.0, 70.0, 80.0, 90.0, 100.0])
    p = saturation_pressure(t + T_ZERO_C) / 1e3
    return "temperature_C,pressure_kPa\n" + "".join(f"{a:g},{b:.5g}\n" for a, b in zip(t, p))


@dataclass
class FitOutcome:
    """The fit's result dict and the point frame, or the library's message."""

    result: dict | None
    points: pd.DataFrame | None
    error: str = ""


def fit_table(text: str, at_pressure_kPa: float | None = None) -> FitOutcome:
    """Read and fit a table given as text; errors come back as the library's message."""
    try:
        data = read_vapor_pressure_table(text)
        fit = fit_vapor_pressure(data.T, data.P, rows=data.rows, gauge=data.gauge,
                                 at_pressure=None if at_pressure_kPa is None
                                 else at_pressure_kPa * 1e3)
    except SolutionsError as exc:
        return FitOutcome(None, None, str(exc))
    d = fit.to_dict()
    pts = pd.DataFrame(d["points"])
    pts["inv_T_1000_per_K"] = 1000.0 / (pts["temperature_C"] + T_ZERO_C)
    pts["ln_p_Pa"] = np.log(pts["pressure_kPa"] * 1e3)
    pts["flag"] = np.where(pts["outlier"], "outlier",
                           np.where(pts["over_ice"], "over ice", "point"))
    return FitOutcome(d, pts)


def cc_chart(d: dict, pts: pd.DataFrame) -> alt.VConcatChart:
    """ln p against 1000/T with the fitted line, and the residuals underneath."""
    cc = d["clausius_clapeyron"]
    x = np.linspace(pts["inv_T_1000_per_K"].min(), pts["inv_T_1000_per_K"].max(), 50)
    line = pd.DataFrame({"inv_T_1000_per_K": x,
                         "ln_p_Pa": cc["intercept_ln_Pa"] + cc["slope_K"] * x / 1000.0})
    enc_x = alt.X("inv_T_1000_per_K:Q", title="1000 / T (1/K)", scale=alt.Scale(zero=False))
    color = alt.Color("flag:N", title=None,
                      scale=alt.Scale(domain=["point", "outlier", "over ice"],
                                      range=["#2b6a8a", "#c0392b", "#8a8a72"]))
    top = (alt.Chart(line).mark_line(color="#9c3d1f").encode(
        x=enc_x, y=alt.Y("ln_p_Pa:Q", title="ln(p / Pa)", scale=alt.Scale(zero=False)))
        + alt.Chart(pts).mark_point(filled=True, size=50).encode(
            x=enc_x, y="ln_p_Pa:Q", color=color,
            tooltip=["row:Q", alt.Tooltip("temperature_C:Q", format=".2f"),
                     alt.Tooltip("pressure_kPa:Q", format=".5g")])).properties(height=260)
    bottom = alt.Chart(pts).mark_point(filled=True).encode(
        x=enc_x, y=alt.Y("cc_residual_ln:Q", title="residual, ln p"), color=color,
        tooltip=["row:Q", alt.Tooltip("cc_residual_ln:Q", format=".2e")]).properties(height=120)
    zero = alt.Chart(pd.DataFrame({"y": [0.0]})).mark_rule(color="#555555").encode(y="y:Q")
    return alt.vconcat(top, bottom + zero)


def antoine_chart(d: dict, pts: pd.DataFrame) -> alt.LayerChart | None:
    """The Antoine curve over the data's range against the measured points (p in kPa)."""
    a = d["antoine"]
    if a is None:
        return None
    t = np.linspace(a["T_min_C"], a["T_max_C"], 80)
    curve = pd.DataFrame({"temperature_C": t,
                          "pressure_kPa": antoine_pressure(t + T_ZERO_C, a["A"], a["B"],
                                                           a["C"]) / 1e3})
    x = alt.X("temperature_C:Q", title="Temperature (°C)")
    y = alt.Y("pressure_kPa:Q", title="Vapor pressure (kPa)")
    return (alt.Chart(curve).mark_line(color="#9c3d1f").encode(x=x, y=y)
            + alt.Chart(pts).mark_point(filled=True, size=50, color="#2b6a8a").encode(
                x=x, y=y, tooltip=["row:Q", alt.Tooltip("antoine_residual_log10:Q",
                                                        format=".2e")])).properties(height=300)


def render_vpfit(st) -> None:
    """Draw the section with the Streamlit module ``st``."""
    st.subheader("Fit measured vapor pressures")
    st.caption("Paste or upload (temperature, pressure) pairs with units in the header "
               "(temperature_C, temperature_K or temperature_F; pressure_kPa, pressure_mmHg, "
               "pressure_bar, pressure_psi…). Gives ΔH_vap from a Clausius–Clapeyron fit, an "
               "Antoine fit over the data's range, and boiling points.")
    st.session_state.setdefault("vp_text", example_table())
    up = st.file_uploader("Upload a CSV", type=["csv", "tsv", "txt"], key="vp_upload")
    text = up.getvalue().decode("utf-8-sig") if up is not None else st.text_area(
        "Data", key="vp_text", height=200)
    use_p = st.checkbox("Boiling point at another pressure", key="vp_use_p")
    p_at = st.number_input("Pressure (kPa)", min_value=0.001, value=50.0, key="vp_p",
                           disabled=not use_p)
    out = fit_table(text, p_at if use_p else None)
    if out.error:
        st.error(plain(out.error), icon=":material/error:")
        return
    d = out.result
    m = st.columns(3)
    lo, hi = d["dH_vap_ci95_kJ_per_mol"]
    m[0].metric("ΔH_vap (Clausius–Clapeyron)", f"{d['dH_vap_kJ_per_mol']:.2f} kJ/mol",
                help=f"± {d['dH_vap_stderr_kJ_per_mol']:.2f} (standard error); 95 %: "
                     f"{lo:.2f}…{hi:.2f} kJ/mol")
    nbp = d["normal_boiling_point_C"]
    m[1].metric("Normal boiling point", "—" if nbp is None else f"{nbp:.2f} °C")
    if "boiling_point_at_pressure_C" in d:
        bp = d["boiling_point_at_pressure_C"]
        m[2].metric(f"Boiling point at {d['at_pressure_kPa']:g} kPa",
                    "—" if bp is None else f"{bp:.2f} °C")
    a = d["antoine"]
    if a:
        st.caption(f"Antoine: log10(p/kPa) = {a['A']:.6g} − {a['B']:.6g} / ({a['C']:.6g} + t/°C),"
                   f" valid {a['T_min_C']:.1f}…{a['T_max_C']:.1f} °C. 95 % interval of ΔH_vap "
                   f"{lo:.2f}…{hi:.2f} kJ/mol.")
    for w in d["warnings"]:
        st.warning(plain(w), icon=":material/warning:")
    st.caption(plain(d["notes"][0]))
    c1, c2 = st.columns(2)
    c1.altair_chart(cc_chart(d, out.points), theme=None, key="chart_vp_cc")
    ac = antoine_chart(d, out.points)
    if ac is not None:
        c2.altair_chart(ac, theme=None, key="chart_vp_antoine")
