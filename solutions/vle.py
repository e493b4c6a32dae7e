"""Vapor over aqueous solutions with volatile organics: partial pressures, total vapor
pressure, vapor composition, bubble point (the boiling point of the mixture) and the
flash point of flammable aqueous mixtures.

Modified Raoult's law with an ideal vapor (good to about 1 % at pressures near
atmospheric, common practice):

    p_w = a_w p_w*(T)                (a_w of the whole solution, electrolytes included)
    p_i = x_i γ_i p_i*(T)            (x_i, γ_i salt-free, from the NRTL organic term)
    P   = p_w + Σ_i p_i,   y_i = p_i / P

with p_w* from IAPWS-IF97 (supercooled water: Murphy–Koop) and p_i* of each volatile
organic from its pure-liquid vapor-pressure equation. The bubble point at pressure P
is the T where the total vapor pressure equals P.

Flash point (Liaw, Lee, Tang, Hsu and Liu 2002): Le Chatelier's rule applied to the
vapor over the liquid, Σ_i y_i / LFL_i = 1 for the flammable components, with the
lower flammability limit of each taken at its own flash point, LFL_i = p_i*(T_fp,i)/P,
so that the condition reads

    Σ_i x_i γ_i p_i*(T) / p_i*(T_fp,i) = 1.

Water is inert in this rule. The result is a closed-cup estimate; a measurement by the
standard closed-cup method decides the hazard class.

References
----------
Liaw, H.-J.; Lee, Y.-H.; Tang, C.-L.; Hsu, H.-H.; Liu, J.-H. (2002) J. Loss Prev.
Process Ind. 15, 429–438.
"""
from __future__ import annotations

import warnings
from dataclasses import dataclass, field

import numpy as np
from . import roots

from .activity import organics
from .activity.models import ActivityTerms, activity_terms
from .composition import Composition
from .constants import P_ATM, P_CRIT, P_TRIPLE, T_CRIT, T_TRIPLE
from .errors import Caveat, OutOfRangeError
from .water import saturation_pressure, saturation_temperature, supercooled_vapor_pressure

__all__ = ["VaporResult", "volatile_keys", "pure_vapor_pressure", "flash_point_pure",
           "vapor", "bubble_point", "flash_point", "FLASH_CAUTION"]

FLASH_CAUTION = ("flash point estimated from vapor–liquid equilibrium (Liaw et al. 2002); "
                 "a closed-cup measurement by the standard method decides the hazard class "
                 "and the storage, transport and labelling rules that follow")


# ---------------------------------------------------------------- pure-component data
def volatile_keys() -> tuple[str, ...]:
    """Solute keys whose vapor this module counts (those with a pure vapor-pressure curve)."""
    from . import solvents
    return tuple(k for k in solvents.volatile_keys() if k != "water")


def pure_vapor_pressure(T, key: str):
    """Vapor pressure of pure liquid ``key`` [Pa] at ``T`` [K] (the cited curves of
    :func:`solutions.solvents.pure_vapor_pressure`), and a caveat where it is extrapolated."""
    from . import solvents
    T = np.asarray(T, dtype=float)
    try:
        return np.asarray(solvents.pure_vapor_pressure(T, key), dtype=float), []
    except OutOfRangeError as exc:
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            p = np.asarray(solvents.pure_vapor_pressure(T, key, extrapolate=True), dtype=float)
        return p, [Caveat("model-range", f"vapor pressure of pure {key}: {exc}; extrapolated",
                          key)]


def flash_point_pure(key: str) -> float | None:
    """Closed-cup flash point of pure ``key`` [K], or None when not flammable or unknown."""
    from . import flammability
    try:
        return float(flammability.flash_point_pure(key))
    except (KeyError, ValueError):
        return None


# ---------------------------------------------------------------- the vapor
def _water_pressure(T):
    T = np.asarray(T, dtype=float)
    hi = T >= T_TRIPLE
    out = np.empty_like(T)
    if np.any(hi):
        out[hi] = saturation_pressure(np.clip(T[hi], T_TRIPLE, T_CRIT))
    if np.any(~hi):
        out[~hi] = supercooled_vapor_pressure(np.maximum(T[~hi], 200.0))
    return out


@dataclass
class VaporResult:
    """Vapor over N liquid compositions at T (arrays of shape (N,))."""

    T: np.ndarray                       # [K]
    names: tuple[str, ...]              # water first, then each volatile organic
    keys: tuple[str, ...]
    partial_pressures: np.ndarray       # [Pa], shape (N, 1 + k)
    caveats: list[Caveat] = field(default_factory=list)

    @property
    def total_pressure(self) -> np.ndarray:
        return self.partial_pressures.sum(axis=1)

    @property
    def vapor_composition(self) -> np.ndarray:
        P = self.total_pressure
        return self.partial_pressures / P[:, None]


#: an organic known from freezing points only contributes its estimated partial pressure when
#: its pure vapor pressure is at most this share of water's (semi-volatile glycols, glycerol,
#: DMSO); a volatile one (methanol, isopropanol, acetone) has its vapor numbers withheld
MINOR_VAPOR_SHARE = 0.05


def _volatile_groups(terms: ActivityTerms):
    """Indices of the NRTL groups that are volatile, and their keys."""
    vk = set(volatile_keys())
    nrtl_idx = [i for i, k in enumerate(terms.kinds) if k == "nrtl"]
    vol = [(pos, i, terms.params[i].solute) for pos, i in enumerate(nrtl_idx)
           if terms.params[i].solute in vk]
    return nrtl_idx, vol


def _organic_lnx_gamma(terms: ActivityTerms, bs, T):
    """ln(x_i γ_i) of every NRTL organic (salt-free), shape (N, k), or None."""
    nrtl_idx = [i for i, k in enumerate(terms.kinds) if k == "nrtl"]
    if not nrtl_idx:
        return None
    pairs = tuple(terms.params[i] for i in nrtl_idx)
    x = organics.mole_fractions([bs[i] for i in nrtl_idx], terms.M_solvent)
    lg = organics.ln_gammas(pairs, x, T)
    with np.errstate(divide="ignore"):
        return np.log(x[:, 1:]) + lg[:, 1:]


def _partials(terms: ActivityTerms, bs, T, vol):
    """Partial pressures (N, 1 + len(vol)) [Pa] and caveats."""
    T = np.asarray(T, dtype=float)
    cav: list[Caveat] = []
    cols = [np.exp(terms.ln_a(bs, T)) * _water_pressure(T)]
    if vol:
        lxg = _organic_lnx_gamma(terms, bs, T)
        for pos, i, key in vol:
            p_star, c = pure_vapor_pressure(T, key)
            cav.extend(c)
            col = np.exp(lxg[:, pos]) * p_star
            if "vle" not in terms.params[i].data:
                # freezing points fix the water's activity, not the organic's own: its
                # partial pressure is kept only for a semi-volatile organic (a glycol), whose
                # pure vapor pressure is a small fraction of water's, so that even a wrong γ
                # moves the total little; a volatile one (isopropanol) is withheld
                small = np.broadcast_to(p_star <= MINOR_VAPOR_SHARE * _water_pressure(T),
                                        col.shape)
                if np.any(small & (np.asarray(bs[i]) > 0)):
                    cav.append(Caveat(
                        "model-range", f"{terms.labels[i]}: its activity parameters come from "
                        "freezing points only; it is semi-volatile (pure vapor pressure under "
                        f"{MINOR_VAPOR_SHARE:.0%} of water's), so its small partial pressure is "
                        "estimated with them",
                        terms.labels[i], about="vapor"))
                if np.any(~small):
                    cav.append(Caveat(
                        "beyond-data", f"{terms.labels[i]}: its activity parameters come from "
                        "freezing points only (no published vapor–liquid data here), which do "
                        "not fix its own vapor pressure: partial pressure, total vapor "
                        "pressure, boiling and flash point are not reported", terms.labels[i],
                        about="vapor"))
                col = np.where(small | (np.asarray(bs[i]) <= 0), col, np.nan)
            cols.append(col)
    return np.column_stack(cols), cav


def _check(comp: Composition):
    if not comp.solvent.is_water:
        raise OutOfRangeError("solvent", 0.0, None, None, "",
                              f"vapor of mixtures in {comp.solvent.name}: only aqueous "
                              "solutions are modelled")


def vapor(comp: Composition, T, model: str = "nonideal",
          terms: ActivityTerms | None = None) -> VaporResult:
    """Partial pressures of water and each volatile organic over ``comp`` at ``T`` [K]."""
    _check(comp)
    terms = terms or activity_terms(comp, model)
    bs = terms.molalities(comp)
    T = np.broadcast_to(np.asarray(T, dtype=float), (comp.N,)).copy()
    _, vol = _volatile_groups(terms)
    pp, cav = _partials(terms, bs, T, vol)
    cav = list(cav) + _salt_note(terms, vol)
    names = (comp.solvent.name,) + tuple(terms.labels[i] for _, i, _ in vol)
    keys = ("water",) + tuple(k for _, _, k in vol)
    return VaporResult(T, names, keys, pp, cav)


def _salt_note(terms, vol):
    if vol and any(k == "pitzer" for k in terms.kinds):
        return [Caveat("combining-rule", "volatile organics with dissolved salts: their "
                       "partial pressures are taken salt-free (salting out, which raises "
                       "them, is not modelled)", terms.labels[vol[0][1]])]
    return []


def _find_root(f, lo, hi, args, N):
    return roots.bracketed_root(f, lo, hi, args, N, xatol=1e-7, xrtol=1e-12)


def bubble_point(comp: Composition, P=P_ATM, model: str = "nonideal",
                 terms: ActivityTerms | None = None):
    """Bubble temperature [K] at pressure ``P`` [Pa], shape (N,), the vapor mole
    fractions there (N, 1 + k) with the component names, and caveats.

    Searched from 250 K to 30 K above pure water's boiling point at P (the organic
    activity parameters are fitted no higher than that); NaN with a caveat where no
    bubble point lies there.
    """
    _check(comp)
    terms = terms or activity_terms(comp, model)
    bs = terms.molalities(comp)
    N = comp.N
    P = np.broadcast_to(np.asarray(P, dtype=float), (N,)).copy()
    _, vol = _volatile_groups(terms)
    cav: list[Caveat] = []

    def f(T, lnP, *b):
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            pp, _ = _partials(terms, list(b), T, vol)
        return np.log(pp.sum(axis=1)) - lnP

    hi = np.minimum(np.asarray(saturation_temperature(np.clip(P, P_TRIPLE, P_CRIT)),
                               dtype=float) + 30.0, T_CRIT - 1.0)
    Tb = _find_root(f, 250.0, hi, [np.log(P), *bs], N)
    if np.any(~np.isfinite(Tb)):
        cav.append(Caveat("model-range", "no bubble point found between −23 °C and 30 K above "
                          "water's boiling point; not reported", None))
    Tsafe = np.where(np.isfinite(Tb), Tb, 373.15)
    held, c = terms.withheld(bs, Tsafe)
    cav.extend(c)
    Tb = np.where(held, np.nan, Tb)
    pp, c = _partials(terms, bs, Tsafe, vol)
    cav.extend(c)
    cav.extend(terms.caveats(bs, Tsafe))
    cav.extend(_salt_note(terms, vol))
    y = pp / pp.sum(axis=1, keepdims=True)
    y[~np.isfinite(Tb)] = np.nan
    names = (comp.solvent.name,) + tuple(terms.labels[i] for _, i, _ in vol)
    return Tb, y, names, cav


def flash_point(comp: Composition, model: str = "nonideal",
                terms: ActivityTerms | None = None, P=P_ATM):
    """Flash point [K] of the liquid, shape (N,), and caveats (Liaw et al. 2002).

    NaN with a caveat where no flammable volatile component is present, where the
    mixture boils at ``P`` before its vapor reaches the lower flammability limit, or where
    the composition lies beyond the activity model's data (``withheld``).
    """
    _check(comp)
    terms = terms or activity_terms(comp, model)
    bs = terms.molalities(comp)
    N = comp.N
    _, vol = _volatile_groups(terms)
    flam = [(pos, i, k, flash_point_pure(k)) for pos, i, k in vol]
    flam = [v for v in flam if v[3] is not None]
    nan = np.full(N, np.nan)
    if not flam:
        return nan, [Caveat("flash-point", "no flammable volatile component with flash-point "
                            "data: no flash point reported (aqueous solution not flammable "
                            "as far as this model knows)", None, about="vapor")]
    cav: list[Caveat] = [Caveat("flash-point", FLASH_CAUTION, flam[0][2], about="vapor")]
    p_fp = {k: float(pure_vapor_pressure(t, k)[0]) for _, _, k, t in flam}

    def g(T, *b):
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            lxg = _organic_lnx_gamma(terms, list(b), T)
            s = 0.0
            for pos, _i, k, _t in flam:
                s = s + np.exp(lxg[:, pos]) * pure_vapor_pressure(T, k)[0] / p_fp[k]
        return np.log(s)

    Tb, _, _, _ = bubble_point(comp, P, model, terms)
    hi = np.where(np.isfinite(Tb), Tb, 400.0)
    Tfp = _find_root(g, 200.0, hi, bs, N)
    held, c = terms.withheld(bs, np.where(np.isfinite(Tfp), Tfp, 300.0))
    cav.extend(c)
    held |= ~np.isfinite(Tb)
    Tfp = np.where(held, np.nan, Tfp)
    if np.any(~np.isfinite(Tfp) & ~held):
        cav.append(Caveat("flash-point", "no flash point below the boiling point: the vapor "
                          "stays below the lower flammability limit up to boiling (not "
                          "flammable by this estimate)", None, about="vapor"))
    for _, _, k, _ in flam:
        _, c = pure_vapor_pressure(np.where(np.isfinite(Tfp), Tfp, 300.0), k)
        cav.extend(c)
    return Tfp, cav
