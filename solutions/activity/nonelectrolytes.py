"""Water activity of aqueous non-electrolytes (sugars, polyols, glycols, alcohols, urea).

Norrish (1966) form, extended by higher terms where the data reach high concentration:

    ln a_w = ln x_w + Σ_{k=1..5} K_k x_s^(k+1)

with x_s the solute mole fraction in the binary solution and x_w = 1 − x_s. With every K
zero it is Raoult's law; K1 alone is Norrish's equation (Norrish's K for glucose, 2.25,
is K1 = −2.25 here, as our fit also finds). Coefficients are in
``solutions/data/nonelectrolyte_activity.csv``, fitted by ``tools/fit_activity.py`` to
published freezing points (a freezing-point table is a water-activity table at the
freezing temperature). The temperature dependence of a_w at fixed composition is small
for these solutes and is neglected (common practice for sugar and polyol solutions):
values at room or boiling temperature carry a note when far from the fitted range.

References
----------
Norrish, R. S. (1966) J. Food Technol. 1, 25–39.
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import cache
from importlib import resources

import numpy as np

from .._csvtable import read_rows
from ..errors import Caveat
from ..ingredients import M_WATER

__all__ = ["NorrishSolute", "load_nonelectrolytes", "ln_water_activity", "validity"]


@dataclass(frozen=True)
class NorrishSolute:
    name: str
    K: tuple[float, ...]       # K1..K5 [1]
    b_max: float               # highest fitted molality [mol/kg]
    w_max: float               # highest fitted mass fraction [1]
    T_min: float               # lowest fitted temperature [K]
    T_max: float               # [K]
    source: str


@cache
def load_nonelectrolytes() -> dict[str, NorrishSolute]:
    path = resources.files("solutions.data") / "nonelectrolyte_activity.csv"
    out = {}
    for r in read_rows(path):
        out[r["solute"]] = NorrishSolute(
            r["solute"], tuple(float(r[f"K{k}"]) for k in range(1, 6)), float(r["b_max"]),
            float(r["w_max"]), float(r["T_min_K"]), float(r["T_max_K"]),
            r["source"])
    return out


def ln_water_activity(solute: NorrishSolute, b):
    """ln a_w of the binary solution of ``solute`` at molality ``b`` [mol/kg]; vectorized.

    x_s = b M_w / (1 + b M_w), M_w the molar mass of water [kg/mol].

    Glucose at 1 mol/kg (isopiestic data give about 0.982, from memory):

    >>> glc = load_nonelectrolytes()["glucose"]
    >>> round(float(np.exp(ln_water_activity(glc, 1.0))), 4)
    0.9815
    """
    b = np.asarray(b, dtype=float)
    x = b * M_WATER / (1.0 + b * M_WATER)
    poly = np.zeros_like(x)
    for k in range(len(solute.K) - 1, -1, -1):  # Horner in x, starting at x²
        poly = poly * x + solute.K[k]
    return np.log1p(-x) + poly * x * x


def validity(name: str, solute: NorrishSolute, b, T) -> list[Caveat]:
    """Warnings when ``b`` or ``T`` leave the range the coefficients were fitted on."""
    out = []
    b = np.atleast_1d(np.asarray(b, dtype=float))
    if np.any(b > solute.b_max * 1.02):
        out.append(Caveat("model-range",
                          f"water-activity data for {name} reach {solute.b_max:.3g} mol/kg "
                          f"({solute.w_max * 100:.3g} % w/w in water alone); this solution has "
                          f"{b.max():.3g} mol/kg: extrapolated", name,
                          {"b_max": solute.b_max}))
    return out
