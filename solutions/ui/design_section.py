"""The dashboard's "Design and batch" section, drawn with Streamlit: a target solve, a
weigh-out sheet and a dilution from stock (helpers in :mod:`solutions.ui.design`).

Only the tool chosen in the section's switch is computed on a run; the target and the
dilution are computed when their button is pressed, and every result is cached by the
page's :class:`~solutions.ui.state.PageKey` and the request.
"""
from __future__ import annotations

import dataclasses

import streamlit as st

from . import design as D
from . import state as S
from .compute import PageResult
from .safe import plain
from .sections import file_stem, library_for, page_for, show_table
from .tables import sort_cautions

__all__ = ["render_design", "DESIGN_TOOLS", "target_for", "weigh_for", "dilution_for"]

#: the section's switch: key → label
DESIGN_TOOLS = {"target": "Target: solve for an amount",
                "scale": "Scale-up / weigh-out",
                "dilute": "Dilution from stock"}


@st.cache_resource(show_spinner=False, max_entries=32, hash_funcs=S.HASH_FUNCS)
def target_for(key: S.PageKey, req: tuple) -> D.TargetOutcome:
    lib, _ = library_for(key.token)
    return D.solve_request(page_for(key).read, key.table(), D.TargetRequest(*req), lib,
                           key.cond)


@st.cache_resource(show_spinner=False, max_entries=32, hash_funcs=S.HASH_FUNCS)
def weigh_for(key: S.PageKey, batch_text: str) -> D.WeighOutcome:
    return D.weigh_out_sheet(page_for(key).read, batch_text, key.cond)


@st.cache_resource(show_spinner=False, max_entries=32, hash_funcs=S.HASH_FUNCS)
def dilution_for(key: S.PageKey, req: tuple) -> D.DilutionOutcome:
    lib, _ = library_for(key.token)
    return D.plan_dilution(page_for(key).read, D.DilutionRequest(*req), lib, key.cond)


def _show_notes(d: dict, shown: dict | None, use: str | None, *, ingredients: bool = True):
    if d["warnings"]:
        with st.container(border=True):
            st.markdown("**⚠ Warnings**\n" + "".join(f"\n- {plain(w)}" for w in d["warnings"]))
    for c in D.design_cautions(d, shown, ingredients=ingredients, use=use):
        st.warning(plain(c), icon=":material/warning:")


def render_design(key: S.PageKey, page: PageResult) -> None:
    ss = st.session_state
    cond = key.cond
    d = page.d
    s = d["solution"]
    st.divider()
    st.header("Design and batch")
    st.caption(plain(
        f"On the recipe above as written, at {s['temperature_C']:g} °C and "
        f"{s['pressure_kPa']:g} kPa (sidebar), model: {s['model_description']}. Volumes "
        f"are read at {cond.T_prep_C:g} °C."
        + (f" Without row(s) {', '.join(str(p.row) for p in page.read.problems)}, as in "
           "the Results." if page.read.problems else "")))
    tool = st.segmented_control("Tool", list(DESIGN_TOOLS), format_func=DESIGN_TOOLS.get,
                                key="design_tool", label_visibility="collapsed")
    ctx = dict(key=key, page=page, here=key.decimal + key.table_csv,   # = D.table_key
               stem=file_stem(d["recipe_name"]), shown=sort_cautions(d), ss=ss)
    if tool == "target":
        _target(**ctx)
    elif tool == "scale":
        _scale(**ctx)
    elif tool == "dilute":
        _dilute(**ctx)
    else:
        st.caption("Choose a tool above.")


def _target(key, page, here, stem, shown, ss):
    cond = key.cond
    d = page.d
    library, _ = library_for(key.token)
    st.caption("Find the amount of one ingredient that gives the recipe a stated property. "
               "Every other row, and the q.s. or balance rule, stays as written.")
    g1, g2, g3 = st.columns([3, 3, 2])
    g1.selectbox("Ingredient to vary", D.vary_options(page.read), key="tg_vary",
                 help="A dissolved ingredient of the recipe, or a library ingredient to add "
                      "as a new row.")
    if ss["tg_vary"] == D.ADD_INGREDIENT:
        g1.selectbox("Library ingredient to add", D.addable_ingredients(library, page.read),
                     key="tg_add", help="Added in % w/v to a q.s.-to-volume recipe, in % w/w "
                     "to a balance or q.s.-to-mass one, in g otherwise.")
    g2.selectbox("Target property", list(D.TARGET_CHOICES), key="tg_property",
                 format_func=lambda k: D.choice_label(k, cond, d["solution"]))
    choice = D.TARGET_CHOICES[ss["tg_property"]]
    if ss["tg_property"] == "concentration":
        varied_now = ss.get("tg_add") if ss["tg_vary"] == D.ADD_INGREDIENT else ss["tg_vary"]
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
    g3.caption(f"This recipe now: {plain(now)}")
    st.button("Solve", type="primary", key="tg_solve", on_click=S.on_solve, args=(ss, here))
    if ss["design_message"]:
        st.success(plain(ss["design_message"]), icon=":material/check_circle:")
    stash = ss["target_request"]
    if stash is None:
        return
    if stash[1] != here:
        st.info("The recipe has changed since the last Solve: press Solve for this recipe.")
        return
    req = D.TargetRequest(*stash[0])
    out = target_for(key, stash[0])
    st.markdown(f"**Target:** {plain(req.describe(cond))}")
    if dataclasses.astuple(D.request_from(ss)) != stash[0]:
        st.caption("The boxes above have changed since this was solved: press Solve to "
                   "update.")
    if not out.ok and out.unreachable:
        st.error(f"Target not reachable: {plain(out.error)}", icon=":material/error:")
        if out.nearest is not None:
            st.warning(plain(f"Nearest reachable value: {D.fmt(out.nearest, D.SIG)} "
                             f"{out.nearest_unit}".strip()), icon=":material/info:")
        return
    if not out.ok:
        st.error(f"Not solved: {plain(out.error)}", icon=":material/error:")
        return
    td = out.d
    for col, (lab, val, helptext) in zip(st.columns(3), D.answer_metrics(td)):
        col.metric(plain(lab), plain(val), help=plain(helptext), border=True)
    st.caption(plain(D.answer_caption(td)))
    e_lines = D.e_value_lines(td)
    if e_lines:
        st.info("**Sodium-chloride-equivalent (E-value) check.** " + plain(" ".join(e_lines)),
                icon=":material/calculate:")
        with st.expander("E-values used and their sources"):
            show_table(st, D.e_value_frame(td))
    a1, a2 = st.columns(2, gap="large")
    a1.markdown("**Adjusted recipe**")
    show_table(a1, D.recipe_frame(td))
    a2.markdown("**Properties: this recipe and the adjusted one**")
    show_table(a2, D.comparison_frame(d, td))
    _show_notes(td, shown, cond.use)
    stem_t = f"{stem}_adjusted"
    b1, b2, b3 = st.columns(3)
    b1.download_button("Adjusted recipe (CSV)", D.adjusted_recipe_csv(out.rows),
                       file_name=f"{stem_t}.csv", mime="text/csv", key="dl_adjusted",
                       on_click="ignore")
    b2.download_button("Target result (JSON)", D.target_json(td), file_name=f"{stem_t}.json",
                       mime="application/json", key="dl_target_json", on_click="ignore")
    v = td["varied"]
    b3.button("Load the adjusted recipe into the table", key="tg_load",
              on_click=S.on_load_adjusted,
              args=(ss, D.adjusted_table(out.rows, key.decimal),
                    f"{d['recipe_name'] or 'recipe'} (adjusted)",
                    f"adjusted recipe loaded: {v['ingredient']} "
                    f"{D.amount_text(v['amount'])} {v['unit']} for "
                    f"{req.describe(cond).split(', varying')[0]}"))


def _scale(key, page, here, stem, shown, ss):
    cond = key.cond
    st.caption("The recipe scaled to a batch: the mass of each ingredient to weigh (as "
               "weighed, hydrates with their crystal water, corrected for assay) and the "
               "solvent to add by mass and by volume.")
    w1, w2, _ = st.columns([2, 1, 3])
    w1.number_input("Batch size", min_value=0.001, step=1.0, key="wo_size")
    w2.selectbox("Unit", S.BATCH_UNITS, key="wo_unit")
    st.caption(f"A volume is the final volume at {cond.T_prep_C:g} °C; a mass the total "
               "mass. This batch is separate from the sidebar's, which scales the Results "
               "above.")
    wo = weigh_for(key, f"{ss['wo_size']!r} {ss['wo_unit']}")
    if not wo.ok:
        st.error(f"No weigh-out sheet: {plain(wo.error)}", icon=":material/error:")
        return
    wd = wo.d
    f = wd["final"]
    st.markdown(f"**Weigh-out sheet for {ss['wo_size']:g} {ss['wo_unit']}** "
                f"(× {D.fmt(wd['scale_factor'], D.SIG)} of the recipe as written)")
    show_table(st, D.weigh_out_frame(wd))
    st.caption("Volumes of liquid ingredients are at 20 °C from the library's pure "
               "densities; weighing is the surer way.")
    m1, m2, m3, m4 = st.columns(4)
    m1.metric("Final mass (g)", D.fmt(f["mass_g"], D.SIG), border=True)
    m2.metric(f"Final volume at {f['volume_temperature_C']:g} °C (mL)",
              D.fmt(f["volume_mL"], D.SIG), border=True)
    m3.metric(f"Density at {f['volume_temperature_C']:g} °C (g/mL)",
              D.fmt(f["density_g_per_mL"], 5), border=True)
    m4.metric(f"Volume at {f['temperature_C']:g} °C (mL)", D.fmt(f["volume_mL_at_T"], D.SIG),
              border=True, help=f"At the sidebar's temperature; density there "
                                f"{D.fmt(f['density_g_per_mL_at_T'], 5)} g/mL.")
    _show_notes(wd, shown, cond.use, ingredients=False)
    st.download_button("Weigh-out sheet (CSV)", D.weigh_out_csv(wd),
                       file_name=f"{stem}_weigh_out_{ss['wo_size']:g}{ss['wo_unit']}.csv",
                       mime="text/csv", key="dl_weigh_out", on_click="ignore")


def _dilute(key, page, here, stem, shown, ss):
    cond = key.cond
    library, _ = library_for(key.token)
    st.caption("This recipe as the stock, diluted with its solvent to a lower concentration "
               "of one ingredient.")
    solute_opts = [o for o in D.vary_options(page.read) if o != D.ADD_INGREDIENT]
    if not solute_opts:
        st.info("The recipe has no dissolved ingredient to dilute.")
        return
    n1, n2, n3 = st.columns([3, 3, 3])
    n1.selectbox("Ingredient", solute_opts, key="dl_ingredient")
    n2a, n2b = n2.columns([3, 2])
    n2a.number_input("Target concentration", min_value=0.0, step=0.1, format="%.4f",
                     key="dl_to_value")
    n2b.selectbox("Unit", D.CONCENTRATION_UNITS, key="dl_to_unit")
    n3a, n3b = n3.columns([3, 2])
    n3a.number_input("Final amount", min_value=0.001, step=1.0, key="dl_final_value")
    n3b.selectbox("Unit", S.BATCH_UNITS, key="dl_final_unit")
    n1.caption(plain("The stock has " + D.stock_concentration(
        page.read.recipe, ss["dl_ingredient"], ss["dl_to_unit"], library, cond)
        + f" (volumes at {cond.T_prep_C:g} °C)."))
    st.button("Plan the dilution", type="primary", key="dl_plan",
              on_click=S.on_plan_dilution, args=(ss, here))
    dstash = ss["dilution_request"]
    if dstash is None:
        return
    if dstash[1] != here:
        st.info("The recipe has changed since the last plan: press Plan the dilution for "
                "this stock.")
        return
    dreq = D.DilutionRequest(*dstash[0])
    dout = dilution_for(key, dstash[0])
    st.markdown(plain(f"Dilution: {dreq.final_value:g} {dreq.final_unit} of "
                      f"{dreq.to_value:g} {dreq.to_unit} {dreq.ingredient}"))
    if dataclasses.astuple(D.dilution_request_from(ss)) != dstash[0]:
        st.caption("The boxes above have changed since this was planned: press Plan the "
                   "dilution to update.")
    if not dout.ok:
        st.error(f"No dilution: {plain(dout.error)}", icon=":material/error:")
        return
    x = dout.d["dilution"]
    show_table(st, D.dilution_frame(dout.d))
    st.info(plain(D.mixing_text(dout.d)), icon=":material/science:")
    st.caption(plain(f"Achieved {D.amount_text(x['achieved'])} {x['unit']} "
                     f"{x['ingredient']} (stock {D.amount_text(x['stock_concentration'])} "
                     f"{x['unit']}; {x['iterations']} brentq iterations)."))
    _show_notes(dout.d, shown, cond.use, ingredients=False)
