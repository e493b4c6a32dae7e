"""Water and organic activities of aqueous organic non-electrolytes over the whole
composition range: one multicomponent NRTL term for water + every organic solute.

Parameters are binary water(1)–organic(2) pairs in ``solutions/data/nrtl_water.csv``
(columns ``solute, a12, b12_K, a21, b21_K, alpha, x2_max, w_max, T_min_K, T_max_K,
data, source`` and, optionally, ``e12_lnT, e21_lnT``), fitted by ``tools/fit_nrtl.py``
to published freezing points and vapor–liquid equilibria:

    τ_ij = a_ij + b_ij / T + e_ij ln(T / K)       (e = 0 unless the row gives it)

Organic–organic pairs have no published parameters here: τ = 0 (ideal mixing between
the organics, with each one's non-ideality towards water kept), and a caveat says so.

Mole fractions are salt-free (water + organics); dissolved electrolytes are combined
with this term by the caller (:mod:`solutions.activity.models`, Ross's product rule).

References
----------
Renon, H.; Prausnitz, J. M. (1968) AIChE J. 14, 135–144.
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import cache
from importlib import resources

import numpy as np

from .._csvtable import read_rows
from ..errors import Caveat, SolutionsError
from ..ingredients import M_WATER
from .nrtl import ln_gamma

__all__ = ["NrtlPair", "NrtlDataError", "load_nrtl_water", "ln_gammas", "ln_water_activity",
           "ln_water_activity_sums", "ln_water_activity_at",
           "mole_fractions", "withheld", "validity", "BEYOND_DATA_MARGIN",
           "ORGANIC_ALPHA"]

BEYOND_DATA_MARGIN = 1.1     # compositions past 1.1 × the fitted mole fraction are withheld
COLD_MARGIN_K = 10.0         # and temperatures more than 10 K below the coldest fitted point
ORGANIC_ALPHA = 0.3          # α of organic–organic pairs (irrelevant while their τ = 0)

_REQUIRED = ("solute", "a12", "b12_K", "a21", "b21_K", "alpha", "x2_max", "w_max",
             "T_min_K", "T_max_K", "data", "source")


class NrtlDataError(SolutionsError, ValueError):
    """A row of the NRTL parameter table is missing a column or holds a bad value."""

    def __init__(self, row: int, column: str, reason: str):
        self.row, self.column, self.reason = row, column, reason
        super().__init__(f"nrtl_water.csv row {row}, column {column!r}: {reason}")


@dataclass(frozen=True)
class NrtlPair:
    """NRTL parameters of one water(1)–solute(2) pair and the range of its data."""

    solute: str
    a12: float
    b12: float        # [K]
    a21: float
    b21: float        # [K]
    alpha: float
    x2_max: float     # highest fitted solute mole fraction [1]
    w_max: float      # highest fitted mass fraction [1]
    T_min: float      # [K]
    T_max: float      # [K]
    data: str         # which data kinds the fit used ("freezing", "freezing+vle", ...)
    source: str
    e12: float = 0.0  # coefficient of ln(T/K) in τ12
    e21: float = 0.0

    def taus(self, T):
        """τ12, τ21 [1] at T [K] (any shape)."""
        T = np.asarray(T, dtype=float)
        if not (self.e12 or self.e21):
            return self.a12 + self.b12 / T, self.a21 + self.b21 / T
        lnT = np.log(T)
        return (self.a12 + self.b12 / T + self.e12 * lnT,
                self.a21 + self.b21 / T + self.e21 * lnT)

    @property
    def temperature_dependent(self) -> bool:
        return bool(self.b12 or self.b21 or self.e12 or self.e21)


def _float(r, col, i, default=None):
    v = r.get(col, default)
    if v is None or (isinstance(v, float) and np.isnan(v)):
        if default is not None:
            return default
        raise NrtlDataError(i, col, "missing value")
    try:
        return float(v)
    except (TypeError, ValueError):
        raise NrtlDataError(i, col, f"{v!r} is not a number") from None


@cache
def load_nrtl_water() -> dict[str, NrtlPair]:
    """The NRTL water–solute pairs by ingredient ``solute`` key.

    Rows from other fits may lack the optional ``e12_lnT``/``e21_lnT`` columns (read
    as 0) or carry extra columns (ignored).

    >>> pairs = load_nrtl_water()
    >>> pairs["ethylene glycol"].data
    'freezing'
    """
    path = resources.files("solutions.data") / "nrtl_water.csv"
    rows = read_rows(path, as_text=("solute", "data", "source"))
    missing = [c for c in _REQUIRED if rows and c not in rows[0]]
    if missing:
        raise NrtlDataError(1, missing[0], "column missing from the header")
    out = {}
    for i, r in enumerate(rows, start=2):
        alpha = _float(r, "alpha", i)
        # negative non-randomness parameters are used for some aqueous systems (the fitted
        # urea and citric acid rows); the model's bounds are checked by the property tests
        if not (-1.0 <= alpha <= 1.5 and alpha != 0.0):
            raise NrtlDataError(i, "alpha", f"{alpha} outside [-1, 1.5] or zero")
        out[str(r["solute"])] = NrtlPair(
            str(r["solute"]), _float(r, "a12", i), _float(r, "b12_K", i), _float(r, "a21", i),
            _float(r, "b21_K", i), alpha, _float(r, "x2_max", i), _float(r, "w_max", i),
            _float(r, "T_min_K", i), _float(r, "T_max_K", i), str(r["data"]),
            str(r["source"]), _float(r, "e12_lnT", i, 0.0), _float(r, "e21_lnT", i, 0.0))
    return out


def mole_fractions(bs, M_solvent: float = M_WATER) -> np.ndarray:
    """Salt-free mole fractions (water first, then each organic), shape (N, 1 + k).

    bs : molalities of the organics [mol/kg water], a sequence of k arrays of shape (N,).
    """
    bs = [np.atleast_1d(np.asarray(b, dtype=float)) for b in bs]
    N = max((b.shape[0] for b in bs), default=1)
    n = np.column_stack([np.full(N, 1.0 / M_solvent)] + [np.broadcast_to(b, (N,)) for b in bs])
    return n / n.sum(axis=1, keepdims=True)


def _matrices(pairs, T):
    """τ (N, c, c) and α (c, c) with water as component 0."""
    T = np.atleast_1d(np.asarray(T, dtype=float))
    c = len(pairs) + 1
    tau = np.zeros(T.shape + (c, c))
    alpha = np.full((c, c), ORGANIC_ALPHA)
    for j, p in enumerate(pairs, start=1):
        t12, t21 = p.taus(T)
        tau[..., 0, j] = t12
        tau[..., j, 0] = t21
        alpha[0, j] = alpha[j, 0] = p.alpha
    np.fill_diagonal(alpha, 0.0)
    return tau, alpha


def ln_gammas(pairs, x, T) -> np.ndarray:
    """ln γ of water and each organic [1], shape (N, 1 + k).

    pairs : the k :class:`NrtlPair` of the organics, in the column order of ``x``
    x : salt-free mole fractions, shape (N, 1 + k), water first
    T : temperature [K], scalar or shape (N,)
    """
    x = np.atleast_2d(np.asarray(x, dtype=float))
    T = np.broadcast_to(np.asarray(T, dtype=float), (x.shape[0],))
    tau, alpha = _matrices(tuple(pairs), T)
    return ln_gamma(x, tau, alpha)


def ln_water_activity(pairs, bs, T, M_solvent: float = M_WATER):
    """ln a_w = ln(x_w γ_w) of water with the organics at molalities ``bs`` [mol/kg].

    Vectorized: each b of shape (N,), T scalar or (N,). Returns shape (N,).

    ln γ_w is the multicomponent NRTL expression (:func:`solutions.activity.nrtl.ln_gamma`)
    with τ = 0 between organics, which closes to (water 0, organics l, X = Σ_l x_l)

        ln γ_w = (Σ_l x_l τ_l0 G_l0)(Σ_l x_l G_l0) / (x_0 + Σ_l x_l G_l0)²
                 + X Σ_l x_l τ_0l G_0l / (x_0 G_0l + X)²

    (one organic: the binary NRTL form), evaluated by :func:`ln_water_activity_sums` and
    :func:`ln_water_activity_at`.

    Ethylene glycol, 48 % w/w (14.87 mol/kg): the CRC table's freezing point of −33.30
    °C puts a_w at the ice value there, 0.723 (IAPWS ice over Murphy–Koop water):

    >>> eg = load_nrtl_water()["ethylene glycol"]
    >>> round(float(np.exp(ln_water_activity([eg], [14.872], 239.86))[0]), 3)
    0.724
    """
    pairs = tuple(pairs)
    c, sums = ln_water_activity_sums(pairs, bs, M_solvent)
    out = c + ln_water_activity_at(pairs, T, *sums)
    shape = np.broadcast_shapes(out.shape, np.shape(T))
    return out if out.shape == shape else np.broadcast_to(out, shape).copy()


def ln_water_activity_sums(pairs, bs, M_solvent: float = M_WATER):
    """ln a_w split for many temperatures at fixed composition: ``(c, sums)`` with
    ln a_w(bs, T) = c + :func:`ln_water_activity_at` ``(pairs, T, *sums)``, c = ln x_w [-]
    and ``sums`` composition-only arrays (N,): x_w, X = Σ_l x_l, the sums Σ_l x_l G_l0,
    Σ_l x_l τ_l0 G_l0 and Σ_l x_l τ_0l G_0l / (x_0 G_0l + X)² over the pairs whose τ does not
    depend on T, and x_l of each pair whose τ does. The same subset of every array gives
    the same subset of compositions.

    pairs : the k :class:`NrtlPair` of the organics; bs : their molalities [mol/kg], k
    arrays (N,) or scalars.
    """
    bs = [np.atleast_1d(np.asarray(b, dtype=float)) for b in bs]
    N = max((b.shape[0] for b in bs), default=1)
    r = np.zeros(N)                         # n_organics / n_water
    for b in bs:
        r += b * M_solvent
    x0 = 1.0 / (1.0 + r)
    X = r * x0
    sg, stg, tail = np.zeros(N), np.zeros(N), np.zeros(N)
    x_dep = []
    for p, b in zip(pairs, bs):
        xl = b * M_solvent * x0
        if p.temperature_dependent:
            x_dep.append(xl)
            continue
        t12, t21 = p.taus(1.0)
        G12, G21 = np.exp(-p.alpha * t12), np.exp(-p.alpha * t21)
        sg += xl * G21
        stg += xl * (t21 * G21)
        d = x0 * G12 + X
        tail += xl * (t12 * G12) / (d * d)
    return -np.log1p(r), (x0, X, sg, stg, tail, *x_dep)


def ln_water_activity_at(pairs, T, x0, X, sg, stg, tail, *x_dep):
    """ln γ_w [-] from the sums of :func:`ln_water_activity_sums`: only the pairs whose τ
    depends on T are evaluated. T [K], scalar or shaped like the sums."""
    T = np.asarray(T, dtype=float)
    first = True
    for p, xl in zip((p for p in pairs if p.temperature_dependent), x_dep):
        t12, t21 = p.taus(T)
        G12 = np.exp(-p.alpha * t12)
        G21 = np.exp(-p.alpha * t21)
        xg = xl * G21
        d = x0 * G12
        d += X
        d *= d
        if first:   # the composition-only sums are not modified in place
            sg, stg, tail, first = sg + xg, stg + t21 * xg, tail + xl * (t12 * G12) / d, False
        else:
            sg += xg
            stg += t21 * xg
            tail += xl * (t12 * G12) / d
    den = x0 + sg
    out = stg * sg
    out /= den * den
    out += X * tail
    return out


def beyond_data(pairs, bs, M_solvent: float = M_WATER) -> np.ndarray:
    """Mask (N,) of compositions past the fitted data by more than the margin.

    The organics' total salt-free mole fraction is compared with the mole-fraction
    weighted mean of their fitted limits ``x2_max`` times :data:`BEYOND_DATA_MARGIN`.
    """
    # column by column, in the order of the sums over rows of mole_fractions(), so that the
    # values are those of the (N, 1 + k) array without building it (large sweeps)
    bs = [np.atleast_1d(np.asarray(b, dtype=float)) for b in bs]
    N = max((b.shape[0] for b in bs), default=1)
    bs = [np.broadcast_to(b, (N,)) for b in bs]
    n_tot = np.full(N, 1.0 / M_solvent)
    for b in bs:
        n_tot += b
    tot, lim_sum, x = np.zeros(N), np.zeros(N), np.empty(N)
    for p, b in zip(pairs, bs):
        np.divide(b, n_tot, out=x)
        tot += x
        x *= p.x2_max
        lim_sum += x
    some = tot > 0
    np.divide(lim_sum, tot, out=lim_sum, where=some)
    lim_sum[~some] = 1.0
    lim_sum *= BEYOND_DATA_MARGIN
    return tot > lim_sum


def withheld(labels, pairs, bs, M_solvent: float = M_WATER, T=None):
    """(mask (N,), caveats): compositions beyond the organic model's data, by
    composition (:func:`beyond_data`) or, when ``T`` [K] is given, by temperature: more
    than :data:`COLD_MARGIN_K` below the coldest fitted point of an organic present
    (warmer is allowed: freezing-only pairs assume a_w independent of T, and the VLE
    pairs reach the boiling range)."""
    mask = beyond_data(pairs, bs, M_solvent)
    cav = []
    if T is not None:
        N = mask.shape[0]
        T = np.broadcast_to(np.asarray(T, dtype=float), (N,))
        for lab, p, b in zip(labels, pairs, bs):
            if "vle" not in p.data:
                # freezing-only pairs take a_w as independent of T (common practice for
                # sugars, polyols and glycols): a mixture freezing colder than their own data
                # (a sugar in a brine) is a mild extrapolation, noted, not withheld
                continue
            cold = np.broadcast_to(np.asarray(b, dtype=float) > 0, (N,)) & (
                T < p.T_min - COLD_MARGIN_K)
            if np.any(cold):
                mask = mask | cold
                cav.append(Caveat("beyond-data",
                                  f"{lab}: the activity data reach down to "
                                  f"{p.T_min - 273.15:.1f} °C (at up to {p.w_max * 100:.3g} % w/w "
                                  f"in water alone); {int(cold.sum())} result(s) at "
                                  f"{float(T[cold].min()) - 273.15:.1f} °C, more than "
                                  f"{COLD_MARGIN_K:.0f} K colder, are not reported", lab,
                                  {"T_min_K": p.T_min}))
    if np.any(mask):
        names = ", ".join(labels)
        lims = ", ".join(f"{lab} {p.w_max * 100:.3g} % w/w" for lab, p in zip(labels, pairs))
        which = ("this solution lies" if mask.shape[0] == 1
                 else f"{int(mask.sum())} of the compositions lie")
        cav.append(Caveat("beyond-data",
                          f"{names}: {which} more than "
                          f"{(BEYOND_DATA_MARGIN - 1) * 100:.0f} % past the published data the "
                          f"activity model was fitted to (in water alone: {lims}); values that "
                          "depend on the solvent activity are not reported",
                          labels[0], {"margin": BEYOND_DATA_MARGIN}))
    return mask, cav


def _celsius(T: float) -> str:
    """A temperature [K] in whole °C, never "-0"."""
    t = round(T - 273.15)
    return f"{t + 0:d}"


def validity(labels, pairs, bs, T) -> list[Caveat]:
    """Notes that do not withhold a value: temperature outside a pair's data, mixed
    organics without organic–organic parameters."""
    out = []
    T = np.atleast_1d(np.asarray(T, dtype=float))
    present = [np.any(np.asarray(b) > 0) for b in bs]
    for lab, p, on in zip(labels, pairs, present):
        if not on:
            continue
        lo, hi = p.T_min - 10.0, p.T_max + 10.0
        if np.any((T < lo) | (T > hi)):
            kind = ("temperature-independent τ (freezing-point data only)"
                    if not p.temperature_dependent else "τ(T) fitted")
            outside = float(np.max(np.where((T < lo) | (T > hi), T, -np.inf)))
            head = (f"activity of {lab} in water: its data span {_celsius(p.T_min)} to "
                    f"{_celsius(p.T_max)} °C ({kind})")
            out.append(Caveat("model-range",
                              f"{head}; {outside - 273.15:.4g} °C is outside: extrapolated", lab,
                              {"T_min_K": p.T_min, "T_max_K": p.T_max, "outside_K": outside,
                               "head": head}))
    on_labels = [lab for lab, on in zip(labels, present) if on]
    if len(on_labels) > 1:
        out.append(Caveat("model-range",
                          f"no published NRTL parameters between {', '.join(on_labels)}: "
                          "they mix ideally with each other (τ = 0) while each keeps its "
                          "fitted interaction with water", on_labels[0]))
    return out
