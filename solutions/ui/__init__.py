"""Helpers of the browser dashboard (``streamlit_app.py``): thin layers over the library.

Without Streamlit (tested and benchmarked without a browser):

* :mod:`solutions.ui.compute` — one page update: read the recipe table row by row (bad
  rows are reported and left out), evaluate, compute the chart data and specifications;
* :mod:`solutions.ui.tables` — the recipe table's columns, pasted and uploaded blocks
  (columns matched by header name), the frames the page shows;
* :mod:`solutions.ui.state` — session defaults, the page key of every cache, the
  callbacks (each takes the session mapping, so a plain dict tests it);
* :mod:`solutions.ui.design` — target, weigh-out and dilution requests and frames;
* :mod:`solutions.ui.safe` — input limits, plain text for Markdown elements, the app's
  own ingredient file.

With Streamlit (drawing only):

* :mod:`solutions.ui.sections` — ``render_sidebar``, ``render_recipe``,
  ``render_results``, ``render_charts``, ``render_downloads``, ``render_tools`` and
  ``guarded`` (an unforeseen error becomes a plain message);
* :mod:`solutions.ui.design_section` — ``render_design``.

Nothing here computes a property: every number comes from :mod:`solutions.evaluate`
and :mod:`solutions.charts`; these modules only move it between the page and the library.
"""
