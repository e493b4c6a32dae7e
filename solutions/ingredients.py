"""The ingredient library: what each name a chemist types means chemically.

The built-in library is ``solutions/data/ingredients.csv`` (columns documented in
``solutions/data/ingredients_README.md``); a user's own library is a CSV with the same
columns (only ``name`` and one of ``formula`` / ``molar_mass_g_per_mol`` are required).
Molar masses are computed from the formula with the standard atomic weights of the
``molmass`` package, unless the file gives one (e.g. PEG 400, a nominal value).

A hydrate is weighed with its water of crystallisation; in solution that water joins the
solvent. Each :class:`Ingredient` therefore names the dissolved ``solute`` (the model key
used by the density and activity data, e.g. ``"CaCl2"`` for both calcium chloride forms)
and ``hydrate_water`` (waters per formula unit). A stock solution of stated strength
(``solution_pct_w_w``, e.g. hydrochloric acid 10 % w/w) is handled the same way: the water
that comes with it is counted as that many waters per formula unit of solute.

Identity rule: a key or full name is exact; a generic name ("magnesium sulfate") or a
synonym that fits several forms is refused, listing each form with its molar mass
(:class:`AmbiguousIngredientError`).

Particles per formula unit are one fact: the ``ions`` column, or, when a row gives only a
formula, the count read from it with the ion table ``data/ions.csv``
(:func:`ions_from_formula`); a formula it cannot read is refused, never counted as 1.
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

from ._csvtable import read_rows
from .errors import Caveat, IngredientError

__all__ = ["Ingredient", "Library", "default_library", "molar_mass_from_formula", "M_WATER",
           "AmbiguousIngredientError", "generic_name", "ions_from_formula", "acid_base_caveats"]

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


class AmbiguousIngredientError(IngredientError):
    """A name fits several library entries (forms of one substance, e.g. a salt and its
    hydrates); the message lists each choice with its molar mass.

    ``choices`` : ((name, M [kg/mol]), ...); ``suggestions`` : the names alone.
    """

    def __init__(self, name: str, choices: Iterable[tuple[str, float]]):
        self.choices = tuple(choices)
        listed = "; ".join(f"{n}, {M * 1e3:.2f} g/mol" for n, M in self.choices)
        super().__init__(name, "is ambiguous: it fits several forms in the library, which "
                               f"differ in molar mass; write which one: {listed}")
        self.suggestions = tuple(n for n, _ in self.choices)


# ----------------------------------------------------------------------------- generic names
# words that name a form of a substance, not the substance: a name stripped of them is the
# substance's generic name, and a generic name shared by several entries is ambiguous
_FORM_WORDS = re.compile(
    r"\((?:anhydrous|solid|dried|powder|pellets)\)"
    r"|\b(?:anhydrous|dried|(?:mono|di|tri|tetra|penta|hexa|hepta|octa|nona|deca|undeca|dodeca"
    r"|hemi|sesqui)?hydrate)\b"
    r"|\bsolution\b|\d+(?:[.,]\d+)?\s*%\s*w/w")


def generic_name(name: str) -> str:
    """The substance a name refers to without its form (hydrate, anhydrous, strength).

    >>> generic_name("Magnesium sulfate heptahydrate")
    'magnesium sulfate'
    >>> generic_name("Sodium hydroxide solution 10 % w/w")
    'sodium hydroxide'
    """
    t = _FORM_WORDS.sub(" ", str(name).strip().lower().replace("·", "."))
    return re.sub(r"\s+", " ", t).strip(" ,")


# ------------------------------------------------------------------------ particles per formula
_NONMETALS = frozenset("H He B C N O F Ne Si P S Cl Ar Se Br Kr I Xe".split())
_WATER_COMP = {"H": 2, "O": 1}


@dataclass(frozen=True)
class _Ion:
    name: str
    role: str
    comp: tuple[tuple[str, int], ...]
    charge: int
    strong_acid_anion: bool


@cache
def _ion_table() -> tuple[_Ion, ...]:
    """The ions of ``data/ions.csv`` with their element counts."""
    path = resources.files("solutions.data") / "ions.csv"
    return tuple(_Ion(r["ion"], r["role"], tuple(sorted(_composition(r["formula"]).items())),
                      int(r["charge"]), r["strong_acid_anion"].strip().lower() == "yes")
                 for r in read_rows(path, text=True))


def _composition(formula: str) -> dict[str, int]:
    from molmass import Formula, FormulaError
    try:
        comp = Formula(str(formula).replace("·", ".")).composition()
    except (FormulaError, ValueError, KeyError, IndexError) as exc:
        raise IngredientError(str(formula), f"cannot read the formula {formula!r}") from exc
    return {el: int(item.count) for el, item in comp.items()}


def _minus(comp: dict[str, int], part: Mapping[str, int], times: int) -> dict[str, int] | None:
    out = dict(comp)
    for el, k in part.items():
        out[el] = out.get(el, 0) - k * times
        if out[el] < 0:
            return None
    return {el: k for el, k in out.items() if k}


def _as_multiple(comp: dict[str, int], ion: _Ion) -> int:
    """m such that comp = m × ion (0 if none)."""
    ic = dict(ion.comp)
    if set(comp) != set(ic):
        return 0
    m = {comp[el] / ic[el] for el in ic}
    if len(m) != 1:
        return 0
    x = m.pop()
    return int(x) if x == int(x) and x >= 1 else 0


def _salt_matches(comp: dict[str, int], cation: _Ion, n: int) -> list[tuple[_Ion, int, int]]:
    """(anion, m, hydrate waters) with comp = n cation + m anion + k H2O, charges balanced."""
    out = []
    rest = _minus(comp, dict(cation.comp), n)
    k = 0
    while rest is not None and rest:
        for an in _ion_table():
            if an.role != "anion" or (cation.name == "hydrogen" and not an.strong_acid_anion):
                continue
            m = _as_multiple(rest, an)
            if m and n * cation.charge == -m * an.charge:
                out.append((an, m, k))
        if out:
            return out
        rest = _minus(rest, _WATER_COMP, 1)
        k += 1
    return out


def ions_from_formula(formula: str) -> tuple[int, str]:
    """Ideal particles per formula unit (ν = ν_M + ν_X) read from a formula, and how.

    A simple salt of one cation of ``data/ions.csv`` (alkali, alkaline-earth, ammonium;
    H⁺ only with strong-acid anions) and one tabulated anion, with or without water of
    crystallisation, gives ν = ν_M + ν_X from charge balance (full dissociation, common
    practice). A carbon compound without a metal or ammonium ion is counted as one
    particle (molecular; weak acids and bases undissociated, common practice).
    Anything else (another metal, two cations, an unknown anion, an amine salt,
    an inorganic molecule) raises :class:`IngredientError` asking for the ``ions`` column.

    >>> ions_from_formula("C6H7KO2")[0], ions_from_formula("Na2HPO4(H2O)12")[0]
    (2, 3)
    """
    comp = _composition(formula)
    ions = _ion_table()
    metals = sorted(el for el in comp if el not in _NONMETALS)
    table_metals = {dict(i.comp).popitem()[0]: i for i in ions
                    if i.role == "cation" and len(i.comp) == 1 and i.comp[0][0] not in _NONMETALS}
    ask = "give the number of ions per formula unit in the 'ions' column"
    unknown = [el for el in metals if el not in table_metals]
    if unknown:
        raise IngredientError(str(formula), f"contains {', '.join(unknown)}, which is not in "
                                            f"the ion table (data/ions.csv); {ask}")
    if len(metals) > 1:
        raise IngredientError(str(formula), f"contains several cations ({', '.join(metals)}); "
                                            f"{ask}")
    if metals:
        cat = table_metals[metals[0]]
        tries = [(cat, comp[metals[0]])]
    else:
        nh4 = next(i for i in ions if i.name == "ammonium")
        tries = [(nh4, n) for n in range(1, 5)]
        if "C" not in comp:
            h = next(i for i in ions if i.name == "hydrogen")
            tries += [(h, n) for n in range(1, 4)]
    for cat, n in tries:
        hits = {(an.name, m) for an, m, _ in _salt_matches(comp, cat, n)}
        if len(hits) == 1:
            (an_name, m), = hits
            return n + m, f"{n} {cat.name} + {m} {an_name} (ions table, full dissociation)"
    if metals:
        raise IngredientError(str(formula), f"a {metals[0]} compound whose anion is not in the "
                                            f"ion table (data/ions.csv); {ask}")
    if "C" in comp and not ("N" in comp and {"Cl", "Br", "I"} & set(comp)):
        return 1, "carbon compound without a metal or ammonium ion: one particle (common practice)"
    raise IngredientError(str(formula), f"cannot tell from the formula how it dissociates; {ask}")


@dataclass(frozen=True)
class Ingredient:
    """One ingredient as weighed.

    M : molar mass of the weighed form (hydrate included) [kg/mol]
    hydrate_water : waters of crystallisation per formula unit [1]; for a stock solution
        (``solution_pct_w_w``) the water that comes with one formula unit of solute
    ions : ideal particles per formula unit (van't Hoff factor at infinite dilution) [1]
    rho_pure : density of the pure liquid at 20 °C [kg/m³], ``None`` for solids
    solution_pct_w_w : strength of a stock solution weighed as such [% w/w], else ``None``
    acid_base : ``"acid"``, ``"base"`` or ``""``: reacts with the other kind (neutralisation)
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
    solution_pct_w_w: float | None = None
    acid_base: str = ""

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
    ``density_g_per_mL`` (pure liquid), ``ions`` (else counted from the formula by
    :func:`ions_from_formula`, or 1 when ``kind`` says non-electrolyte; otherwise refused),
    ``hydrate_water`` (0), ``solution_pct_w_w`` (the weighed liquid is a solution of this
    strength in water: its water joins the solvent like water of crystallisation),
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
    strength = _num(rec.get("solution_pct_w_w"), "solution_pct_w_w", label)
    if strength is not None:
        # a stock solution weighed as such: per formula unit of solute, (1 − w)/w of its
        # mass is water, which joins the solvent exactly as water of crystallisation does
        if not (0 < strength < 100) or hyd:
            raise IngredientError(label, f"solution_pct_w_w must lie in (0, 100) % and "
                                         f"exclude hydrate_water, got {strength:g}")
        w = strength / 100.0
        hyd = M * (1.0 - w) / w / M_WATER
        M = M / w
    if hyd < 0 or hyd * M_WATER >= M:
        raise IngredientError(label, f"hydrate_water {hyd:g} is impossible for molar mass "
                                     f"{M * 1e3:.4g} g/mol")
    ions = _num(rec.get("ions"), "ions", label)
    kind = str(rec.get("kind") or "").strip().lower()
    if ions is None:
        if formula:
            try:
                ions = float(ions_from_formula(formula)[0])
            except IngredientError as exc:
                raise IngredientError(label, exc.reason) from None
        elif kind == "nonelectrolyte" or kind == "solvent":
            ions = 1.0
        else:
            raise IngredientError(label, "give the number of ions per formula unit in the "
                                         "'ions' column (1 for a non-electrolyte such as a "
                                         "sugar, 2 for NaCl, 3 for CaCl2) or a formula to "
                                         "count them from")
    if ions < 1:
        raise IngredientError(label, f"ions per formula unit must be ≥ 1, got {ions:g}")
    rho = _num(rec.get("density_g_per_mL"), "density_g_per_mL", label)
    if rho is not None and not (0.5 <= rho <= 5.0):
        raise IngredientError(label, f"density {rho:g} g/mL is outside 0.5–5 g/mL; "
                                     "give the pure ingredient's density in g/mL")
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
    acid_base = str(rec.get("acid_base") or "").strip().lower()
    if acid_base in ("nan", "none"):
        acid_base = ""
    if acid_base not in ("", "acid", "base"):
        raise IngredientError(label, "acid_base must be 'acid', 'base' or empty, "
                                     f"got {acid_base!r}")
    src = str(rec.get("source") or ("user entry" if custom else "")).strip()
    caution = str(rec.get("caution") or "").strip()
    return Ingredient(key=key, name=name, formula=formula, M=M, hydrate_water=hyd,
                      solute=solute, kind=kind, ions=ions,
                      rho_pure=None if rho is None else rho * 1e3,
                      source=src if src != "nan" else "", caution=caution if caution != "nan" else "",
                      synonyms=synonyms, custom=custom, solution_pct_w_w=strength,
                      acid_base=acid_base)


class Library:
    """Look-up of ingredients by key, name or synonym (case, spaces and dashes ignored).

    Identity rule: a key or full name is exact. A synonym, or a generic name (the name
    without its form: "magnesium sulfate" for "Magnesium sulfate heptahydrate", see
    :func:`generic_name`), resolves only when it fits one entry; when it fits several
    forms it is refused with :class:`AmbiguousIngredientError`, which lists each form
    with its molar mass, because the forms differ in how much is dissolved per gram.
    """

    def __init__(self, ingredients: Iterable[Ingredient]):
        self._items: dict[str, Ingredient] = {}
        # alias -> keys; a key or name is exact, a synonym or generic name shared by
        # several forms is ambiguous
        self._exact: dict[str, str] = {}
        self._index: dict[str, list[str]] = {}
        for ing in ingredients:
            self.add(ing)

    def add(self, ing: Ingredient, *, override: bool = True) -> None:
        """Add an ingredient; its name, generic name and synonyms then resolve to it."""
        if ing.key in self._items and not override:
            raise IngredientError(ing.name, f"key {ing.key!r} already in the library")
        self._items[ing.key] = ing
        for alias in (ing.key, ing.name):
            self._exact[_norm(alias)] = ing.key
        for alias in dict.fromkeys((generic_name(ing.name), *ing.synonyms)):
            keys = self._index.setdefault(_norm(alias), [])
            if ing.custom:  # a user's own entry takes the name over
                keys.clear()
            if ing.key not in keys:
                keys.append(ing.key)

    def _keys(self, name: str) -> list[str]:
        k = _norm(name)
        if k in self._exact:
            return [self._exact[k]]
        return self._index.get(k, [])

    def __contains__(self, name: str) -> bool:
        return len(self._keys(name)) == 1

    def __iter__(self):
        return iter(self._items.values())

    def __len__(self) -> int:
        return len(self._items)

    def names(self) -> list[str]:
        return [i.name for i in self._items.values()]

    def generic_names(self) -> dict[str, tuple[str, ...]]:
        """Every generic name or synonym that fits more than one entry, with the entry keys."""
        return {a: tuple(v) for a, v in self._index.items() if len(v) > 1 and a not in self._exact}

    def get(self, name: str) -> Ingredient:
        """The ingredient for ``name``; :class:`IngredientError` with suggestions if unknown,
        :class:`AmbiguousIngredientError` (choices with molar masses) if it fits several."""
        keys = self._keys(name)
        if len(keys) == 1:
            return self._items[keys[0]]
        if len(keys) > 1:
            raise AmbiguousIngredientError(str(name), tuple((self._items[x].name, self._items[x].M)
                                                            for x in keys))
        k = _norm(name)
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
    import pandas as pd  # a user's file may be written loosely: the full CSV reader

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
    import pandas as pd

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
        "source": i.source or "user entry", "caution": i.caution,
        "acid_base": i.acid_base} for i in rows.values()])
    df.to_csv(path, index=False)


@cache
def default_library() -> Library:
    """The built-in library, loaded once."""
    path = resources.files("solutions.data") / "ingredients.csv"
    return Library(ingredient_from_record(rec, where=f"ingredients.csv row {i}")
                   for i, rec in enumerate(read_rows(path, text=True), start=2))


def acid_base_caveats(ingredients: Iterable[Ingredient]) -> list[Caveat]:
    """A caveat when a recipe combines an acid and a base (library column ``acid_base``).

    Acids are the free acids (hydrochloric, citric, acetic, boric, lactic, benzoic, sorbic,
    salicylic …); bases the hydroxides, carbonates, hydrogen carbonates and tromethamine.
    Salts of weak acids (acetate, citrate, phosphate buffers) are neither: a buffer pair
    exchanges protons without changing the particle count much. Every property here counts
    particles as weighed; an acid and a base neutralise each other (water or CO₂ form,
    ions pair), so the real count, and the pH, differ.

    ingredients : the recipe's ingredients (any iterable; duplicates are ignored)
    """
    ings = list(dict.fromkeys(ingredients))
    acids = [i.name for i in ings if i.acid_base == "acid"]
    bases = [i.name for i in ings if i.acid_base == "base"]
    if not (acids and bases):
        return []
    a, b = ", ".join(acids), ", ".join(bases)
    return [Caveat("acid-base",
                   f"particle count assumes no reaction between {a} (acid) and {b} (base): "
                   "they neutralise each other, which changes the number of dissolved particles "
                   "(and the pH), so osmolality, freezing point and water activity are estimates; "
                   "measure them on the made-up solution",
                   "; ".join(acids + bases), {"acids": acids, "bases": bases})]
