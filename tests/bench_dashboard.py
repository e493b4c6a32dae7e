"""How long one dashboard rerun takes on the library side (a script, not a test).

    python tests/bench_dashboard.py [--repeat N] [--recipe NAME] [--model M]

Without ``--recipe`` it uses a 20-ingredient recipe (19 library solutes at 0.5 g each in
water, a stress case for the page, not a product). Three figures:

* **cold update** (a cache miss: the recipe or a condition changed) — read the table and
  evaluate (:func:`solutions.ui.compute.evaluate_table`), the chart data
  (:func:`~solutions.ui.compute.chart_curves`) and the chart specifications
  (:func:`~solutions.ui.compute.chart_specs`: Altair ``to_dict``, schema-checked once
  per chart kind);
* **temperature change** — the same recipe at another temperature: the evaluation and
  the chart specifications again, the chart data reused (what the charts draw does not
  depend on the solution temperature; the page caches it without it);
* **warm rerun** (a widget that changes nothing computed, e.g. ticking a basis) — the
  page key, the frames the page shows, escaped for Markdown, the CSV and JSON downloads;
  the cached results are reused as the app reuses them;
* **hidden tools** — the weigh-out sheet, computed only when its tool is shown.

Streamlit's own rendering and websocket traffic are not included (see
``tests/bench_load.py`` for those).
"""
from __future__ import annotations

import argparse
import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def twenty_ingredient_table(lib):
    import pandas as pd
    names = [i.name for i in lib if not i.is_water and i.rho_pure is None][:19]
    rows = [{"ingredient": n, "amount": "0.5", "unit": "g"} for n in names]
    rows.append({"ingredient": "water", "amount": "100", "unit": "g"})
    return pd.DataFrame(rows)


def median_ms(f, repeat: int) -> float:
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        f()
        times.append(time.perf_counter() - t0)
    return statistics.median(times) * 1e3


def main(argv=None) -> int:
    sys.path.insert(0, str(ROOT))
    from solutions.ingredients import default_library
    from solutions.report import json_text, summary_csv
    from solutions.ui import design as D
    from solutions.ui import state as S
    from solutions.ui.compute import (Conditions, chart_curves, chart_specs, evaluate_table,
                                      report_dict)
    from solutions.ui.safe import plain, plain_frame
    from solutions.ui.tables import (DEFAULT_BASES, composition_frame, demo_recipes,
                                     frame_from_text, headline, property_frame,
                                     sort_cautions)

    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=5)
    ap.add_argument("--recipe", default=None, help="a demo recipe's name (default: the "
                    "20-ingredient stress recipe)")
    ap.add_argument("--model", default="nonideal")
    args = ap.parse_args(argv)

    lib = default_library()
    if args.recipe:
        path = demo_recipes(ROOT / "recipes")[args.recipe]
        table = frame_from_text(path.read_text(encoding="utf-8-sig"))[0]
        name = args.recipe
    else:
        table, name = twenty_ingredient_table(lib), "twenty ingredients"
    cond = Conditions(model=args.model)
    state: dict = {}
    S.init_state(state)
    state["model"] = args.model

    t0 = time.perf_counter()
    evaluate_table(table, lib, cond, name=name)   # first call: loads the data files
    first = (time.perf_counter() - t0) * 1e3

    out = {}

    def cold():
        page = evaluate_table(table, lib, cond, name=name)
        curves = chart_curves(page.evaluation, page.d)
        specs = chart_specs(page, curves)
        out.update(page=page, curves=curves, specs=specs)

    def evaluate_only():
        evaluate_table(table, lib, cond, name=name)

    hotter = Conditions(model=args.model, T_C=37.0)

    def temperature_change():
        page = evaluate_table(table, lib, hotter, name=name)
        chart_specs(page, out["curves"])

    def curves_only():
        chart_curves(out["page"].evaluation, out["page"].d)

    def specs_only():
        chart_specs(out["page"], out["curves"])

    def warm():
        S.page_key(state, table)
        d = out["page"].d
        [plain(x) for h in headline(d) for x in h]
        plain_frame(property_frame(d))
        plain_frame(composition_frame(d, DEFAULT_BASES))
        [plain(c) for g in sort_cautions(d).values() for c in g]
        [plain(w) for w in d["warnings"]]
        summary_csv(report_dict(out["page"]))
        json_text(d)

    def weigh():
        D.weigh_out_sheet(out["page"].read, "5 L", cond)

    cold_ms = median_ms(cold, args.repeat)
    if not out["page"].ok:
        print(f"{name}: the recipe did not evaluate: {out['page'].error}")
        return 1
    ev_ms = median_ms(evaluate_only, args.repeat)
    curve_ms = median_ms(curves_only, args.repeat)
    spec_ms = median_ms(specs_only, args.repeat)
    warm_ms = median_ms(warm, args.repeat * 4)
    hot_ms = median_ms(temperature_change, args.repeat)
    weigh_ms = median_ms(weigh, args.repeat)
    bad = [k for k, v in out["curves"].items() if isinstance(v, str)]
    print(f"recipe: {name} ({len(table)} rows), model {args.model}, "
          f"{args.repeat} repeats, medians")
    print(f"first call (data files loading):       {first:8.1f} ms")
    print(f"cold update (cache miss), in all:      {cold_ms:8.1f} ms")
    print(f"  read + evaluate:                     {ev_ms:8.1f} ms")
    print(f"  chart data, 3 charts:                {curve_ms:8.1f} ms")
    print(f"  chart specifications (not revalidated): {spec_ms:5.1f} ms")
    print(f"temperature change (chart data reused): {hot_ms:6.1f} ms")
    print(f"warm rerun (caches hit):               {warm_ms:8.1f} ms")
    print(f"weigh-out sheet (only when shown):     {weigh_ms:8.1f} ms")
    if bad:
        print(f"charts without data: {', '.join(bad)}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
