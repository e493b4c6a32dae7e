"""Salting-out of dissolved gases by the other solutes: the Sechenov model of Weisenberger &
Schumpe (1996).

S. Weisenberger and A. Schumpe, "Estimation of gas solubilities in salt solutions at
temperatures from 273 K to 363 K", AIChE J. 42, 298–300 (1996). The ratio of the gas's molar
solubility in pure water c_G0 to that in the salt solution c_G is

    log10(c_G0 / c_G) = Σ_i (h_i + h_G) c_i,     h_G = h_G,0 + h_T (T − 298.15 K),

c_i the molar concentration of ion i [kmol/m³ = mol/L], h_i per ion, h_G,0 and h_T per gas
[m³/kmol]. Coefficients: ``solutions/data/sechenov_ions.csv`` and ``sechenov_gases.csv``;
each salt's ions: ``sechenov_salts.csv``. Stated range: 273–363 K.

Solutes the tables do not cover — ions without an h_i (acetate, citrate, lactate, formate),
and all non-electrolytes (sugars, polyols, alcohols; no published Sechenov coefficient is held
here) — are left out of the sum, and a :class:`~solutions.errors.Caveat` names each one.
The factor returned, f = c_G / c_G0 = 10^(−Σ…), multiplies the gas's molar solubility in pure
water at the same partial pressure.
"""
from __future__ import annotations

import csv
from dataclasses import dataclass, field
from functools import cache
from importlib import resources

import numpy as np

from ..errors import Caveat
from .iapws_henry import get_gas

__all__ = ["MODEL_NAME", "SaltingOut", "ion_table", "gas_table", "salt_ions",
           "sechenov_factor", "salting_out", "T_REF", "C_IONS_CAVEAT"]

MODEL_NAME = "Sechenov, ion- and gas-specific (Weisenberger & Schumpe 1996)"
#: reference temperature of h_T [K]
T_REF = 298.15
#: total ion concentration [kmol/m³] above which a caveat is attached: the correlation was
#: built from data at moderate concentrations (our limit, not a number stated in the paper)
C_IONS_CAVEAT = 5.0


def _rows(name: str) -> list[dict]:
    path = resources.files("solutions.data") / name
    with path.open(encoding="utf-8", newline="") as fh:
        return list(csv.DictReader(ln for ln in fh if not ln.startswith("#")))


@cache
def ion_table() -> dict[str, dict]:
    """Ion → {h [m³/kmol], T_min, T_max [K], source}."""
    return {r["ion"]: {"h": float(r["h_m3_per_kmol"]), "T_min": float(r["T_min_K"]),
                       "T_max": float(r["T_max_K"]), "source": r["source"]}
            for r in _rows("sechenov_ions.csv")}


@cache
def gas_table() -> dict[str, dict]:
    """Gas key → {h_G0 [m³/kmol], h_T [m³/(kmol K)], T_min, T_max [K], source}."""
    return {r["gas"]: {"h_G0": float(r["h_G0_m3_per_kmol"]),
                       "h_T": float(r["h_T_m3_per_kmol_K"]),
                       "T_min": float(r["T_min_K"]), "T_max": float(r["T_max_K"]),
                       "source": r["source"]}
            for r in _rows("sechenov_gases.csv")}


@cache
def _salts() -> dict[str, tuple[tuple[str, float], ...]]:
    out = {}
    for r in _rows("sechenov_salts.csv"):
        out[r["solute"]] = tuple((p.split(":")[0], float(p.split(":")[1]))
                                 for p in r["ions"].split("|"))
    return out


def salt_ions(solute: str) -> tuple[tuple[str, float], ...] | None:
    """The ions (name, count per formula unit) of a dissolved salt, or ``None``."""
    return _salts().get(solute)


def sechenov_factor(T, c_ions, h_ions, gas) -> np.ndarray:
    """f = c_G/c_G0 = 10^(−Σ_i (h_i + h_G(T)) c_i) [1].

    T : temperature [K], shape (N,) or scalar
    c_ions : ion molar concentrations [kmol/m³], shape (N, n_ions)
    h_ions : ion parameters h_i [m³/kmol], shape (n_ions,)
    gas : gas key with a row in ``sechenov_gases.csv``

    >>> round(float(sechenov_factor(298.15, [[1.0, 1.0]], [0.1143, 0.0318], "oxygen")[0]), 4)
    0.7143
    """
    g = gas_table()[get_gas(gas).key]
    T = np.atleast_1d(np.asarray(T, dtype=float))
    c = np.atleast_2d(np.asarray(c_ions, dtype=float))
    h = np.asarray(h_ions, dtype=float)
    hG = g["h_G0"] + g["h_T"] * (T - T_REF)
    s = (c * h).sum(axis=1) + hG * c.sum(axis=1)
    return 10.0 ** (-s)


@dataclass
class SaltingOut:
    """The salting-out factor of one gas for N compositions, and what it left out."""

    factor: np.ndarray                 # c_G / c_G0, shape (N,)
    model: str
    ions: dict[str, np.ndarray]        # ion → molar concentration [kmol/m³], shape (N,)
    caveats: list[Caveat] = field(default_factory=list)


def salting_out(comp, rho, T, gas) -> SaltingOut:
    """Salting-out factor of ``gas`` by the solutes of a :class:`Composition`.

    comp : the composition (N rows)
    rho : solution density [kg/m³], shape (N,) or scalar (for molar concentrations)
    T : temperature [K]
    gas : gas name or key

    Ions are counted from each electrolyte's formula (full dissociation). Electrolyte ions
    without a coefficient and every non-electrolyte are ignored with a caveat; a gas without
    gas parameters gets factor 1 with a caveat; T outside 273–363 K or more than
    :data:`C_IONS_CAVEAT` kmol/m³ of ions gets a caveat.
    """
    g = get_gas(gas)
    T = np.broadcast_to(np.asarray(T, dtype=float), (comp.N,))
    c_mol = comp.molarity(np.broadcast_to(np.asarray(rho, dtype=float), (comp.N,))) / 1e3
    cav: list[Caveat] = []
    ions: dict[str, np.ndarray] = {}
    for j, ing in enumerate(comp.solutes):
        if ing.kind != "electrolyte":
            if np.any(c_mol[:, j] > 0):
                cav.append(Caveat(
                    "no-data", f"salting-out of {g.name}: no Sechenov coefficient for "
                    f"{ing.name} is held, so its effect on gas solubility is ignored (sugars, "
                    "polyols and alcohols usually lower gas solubility somewhat; measure if it "
                    "matters)", ing.name, about="gas"))
            continue
        parts = salt_ions(ing.solute)
        if parts is None:
            cav.append(Caveat("no-data", f"salting-out of {g.name}: the ions of {ing.name} are "
                              "not in the Sechenov tables; it is ignored", ing.name, about="gas"))
            continue
        for ion, nu in parts:
            if ion not in ion_table():
                cav.append(Caveat("no-data", f"salting-out of {g.name}: no Sechenov ion "
                                  f"coefficient for {ion} (from {ing.name}); that ion is ignored",
                                  ing.name, about="gas"))
                continue
            ions[ion] = ions.get(ion, 0.0) + nu * c_mol[:, j]
    if g.key not in gas_table():
        if ions:
            cav.append(Caveat("no-data", f"salting-out: no Weisenberger–Schumpe gas parameter "
                              f"for {g.name}; no salting-out correction is applied", g.name,
                              about="gas"))
        return SaltingOut(np.ones(comp.N), MODEL_NAME, ions, cav)
    if not ions:
        return SaltingOut(np.ones(comp.N), MODEL_NAME, ions, cav)
    names = list(ions)
    c = np.stack([np.broadcast_to(ions[n], (comp.N,)) for n in names], axis=1)
    h = np.array([ion_table()[n]["h"] for n in names])
    f = sechenov_factor(T, c, h, g.key)
    rng = gas_table()[g.key]
    if np.any((T < rng["T_min"] - 0.5) | (T > rng["T_max"])):
        cav.append(Caveat("model-range", f"salting-out of {g.name}: temperature outside the "
                          f"{rng['T_min']:.0f}–{rng['T_max']:.0f} K range of the Weisenberger–"
                          "Schumpe model", g.name, about="gas"))
    tot = c.sum(axis=1)
    if np.any(tot > C_IONS_CAVEAT):
        cav.append(Caveat("model-range", f"salting-out of {g.name}: {float(tot.max()):.3g} mol/L "
                          f"of ions is more than {C_IONS_CAVEAT:g} mol/L, beyond the moderate "
                          "concentrations the Sechenov correlation was built on", g.name,
                          about="gas"))
    if "K+" in ions and np.any(ions["K+"] > 0):
        cav.append(Caveat("data", "salting-out: the K+ coefficient (0.0992 L/mol) is an "
                          "unconfirmed transcription (from memory the paper gives 0.0922)",
                          "K+", about="gas"))
    return SaltingOut(f, MODEL_NAME, ions, cav)
