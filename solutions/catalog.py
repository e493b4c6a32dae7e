"""Finding ingredients in the library, and what data the package holds for each.

:func:`find_ingredients` matches a typed text against every entry's key, name, synonyms and
formula (case, spaces, dashes, dots and underscores ignored), so "tris", "WFI" or "Epsom"
find Tromethamine, Water and Magnesium sulfate heptahydrate. :func:`ingredient_record`
gathers one entry's library columns with what each model would use for it — the activity
model (asked of :func:`solutions.activity.models.activity_terms` on a one-solute solution),
density data (asked of :func:`solutions.density.solution_density`), pure-liquid vapor
pressure, solubility and eutectic, E-value and partition data — without reading any table
itself.
"""
from __future__ import annotations

import difflib
from typing import Iterable

from .ingredients import Ingredient, Library, _norm, generic_name

__all__ = ["find_ingredients", "close_names", "ingredient_record", "forms_of",
           "ACTIVITY_MODEL_NAMES"]

#: how each activity-model kind of :class:`~solutions.activity.models.ActivityTerms` is named
ACTIVITY_MODEL_NAMES = {"pitzer": "Pitzer binary", "norrish": "extended Norrish",
                        "nrtl": "NRTL", "raoult": "ideal (Raoult's law)"}

#: temperature at which a listing states solubility [K]
T_LISTING = 298.15


def _fields(ing: Ingredient) -> tuple[str, ...]:
    return (ing.key, ing.name, *ing.synonyms, ing.formula)


def find_ingredients(lib: Library, text: str) -> list[Ingredient]:
    """Entries whose key, name, a synonym or the formula contains ``text`` (case, spaces,
    dashes, dots and underscores ignored). Exact matches come first, then those starting
    with the text, then the rest, each in library order."""
    q = _norm(text).replace(".", "")
    if not q:
        return list(lib)
    ranked = []
    for pos, ing in enumerate(lib):
        norms = [_norm(f).replace(".", "") for f in _fields(ing) if f]
        if any(q == n for n in norms):
            ranked.append((0, pos, ing))
        elif any(n.startswith(q) for n in norms):
            ranked.append((1, pos, ing))
        elif any(q in n for n in norms):
            ranked.append((2, pos, ing))
    return [ing for _, _, ing in sorted(ranked, key=lambda r: r[:2])]


def close_names(lib: Library, text: str, n: int = 5) -> list[str]:
    """Names of entries whose key, name or a synonym is close in spelling to ``text``."""
    by_alias: dict[str, str] = {}
    for ing in lib:
        for f in _fields(ing):
            if f:
                by_alias.setdefault(_norm(f), ing.name)
    hits = difflib.get_close_matches(_norm(text), list(by_alias), n=3 * n, cutoff=0.6)
    return list(dict.fromkeys(by_alias[h] for h in hits))[:n]


def forms_of(lib: Library, ing: Ingredient) -> list[Ingredient]:
    """Other entries of the same substance: the same generic name (a hydrate and its
    anhydrous salt, stock solutions) or the same dissolved solute."""
    g = generic_name(ing.name)
    return [o for o in lib if o.key != ing.key
            and (generic_name(o.name) == g or (o.solute == ing.solute and not ing.is_water))]


def _one_solute(ing: Ingredient, lib: Library, b: float = 0.1):
    from .composition import Composition
    water = next(o for o in lib if o.is_water)
    return Composition.from_molalities((ing,), [[b]], water)


def _activity_model(ing: Ingredient, lib: Library) -> str:
    if ing.is_water:
        return "solvent (IAPWS water)"
    from .activity.models import activity_terms
    kinds = activity_terms(_one_solute(ing, lib), "nonideal").kinds
    return ACTIVITY_MODEL_NAMES.get(kinds[0], kinds[0]) if kinds else "none"


def _density_data(ing: Ingredient, lib: Library) -> str:
    if ing.is_water:
        return "IAPWS-IF97 (water)"
    from .density import solution_density
    res = solution_density(_one_solute(ing, lib), 293.15)
    notes = [c.message for c in res.caveats if c.kind == "ideal-fallback"]
    if not notes:
        return "solution-density table"
    if any("is taken from" in m for m in notes):
        return "analogue solute's table (estimate)"
    return "ideal additivity (no solution-density data)"


def ingredient_record(ing: Ingredient, lib: Library) -> dict:
    """Every library column of ``ing`` and what the models have for it (see the module).

    Keys: the library columns (``key``, ``name``, ``synonyms``, ``formula``,
    ``molar_mass_g_per_mol``, ``hydrate_water``, ``solute``, ``kind``, ``ions``,
    ``solution_pct_w_w``, ``density_g_per_mL``, ``acid_base``, ``source``, ``caution``,
    ``custom``), ``forms`` (name, key, molar mass of each other form), ``activity_model``,
    ``density_data``, ``vapor_pressure`` (bool), ``solubility`` (at 25 °C, or ``None``),
    ``eutectic`` (or ``None``), ``E_value`` (or ``None``), ``log_Kow`` and ``pKa`` (or
    ``None``), ``partition_data`` (bool).
    """
    from .limits import e_values, eutectic, solubility_limit
    from .partition import partition_rows
    from .solvents import volatile_keys

    rec = {"key": ing.key, "name": ing.name, "synonyms": list(ing.synonyms),
           "formula": ing.formula, "molar_mass_g_per_mol": round(ing.M * 1e3, 4),
           "hydrate_water": ing.hydrate_water, "solute": ing.solute, "kind": ing.kind,
           "ions": ing.ions, "solution_pct_w_w": ing.solution_pct_w_w,
           "density_g_per_mL": None if ing.rho_pure is None else ing.rho_pure / 1e3,
           "acid_base": ing.acid_base or None, "source": ing.source,
           "caution": ing.caution or None, "custom": ing.custom}
    rec["forms"] = [{"name": o.name, "key": o.key, "molar_mass_g_per_mol": round(o.M * 1e3, 4)}
                    for o in forms_of(lib, ing)]
    rec["activity_model"] = _activity_model(ing, lib)
    rec["density_data"] = _density_data(ing, lib)
    rec["vapor_pressure"] = ing.solute in volatile_keys()
    sol = None if ing.is_water else solubility_limit(ing.solute, T_LISTING)
    rec["solubility"] = None if sol is None else {
        "g_per_100g_water_at_25C": round(sol[0] * 100.0, 4),
        "T_min_C": round(sol[1]["T_min"] - 273.15, 2),
        "T_max_C": round(sol[1]["T_max"] - 273.15, 2),
        "extrapolated": sol[1]["extrapolated"], "source": sol[1]["source"]}
    eu = None if ing.is_water else eutectic(ing.solute)
    rec["eutectic"] = None if eu is None else {
        "T_C": round(eu[1] - 273.15, 3), "mass_pct": float(eu[2]["eutectic_mass_pct"]),
        "source": eu[2].get("source")}
    rec["E_value"] = e_values().get(ing.key)
    part = {r["key"]: r for r in partition_rows()}.get(ing.key)
    rec["log_Kow"] = None if part is None else part["log_Kow"]
    rec["pKa"] = None if part is None else part["pKa"]
    rec["partition_data"] = part is not None
    return rec


def records(lib: Library, ingredients: Iterable[Ingredient]) -> list[dict]:
    """:func:`ingredient_record` for each of ``ingredients``."""
    return [ingredient_record(i, lib) for i in ingredients]
