"""One page update of the dashboard, without Streamlit: table → recipe → evaluation → curves.

The recipe table is read with :func:`solutions.recipe.read_recipe`. When a row is wrong
(unknown ingredient, bad number or unit) the library's :class:`RecipeError` names it; the
row is then set aside and the table read again, so every bad row gets its own message
and the remaining rows are still evaluated. Errors that concern the recipe as a whole
(it does not resolve, a condition is out of range) stop the evaluation with the
library's message; the page stays usable.
"""
from __future__ import annotations

import logging
import math
import re
from dataclasses import dataclass, field

import pandas as pd

from ..charts import (Curve, chart_spec, clausius_clapeyron_chart, concentration_chart,
                      concentration_curve, vapor_pressure_chart, vapor_pressure_curve,
                      vapor_pressure_range)
from ..errors import RecipeError, SolutionsError
from ..evaluate import Evaluation, evaluate
from ..ingredients import Library
from ..recipe import Recipe, parse_batch, read_recipe
from .safe import InputLimitError, check_table_limits
from .tables import EDITOR_COLUMNS, clean_table

_log = logging.getLogger(__name__)

__all__ = ["Conditions", "RowProblem", "TableRead", "PageResult", "read_table",
           "evaluate_table", "chart_curves"]


@dataclass(frozen=True)
class Conditions:
    """What the sidebar sets, in the units the page shows (°C, kPa, g/mL)."""

    T_C: float = 25.0
    P_kPa: float = 101.325
    model: str = "nonideal"
    rho_measured_g_per_mL: float | None = None
    batch_text: str | None = None      # e.g. "5 L"; None = as the recipe states
    T_prep_C: float = 20.0
    use: str | None = None             # "technical": never meets the body

    def evaluate_kwargs(self) -> dict:
        """Keyword arguments of :func:`solutions.evaluate.evaluate`, in SI (``use`` only
        when it is "technical", so the library's default stands otherwise)."""
        kw = dict(T=self.T_C + 273.15, P=self.P_kPa * 1e3, model=self.model,
                  rho_measured=None if self.rho_measured_g_per_mL is None
                  else self.rho_measured_g_per_mL * 1e3,
                  batch=parse_batch(self.batch_text) if self.batch_text else None,
                  T_prep=self.T_prep_C + 273.15)
        if self.use == "technical":
            kw["use"] = "technical"
        return kw


@dataclass(frozen=True)
class RowProblem:
    """A table row left out of the results, with the library's reason."""

    row: int                 # 1-based, as the table shows it
    ingredient: str | None
    column: str | None
    reason: str
    message: str             # the RecipeError message, numbered as the table is


@dataclass
class TableRead:
    recipe: Recipe | None
    problems: list[RowProblem] = field(default_factory=list)
    used_rows: list[int] = field(default_factory=list)     # 1-based table rows
    written: list[dict] = field(default_factory=list)      # {ingredient, amount, unit}
    fatal: str | None = None


@dataclass
class PageResult:
    read: TableRead
    evaluation: Evaluation | None = None
    d: dict | None = None         # Evaluation.to_dict(): the CLI's JSON object
    error: str | None = None      # why there is no evaluation

    @property
    def ok(self) -> bool:
        return self.d is not None


def _blank(rec: dict) -> bool:
    return all(str(rec.get(c, "") or "").strip() == "" for c in ("ingredient", "amount", "unit"))


#: the message of an error the library did not foresee (no type, path or traceback)
INTERNAL = ("internal error while {what}; please report it with the recipe that caused "
            "it")
_COMMA_NUMBER = re.compile(r"^\s*[-+]?\d*,\d+\s*$")
DECIMAL_HINT = ("if your numbers use a decimal comma (0,9), tick “Numbers use a decimal "
                "comma” under the table")


def _unexpected_row(df: pd.DataFrame, keep: list[int], library: Library, decimal: str,
                    exc_type: type) -> int | None:
    """The first kept row that alone raises ``exc_type`` (an error the library did not
    turn into a RecipeError), as an index into ``keep``; None if no single row does."""
    for k, i in enumerate(keep):
        try:
            read_recipe(df.iloc[[i]].reset_index(drop=True), library, decimal=decimal)
        except exc_type:
            return k
        except Exception:   # noqa: BLE001 - any other outcome: not this row
            continue
    return None


def read_table(table: pd.DataFrame, library: Library, *, decimal: str = ".",
               name: str = "") -> TableRead:
    """Read the recipe table; each row the library rejects becomes a :class:`RowProblem`.

    Row numbers are 1-based positions in ``table`` (blank rows count, as on screen). A
    table over the page's limits (:mod:`solutions.ui.safe`) is not read. When every
    dissolved ingredient is left out there is no recipe (the page shows no results for
    plain solvent), with a hint about the decimal comma when a refused amount has one.
    """
    try:
        check_table_limits(table)
    except InputLimitError as exc:
        return TableRead(None, fatal=str(exc))
    df = clean_table(table)
    keep = [i for i, rec in enumerate(df.to_dict("records")) if not _blank(rec)]
    problems: list[RowProblem] = []
    while True:
        if not keep:
            return TableRead(None, problems, fatal=_nothing_left(problems, df, decimal))
        sub = df.iloc[keep].reset_index(drop=True)
        try:
            recipe = read_recipe(sub, library, decimal=decimal, name=name)
            break
        except RecipeError as exc:
            if exc.row is None or not 1 <= exc.row <= len(keep):
                return TableRead(None, problems, fatal=str(exc))
            row = keep[exc.row - 1] + 1
            msg = str(RecipeError(exc.reason, row, exc.column, exc.ingredient))
            problems.append(RowProblem(row, exc.ingredient, exc.column, exc.reason, msg))
            del keep[exc.row - 1]
        except SolutionsError as exc:
            return TableRead(None, problems, fatal=str(exc))
        except Exception as exc:  # noqa: BLE001 - a reader defect must not reach the page
            k = _unexpected_row(df, keep, library, decimal, type(exc))
            if k is None:
                return TableRead(None, problems, fatal=INTERNAL.format(
                    what="reading the recipe table"))
            row = keep[k] + 1
            reason = "this row could not be read (check the amount and unit)"
            msg = str(RecipeError(reason, row, None, str(df.iloc[keep[k]]["ingredient"])))
            problems.append(RowProblem(row, str(df.iloc[keep[k]]["ingredient"]), None,
                                       reason, msg))
            del keep[k]
    if problems and all(r.is_solvent_rule or r.ingredient.is_water for r in recipe.rows):
        return TableRead(None, problems, fatal=_nothing_left(problems, df, decimal))
    written = [{"ingredient": str(df.iloc[i]["ingredient"]).strip(),
                "amount": str(df.iloc[i]["amount"]).strip(),
                "unit": str(df.iloc[i]["unit"]).strip()} for i in keep]
    return TableRead(recipe, problems, [i + 1 for i in keep], written)


def _nothing_left(problems: list[RowProblem], df: pd.DataFrame, decimal: str) -> str:
    if not problems:
        return "the recipe table is empty: add ingredient, amount and unit rows"
    rows = ", ".join(str(p.row) for p in problems)
    msg = (f"every dissolved ingredient was left out (row(s) {rows}), so there is nothing "
           "to compute")
    if decimal == "." and any(_COMMA_NUMBER.match(str(df.iloc[p.row - 1]["amount"]))
                              for p in problems):
        msg += "; " + DECIMAL_HINT
    return msg


def evaluate_table(table: pd.DataFrame, library: Library, conditions: Conditions, *,
                   decimal: str = ".", name: str = "") -> PageResult:
    """Read the table and evaluate what can be read under ``conditions``."""
    read = read_table(table, library, decimal=decimal, name=name)
    if read.recipe is None:
        return PageResult(read, error=read.fatal)
    try:
        ev = evaluate(read.recipe, **conditions.evaluate_kwargs())
        d = ev.to_dict()
    except SolutionsError as exc:
        return PageResult(read, error=str(exc))
    except Exception:  # noqa: BLE001 - a model defect: a plain message, details in the log
        _log.exception("evaluating a recipe")
        return PageResult(read, error=INTERNAL.format(what="evaluating this recipe"))
    return PageResult(read, ev, d)


def chart_curves(ev: Evaluation, d: dict) -> dict[str, Curve | str]:
    """The curve data of the three charts; a chart the library cannot draw gets its reason.

    Keys: ``"concentration"`` (chart a) and ``"vapor"`` (charts b and c).
    """
    return {"concentration": concentration_curve_of(ev),
            "vapor": vapor_curve_of(ev, *vapor_pressure_range(d["solution"]))}


def concentration_curve_of(ev: Evaluation) -> Curve | str:
    """Chart (a) of an evaluation, or the reason it cannot be drawn. It does not depend on
    the solution temperature (freezing and boiling points are found at their own)."""
    try:
        return concentration_curve(ev.composition, ev.P, ev.model)
    except SolutionsError as exc:
        return str(exc)
    except Exception:  # noqa: BLE001
        _log.exception("concentration curve")
        return INTERNAL.format(what="computing this chart")


def vapor_curve_of(ev: Evaluation, lo: float, hi: float) -> Curve | str:
    """Charts (b) and (c) of an evaluation from ``lo`` to ``hi`` [K], or the reason they
    cannot be drawn (see :func:`solutions.charts.vapor_pressure_range` for the span)."""
    try:
        return vapor_pressure_curve(ev.composition, ev.model, lo, hi)
    except SolutionsError as exc:
        return str(exc)
    except Exception:  # noqa: BLE001
        _log.exception("vapor-pressure curve")
        return INTERNAL.format(what="computing this chart")


def boiling_marks(d: dict, curve: Curve) -> dict[str, float]:
    """Boiling points [°C] of the pure solvent and the solution, keyed by curve label."""
    s = d["solution"]
    Tb, dTb = s.get("boiling_point_C"), s.get("boiling_point_elevation_K")
    labels = list(dict.fromkeys(curve.data["series"]))
    out = {}
    if Tb is not None and dTb is not None and math.isfinite(Tb) and len(labels) == 2:
        out[labels[0]] = Tb - dTb
        out[labels[1]] = Tb
    return out


def below_freezing(s: dict) -> bool:
    """True when the solution's temperature is below its freezing point (ice is stable)."""
    Tf = s.get("freezing_point_C")
    return Tf is not None and s["temperature_C"] < Tf


def report_dict(page: PageResult) -> dict:
    """The evaluation dictionary plus the recipe rows as written (for the CSV and HTML)."""
    return {**page.d, "recipe": page.read.written}


#: captions of the three charts, as the page and the printable report show them
CAPTIONS = {
    "concentration": "Freezing and boiling point against concentration (this recipe marked; "
                     "dashed: dilute ideal)",
    "vapor": "Vapor pressure against temperature; each curve boils where it meets the "
             "external pressure",
    "clausius": "ln p against 1000/T (Clausius–Clapeyron view)",
}


def page_charts(page: PageResult, curves: dict, width: int | None = None) -> dict:
    """``{"concentration" | "vapor" | "clausius": altair chart}`` for the curves that
    could be computed. ``width`` [px] of charts b and c (``None``: the container's)."""
    d, out = page.d, {}
    s = d["solution"]
    conc = curves.get("concentration")
    if isinstance(conc, Curve):
        out["concentration"] = concentration_chart(conc, s["freezing_point_C"],
                                                   s["boiling_point_C"], s["pressure_kPa"],
                                                   width=300)
    vap = curves.get("vapor")
    if isinstance(vap, Curve):
        P = s["pressure_kPa"]
        marks = boiling_marks(d, vap)
        # the curve is over the liquid, so its marker is too (not over ice below freezing)
        here = (s["temperature_C"], s["vapor_pressure_liquid_kPa"])
        note = "supercooled liquid" if below_freezing(s) else ""
        out["vapor"] = vapor_pressure_chart(vap, P, marks, here, note, width=width)
        out["clausius"] = clausius_clapeyron_chart(vap, P, marks, width=width)
    return out


def chart_specs(page: PageResult, curves: dict) -> dict[str, dict]:
    """The page's charts as Vega-Lite specifications (plain dicts, data inline), for
    ``st.vega_lite_chart``: built once per page update and cached with it, so a rerun
    does not convert the Altair charts again (:func:`solutions.charts.chart_spec`:
    each chart structure is built and schema-checked once per process)."""
    out = {}
    for k, chart in page_charts(page, curves).items():
        spec = chart_spec(chart)
        view = spec.get("config", {}).get("view", {})
        for dflt in ("continuousWidth", "continuousHeight"):   # Altair's theme, not ours
            view.pop(dflt, None)
        out[k] = spec
    return out


def report_charts(page: PageResult, curves: dict, width: int = 460) -> dict:
    """The charts keyed by caption, for :func:`solutions.report.html_report`."""
    return {CAPTIONS[k]: c for k, c in page_charts(page, curves, width).items()}


__all__ += ["chart_specs", "boiling_marks", "below_freezing", "EDITOR_COLUMNS", "report_dict", "CAPTIONS", "page_charts",
            "report_charts"]
