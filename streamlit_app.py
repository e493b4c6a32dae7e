"""Solution workbench in the browser: ``streamlit run streamlit_app.py``.

Layout only: each section is drawn by a function of :mod:`solutions.ui.sections` or
:mod:`solutions.ui.design_section`, run through :func:`~solutions.ui.sections.guarded` so
that an unforeseen error becomes a plain message and the rest of the page still draws.
Every number comes from the library (:mod:`solutions.ui.compute` →
:func:`solutions.evaluate.evaluate`, :mod:`solutions.charts`) and is formatted by
:mod:`solutions.report`; callbacks and session defaults are in :mod:`solutions.ui.state`.
"""
from __future__ import annotations

from pathlib import Path

import streamlit as st

from solutions.ui import state as S
from solutions.ui.design_section import render_design
from solutions.ui.sections import (guarded, render_charts, render_downloads, render_recipe,
                                   render_results, render_sidebar, render_tools)

st.set_page_config(page_title="Solution workbench", layout="wide")
st.session_state.setdefault("demo_dir", str(Path(__file__).resolve().parent / "recipes"))
S.init_state(st.session_state)
S.keep_widget_values(st.session_state)

guarded("conditions", render_sidebar)
drawn = guarded("recipe", render_recipe)
page = None
if drawn is not None:
    key, page = drawn
    if guarded("results", render_results, key, page):
        guarded("charts", render_charts, key, page)
        guarded("design and batch", render_design, key, page)
        guarded("downloads", render_downloads, key, page)
guarded("more tools", render_tools, page)
