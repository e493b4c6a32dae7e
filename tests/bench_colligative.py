"""Benchmark (a script, not a test): freezing point of a 3-solute mixture (NaCl + glycerol +
sucrose, model "nonideal") over N compositions in one vectorized call, against the same points
one at a time through the public scalar route, with peak memory, and against a fused numpy
evaluation of the same freezing residual.

    python tests/bench_colligative.py [N]        # default 100 000

Prints the time of the vectorized call (best of three, untraced) and its cost per point, the
speed ratio to the one-at-a-time loop, the peak traced memory (tracemalloc, a separate call),
and the residual ratio: the solve's time over (one evaluation of the residual
ln a_w(b, T) − ln a_ice(T) at all N points written as one plain numpy expression, composition
terms included) × (the residual evaluations per point that the solver used, bracket ends
included). The solve also does the composition sums once per chunk and a first guess of two
water-activity evaluations, which that product does not count.

Targets: a million compositions in under 1.5 s on one core, peak traced memory under 100 MB,
the cost per point flat from 100 000 to 1 000 000 compositions (the solve works in chunks of
``solutions.roots.ROOT_CHUNK``), at least 50× the per-point loop.
"""
from __future__ import annotations

import sys
import time
import tracemalloc
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from solutions import roots  # noqa: E402
from solutions.activity.organics import load_nrtl_water  # noqa: E402
from solutions.activity.pitzer import (_APHI_CRP94, M_WATER, T_REF,  # noqa: E402
                                       load_pitzer_salts)
from solutions.colligative import freezing_point  # noqa: E402
from solutions.composition import Composition  # noqa: E402
from solutions.constants import P_TRIPLE, T_MELT, T_TRIPLE  # noqa: E402
from solutions.ingredients import default_library  # noqa: E402


def fused_residual(T, b_nacl, b_gly, b_suc, M_w):
    """The freezing residual of NaCl + glycerol + sucrose in one plain numpy expression:
    Pitzer (one 1:1 salt, its low-temperature set, below 273.15 K) + NRTL (water, glycerol,
    sucrose; τ = 0 between the organics; M_w the solvent's molar mass [kg/mol]) −
    ln(p_subl/p_liq) referred to the triple point (IAPWS R14-08, Murphy & Koop Eq. 10).
    Parameters are read from the package's data."""
    low = load_pitzer_salts()["NaCl"].sets[0]
    pairs = load_nrtl_water()
    g, s = pairs["glycerol"], pairs["sucrose"]
    Tr = T_REF

    def ph(tf):   # the phreeqc_analytic form
        a = tf.coeffs
        return (a[0] + a[1] * (1 / T - 1 / Tr) + a[2] * np.log(T / Tr) + a[3] * (T - Tr)
                + a[4] * (T**2 - Tr**2) + a[5] * (1 / T**2 - 1 / Tr**2))

    def ln_ice(T):
        th = T / T_TRIPLE
        ln_subl = (-21.2144006 * th**0.00333333333 + 27.3203819 * th**1.20666667
                   - 6.10598130 * th**1.70333333) / th
        ln_liq = (54.842763 - 6763.22 / T - 4.210 * np.log(T) + 0.000367 * T
                  + np.tanh(0.0415 * (T - 218.8))
                  * (53.878 - 1331.22 / T - 9.44523 * np.log(T) + 0.014025 * T))
        return ln_subl + np.log(P_TRIPLE) - ln_liq

    sI = np.sqrt(b_nacl)
    Aphi = np.polynomial.chebyshev.chebval((2 * T - 607.3) / 139, _APHI_CRP94)
    phi = (1 - Aphi * sI / (1 + 1.2 * sI) + b_nacl * (ph(low.beta0) + ph(low.beta1)
                                                      * np.exp(-2 * sI))
           + b_nacl**2 * ph(low.Cphi))
    x0 = 1 / (1 + M_w * (b_gly + b_suc))
    x2, x3 = M_w * b_gly * x0, M_w * b_suc * x0
    t12g, t21g = g.a12 + g.b12 / T, g.a21 + g.b21 / T
    t12s, t21s = s.a12 + s.b12 / T, s.a21 + s.b21 / T
    G12g, G21g = np.exp(-g.alpha * t12g), np.exp(-g.alpha * t21g)
    G12s, G21s = np.exp(-s.alpha * t12s), np.exp(-s.alpha * t21s)
    sg = x2 * G21g + x3 * G21s
    ln_gw = ((x2 * t21g * G21g + x3 * t21s * G21s) * sg / (x0 + sg) ** 2
             + (x2 + x3) * (x2 * t12g * G12g / (x0 * G12g + x2 + x3) ** 2
                            + x3 * t12s * G12s / (x0 * G12s + x2 + x3) ** 2))
    return (-2 * M_WATER * b_nacl * phi + np.log(x0) + ln_gw
            - (ln_ice(T) - ln_ice(np.array([T_TRIPLE]))[0]))


def solver_counts(comp):
    """(residual evaluations per point, iterations per point) of one freezing_point call."""
    evals, iters = [0], [0]
    br, fr = roots.bracketed_root, roots._find_root

    def counted_bracketed_root(f, *a, **k):
        if getattr(f, "counted", False):   # a chunk of an outer call: counted there
            return br(f, *a, **k)

        def g(x, *args):
            evals[0] += np.size(x)
            return f(x, *args)
        g.counted = True
        return br(g, *a, **k)

    def counted_find_root(*a, **k):
        res = fr(*a, **k)
        iters[0] += int(np.sum(res.nit))
        return res
    roots.bracketed_root, roots._find_root = counted_bracketed_root, counted_find_root
    try:
        freezing_point(comp)
    finally:
        roots.bracketed_root, roots._find_root = br, fr
    return evals[0] / comp.N, iters[0] / comp.N


def main(N: int = 100_000, n_loop: int = 300) -> None:
    lib = default_library()
    solutes = (lib.get("NaCl"), lib.get("glycerol"), lib.get("sucrose"))
    rng = np.random.default_rng(1)
    b = rng.uniform([0.0, 0.0, 0.0], [2.0, 4.0, 1.5], size=(N, 3))
    comp = Composition.from_molalities(solutes, b, lib.get("water"))
    freezing_point(Composition.from_molalities(solutes, b[:10], lib.get("water")))  # warm up

    t_vec = np.inf
    for _ in range(3):
        t0 = time.perf_counter()
        Tf, dT, _ = freezing_point(comp)
        t_vec = min(t_vec, time.perf_counter() - t0)
    assert np.all(np.isfinite(Tf))
    del Tf, dT
    tracemalloc.start()
    Tf, _, _ = freezing_point(comp)
    _, peak = tracemalloc.get_traced_memory()
    tracemalloc.stop()

    t0 = time.perf_counter()
    for i in range(n_loop):
        freezing_point(Composition.from_molalities(solutes, b[i:i + 1], lib.get("water")))
    t_one = (time.perf_counter() - t0) / n_loop

    # the same residual as one numpy expression over all N points, at the roots found
    T = Tf + (T_TRIPLE - T_MELT)            # roots on the triple-point scale
    assert T.max() < 273.15                 # the low-temperature Pitzer set applies
    b_nacl, b_gly, b_suc = (np.ascontiguousarray(b[:, j]) for j in range(3))
    t_fused = np.inf
    for _ in range(3):
        t0 = time.perf_counter()
        r = fused_residual(T, b_nacl, b_gly, b_suc, comp.solvent.M)
        t_fused = min(t_fused, time.perf_counter() - t0)
    n_eval, n_iter = solver_counts(comp)

    print(f"compositions              {N}")
    print(f"vectorized call           {t_vec:.3f} s  ({N / t_vec:,.0f} points/s, "
          f"{t_vec / N * 1e6:.2f} µs/point)")
    print(f"one at a time (scalar)    {t_one * 1e3:.2f} ms/point  ({1 / t_one:,.0f} points/s, "
          f"{n_loop} points timed)")
    print(f"speed ratio               {t_one * N / t_vec:,.0f}x")
    print(f"peak traced memory        {peak / 2**20:.1f} MB")
    print(f"fused numpy residual      {t_fused:.3f} s for all points (|residual| at the roots "
          f"≤ {np.max(np.abs(r)):.1e})")
    print(f"solver                    {n_eval:.2f} residual evaluations per point "
          f"({n_iter:.2f} iterations, {n_eval - n_iter:.2f} at bracket ends)")
    print(f"residual ratio            {t_vec / (t_fused * n_eval):.2f}  "
          "(solve time / (fused residual time × evaluations per point))")

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
