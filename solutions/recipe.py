"""Recipes: read the table a chemist writes, and resolve it into a :class:`Composition`.

A recipe is a table with columns ``ingredient, amount, unit`` and optional columns
``formula``, ``molar_mass`` (g/mol), ``density`` (g/mL, pure liquid), ``ions``,
``hydrate_water`` and ``assay_%`` (purity of what is weighed). Rows may mix bases freely:
grams, millilitres of a liquid, moles, % w/w, % w/v, % v/v, ppm, mg/mL, g/L, M, mM and
mol/kg; the solvent row may read ``q.s.`` (to a volume or mass in its unit column) or
``balance`` (to 100 % w/w).

Resolution: for a fixed solution density every row's weighed mass is linear in the total
mass, the solvent mass and the added-solvent mass, so the recipe is a 3×3 linear system;
the density depends on the composition, so the system is re-solved with the density of
its own result until the density no longer changes (a fixed point, converging in a few
iterations because density depends weakly on it). Volumes in the recipe (q.s. to 1000 mL,
% w/v, molarity, mL of a liquid) are taken at the preparation temperature, 20 °C unless
stated, as volumetric glassware is calibrated.
"""
from __future__ import annotations

import csv
import io
import math
import re
import sys
import unicodedata
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import TYPE_CHECKING, Iterable

import numpy as np

from .composition import Composition
from .density import solution_density
from .errors import Caveat, IngredientError, NumberError, RecipeError, UnitParseError
from .ingredients import Ingredient, Library, default_library, ingredient_from_record
from .units import (LIQUID_DENSITY_G_PER_ML, Amount, Basis, is_solvent_rule, parse_unit,
                    read_number)
from .water import water_density

if TYPE_CHECKING:  # pandas is imported only where a workbook or DataFrame is read
    import pandas as pd

__all__ = ["RecipeRow", "Recipe", "ResolvedRecipe", "read_recipe", "resolve", "T_PREP",
           "find_columns", "parse_batch", "read_workbook", "parse_quantity", "find_row",
           "solvent_row", "new_row_unit", "with_new_row", "with_number", "recipe_csv"]

T_PREP = 293.15  # K: volumes in a recipe are read at 20 °C unless stated

_COLUMN_ALIASES = {
    # English first, then German, French, Spanish, Italian, Dutch and Portuguese headers
    # (compared lower-case, accents removed, a trailing "(unit)" or "[unit]" ignored)
    "ingredient": ("ingredient", "name", "component", "material", "substance", "item",
                   "zutat", "bestandteil", "substanz", "stoff", "komponente", "rohstoff",
                   "composant", "produit", "ingrediente", "componente", "sustancia",
                   "materia prima", "sostanza", "ingredient", "bestanddeel", "stof",
                   "grondstof", "substancia", "materia-prima"),
    "amount": ("amount", "quantity", "qty", "value", "amt", "menge", "anteil", "einwaage",
               "quantite", "cantidad", "quantita", "hoeveelheid", "quantidade", "quant."),
    "unit": ("unit", "units", "uom", "einheit", "unite", "unidad", "unita", "eenheid",
             "unidade"),
    "formula": ("formula", "formel", "summenformel", "formule", "formula quimica"),
    "molar_mass": ("molar_mass", "molar mass", "mw", "molar_mass_g_per_mol", "m (g/mol)",
                   "molar mass (g/mol)", "mol_wt", "molecular weight", "molmasse",
                   "molare masse", "molekulargewicht", "masse molaire", "masa molar",
                   "peso molecular", "massa molare", "peso molecolare", "molaire massa",
                   "molmassa", "massa molar"),
    "density": ("density", "density_g_per_ml", "density (g/ml)", "rho", "dichte",
                "densite", "masse volumique", "densidad", "densita", "dichtheid",
                "densidade"),
    "ions": ("ions", "i", "van't hoff factor", "vant_hoff", "particles", "ionen", "iones",
             "ioni", "ioes", "ions"),
    "hydrate_water": ("hydrate_water", "hydrate", "water of crystallisation"),
    "assay": ("assay_%", "assay", "assay %", "purity", "purity_%", "purity %", "assay (%)",
              "reinheit", "gehalt", "purete", "teneur", "pureza", "riqueza", "purezza",
              "titolo", "zuiverheid", "gehalte", "teor"),
}
_ALIAS_SET = {a for v in _COLUMN_ALIASES.values() for a in v}


@dataclass(frozen=True)
class RecipeRow:
    """One row of a recipe, parsed. ``row`` is 1-based over the ingredient rows."""

    row: int
    ingredient: Ingredient
    amount: Amount
    number: float | None           # the number typed (None for plain q.s./balance)
    assay: float = 1.0             # purity of what is weighed [1]
    text: str = ""                 # the ingredient name as typed

    @property
    def is_solvent_rule(self) -> bool:
        return self.amount.basis.is_solvent_rule

    @property
    def value_si(self) -> float:
        return (self.number if self.number is not None else 1.0) * self.amount.value_si

    def unit_label(self) -> str:
        return self.amount.text


@dataclass(frozen=True)
class Recipe:
    rows: tuple[RecipeRow, ...]
    name: str = ""

    def __iter__(self):
        return iter(self.rows)

    def __len__(self):
        return len(self.rows)

    def as_written(self) -> list[dict]:
        """The rows as written: row, ingredient, amount, unit (q.s./balance spelled out,
        numbers at full precision). The one description of a recipe every output uses."""
        out = []
        for r in self.rows:
            b = r.amount.basis
            if b is Basis.BALANCE:
                amount, unit = "balance", ""
            elif b in (Basis.QS_VOLUME, Basis.QS_MASS):
                amount, unit = f"q.s. to {_number_text(r.number)}", r.amount.text
            else:
                amount, unit = float(r.number), r.amount.text
            out.append({"row": r.row, "ingredient": r.text, "amount": amount, "unit": unit})
        return out


# ------------------------------------------------------------------------------ reading
def _header_key(col) -> str:
    """A header as compared with the aliases: lower-case, accents removed, a trailing
    "(g/mol)" or "[%]" and surrounding spaces dropped."""
    c = unicodedata.normalize("NFKD", str(col)).encode("ascii", "ignore").decode()
    c = c.strip().lower()
    if c in _ALIAS_SET:
        return c
    c = re.sub(r"\s*[\(\[][^\)\]]*[\)\]]\s*$", "", c).strip()
    return c


def find_columns(columns: Iterable[str]) -> dict[str, str]:
    """Map the canonical column names (ingredient, amount, unit, formula, molar_mass, density,
    ions, hydrate_water, assay) to the columns of a table as a chemist headed them, in
    English or in German, French, Spanish, Italian, Dutch or Portuguese.

    >>> find_columns(["Zutat", "Menge", "Einheit", "Lieferant", "Molmasse (g/mol)"])
    {'ingredient': 'Zutat', 'amount': 'Menge', 'unit': 'Einheit', 'molar_mass': 'Molmasse (g/mol)'}
    """
    found = {}
    for col in columns:
        c = _header_key(col)
        for canon, aliases in _COLUMN_ALIASES.items():
            if c in aliases and canon not in found:
                found[canon] = col
    return found


#: the most rows and the longest cell a recipe may have (a recipe is a bench sheet)
MAX_ROWS = 500
MAX_CELL = 1000


def _is_comment(line: str) -> bool:
    return line.lstrip().startswith("#")


class _TextTable:
    """The cells of a recipe read from text: header, row numbers and one dict per row (the
    three things :func:`read_recipe` asks of a table; no data-frame library needed)."""

    def __init__(self, columns: list[str], records: list[list[str]], rows: list[int]):
        self.columns = list(columns)
        self.index = list(rows)
        self._records = [dict(zip(self.columns, r)) for r in records]

    def __len__(self) -> int:
        return len(self._records)

    def to_dict(self, orient: str = "records") -> list[dict]:
        if orient != "records":
            raise ValueError(f"only 'records' is supported, got {orient!r}")
        return [dict(r) for r in self._records]


def _read_text(text: str, decimal: str) -> _TextTable:
    """A recipe table from CSV/TSV text. The delimiter is read from the header line alone (tab,
    else ';', else ','); lines starting with '#' are comments and blank lines are skipped, but both
    keep their place in the row count, so 'row N' is the N-th line under the header."""
    lines = text.splitlines()
    head_i = next((i for i, ln in enumerate(lines) if ln.strip() and not _is_comment(ln)), None)
    if head_i is None:
        raise RecipeError("the recipe is empty: write a header line 'ingredient,amount,unit' "
                          "and one line per ingredient")
    header = lines[head_i]
    sep = "\t" if "\t" in header else (";" if ";" in header else ",")
    if len(lines) - head_i - 1 > MAX_ROWS:
        raise RecipeError(f"the recipe has {len(lines) - head_i - 1} lines; at most {MAX_ROWS} "
                          "rows are read")
    cols = [c.strip() for c in next(csv.reader([header], delimiter=sep))]
    records, rows = [], []
    for k, line in enumerate(lines[head_i + 1:], start=1):
        if not line.strip() or _is_comment(line):
            continue
        try:
            fields = next(csv.reader([line], delimiter=sep, skipinitialspace=True))
        except csv.Error as exc:
            raise RecipeError(f"cannot read this line: {exc}", k) from None
        if len(fields) > len(cols) and any(f.strip() for f in fields[len(cols):]):
            hint = (" — an unquoted decimal comma? quote the number (\"0,9\") or separate "
                    "columns with ';' or a tab" if sep == "," else "")
            raise RecipeError(f"has {len(fields)} fields but the header has {len(cols)} "
                              f"({', '.join(cols)}){hint}", k)
        fields = (fields + [""] * len(cols))[:len(cols)]
        records.append(fields)
        rows.append(k)
    return _TextTable(cols, records, rows)


def _table(source, decimal: str):
    pd = sys.modules.get("pandas")  # a DataFrame can only come from an imported pandas
    if pd is not None and isinstance(source, pd.DataFrame):
        df = source.astype(object).where(source.notna(), "")
        df.index = range(1, len(df) + 1)
        return df
    if isinstance(source, Path) or (isinstance(source, str) and "\n" not in source
                                    and source.lower().endswith((".csv", ".tsv", ".txt",
                                                                 ".xlsx", ".xls"))):
        p = Path(source)
        if not p.is_file():
            raise RecipeError(f"recipe file {str(p)!r} not found")
        if p.suffix.lower() in (".xlsx", ".xls"):
            return read_workbook(p.read_bytes(), p.name)
        try:
            return _read_text(p.read_text(encoding="utf-8-sig"), decimal)
        except UnicodeDecodeError:
            raise RecipeError(f"recipe file {p.name!r} is not UTF-8 text; save it as CSV "
                              "(UTF-8) or XLSX") from None
    if isinstance(source, str):
        return _read_text(source, decimal)
    raise RecipeError(f"cannot read a recipe from a {type(source).__name__}")


def read_workbook(data: bytes, name: str = "recipe.xlsx") -> "pd.DataFrame":
    """The first sheet of an .xlsx workbook as a table of text cells, rows numbered from 1
    under the header; a file that is not a workbook is refused with a clear message."""
    import pandas as pd

    try:
        df = pd.read_excel(io.BytesIO(data), dtype=str, engine="openpyxl")
    except Exception:  # openpyxl raises many kinds for a file that is not a workbook
        raise RecipeError(f"{name!r} is not a readable .xlsx workbook; save it as .xlsx or "
                          "CSV") from None
    if len(df) > MAX_ROWS:
        raise RecipeError(f"the workbook has {len(df)} rows; at most {MAX_ROWS} rows are read")
    df = df.astype(object).where(df.notna(), "")
    df.index = range(1, len(df) + 1)
    return df


def _number(cell, *, row: int, column: str, name: str, decimal: str) -> float | None:
    """A numeric cell through the one number reader; a refusal names row, column and value."""
    try:
        return read_number(cell, decimal=decimal)
    except NumberError as exc:
        raise RecipeError(f"{exc.text!r} {exc.reason}", row, column, name) from None


_QS_TO = re.compile(r"^\s*(q\.?\s*s\.?|qs)\s*(ad|to)?\s*(?P<num>[-+0-9.,eE]+)?\s*(?P<unit>.*)$",
                    re.IGNORECASE)
_NUM_UNIT = re.compile(r"^\s*(?P<num>[-+]?[0-9]*[.,]?[0-9]+(?:[eE][-+]?[0-9]+)?)\s*(?P<unit>.*)$")


def read_recipe(source, library: Library | None = None, *, decimal: str = ".",
                name: str = "") -> Recipe:
    """Read a recipe from a CSV/TSV path or text, an XLSX path, or a DataFrame.

    ``decimal=","`` reads decimal commas (``0,9``), as pasted from many spreadsheets.
    Unknown ingredients, bad numbers and bad units raise :class:`RecipeError` naming the
    row, column and value. Inline columns (formula, molar_mass, density, ions) define or
    override an ingredient for this recipe only.
    """
    lib = library or default_library()
    df = _table(source, decimal)
    cols = find_columns(df.columns)
    for need in ("ingredient", "amount"):
        if need not in cols:
            raise RecipeError(f"the recipe has no {need!r} column (columns found: "
                              f"{', '.join(map(str, df.columns)) or 'none'}); expected "
                              "ingredient, amount, unit")
    rows = []
    for i, rec in zip(df.index, df.to_dict("records")):
        i = int(i)
        for col, cell in rec.items():
            if isinstance(cell, str) and len(cell) > MAX_CELL:
                raise RecipeError(f"a cell of {len(cell)} characters; at most {MAX_CELL} are "
                                  "read", i, str(col))
        text = _clean_name(rec.get(cols["ingredient"], ""))
        amount_cell = rec.get(cols["amount"], "")
        unit_cell = str(rec.get(cols.get("unit", ""), "") or "").strip() if "unit" in cols else ""
        if not text and str(amount_cell).strip() in ("", "nan") and not unit_cell:
            continue  # blank line
        if not text:
            raise RecipeError("the ingredient name is empty", i, "ingredient")
        rows.append(_parse_row(i, text, amount_cell, unit_cell, rec, cols, lib, decimal))
    if not rows:
        raise RecipeError("the recipe has no ingredient rows")
    recipe = Recipe(tuple(rows), name)
    _check_rows(recipe)
    return recipe


def _parse_row(i, text, amount_cell, unit_cell, rec, cols, lib, decimal) -> RecipeRow:
    inline = {}
    if "formula" in cols and str(rec.get(cols["formula"], "") or "").strip() not in ("", "nan"):
        inline["formula"] = str(rec[cols["formula"]]).strip()
    for k in ("molar_mass", "density", "ions", "hydrate_water"):
        if k in cols:
            v = _number(rec.get(cols[k], ""), row=i, column=cols[k], name=text, decimal=decimal)
            if v is not None:
                inline[k] = _check_inline(k, v, row=i, column=cols[k], name=text)
    try:
        ing = _ingredient(text, inline, lib)
    except IngredientError as exc:
        raise RecipeError(str(exc), i, "ingredient", text) from None
    raw = "" if amount_cell is None else str(amount_cell).strip()
    solvent_rule = is_solvent_rule(raw)
    number: float | None
    unit_text = unit_cell
    if solvent_rule:
        m = _QS_TO.match(raw)
        num = m.group("num") if m else None
        if m and m.group("unit") and not unit_text:
            unit_text = m.group("unit").strip()
        number = (_number(num, row=i, column="amount", name=text, decimal=decimal)
                  if num else None)
        if raw.lower().replace(" ", "").startswith(("bal", "rest", "remainder")):
            number, unit_text = None, ""
    else:
        if not raw:
            raise RecipeError("the amount is empty", i, "amount", text)
        m = _NUM_UNIT.match(raw) if isinstance(amount_cell, str) else None
        if m and m.group("unit").strip() and not unit_cell:
            number = _number(m.group("num"), row=i, column="amount", name=text, decimal=decimal)
            unit_text = m.group("unit").strip()
        else:
            number = _number(amount_cell, row=i, column="amount", name=text, decimal=decimal)
            if number is None:
                raise RecipeError("the amount is empty", i, "amount", text)
    try:
        amount = parse_unit(unit_text, solvent_rule=solvent_rule)
    except UnitParseError as exc:
        raise RecipeError(f"unit {unit_text!r}: {exc.reason}", i, "unit", text) from None
    if amount.basis is Basis.BALANCE:
        number = None
    if amount.basis in (Basis.QS_VOLUME, Basis.QS_MASS) and number is None:
        raise RecipeError(f"q.s. needs the final amount, e.g. 'q.s. to 1000' with unit "
                          f"{unit_text or 'mL'!r}", i, "amount", text)
    if number is not None and number <= 0:
        raise RecipeError(f"amount must be positive, got {number:g}", i, "amount", text)
    if number is not None and not math.isfinite(number * amount.value_si * 1e6):
        raise RecipeError(f"amount {number:g} {unit_text} is too large to compute with",
                          i, "amount", text)
    assay = 1.0
    if "assay" in cols:
        a = _number(rec.get(cols["assay"], ""), row=i, column=cols["assay"], name=text,
                    decimal=decimal)
        if a is not None:
            if not (0 < a <= 100):
                raise RecipeError(f"assay must be in (0, 100] %, got {a:g}", i, cols["assay"], text)
            if a <= 1:
                raise RecipeError(f"assay {a:g} % looks like a fraction: did you mean "
                                  f"{a * 100:g} %? (the assay column is in percent)",
                                  i, cols["assay"], text)
            assay = a / 100.0
    if amount.basis in (Basis.VOLUME, Basis.VOLUME_FRACTION) and not ing.rho_pure \
            and not ing.is_water:
        raise RecipeError(f"a volume of {ing.name} needs its density: it is not a liquid in "
                          "the library; give a 'density' column (g/mL) or weigh it", i, "unit", text)
    return RecipeRow(i, ing, amount, number, assay, text)


_CONTROL = re.compile(r"[\x00-\x1f\x7f-\x9f]")


def _clean_name(cell) -> str:
    """An ingredient name as typed, without control characters (terminal escapes)."""
    return _CONTROL.sub("", str(cell if cell is not None else "")).strip()


def _check_inline(kind: str, v: float, *, row: int, column: str, name: str) -> float:
    """Physical checks on an inline number of kind ``molar_mass`` [g/mol], ``density`` (pure
    liquid) [g/mL], ``ions`` or ``hydrate_water``; returns it or raises naming row and column."""
    where = dict(row=row, column=column, ingredient=name)
    if kind == "density":
        lo, hi = LIQUID_DENSITY_G_PER_ML
        if 1e3 * lo <= v <= 1e3 * hi:
            raise RecipeError(f"density {v:g} looks like kg/m³: the column is in g/mL — did "
                              f"you mean {v / 1000:g}?", **where)
        if not (lo <= v <= hi):
            raise RecipeError(f"density {v:g} g/mL is not a liquid's density ({lo:g}–{hi:g} "
                              "g/mL)", **where)
    elif kind == "molar_mass":
        if not (1.0 <= v <= 1e7):
            raise RecipeError(f"molar mass {v:g} g/mol is outside 1–10 000 000 g/mol", **where)
    elif kind == "ions":
        if not (1 <= v <= 20):
            raise RecipeError(f"ions per formula unit {v:g} is outside 1–20", **where)
    elif kind == "hydrate_water":
        if not (0 <= v <= 30):
            raise RecipeError(f"waters of crystallisation {v:g} is outside 0–30", **where)
    return v


def _ingredient(text: str, inline: dict, lib: Library) -> Ingredient:
    if not inline:
        return lib.get(text)
    rec = {"name": text}
    base = None
    if text in lib:
        base = lib.get(text)
        rec.update({"formula": base.formula, "molar_mass_g_per_mol": base.M * 1e3,
                    "density_g_per_mL": (base.rho_pure / 1e3) if base.rho_pure else "",
                    "ions": base.ions, "hydrate_water": base.hydrate_water,
                    "solute": base.solute, "kind": base.kind, "key": base.key,
                    "source": base.source, "caution": base.caution})
    if "formula" in inline:
        rec["formula"] = inline["formula"]
        rec.pop("molar_mass_g_per_mol", None)
    if "molar_mass" in inline:
        rec["molar_mass_g_per_mol"] = inline["molar_mass"]
    if "density" in inline:
        rec["density_g_per_mL"] = inline["density"]
    if "ions" in inline:
        rec["ions"] = inline["ions"]
        if base is None or float(inline["ions"]) != base.ions:
            rec.pop("kind", None)
    if "hydrate_water" in inline:
        rec["hydrate_water"] = inline["hydrate_water"]
    ing = ingredient_from_record(rec, custom=True, where=text)
    return ing if base is None else replace(ing, custom=(ing != base))


def _check_rows(recipe: Recipe) -> None:
    rules = [r for r in recipe.rows if r.is_solvent_rule]
    if len(rules) > 1:
        raise RecipeError(f"two q.s./balance rows (rows {rules[0].row} and {rules[1].row}); "
                          "only the solvent can be made up to volume", rules[1].row, "amount",
                          rules[1].text)
    frac = [r for r in recipe.rows if r.amount.basis is Basis.MASS_FRACTION]
    total = sum(r.value_si for r in frac)
    if total > 1.0 + 1e-12:
        raise RecipeError(f"the % w/w and ppm rows add up to {total * 100:.6g} %, over 100 %",
                          frac[-1].row, "amount", frac[-1].text)
    balance = [r for r in rules if r.amount.basis is Basis.BALANCE]
    if balance and frac and total >= 1.0 - 1e-9:
        raise RecipeError(f"the % w/w rows add up to {total * 100:.6g} %, leaving nothing for "
                          "the balance row; lower them or drop the balance row",
                          balance[0].row, "amount", balance[0].text)
    vfrac = [r for r in recipe.rows if r.amount.basis is Basis.VOLUME_FRACTION]
    if sum(r.value_si for r in vfrac) > 1.0 + 1e-12:
        raise RecipeError("the % v/v rows add up to over 100 %", vfrac[-1].row, "amount",
                          vfrac[-1].text)


# ---------------------------------------------------------------------------- resolving
@dataclass(frozen=True)
class ResolvedRecipe:
    """A recipe resolved for one batch: the masses to weigh and the composition."""

    recipe: Recipe
    composition: Composition          # N = 1
    solvent_row: RecipeRow | None
    weighed_kg: np.ndarray            # per non-solvent row, as weighed (assay applied) [kg]
    pure_kg: np.ndarray               # per non-solvent row, pure weighed form [kg]
    water_added_kg: float             # solvent added (q.s./balance/stated) [kg]
    rho_prep: float                   # solution density at T_prep [kg/m³]
    T_prep: float                     # [K]
    iterations: int
    caveats: tuple[Caveat, ...] = field(default=())

    @property
    def solute_rows(self) -> tuple[RecipeRow, ...]:
        return tuple(r for r in self.recipe.rows if r is not self.solvent_row)

    @property
    def volume_prep(self) -> float:
        """Solution volume at the preparation temperature [m³]."""
        return float(self.composition.m_total[0] / self.rho_prep)

    @property
    def m_total(self) -> float:
        return float(self.composition.m_total[0])


def _solvent_of(recipe: Recipe, lib: Library) -> tuple[RecipeRow | None, Ingredient]:
    rules = [r for r in recipe.rows if r.is_solvent_rule]
    if rules:
        return rules[0], rules[0].ingredient
    waters = [r for r in recipe.rows if r.ingredient.is_water]
    if waters:
        if len(waters) > 1:
            raise RecipeError("water appears in two rows; combine them", waters[1].row,
                              "ingredient", waters[1].text)
        return waters[0], waters[0].ingredient
    return None, lib.get("water")


def resolve(recipe: Recipe, *, batch: tuple[str, float] | None = None,
            T_prep: float = T_PREP, rho_measured: float | None = None,
            library: Library | None = None, tol: float = 1e-13,
            max_iter: int = 200) -> ResolvedRecipe:
    """Resolve ``recipe`` into masses and a :class:`Composition`.

    batch : ``("mass", kg)`` or ``("volume", m³)`` to scale the result to; without it the
        batch is what the recipe states (its q.s. target, or what its amounts add up to;
        1 kg when every row is relative).
    T_prep : temperature at which the recipe's volumes are read [K].
    rho_measured : a measured solution density at T_prep [kg/m³]; replaces the model.
    """
    lib = library or default_library()
    solvent_row, solvent = _solvent_of(recipe, lib)
    rows = [r for r in recipe.rows if r is not solvent_row]
    for r in rows:
        if r.ingredient.key == solvent.key:
            raise RecipeError(f"{solvent.name} is the solvent (row {solvent_row.row}) and "
                              "cannot also be a solute row; combine the rows", r.row,
                              "ingredient", r.text)
    M = np.array([r.ingredient.M for r in rows])
    h = np.array([r.ingredient.hydrate_mass_fraction for r in rows])
    rho_w = float(water_density(T_prep)) if solvent.is_water else (solvent.rho_pure or 1000.0)

    has_absolute = any(r.amount.basis in (Basis.MASS, Basis.AMOUNT, Basis.VOLUME) for r in rows)
    sb = solvent_row.amount.basis if solvent_row is not None else None
    if sb in (Basis.MASS, Basis.VOLUME, Basis.AMOUNT, Basis.QS_MASS, Basis.QS_VOLUME):
        has_absolute = True
    if sb is Basis.BALANCE and has_absolute and batch is None:
        absolute = next(r for r in rows if r.amount.basis in (Basis.MASS, Basis.AMOUNT,
                                                             Basis.VOLUME))
        raise RecipeError("balance fills to 100 % w/w, but row "
                          f"{absolute.row} ({absolute.text!r}) is an absolute amount, so the "
                          "batch is undefined; give a batch size or make the solvent "
                          "'q.s. to' a mass or volume", solvent_row.row, "amount", solvent_row.text)
    if sb is Basis.BALANCE and batch is not None:
        has_absolute = True  # the batch fixes the scale
    if sb is Basis.BALANCE and batch is None:
        batch_mass = 1.0
    elif sb is Basis.BALANCE and batch is not None:
        batch_mass = batch[1] if batch[0] == "mass" else None
    else:
        batch_mass = None

    rho = rho_measured if rho_measured is not None else rho_w
    caveats: tuple[Caveat, ...] = ()
    x = None
    denser = False
    for it in range(1, max_iter + 1):
        x = _linear_solve(rows, solvent_row, solvent, M, h, rho, rho_w, has_absolute,
                          batch_mass, batch)
        # Too little room at this density (the solvent would be negative, or rows per
        # volume ask for more than the solution weighs): a dense syrup or brine holds more
        # per litre than water does, so start once from a density that could hold the
        # solutes; if that fails too, the recipe has no solution and says why
        if not x[0] > 0 or np.any(x[3] < 0):
            need = _per_volume_need(rows)
            if rho_measured is None and not denser and rho < need * 1.1 < _RHO_MAX:
                rho, denser = need * 1.1, True
                continue
            _too_much_per_volume(rows, need)
        if x[2] < 0:
            if rho_measured is None and not denser and x[0] > 0:
                rho, denser = min(rho * (x[0] - x[2]) / x[0] * 1.05, _RHO_MAX), True
                continue
            break   # not enough room for the solvent: reported below
        comp = _composition(rows, solvent, M, h, x)
        if rho_measured is not None:
            break
        dres = solution_density(comp, T_prep)
        new = float(dres.rho[0])
        caveats = dres.caveats
        if abs(new - rho) <= tol * new:
            rho = new
            break
        rho = new
    else:
        raise RecipeError("the density of this recipe did not settle; check the amounts")
    m_tot, m_w, m_wa, weighed = x
    _check_result(rows, solvent_row, m_tot, m_wa, rho, weighed)
    comp = _composition(rows, solvent, M, h, x)
    res = ResolvedRecipe(recipe, comp, solvent_row, weighed / np.array([r.assay for r in rows])
                         if rows else weighed, weighed, float(m_wa), float(rho), T_prep, it,
                         caveats)
    if batch is not None and sb is not Basis.BALANCE:
        res = _scale_to(res, batch)
    elif batch is not None and batch[0] == "volume":
        res = _scale_to(res, batch)
    return res


_RHO_MAX = 1e3 * LIQUID_DENSITY_G_PER_ML[1]   # kg/m³

_PER_LITRE = {Basis.MASS_PER_VOLUME: lambda r: r.value_si,
              Basis.MOLARITY: lambda r: r.value_si * r.ingredient.M,
              Basis.VOLUME_FRACTION: lambda r: r.value_si * (r.ingredient.rho_pure or 0.0)}


def _per_volume_need(rows) -> float:
    """Solute mass the rows given per volume of solution ask for [kg/m³]."""
    return sum(_PER_LITRE[r.amount.basis](r) for r in rows if r.amount.basis in _PER_LITRE)


def _too_much_per_volume(rows, need: float):
    """Raise the reason a recipe has no solution: its rows given per volume of solution ask
    for more mass per litre than a solution of it weighs."""
    per_volume = [r for r in rows if r.amount.basis in _PER_LITRE]
    if not per_volume:
        raise RecipeError("these amounts give no solution (a negative total mass); check "
                          "the amounts and units")
    first = max(per_volume, key=lambda r: _PER_LITRE[r.amount.basis](r))
    raise RecipeError(f"the rows given per volume of solution ask for {need / 1e3:.3g} g of "
                      "solute per mL of solution, more than such a solution weighs in all "
                      "(water-based solutions weigh about 1 to 2 g per mL); check the amount "
                      "and its unit (% w/v is grams per 100 mL of solution)",
                      first.row, "amount", first.text)


def _linear_solve(rows, solvent_row, solvent, M, h, rho, rho_w, has_absolute, batch_mass, batch):
    """Solve for (m_tot, m_w, m_wa) at fixed density; returns them and weighed masses."""
    k = len(rows)
    a = np.zeros(k)   # absolute weighed mass [kg]
    p = np.zeros(k)   # per kg of total solution
    q = np.zeros(k)   # per kg of solvent (water)
    for j, r in enumerate(rows):
        v, b = r.value_si, r.amount.basis
        ing = r.ingredient
        if b is Basis.MASS:
            a[j] = v
        elif b is Basis.AMOUNT:
            a[j] = v * ing.M
        elif b is Basis.VOLUME:
            a[j] = v * ing.rho_pure
        elif b is Basis.MASS_FRACTION:
            p[j] = v
        elif b is Basis.MASS_PER_VOLUME:
            p[j] = v / rho
        elif b is Basis.MOLARITY:
            p[j] = v * ing.M / rho
        elif b is Basis.VOLUME_FRACTION:
            p[j] = v * ing.rho_pure / rho
        elif b is Basis.MOLALITY:
            q[j] = v * ing.M
        else:  # pragma: no cover - solvent rules are filtered out before
            raise RecipeError(f"{b.value} is only for the solvent row", r.row, "amount", r.text)
    # unknowns X = [m_tot, m_w, m_wa]
    A = np.zeros((3, 3))
    B = np.zeros(3)
    # total mass: m_tot = m_wa + Σ(a + p m_tot + q m_w)
    A[0] = [1.0 - p.sum(), -q.sum(), -1.0]
    B[0] = a.sum()
    # water: m_w = m_wa + Σ h (a + p m_tot + q m_w)
    A[1] = [-(h * p).sum(), 1.0 - (h * q).sum(), -1.0]
    B[1] = (h * a).sum()
    # the solvent row's own rule
    sb = solvent_row.amount.basis if solvent_row is not None else None
    sv = solvent_row.value_si if solvent_row is not None else 0.0
    if solvent_row is None:
        A[2], B[2] = [0.0, 0.0, 1.0], 0.0
    elif sb is Basis.QS_VOLUME:
        A[2], B[2] = [1.0, 0.0, 0.0], rho * sv
    elif sb is Basis.QS_MASS:
        A[2], B[2] = [1.0, 0.0, 0.0], sv
    elif sb is Basis.BALANCE:
        if batch_mass is not None:
            A[2], B[2] = [1.0, 0.0, 0.0], batch_mass
        else:  # balance to a volume batch: fix total volume
            A[2], B[2] = [1.0, 0.0, 0.0], rho * batch[1]
    elif sb is Basis.MASS:
        A[2], B[2] = [0.0, 0.0, 1.0], sv
    elif sb is Basis.VOLUME:
        A[2], B[2] = [0.0, 0.0, 1.0], sv * rho_w
    elif sb is Basis.AMOUNT:
        A[2], B[2] = [0.0, 0.0, 1.0], sv * solvent.M
    elif sb is Basis.MASS_FRACTION:
        A[2], B[2] = [-sv, 0.0, 1.0], 0.0
    elif sb is Basis.MASS_PER_VOLUME:
        A[2], B[2] = [-sv / rho, 0.0, 1.0], 0.0
    elif sb is Basis.VOLUME_FRACTION:
        A[2], B[2] = [-sv * rho_w / rho, 0.0, 1.0], 0.0
    elif sb is Basis.MOLARITY:
        A[2], B[2] = [-sv * solvent.M / rho, 0.0, 1.0], 0.0
    else:
        raise RecipeError(f"the solvent cannot be given as {sb.value}", solvent_row.row,
                          "unit", solvent_row.text)
    if not has_absolute:
        # every row is relative: the scale is free. Fix 1 kg and check the dropped rule.
        rule = A[2].copy()
        A[2], B[2] = [1.0, 0.0, 0.0], 1.0
        X = np.linalg.solve(A, B)
        if solvent_row is not None and sb is not Basis.BALANCE and abs(rule @ X) > 1e-9:
            total = (1.0 - X[2] / X[0]) * 100.0
            raise RecipeError(f"the rows are all relative and do not add up: the solutes make "
                              f"{total:.6g} % w/w and the solvent row asks for "
                              f"{solvent_row.number:g} {solvent_row.unit_label()}; write the "
                              "solvent as 'balance' or give absolute amounts",
                              solvent_row.row, "amount", solvent_row.text)
    else:
        try:
            X = np.linalg.solve(A, B)
        except np.linalg.LinAlgError:
            raise RecipeError("the recipe does not fix the amounts (the rows are not "
                              "independent); give one absolute amount or a q.s. row") from None
    m_tot, m_w, m_wa = X
    weighed = a + p * m_tot + q * m_w
    return m_tot, m_w, m_wa, weighed


def _composition(rows, solvent, M, h, x) -> Composition:
    m_tot, m_w, m_wa, weighed = x
    n = weighed / M if len(rows) else np.zeros(0)
    return Composition(tuple(r.ingredient for r in rows), n.reshape(1, -1),
                       np.array([m_w]), solvent, tuple(r.text for r in rows))


def _check_result(rows, solvent_row, m_tot, m_wa, rho, weighed):
    if m_wa < -1e-12 * max(m_tot, 1e-30):
        if solvent_row is not None and solvent_row.amount.basis is Basis.QS_VOLUME:
            need = (m_tot - m_wa) / rho
            raise RecipeError(
                f"q.s. to {solvent_row.number:g} {solvent_row.unit_label()} is too little: the "
                f"other ingredients alone need about {need * 1e6:.4g} mL of solution",
                solvent_row.row, "amount", solvent_row.text)
        if solvent_row is not None and solvent_row.amount.basis is Basis.QS_MASS:
            raise RecipeError(
                f"q.s. to {solvent_row.number:g} {solvent_row.unit_label()} is too little: the "
                f"other ingredients alone weigh {(m_tot - m_wa) * 1e3:.5g} g",
                solvent_row.row, "amount", solvent_row.text)
        raise RecipeError("the solutes take more than 100 % of the solution; lower the "
                          "amounts", solvent_row.row if solvent_row else None, "amount",
                          solvent_row.text if solvent_row else None)
    if m_tot <= 0 or not np.isfinite(m_tot):
        raise RecipeError("the recipe resolves to no solution; check the amounts")
    if solvent_row is None and not any(r.ingredient.hydrate_water for r in rows):
        raise RecipeError("the recipe has no solvent: add water (an amount, 'q.s. to' a "
                          "volume, or 'balance')")
    if np.any(weighed < 0):
        j = int(np.argmin(weighed))
        raise RecipeError("resolves to a negative amount", rows[j].row, "amount", rows[j].text)


def _scale_to(res: ResolvedRecipe, batch: tuple[str, float]) -> ResolvedRecipe:
    kind, value = batch
    if not (value > 0 and math.isfinite(value)):
        raise RecipeError(f"batch size must be positive, got {value:g}")
    f = value / (res.m_total if kind == "mass" else res.volume_prep)
    return replace(res, composition=res.composition.scaled(f), weighed_kg=res.weighed_kg * f,
                   pure_kg=res.pure_kg * f, water_added_kg=res.water_added_kg * f)


#: batch sizes the tool computes: 1 µg to 1 000 t [kg], 1 µL to 1 000 m³ [m³]
BATCH_MASS_RANGE = (1e-9, 1e6)
BATCH_VOLUME_RANGE = (1e-9, 1e3)


def parse_batch(text: str, *, decimal: str = ".") -> tuple[str, float]:
    """Parse a batch size such as ``"5 L"`` or ``"20 kg"`` into (``"mass"|"volume"``, SI).

    >>> parse_batch("5 L"), parse_batch("20 kg")
    (('volume', 0.005), ('mass', 20.0))
    """
    m = _NUM_UNIT.match(str(text))
    if not m or not m.group("unit").strip():
        raise RecipeError(f"batch {text!r}: write a number and a unit, e.g. '5 L' or '20 kg'")
    try:
        amount = parse_unit(m.group("unit"))
        x = read_number(m.group("num"), decimal=decimal)
    except (UnitParseError, NumberError) as exc:
        raise RecipeError(f"batch {text!r}: {exc.reason}") from None
    v = x * amount.value_si
    if amount.basis not in (Basis.MASS, Basis.VOLUME):
        raise RecipeError(f"batch {text!r}: the unit must be a mass or a volume")
    kind = "mass" if amount.basis is Basis.MASS else "volume"
    lo, hi = BATCH_MASS_RANGE if kind == "mass" else BATCH_VOLUME_RANGE
    if not (lo <= v <= hi):
        shown = ("1 µg to 1 000 t" if kind == "mass" else "1 µL to 1 000 m³")
        raise RecipeError(f"batch {text!r} is outside the sizes this tool computes ({shown})")
    return kind, v


# ---------------------------------------------------------------------------- recipe edits
def parse_quantity(text: str) -> tuple[float, Amount]:
    """``"0.9 % w/v"`` → (0.9, Amount of % w/v). Raises :class:`RecipeError` if unreadable.

    >>> n, a = parse_quantity("0.9 % w/v")
    >>> n, a.basis.value, a.value_si   # % w/v is 10 kg/m³ per unit
    (0.9, 'mass/volume', 10.0)
    """
    m = _NUM_UNIT.match(str(text).replace("\u2212", "-"))
    if not m or not m.group("unit").strip():
        raise RecipeError(f"{text!r}: write a number and a unit, e.g. '0.9 % w/v' or '20 % w/w'")
    try:
        return read_number(m.group("num")), parse_unit(m.group("unit"))
    except (NumberError, UnitParseError) as exc:
        raise RecipeError(f"{text!r}: {exc.reason}") from None


# ---------------------------------------------------------------------------- recipe edits
def _norm(text: str) -> str:
    return re.sub(r"[\s_\-,]+", "", str(text).strip().lower().replace("·", "."))


def find_row(recipe: Recipe, name: str, library: Library | None = None
             ) -> tuple[RecipeRow | None, Ingredient]:
    """The recipe row ``name`` refers to (as typed, or by library name or synonym), or
    ``(None, ingredient)`` when the ingredient is not in the recipe."""
    lib = library or default_library()
    n = _norm(name)
    hits = [r for r in recipe.rows if _norm(r.text) == n]
    if not hits:
        hits = [r for r in recipe.rows if n in {_norm(r.ingredient.name), _norm(r.ingredient.key),
                                               *map(_norm, r.ingredient.synonyms)}]
    ing = None
    if not hits:
        try:
            ing = lib.get(name)
            hits = [r for r in recipe.rows if r.ingredient.key == ing.key]
        except IngredientError as exc:
            if "ambiguous" not in exc.reason:
                raise
            keys = {lib.get(s).key for s in exc.suggestions}
            hits = [r for r in recipe.rows if r.ingredient.key in keys]
            if not hits:
                raise
    if len(hits) > 1:
        raise RecipeError(f"{name!r} matches rows {', '.join(str(r.row) for r in hits)}; "
                          "write the ingredient as in one row")
    if hits:
        return hits[0], hits[0].ingredient
    return None, ing


def solvent_row(recipe: Recipe) -> RecipeRow | None:
    """The solvent's row: the q.s./balance row, else the water row, else ``None``."""
    rules = [r for r in recipe.rows if r.is_solvent_rule]
    if rules:
        return rules[0]
    waters = [r for r in recipe.rows if r.ingredient.is_water]
    return waters[0] if waters else None


def new_row_unit(recipe: Recipe) -> str:
    """The unit a new row gets: % w/v under a q.s. volume, % w/w under balance or a q.s.
    mass, grams otherwise."""
    sv = solvent_row(recipe)
    b = sv.amount.basis if sv is not None else None
    if b is Basis.QS_VOLUME:
        return "% w/v"
    if b in (Basis.BALANCE, Basis.QS_MASS):
        return "% w/w"
    return "g"


def with_new_row(recipe: Recipe, ingredient: Ingredient, text: str
                 ) -> tuple[Recipe, RecipeRow]:
    """The recipe with a last row of ``ingredient`` (written ``text``) at 0 in
    :func:`new_row_unit`, and that row."""
    row = RecipeRow(max(r.row for r in recipe.rows) + 1, ingredient,
                    parse_unit(new_row_unit(recipe)), 0.0, 1.0, text)
    return replace(recipe, rows=(*recipe.rows, row)), row


def with_number(recipe: Recipe, row_id: int, x: float) -> Recipe:
    """The recipe with row ``row_id``'s number set to ``x`` (its unit unchanged)."""
    rows = tuple(replace(r, number=float(x)) if r.row == row_id else r for r in recipe.rows)
    return replace(recipe, rows=rows)


def _number_text(x: float) -> str:
    return str(int(x)) if float(x).is_integer() and abs(x) < 1e15 else repr(float(x))


def recipe_csv(recipe: Recipe) -> str:
    """The recipe as CSV text that :func:`read_recipe` reads back exactly (numbers written with
    full precision)."""
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["ingredient", "amount", "unit", "assay_%"])
    for rec, r in zip(recipe.as_written(), recipe.rows):
        a = rec["amount"]
        w.writerow([rec["ingredient"], repr(a) if isinstance(a, float) else a, rec["unit"],
                    repr(r.assay * 100.0) if r.assay != 1.0 else ""])
    return buf.getvalue()
