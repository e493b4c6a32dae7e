"""Benchmark (a script, not a test): freezing point of a four-salt brine (NaCl, KCl,
CaCl2, MgCl2) plus glycerol over N compositions in one vectorized call, with the mixed
Pitzer model, beside the three-solute figure of bench_colligative.py.

    python tests/bench_mixtures.py [N]
"""
from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from solutions.colligative import freezing_point  # noqa: E402
from solutions.composition import Composition  # noqa: E402
from solutions.ingredients import default_library  # noqa: E402


def main(N: int = 100_000) -> None:
    lib = default_library()
    solutes = tuple(lib.get(k) for k in ("NaCl", "KCl", "calcium_chloride_anhydrous",
                                         "magnesium_chloride_anhydrous", "glycerol"))
    rng = np.random.default_rng(1)
    b = rng.uniform(0.0, [1.5, 0.5, 0.5, 0.5, 2.0], size=(N, 5))
    comp = Composition.from_molalities(solutes, b, lib.get("water"))
    freezing_point(Composition.from_molalities(solutes, b[:10], lib.get("water")))  # warm up
    t0 = time.perf_counter()
    Tf, _, _ = freezing_point(comp)
    t = time.perf_counter() - t0
    assert np.all(np.isfinite(Tf))
    print(f"compositions              {N}")
    print(f"4 salts + glycerol        {t:.3f} s  ({N / t:,.0f} points/s)")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 100_000)
