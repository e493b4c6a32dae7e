"""How long one full dashboard page update takes on the library side (not a test).

    python tests/bench_dashboard.py [--repeat N] [--recipe NAME]

One update = read the recipe table row by row and evaluate it
(:func:`solutions.ui.compute.evaluate_table`), then compute the data of the three charts
(:func:`solutions.ui.compute.chart_curves`: the 0–2× concentration sweep under the chosen
model and the dilute ideal, and the vapor-pressure curves of charts b and c). By default
it uses the demo recipe with the most rows. Streamlit's own rendering and the caches are
not included: this is the cost of a cache miss.
"""
from __future__ import annotations

import argparse
import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def main(argv=None) -> int:
    sys.path.insert(0, str(ROOT))
    from solutions.ingredients import default_library
    from solutions.ui.compute import Conditions, chart_curves, evaluate_table
    from solutions.ui.tables import demo_recipes, frame_from_text

    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=5)
    ap.add_argument("--recipe", default=None, help="demo recipe name (default: most rows)")
    ap.add_argument("--model", default="nonideal")
    args = ap.parse_args(argv)

    demos = demo_recipes(ROOT / "recipes")
    tables = {k: frame_from_text(p.read_text(encoding="utf-8-sig"))[0] for k, p in demos.items()}
    name = args.recipe or max(tables, key=lambda k: len(tables[k]))
    table = tables[name]
    lib = default_library()
    cond = Conditions(model=args.model)

    t0 = time.perf_counter()
    evaluate_table(table, lib, cond, name=name)   # first call: loads data files
    first = time.perf_counter() - t0

    ev_times, chart_times = [], []
    for _ in range(args.repeat):
        t0 = time.perf_counter()
        page = evaluate_table(table, lib, cond, name=name)
        t1 = time.perf_counter()
        curves = chart_curves(page.evaluation, page.d)
        t2 = time.perf_counter()
        ev_times.append(t1 - t0)
        chart_times.append(t2 - t1)
    if not page.ok:
        print(f"{name}: the recipe did not evaluate: {page.error}")
        return 1
    bad = [k for k, v in curves.items() if isinstance(v, str)]
    total = [a + b for a, b in zip(ev_times, chart_times)]
    print(f"recipe: {name} ({len(table)} rows), model {args.model}, {args.repeat} repeats")
    print(f"first call (data files loading):  {first * 1e3:8.1f} ms")
    print(f"evaluate (median):                {statistics.median(ev_times) * 1e3:8.1f} ms")
    print(f"chart data, 3 charts (median):    {statistics.median(chart_times) * 1e3:8.1f} ms")
    print(f"one page update (median):         {statistics.median(total) * 1e3:8.1f} ms")
    if bad:
        print(f"charts without data: {', '.join(bad)}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
