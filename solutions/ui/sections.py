"""The dashboard's sections, drawn with Streamlit: sidebar, recipe, results, charts,
downloads (the design section is in :mod:`solutions.ui.design_section`).

Each ``render_*`` function draws one section from the page's :class:`~solutions.ui.state.PageKey`
and its cached :class:`~solutions.ui.compute.PageResult`; :func:`guarded` runs a section
so that an unforeseen exception becomes a plain "internal error" message (details go to
the server log, never to the browser) and the other sections still draw. Every text that
holds what a user typed, or a library message that may quote it, goes through
:func:`~solutions.ui.safe.plain` before Streamlit renders it as Markdown.

The cached computations are keyed by one hashable :class:`~solutions.ui.state.PageKey`.
Results are cached with ``st.cache_resource`` (shared, never copied): nothing here
mutates them.
"""
from __future__ import annotations

import dataclasses
import functools
import hashlib
import json
import logging
import threading

import streamlit as st

from .._version import __version__
from ..charts import Curve, vapor_pressure_range
from ..units import LIQUID_DENSITY_G_PER_ML
from ..report import html_report, json_text, property_text, summary_csv
from . import state as S
from .compute import (CAPTIONS, PageResult, below_freezing, chart_specs,
                      concentration_curve_of, evaluate_table, report_charts, report_dict,
                      vapor_curve_of)
from .safe import MAX_CELL_CHARS, MAX_ROWS, max_upload_bytes, plain, plain_frame
from .tables import (BASES, COLUMN_HELP, EDITOR_COLUMNS, composition_frame, headline,
                     property_frame, solvent_words, sort_cautions)

__all__ = ["guarded", "library_for", "page_for", "curves_for", "charts_for", "html_for",
           "frames_for",
           "render_sidebar", "render_recipe", "render_results", "render_charts",
           "render_downloads", "render_tools", "show_table", "USE_OPTIONS"]

_log = logging.getLogger(__name__)

#: the page's "Product use" choice
USE_OPTIONS = {"body": "May meet the body (eye, skin, mouth, injection)",
               "technical": "Technical only (never meets the body)"}


def guarded(section: str, fn, *args, **kwargs):
    """Run ``fn``; an unforeseen exception shows a plain message instead of a traceback
    and returns None. Streamlit's own stop and rerun signals are BaseExceptions and
    pass through."""
    try:
        return fn(*args, **kwargs)
    except Exception:  # noqa: BLE001 - the page must keep working
        _log.exception("dashboard section %r", section)
        st.error(f"Internal error in the {section} section; please report it (with the "
                 "recipe). The rest of the page still works.", icon=":material/error:")
        return None


# ------------------------------------------------------------------ cached library calls
@st.cache_resource(show_spinner=False, max_entries=16)
def library_for(token: str):
    return S.build_library(token)


@st.cache_resource(show_spinner=False, max_entries=256, hash_funcs=S.HASH_FUNCS)
def page_for(key: S.PageKey) -> PageResult:
    lib, _ = library_for(key.token)
    return evaluate_table(key.table(), lib, key.cond, decimal=key.decimal, name=key.name)


def curves_for(key: S.PageKey) -> dict:
    """The curve data of the page's charts (see :func:`~solutions.ui.compute.chart_curves`).
    What they draw does not depend on the solution temperature, so they are cached under
    the page key without it (the vapor curves also under their span): a change of
    temperature redraws the marks only."""
    page = page_for(key)
    if not page.ok:
        return {}
    unheated = dataclasses.replace(key, cond=dataclasses.replace(key.cond, T_C=None))
    lo, hi = vapor_pressure_range(page.d["solution"])
    return {"concentration": _concentration_curve(unheated, page.evaluation),
            "vapor": _vapor_curve(unheated, lo, hi, page.evaluation)}


@st.cache_resource(show_spinner=False, max_entries=128, hash_funcs=S.HASH_FUNCS)
def _concentration_curve(key: S.PageKey, _ev):   # _ev: not hashed, it follows from key
    return concentration_curve_of(_ev)


@st.cache_resource(show_spinner=False, max_entries=128, hash_funcs=S.HASH_FUNCS)
def _vapor_curve(key: S.PageKey, lo: float, hi: float, _ev):
    return vapor_curve_of(_ev, lo, hi)


@st.cache_resource(show_spinner=False, max_entries=128, hash_funcs=S.HASH_FUNCS)
def charts_for(key: S.PageKey) -> dict:
    """The page's charts as Vega-Lite specifications, built once per page key, their
    datasets already in the Arrow form Streamlit sends (it takes bytes as they are, so a
    rerun does not convert the data again)."""
    return {k: _arrow_datasets(spec) for k, spec in
            chart_specs(page_for(key), curves_for(key)).items()}


def _arrow_datasets(spec: dict) -> dict:
    return {**spec, "datasets": {k: _arrow_bytes(_digest(v), v)
                                 for k, v in spec.get("datasets", {}).items()}}


def _digest(records: list) -> str:
    """A digest of a dataset's content; the curves' datasets are the same list objects
    from run to run (:attr:`solutions.charts.Curve.records`), so theirs are kept."""
    known = _DIGESTS.get(id(records))
    if known is not None and known[0] is records:
        return known[1]
    digest = hashlib.blake2b(json.dumps(records).encode(), digest_size=16).hexdigest()
    if len(records) > 4:
        with _DIGESTS_LOCK:   # sessions run in threads of one process
            if len(_DIGESTS) >= 512:
                _DIGESTS.pop(next(iter(_DIGESTS)))
            _DIGESTS[id(records)] = (records, digest)
    return digest


_DIGESTS: dict[int, tuple[list, str]] = {}
_DIGESTS_LOCK = threading.Lock()


@st.cache_resource(show_spinner=False, max_entries=512)
def _arrow_bytes(digest: str, _records: list):
    """One chart dataset in the Arrow form Streamlit sends, keyed by a digest of its
    content: a curve that did not change is not converted again when only the marks
    moved."""
    try:   # Streamlit's own converter; without it the records are sent as they are
        from streamlit.dataframe_util import convert_anything_to_arrow_bytes
    except ImportError:  # pragma: no cover - another Streamlit version
        return _records
    import pandas as pd
    return convert_anything_to_arrow_bytes(pd.DataFrame(_records))


@st.cache_data(show_spinner=False, max_entries=16, hash_funcs=S.HASH_FUNCS)
def html_for(key: S.PageKey) -> str:
    page = page_for(key)
    return html_report(report_dict(page), report_charts(page, curves_for(key)))


@st.cache_resource(show_spinner=False, max_entries=256, hash_funcs=S.HASH_FUNCS)
def frames_for(key: S.PageKey, bases: tuple) -> tuple:
    """The property and composition tables of a page, escaped for display (cached: they
    are rebuilt only when the page or the bases shown change)."""
    d = page_for(key).d
    return plain_frame(property_frame(d)), plain_frame(composition_frame(d, list(bases)))


def show_table(container, df) -> None:
    """``st.table`` of ``df`` with every cell shown as typed (see :func:`plain`)."""
    container.table(plain_frame(df), hide_index=True)


# ------------------------------------------------------------------ sidebar
def render_sidebar() -> None:
    ss = st.session_state
    with st.sidebar:
        st.header("Conditions")
        st.number_input("Solution temperature (°C)", min_value=-60.0, max_value=300.0,
                        step=1.0, key="T_C")
        st.selectbox("External pressure", [*S.PRESSURE_PRESETS, S.CUSTOM_PRESSURE],
                     key="pressure_preset", on_change=S.on_preset, args=(ss,))
        st.number_input("Pressure (kPa)", min_value=1.0, max_value=20000.0, step=1.0,
                        format="%.3f", key="P_kPa", on_change=S.on_pressure_typed, args=(ss,),
                        help="Sets the boiling point; freezing points are at 101.325 kPa.")
        st.radio("Activity model", list(S.MODEL_OPTIONS), format_func=S.MODEL_OPTIONS.get,
                 key="model", help="The dilute-ideal figures are always shown beside the "
                 "others.")
        st.radio("Product use", list(USE_OPTIONS), format_func=USE_OPTIONS.get, key="use",
                 help="A technical-only product (coolant, de-icer, bath) is shown without "
                      "the tonicity caution.")
        st.subheader("Batch")
        st.checkbox("Scale to a batch size", key="use_batch",
                    help="Off: the batch is what the recipe states (1 kg if all rows are "
                         "relative).")
        b1, b2 = st.columns([3, 2])
        b1.number_input("Batch size", min_value=0.001, step=1.0, key="batch_size",
                        disabled=not ss["use_batch"])
        b2.selectbox("Unit", S.BATCH_UNITS, key="batch_unit", disabled=not ss["use_batch"])
        st.subheader("Density and volumes")
        st.checkbox("Use a measured density", key="use_measured_density")
        st.number_input("Measured density (g/mL)", min_value=LIQUID_DENSITY_G_PER_ML[0],
                        max_value=LIQUID_DENSITY_G_PER_ML[1], step=0.001,
                        format="%.4f", key="rho_measured",
                        disabled=not ss["use_measured_density"])
        st.number_input("Recipe volumes read at (°C)", min_value=0.0, max_value=80.0,
                        step=1.0, key="T_prep_C", help="Temperature of the glassware reading "
                        "(q.s. to, % w/v, molarity, mL of a liquid).")
        st.caption(f"solutions {__version__}")


# ------------------------------------------------------------------ recipe
def render_recipe() -> tuple[S.PageKey, PageResult]:
    """The recipe table and its tools; returns the page's key and result."""
    ss = st.session_state
    st.title("Solution workbench")
    st.caption("A recipe in, every concentration basis and the solution's density, "
               "solvent activity, vapor pressure, freezing and boiling points and "
               "osmolality out.")
    st.subheader("Recipe")
    r1, r2, r3, r4 = st.columns([3, 3, 1.2, 1.2], vertical_alignment="bottom")
    r1.text_input("Recipe name", key="recipe_name", max_chars=120)
    r2.selectbox("Demo recipe", list(S.demo_recipes(ss["demo_dir"])), index=None,
                 placeholder="Choose a demo recipe…", key="demo", on_change=S.on_demo,
                 args=(ss,), help="Choosing one loads it into the table.")
    r3.button("Reload demo", key="reload_demo", on_click=S.on_demo, args=(ss,),
              width="stretch", disabled=ss["demo"] is None)
    r4.button("Clear table", key="clear_table", on_click=S.on_clear, args=(ss,),
              width="stretch")
    st.caption("Type in the table, or paste rows copied from a spreadsheet into it (click "
               "a cell, Ctrl+V). Rows are counted from the top, starting at 1.")
    # room for a long ingredient name, with every column still in view
    widths = {"ingredient": 205}   # px
    column_config = {c: st.column_config.TextColumn(COLUMN_HELP[c][0], help=COLUMN_HELP[c][1],
                                                    width=widths.get(c))
                     for c in EDITOR_COLUMNS}
    table = st.data_editor(S.table_or_blank(ss), key=S.EDITOR_KEY, num_rows="dynamic",
                           hide_index=True, column_config=column_config,
                           column_order=EDITOR_COLUMNS)
    st.checkbox("Numbers use a decimal comma (0,9)", key="decimal_comma")
    for note in ss["load_notes"]:
        st.caption(f"Note: {plain(note)}")
    key = S.page_key(ss, table)
    _, library_note = library_for(key.token)
    if library_note:
        st.warning(plain(library_note))
    page = page_for(key)
    for p in page.read.problems:
        st.error(f"Left out of the results — {plain(p.message)}", icon=":material/error:")
    if page.ok:
        for c in sort_cautions(page.d)["ingredients"]:
            st.warning(plain(c), icon=":material/warning:")
    guarded("paste, upload and new ingredient", _render_inputs)
    return key, page


def _render_inputs() -> None:
    ss = st.session_state
    with st.expander("Paste a block, upload a file, or add your own ingredient"):
        t_paste, t_upload, t_new = st.tabs(["Paste a block", "Upload a file",
                                            "New ingredient"])
        with t_paste:
            st.text_area("Rows copied from a spreadsheet (tab-separated) or CSV text",
                         key="paste_text", height=140,
                         placeholder="sodium chloride\t0.9\t% w/v\nwater\tq.s. to 1000\tmL")
            st.button("Put in the table", key="paste_apply", on_click=S.on_paste, args=(ss,))
            st.caption("A first line naming the columns (in English, German, French, "
                       "Spanish, Italian, Dutch or Portuguese) is matched by name and other "
                       "columns are left out; without it the columns are ingredient, "
                       "amount, unit. The decimal-comma box above applies. At most "
                       f"{MAX_ROWS} rows of {MAX_CELL_CHARS} characters a cell.")
        with t_upload:
            st.file_uploader("Recipe file (CSV, TSV or XLSX)",
                             type=["csv", "tsv", "txt", "xlsx"], key="upload",
                             on_change=S.on_upload, args=(ss,),
                             help=f"At most {max_upload_bytes() / 2**20:g} MB.")
        with t_new:
            n1, n2 = st.columns(2)
            with n1, st.form("new_ingredient", clear_on_submit=False):
                st.text_input("Name", key="new_name", max_chars=120)
                st.text_input("Formula (e.g. C6H12O6 or CaCl2(H2O)2)", key="new_formula",
                              max_chars=120)
                st.number_input("or molar mass (g/mol)", min_value=0.0, value=None,
                                key="new_molar_mass")
                st.number_input("Pure density (g/mL), for liquids", min_value=0.0,
                                value=None, key="new_density")
                st.number_input("Ions per formula unit", min_value=1.0, value=1.0, step=1.0,
                                key="new_ions")
                st.form_submit_button("Add for this session", on_click=S.on_add_ingredient,
                                      args=(ss,))
            with n2:
                if ss["custom_ingredients"]:
                    st.markdown("**This session:** " +
                                plain(", ".join(r["name"] for r in ss["custom_ingredients"])))
                st.caption("Your own ingredients are kept in the app's ingredient file and "
                           "loaded whenever it exists.")
                st.button("Save session ingredients to my ingredient file",
                          key="save_library", on_click=S.on_save_library, args=(ss,),
                          disabled=not ss["custom_ingredients"])
                msg = ss["library_message"]
                if msg.startswith("error"):
                    st.error(plain(msg))
                elif msg:
                    st.success(plain(msg))


# ------------------------------------------------------------------ results
def render_results(key: S.PageKey, page: PageResult) -> bool:
    """Headline figures, properties, composition and cautions; False when there are no
    results (the sections that build on them are then left out)."""
    ss = st.session_state
    st.divider()
    st.header("Results")
    if not page.ok:
        st.error(f"No results: {plain(page.error)}", icon=":material/error:")
        return False
    d = page.d
    s = d["solution"]
    words = solvent_words(s)
    if page.read.problems:
        left_out = ", ".join(str(p.row) for p in page.read.problems)
        st.info(f"These results are for the recipe without row(s) {left_out}.")
    st.caption(plain(f"{d['recipe_name'] or 'Recipe'} at {s['temperature_C']:g} °C and "
                     f"{s['pressure_kPa']:g} kPa — model: {s['model_description']}. Density "
                     f"from {s['density_method']}."))
    heads = headline(d)
    for col, (label, value, helptext) in zip(st.columns(len(heads)), heads):
        col.metric(plain(label), plain(value), help=plain(helptext), border=True)
    st.subheader("Solution properties")
    props, comp = frames_for(key, tuple(ss["bases"]))
    st.table(props, hide_index=True)
    if d["warnings"]:
        with st.container(border=True):
            st.markdown("**Warnings** (numbered as in the Warnings column)")
            for i, w in enumerate(d["warnings"], start=1):
                st.markdown(f"⚠ **{i}.** {plain(w)}")
    st.subheader("Composition")
    # the widget's own key is dropped on runs that stop before it; "bases" keeps the choice
    st.pills("Bases shown", list(BASES), format_func=BASES.get, selection_mode="multi",
             default=ss["bases"], key="bases_pick", on_change=S.on_bases, args=(ss,))
    st.table(comp, hide_index=True)
    st.caption("Masses are as weighed (a hydrate with its water); amounts and molalities in "
               f"moles of the ingredient; the solvent row counts the {words['solvent']} "
               "added, while molalities are per kg of all "
               f"{words['solvent']}{words['crystal']}.")
    for c in sort_cautions(d)["results"]:
        st.warning(plain(c), icon=":material/warning:")
    return True


# ------------------------------------------------------------------ charts
def render_charts(key: S.PageKey, page: PageResult) -> None:
    st.divider()
    st.header("Charts")
    d = page.d
    s = d["solution"]
    curves = curves_for(key)
    charts = charts_for(key)
    for name in ("concentration", "vapor"):
        if isinstance(curves.get(name), str):
            st.error(f"Chart not drawn: {plain(curves[name])}", icon=":material/error:")
    if "concentration" in charts:
        st.vega_lite_chart(charts["concentration"], theme=None, key="chart_concentration")
        st.caption(CAPTIONS["concentration"] + ".")
        _notes("Model notes along these curves", curves["concentration"])
    if "vapor" in charts:
        cb, cc = st.columns(2, gap="large")
        cb.vega_lite_chart(charts["vapor"], theme=None, key="chart_vapor")
        over_solid = (f" over {solvent_words(s)['solid']}, the stable phase at this "
                      "temperature (the curve is the supercooled liquid's); the liquid's is"
                      if below_freezing(s) else ",")
        cb.caption(f"{CAPTIONS['vapor']}. At {s['temperature_C']:g} °C the solution's vapor "
                   f"pressure is {property_text(s, 'vapor_pressure_kPa')} kPa{over_solid} "
                   f"{property_text(s, 'vapor_pressure_lowering_kPa')} kPa below the pure "
                   "solvent's.")
        cc.vega_lite_chart(charts["clausius"], theme=None, key="chart_cc")
        cc.caption(CAPTIONS["clausius"] + ".")
        for c in sort_cautions(d)["vessels"]:
            st.warning(plain(c), icon=":material/warning:")
        _notes("Model notes along the vapor-pressure curves", curves["vapor"])


def _notes(title: str, curve) -> None:
    notes = curve.notes if isinstance(curve, Curve) else []
    if notes:
        with st.expander(f"{title} ({len(notes)})"):
            for n in notes:
                st.markdown(f"- {plain(n)}")


# ------------------------------------------------------------------ downloads
def file_stem(name: str | None) -> str:
    """A file name stem from a recipe name: letters, digits, - and _ only."""
    stem = "".join(ch if ch.isalnum() or ch in "-_" else "_" for ch in (name or "recipe"))
    return stem[:80] or "recipe"


def render_downloads(key: S.PageKey, page: PageResult) -> None:
    st.divider()
    st.header("Downloads")
    stem = file_stem(page.d["recipe_name"])
    rd = report_dict(page)
    d1, d2, d3 = st.columns(3)
    d1.download_button("Summary table (CSV)", summary_csv(rd), file_name=f"{stem}.csv",
                       mime="text/csv", key="dl_csv", on_click="ignore")
    d2.download_button("Full result (JSON)", json_text(page.d), file_name=f"{stem}.json",
                       mime="application/json", key="dl_json", on_click="ignore")
    d3.download_button("Printable report (HTML)",
                       # built on click, outside this run: bind the key now
                       functools.partial(html_for, key),
                       file_name=f"{stem}.html", mime="text/html", key="dl_html",
                       on_click="ignore")
    st.caption("The JSON is the object `python -m solutions evaluate --json` prints. The "
               "HTML report holds the recipe, conditions, every basis, every property with "
               "its model and warnings, the cautions and the charts, and opens offline.")


# ------------------------------------------------------------------ other tools
#: (tab title, module under solutions.ui, function): sections drawn by their own modules
def render_tools(page: PageResult | None = None) -> None:
    """The tools below the recipe, one at a time: only the tool the user picks is drawn
    (and computed), so a rerun of the recipe does no work for tools nobody opened. A tool
    that fails shows a plain message. A tool that works on the recipe (its function takes
    ``recipe``) gets the page's recipe."""
    import importlib
    import inspect
    found = {}
    for title, mod, fn, _ in S.TOOLS:
        try:
            found[title] = getattr(importlib.import_module(f"solutions.ui.{mod}"), fn)
        except (ImportError, AttributeError):
            continue
    if not found:
        return
    st.divider()
    st.header("More tools")
    title = st.segmented_control("Tool", list(found), key="more_tool",
                                 label_visibility="collapsed")
    if title is None:
        st.caption("Choose a tool above: the gas a solution holds and the pressure of a "
                   "sealed container, how a preservative splits between oil and water, or "
                   "a fit of measured vapor pressures.")
        return
    fn = found[title]
    recipe = page.read.recipe if page is not None and page.read is not None else None
    if "recipe" in inspect.signature(fn).parameters:
        guarded(title, fn, st, recipe)
    else:
        guarded(title, fn, st)
