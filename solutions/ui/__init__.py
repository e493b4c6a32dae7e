"""Helpers of the browser dashboard (``streamlit_app.py``): thin layers over the library.

* :mod:`solutions.ui.compute` — one page update without Streamlit: read the recipe table
  row by row (bad rows are reported and left out), evaluate, compute the chart curves;
* :mod:`solutions.ui.tables` — the recipe table's columns and the frames the page shows;
* :mod:`solutions.ui.state` — session defaults, pressure presets, conditions, the
  ingredient library of a session.

Nothing here computes a property: every number comes from :mod:`solutions.evaluate`
and :mod:`solutions.charts`; these modules only move it between the page and the library.
They import no Streamlit, so they are tested and benchmarked without a browser.
"""
