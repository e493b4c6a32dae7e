"""Solvent activity of a composition under each model, with the caveats that go with it.

Three models share one interface, :func:`solvent_activity` ``(comp, T, model)`` →
``(ln a, caveats)``, so colligative properties are computed the same way whatever the
model:

``dilute``
    ln a = −M_s Σ ν_i b_i: the dilute limit of Raoult's law with ideal van't Hoff
    factors. It is what ΔT = i K b assumes.
``ideal``
    ln a = ln x_s, Raoult's law on mole fractions, each solute counted as ν_i particles.
``nonideal`` (default)
    Electrolytes from the Pitzer equations (:mod:`solutions.activity.pitzer`), each
    at its molality; the organic non-electrolytes with NRTL parameters
    (:mod:`solutions.activity.organics`) together in ONE multicomponent NRTL term on
    salt-free mole fractions (water + organics), valid over the whole composition
    range of their data; other non-electrolytes from their extended Norrish fit
    (:mod:`solutions.activity.nonelectrolytes`). The parts are combined by the Ross
    (1975) product rule, ln a_w = Σ_parts ln a_w,part, each part at its own
    concentration in the water: exact when the parts do not interact, it leaves out
    salt–organic interactions (salting out). Ross rather than Zdanovskii–Stokes–
    Robinson because ZSR needs each part's binary molality at the mixture's a_w (an
    inversion of every binary model inside every root search) and is tested on
    electrolyte mixtures, while Ross is one sum, vectorizes directly and is the rule
    of choice in food and pharmaceutical water-activity practice for sugar/polyol +
    salt mixtures. A caveat states it when both parts are present. A solute with no
    parameters enters by Raoult's law and is named in a caveat. Several ingredients
    that dissolve to the same solute (a salt and its hydrate) are summed first.

    Salts are not combined by the Ross rule among themselves: all of them enter one
    term, the Pitzer mixed-electrolyte equations at their ion molalities (every ion in
    the total ionic strength, cross pairs and mixing parameters θ, ψ; see
    :func:`solutions.activity.pitzer.pitzer_mixture`), and that term is one factor of
    the product.

Non-aqueous solvents have no non-ideal data here: ``nonideal`` falls back to ``ideal``
with a caveat.

References
----------
Ross, K. D. (1975) Food Technol. 29(3), 26–34 (the product rule for mixed solutes).
"""
from __future__ import annotations

import re
from dataclasses import dataclass, replace
from functools import cache, partial

import numpy as np

from ..composition import Composition
from ..errors import Caveat, SolutionsError, merge_caveats
from . import nonelectrolytes, organics

__all__ = ["MODELS", "MODEL_NAMES", "ActivityTerms", "activity_terms", "solvent_activity",
           "solute_groups", "describe_model", "check_model", "NORRISH_MARGIN"]

NORRISH_MARGIN = 1.1   # Norrish-fit compositions past 1.1 × the fitted molality are withheld

MODELS = ("nonideal", "ideal", "dilute")
MODEL_NAMES = {
    "nonideal": "non-ideal: Pitzer mixed electrolytes + NRTL (organics; extended Norrish "
                "where no NRTL data), Ross product between the two",
    "ideal": "ideal solution: Raoult's law on mole fractions",
    "dilute": "dilute ideal: textbook constants, ΔT = i·K·b",
}


def describe_model(model: str) -> str:
    return MODEL_NAMES[_check_model(model)]


def check_model(model: str) -> str:
    """The canonical model name for ``model`` (``nonideal``, ``ideal`` or ``dilute``)."""
    return _check_model(model)


def _check_model(model: str) -> str:
    m = str(model).strip().lower().replace("-", "").replace("_", "")
    alias = {"nonideal": "nonideal", "default": "nonideal", "real": "nonideal",
             "ideal": "ideal", "raoult": "ideal", "dilute": "dilute", "textbook": "dilute"}
    if m not in alias:
        raise SolutionsError(f"unknown model {model!r}; choose one of {', '.join(MODELS)}")
    return alias[m]


@cache
def _pitzer_salts():
    try:
        from . import pitzer
    except ImportError:  # pragma: no cover - the module is part of the package
        return None, {}
    return pitzer, pitzer.load_pitzer_salts()


# ingredient solute keys that a parameter table may spell differently
_PITZER_ALIASES = {
    "trisodium citrate": ("Na3Citrate", "Na3Cit", "Na3C6H5O7", "trisodium citrate"),
    "sodium acetate": ("NaOAc", "NaCH3COO", "NaC2H3O2", "sodium acetate"),
    "potassium acetate": ("KOAc", "KCH3COO", "KC2H3O2", "potassium acetate"),
    "potassium formate": ("KHCOO", "KHCO2", "KFormate", "potassium formate"),
    "sodium formate": ("NaHCOO", "NaHCO2", "NaFormate", "sodium formate"),
    "sodium lactate": ("NaLactate", "NaC3H5O3", "sodium lactate"),
}


def _pitzer_salt(key: str):
    """(pitzer module, binary PitzerSalt or None, key of the salt's ions or None)."""
    mod, salts = _pitzer_salts()
    keys = (key, *_PITZER_ALIASES.get(key, ()))
    binary = next((salts[k] for k in keys if k in salts), None)
    ion_table = mod.load_salt_ions() if mod is not None else {}
    ion_key = next((k for k in keys if k in ion_table), None)
    return mod, binary, ion_key


def solute_groups(comp: Composition) -> dict[str, tuple[list[int], object]]:
    """Columns of ``comp`` grouped by dissolved solute key, with the ingredient of the first."""
    groups: dict[str, list[int]] = {}
    for j, s in enumerate(comp.solutes):
        groups.setdefault(s.solute, []).append(j)
    return {k: (cols, comp.solutes[cols[0]]) for k, cols in groups.items()}


@dataclass(frozen=True)
class ActivityTerms:
    """The solvent-activity model of one set of solutes, ready to evaluate on molalities.

    Built once per recipe (or sweep) by :func:`activity_terms`; :meth:`ln_a` is then a
    pure vectorized function of the group molalities and T, so root finders can call it
    on 100 000 compositions at once.
    """

    model: str
    labels: tuple[str, ...]          # ingredient names, one per solute group
    columns: tuple[tuple[int, ...], ...]
    kinds: tuple[str, ...]           # "pitzer", "nrtl", "norrish", "raoult" per group
    params: tuple[object, ...]
    ions: np.ndarray                 # ideal particles per formula unit, per group
    M_solvent: float                 # [kg/mol]
    notes: tuple[Caveat, ...] = ()   # caveats that do not depend on composition
    electrolytes: object = None      # PitzerMixture of all "pitzer" groups, in group order

    def _ion_molalities(self, bs, T=0.0) -> np.ndarray:
        """Ion molalities [mol/kg] of the "pitzer" groups, shape (..., n_ions), the
        leading shape being that of the group molalities broadcast with ``T``."""
        salt_b = [b for kind, b in zip(self.kinds, bs) if kind == "pitzer"]
        shape = np.broadcast_shapes(np.shape(T), *(np.shape(b) for b in salt_b))
        return self.electrolytes.ion_molalities(
            [np.broadcast_to(np.asarray(b, dtype=float), shape) for b in salt_b])

    def molalities(self, comp: Composition) -> list[np.ndarray]:
        """Group molalities [mol/kg], one array of shape (N,) per group."""
        b = comp.molality()
        return [b[:, list(c)].sum(axis=1) for c in self.columns]

    def ln_a(self, bs, T):
        """ln a of the solvent [1] at group molalities ``bs`` [mol/kg] and ``T`` [K]
        (broadcast together)."""
        T = np.asarray(T, dtype=float)
        if not bs:
            return np.zeros(np.shape(T))
        shape = np.broadcast_shapes(np.shape(T), *(np.shape(b) for b in bs))
        g, args = self.at_compositions(
            [np.broadcast_to(np.asarray(b, dtype=float), shape).reshape(-1) for b in bs])
        return g(np.broadcast_to(T, shape).reshape(-1), *args).reshape(shape)

    def at_compositions(self, bs):
        """``(g, args)`` with ln a(bs, T) = g(T, *args) [1] for any ``T`` [K] (scalar or
        shaped like the molalities), to rounding: every sum over the composition is done
        here, once, so that a search over T (freezing point) evaluates only the functions of
        T. ``args`` are arrays of shape (N,); taking the same subset of each gives ``g`` of
        that subset of the compositions (as a root finder that drops converged points does).

        bs : group molalities [mol/kg], one array (N,) per group.
        """
        bs = [np.atleast_1d(np.asarray(b, dtype=float)) for b in bs]
        N = max((b.shape[0] for b in bs), default=1)
        c = np.zeros(N)
        parts: list[tuple] = []     # (function of (T, *sums), its number of sums)
        sums: list[np.ndarray] = []
        if bs and self.model in ("dilute", "ideal"):
            nu_b = sum(nu * b for nu, b in zip(self.ions, bs))
            c = c + (-self.M_solvent * nu_b if self.model == "dilute"
                     else -np.log1p(self.M_solvent * nu_b))
        elif bs:
            if self.electrolytes is not None:
                ce, se = self.electrolytes.ln_water_activity_sums(self._ion_molalities(bs))
                c += ce
                parts.append((self.electrolytes.ln_water_activity_at, len(se)))
                sums.extend(se)
            org = self._nrtl(bs)
            if org is not None:
                co, so = organics.ln_water_activity_sums(org[1], org[2], self.M_solvent)
                c += co
                parts.append((partial(organics.ln_water_activity_at, org[1]), len(so)))
                sums.extend(so)
            for kind, par, nu, b in zip(self.kinds, self.params, self.ions, bs):
                if kind in ("nrtl", "pitzer"):
                    continue  # all organics in one NRTL term, all salts in one Pitzer term
                if kind == "norrish":
                    c += nonelectrolytes.ln_water_activity(par, b)
                else:
                    c -= np.log1p(nu * b * self.M_solvent)
        parts = tuple(parts)

        def g(T, c, *sums):
            out, k = None, 0
            for fn, n in parts:
                v = fn(T, *sums[k:k + n])
                k += n
                if out is None:
                    out = v
                else:
                    out += v
            if out is None:
                return c + 0.0 * np.asarray(T, dtype=float)
            out += c
            return out
        return g, (c, *sums)

    def _nrtl(self, bs):
        """(labels, pairs, molalities) of the NRTL organics, or None."""
        idx = [i for i, k in enumerate(self.kinds) if k == "nrtl"]
        if self.model != "nonideal" or not idx:
            return None
        return (tuple(self.labels[i] for i in idx), tuple(self.params[i] for i in idx),
                [bs[i] for i in idx])

    def withheld(self, bs, T):
        """(mask of shape (N,), caveats): compositions beyond the organic model's data
        by more than the stated margin (NRTL: 1.1 × the fitted mole fraction, or more than
        10 K colder than the coldest fitted point; Norrish fits: 1.1 × the fitted
        molality), where solvent-activity results are withheld.

        T : [K], scalar or (N,) (kept for models whose range depends on T).
        """
        N = max((np.atleast_1d(np.asarray(b)).shape[0] for b in bs), default=1)
        N = max(N, np.atleast_1d(np.asarray(T)).shape[0])
        mask = np.zeros(N, bool)
        cav: list[Caveat] = []
        if self.model != "nonideal":
            return mask, cav
        org = self._nrtl(bs)
        if org is not None:
            m, c = organics.withheld(org[0], org[1], org[2], self.M_solvent, T)
            mask |= m
            cav.extend(c)
        for label, kind, par, b in zip(self.labels, self.kinds, self.params, bs):
            if kind != "norrish":
                continue
            m = np.broadcast_to(np.asarray(b, dtype=float) > NORRISH_MARGIN * par.b_max, (N,))
            if np.any(m):
                mask |= m
                cav.append(Caveat("beyond-data",
                                  f"{label}: {'this solution is' if N == 1 else str(int(m.sum())) + ' of the compositions are'} above "
                                  f"{NORRISH_MARGIN * par.b_max:.3g} mol/kg, more than "
                                  f"{(NORRISH_MARGIN - 1) * 100:.0f} % past its fitted data "
                                  f"({par.b_max:.3g} mol/kg, {par.w_max * 100:.3g} % w/w in water "
                                  "alone); values that depend on the water activity are not "
                                  "reported there", label, {"b_max": par.b_max}))
        return mask, cav

    def caveats(self, bs, T) -> list[Caveat]:
        """Range warnings for these molalities at ``T`` [K], plus the fixed notes."""
        out = list(self.notes)
        if self.model != "nonideal":
            return out
        if self.electrolytes is not None:
            m = self._ion_molalities(bs, T)
            out.extend(self.electrolytes.caveats(
                m.reshape(-1, m.shape[-1]),
                np.broadcast_to(np.asarray(T, dtype=float), m.shape[:-1]).reshape(-1)))
        org = self._nrtl(bs)
        if org is not None:
            out.extend(organics.validity(org[0], org[1], org[2], T))
        for label, kind, par, b in zip(self.labels, self.kinds, self.params, bs):
            if kind == "pitzer" and par[1] is not None:  # molality and A_phi ranges
                out.extend(par[0].validity(par[1], b, T))
            elif kind == "norrish":
                out.extend(nonelectrolytes.validity(label, par, b, T))
        return merge_caveats([self._named(c) for c in out])

    def _named(self, c: Caveat) -> Caveat:
        """The caveat with salts named as the recipe names them ("Sodium acetate trihydrate
        (NaC2H3O2)") instead of by their parameter-table keys alone."""
        names = {}
        for label, kind, par in zip(self.labels, self.kinds, self.params):
            if kind == "pitzer":
                for key in {par[2], getattr(par[1], "name", None)} - {None}:
                    names[key] = label
        mix = self.electrolytes
        if mix is not None:   # a pair of ions from two different salts of the recipe
            labels = mix.labels()
            for cat, an, salt in mix.pairs:      # ion indices
                if salt is not None and salt.name not in names:
                    names[salt.name] = f"the {labels[cat]}-{labels[an]} pair"
        if not names:
            return c
        pattern = re.compile(r"(?<![\w(])(" + "|".join(re.escape(k) for k in
                             sorted(names, key=len, reverse=True)) + r")(?![\w)])")
        def named(text: str) -> str:
            return pattern.sub(lambda m: f"{names[m.group(1)]} ({m.group(1)})", text)
        msg = named(c.message)
        if msg == c.message:
            return c
        comp = pattern.sub(lambda m: names[m.group(1)], c.component) if c.component else None
        extra = c.extra
        if extra and "head" in extra:      # the words a grouped note starts with
            extra = {**extra, "head": named(extra["head"])}
        return replace(c, message=msg, component=comp, extra=extra)


def activity_terms(comp: Composition, model: str = "nonideal") -> ActivityTerms:
    """Choose, for each dissolved solute of ``comp``, the activity model and parameters."""
    model = _check_model(model)
    groups = solute_groups(comp)
    notes: list[Caveat] = []
    if model == "nonideal" and not comp.solvent.is_water:
        notes.append(Caveat("ideal-fallback", f"no non-ideal activity data for solutions in "
                            f"{comp.solvent.name}: Raoult's law used", comp.solvent.name))
        model = "ideal"
    norrish = nonelectrolytes.load_nonelectrolytes()
    nrtl = organics.load_nrtl_water()
    labels, columns, kinds, params, ions = [], [], [], [], []
    for key, (cols, ing) in groups.items():
        labels.append(ing.name)
        columns.append(tuple(cols))
        ions.append(ing.ions)
        kind, par = "raoult", None
        if model == "nonideal":
            if ing.kind == "electrolyte":
                mod, salt, ion_key = _pitzer_salt(key)
                if ion_key is not None:
                    kind, par = "pitzer", (mod, salt, ion_key)
            elif key in nrtl:
                kind, par = "nrtl", nrtl[key]
            elif key in norrish:
                kind, par = "norrish", norrish[key]
            if kind == "raoult":
                notes.append(Caveat("ideal-fallback",
                                    f"no activity parameters for {ing.name}: it enters as an "
                                    f"ideal solute with {ing.ions:g} particle(s) per formula "
                                    "unit", ing.name))
        kinds.append(kind)
        params.append(par)
    salts = [p[2] for k, p in zip(kinds, params) if k == "pitzer"]
    mixture = params[kinds.index("pitzer")][0].pitzer_mixture(salts) if salts else None
    if model == "nonideal":
        electro = [lab for lab, g in zip(labels, groups.values()) if g[1].kind == "electrolyte"]
        organic = [lab for lab, k in zip(labels, kinds) if k in ("nrtl", "norrish")]
        if electro and organic:
            notes.append(Caveat("combining-rule",
                                f"water activity of {', '.join(electro)} with "
                                f"{', '.join(organic)}: Ross's product rule (each part at its "
                                "own concentration in the water); salt–organic interactions "
                                "(salting out) are not modelled, so mixed results are less "
                                "certain than either part alone", organic[0]))
    return ActivityTerms(model, tuple(labels), tuple(columns), tuple(kinds), tuple(params),
                         np.array(ions, dtype=float), comp.solvent.M, tuple(notes), mixture)


def solvent_activity(comp: Composition, T, model: str = "nonideal"):
    """ln of the solvent activity [1] for each composition, shape (N,), and caveats.

    T : temperature [K], scalar or shape (N,).
    """
    terms = activity_terms(comp, model)
    bs = terms.molalities(comp)
    return terms.ln_a(bs, T), terms.caveats(bs, T)
