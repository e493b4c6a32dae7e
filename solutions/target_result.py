"""The answer of a target solve: the property measured, the result envelope, and the words
for a target out of reach.

:func:`measure` gives the target property of a resolved recipe exactly as
:func:`solutions.evaluate.evaluate` computes it (the solver's function);
:func:`measure_evaluation` reads it from an evaluation (the achieved value).

:class:`TargetResult` holds the adjusted recipe, its evaluation and how the solve went;
``to_dict`` is ``evaluate --json`` of the adjusted recipe plus the recipe, the varied row and
the target, ``summary_text`` the lines printed above the report.

:func:`unreachable` says why a target cannot be reached, from plain data of the search in
:mod:`solutions.targeting`: the points it visited, the limit it stopped at (:class:`Limit`)
and that limit's data (solubility, eutectic, the solvent row's q.s. or balance rule, the
pure-ingredient cap).
"""
from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

import numpy as np

from .colligative import colligative
from .concentration import component_concentration
from .density import solution_density
from .errors import Caveat, TargetError, caveat_fields
from .properties import targets as registry_targets
from .units import Basis

if TYPE_CHECKING:
    from .evaluate import Evaluation
    from .recipe import Recipe, RecipeRow, ResolvedRecipe
    from .targeting import Target

__all__ = ["SolveConditions", "measure", "measure_evaluation", "TargetResult", "Limit",
           "unreachable"]


# ---------------------------------------------------------------------------- measuring
@dataclass
class SolveConditions:
    """Conditions of a solve: T [K], P [Pa], activity model, measured density [kg/m³] or
    None, and the temperature the recipe's volumes are read at [K]."""

    T: float
    P: float
    model: str
    rho_measured: float | None
    T_prep: float


def measure(res: ResolvedRecipe, target: Target, cond: SolveConditions,
            comp_row: int | None) -> float:
    """The target property of a resolved recipe, as :func:`evaluate` computes it [SI]."""
    comp = res.composition
    rho = float(solution_density(comp, cond.T, measured=cond.rho_measured).rho[0])
    q = target.quantity
    if q == "density":
        return rho
    if q == "concentration":
        return component_concentration(res, comp_row, target.amount, rho)
    need = target.prop.needs
    props = colligative(comp, cond.T, cond.P, cond.model, rho=rho,
                        with_boiling=(need == "boiling"), with_freezing=(need == "freezing"))
    return _from_props(props, q)


def _from_props(props, q: str) -> float:
    v = getattr(props, registry_targets()[q].field)
    return float(np.asarray(v).reshape(-1)[0])


def measure_evaluation(ev: Evaluation, target: Target, comp_row: int | None) -> float:
    """The target property of an evaluation [SI] (the achieved value of a solve)."""
    q = target.quantity
    if q == "density":
        return ev.rho
    if q == "concentration":
        return component_concentration(ev.resolved, comp_row, target.amount, ev.rho)
    return _from_props(ev.props, q)



# ---------------------------------------------------------------------------- the result
@dataclass
class TargetResult:
    """A solved target: the adjusted recipe, its evaluation and how the solve went."""

    target: Target
    evaluation: Evaluation
    recipe: Recipe                      # the adjusted recipe
    varied: RecipeRow                   # the adjusted row (in the adjusted recipe)
    original_number: float | None       # None when the row was added
    achieved: float                     # [SI]
    iterations: int
    function_calls: int
    caveats: list[Caveat] = field(default_factory=list)
    e_value_method: dict | None = None
    component_row: int | None = None

    @property
    def number(self) -> float:
        return float(self.varied.number)

    @property
    def added(self) -> bool:
        return self.original_number is None

    def _varied_index(self) -> int:
        return next(i for i, r in enumerate(self.evaluation.resolved.solute_rows)
                    if r.row == self.varied.row)

    def to_dict(self) -> dict:
        """``evaluate --json`` of the adjusted recipe plus recipe, varied and target."""
        ev = self.evaluation
        d = ev.to_dict()
        d.update(caveat_fields([*ev.warnings, *self.caveats]))
        d["recipe"] = self.recipe.as_written()
        j = self._varied_index()
        res = ev.resolved
        d["varied"] = {
            "ingredient": self.varied.text, "library_name": self.varied.ingredient.name,
            "row": self.varied.row, "mass_g": float(res.pure_kg[j]) * 1e3,
            "weigh_g": float(res.weighed_kg[j]) * 1e3,
            "amount": self.number, "unit": self.varied.amount.text,
            "original_amount": self.original_number, "added_row": self.added,
        }
        t = self.target
        d["target"] = {
            "property": t.quantity, "label": t.label, "value": t.display(t.value),
            "unit": t.unit, "achieved": t.display(self.achieved),
            "tolerance": t.tolerance / t.amount.value_si if t.quantity == "concentration"
            else t.tolerance * t.prop.scale,
            "iterations": self.iterations, "function_calls": self.function_calls,
            "solver": "scipy.optimize.brentq",
        }
        if t.isotonic:
            d["target"]["isotonic"] = True
        if t.quantity == "concentration":
            d["target"]["component"] = t.component
        if self.e_value_method is not None:
            d["e_value_method"] = self.e_value_method
        return d

    def summary_text(self) -> str:
        t = self.target
        was = ("(added row)" if self.added else
               f"(was {self.original_number:.6g} {self.varied.amount.text})")
        d = self.to_dict()
        lines = [f"Target: {t.label} {t.fmt(t.value)}"
                 + (" (isotonic)" if t.isotonic else ""),
                 f"Vary {self.varied.text}: {self.number:.6g} {self.varied.amount.text} {was}"
                 f" = {d['varied']['mass_g']:.6g} g in this batch",
                 f"Achieved: {t.fmt(self.achieved)} ({self.iterations} brentq iterations, "
                 f"{self.function_calls} model evaluations)"]
        e = self.e_value_method
        if e is not None:
            if e.get("available"):
                lines.append(
                    f"E-value (NaCl-equivalent) method: {e['g_per_100_mL']:.4g} g/100 mL of "
                    f"{self.varied.text} ({e['g_in_batch']:.4g} g in {e['volume_mL']:.5g} mL); "
                    f"model: {e['model_g_per_100_mL']:.4g} g/100 mL "
                    f"({e['difference_percent']:+.2g} % E-method vs model)")
            else:
                lines.append(f"E-value method not available: {e['reason']}")
        return "\n".join(lines)


# ---------------------------------------------------------------------------- out of reach
_LIMIT_WORDS = {"solubility": "solubility reached", "eutectic": "eutectic reached",
                "water": "no water left", "cap": "{cap:g} % w/w reached",
                "model": "the model's range ends"}


@dataclass
class Limit:
    """Where the search stopped: the limit's kind (``"solubility"``, ``"eutectic"``,
    ``"water"``, ``"cap"`` or ``"model"``), the varied row's number ``x`` there and the
    property there [SI] (NaN if it cannot be computed)."""

    kind: str
    x: float
    value: float


def unreachable(target: Target, row: RecipeRow, visited, limit: Limit, *, T: float,
                solubility=None, eutectic=None, solvent: RecipeRow | None = None,
                w_cap: float) -> TargetError:
    """Why ``target`` cannot be reached by varying ``row``: a :class:`TargetError` carrying
    the nearest reachable value (display unit), for the caller to raise.

    visited : (x, property − target [SI]) at the points searched, the first at x = 0
    limit : where the search stopped
    T : temperature of the solution [K]
    solubility : ``(g solute per g water, table row)`` of :func:`limits.solubility_limit`
    eutectic : ``(g solute per g water, T_e [K], table row)`` of :func:`limits.eutectic`
    solvent : the recipe's solvent row (its q.s. or balance rule), None without one
    w_cap : the highest mass fraction of the varied ingredient searched
    """
    t = target
    name, unit = row.text, row.amount.text
    vals = [(x, fx + t.value) for x, fx in visited if math.isfinite(fx)]
    x_near, p_near = min(vals, key=lambda v: abs(v[1] - t.value))
    p0 = vals[0][1]
    tgt = t.fmt(t.value)
    nearest = t.display(p_near)
    scale = max(abs(p0), abs(t.value), 1e-300)
    spread = max(abs(p - p0) for _, p in vals)
    if spread <= max(t.tolerance, 1e-12 * scale):
        return TargetError(f"{name} does not change the {t.label} of this recipe (it stays "
                           f"{t.fmt(p0)}); the target {tgt} needs another ingredient",
                           nearest, t.unit)
    if x_near == 0.0:
        far = max(vals, key=lambda v: abs(v[1] - p0))
        return TargetError(
            f"{name} moves the {t.label} the wrong way: without any {name} it is "
            f"{t.fmt(p0)}, and adding {name} takes it further from the target {tgt} "
            f"(to {t.fmt(far[1])} at {far[0]:.4g} {unit})", t.display(p0), t.unit)
    if abs(x_near - limit.x) > 1e-6 * max(limit.x, 1e-300):
        # the property turned back before the limit (outside a model's fitted range)
        words = _LIMIT_WORDS.get(limit.kind, limit.kind).format(cap=w_cap * 100)
        return TargetError(
            f"the {t.label} comes closest to the target {tgt} at {x_near:.4g} {unit} of "
            f"{name} ({t.fmt(p_near)}) and turns back beyond it (outside the range the "
            f"model was fitted on); the search stopped at {limit.x:.4g} {unit} "
            f"({words})", nearest, t.unit)
    xb = f"{limit.x:.4g} {unit}"
    pb = t.fmt(limit.value) if math.isfinite(limit.value) else "not defined"
    if limit.kind == "solubility":
        r_sat, info = solubility
        why = (f"{name} cannot dissolve beyond its solubility, {r_sat * 100:.4g} g per 100 g "
               f"water at {T - 273.15:.4g} °C (solubility.csv: {info['name']}); "
               f"at that limit ({xb}) the {t.label} is {pb}, short of the target {tgt}")
    elif limit.kind == "eutectic":
        r_e, T_e, eut = eutectic
        w_e = float(eut["eutectic_mass_pct"])
        why = (f"beyond the {eut['name']}–water eutectic ({w_e:g} % "
               f"w/w, {T_e - 273.15:.4g} °C; eutectics.csv) ice is no longer the only solid "
               f"that forms, so adding {name} cannot lower the freezing point further; at "
               f"the eutectic composition ({xb}) the model gives a {t.label} of {pb}, "
               f"short of the target {tgt}")
    elif limit.kind == "water":
        sb = solvent.amount.basis if solvent is not None else None
        if sb in (Basis.QS_VOLUME, Basis.QS_MASS):
            full = "volume" if sb is Basis.QS_VOLUME else "mass"
            why = (f"the q.s. {full} is already full: at {xb} of {name} no water is left "
                   f"to make up to {solvent.number:g} {solvent.amount.text}; the "
                   f"{t.label} there is {pb}, short of the target {tgt}")
        elif sb is Basis.BALANCE:
            why = (f"a % w/w balance recipe cannot exceed 100 %: at {xb} of {name} the "
                   f"rows leave no room for water; the {t.label} there is {pb}, short of "
                   f"the target {tgt}")
        else:
            why = (f"at {xb} of {name} the solutes would take the whole solution (no water "
                   f"left); the {t.label} there is {pb}, short of the target {tgt}")
    elif limit.kind == "cap":
        why = (f"even at {w_cap * 100:g} % w/w {row.ingredient.name} ({xb}), practically the "
               f"pure ingredient, the {t.label} only reaches {pb}, short of the target {tgt}")
    else:
        why = (f"beyond {xb} of {name} the {t.label} leaves the model's range (it cannot "
               f"be computed there); the last computed value is {pb}, short of the "
               f"target {tgt}")
    return TargetError(why, nearest, t.unit)
