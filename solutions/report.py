"""Formulation summaries: plain text for the terminal, a tidy CSV, JSON and a printable HTML.

All writers take the dictionary of :meth:`solutions.evaluate.Evaluation.to_dict`, so every
output surface shows the same numbers, models, warnings and cautions.
"""
from __future__ import annotations

import csv
import html
import io
import json
import math

from .properties import PROPERTIES, about_groups, display_rows

__all__ = ["text_report", "summary_csv", "safe_cell", "PROPERTY_LABELS", "BASIS_LABELS", "fmt",
           "fmt_fixed", "property_text", "dilute_text", "warning_links", "json_text",
           "chart_svg", "html_report", "property_model", "dumps"]

#: (key in ``solution``, label, unit) in display order, from the property registry
PROPERTY_LABELS = display_rows()

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
        if key == "water_activity" and s.get("solvent", "Water") != "Water":
            lab = f"Solvent activity ({s['solvent']})"
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


#: significant figures of a number in a CSV export: above any input's precision, below
#: binary floating-point noise (9.000000000000004 is written 9)
CSV_SIG = 12


def csv_value(x):
    """A cell of a CSV export: a float to :data:`CSV_SIG` significant figures, ``None``
    as an empty cell, anything else as it is.

    >>> csv_value(9.000000000000004), csv_value(None), csv_value(0.1 + 0.2), csv_value("q.s.")
    ('9', '', '0.3', 'q.s.')
    """
    if x is None:
        return ""
    if isinstance(x, float):
        return f"{x:.{CSV_SIG}g}" if math.isfinite(x) else ""
    return x


def summary_csv(d: dict) -> str:
    """One tidy table: section, item, quantity, value, unit, note; numbers to
    :data:`CSV_SIG` significant figures, empty cells for missing values."""
    out = io.StringIO()
    w = csv.writer(out)
    w.writerow(["section", "item", "quantity", "value", "unit", "note"])
    row = lambda *r: w.writerow([csv_value(x) if isinstance(x, float) else safe_cell(csv_value(x))
                                 for x in r])  # noqa: E731
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


# ------------------------------------------------------------------ display precision
#: significant figures a property is shown with (keys of ``solution``); the freezing and
#: boiling points are shown to the decimals of their shift (see :func:`property_text`)
PROPERTY_SIG = {p.key: p.sig for p in PROPERTIES}
#: significant figures of the composition tables (dashboard and printable report)
COMPOSITION_SIG = 4
#: fixed decimals for properties whose scale is bounded
PROPERTY_DECIMALS = {"water_activity": 4}
#: a temperature and its shift are shown to the same decimals, so that the two lines agree
_SHIFT_OF = {"freezing_point_C": "freezing_point_depression_K",
             "boiling_point_C": "boiling_point_elevation_K"}


def fmt_fixed(x, decimals: int) -> str:
    """A number with a fixed number of decimals; '—' for a missing value.

    >>> fmt_fixed(-0.53213, 3), fmt_fixed(None, 2)
    ('-0.532', '—')
    """
    if x is None or (isinstance(x, float) and not math.isfinite(x)):
        return "—"
    return f"{x:.{max(decimals, 0)}f}"


def _decimals_for_sig(x: float, sig: int) -> int:
    if x is None or not math.isfinite(x) or x == 0:
        return max(sig - 1, 0)
    return max(sig - 1 - int(math.floor(math.log10(abs(x)))), 0)


def _shown(key: str, values: dict):
    """(text, decimals or None) of ``values[key]`` under the display policy."""
    x = values.get(key)
    if key in PROPERTY_DECIMALS:
        return fmt_fixed(x, PROPERTY_DECIMALS[key]), PROPERTY_DECIMALS[key]
    if key in _SHIFT_OF:
        shift = values.get(_SHIFT_OF[key])
        dec = min(max(_decimals_for_sig(shift, 3) if shift else 2, 1), 3)
        return fmt_fixed(x, dec), dec
    if key in ("freezing_point_depression_K", "boiling_point_elevation_K") and x is not None \
            and math.isfinite(x):
        dec = min(max(_decimals_for_sig(x, 3) if x else 2, 1), 3)
        return fmt_fixed(x, dec), dec
    return fmt(x, PROPERTY_SIG.get(key, 4)), None


def property_text(s: dict, key: str) -> str:
    """A solution property as the dashboard and the printable report show it.

    Significant figures follow :data:`PROPERTY_SIG`; a freezing or boiling point is shown
    to the decimals of its depression or elevation (3 significant figures, 1 to 3
    decimals), so that a point and its shift read consistently.

    >>> s = {"freezing_point_C": -0.53213, "freezing_point_depression_K": 0.53213,
    ...      "osmolality_mOsm_per_kg": 286.68, "water_activity": 0.99485}
    >>> [property_text(s, k) for k in ("freezing_point_C", "freezing_point_depression_K",
    ...                                "osmolality_mOsm_per_kg", "water_activity")]
    ['-0.532', '0.532', '287', '0.9949']
    """
    return _shown(key, s)[0]


def dilute_text(s: dict, key: str) -> str:
    """The dilute-ideal figure of ``key`` with the same display policy ('' if none)."""
    dil = s.get("dilute_ideal") or {}
    if key not in dil:
        return ""
    return _shown(key, dil)[0]


# ------------------------------------------------------------------ warnings by property
def warning_links(d: dict) -> dict[str, list[int]]:
    """Which warnings (1-based numbers in ``d['warnings']``) bear on which property, read
    from each warning's ``about`` tag (``warnings_detail``) and the property registry.

    >>> d = {"warnings": ["w", "v"], "warnings_detail": [{"about": "density", "kind": "x"},
    ...      {"about": "vapor boiling", "kind": "y"}]}
    >>> warning_links(d)["volume_mL"], warning_links(d)["boiling_point_C"]
    ([1], [2])
    """
    links: dict[str, list[int]] = {k: [] for k, _, _ in PROPERTY_LABELS}
    groups = about_groups()
    for i, w in enumerate(d.get("warnings_detail") or [], start=1):
        tags = (w.get("about") or "").split() or [""]     # one tag, several, or none
        keys = dict.fromkeys(k for t in tags for k in groups.get(t, ()))
        for k in keys:
            links[k].append(i)
    return links


# ------------------------------------------------------------------ JSON and HTML
def _clean(obj):
    """JSON-safe copy: NaN/inf become None (and are never produced silently upstream)."""
    if isinstance(obj, float):
        return obj if math.isfinite(obj) else None
    if isinstance(obj, dict):
        return {k: _clean(v) for k, v in obj.items()}
    if isinstance(obj, (list, tuple)):
        return [_clean(v) for v in obj]
    if hasattr(obj, "item") and callable(obj.item):  # numpy scalar
        return _clean(obj.item())
    return obj


def dumps(obj) -> str:
    return json.dumps(_clean(obj), indent=2, ensure_ascii=False, allow_nan=False)


def json_text(d: dict) -> str:
    """The JSON text of ``python -m solutions evaluate --json`` for the same dictionary."""
    return dumps(d)


def chart_svg(chart) -> str:
    """An Altair chart as inline SVG text, rendered offline by vl-convert."""
    import vl_convert as vlc
    svg = vlc.vegalite_to_svg(chart.to_json())
    return svg[svg.index("<svg"):] if "<svg" in svg else svg


_MODEL_SHORT = {"nonideal": "non-ideal", "ideal": "ideal solution", "dilute": "dilute ideal"}


def property_model(s: dict, key: str) -> str:
    """The model a solution property comes from, in a few words."""
    if key in ("density_g_per_mL", "volume_mL"):
        return s.get("density_method", "")
    if key == "mass_g":
        return "from the recipe"
    if key == "osmolarity_mOsm_per_L":
        return "ideal particle count"
    return _MODEL_SHORT.get(s.get("model"), s.get("model", ""))


_CSS = """
body{font-family:Georgia,'Times New Roman',serif;color:#1d1d1d;margin:2em auto;max-width:60em;
line-height:1.35;padding:0 1em}
h1{font-size:1.6em;margin-bottom:.1em}h2{font-size:1.2em;border-bottom:1px solid #999;
margin-top:1.6em}
table{border-collapse:collapse;margin:.5em 0;font-size:.9em}
th,td{border:1px solid #bbb;padding:.2em .5em;vertical-align:top}
th{background:#efece6;text-align:left}td.n{text-align:right;font-variant-numeric:tabular-nums}
.meta{color:#555;font-size:.9em}.caution{background:#fbf3e4;border-left:4px solid #b7791f;
padding:.4em .7em;margin:.4em 0}.warn{background:#fdf0ee;border-left:4px solid #a33;
padding:.3em .7em;margin:.3em 0}
figure{margin:1em 0;page-break-inside:avoid}figcaption{font-size:.9em;color:#444}
@media print{body{margin:0;max-width:none}h2{page-break-after:avoid}}
"""


def html_report(d: dict, charts: dict | None = None) -> str:
    """A printable, self-contained HTML report of one evaluation.

    d : the dictionary of :meth:`solutions.evaluate.Evaluation.to_dict`, optionally with a
        ``recipe`` list of ``{ingredient, amount, unit}`` rows as written.
    charts : ``{caption: altair chart}``; each is embedded as inline SVG (no scripts,
        no links: the file opens and prints offline).

    Shows the recipe, the conditions, every basis of every component, every property
    with its model, dilute-ideal figure and linked warnings, the warnings, the
    cautions, and the tool version and date.
    """
    e = _esc
    s, cond, tool = d["solution"], d["conditions"], d.get("tool", {})
    title = d.get("recipe_name") or "Recipe"
    out = ["<!DOCTYPE html>", '<html lang="en"><head><meta charset="utf-8">',
           f"<title>{e(title)} — solution report</title><style>{_CSS}</style></head><body>"]
    out.append(f"<h1>{e(title)}</h1>")
    out.append(f'<p class="meta">Report by {e(tool.get("name", "solutions"))} '
               f'{e(tool.get("version", ""))}, {e(tool.get("date", ""))}. Model estimates: '
               "confirm by measurement where it matters.</p>")
    out.append("<h2>Conditions</h2><table>")
    for lab, val in (("Temperature", f"{fmt(cond['temperature_C'], 5)} °C"),
                     ("External pressure", f"{fmt(cond['pressure_kPa'], 6)} kPa"),
                     ("Activity model", s.get("model_description", cond.get("model", ""))),
                     ("Recipe volumes read at", f"{fmt(cond.get('volumes_read_at_C'), 4)} °C"),
                     ("Density from", s.get("density_method", ""))):
        out.append(f"<tr><th>{e(lab)}</th><td>{e(val)}</td></tr>")
    out.append("</table>")
    if d.get("recipe"):
        out.append("<h2>Recipe as written</h2><table><tr><th>Ingredient</th><th>Amount</th>"
                   "<th>Unit</th></tr>")
        for r in d["recipe"]:
            out.append(f"<tr><td>{e(r.get('ingredient', ''))}</td><td>{e(r.get('amount', ''))}"
                       f"</td><td>{e(r.get('unit', ''))}</td></tr>")
        out.append("</table>")
    out.append(f"<h2>Composition</h2><p class='meta'>{COMPOSITION_SIG} significant figures; "
               "masses as weighed (a hydrate with its water).</p>"
               "<table><tr><th>Ingredient</th><th>To weigh [g]</th>")
    out.extend(f"<th>{e(lab)}{' [' + e(u) + ']' if u else ''}</th>" for _, lab, u in BASIS_LABELS)
    out.append("</tr>")
    for c in d["components"]:
        out.append(f"<tr><td>{e(c['ingredient'])}</td>"
                   f"<td class='n'>{e(fmt(c.get('weigh_g'), COMPOSITION_SIG))}</td>")
        out.extend(f"<td class='n'>{e(fmt(c.get(k), COMPOSITION_SIG))}</td>"
                   for k, _, _ in BASIS_LABELS)
        out.append("</tr>")
    out.append("</table>")
    links = warning_links(d)
    out.append("<h2>Properties</h2><table><tr><th>Property</th><th>Value</th><th>Unit</th>"
               "<th>Model</th><th>Dilute ideal</th><th>Warnings</th></tr>")
    for key, lab, unit in PROPERTY_LABELS:
        if key == "boiling_point_C":
            lab = f"{lab} at {fmt(s.get('pressure_kPa'), 6)} kPa"
        w = ", ".join(str(i) for i in links.get(key, []))
        out.append(f"<tr><td>{e(lab)}</td><td class='n'>{e(property_text(s, key))}</td>"
                   f"<td>{e(unit)}</td><td>{e(property_model(s, key))}</td>"
                   f"<td class='n'>{e(dilute_text(s, key))}</td><td>{e(w)}</td></tr>")
    out.append("</table>")
    if d.get("warnings"):
        out.append("<h2>Warnings</h2>")
        out.extend(f'<p class="warn">{i}. {e(w)}</p>' for i, w in enumerate(d["warnings"], 1))
    if d.get("cautions"):
        out.append("<h2>Cautions</h2>")
        out.extend(f'<p class="caution">{e(c)}</p>' for c in d["cautions"])
    if charts:
        out.append("<h2>Charts</h2>")
        for caption, chart in charts.items():
            out.append(f"<figure>{chart_svg(chart)}<figcaption>{e(caption)}</figcaption></figure>")
    out.append("</body></html>")
    return "\n".join(out)
