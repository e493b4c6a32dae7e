"""Formulation summaries: plain text for the terminal, a tidy CSV, JSON and a printable HTML.

All writers take the dictionary of :meth:`solutions.evaluate.Evaluation.to_dict`, so every
output surface shows the same numbers, models, warnings and cautions.
"""
from __future__ import annotations

import csv
import html
import io
import math

__all__ = ["text_report", "summary_csv", "safe_cell", "PROPERTY_LABELS", "BASIS_LABELS", "fmt"]

#: (key in ``solution``, label, unit) in display order
PROPERTY_LABELS = [
    ("density_g_per_mL", "Density", "g/mL"),
    ("volume_mL", "Volume", "mL"),
    ("mass_g", "Mass", "g"),
    ("water_activity", "Water activity", ""),
    ("vapor_pressure_kPa", "Vapor pressure", "kPa"),
    ("vapor_pressure_lowering_kPa", "Vapor-pressure lowering", "kPa"),
    ("freezing_point_C", "Freezing point", "°C"),
    ("freezing_point_depression_K", "Freezing-point depression", "K"),
    ("boiling_point_C", "Boiling point", "°C"),
    ("boiling_point_elevation_K", "Boiling-point elevation", "K"),
    ("osmolality_mOsm_per_kg", "Osmolality", "mOsm/kg"),
    ("osmolarity_mOsm_per_L", "Calculated osmolarity", "mOsm/L"),
    ("osmotic_coefficient", "Osmotic coefficient", ""),
    ("osmotic_pressure_kPa", "Osmotic pressure", "kPa"),
]

#: (key in a component record, label, unit)
BASIS_LABELS = [
    ("mass_g", "Mass", "g"),
    ("amount_mol", "Amount", "mol"),
    ("mass_fraction", "Mass fraction", ""),
    ("mole_fraction", "Mole fraction", ""),
    ("molality_mol_per_kg", "Molality", "mol/kg"),
    ("molarity_mol_per_L", "Molarity", "mol/L"),
    ("mass_per_volume_g_per_L", "Mass/volume", "g/L"),
    ("percent_w_v", "% w/v", "g/100 mL"),
    ("ppm", "ppm (w/w)", "mg/kg"),
]


def fmt(x, sig: int = 5) -> str:
    """A number with ``sig`` significant figures; '—' for a missing value."""
    if x is None:
        return "—"
    if isinstance(x, str):
        return x
    if not math.isfinite(x):
        return "—"
    if x == 0:
        return "0"
    if abs(x) >= 1e6 or abs(x) < 1e-4:
        return f"{x:.{sig - 1}e}"
    digits = max(sig - 1 - int(math.floor(math.log10(abs(x)))), 0)
    return f"{x:.{digits}f}"


def text_report(d: dict) -> str:
    s, cond = d["solution"], d["conditions"]
    lines = []
    title = d.get("recipe_name") or "recipe"
    lines.append(f"{title} at {fmt(cond['temperature_C'], 4)} °C, {fmt(cond['pressure_kPa'], 6)} kPa;"
                 f" model: {s['model_description']}")
    lines.append("")
    head = ["ingredient"] + [f"{lab} [{u}]" if u else lab for _, lab, u in BASIS_LABELS]
    rows = [[c["ingredient"]] + [fmt(c.get(k)) for k, _, _ in BASIS_LABELS] for c in d["components"]]
    widths = [max(len(h), *(len(r[i]) for r in rows)) for i, h in enumerate(head)]
    lines.append("  ".join(h.ljust(w) for h, w in zip(head, widths)))
    for r in rows:
        lines.append("  ".join(v.ljust(w) if i == 0 else v.rjust(w)
                               for i, (v, w) in enumerate(zip(r, widths))))
    lines.append("")
    dil = s.get("dilute_ideal", {})
    for key, lab, unit in PROPERTY_LABELS:
        v = fmt(s.get(key))
        extra = f"   (dilute ideal: {fmt(dil[key])})" if key in dil else ""
        lines.append(f"{lab:<28}{v:>14} {unit:<8}{extra}")
    lines.append(f"{'Density from':<28}{s['density_method']:>14}")
    if d.get("warnings"):
        lines.append("")
        lines.append("Warnings:")
        lines.extend(f"  - {w}" for w in d["warnings"])
    if d.get("cautions"):
        lines.append("")
        lines.append("Cautions:")
        lines.extend(f"  - {c}" for c in d["cautions"])
    return "\n".join(lines)


def safe_cell(v):
    """Neutralise text a spreadsheet would run as a formula (=, +, -, @, tab, CR)."""
    if isinstance(v, str) and v and v[0] in "=+-@\t\r":
        return "'" + v
    return v


def summary_csv(d: dict) -> str:
    """One tidy table: section, item, quantity, value, unit, note."""
    out = io.StringIO()
    w = csv.writer(out)
    w.writerow(["section", "item", "quantity", "value", "unit", "note"])
    row = lambda *r: w.writerow([safe_cell(x) for x in r])  # noqa: E731
    tool = d.get("tool", {})
    row("tool", "solutions", "version", tool.get("version", ""), "", tool.get("date", ""))
    row("recipe", d.get("recipe_name", ""), "name", d.get("recipe_name", ""), "", "")
    c = d["conditions"]
    row("conditions", "", "temperature", c["temperature_C"], "°C", "")
    row("conditions", "", "pressure", c["pressure_kPa"], "kPa", "")
    row("conditions", "", "model", c["model"], "", d["solution"]["model_description"])
    for rec in d.get("recipe", []):
        row("recipe row", rec["ingredient"], "amount", rec["amount"], rec["unit"], "")
    for comp in d["components"]:
        for key, lab, unit in BASIS_LABELS:
            v = comp.get(key)
            row("composition", comp["ingredient"], lab, "" if v is None else v, unit, "")
    s = d["solution"]
    for key, lab, unit in PROPERTY_LABELS:
        v = s.get(key)
        row("property", "solution", lab, "" if v is None else v, unit, s["model"])
    for key, v in s.get("dilute_ideal", {}).items():
        lab = next((lb for k, lb, _ in PROPERTY_LABELS if k == key), key)
        unit = next((u for k, _, u in PROPERTY_LABELS if k == key), "")
        row("property (dilute ideal)", "solution", lab, "" if v is None else v, unit, "dilute")
    for wmsg in d.get("warnings", []):
        row("warning", "", "", "", "", wmsg)
    for cmsg in d.get("cautions", []):
        row("caution", "", "", "", "", cmsg)
    return out.getvalue()


def _esc(x) -> str:
    return html.escape(str(x))
