"""Phase limits that a property model must not extrapolate past silently.

* Eutectics (``data/eutectics.csv``): above a salt's eutectic concentration, cooling
  crystallises a salt or salt hydrate before ice; the "freezing point" on the ice line
  extended past the eutectic is metastable and is flagged.
* Solubility (``data/solubility.csv``): a solute above its tabulated aqueous solubility
  (g per 100 g water near 20–25 °C) would not dissolve, or would crystallise; flagged.

Both compare the solute with the water alone (its binary concentration), which is the
basis of the published limits.
"""
from __future__ import annotations

from functools import cache
from importlib import resources

import numpy as np
import pandas as pd

from .composition import Composition
from .errors import Caveat

__all__ = ["eutectic_caveats", "solubility_caveats", "eutectics", "solubilities"]


@cache
def eutectics() -> dict[str, dict]:
    df = pd.read_csv(str(resources.files("solutions.data") / "eutectics.csv"))
    return {r["solute"]: r for r in df.to_dict("records")}


@cache
def solubilities() -> dict[str, list[dict]]:
    df = pd.read_csv(str(resources.files("solutions.data") / "solubility.csv"))
    out: dict[str, list[dict]] = {}
    for r in df.to_dict("records"):
        out.setdefault(str(r["ingredient"]).strip().lower(), []).append(r)
    return out


def _binary_fraction(comp: Composition, cols) -> np.ndarray:
    """Mass fraction of the dissolved solute in its binary with all the water [1]."""
    m = comp.m[:, cols].sum(axis=1)
    return m / (m + comp.m_solvent)


def eutectic_caveats(comp: Composition) -> list[Caveat]:
    """Caveats for solutes above their eutectic concentration (freezing-point results)."""
    if not comp.solvent.is_water:
        return []
    from .activity.models import solute_groups
    table = eutectics()
    out = []
    for key, (cols, ing) in solute_groups(comp).items():
        row = table.get(key)
        if row is None:
            continue
        w = _binary_fraction(comp, cols)
        limit = float(row["eutectic_mass_pct"]) / 100
        if np.any(w > limit):
            out.append(Caveat(
                "eutectic",
                f"{ing.name} is above its eutectic ({limit * 100:g} % w/w in water, "
                f"{float(row['eutectic_T_C']):g} °C): on cooling the salt (or its hydrate) "
                "crystallises before ice, so the ice freezing point shown is metastable and the "
                f"lowest liquid temperature is about {float(row['eutectic_T_C']):g} °C",
                ing.name, {"eutectic_mass_pct": limit * 100,
                           "eutectic_T_C": float(row["eutectic_T_C"])}))
    return out


def solubility_caveats(comp: Composition) -> list[Caveat]:
    """Caveats for solutes above their tabulated aqueous solubility."""
    if not comp.solvent.is_water:
        return []
    from .activity.models import solute_groups
    table = solubilities()
    out = []
    for key, (cols, ing) in solute_groups(comp).items():
        rows = table.get(ing.name.lower()) or table.get(key.lower()) or table.get(
            ing.name.split(" (")[0].lower())
        if not rows:
            continue
        best = max(rows, key=lambda r: float(r["solubility_g_per_100g_water"]))
        s = float(best["solubility_g_per_100g_water"]) / 100.0  # g solute per g water
        ratio = comp.m[:, cols].sum(axis=1) / comp.m_solvent
        if np.any(ratio > s * 1.0001):
            out.append(Caveat(
                "solubility",
                f"{ing.name} at {ratio.max() * 100:.4g} g per 100 g water exceeds its solubility "
                f"({s * 100:.4g} g/100 g water at {float(best['T_C']):g} °C): it would not all "
                "dissolve, or would crystallise", ing.name,
                {"solubility_g_per_100g_water": s * 100}))
    return out
