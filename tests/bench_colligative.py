"""Benchmark (a script, not a test): freezing point of a 3-solute mixture over 100 000
compositions in one vectorized call, against the same points one at a time through the
public scalar route, with peak memory.

    python tests/bench_colligative.py [N]

Prints points per second, the speed ratio, and peak traced memory. Targets:
100 000 compositions in under 1 s on one core, at least 50× the per-point loop,
peak memory under 300 MB.
"""
from __future__ import annotations

import sys
import time
import tracemalloc
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from solutions.colligative import freezing_point  # noqa: E402
from solutions.composition import Composition  # noqa: E402
from solutions.ingredients import default_library  # noqa: E402


def main(N: int = 100_000, n_loop: int = 300) -> None:
    lib = default_library()
    solutes = (lib.get("NaCl"), lib.get("glycerol"), lib.get("sucrose"))
    rng = np.random.default_rng(1)
    b = rng.uniform([0.0, 0.0, 0.0], [2.0, 4.0, 1.5], size=(N, 3))
    comp = Composition.from_molalities(solutes, b, lib.get("water"))
    freezing_point(Composition.from_molalities(solutes, b[:10], lib.get("water")))  # warm up

    tracemalloc.start()
    t0 = time.perf_counter()
    Tf, dT, _ = freezing_point(comp)
    t_vec = time.perf_counter() - t0
    _, peak = tracemalloc.get_traced_memory()
    tracemalloc.stop()
    assert np.all(np.isfinite(Tf))

    t0 = time.perf_counter()
    for i in range(n_loop):
        freezing_point(Composition.from_molalities(solutes, b[i:i + 1], lib.get("water")))
    t_one = (time.perf_counter() - t0) / n_loop

    print(f"compositions              {N}")
    print(f"vectorized call           {t_vec:.3f} s  ({N / t_vec:,.0f} points/s)")
    print(f"one at a time (scalar)    {t_one * 1e3:.2f} ms/point  ({1 / t_one:,.0f} points/s, "
          f"{n_loop} points timed)")
    print(f"speed ratio               {t_one * N / t_vec:,.0f}x")
    print(f"peak traced memory        {peak / 2**20:.1f} MB")

    # a glycol coolant: ethylene + propylene glycol (one multicomponent NRTL term) + NaCl
    gly = (lib.get("ethylene glycol"), lib.get("propylene glycol"), lib.get("NaCl"))
    wg = rng.uniform([0.0, 0.0, 0.0], [0.3, 0.25, 0.03], size=(N, 3))
    cg = Composition.from_mass_fractions(gly, wg, lib.get("water"))
    freezing_point(Composition.from_mass_fractions(gly, wg[:10], lib.get("water")))
    t0 = time.perf_counter()
    Tg, _, _ = freezing_point(cg)
    t_gly = time.perf_counter() - t0
    print(f"glycol mixture (EG+PG+NaCl) vectorized  {t_gly:.3f} s  ({N / t_gly:,.0f} points/s, "
          f"{np.isfinite(Tg).mean() * 100:.1f} % found)")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 100_000)
