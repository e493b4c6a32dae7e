"""The ingredient library: what each name a chemist types means chemically.

The built-in library is ``solutions/data/ingredients.csv``; a user's own library is a CSV
with the same columns (only ``name`` and one of ``formula`` / ``molar_mass_g_per_mol`` are
required). Molar masses are computed from the formula with the standard atomic weights
of the ``molmass`` package, unless the file gives one (e.g. PEG 400, a nominal value).

A hydrate is weighed with its water of crystallisation; in solution that water joins the
solvent. Each :class:`Ingredient` therefore names the dissolved ``solute`` (the model key
used by the density and activity data, e.g. ``"CaCl2"`` for both calcium chloride forms)
and ``hydrate_water`` (waters per formula unit).
"""
from __future__ import annotations

import difflib
import math
import re
from dataclasses import dataclass, replace
from functools import cache
from importlib import resources
from pathlib import Path
from typing import Iterable, Mapping

import pandas as pd

from .errors import IngredientError

__all__ = ["Ingredient", "Library", "default_library", "molar_mass_from_formula", "M_WATER"]

#: molar mass of water [kg/mol], from the same atomic weights as every other formula
M_WATER: float


_KINDS = ("solvent", "electrolyte", "nonelectrolyte")


def molar_mass_from_formula(formula: str) -> float:
    """Molar mass [kg/mol] of a formula such as ``"CaCl2(H2O)2"`` or ``"NaCl"``.

    Uses the atomic weights of ``molmass`` (NIST/IUPAC standard atomic weights).

    >>> round(molar_mass_from_formula("NaCl") * 1e3, 3)
    58.443
    """
    from molmass import Formula, FormulaError

    try:
        return Formula(str(formula).replace("·", ".")).mass * 1e-3
    except (FormulaError, ValueError, KeyError, IndexError) as exc:
        raise IngredientError(str(formula), f"cannot read the formula {formula!r}") from exc


M_WATER = molar_mass_from_formula("H2O")


@dataclass(frozen=True)
class Ingredient:
    """One ingredient as weighed.

    M : molar mass of the weighed form (hydrate included) [kg/mol]
    hydrate_water : waters of crystallisation per formula unit [1]
    ions : ideal particles per formula unit (van't Hoff factor at infinite dilution) [1]
    rho_pure : density of the pure liquid at 20 °C [kg/m³], ``None`` for solids
    """

    key: str
    name: str
    formula: str
    M: float
    hydrate_water: float
    solute: str
    kind: str
    ions: float
    rho_pure: float | None
    source: str
    caution: str = ""
    synonyms: tuple[str, ...] = ()
    custom: bool = False

    @property
    def M_solute(self) -> float:
        """Molar mass of the dissolved (anhydrous) solute [kg/mol]."""
        return self.M - self.hydrate_water * M_WATER

    @property
    def hydrate_mass_fraction(self) -> float:
        """Mass fraction of crystal water in the weighed form [1]."""
        return self.hydrate_water * M_WATER / self.M

    @property
    def is_water(self) -> bool:
        return self.solute == "water"


def _norm(name: str) -> str:
    """Normalise a name for look-up: case, spaces, dots and dashes do not matter."""
    t = str(name).strip().lower().replace("·", ".").replace("μ", "µ")
    t = re.sub(r"[\s_\-,]+", "", t)
    return t


def _num(value, column: str, where: str) -> float | None:
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return None
    if isinstance(value, str) and not value.strip():
        return None
    try:
        x = float(str(value).replace(",", ".") if isinstance(value, str) else value)
    except ValueError:
        raise IngredientError(where, f"column {column!r} must be a number, got {value!r}") from None
    if not math.isfinite(x):
        raise IngredientError(where, f"column {column!r} must be a finite number, got {value!r}")
    return x


def ingredient_from_record(rec: Mapping, *, custom: bool = False, where: str = "") -> Ingredient:
    """Build an :class:`Ingredient` from one library row (or inline recipe columns).

    Required: ``name`` and one of ``formula`` / ``molar_mass_g_per_mol``. Optional:
    ``density_g_per_mL`` (pure liquid), ``ions`` (default 1), ``hydrate_water`` (0),
    ``kind`` (``electrolyte`` when ions > 1, else ``nonelectrolyte``), ``solute``.
    """
    name = str(rec.get("name") or "").strip()
    label = where or name or "(unnamed)"
    if not name:
        raise IngredientError(label, "the 'name' column is empty")
    formula = str(rec.get("formula") or "").strip()
    if formula.lower() == "nan":
        formula = ""
    M_given = _num(rec.get("molar_mass_g_per_mol"), "molar_mass_g_per_mol", label)
    if M_given is not None:
        if M_given <= 0:
            raise IngredientError(label, f"molar mass must be positive, got {M_given:g} g/mol")
        M = M_given * 1e-3
    elif formula:
        M = molar_mass_from_formula(formula)
    else:
        raise IngredientError(label, "needs a formula or a molar mass (g/mol)")
    hyd = _num(rec.get("hydrate_water"), "hydrate_water", label) or 0.0
    if hyd < 0 or hyd * M_WATER >= M:
        raise IngredientError(label, f"hydrate_water {hyd:g} is impossible for molar mass "
                                     f"{M * 1e3:.4g} g/mol")
    ions = _num(rec.get("ions"), "ions", label)
    ions = 1.0 if ions is None else ions
    if ions < 1:
        raise IngredientError(label, f"ions per formula unit must be ≥ 1, got {ions:g}")
    rho = _num(rec.get("density_g_per_mL"), "density_g_per_mL", label)
    if rho is not None and not (0.5 <= rho <= 5.0):
        raise IngredientError(label, f"density {rho:g} g/mL is outside 0.5–5 g/mL; "
                                     "give the pure ingredient's density in g/mL")
    kind = str(rec.get("kind") or "").strip().lower()
    if kind in ("", "nan"):
        kind = "electrolyte" if ions > 1 else "nonelectrolyte"
    if kind not in _KINDS:
        raise IngredientError(label, f"kind must be one of {', '.join(_KINDS)}, got {kind!r}")
    key = str(rec.get("key") or "").strip() or _norm(name)
    solute = str(rec.get("solute") or "").strip()
    if solute.lower() in ("", "nan"):
        solute = key
    syn = rec.get("synonyms") or ""
    synonyms = tuple(s.strip() for s in str(syn).split("|") if s.strip() and s.strip() != "nan")
    src = str(rec.get("source") or ("user entry" if custom else "")).strip()
    caution = str(rec.get("caution") or "").strip()
    return Ingredient(key=key, name=name, formula=formula, M=M, hydrate_water=hyd,
                      solute=solute, kind=kind, ions=ions,
                      rho_pure=None if rho is None else rho * 1e3,
                      source=src if src != "nan" else "", caution=caution if caution != "nan" else "",
                      synonyms=synonyms, custom=custom)


class Library:
    """Look-up of ingredients by key, name or synonym (case, spaces and dashes ignored)."""

    def __init__(self, ingredients: Iterable[Ingredient]):
        self._items: dict[str, Ingredient] = {}
        # alias -> keys; a key or name is exact, a synonym shared by several forms is ambiguous
        self._exact: dict[str, str] = {}
        self._index: dict[str, list[str]] = {}
        for ing in ingredients:
            self.add(ing)

    def add(self, ing: Ingredient, *, override: bool = True) -> None:
        """Add an ingredient; its name and synonyms then resolve to it."""
        if ing.key in self._items and not override:
            raise IngredientError(ing.name, f"key {ing.key!r} already in the library")
        self._items[ing.key] = ing
        for alias in (ing.key, ing.name):
            self._exact[_norm(alias)] = ing.key
        for alias in ing.synonyms:
            keys = self._index.setdefault(_norm(alias), [])
            if ing.custom:  # a user's own entry takes the name over
                keys.clear()
            if ing.key not in keys:
                keys.append(ing.key)

    def __contains__(self, name: str) -> bool:
        k = _norm(name)
        return k in self._exact or len(self._index.get(k, ())) == 1

    def __iter__(self):
        return iter(self._items.values())

    def __len__(self) -> int:
        return len(self._items)

    def names(self) -> list[str]:
        return [i.name for i in self._items.values()]

    def get(self, name: str) -> Ingredient:
        """The ingredient for ``name``; :class:`IngredientError` with suggestions if unknown."""
        k = _norm(name)
        if k in self._exact:
            return self._items[self._exact[k]]
        keys = self._index.get(k, [])
        if len(keys) == 1:
            return self._items[keys[0]]
        if len(keys) > 1:
            raise IngredientError(str(name), "is ambiguous: several forms are in the library; "
                                             "write which one", tuple(self._items[x].name for x in keys))
        known = {**{a: [v] for a, v in self._exact.items()}, **self._index}
        close = difflib.get_close_matches(k, list(known), n=5, cutoff=0.6)
        sugg = tuple(dict.fromkeys(self._items[x].name for c in close for x in known[c]))[:3]
        raise IngredientError(str(name), "not in the ingredient library; add it inline "
                                         "(molar_mass or formula column) or to a user library file",
                              sugg)

    def copy(self) -> "Library":
        return Library(self._items.values())

    def with_file(self, path: str | Path) -> "Library":
        """A copy of this library extended by a user library CSV (same columns)."""
        lib = self.copy()
        for ing in read_library_file(path):
            lib.add(replace(ing, custom=True))
        return lib


def read_library_file(path: str | Path) -> list[Ingredient]:
    """Read a library CSV; a bad row raises :class:`IngredientError` naming the row."""
    try:
        df = pd.read_csv(path, dtype=str, keep_default_na=False, comment="#")
    except FileNotFoundError:
        raise IngredientError(str(path), "library file not found") from None
    except pd.errors.EmptyDataError:
        raise IngredientError(str(path), "the library file is empty: it needs a header line "
                                         "with at least 'name' and 'formula' or "
                                         "'molar_mass_g_per_mol'") from None
    except (pd.errors.ParserError, UnicodeDecodeError) as exc:
        raise IngredientError(str(path), f"cannot read the library file: {exc}") from None
    out = []
    for i, rec in enumerate(df.to_dict("records"), start=2):  # row 1 is the header
        out.append(ingredient_from_record(rec, custom=True,
                                          where=f"{Path(path).name} row {i}"))
    return out


def write_library_file(path: str | Path, ingredients: Iterable[Ingredient]) -> None:
    """Append/replace user ingredients in a library CSV (used by the dashboard's form)."""
    path = Path(path)
    rows = {}
    if path.exists():
        for ing in read_library_file(path):
            rows[ing.key] = ing
    for ing in ingredients:
        rows[ing.key] = ing
    df = pd.DataFrame([{
        "key": i.key, "name": i.name, "synonyms": "|".join(i.synonyms), "formula": i.formula,
        "hydrate_water": i.hydrate_water, "solute": i.solute, "kind": i.kind, "ions": i.ions,
        "molar_mass_g_per_mol": i.M * 1e3,
        "density_g_per_mL": "" if i.rho_pure is None else i.rho_pure / 1e3,
        "source": i.source or "user entry", "caution": i.caution} for i in rows.values()])
    df.to_csv(path, index=False)


@cache
def default_library() -> Library:
    """The built-in library, loaded once."""
    path = resources.files("solutions.data") / "ingredients.csv"
    df = pd.read_csv(str(path), dtype=str, keep_default_na=False)
    return Library(ingredient_from_record(rec, where=f"ingredients.csv row {i}")
                   for i, rec in enumerate(df.to_dict("records"), start=2))
