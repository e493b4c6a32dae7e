"""The dashboard's "Design and batch" section without Streamlit: a target solve, a
weigh-out sheet and a dilution from stock, each one call into the library.

:func:`solve_request` calls :func:`solutions.targeting.solve_target`,
:func:`weigh_out_sheet` calls :func:`solutions.batch.weigh_out` and :func:`plan_dilution`
calls :func:`solutions.batch.dilution_plan`, under the sidebar's :class:`Conditions`. What
a chemist typed (°C, mOsm/kg, kPa, g/mL, "20 % w/w") becomes a
:class:`~solutions.targeting.Target` through the library's own property table; every
number shown or written is the library's, formatted with :func:`solutions.report.fmt`.
Library errors come back as text (and, for an unreachable target, the nearest reachable
value), so the page keeps working.
"""
from __future__ import annotations

import csv
import io
from dataclasses import dataclass, field

import pandas as pd

from ..batch import dilution_plan, weigh_out
from ..concentration import component_concentration
from ..errors import SolutionsError, TargetError
from ..ingredients import Library
from ..recipe import Recipe, find_row, parse_batch, parse_quantity, resolve
from ..report import csv_value, fmt, json_text, property_text, safe_cell
from ..targeting import PROPERTIES, Target, solve_target
from .compute import Conditions, TableRead
from .tables import EDITOR_COLUMNS, activity_label, clean_table, sort_cautions

__all__ = ["TargetChoice", "TARGET_CHOICES", "CONCENTRATION_UNITS", "ADD_INGREDIENT",
           "TargetRequest", "TargetOutcome", "vary_options", "addable_ingredients",
           "choice_label", "make_target", "amount_text", "solve_request", "adjusted_rows",
           "adjusted_recipe_csv", "adjusted_table", "target_json", "answer_metrics",
           "answer_caption",
           "comparison_frame", "recipe_frame", "e_value_lines", "e_value_frame",
           "WeighOutcome", "weigh_out_sheet", "weigh_out_frame", "weigh_out_csv",
           "DilutionRequest", "DilutionOutcome", "plan_dilution", "dilution_frame",
           "stock_concentration", "design_cautions", "SIG"]

#: significant figures of the amounts and values this section shows
SIG = 6

#: the choice in the "ingredient to vary" box that adds a library ingredient
ADD_INGREDIENT = "Add an ingredient from the library…"

#: the concentration bases a concentration target or a dilution can be written in
CONCENTRATION_UNITS = ["% w/w", "% w/v", "% v/v", "ppm", "g/L", "mg/mL", "M", "mM", "mol/kg"]


@dataclass(frozen=True)
class TargetChoice:
    """One entry of the target-property box."""

    quantity: str        # a key of solutions.targeting.PROPERTIES
    label: str           # may name {P} [kPa] or {T} [°C] of the sidebar
    unit: str            # the unit the number is typed in
    default: float       # the number the box starts with (an example, not data)
    step: float
    format: str          # of the number box
    solution_key: str    # the page's value of this property, in Evaluation.to_dict()
    isotonic: bool = False


#: the target-property box, in display order; keys are the session's choice names
TARGET_CHOICES: dict[str, TargetChoice] = {c[0]: TargetChoice(*c[1:]) for c in (
    ("freezing_point", "freezing_point", "Freezing point", "°C", -10.0, 1.0, "%.3f",
     "freezing_point_C"),
    ("freezing_point_depression", "freezing_point_depression", "Freezing-point depression",
     "K", 5.0, 0.5, "%.3f", "freezing_point_depression_K"),
    ("isotonic", "osmolality", "Osmolality: isotonic", "mOsm/kg", 290.0, 1.0, "%.1f",
     "osmolality_mOsm_per_kg", True),
    ("osmolality", "osmolality", "Osmolality", "mOsm/kg", 300.0, 10.0, "%.1f",
     "osmolality_mOsm_per_kg"),
    ("osmolarity", "osmolarity", "Calculated osmolarity", "mOsm/L", 300.0, 10.0, "%.1f",
     "osmolarity_mOsm_per_L"),
    ("water_activity", "water_activity", "Water activity", "", 0.95, 0.01, "%.4f",
     "water_activity"),
    ("boiling_point", "boiling_point", "Boiling point at {P:g} kPa", "°C", 101.0, 0.5,
     "%.3f", "boiling_point_C"),
    ("vapor_pressure", "vapor_pressure", "Vapor pressure at {T:g} °C", "kPa", 3.0, 0.1,
     "%.4f", "vapor_pressure_kPa"),
    ("density", "density", "Density at {T:g} °C", "g/mL", 1.05, 0.01, "%.4f",
     "density_g_per_mL"),
    ("equilibrium_relative_humidity", "equilibrium_relative_humidity",
     "Equilibrium relative humidity at {T:g} °C", "%", 90.0, 1.0, "%.2f",
     "equilibrium_relative_humidity_percent"),
    ("concentration", "concentration", "Concentration of another ingredient", "", 1.0, 0.1,
     "%.4f", ""),
)}


def choice_label(key: str, cond: Conditions, solution: dict | None = None) -> str:
    """The property box's text for choice ``key`` under the sidebar's conditions (the
    solvent's activity named after the page's ``solution`` solvent)."""
    c = TARGET_CHOICES[key]
    text = c.label.format(P=cond.P_kPa, T=cond.T_C)
    if c.quantity == "water_activity" and solution is not None:
        text = activity_label(solution)
    return f"{text} ({c.unit})" if c.unit else text


def vary_options(read: TableRead) -> list[str]:
    """The recipe's dissolved ingredients as typed (the solvent row is not one), then the
    choice that adds a library ingredient."""
    rec = read.recipe
    out = [r.text for r in rec.rows if not r.is_solvent_rule and not r.ingredient.is_water] \
        if rec is not None else []
    return [*out, ADD_INGREDIENT]


def addable_ingredients(library: Library, read: TableRead) -> list[str]:
    """Library ingredients that can be added as the varied row: not water, not in the
    recipe already."""
    have = {r.ingredient.key for r in read.recipe.rows} if read.recipe is not None else set()
    return [i.name for i in library if not i.is_water and i.key not in have]


@dataclass(frozen=True)
class TargetRequest:
    """What the chemist asked for when pressing Solve (hashable, for the page's cache)."""

    vary: str
    choice: str                  # a key of TARGET_CHOICES
    value: float                 # in the choice's unit
    component: str | None = None
    basis: str | None = None     # the concentration unit, e.g. "% w/v"

    def describe(self, cond: Conditions) -> str:
        """In words, e.g. "freezing point −25 °C, varying propylene glycol"."""
        c = TARGET_CHOICES[self.choice]
        if self.choice == "concentration":
            what = f"concentration of {self.component} {amount_text(self.value)} {self.basis}"
        elif c.isotonic:
            what = f"isotonic osmolality, taken as {amount_text(self.value)} {c.unit}"
        else:
            what = (f"{c.label.format(P=cond.P_kPa, T=cond.T_C).lower()} "
                    f"{amount_text(self.value)} {c.unit}").strip()
        return f"{what}, varying {self.vary}"


def request_from(state) -> TargetRequest:
    """The :class:`TargetRequest` the target boxes of session ``state`` hold now."""
    vary = state.get("tg_vary")
    if vary == ADD_INGREDIENT:
        vary = state.get("tg_add")
    choice = state["tg_property"]
    conc = choice == "concentration"
    return TargetRequest(str(vary or ""), choice, float(state[f"tg_value_{choice}"]),
                         state.get("tg_component") if conc else None,
                         state.get("tg_basis") if conc else None)


def dilution_request_from(state) -> DilutionRequest:
    """The :class:`DilutionRequest` the dilution boxes of session ``state`` hold now."""
    return DilutionRequest(str(state.get("dl_ingredient") or ""), float(state["dl_to_value"]),
                           state["dl_to_unit"], float(state["dl_final_value"]),
                           state["dl_final_unit"])


def table_key(table: pd.DataFrame, decimal: str = ".") -> str:
    """A text that changes whenever the recipe table does (ties a solve to its recipe)."""
    return decimal + clean_table(table).to_csv(index=False)


def current_value(page, choice: str, component: str | None = None,
                  basis: str | None = None) -> str:
    """The page's recipe's value of target ``choice`` now, as text with its unit."""
    c = TARGET_CHOICES[choice]
    if c.quantity != "concentration":
        s = page.d["solution"]
        return f"{property_text(s, c.solution_key)} {c.unit}".strip()
    if not component or not basis:
        return "—"
    ev = page.evaluation
    try:
        row, _ = find_row(ev.resolved.recipe, component)
        _, amount = parse_quantity(f"1 {basis}")
        v = component_concentration(ev.resolved, row.row, amount, ev.rho)
    except (SolutionsError, AttributeError):
        return "—"
    return f"{fmt(v / amount.value_si, SIG)} {basis}"


def make_target(req: TargetRequest) -> Target:
    """The library's :class:`Target` for ``req``: the typed number taken back to SI with
    the library's own display scale of that property."""
    c = TARGET_CHOICES[req.choice]
    if c.quantity == "concentration":
        if not req.component or not req.basis:
            raise SolutionsError("choose the ingredient and the unit of the concentration")
        return Target.concentration(req.component, f"{req.value!r} {req.basis}")
    p = PROPERTIES[c.quantity]
    si = (float(req.value) - p.offset) / p.scale
    if c.isotonic:
        if not si > 0:
            raise SolutionsError(f"the isotonic osmolality must be positive, got "
                                 f"{req.value:g} {c.unit}")
        return Target.osmolality("isotonic", isotonic=si)
    return Target(c.quantity, si)


@dataclass
class TargetOutcome:
    """A target solve as the page shows it: the result's dictionary, or why there is none."""

    request: TargetRequest
    d: dict | None = None                  # TargetResult.to_dict()
    summary: str = ""                      # TargetResult.summary_text()
    rows: list[dict] = field(default_factory=list)   # adjusted recipe, editor columns
    error: str | None = None
    unreachable: bool = False
    nearest: float | None = None
    nearest_unit: str = ""

    @property
    def ok(self) -> bool:
        return self.d is not None


def _solve_kwargs(cond: Conditions) -> dict:
    kw = cond.evaluate_kwargs()
    kw.pop("batch")   # a target is solved on the recipe as written; scale it afterwards
    kw.pop("use", None)   # the design tools take no product use; design_cautions applies it
    return kw


def solve_request(read: TableRead, table: pd.DataFrame, req: TargetRequest, library: Library,
                  cond: Conditions) -> TargetOutcome:
    """Solve ``req`` on the page's recipe with :func:`solutions.targeting.solve_target`."""
    if read.recipe is None:
        return TargetOutcome(req, error=read.fatal or "no recipe")
    try:
        result = solve_target(read.recipe, req.vary, make_target(req), library=library,
                              **_solve_kwargs(cond))
    except TargetError as exc:
        return TargetOutcome(req, error=exc.reason, unreachable=True, nearest=exc.nearest,
                             nearest_unit=exc.unit)
    except SolutionsError as exc:
        return TargetOutcome(req, error=str(exc))
    d = result.to_dict()
    return TargetOutcome(req, d, result.summary_text(), adjusted_rows(d, read, table))


def amount_text(x) -> str:
    """An amount as a chemist writes it: up to :data:`SIG` significant figures, no
    trailing zeros (``38``, ``43.592``, ``0.0298493``)."""
    return f"{x:.{SIG}g}" if isinstance(x, (int, float)) else str(x)


def _number_text(x) -> str:
    """A recipe amount as text that reads back to the same float."""
    return repr(float(x)) if isinstance(x, (int, float)) else str(x)


def adjusted_rows(d: dict, read: TableRead, table: pd.DataFrame) -> list[dict]:
    """The adjusted recipe as editor rows (ingredient, amount, unit and the optional
    columns of the original table), amounts written to read back exactly."""
    src = clean_table(table)
    rows = []
    for k, rec in enumerate(d["recipe"]):
        row = {c: "" for c in EDITOR_COLUMNS}
        if k < len(read.used_rows):      # an original row: keep its optional cells
            row.update(src.iloc[read.used_rows[k] - 1].to_dict())
        row.update(ingredient=rec["ingredient"], amount=_number_text(rec["amount"]),
                   unit=rec["unit"])
        rows.append(row)
    return rows


def _optional_columns(rows: list[dict]) -> list[str]:
    return [c for c in EDITOR_COLUMNS[3:] if any(str(r.get(c, "")).strip() for r in rows)]


def adjusted_recipe_csv(rows: list[dict]) -> str:
    """The adjusted recipe as CSV (ingredient, amount, unit, then any optional column the
    recipe uses) that :func:`solutions.recipe.read_recipe` reads back; cells a spreadsheet
    would run as formulas are neutralised (:func:`solutions.report.safe_cell`)."""
    cols = ["ingredient", "amount", "unit", *_optional_columns(rows)]
    out = io.StringIO()
    w = csv.writer(out, lineterminator="\n")
    w.writerow(cols)
    for r in rows:
        w.writerow([safe_cell(str(r.get(c, ""))) for c in cols])
    return out.getvalue()


def adjusted_table(rows: list[dict], decimal: str = ".") -> pd.DataFrame:
    """The adjusted recipe as the recipe editor's frame (numbers with ``decimal``)."""
    df = pd.DataFrame([{c: r.get(c, "") for c in EDITOR_COLUMNS} for r in rows],
                      columns=EDITOR_COLUMNS)
    if decimal == ",":
        df["amount"] = [a.replace(".", ",") if _is_number(a) else a for a in df["amount"]]
    return df


def _is_number(text: str) -> bool:
    try:
        float(text)
        return True
    except ValueError:
        return False


def target_json(d: dict) -> str:
    """The target result's JSON (the evaluate JSON of the adjusted recipe and the solve)."""
    return json_text(d)


def answer_metrics(d: dict) -> list[tuple[str, str, str]]:
    """(label, value, help) of the answer: the new amount, its mass, the achieved value."""
    v, t = d["varied"], d["target"]
    was = ("a new row" if v["added_row"] else
           f"was {amount_text(v['original_amount'])} {v['unit']}")
    unit = f" {t['unit']}" if t["unit"] else ""
    mass_help = "Of the pure ingredient, in the recipe as written."
    if abs(v["weigh_g"] - v["mass_g"]) > 1e-12 * max(v["mass_g"], 1e-300):
        mass_help += f" To weigh, with the assay: {fmt(v['weigh_g'], SIG)} g."
    return [
        (f"New amount of {v['ingredient']}", f"{amount_text(v['amount'])} {v['unit']}",
         f"In the recipe's own unit ({was})."),
        (f"Mass of {v['ingredient']} (g)", fmt(v["mass_g"], SIG), mass_help),
        (f"Achieved {t['label']}", f"{fmt(t['achieved'], SIG)}{unit}",
         f"Target {amount_text(t['value'])}{unit}, evaluated on the adjusted recipe."),
    ]


def answer_caption(d: dict) -> str:
    """How the solve went, and what the grams refer to."""
    t = d["target"]
    return (f"{t['solver']}: {t['iterations']} iterations ({t['function_calls']} model "
            f"evaluations). Grams are for the recipe as written "
            f"({fmt(d['solution']['mass_g'], SIG)} g in all); the sidebar's batch does not "
            "apply here: scale the adjusted recipe in Scale-up / weigh-out after loading it.")


#: (solution key, label, unit) of the before/after comparison
_COMPARED = [("freezing_point_C", "Freezing point", "°C"),
             ("boiling_point_C", "Boiling point", "°C"),
             ("osmolality_mOsm_per_kg", "Osmolality", "mOsm/kg"),
             ("osmolarity_mOsm_per_L", "Calculated osmolarity", "mOsm/L"),
             ("water_activity", "Water activity", ""),
             ("vapor_pressure_kPa", "Vapor pressure", "kPa"),
             ("density_g_per_mL", "Density", "g/mL")]


def comparison_frame(before: dict, after: dict) -> pd.DataFrame:
    """The main properties of the recipe and of the adjusted recipe, side by side."""
    s0, s1 = before["solution"], after["solution"]
    rows = []
    for key, label, unit in _COMPARED:
        if key == "boiling_point_C":
            label = f"Boiling point at {s1['pressure_kPa']:g} kPa"
        rows.append({"Property": label, "Unit": unit or "–", "This recipe": property_text(s0, key),
                     "Adjusted recipe": property_text(s1, key)})
    return pd.DataFrame(rows)


def recipe_frame(d: dict) -> pd.DataFrame:
    """The adjusted recipe for display: amounts to :data:`SIG` figures, the varied row
    marked."""
    v = d["varied"]
    rows = []
    for i, rec in enumerate(d["recipe"], start=1):
        a = rec["amount"]
        note = ""
        if i == v["row"]:
            note = ("added" if v["added_row"] else
                    f"was {amount_text(v['original_amount'])} {v['unit']}")
        rows.append({"Ingredient": rec["ingredient"], "Amount": amount_text(a),
                     "Unit": rec["unit"], "Change": note})
    return pd.DataFrame(rows, columns=["Ingredient", "Amount", "Unit", "Change"])


def e_value_lines(d: dict) -> list[str]:
    """The E-value (sodium-chloride-equivalent) comparison, or why it is not available;
    empty when the target is not isotonic."""
    e = d.get("e_value_method")
    if e is None:
        return []
    if not e.get("available"):
        return [f"E-value method not available: {e['reason']}."]
    v = e["varied"]
    lines = [f"E-value method: {fmt(e['g_per_100_mL'], 4)} g/100 mL of {v} "
             f"({fmt(e['g_in_batch'], 4)} g in {fmt(e['volume_mL'], 5)} mL at "
             f"{e['volume_read_at_C']:g} °C); the model: {fmt(e['model_g_per_100_mL'], 4)} "
             f"g/100 mL ({fmt(e['model_g_in_batch'], 4)} g)."]
    diff = e.get("difference_percent")
    if diff is not None:
        lines.append(f"The E-value amount is {abs(diff):.2g} % "
                     f"{'less' if diff < 0 else 'more'} than the model's.")
    lines.append(e["note"][0].upper() + e["note"][1:] + ".")
    return lines


def e_value_frame(d: dict) -> pd.DataFrame | None:
    """The E-values used, one row per ingredient (``None`` when the method was not run)."""
    e = d.get("e_value_method")
    if e is None:
        return None
    return pd.DataFrame([{"Ingredient": i["ingredient"], "E (g NaCl per g)": fmt(i["E"], 3),
                          "g/100 mL": fmt(i["g_per_100_mL"], 4),
                          "NaCl-equivalent (g/100 mL)": fmt(i["nacl_equivalent_g_per_100_mL"], 4),
                          "Source": (i["derived"] + "; " if i["derived"] else "") + i["source"]}
                         for i in e["ingredients"]])


def design_cautions(d: dict, shown: dict | None = None, *, ingredients: bool = True,
                    use: str | None = None) -> list[str]:
    """The cautions of a design result to show beside it: tonicity and freeze protection,
    and (``ingredients``) ingredient cautions the page does not show already (``shown``:
    the page's :func:`~solutions.ui.tables.sort_cautions`). With ``use="technical"`` the
    tonicity caution is left out, as :func:`solutions.evaluate.evaluate` does."""
    groups = sort_cautions(d)
    tonicity = {c["message"] for c in d.get("cautions_detail", []) if c["tag"] == "tonicity"}
    out = [c for c in groups["results"] if not (use == "technical" and c in tonicity)]
    if ingredients:
        have = set((shown or {}).get("ingredients", []))
        out += [c for c in groups["ingredients"] if c not in have]
    return out


# ------------------------------------------------------------------ weigh-out
@dataclass
class WeighOutcome:
    batch_text: str
    d: dict | None = None          # WeighOut.to_dict()
    error: str | None = None

    @property
    def ok(self) -> bool:
        return self.d is not None


def weigh_out_sheet(read: TableRead, batch_text: str, cond: Conditions) -> WeighOutcome:
    """The weigh-out sheet of the page's recipe for ``batch_text`` (e.g. ``"5 L"``)."""
    if read.recipe is None:
        return WeighOutcome(batch_text, error=read.fatal or "no recipe")
    try:
        sheet = weigh_out(read.recipe, parse_batch(batch_text), **_solve_kwargs(cond))
        return WeighOutcome(batch_text, sheet.to_dict())
    except SolutionsError as exc:
        return WeighOutcome(batch_text, error=str(exc))


def _as_written(r: dict) -> str:
    a = r["recipe_amount"]
    a = "" if a is None else amount_text(a)
    return f"{a} {r['recipe_unit']}".strip()


def _volume(r: dict):
    return r.get("volume_mL") if r.get("solvent") else r.get("liquid_volume_mL_20C")


def weigh_out_frame(d: dict) -> pd.DataFrame:
    """The weigh-out sheet for display: one row per ingredient, the water last."""
    t_prep = d["final"]["volume_temperature_C"]
    rows = []
    for r in d["weigh_out"]:
        vol = _volume(r)
        at = f" at {t_prep:g} °C" if r.get("solvent") else " at 20 °C"
        assay = r.get("assay_percent")
        rows.append({"Ingredient": r["ingredient"], "As written": _as_written(r),
                     "Weigh (g)": fmt(r["weigh_g"], SIG),
                     "Volume (mL)": "" if vol is None else fmt(vol, SIG) + at,
                     "Assay (%)": "" if assay is None or assay == 100.0 else fmt(assay, 4),
                     "Note": r.get("note") or ""})
    df = pd.DataFrame(rows)
    for col in ("Assay (%)", "Note"):
        if not df[col].any():
            df = df.drop(columns=col)
    return df


def weigh_out_csv(d: dict) -> str:
    """The weigh-out sheet as CSV: the ingredients and water, the expected final solution,
    then the warnings and cautions; formula-like cells neutralised."""
    f = d["final"]
    out = io.StringIO()
    w = csv.writer(out, lineterminator="\n")
    row = lambda *r: w.writerow([csv_value(x) if isinstance(x, float) else safe_cell(csv_value(x))
                                 for x in r])  # noqa: E731
    row("item", "as_written", "weigh_g", "volume_mL", "volume_at_C", "note")
    for r in d["weigh_out"]:
        vol = _volume(r)
        row(r["ingredient"], _as_written(r), float(r["weigh_g"]),
            None if vol is None else float(vol),
            "" if vol is None else (f"{f['volume_temperature_C']:g}" if r.get("solvent")
                                    else "20"), r["note"])
    row("final solution (expected)", "", float(f["mass_g"]), float(f["volume_mL"]),
        f"{f['volume_temperature_C']:g}", f"density {csv_value(f['density_g_per_mL'])} g/mL "
        f"at {f['volume_temperature_C']:g} °C; {csv_value(f['volume_mL_at_T'])} mL at "
        f"{f['temperature_C']:g} °C")
    for m in d["warnings"]:
        row("warning", "", "", "", "", m)
    for m in d["cautions"]:
        row("caution", "", "", "", "", m)
    return out.getvalue()


# ------------------------------------------------------------------ dilution
@dataclass(frozen=True)
class DilutionRequest:
    ingredient: str
    to_value: float
    to_unit: str
    final_value: float
    final_unit: str

    @property
    def to_text(self) -> str:
        return f"{self.to_value!r} {self.to_unit}"

    @property
    def final_text(self) -> str:
        return f"{self.final_value!r} {self.final_unit}"


@dataclass
class DilutionOutcome:
    request: DilutionRequest
    d: dict | None = None          # DilutionPlan.to_dict()
    text: str = ""                 # DilutionPlan.text()
    error: str | None = None

    @property
    def ok(self) -> bool:
        return self.d is not None


def plan_dilution(read: TableRead, req: DilutionRequest, library: Library,
                  cond: Conditions) -> DilutionOutcome:
    """The page's recipe as the stock, diluted with its solvent to ``req``."""
    if read.recipe is None:
        return DilutionOutcome(req, error=read.fatal or "no recipe")
    try:
        plan = dilution_plan(read.recipe, req.ingredient, req.to_text, req.final_text,
                             library=library, **_solve_kwargs(cond))
        return DilutionOutcome(req, plan.to_dict(), plan.text())
    except SolutionsError as exc:
        return DilutionOutcome(req, error=str(exc))


def stock_concentration(recipe: Recipe, ingredient: str, unit: str, library: Library,
                        cond: Conditions) -> str:
    """The stock's concentration of ``ingredient`` in ``unit``, with the volumes at the
    preparation temperature (as the dilution takes them); the reason if it has none."""
    try:
        row, _ = find_row(recipe, ingredient, library)
        _, amount = parse_quantity(f"1 {unit}")
        res = resolve(recipe, T_prep=cond.T_prep_C + 273.15)
        c = component_concentration(res, row.row, amount, res.rho_prep)
    except (SolutionsError, AttributeError) as exc:
        return f"not available ({exc})"
    return f"{amount_text(c / amount.value_si)} {unit}"


def dilution_frame(d: dict) -> pd.DataFrame:
    """Stock, diluent and final solution: mass, volume and density at the preparation
    temperature."""
    x = d["dilution"]
    t = x["volume_temperature_C"]
    rows = []
    for label, part in (("Stock (this recipe)", x["stock"]),
                        (f"Diluent ({x['diluent']['ingredient'].lower()})", x["diluent"]),
                        ("Final solution", x["final"])):
        rows.append({"": label, "Mass (g)": fmt(part["mass_g"], SIG),
                     f"Volume (mL at {t:g} °C)": fmt(part["volume_mL"], SIG),
                     f"Density (g/mL at {t:g} °C)": fmt(part["density_g_per_mL"], 5)})
    return pd.DataFrame(rows)


def mixing_text(d: dict) -> str:
    """What the volume change on mixing means for the person at the bench, and whether
    the density model can see it (a component taken as mixing ideally cannot)."""
    x = d["dilution"]
    t = x["volume_temperature_C"]
    s, w, f = x["stock"], x["diluent"], x["final"]
    dv = x["volume_change_on_mixing_mL"]
    name = w["ingredient"].lower()
    ideal = sorted({c["component"] for c in d.get("warnings_detail", [])
                    if c.get("kind") == "ideal-fallback" and c.get("about") == "density"
                    and c.get("component")})
    tail = (f" The density model takes {' and '.join(ideal)} as mixing ideally with "
            f"{name} (volumes additive), so a real contraction or expansion from "
            f"{'it' if len(ideal) == 1 else 'them'} is not in these volumes."
            if ideal else "")
    if abs(dv) > 1e-4 * f["volume_mL"]:
        return (f"{'By the density model, v' if ideal else 'V'}olumes are not additive: "
                f"{fmt(s['volume_mL'], SIG)} mL of stock and {fmt(w['volume_mL'], SIG)} mL of "
                f"{name} ({fmt(s['volume_mL'] + w['volume_mL'], SIG)} mL together) give "
                f"{fmt(f['volume_mL'], SIG)} mL at {t:g} °C, a change of {dv:+.3g} mL on "
                "mixing. Weigh both, or add the stock and make up to the final volume."
                + tail)
    return (f"Volumes add up here to within {abs(dv):.2g} mL (the density model's estimate); "
            "weighing is still the surer way." + tail)


__all__ += ["mixing_text", "request_from", "dilution_request_from", "table_key",
            "current_value"]
