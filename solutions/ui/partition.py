"""The dashboard's "Preservative in an emulsion" section: one call into
:func:`solutions.partition.distribute` and a chart of each phase's concentration against pH.

:func:`partition_request` and :func:`profile_frame` do the work without Streamlit (testable);
:func:`partition_chart` builds the Altair chart; :func:`render_partition` draws the section with
the Streamlit module it is given (``render_partition(st)``), so the app file only places it.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import altair as alt
import numpy as np
import pandas as pd

from ..errors import SolutionsError, TargetError
from ..partition import DEFAULT_OIL, distribute, oil_relations, partition_data, phase_profile
from .safe import plain

__all__ = ["PartitionOutcome", "preservative_choices", "oil_choices", "partition_request",
           "profile_frame", "partition_chart", "render_partition", "PH_GRID", "PHASE_LABELS"]

#: pH values of the chart
PH_GRID = np.linspace(2.0, 10.0, 81)

PHASE_LABELS = {"water": "Water phase, all forms", "oil": "Oil phase",
                "free_unionized": "Free un-ionized in water"}
_COLORS = ["#2b6a8a", "#9c3d1f", "#3f7d3a"]
_MEASURED = "measured K (type it below)"


def preservative_choices() -> list[str]:
    """Keys of the preservatives that have partition data."""
    return list(partition_data())


def oil_choices() -> list[str]:
    """The oils with an octanol-to-oil relation, plus a measured coefficient."""
    return list(oil_relations()) + [_MEASURED]


@dataclass
class PartitionOutcome:
    """A result dict (``None`` on error), the pH profile frame and an error message."""

    result: dict | None
    profile: pd.DataFrame | None
    error: str = ""
    nearest: float | None = None
    notes: list = field(default_factory=list)


def profile_frame(ingredient: str, phi: float, c_total: float, **kw) -> pd.DataFrame:
    """Long frame (pH, phase, g_per_L) of each phase's concentration against pH [g/L]."""
    prof = phase_profile(ingredient, phi, c_total, PH_GRID, **kw)
    frames = [pd.DataFrame({"pH": prof["pH"], "phase": PHASE_LABELS[k], "g_per_L": prof[k]})
              for k in ("water", "oil", "free_unionized")]
    return pd.concat(frames, ignore_index=True)


def partition_request(ingredient: str, phi: float, total_g_per_L: float, *, pH=None,
                      oil: str = DEFAULT_OIL, K=None, surfactant_g_per_L=None, binding=None,
                      target_free_g_per_L=None) -> PartitionOutcome:
    """One section update: the library's result and profile, or the library's message."""
    kw = dict(K=K if oil == _MEASURED else None, oil=None if oil == _MEASURED else oil,
              surfactant=surfactant_g_per_L, binding=binding)
    try:
        res = distribute(ingredient, phi, total_g_per_L, pH=pH,
                         target_free=target_free_g_per_L, **kw)
        prof = None
        if res.kind != "neutral":
            prof = profile_frame(ingredient, phi, total_g_per_L, **kw)
        return PartitionOutcome(res.to_dict(), prof)
    except TargetError as exc:
        return PartitionOutcome(None, None, f"Target not reachable: {exc.reason}", exc.nearest)
    except SolutionsError as exc:
        return PartitionOutcome(None, None, str(exc))


def partition_chart(frame: pd.DataFrame, pH: float | None = None) -> alt.Chart:
    """Each phase's concentration [g/L] against the water phase's pH; the chosen pH as a rule."""
    base = alt.Chart(frame).mark_line().encode(
        x=alt.X("pH:Q", title="pH of the water phase"),
        y=alt.Y("g_per_L:Q", title="Concentration (g/L of its phase)"),
        color=alt.Color("phase:N", title=None,
                        scale=alt.Scale(domain=list(PHASE_LABELS.values()), range=_COLORS)),
        tooltip=[alt.Tooltip("pH:Q", format=".2f"), "phase:N",
                 alt.Tooltip("g_per_L:Q", title="g/L", format=".4g")])
    chart = base
    if pH is not None:
        rule = alt.Chart(pd.DataFrame({"pH": [pH]})).mark_rule(
            color="#555555", strokeDash=[4, 3]).encode(x="pH:Q")
        chart = base + rule
    return chart.properties(height=300)


def render_partition(st) -> None:
    """Draw the section with the Streamlit module ``st``."""
    st.subheader("Preservative in an emulsion")
    st.caption("Where a preservative goes in an oil-in-water emulsion: into the oil, the water, "
               "and (as the free un-ionized form that acts on microbes) what is left in the "
               "water. Nernst partition of the un-ionized form, ionization by pH, optional "
               "micellar binding.")
    data = partition_data()
    keys = preservative_choices()
    c1, c2, c3 = st.columns(3)
    ing = c1.selectbox("Preservative", keys, format_func=lambda k: data[k].name, key="pt_ing")
    phi = c2.number_input("Oil volume fraction", min_value=0.0, max_value=0.95, value=0.2,
                          step=0.05, key="pt_phi")
    total = c3.number_input("Total (% w/v of emulsion)", min_value=0.0, max_value=50.0,
                            value=0.2, step=0.05, format="%.4f", key="pt_total")
    c4, c5, c6 = st.columns(3)
    use_pH = c4.checkbox("Water phase pH known", value=True, key="pt_use_ph")
    pH = c4.number_input("pH", min_value=0.0, max_value=14.0, value=5.0, step=0.1,
                         key="pt_ph", disabled=not use_pH)
    rels = oil_relations()
    oil = c5.selectbox("Oil", oil_choices(), key="pt_oil",
                       format_func=lambda k: rels[k].label if k in rels else k)
    K = c5.number_input("Measured K oil/water (un-ionized)", min_value=0.0, value=1.0,
                        key="pt_K", disabled=oil != _MEASURED)
    use_bind = c6.checkbox("Micellar binding", value=False, key="pt_use_bind")
    surf = c6.number_input("Surfactant in water (% w/v)", min_value=0.0, value=2.0, step=0.5,
                           key="pt_surf", disabled=not use_bind)
    bind = c6.number_input("Binding constant (per % w/v)", min_value=0.0, value=0.5,
                           key="pt_bind", disabled=not use_bind)
    use_target = st.checkbox("Solve for a target free concentration", key="pt_use_target")
    target = st.number_input("Target free un-ionized in water (% w/v)", min_value=0.0,
                             value=0.05, step=0.01, format="%.4f", key="pt_target",
                             disabled=not use_target)
    out = partition_request(
        ing, phi, total * 10.0, pH=pH if use_pH else None, oil=oil,
        K=K if oil == _MEASURED else None,
        surfactant_g_per_L=surf * 10.0 if use_bind else None,
        binding=bind if use_bind else None,
        target_free_g_per_L=target * 10.0 if use_target else None)
    if out.error:
        st.error(plain(out.error) + (f" (nearest reachable total: {out.nearest:.4g} g/L)"
                              if out.nearest is not None else ""), icon=":material/error:")
        return
    d = out.result

    def g(x):
        return "—" if x is None else f"{x:.4g} g/L"
    m = st.columns(4)
    m[0].metric("Free un-ionized in water", g(d["free_unionized_water_g_per_L"]))
    m[1].metric("Water phase, all forms", g(d["water_phase_g_per_L"]))
    m[2].metric("Oil phase", g(d["oil_phase_g_per_L"]))
    m[3].metric("Fraction in the oil", "—" if d["fraction_in_oil"] is None
                else f"{d['fraction_in_oil']:.3g}")
    if "total_needed_g_per_L" in d:
        st.success(f"Add {d['total_needed_g_per_L']:.4g} g/L ({d['total_needed_g_per_L'] / 10:.4g}"
                   f" % w/v) of {data[ing].name} for {d['target_free_unionized_water_g_per_L']:.4g}"
                   " g/L free un-ionized in the water phase.")
    st.caption(f"K oil/water (un-ionized) {d['partition_coefficient_unionized']:.4g} "
               f"({d['partition_coefficient_source']}); un-ionized fraction "
               f"{d['fraction_unionized']:.4g}; distribution ratio {d['distribution_ratio']:.4g}.")
    for w in d["warnings"]:
        st.warning(plain(w), icon=":material/warning:")
    for c in d["cautions"]:
        st.info(plain(c), icon=":material/health_and_safety:")
    if out.profile is not None:
        st.altair_chart(partition_chart(out.profile, pH if use_pH else None), theme=None,
                        key="chart_partition")
        st.caption("Concentration in each phase against the water phase's pH, at the total and "
                   "oil fraction above (g/L of that phase).")
