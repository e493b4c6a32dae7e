"""The dashboard's tables: the recipe table's columns, reading pasted or uploaded blocks
into it, and the frames of text the results section shows.

Every number shown is formatted from :meth:`Evaluation.to_dict` with the display policy
of :mod:`solutions.report`, so the page, the CSV and the printable report agree.
"""
from __future__ import annotations

import csv
import io
from pathlib import Path

import pandas as pd

from ..errors import RecipeError
from ..recipe import find_columns
from ..report import (COMPOSITION_SIG, PROPERTY_LABELS, dilute_text, fmt, property_model,
                      property_text, warning_links)
from .safe import InputLimitError, check_table_limits, check_text_limits, max_upload_bytes

__all__ = ["EDITOR_COLUMNS", "COLUMN_HELP", "blank_table", "clean_table", "frame_from_text",
           "frame_from_upload", "demo_recipes", "BASES", "DEFAULT_BASES", "composition_frame",
           "property_frame", "HEADLINE", "headline", "sort_cautions", "is_water",
           "activity_label", "solvent_words"]

#: the recipe table's columns, in the order a spreadsheet block is pasted
EDITOR_COLUMNS = ["ingredient", "amount", "unit", "formula", "molar_mass", "density", "ions",
                  "assay_%"]
COLUMN_HELP = {
    "ingredient": ("Ingredient", "A name from the ingredient library, or your own with a "
                   "formula or molar mass in the optional columns"),
    "amount": ("Amount", "A number, or for the solvent 'q.s. to 500' or 'balance'"),
    "unit": ("Unit", "g, mg, kg, mL, L, mol, mmol, % w/w, % w/v, % v/v, ppm, mg/mL, g/L, "
             "M, mM, mol/kg"),
    "formula": ("Formula", "Optional: defines or overrides the ingredient for this recipe"),
    "molar_mass": ("Molar mass (g/mol)", "Optional: instead of a formula"),
    "density": ("Density (g/mL)", "Optional: the pure liquid's density, for a liquid measured "
                "by volume"),
    "ions": ("Ions", "Optional: particles per formula unit (van 't Hoff factor), e.g. 2 "
             "for NaCl"),
    "assay_%": ("Assay (%)", "Optional: purity of what is weighed"),
}


def blank_table(rows: int = 1) -> pd.DataFrame:
    """An empty recipe table with ``rows`` blank rows."""
    return pd.DataFrame([{c: "" for c in EDITOR_COLUMNS} for _ in range(rows)],
                        columns=EDITOR_COLUMNS)


def _text(v) -> str:
    if v is None:
        return ""
    if isinstance(v, float):
        if v != v:  # NaN from an empty spreadsheet cell
            return ""
        return f"{v:g}"
    return str(v).strip()


def clean_table(df: pd.DataFrame) -> pd.DataFrame:
    """The editor's frame with every recipe column present, as text, on a plain index."""
    n = len(df)
    return pd.DataFrame({c: ([_text(v) for v in df[c].tolist()] if c in df.columns
                             else [""] * n) for c in EDITOR_COLUMNS},
                        index=range(n), dtype=object)


def _to_editor(df: pd.DataFrame) -> tuple[pd.DataFrame, list[str]]:
    """Map a table with its own header onto the editor's columns by header name (any
    language :func:`solutions.recipe.find_columns` knows); notes on the columns left out."""
    found = find_columns(df.columns)
    canon = {"molar_mass": "molar_mass", "assay": "assay_%"}
    rename = {col: canon.get(k, k) for k, col in found.items() if canon.get(k, k) in
              EDITOR_COLUMNS}
    dropped = [str(c) for c in df.columns if c not in rename and str(c).strip()]
    notes = [f"column(s) {', '.join(repr(c[:40]) for c in dropped)} not used"] if dropped else []
    missing = [c for c in ("ingredient", "amount") if c not in found]
    if missing:
        notes.append(f"no column headed {' or '.join(repr(m) for m in missing)} was found: "
                     "name the columns in the first line (ingredient, amount, unit, and "
                     "optionally formula, molar mass, density, ions, assay)")
    out = clean_table(df.loc[:, list(rename)].rename(columns=rename))
    if len(out) == 0:
        notes.append("the block has a header line but no ingredient rows")
        out = blank_table()
    return out, notes


def _looks_like_data(row: list[str]) -> bool:
    """True when a first line reads as an ingredient row (its amount cell is a number or
    a q.s./balance), not as a header."""
    if len(row) < 2:
        return False
    a = row[1].strip().lower().replace(",", ".")
    if a.startswith(("q.s", "qs", "balance", "bal")):
        return True
    try:
        float(a)
        return True
    except ValueError:
        return False


def frame_from_text(text: str, *, decimal_comma: bool = False) -> tuple[pd.DataFrame, list[str]]:
    """Read a pasted block (tab-separated from a spreadsheet, or CSV) into the editor.

    A first line naming the columns is used as the header, matched by name (common
    synonyms, and German, French, Spanish, Italian, Dutch and Portuguese headers);
    columns it does not know (supplier, lot…) are left out with a note. Without a header
    the first three columns are ingredient, amount and unit; further columns are used
    only when there are at most the editor's eight, else left out with a note asking
    for a header. A first line that is neither a known header nor an ingredient row
    gives an empty table and a note. With ``decimal_comma`` a comma-separated block is
    read as semicolon-separated, as such spreadsheets export. Raises
    :class:`~solutions.ui.safe.InputLimitError` beyond :data:`~solutions.ui.safe.MAX_ROWS`
    rows or :data:`~solutions.ui.safe.MAX_CELL_CHARS` characters in a cell.
    """
    lines = [ln for ln in text.replace("\r\n", "\n").replace("\r", "\n").split("\n")
             if ln.strip() and not ln.lstrip().startswith("#")]
    if not lines:
        return blank_table(), ["nothing to read"]
    check_text_limits("\n".join(lines))
    sample = lines[0]
    sep = "\t" if "\t" in sample else (";" if (";" in sample or decimal_comma) else ",")
    rows = list(csv.reader(io.StringIO("\n".join(lines)), delimiter=sep))
    head = [c.strip() for c in rows[0]]
    found = find_columns(head)
    if found:
        width = len(rows[0])
        body = [(r + [""] * width)[:width] for r in rows[1:]]
        return _to_editor(pd.DataFrame(body, columns=[h or f"column {i + 1}"
                                                      for i, h in enumerate(head)]))
    if not _looks_like_data(head):
        return blank_table(), [
            f"the first line ({', '.join(repr(h[:30]) for h in head[:4])}) is neither a "
            "header the page knows nor an ingredient row: start the block with a line "
            "naming the columns (ingredient, amount, unit, …) or with the first "
            "ingredient"]
    notes = []
    width = len(EDITOR_COLUMNS)
    most = max(len(r) for r in rows)
    if most > width:
        width = 3
        notes.append(f"the block has {most} columns and no header line: only ingredient, "
                     "amount and unit (the first three) were read; add a first line naming "
                     "the columns to use the others")
    body = [(r + [""] * width)[:width] for r in rows]
    return clean_table(pd.DataFrame(body, columns=EDITOR_COLUMNS[:width])), notes


def frame_from_upload(name: str, data: bytes, *, decimal_comma: bool = False
                      ) -> tuple[pd.DataFrame, list[str]]:
    """Read an uploaded CSV/TSV/TXT or XLSX recipe file into the editor.

    Raises :class:`~solutions.ui.safe.InputLimitError` for a file over
    :func:`~solutions.ui.safe.max_upload_bytes` or a table over the row and cell limits,
    and :class:`~solutions.errors.RecipeError` for a file that is not a readable
    workbook or text (the message names no path)."""
    limit = max_upload_bytes()
    if len(data) > limit:
        raise InputLimitError("the file", len(data), limit, "bytes")
    if name.lower().endswith((".xlsx", ".xlsm")):
        try:
            df = pd.read_excel(io.BytesIO(data), dtype=str, engine="openpyxl").fillna("")
        except Exception as exc:  # noqa: BLE001 - zip, XML and format errors alike
            raise RecipeError("it is not a readable .xlsx workbook (save it from the "
                              "spreadsheet as .xlsx, or as CSV)") from exc
        check_table_limits(df, "the workbook")
        if not len(df.columns) or not find_columns(df.columns):
            raise RecipeError("its first sheet has no header line naming the columns "
                              "(ingredient, amount, unit, …)")
        return _to_editor(df)
    if name.lower().endswith(".xls"):
        raise RecipeError("old .xls workbooks are not read: save it as .xlsx or CSV")
    try:
        text = data.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise RecipeError("it is not UTF-8 text (save it as CSV UTF-8, or as .xlsx)") from exc
    return frame_from_text(text, decimal_comma=decimal_comma)


def demo_recipes(folder: str | Path) -> dict[str, Path]:
    """The demo recipes: ``{name: path}`` of ``folder/*.csv``, sorted by name."""
    return {p.stem: p for p in sorted(Path(folder).glob("*.csv"))}


# ------------------------------------------------------------------ results
#: bases the user can tick: (component key, column header with unit)
BASES = {
    "weigh_g": "To weigh (g)",
    "mass_g": "Mass (g)",
    "amount_mol": "Amount (mol)",
    "mass_fraction": "Mass fraction (g/g)",
    "mole_fraction": "Mole fraction (mol/mol)",
    "molality_mol_per_kg": "Molality (mol/kg solvent)",
    "molarity_mol_per_L": "Molarity (mol/L)",
    "mass_per_volume_g_per_L": "Mass/volume (g/L)",
    "ppm": "ppm w/w (mg/kg)",
    "percent_w_v": "% w/v (g/100 mL)",
}
DEFAULT_BASES = ["weigh_g", "mass_fraction", "molality_mol_per_kg", "molarity_mol_per_L",
                 "percent_w_v"]


def composition_frame(d: dict, bases: list[str]) -> pd.DataFrame:
    """One row per component, one column per ticked basis; text with 4 significant figures."""
    rows = []
    for c in d["components"]:
        name = c["ingredient"]
        if c.get("library_name") and c["library_name"].lower() != name.lower():
            name = f"{name} ({c['library_name']})"
        row = {"Ingredient": name}
        for k in bases:
            row[BASES[k]] = fmt(c.get(k), COMPOSITION_SIG)
        rows.append(row)
    return pd.DataFrame(rows, columns=["Ingredient", *(BASES[k] for k in bases)])


def is_water(s: dict) -> bool:
    """True when the solution's solvent is water (``solution.solvent`` of the result)."""
    return str(s.get("solvent") or "water").strip().lower() == "water"


def activity_label(s: dict) -> str:
    """"Water activity", or the activity of the solution's own solvent."""
    return "Water activity" if is_water(s) else f"Solvent activity ({s['solvent']})"


def solvent_words(s: dict) -> dict[str, str]:
    """Words that follow the solvent: ``solvent`` (its name, lower case), ``solid`` (what
    freezes out) and ``crystal`` (the note on crystal water, empty for other solvents)."""
    if is_water(s):
        return {"solvent": "water", "solid": "ice", "crystal": ", crystal water included"}
    name = str(s["solvent"]).lower()
    return {"solvent": name, "solid": f"solid {name}", "crystal": ""}


def property_frame(d: dict) -> pd.DataFrame:
    """Every solution property: value, unit, model, dilute-ideal figure, linked warnings."""
    s = d["solution"]
    links = warning_links(d)
    rows = []
    for key, label, unit in PROPERTY_LABELS:
        if key == "water_activity":
            label = activity_label(s)
        if key == "boiling_point_C":
            label = f"Boiling point at {s['pressure_kPa']:g} kPa"
        w = links.get(key, [])
        rows.append({"Property": label, "Value": property_text(s, key), "Unit": unit or "–",
                     "Model": property_model(s, key), "Dilute ideal": dilute_text(s, key),
                     "Warnings": ("⚠ " + ", ".join(map(str, w))) if w else ""})
    return pd.DataFrame(rows)


#: the properties shown large at the top of the results: (key, label, unit)
HEADLINE = [("freezing_point_C", "Freezing point", "°C"),
            ("boiling_point_C", "Boiling point", "°C"),
            ("osmolality_mOsm_per_kg", "Osmolality", "mOsm/kg"),
            ("water_activity", "Water activity", "")]


def headline(d: dict) -> list[tuple[str, str, str]]:
    """(label with unit, value text, help text) of the headline properties."""
    s = d["solution"]
    out = []
    for key, label, unit in HEADLINE:
        if key == "water_activity":
            label = activity_label(s)
        dil = dilute_text(s, key)
        helptext = f"Model: {property_model(s, key)}."
        if key == "boiling_point_C":
            helptext = f"At {s['pressure_kPa']:g} kPa. " + helptext
        if key == "freezing_point_C":
            helptext = "At 101.325 kPa. " + helptext
        if dil:
            helptext += f" Dilute ideal: {dil}{(' ' + unit) if unit else ''}."
        out.append((f"{label} ({unit})" if unit else label, property_text(s, key), helptext))
    return out


def sort_cautions(d: dict) -> dict[str, list[str]]:
    """The evaluation's cautions, grouped by where the page shows them.

    ``ingredients`` (a named ingredient's hazard, beside the recipe), ``results``
    (tonicity and injectables, freeze protection, anything else) and ``vessels``
    (heating closed vessels, beside the vapor-pressure chart). Every caution lands in
    exactly one group.
    """
    out: dict[str, list[str]] = {"ingredients": [], "results": [], "vessels": []}
    detail = d.get("cautions_detail")
    if detail:
        place = {"ingredient": "ingredients", "vessel": "vessels"}
        for c in detail:
            out[place.get(c["tag"], "results")].append(c["message"])
        return out
    names = {str(c.get("library_name") or "").lower() for c in d.get("components", [])}
    for msg in d.get("cautions", []):
        head = msg.split(":", 1)[0].strip().lower()
        if head in names:
            out["ingredients"].append(msg)
        elif "sealed vessel" in msg or "closed or sealed" in msg:
            out["vessels"].append(msg)
        else:
            out["results"].append(msg)
    return out
