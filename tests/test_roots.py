"""The numpy-only bracketed root finder (Chandrupatla's method) and the csv table reader.

References outside the project: SciPy's ``scipy.optimize.elementwise.find_root`` (the same
published method, Chandrupatla 1997, used here only as a test reference), exact roots known in
closed form (π/2, 2^(1/3), √2), and pandas' CSV reader for the data tables.
"""
import math

import numpy as np
import pytest
from hypothesis import given, settings, strategies as st

from solutions.roots import (CONVERGED, SIGN_ERROR, bisect_edge, bracketed_root, find_root,
                            finite_edge)


def test_closed_form_roots():
    """cos x = 0 at π/2 in [1, 2]; x³ = 2 at 2^(1/3); x² = 2 at √2."""
    r = find_root(np.cos, (1.0, 2.0))
    assert r.success and r.x == pytest.approx(math.pi / 2, abs=1e-15)
    r = find_root(lambda x, c, p: x ** p - c, (0.0, 3.0), args=([2.0, 2.0], [3.0, 2.0]))
    assert np.allclose(r.x, [2.0 ** (1 / 3), math.sqrt(2.0)], rtol=0, atol=4e-16)
    assert r.x.shape == (2,) and r.success.all()


def test_bisect_edge_and_finite_edge_closed_form():
    """The edge of x² < 2 is √2; √(2 − x) − 1 is finite up to x = 2 and changes sign at 1;
    √(2 − x) + 1 has no root, so the search ends at the finite edge x → 2."""
    good, bad = bisect_edge(lambda x: x * x < 2.0, 1.0, 2.0)
    assert good < math.sqrt(2.0) <= bad and bad - good <= 1e-12 * 2.0

    def f(c):
        return lambda x: math.sqrt(2.0 - x) + c if x <= 2.0 else math.nan
    how, lo, hi = finite_edge(f(-1.0), 0.0, f(-1.0)(0.0), 4.0)
    assert how == "bracket" and lo <= 1.0 <= hi
    how, x, fx = finite_edge(f(1.0), 0.0, f(1.0)(0.0), 4.0)
    assert how == "edge" and x == pytest.approx(2.0, abs=1e-9) and fx == f(1.0)(x)


def test_bracket_without_sign_change_fails_with_nan():
    r = find_root(np.sin, (1.0, 2.0))
    assert not r.success and r.status == SIGN_ERROR and math.isnan(r.x)


def test_tolerance_keys_are_checked():
    with pytest.raises(ValueError, match="xtol"):
        find_root(np.cos, (1.0, 2.0), tolerances={"xtol": 1e-9})


@pytest.mark.parametrize("tol", [None, {"xatol": 1e-9, "xrtol": 1e-13}])
def test_same_results_as_scipy(tol):
    """Same roots, status and evaluation counts as SciPy's implementation of the same method
    on 2000 random monotone and oscillating equations (freezing/boiling-point solves rely on
    this being a drop-in)."""
    elementwise = pytest.importorskip("scipy.optimize.elementwise")
    rng = np.random.default_rng(1)
    c, p = rng.uniform(0.1, 10, 2000), rng.uniform(0.5, 5, 2000)

    def f(x, c, p):
        return x ** p - c + 0.3 * np.sin(5 * x)

    a = find_root(f, (0.0, 6.0), args=(c, p), tolerances=tol)
    b = elementwise.find_root(f, (0.0, 6.0), args=(c, p), tolerances=tol)
    assert np.array_equal(a.status, b.status)
    assert np.array_equal(a.x, b.x, equal_nan=True)
    assert np.array_equal(a.nfev, b.nfev)


def test_bracketed_root_evaluates_each_end_once():
    """bracketed_root checks the ends for a sign change and hands their values to the
    solver: the same roots as find_root (checked against SciPy above) with the same number
    of evaluations, the ends evaluated once; no root (NaN) where a bracket holds none."""
    rng = np.random.default_rng(2)
    c, p = rng.uniform(0.1, 10, 500), rng.uniform(0.5, 5, 500)
    seen = []

    def f(x, c, p):
        seen.append(np.size(x))
        return x ** p - c + 0.3 * np.sin(5 * x)

    hi = np.where(np.arange(500) % 50 == 0, 1e-3, 6.0)   # every 50th: no sign change
    ref = find_root(f, (0.0, hi), args=(c, p), tolerances={"xatol": 1e-9, "xrtol": 1e-13})
    n_ref = sum(seen)
    seen.clear()
    x = bracketed_root(f, 0.0, hi, (c, p), 500)
    assert np.array_equal(x, np.where(ref.success, ref.x, np.nan), equal_nan=True)
    assert sum(seen) == n_ref and not ref.success.all()


@settings(max_examples=200, deadline=None)
@given(st.floats(-1e3, 1e3), st.floats(1e-3, 1e3), st.floats(1e-3, 1e3))
def test_root_within_tolerance(r0, left, right):
    """For f(x) = (x − r)³ the root r is found within xatol + xrtol·|r| on any bracket."""
    res = find_root(lambda x: (x - r0) ** 3, (r0 - left, r0 + right),
                    tolerances={"xatol": 1e-9, "xrtol": 1e-13})
    assert res.status == CONVERGED
    assert abs(res.x - r0) <= 1e-9 + 1e-13 * abs(r0) + 1e-12


def test_data_tables_read_as_before():
    """The csv reader gives the rows pandas gave for every data table both can read."""
    pd = pytest.importorskip("pandas")
    from importlib import resources
    from solutions._csvtable import read_rows
    names = ["density_apparent.csv", "liquid_density.csv", "density_correlations.csv",
             "nonelectrolyte_activity.csv", "ingredients.csv", "ions.csv"]
    for name in names:
        path = str(resources.files("solutions.data") / name)
        for text in (False, True):
            df = (pd.read_csv(path, dtype=str, keep_default_na=False) if text
                  else pd.read_csv(path))
            theirs, mine = df.to_dict("records"), read_rows(path, text=text)
            assert len(mine) == len(theirs), name
            for r, t in zip(mine, theirs):
                for k, v in t.items():
                    if isinstance(v, float) and math.isnan(v):
                        assert isinstance(r[k], float) and math.isnan(r[k]), (name, k)
                    else:
                        assert r[k] == v, (name, k, r[k], v)
