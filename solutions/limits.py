"""Phase limits that a property model must not extrapolate past silently, read once.

* Solubility (``data/solubility.csv``): the saturated solution's solute per water against
  temperature. One rule everywhere: the limit at the solution's temperature, linear in T
  between tabulated points and the nearest point outside the table (said so).
* Eutectics (``data/eutectics.csv``): above a salt's eutectic concentration, cooling
  crystallises a salt or salt hydrate before ice; the "freezing point" on the ice line past
  the eutectic is metastable and is flagged.
* E-values (``data/e_values.csv``): sodium-chloride equivalents for the isotonicity
  estimate shown beside the model.

Limits compare each dissolved solute with all the water (its binary concentration), the
basis of the published limits. Data rows name an ingredient (any library name: a generic
name applies to every form) and are matched by the dissolved solute.
"""
from __future__ import annotations

import csv
from functools import cache
from importlib import resources

import numpy as np

from .composition import Composition
from .errors import Caveat, IngredientError
from .ingredients import Library, default_library

__all__ = ["solubility_limit", "solubility_caveats", "eutectic", "eutectic_caveats",
           "e_value_table", "e_values", "solute_keys"]


def _rows(filename: str) -> list[dict]:
    path = resources.files("solutions.data") / filename
    with path.open(encoding="utf-8", newline="") as fh:
        return list(csv.DictReader(ln for ln in fh if not ln.startswith("#")))


def solute_keys(name: str, lib: Library | None = None) -> set[str]:
    """The dissolved-solute keys a data-table name refers to (all forms of a generic name)."""
    lib = lib or default_library()
    try:
        return {lib.get(name).solute}
    except IngredientError as exc:
        keys = set()
        for s in exc.suggestions if "ambiguous" in exc.reason else ():
            try:
                keys.add(lib.get(s).solute)
            except IngredientError:
                keys.update(i.solute for i in lib if i.name == s)
        return keys


def _solute_of(row: dict, lib: Library) -> set[str]:
    for col in ("ingredient_key", "key", "ingredient", "name"):
        name = (row.get(col) or "").strip()
        if name:
            keys = solute_keys(name, lib)
            if keys:
                return keys
    return set()


@cache
def _solubility_table() -> dict[str, tuple[np.ndarray, np.ndarray, str, str]]:
    """solute key → (T [K] sorted, saturation ratio [kg solute / kg water], source, name)."""
    lib = default_library()
    acc: dict[str, list] = {}
    for r in _rows("solubility.csv"):
        if "solubility_g_per_100g_water" in r and (r["solubility_g_per_100g_water"] or "").strip():
            ratio = float(r["solubility_g_per_100g_water"]) / 100.0
        elif (r.get("solubility_mass_pct") or "").strip():
            w = float(r["solubility_mass_pct"]) / 100.0
            ratio = w / (1.0 - w)
        else:
            continue  # an explicit "no published limit" row
        for key in _solute_of(r, lib):
            acc.setdefault(key, []).append((float(r["T_C"]) + 273.15, ratio, r.get("source", ""),
                                            r.get("ingredient") or r.get("ingredient_key", "")))
    out = {}
    for key, pts in acc.items():
        pts.sort()
        out[key] = (np.array([p[0] for p in pts]), np.array([p[1] for p in pts]),
                    pts[0][2], pts[0][3])
    return out


def solubility_limit(solute: str, T: float) -> tuple[float, dict] | None:
    """Solubility of dissolved solute ``solute`` (model key) at ``T`` [K] as kg solute per kg
    water, and where it came from; ``None`` when no limit is tabulated. Linear in T between
    tabulated points; outside them the nearest point (``info["extrapolated"]``)."""
    row = _solubility_table().get(solute)
    if row is None:
        return None
    Ts, rs, source, name = row
    outside = T < Ts[0] - 1e-9 or T > Ts[-1] + 1e-9
    return float(np.interp(T, Ts, rs)), {"T_min": float(Ts[0]), "T_max": float(Ts[-1]),
                                         "extrapolated": bool(outside), "source": source,
                                         "name": name}


def _groups(comp: Composition) -> dict[str, tuple[list[int], object]]:
    groups: dict[str, list[int]] = {}
    for j, s in enumerate(comp.solutes):
        groups.setdefault(s.solute, []).append(j)
    return {k: (cols, comp.solutes[cols[0]]) for k, cols in groups.items()}


def solubility_caveats(comp: Composition, T: float) -> list[Caveat]:
    """A caveat for every dissolved solute above its solubility at ``T`` [K] (first
    composition of ``comp``, the recipe itself)."""
    if not comp.solvent.is_water:
        return []
    out = []
    m_w = float(comp.m_solvent[0])
    for key, (cols, ing) in _groups(comp).items():
        lim = solubility_limit(key, T)
        if lim is None or m_w <= 0:
            continue
        r_sat, info = lim
        r = float(comp.m[0, cols].sum()) / m_w
        if r > r_sat * (1 + 1e-9):
            where = (f"{T - 273.15:.4g} °C, taken from the nearest tabulated "
                     f"{info['T_min'] - 273.15:g}–{info['T_max'] - 273.15:g} °C"
                     if info["extrapolated"] else f"{T - 273.15:.4g} °C")
            out.append(Caveat(
                "solubility",
                f"{ing.name}: {r * 100:.4g} g per 100 g water exceeds its solubility, "
                f"{r_sat * 100:.4g} g per 100 g water at {where}: it will not all dissolve, "
                "or will crystallise, and the figures assume it stays dissolved", ing.name,
                {"g_per_100g_water": r * 100, "solubility_g_per_100g_water": r_sat * 100},
                about="recipe"))
    return out


@cache
def _eutectic_table() -> dict[str, dict]:
    lib = default_library()
    out = {}
    for r in _rows("eutectics.csv"):
        keys = {r["solute"]} if r.get("solute") else _solute_of(r, lib)
        for k in keys:
            out[k] = r
    return out


def eutectic(solute: str) -> tuple[float, float, dict] | None:
    """Ice–solute eutectic of ``solute`` (model key): (r_E [kg solute per kg water], T_E [K],
    row) or ``None``; r_E = w_E / (1 − w_E) from the eutectic mass fraction w_E."""
    row = _eutectic_table().get(solute)
    if row is None:
        return None
    w = float(row["eutectic_mass_pct"]) / 100.0
    return w / (1.0 - w), float(row["eutectic_T_C"]) + 273.15, row


def eutectic_caveats(comp: Composition) -> list[Caveat]:
    """Caveats for solutes above their eutectic concentration (freezing-point results)."""
    if not comp.solvent.is_water:
        return []
    out = []
    for key, (cols, ing) in _groups(comp).items():
        e = eutectic(key)
        if e is None:
            continue
        r_E, T_E, _ = e
        r = (comp.n[:, cols] * comp.M[cols]).sum(axis=1) / comp.m_solvent  # no (N, k) masses
        if np.any(r > r_E * (1 + 1e-9)):
            w_E = r_E / (1 + r_E) * 100
            out.append(Caveat(
                "eutectic",
                f"{ing.name} is above its eutectic ({w_E:.3g} % w/w in water, "
                f"{T_E - 273.15:.3g} °C): on cooling the salt (or its hydrate) crystallises "
                "before ice, so the ice freezing point shown is metastable and the lowest "
                f"liquid temperature is about {T_E - 273.15:.3g} °C", ing.name,
                {"eutectic_mass_pct": w_E, "eutectic_T_C": T_E - 273.15}))
    return out


@cache
def e_value_table() -> dict[str, dict]:
    """E-values (sodium-chloride equivalents) by library key: {"E", "derived", "source"};
    a row with only ΔTf(1 %) gets E = ΔTf / ΔTf(NaCl) (common practice)."""
    rows = _rows("e_values.csv")
    nacl = next((r for r in rows if r.get("key") == "sodium_chloride"), None)
    dT_nacl = float(nacl["freezing_point_depression_1pct_K"]) if nacl and \
        (nacl.get("freezing_point_depression_1pct_K") or "").strip() else None
    out = {}
    for r in rows:
        key = (r.get("key") or "").strip()
        if not key:
            continue  # the form (hydrate) is not stated: not matched to a library entry
        E = (r.get("E_value") or "").strip()
        dT = (r.get("freezing_point_depression_1pct_K") or "").strip()
        if E:
            out[key] = {"E": float(E), "derived": "", "source": r.get("source", "")}
        elif dT and dT_nacl:
            out[key] = {"E": float(dT) / dT_nacl,
                        "derived": f"E = ΔTf(1 %) {float(dT):g} K / {dT_nacl:g} K for NaCl",
                        "source": r.get("source", "")}
    return out


def e_values() -> dict[str, float]:
    """E-values by library key."""
    return {k: v["E"] for k, v in e_value_table().items()}
