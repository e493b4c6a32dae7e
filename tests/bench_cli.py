"""Command-line start-up and run time: prints figures, asserts nothing.

    python tests/bench_cli.py [--repeat 7] [--profile]

Each command runs in a fresh process ``--repeat`` times; the median CPU time (user + sys of
the child, from ``getrusage``) and the median wall time are printed. CPU time is the figure to
compare between machines or while other jobs share the cores; wall time is shown as well.
``--profile`` adds, per command, the heaviest imports (``python -X importtime``, cumulative
microseconds of the modules imported at top level by the command and of the third-party
packages), so a new top-level import of a heavy package shows up at once.
"""
from __future__ import annotations

import argparse
import re
import resource
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
RECIPE = "recipes/saline_rinse.csv"
COMMANDS = {
    "start-up (--help)": ["--help"],
    "ingredients": ["ingredients"],
    "ingredients tris": ["ingredients", "tris"],
    "ingredients --json": ["ingredients", "--json"],
    "evaluate": ["evaluate", RECIPE],
    "evaluate --json": ["evaluate", RECIPE, "--json"],
    "target osmolality": ["target", RECIPE, "--vary", "sodium chloride",
                          "--osmolality", "isotonic"],
    "scale 5 L": ["scale", RECIPE, "--batch", "5 L"],
    "partition": ["partition", "--ingredient", "methylparaben", "--oil-fraction", "0.2",
                  "--total", "0.2 % w/v", "--ph", "6"],
}
HEAVY = ("numpy", "scipy", "pandas", "pyarrow", "molmass", "pint", "streamlit", "altair",
         "openpyxl")


def _run_once(argv: list[str]) -> tuple[float, float, int]:
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    t0 = time.perf_counter()
    r = subprocess.run([sys.executable, "-m", "solutions", *argv], cwd=ROOT,
                       stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    wall = time.perf_counter() - t0
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
    return cpu, wall, r.returncode


def _profile(argv: list[str], top: int = 8) -> list[tuple[str, float]]:
    r = subprocess.run([sys.executable, "-X", "importtime", "-m", "solutions", *argv],
                       cwd=ROOT, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True)
    rows = []
    for line in r.stderr.splitlines():
        m = re.match(r"import time:\s+\d+ \|\s+(\d+) \|( *)(\S+)", line)
        if not m:
            continue
        cum, depth, name = int(m[1]), len(m[2]), m[3]
        top_level = name.split(".")[0]
        if (top_level in HEAVY and (name == top_level or top_level == "scipy")
                and name.count(".") <= 1) or (top_level == "solutions" and depth <= 2):
            rows.append((name, cum / 1e3))
    best: dict[str, float] = {}
    for name, ms in rows:
        best[name] = max(ms, best.get(name, 0.0))
    return sorted(best.items(), key=lambda kv: -kv[1])[:top]


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repeat", type=int, default=7)
    ap.add_argument("--profile", action="store_true")
    args = ap.parse_args(argv)
    print(f"python {sys.version.split()[0]}, {args.repeat} runs each, median")
    print(f"{'command':<22} {'CPU user+sys [s]':>17} {'wall [s]':>9}  exit")
    for label, cmd in COMMANDS.items():
        runs = [_run_once(cmd) for _ in range(args.repeat)]
        cpu = statistics.median(r[0] for r in runs)
        wall = statistics.median(r[1] for r in runs)
        codes = sorted({r[2] for r in runs})
        print(f"{label:<22} {cpu:>17.3f} {wall:>9.3f}  {','.join(map(str, codes))}")
        if args.profile:
            for name, ms in _profile(cmd):
                print(f"    {name:<34} {ms:8.1f} ms (import, cumulative)")
    return 0


if __name__ == "__main__":
    sys.exit(main())
