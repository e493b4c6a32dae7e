"""Vectorized bracketed root finding (Chandrupatla's method) on numpy arrays.

The colligative properties solve one equation per composition (freezing point, boiling
point) over a bracket known to hold the root. This module solves all of them at once with
Chandrupatla's hybrid inverse-quadratic / bisection method, whose convergence is
guaranteed like bisection's and usually superlinear. It needs only numpy, so computing a
recipe does not import the large optimisation package (close to a second of CPU at every
command-line call).

The call matches the one the package used before (``elementwise.find_root(f, (a, b),
args=…, tolerances={…})``), so ``from solutions import roots as elementwise`` drops in:
``find_root`` returns an object with ``x``, ``fun``, ``success``, ``status``, ``nit``,
``nfev``, ``bracket`` and ``f_bracket``.

Reference: T. R. Chandrupatla, "A new hybrid quadratic/bisection algorithm for finding
the zero of a nonlinear function without using derivatives", Advances in Engineering
Software 28 (1997) 145–149, doi:10.1016/S0965-9978(96)00051-8 (Figure 1 and the BASIC
listing of its appendix). The stopping rule is bisection's: |x₂ − x₁| < xatol + xrtol·|x_min|.

Two scalar helpers serve a bracket search along one variable (the target solver):
:func:`bisect_edge` narrows an interval around the edge of a condition, :func:`finite_edge`
around the point where a function stops being finite.
"""
from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable

import numpy as np

__all__ = ["find_root", "bracketed_root", "ROOT_CHUNK", "RootResult", "CONVERGED", "SIGN_ERROR",
           "MAX_ITER", "VALUE_ERROR", "bisect_edge", "finite_edge"]

#: ``status`` codes: converged; the bracket does not change sign; out of iterations;
#: a non-finite abscissa or function value
CONVERGED, SIGN_ERROR, MAX_ITER, VALUE_ERROR = 0, -1, -2, -3
_RUNNING = 1


@dataclass(frozen=True)
class RootResult:
    """Roots of a vectorized bracketed solve; every field has the shape of the bracket.

    x : root (NaN where ``success`` is False)
    fun : f at ``x``
    success : ``status == 0``
    status : see :data:`CONVERGED` and the other codes
    nit, nfev : iterations and function evaluations spent on each element
    bracket : (lower, upper) ends of the final bracket
    f_bracket : f at those ends
    """

    x: np.ndarray
    fun: np.ndarray
    success: np.ndarray
    status: np.ndarray
    nit: np.ndarray
    nfev: np.ndarray
    bracket: tuple[np.ndarray, np.ndarray]
    f_bracket: tuple[np.ndarray, np.ndarray]


def find_root(f, init, /, *, args=(), tolerances=None, maxiter=None) -> RootResult:
    """Root of ``f(x, *args) = 0`` in each bracket ``init = (a, b)``, elementwise.

    f : elementwise function of an array ``x`` and the arrays of ``args``
    init : (a, b), the ends of the brackets (any order), broadcastable with ``args``
    tolerances : dict with any of ``xatol`` (default 4 × smallest normal float), ``xrtol``
        (default 4 ε), ``fatol`` (default smallest normal float), ``frtol`` (default 0:
        relative to the smaller |f| at the bracket ends)
    maxiter : iterations allowed (default: the number of halvings that exhaust the
        float range, about 2046)

    An element stops when |x₂ − x₁| < xatol + xrtol·|x_min| or |f(x_min)| ≤ fatol + frtol·
    min(|f(a)|, |f(b)|) (converged), when its bracket holds no sign change, or when a value
    is not finite (failed, ``x`` NaN). Only the elements still running are evaluated.
    """
    return _find_root(f, init, args, tolerances, maxiter)


def _find_root(f, init, args, tolerances, maxiter, f_init=None) -> RootResult:
    """:func:`find_root`; ``f_init``: f at the two ends of ``init`` when the caller has
    already evaluated it there (then f is not evaluated there again)."""
    tol = dict(tolerances or {})
    unknown = set(tol) - {"xatol", "xrtol", "fatol", "frtol"}
    if unknown:
        raise ValueError(f"unknown tolerances {sorted(unknown)}; known: xatol, xrtol, "
                         "fatol, frtol")
    a, b, *bargs = np.broadcast_arrays(*(np.asarray(v, dtype=float) for v in (*init, *args)))
    shape = a.shape
    fi = np.finfo(float)
    xatol = 4 * fi.smallest_normal if tol.get("xatol") is None else float(tol["xatol"])
    xrtol = 4 * fi.eps if tol.get("xrtol") is None else float(tol["xrtol"])
    fatol = fi.smallest_normal if tol.get("fatol") is None else float(tol["fatol"])
    frtol = 0.0 if tol.get("frtol") is None else float(tol["frtol"])
    if maxiter is None:
        maxiter = math.log2(fi.max) - math.log2(fi.smallest_normal)

    n = a.size
    x1, x2 = a.reshape(n).copy(), b.reshape(n).copy()
    A = [v.reshape(n) for v in bargs]
    if f_init is None:
        f_init = (f(x1, *A), f(x2, *A))
    f1, f2 = (np.asarray(v, dtype=float).reshape(n).copy() for v in f_init)
    frtol_i = frtol * np.minimum(np.abs(f1), np.abs(f2))

    # results, written as elements stop
    X, F = np.full(n, np.nan), np.full(n, np.nan)
    XL, XR, FL, FR = x1.copy(), x2.copy(), f1.copy(), f2.copy()
    status = np.full(n, _RUNNING, dtype=np.int32)
    nit, nfev = np.zeros(n, dtype=np.int32), np.full(n, 2, dtype=np.int32)

    idx = np.arange(n)  # indices of the running elements
    x3 = f3 = None
    t = np.full(n, 0.5)
    it = 0
    while True:
        # termination check (Chandrupatla Fig. 1, second diamond)
        closer = np.abs(f1) < np.abs(f2)
        xmin, fmin = np.where(closer, x1, x2), np.where(closer, f1, f2)
        st = np.full(idx.size, _RUNNING, dtype=np.int32)
        done_f = np.abs(fmin) <= fatol + frtol_i
        st[done_f] = CONVERGED
        stop = done_f.copy()
        bad = (np.sign(f1) == np.sign(f2)) & ~stop
        st[bad] = SIGN_ERROR
        stop |= bad
        bad = (~(np.isfinite(x1) & np.isfinite(x2)) | (np.isnan(f1) & np.isnan(f2))) & ~stop
        st[bad] = VALUE_ERROR
        stop |= bad
        dx = np.abs(x2 - x1)
        tl = np.abs(xmin) * xrtol + xatol
        done_x = dx < tl
        st[done_x] = CONVERGED
        stop |= done_x
        if it >= maxiter:
            st[~stop] = MAX_ITER
            stop[:] = True
        if np.any(stop):
            k = idx[stop]
            ok = st[stop] == CONVERGED
            X[k] = np.where(ok, xmin[stop], np.nan)
            F[k] = np.where(ok, fmin[stop], np.nan)
            XL[k], XR[k], FL[k], FR[k] = x1[stop], x2[stop], f1[stop], f2[stop]
            status[k] = st[stop]
            nit[k], nfev[k] = it, it + 2
            keep = ~stop
            idx, x1, x2, f1, f2 = idx[keep], x1[keep], x2[keep], f1[keep], f2[keep]
            frtol_i, dx, tl = frtol_i[keep], dx[keep], tl[keep]
            if x3 is not None:
                x3, f3 = x3[keep], f3[keep]
            t = t[keep]
            A = [v[keep] for v in A]
        if idx.size == 0:
            break
        if x3 is not None:
            # inverse quadratic step where it is safe (Fig. 1 third diamond, Eq. 1)
            with np.errstate(divide="ignore", invalid="ignore"):
                xi = (x1 - x2) / (x3 - x2)
                phi = (f1 - f2) / (f3 - f2)
                alpha = (x3 - x1) / (x2 - x1)
                iq = ((1 - np.sqrt(1 - xi)) < phi) & (phi < np.sqrt(xi))
                tq = (f1 / (f1 - f2) * f3 / (f3 - f2)
                      - alpha * f1 / (f3 - f1) * f2 / (f2 - f3))
            t = np.where(iq, tq, 0.5)
            # keep the new point away from the bracket's ends
            tl_rel = 0.5 * tl / dx
            t = np.clip(t, tl_rel, 1 - tl_rel)
        # new point and bracket update (Fig. 1, first box and first diamond)
        x = x1 + t * (x2 - x1)
        fx = np.asarray(f(x, *A), dtype=float).reshape(x.shape)
        same = np.sign(fx) == np.sign(f1)
        x3 = np.where(same, x1, x2)
        f3 = np.where(same, f1, f2)
        x2 = np.where(same, x2, x1)
        f2 = np.where(same, f2, f1)
        x1, f1 = x, fx
        it += 1
    # the bracket is reported low end first
    lo_first = XL < XR
    xl, xr = np.where(lo_first, XL, XR), np.where(lo_first, XR, XL)
    fl, fr = np.where(lo_first, FL, FR), np.where(lo_first, FR, FL)
    r = lambda v: v.reshape(shape)[()]  # noqa: E731 — scalars come back as 0-d
    return RootResult(x=r(X), fun=r(F), success=r(status == CONVERGED), status=r(status),
                      nit=r(nit), nfev=r(nfev), bracket=(r(xl), r(xr)),
                      f_bracket=(r(fl), r(fr)))


#: compositions solved per vectorized call: keeps the solver's working arrays (and so the
#: cost per point) flat for sweeps of millions of compositions
ROOT_CHUNK = 32_768


def bracketed_root(f, lo, hi, bs, N, *, xatol=1e-9, xrtol=1e-13):
    """Vectorized root of f(x, *bs) in [lo, hi] for N problems; NaN where the bracket holds
    no root (a sign change is needed), ``hi`` where f(hi) is exactly 0. Large sweeps are
    solved in chunks of :data:`ROOT_CHUNK` problems, so the working arrays stay small."""
    lo = np.broadcast_to(np.asarray(lo, dtype=float), (N,))
    hi = np.broadcast_to(np.asarray(hi, dtype=float), (N,))
    args = tuple(np.broadcast_to(np.asarray(b, dtype=float), (N,)) for b in bs)
    if N > ROOT_CHUNK:
        out = np.empty(N)
        for k in range(0, N, ROOT_CHUNK):
            sl = slice(k, min(k + ROOT_CHUNK, N))
            out[sl] = bracketed_root(f, lo[sl], hi[sl], [a[sl] for a in args], sl.stop - k,
                                     xatol=xatol, xrtol=xrtol)
        return out
    lo, hi = lo.copy(), hi.copy()
    with np.errstate(all="ignore"):
        flo, fhi = f(lo, *args), f(hi, *args)
    ok = np.isfinite(flo) & np.isfinite(fhi) & (np.sign(flo) != np.sign(fhi))
    exact_hi = fhi == 0
    out = np.full(N, np.nan)
    out[exact_hi] = hi[exact_hi]
    ok &= ~exact_hi
    if np.any(ok):
        if np.all(ok):   # every bracket holds a root: no copies
            sub, ends, f_ends = args, (lo, hi), (flo, fhi)
        else:
            sub = tuple(a[ok] for a in args)
            ends, f_ends = (lo[ok], hi[ok]), (flo[ok], fhi[ok])
        with np.errstate(all="ignore"):
            res = _find_root(f, ends, sub, {"xatol": xatol, "xrtol": xrtol}, None, f_ends)
        out[ok] = np.where(res.success, res.x, np.nan)
    return out


def bisect_edge(ok: Callable[[float], bool], good: float, bad: float,
                n: int = 60) -> tuple[float, float]:
    """Narrow [good, bad] around the edge of ``ok`` (true at ``good``, false at ``bad``) by
    bisection, to 1e-12 relative or ``n`` halvings; returns the narrowed (good, bad)."""
    for _ in range(n):
        mid = 0.5 * (good + bad)
        if mid in (good, bad) or abs(bad - good) <= 1e-12 * abs(bad):
            break
        if ok(mid):
            good = mid
        else:
            bad = mid
    return good, bad


def finite_edge(f: Callable[[float], float], a: float, fa: float, bad: float, n: int = 50):
    """``f`` is finite at ``a`` (value ``fa``) and not at ``bad`` > ``a``: bisect towards
    ``bad`` until ``f`` changes sign or the finite edge is found (1e-12 relative or ``n``
    halvings). Returns ``("bracket", lo, hi)``, a sign change of ``f`` between lo and hi, or
    ``("edge", x, f(x))``, the last finite point."""
    for _ in range(n):
        mid = 0.5 * (a + bad)
        if mid in (a, bad) or bad - a <= 1e-12 * bad:
            break
        fm = f(mid)
        if not math.isfinite(fm):
            bad = mid
        elif np.sign(fm) != np.sign(fa):
            return "bracket", a, mid
        else:
            a, fa = mid, fm
    return "edge", a, fa
