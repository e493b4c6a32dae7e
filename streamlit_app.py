"""Solution workbench in the browser: ``streamlit run streamlit_app.py``.

Widgets, layout and calls into ``solutions`` only; every number comes from the library
(:mod:`solutions.ui.compute` → :func:`solutions.evaluate.evaluate`,
:mod:`solutions.charts`) and is formatted by :mod:`solutions.report`.
"""
from __future__ import annotations

import dataclasses
import functools
from pathlib import Path

import streamlit as st

from solutions import __version__
from solutions.errors import SolutionsError
from solutions.ingredients import write_library_file
from solutions.report import html_report, json_text, property_text, summary_csv
from solutions.ui import design as D
from solutions.ui import state as S
from solutions.ui.compute import (CAPTIONS, Conditions, below_freezing, chart_curves,
                                  evaluate_table,
                                  page_charts, report_charts, report_dict)
from solutions.ui.tables import (BASES, COLUMN_HELP, EDITOR_COLUMNS, blank_table,
                                 composition_frame, frame_from_text, frame_from_upload,
                                 headline, property_frame, sort_cautions)

HERE = Path(__file__).resolve().parent

st.set_page_config(page_title="Solution workbench", layout="wide")
st.session_state.setdefault("demo_dir", str(HERE / "recipes"))
S.init_state(st.session_state)
ss = st.session_state


# ------------------------------------------------------------------ cached library calls
@st.cache_resource(show_spinner=False)
def library_for(token: str):
    return S.build_library(token)


@st.cache_data(show_spinner=False, max_entries=128)
def page_for(table, token: str, cond: tuple, decimal: str, name: str):
    lib, _ = library_for(token)
    return evaluate_table(table, lib, Conditions(*cond), decimal=decimal, name=name)


@st.cache_data(show_spinner=False, max_entries=64)
def curves_for(table, token: str, cond: tuple, decimal: str, name: str):
    page = page_for(table, token, cond, decimal, name)
    return chart_curves(page.evaluation, page.d)


@st.cache_data(show_spinner=False, max_entries=16)
def html_for(table, token: str, cond: tuple, decimal: str, name: str) -> str:
    page = page_for(table, token, cond, decimal, name)
    curves = curves_for(table, token, cond, decimal, name)
    return html_report(report_dict(page), report_charts(page, curves))


@st.cache_data(show_spinner=False, max_entries=32)
def target_for(table, token: str, cond: tuple, decimal: str, name: str, req: tuple):
    page = page_for(table, token, cond, decimal, name)
    lib, _ = library_for(token)
    return D.solve_request(page.read, table, D.TargetRequest(*req), lib, Conditions(*cond))


@st.cache_data(show_spinner=False, max_entries=32)
def weigh_for(table, token: str, cond: tuple, decimal: str, name: str, batch_text: str):
    page = page_for(table, token, cond, decimal, name)
    return D.weigh_out_sheet(page.read, batch_text, Conditions(*cond))


@st.cache_data(show_spinner=False, max_entries=32)
def dilution_for(table, token: str, cond: tuple, decimal: str, name: str, req: tuple):
    page = page_for(table, token, cond, decimal, name)
    lib, _ = library_for(token)
    return D.plan_dilution(page.read, D.DilutionRequest(*req), lib, Conditions(*cond))


# ------------------------------------------------------------------ callbacks
def on_demo():
    if ss["demo"] is not None:
        S.load_demo(ss, ss["demo"])


def on_clear():
    ss["demo"] = None  # the table is no longer a demo
    ss["recipe_table"] = blank_table(3)
    ss["recipe_name"] = "my recipe"
    ss["load_notes"] = []
    ss.pop(S.EDITOR_KEY, None)


def on_paste():
    ss["demo"] = None  # the table is no longer a demo
    df, notes = frame_from_text(ss["paste_text"], decimal_comma=ss["decimal_comma"])
    ss["recipe_table"], ss["load_notes"] = df, notes
    ss["recipe_name"] = "pasted recipe"
    ss.pop(S.EDITOR_KEY, None)


def on_upload():
    f = ss.get("upload")
    if f is None:
        return
    try:
        df, notes = frame_from_upload(f.name, f.getvalue(), decimal_comma=ss["decimal_comma"])
    except (ValueError, UnicodeDecodeError, OSError) as exc:
        ss["load_notes"] = [f"cannot read {f.name}: {exc}"]
        return
    ss["recipe_table"], ss["load_notes"] = df, notes
    ss["recipe_name"] = Path(f.name).stem
    ss["demo"] = None
    ss.pop(S.EDITOR_KEY, None)


def on_solve(key: str):
    ss["target_request"] = (dataclasses.astuple(D.request_from(ss)), key)
    ss["design_message"] = ""


def on_plan_dilution(key: str):
    ss["dilution_request"] = (dataclasses.astuple(D.dilution_request_from(ss)), key)


def on_load_adjusted(frame, name: str, note: str):
    ss["demo"] = None  # the table is no longer a demo
    ss["recipe_table"] = frame
    ss["recipe_name"] = name
    ss["load_notes"] = [note]
    ss["target_request"] = None
    ss["design_message"] = note
    ss.pop(S.EDITOR_KEY, None)


def on_bases():
    ss["bases"] = list(ss["bases_pick"])


def on_preset():
    if ss["pressure_preset"] in S.PRESSURE_PRESETS:
        ss["P_kPa"] = S.PRESSURE_PRESETS[ss["pressure_preset"]]


def on_pressure_typed():
    match = [k for k, v in S.PRESSURE_PRESETS.items() if abs(v - ss["P_kPa"]) < 1e-9]
    ss["pressure_preset"] = match[0] if match else S.CUSTOM_PRESSURE


def on_add_ingredient():
    try:
        rec = S.custom_ingredient(ss["new_name"], ss["new_formula"], ss["new_molar_mass"],
                                  ss["new_density"], ss["new_ions"])
    except SolutionsError as exc:
        ss["library_message"] = f"error: {exc}"
        return
    others = [r for r in ss["custom_ingredients"] if r["name"].lower() != rec["name"].lower()]
    ss["custom_ingredients"] = [*others, rec]
    ss["library_message"] = f"added {rec['name']!r} for this session"


def on_save_library():
    path = Path(str(ss["library_path"])).expanduser()
    try:
        write_library_file(path, S.session_ingredients(ss))
    except (SolutionsError, OSError) as exc:
        ss["library_message"] = f"error: could not save to {path}: {exc}"
        return
    ss["library_message"] = f"saved {len(ss['custom_ingredients'])} ingredient(s) to {path}"


# ------------------------------------------------------------------ sidebar: conditions
with st.sidebar:
    st.header("Conditions")
    st.number_input("Solution temperature (°C)", min_value=-60.0, max_value=300.0, step=1.0,
                    key="T_C")
    st.selectbox("External pressure", [*S.PRESSURE_PRESETS, S.CUSTOM_PRESSURE],
                 key="pressure_preset", on_change=on_preset)
    st.number_input("Pressure (kPa)", min_value=1.0, max_value=20000.0, step=1.0,
                    format="%.3f", key="P_kPa", on_change=on_pressure_typed,
                    help="Sets the boiling point; freezing points are at 101.325 kPa.")
    st.radio("Activity model", list(S.MODEL_OPTIONS), format_func=S.MODEL_OPTIONS.get,
             key="model", help="The dilute-ideal figures are always shown beside the others.")
    st.subheader("Batch")
    st.checkbox("Scale to a batch size", key="use_batch",
                help="Off: the batch is what the recipe states (1 kg if all rows are relative).")
    b1, b2 = st.columns([3, 2])
    b1.number_input("Batch size", min_value=0.001, step=1.0, key="batch_size",
                    disabled=not ss["use_batch"])
    b2.selectbox("Unit", S.BATCH_UNITS, key="batch_unit", disabled=not ss["use_batch"])
    st.subheader("Density and volumes")
    st.checkbox("Use a measured density", key="use_measured_density")
    st.number_input("Measured density (g/mL)", min_value=0.5, max_value=3.0, step=0.001,
                    format="%.4f", key="rho_measured", disabled=not ss["use_measured_density"])
    st.number_input("Recipe volumes read at (°C)", min_value=0.0, max_value=80.0, step=1.0,
                    key="T_prep_C", help="Temperature of the glassware reading (q.s. to, "
                    "% w/v, molarity, mL of a liquid).")
    st.caption(f"solutions {__version__}")

cond = S.conditions_from(ss)
cond_t = dataclasses.astuple(cond)
token = S.library_token(ss)
library, library_note = library_for(token)
decimal = "," if ss["decimal_comma"] else "."

# ------------------------------------------------------------------ recipe
st.title("Solution workbench")
st.caption("A recipe in, every concentration basis and the solution's density, water "
           "activity, vapor pressure, freezing and boiling points and osmolality out.")

st.subheader("Recipe")
r1, r2, r3, r4 = st.columns([3, 3, 1.2, 1.2], vertical_alignment="bottom")
r1.text_input("Recipe name", key="recipe_name")
r2.selectbox("Demo recipe", list(S.demo_recipes(ss["demo_dir"])), index=None,
             placeholder="Choose a demo recipe…", key="demo", on_change=on_demo,
             help="Choosing one loads it into the table.")
r3.button("Reload demo", key="reload_demo", on_click=on_demo, width="stretch",
          disabled=ss["demo"] is None)
r4.button("Clear table", key="clear_table", on_click=on_clear, width="stretch")
st.caption("Type in the table, or paste rows copied from a spreadsheet into it (click a "
           "cell, Ctrl+V). Rows are counted from the top, starting at 1.")
column_config = {c: st.column_config.TextColumn(COLUMN_HELP[c][0], help=COLUMN_HELP[c][1])
                 for c in EDITOR_COLUMNS}
table = st.data_editor(S.table_or_blank(ss), key=S.EDITOR_KEY, num_rows="dynamic",
                       hide_index=True, column_config=column_config,
                       column_order=EDITOR_COLUMNS)
st.checkbox("Numbers use a decimal comma (0,9)", key="decimal_comma")
for note in ss["load_notes"]:
    st.caption(f"Note: {note}")
if library_note:
    st.warning(library_note)

page = page_for(table, token, cond_t, decimal, ss["recipe_name"])

for p in page.read.problems:
    st.error(f"Left out of the results — {p.message}", icon=":material/error:")
cautions = sort_cautions(page.d) if page.ok else {"ingredients": [], "results": [],
                                                   "vessels": []}
for c in cautions["ingredients"]:
    st.warning(c, icon=":material/warning:")

with st.expander("Paste a block, upload a file, or add your own ingredient"):
    t_paste, t_upload, t_new = st.tabs(["Paste a block", "Upload a file", "New ingredient"])
    with t_paste:
        st.text_area("Rows copied from a spreadsheet (tab-separated) or CSV text",
                     key="paste_text", height=140,
                     placeholder="sodium chloride\t0.9\t% w/v\nwater\tq.s. to 1000\tmL")
        st.button("Put in the table", key="paste_apply", on_click=on_paste)
        st.caption("A first line naming the columns is used as the header; without it the "
                   "columns are ingredient, amount, unit, then the optional ones. The "
                   "decimal-comma box above applies.")
    with t_upload:
        st.file_uploader("Recipe file (CSV, TSV or XLSX)", type=["csv", "tsv", "txt", "xlsx"],
                         key="upload", on_change=on_upload)
    with t_new:
        n1, n2 = st.columns(2)
        with n1, st.form("new_ingredient", clear_on_submit=False):
            st.text_input("Name", key="new_name")
            st.text_input("Formula (e.g. C6H12O6 or CaCl2(H2O)2)", key="new_formula")
            st.number_input("or molar mass (g/mol)", min_value=0.0, value=None,
                            key="new_molar_mass")
            st.number_input("Pure density (g/mL), for liquids", min_value=0.0, value=None,
                            key="new_density")
            st.number_input("Ions per formula unit", min_value=1.0, value=1.0, step=1.0,
                            key="new_ions")
            st.form_submit_button("Add for this session", on_click=on_add_ingredient)
        with n2:
            if ss["custom_ingredients"]:
                st.markdown("**This session:** " +
                            ", ".join(r["name"] for r in ss["custom_ingredients"]))
            st.text_input("Your library file", key="library_path",
                          help="A CSV of your own ingredients; loaded whenever it exists.")
            st.button("Save session ingredients to the file", key="save_library",
                      on_click=on_save_library, disabled=not ss["custom_ingredients"])
            msg = ss["library_message"]
            if msg.startswith("error"):
                st.error(msg)
            elif msg:
                st.success(msg)

# ------------------------------------------------------------------ results
st.divider()
st.header("Results")
if not page.ok:
    st.error(f"No results: {page.error}", icon=":material/error:")
    st.stop()

d = page.d
s = d["solution"]
if page.read.problems:
    left_out = ", ".join(str(p.row) for p in page.read.problems)
    st.info(f"These results are for the recipe without row(s) {left_out}.")
st.caption(f"{d['recipe_name'] or 'Recipe'} at {s['temperature_C']:g} °C and "
           f"{s['pressure_kPa']:g} kPa — model: {s['model_description']}. Density from "
           f"{s['density_method']}.")
metric_cols = st.columns(len(headline(d)))
for col, (label, value, helptext) in zip(metric_cols, headline(d)):
    col.metric(label, value, help=helptext, border=True)

st.subheader("Solution properties")
st.table(property_frame(d), hide_index=True)
if d["warnings"]:
    with st.container(border=True):
        st.markdown("**Warnings** (numbered as in the Warnings column)")
        for i, w in enumerate(d["warnings"], start=1):
            st.markdown(f"⚠ **{i}.** {w}")
st.subheader("Composition")
# the widget's own key is dropped on runs that stop before it; "bases" keeps the choice
st.pills("Bases shown", list(BASES), format_func=BASES.get, selection_mode="multi",
         default=ss["bases"], key="bases_pick", on_change=on_bases)
st.table(composition_frame(d, ss["bases"]), hide_index=True)
st.caption("Masses are as weighed (a hydrate with its water); amounts and molalities in "
           "moles of the ingredient; the solvent row counts the water added, while "
           "molalities are per kg of all water, crystal water included.")

for c in cautions["results"]:
    st.warning(c, icon=":material/warning:")

# ------------------------------------------------------------------ charts
st.divider()
st.header("Charts")
curves = curves_for(table, token, cond_t, decimal, ss["recipe_name"])
charts = page_charts(page, curves)
for key in ("concentration", "vapor"):
    if isinstance(curves.get(key), str):
        st.error(f"Chart not drawn: {curves[key]}", icon=":material/error:")
if "concentration" in charts:
    st.altair_chart(charts["concentration"], theme=None, key="chart_concentration")
    st.caption(CAPTIONS["concentration"] + ".")
    notes = curves["concentration"].notes
    if notes:
        with st.expander(f"Model notes along these curves ({len(notes)})"):
            for n in notes:
                st.markdown(f"- {n}")
if "vapor" in charts:
    cb, cc = st.columns(2, gap="large")
    cb.altair_chart(charts["vapor"], theme=None, key="chart_vapor")
    over_ice = (" over ice, the stable phase at this temperature (the curve is the "
                "supercooled liquid's); the liquid's is"
                if below_freezing(s) else ",")
    cb.caption(f"{CAPTIONS['vapor']}. At {s['temperature_C']:g} °C the solution's vapor "
               f"pressure is {property_text(s, 'vapor_pressure_kPa')} kPa{over_ice} "
               f"{property_text(s, 'vapor_pressure_lowering_kPa')} kPa below the pure "
               "solvent's.")
    cc.altair_chart(charts["clausius"], theme=None, key="chart_cc")
    cc.caption(CAPTIONS["clausius"] + ".")
    for c in cautions["vessels"]:
        st.warning(c, icon=":material/warning:")
    if curves["vapor"].notes:
        with st.expander(f"Model notes along the vapor-pressure curves "
                         f"({len(curves['vapor'].notes)})"):
            for n in curves["vapor"].notes:
                st.markdown(f"- {n}")

# ------------------------------------------------------------------ design and batch
st.divider()
st.header("Design and batch")
st.caption(f"On the recipe above as written, at {s['temperature_C']:g} °C and "
           f"{s['pressure_kPa']:g} kPa (sidebar), model: {s['model_description']}. Volumes "
           f"are read at {cond.T_prep_C:g} °C."
           + (f" Without row(s) {', '.join(str(p.row) for p in page.read.problems)}, as in "
              "the Results." if page.read.problems else ""))
here_key = D.table_key(table, decimal)
stem = "".join(ch if ch.isalnum() or ch in "-_" else "_" for ch in (d["recipe_name"] or
                                                                      "recipe")) or "recipe"
t_target, t_scale, t_dilute = st.tabs(["Target: solve for an amount", "Scale-up / weigh-out",
                                       "Dilution from stock"])


def show_notes(d: dict, shown: dict | None, *, ingredients: bool = True):
    if d["warnings"]:
        with st.container(border=True):
            st.markdown("**⚠ Warnings**\n" + "".join(f"\n- {w}" for w in d["warnings"]))
    for c in D.design_cautions(d, shown, ingredients=ingredients):
        st.warning(c, icon=":material/warning:")


with t_target:
    st.caption("Find the amount of one ingredient that gives the recipe a stated property. "
               "Every other row, and the q.s. or balance rule, stays as written.")
    vary_opts = D.vary_options(page.read)
    g1, g2, g3 = st.columns([3, 3, 2])
    g1.selectbox("Ingredient to vary", vary_opts, key="tg_vary",
                 help="A dissolved ingredient of the recipe, or a library ingredient to add "
                      "as a new row.")
    if ss["tg_vary"] == D.ADD_INGREDIENT:
        g1.selectbox("Library ingredient to add", D.addable_ingredients(library, page.read),
                     key="tg_add", help="Added in % w/v to a q.s.-to-volume recipe, in % w/w "
                     "to a balance or q.s.-to-mass one, in g otherwise.")
    g2.selectbox("Target property", list(D.TARGET_CHOICES), key="tg_property",
                 format_func=lambda k: D.choice_label(k, cond))
    choice = D.TARGET_CHOICES[ss["tg_property"]]
    if ss["tg_property"] == "concentration":
        varied_now = ss["tg_add"] if ss["tg_vary"] == D.ADD_INGREDIENT else ss["tg_vary"]
        g2.selectbox("Concentration of", [r.text for r in page.read.recipe.rows
                                          if r.text != varied_now], key="tg_component")
        g3.number_input("Target value", min_value=0.0, step=choice.step, format=choice.format,
                        key="tg_value_concentration")
        g3.selectbox("Unit", D.CONCENTRATION_UNITS, key="tg_basis")
        now = D.current_value(page, "concentration", ss.get("tg_component"), ss["tg_basis"])
    else:
        label = ("Isotonic osmolality (mOsm/kg)" if choice.isotonic else
                 f"Target ({choice.unit})" if choice.unit else "Target")
        g3.number_input(label, step=choice.step, format=choice.format,
                        key=f"tg_value_{ss['tg_property']}",
                        help="290 mOsm/kg unless your reference says otherwise; the "
                             "E-value (sodium chloride equivalent) method is shown beside "
                             "the model." if choice.isotonic else None)
        now = D.current_value(page, ss["tg_property"])
    g3.caption(f"This recipe now: {now}")
    st.button("Solve", type="primary", key="tg_solve", on_click=on_solve, args=(here_key,))
    if ss["design_message"]:
        st.success(ss["design_message"], icon=":material/check_circle:")

    stash = ss["target_request"]
    if stash is not None and stash[1] != here_key:
        st.info("The recipe has changed since the last Solve: press Solve for this recipe.")
    elif stash is not None:
        req = D.TargetRequest(*stash[0])
        out = target_for(table, token, cond_t, decimal, ss["recipe_name"], stash[0])
        st.markdown(f"**Target:** {req.describe(cond)}")
        if dataclasses.astuple(D.request_from(ss)) != stash[0]:
            st.caption("The boxes above have changed since this was solved: press Solve to "
                       "update.")
        if not out.ok and out.unreachable:
            st.error(f"Target not reachable: {out.error}", icon=":material/error:")
            if out.nearest is not None:
                st.warning(f"Nearest reachable value: {D.fmt(out.nearest, D.SIG)} "
                           f"{out.nearest_unit}".strip(), icon=":material/info:")
        elif not out.ok:
            st.error(f"Not solved: {out.error}", icon=":material/error:")
        else:
            td = out.d
            cols = st.columns(3)
            for col, (lab, val, helptext) in zip(cols, D.answer_metrics(td)):
                col.metric(lab, val, help=helptext, border=True)
            st.caption(D.answer_caption(td))
            e_lines = D.e_value_lines(td)
            if e_lines:
                st.info("**Sodium-chloride-equivalent (E-value) check.** " + " ".join(e_lines),
                        icon=":material/calculate:")
                with st.expander("E-values used and their sources"):
                    st.table(D.e_value_frame(td), hide_index=True)
            a1, a2 = st.columns(2, gap="large")
            a1.markdown("**Adjusted recipe**")
            a1.table(D.recipe_frame(td), hide_index=True)
            a2.markdown("**Properties: this recipe and the adjusted one**")
            a2.table(D.comparison_frame(d, td), hide_index=True)
            show_notes(td, cautions)
            stem_t = f"{stem}_adjusted"
            b1, b2, b3 = st.columns(3)
            b1.download_button("Adjusted recipe (CSV)", D.adjusted_recipe_csv(out.rows),
                               file_name=f"{stem_t}.csv", mime="text/csv", key="dl_adjusted",
                               on_click="ignore")
            b2.download_button("Target result (JSON)", D.target_json(td),
                               file_name=f"{stem_t}.json", mime="application/json",
                               key="dl_target_json", on_click="ignore")
            v = td["varied"]
            b3.button("Load the adjusted recipe into the table", key="tg_load",
                      on_click=on_load_adjusted,
                      args=(D.adjusted_table(out.rows, decimal),
                            f"{d['recipe_name'] or 'recipe'} (adjusted)",
                            f"adjusted recipe loaded: {v['ingredient']} "
                            f"{D.amount_text(v['amount'])} {v['unit']} for "
                            f"{req.describe(cond).split(', varying')[0]}"))

with t_scale:
    st.caption("The recipe scaled to a batch: the mass of each ingredient to weigh (as "
               "weighed, hydrates with their crystal water, corrected for assay) and the "
               "water to add by mass and by volume.")
    w1, w2, _ = st.columns([2, 1, 3])
    w1.number_input("Batch size", min_value=0.001, step=1.0, key="wo_size")
    w2.selectbox("Unit", S.BATCH_UNITS, key="wo_unit")
    st.caption(f"A volume is the final volume at {cond.T_prep_C:g} °C; a mass the total mass. "
               "This batch is separate from the sidebar's, which scales the Results above.")
    wo = weigh_for(table, token, cond_t, decimal, ss["recipe_name"],
                   f"{ss['wo_size']!r} {ss['wo_unit']}")
    if not wo.ok:
        st.error(f"No weigh-out sheet: {wo.error}", icon=":material/error:")
    else:
        wd = wo.d
        f = wd["final"]
        st.markdown(f"**Weigh-out sheet for {ss['wo_size']:g} {ss['wo_unit']}** "
                    f"(× {D.fmt(wd['scale_factor'], D.SIG)} of the recipe as written)")
        st.table(D.weigh_out_frame(wd), hide_index=True)
        st.caption("Volumes of liquid ingredients are at 20 °C from the library's pure "
                   "densities; weighing is the surer way.")
        m1, m2, m3, m4 = st.columns(4)
        m1.metric("Final mass (g)", D.fmt(f["mass_g"], D.SIG), border=True)
        m2.metric(f"Final volume at {f['volume_temperature_C']:g} °C (mL)",
                  D.fmt(f["volume_mL"], D.SIG), border=True)
        m3.metric(f"Density at {f['volume_temperature_C']:g} °C (g/mL)",
                  D.fmt(f["density_g_per_mL"], 5), border=True)
        m4.metric(f"Volume at {f['temperature_C']:g} °C (mL)",
                  D.fmt(f["volume_mL_at_T"], D.SIG), border=True,
                  help=f"At the sidebar's temperature; density there "
                       f"{D.fmt(f['density_g_per_mL_at_T'], 5)} g/mL.")
        show_notes(wd, cautions, ingredients=False)
        st.download_button("Weigh-out sheet (CSV)", D.weigh_out_csv(wd),
                           file_name=f"{stem}_weigh_out_{ss['wo_size']:g}{ss['wo_unit']}.csv",
                           mime="text/csv", key="dl_weigh_out", on_click="ignore")

with t_dilute:
    st.caption("This recipe as the stock, diluted with its solvent to a lower concentration "
               "of one ingredient.")
    solute_opts = [o for o in vary_opts if o != D.ADD_INGREDIENT]
    if not solute_opts:
        st.info("The recipe has no dissolved ingredient to dilute.")
    else:
        n1, n2, n3 = st.columns([3, 3, 3])
        n1.selectbox("Ingredient", solute_opts, key="dl_ingredient")
        n2a, n2b = n2.columns([3, 2])
        n2a.number_input("Target concentration", min_value=0.0, step=0.1, format="%.4f",
                         key="dl_to_value")
        n2b.selectbox("Unit", D.CONCENTRATION_UNITS, key="dl_to_unit")
        n3a, n3b = n3.columns([3, 2])
        n3a.number_input("Final amount", min_value=0.001, step=1.0, key="dl_final_value")
        n3b.selectbox("Unit", S.BATCH_UNITS, key="dl_final_unit")
        n1.caption("The stock has " + D.stock_concentration(
            page.read.recipe, ss["dl_ingredient"], ss["dl_to_unit"], library, cond)
            + f" (volumes at {cond.T_prep_C:g} °C).")
        st.button("Plan the dilution", type="primary", key="dl_plan",
                  on_click=on_plan_dilution, args=(here_key,))
        dstash = ss["dilution_request"]
        if dstash is not None and dstash[1] != here_key:
            st.info("The recipe has changed since the last plan: press Plan the dilution "
                    "for this stock.")
        elif dstash is not None:
            dreq = D.DilutionRequest(*dstash[0])
            dout = dilution_for(table, token, cond_t, decimal, ss["recipe_name"], dstash[0])
            st.markdown(f"**Dilution:** {dreq.final_value:g} {dreq.final_unit} of "
                        f"{dreq.to_value:g} {dreq.to_unit} {dreq.ingredient}")
            if dataclasses.astuple(D.dilution_request_from(ss)) != dstash[0]:
                st.caption("The boxes above have changed since this was planned: press Plan "
                           "the dilution to update.")
            if not dout.ok:
                st.error(f"No dilution: {dout.error}", icon=":material/error:")
            else:
                x = dout.d["dilution"]
                st.table(D.dilution_frame(dout.d), hide_index=True)
                st.info(D.mixing_text(dout.d), icon=":material/science:")
                st.caption(f"Achieved {D.amount_text(x['achieved'])} {x['unit']} "
                           f"{x['ingredient']} (stock {D.amount_text(x['stock_concentration'])} "
                           f"{x['unit']}; {x['iterations']} brentq iterations).")
                show_notes(dout.d, cautions, ingredients=False)

# ------------------------------------------------------------------ downloads
st.divider()
st.header("Downloads")
rd = report_dict(page)
d1, d2, d3 = st.columns(3)
d1.download_button("Summary table (CSV)", summary_csv(rd), file_name=f"{stem}.csv",
                   mime="text/csv", key="dl_csv", on_click="ignore")
d2.download_button("Full result (JSON)", json_text(d), file_name=f"{stem}.json",
                   mime="application/json", key="dl_json", on_click="ignore")
d3.download_button("Printable report (HTML)",
                   # built on click, outside this run: bind the values now
                   functools.partial(html_for, table, token, cond_t, decimal, ss["recipe_name"]),
                   file_name=f"{stem}.html", mime="text/html", key="dl_html", on_click="ignore")
st.caption("The JSON is the object `python -m solutions evaluate --json` prints. The HTML "
           "report holds the recipe, conditions, every basis, every property with its model "
           "and warnings, the cautions and the charts, and opens offline.")
