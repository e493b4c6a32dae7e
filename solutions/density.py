"""Density of aqueous solutions from apparent specific volumes of the solutes.

The solution's specific volume is the water's plus each solute's apparent one:

    1/rho = w_w / rho_w(T) + Σ_i w_i / rho_app,i(w_s, T)

with w_s = 1 − w_w the total solute mass fraction (Laliberté & Cooper 2004, eq. 4 and
their mixing rule, which evaluates every solute at the total solute fraction). Per solute,
``solutions/data/density_apparent.csv`` gives one of two published-or-fitted forms:

``laliberte``
    rho_app = (c0 w_s + c1) exp(1e-6 (t + c4)²) / (w_s + c2 + c3 t)   [kg/m³], t in °C;
    coefficients from Laliberté (2009), valid over the table's T and w ranges.
``vapp_poly``
    1/rho_app = c0 + c1 w_s + c2 w_s² + c3 w_s³   [m³/kg]; fitted by tools/fit_density.py
    to the CRC Handbook 20 °C tables. Only 20 °C data stand behind it: at other
    temperatures the solute's apparent volume is held at its 20 °C value while water
    follows IAPWS-IF97, and the result carries a warning.

A solute with neither falls back to ideal volume additivity (its pure-liquid density, or a
listed analogue), flagged in the output. A measured density always wins.

References
----------
Laliberté, M.; Cooper, W. E. (2004) J. Chem. Eng. Data 49, 1141–1151.
Laliberté, M. (2009) J. Chem. Eng. Data 54, 1725–1760.
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import cache
from importlib import resources

import numpy as np
import pandas as pd

from .composition import Composition
from .errors import Caveat
from .water import saturation_pressure, water_density

__all__ = ["DensityResult", "solution_density", "apparent_density", "density_table"]

# Isomers and near relatives used when a solute has no density data of its own. An
# estimate, flagged in every result (common practice for formulation estimates).
_ANALOGUES = {
    "sorbitol": "mannitol",      # C6H14O6 isomers
    "trehalose": "sucrose",      # C12H22O11 isomers
    "sodium lactate": "sodium acetate",
    "glycine": "urea",
}


@cache
def density_table() -> dict[str, dict]:
    """Rows of density_apparent.csv keyed by solute key (loaded once)."""
    path = resources.files("solutions.data") / "density_apparent.csv"
    df = pd.read_csv(str(path))
    return {r["solute"]: r for r in df.to_dict("records")}


def apparent_density(row: dict, w_s, T):
    """Apparent density of one solute, rho_app [kg/m³], at total solute fraction ``w_s``
    [1] and temperature ``T`` [K], from one row of the density table."""
    w_s = np.asarray(w_s, dtype=float)
    t = np.asarray(T, dtype=float) - 273.15
    c0, c1, c2, c3 = (float(row[k]) for k in ("c0", "c1", "c2", "c3"))
    if row["form"] == "laliberte":
        c4 = float(row["c4"])
        return (c0 * w_s + c1) * np.exp(1e-6 * (t + c4) ** 2) / (w_s + c2 + c3 * t)
    if row["form"] == "vapp_poly":
        return 1.0 / (c0 + w_s * (c1 + w_s * (c2 + w_s * c3))) + 0.0 * t
    raise ValueError(f"unknown density form {row['form']!r} for {row['solute']!r}")


@dataclass(frozen=True)
class DensityResult:
    rho: np.ndarray                  # [kg/m³], shape (N,)
    method: str                      # "measured", "apparent volumes", "ideal additivity", ...
    caveats: tuple[Caveat, ...]


def solution_density(comp: Composition, T, measured=None) -> DensityResult:
    """Density [kg/m³] of each composition at ``T`` [K], with the method and caveats.

    ``measured`` [kg/m³] (scalar or shape (N,)) overrides the model.
    """
    T = np.asarray(T, dtype=float)
    if measured is not None:
        rho = np.broadcast_to(np.asarray(measured, dtype=float), (comp.N,)).copy()
        return DensityResult(rho, "measured (given)", ())
    caveats: list[Caveat] = []
    if not comp.solvent.is_water:
        return _ideal_nonaqueous(comp, T)
    table = density_table()
    w = comp.mass_fraction()
    w_s = w.sum(axis=1)
    Tw = np.clip(T, 273.15, 623.15)
    # liquid water above its normal boiling point exists only at its saturation pressure
    rho_w = water_density(Tw, np.maximum(101325.0, 1.0001 * saturation_pressure(Tw)))
    if np.any(T < 273.15):
        caveats.append(Caveat("model-range", "density below 0 °C uses water's density at 0 °C"))
    v = comp.solvent_mass_fraction() / rho_w
    fallback = []
    for j, ing in enumerate(comp.solutes):
        key = ing.solute
        row = table.get(key)
        note = None
        if row is None and key in _ANALOGUES and _ANALOGUES[key] in table:
            row = table[_ANALOGUES[key]]
            note = (f"no density data for {ing.name}; its apparent volume is taken from "
                    f"{_ANALOGUES[key]} (an estimate)")
        if row is not None:
            rho_app = apparent_density(row, w_s, T)
            caveats.extend(_range_caveats(ing.name, row, w_s, T))
            if note:
                caveats.append(Caveat("ideal-fallback", note, ing.name))
        else:
            rho_app = _ideal_apparent_density(ing)
            fallback.append(ing.name)
        v = v + w[:, j] / rho_app
    method = "apparent volumes"
    if fallback:
        method += " + ideal additivity for " + ", ".join(fallback)
        for name in fallback:
            ing = next(s for s in comp.solutes if s.name == name)
            basis = ("its pure-liquid density" if ing.rho_pure else
                     "a typical solid apparent density of 1.5 g/mL (rough estimate)")
            caveats.append(Caveat("ideal-fallback",
                                  f"no solution-density data for {name}: ideal volume "
                                  f"additivity with {basis}; measure the density if "
                                  "volumes matter", name))
    return DensityResult(1.0 / v, method, tuple(caveats))


def _ideal_apparent_density(ing) -> float:
    if ing.rho_pure:
        return ing.rho_pure
    return 1500.0  # typical of dissolved organic solids; flagged where used


def _ideal_nonaqueous(comp: Composition, T) -> DensityResult:
    rho_s = comp.solvent.rho_pure or 1000.0
    v = comp.solvent_mass_fraction() / rho_s
    for j, ing in enumerate(comp.solutes):
        v = v + comp.mass_fraction()[:, j] / _ideal_apparent_density(ing)
    cav = Caveat("ideal-fallback",
                 f"density in {comp.solvent.name} by ideal volume additivity at the pure "
                 "liquids' 20 °C densities (no temperature dependence); measure it if "
                 "volumes matter", comp.solvent.name)
    return DensityResult(1.0 / v, "ideal additivity (non-aqueous)", (cav,))


def _range_caveats(name: str, row: dict, w_s, T) -> list[Caveat]:
    out = []
    t = np.atleast_1d(np.asarray(T, dtype=float)) - 273.15
    tmin, tmax, wmax = float(row["T_min_C"]), float(row["T_max_C"]), float(row["w_max"])
    if np.any(t < tmin - 0.5) or np.any(t > tmax + 0.5):
        extra = (" (fitted at 20 °C only; solute's apparent volume held at its 20 °C value)"
                 if row["form"] == "vapp_poly" else "")
        out.append(Caveat("model-range",
                          f"density data for {name} cover {tmin:g}–{tmax:g} °C{extra}; "
                          f"result at {_fmt_range(t)} °C is extrapolated", name,
                          {"T_min_C": tmin, "T_max_C": tmax}))
    ws = np.atleast_1d(w_s)
    if np.any(ws > wmax * 1.001):
        out.append(Caveat("model-range",
                          f"density data for {name} reach {wmax * 100:.3g} % w/w total solutes; "
                          f"this solution has {ws.max() * 100:.3g} % (extrapolated)", name,
                          {"w_max": wmax}))
    return out


def _fmt_range(t) -> str:
    lo, hi = float(np.min(t)), float(np.max(t))
    return f"{lo:.4g}" if abs(hi - lo) < 1e-9 else f"{lo:.4g}–{hi:.4g}"
