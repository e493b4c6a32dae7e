"""Design to a target: the amount of one ingredient that gives a recipe a stated property.

Given a recipe, one adjustable row and a target on one property — freezing point,
freezing-point depression, osmolality (``isotonic`` = 290 mOsm/kg unless stated), calculated
osmolarity, water activity, boiling point at a pressure, vapor pressure at a temperature,
density, or the concentration of a component in any basis — :func:`solve_target` finds
the number ``x`` of that row (in its own unit; the q.s./balance rule and every other row are
kept) with :func:`scipy.optimize.brentq` on exactly the model :func:`solutions.evaluate.evaluate`
uses, and checks the evaluated result against the target before returning it.

Method. The property ``p(x)`` of the resolved recipe is followed from ``x = 0`` upward
(doubling from the row's own amount) until it crosses the target, which brackets the root
for brentq. The search stops at the first physical or model limit:

* the q.s. volume or mass is full, or a % w/w balance recipe reaches 100 % (no water left);
* the ingredient's solubility at ``T`` (``solutions/data/solubility.csv``, g per 100 g water,
  interpolated linearly in T, nearest tabulated T outside the range, flagged);
* for freezing targets, the ingredient–water eutectic (``solutions/data/eutectics.csv``):
  past it ice is not the only solid that forms, so the ice line ends there. Both limits are
  taken on the binary basis, mass of dissolved (anhydrous) solute per mass of water in the
  solution; in a mixture this is an approximation;
* 98 % w/w of the ingredient (practically the pure ingredient, for miscible liquids);
* the property leaving the model's range (reported as not a number by the model).

A target that is not crossed raises :class:`~solutions.errors.TargetError` saying which
limit (or that the ingredient moves the property the wrong way) and the nearest value the
recipe can reach. Concentration and density targets are at the evaluation temperature
``T``, like :func:`~solutions.evaluate.evaluate`'s output; the recipe's own volumes stay at
its preparation temperature.

Beside the model, for isotonic osmolality targets, the sodium-chloride-equivalent (E-value)
method of hospital pharmacy (common practice):
NaCl-equivalent needed = 0.9 g/100 mL − Σ_j E_j c_j, the varied ingredient's amount
c_X = (0.9 − Σ_{j≠X} E_j c_j) / E_X [g/100 mL], with E-values from
``solutions/data/e_values.csv`` (or E = ΔT_f(1 %)_X / ΔT_f(1 %)_NaCl where only the 1 %
freezing-point depression is listed).
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass, field, replace
from typing import Callable

import numpy as np

from .colligative import P_ATM, colligative
from .density import solution_density
from .errors import Caveat, InputError, RecipeError, TargetError, caveat_fields
from .evaluate import Evaluation, evaluate
from .ingredients import Library, default_library
from .recipe import (T_PREP, Recipe, RecipeRow, ResolvedRecipe, find_row, new_row_unit,
                     parse_quantity, resolve, solvent_row, with_number)
from .concentration import CONCENTRATION_BASES as _CONC_BASES, component_concentration
from .isotonic import ISOTONIC_NACL_G_PER_100ML, ISOTONIC_OSMOLALITY, e_value_isotonic
from .limits import e_values, eutectic, solubility_limit
from .properties import targets as registry_targets
from .units import Amount, Basis, parse_unit

__all__ = ["Target", "TargetResult", "solve_target",
           "solubility_limit", "eutectic", "e_values",
           "component_concentration", "ISOTONIC_OSMOLALITY",
           "ISOTONIC_NACL_G_PER_100ML", "W_CAP", "PROPERTIES"]

#: highest mass fraction of the varied ingredient searched (practically the pure ingredient)
W_CAP = 0.98


# ---------------------------------------------------------------------------- properties
@dataclass(frozen=True)
class _Prop:
    key: str
    label: str
    unit: str        # display unit
    scale: float     # display = SI * scale + offset
    offset: float
    tol: float       # absolute tolerance of the achieved check [SI]
    needs: str = ""  # "freezing", "boiling" or ""


def _from_registry(p) -> _Prop:
    return _Prop(p.target, p.label[0].lower() + p.label[1:], p.unit, p.scale, p.offset, p.tol,
                 p.needs)


#: the target properties: the registry's target rows, plus the concentration of a row
PROPERTIES: dict[str, _Prop] = {
    **{name: _from_registry(p) for name, p in registry_targets().items()},
    "concentration": _Prop("concentration", "concentration", "", 1.0, 0.0, 0.0),
}


@dataclass(frozen=True)
class Target:
    """A target on one property, in SI.

    quantity : a key of :data:`PROPERTIES`
    value : the target [SI unit of the property: K, mol/kg, mol/m³, 1, Pa, kg/m³, or the
        SI unit of the concentration basis]
    component : for a concentration target, the ingredient (as typed or library name)
    amount : for a concentration target, the parsed unit (basis and SI factor)
    isotonic : the target is the isotonic osmolality (the E-value method applies)
    """

    quantity: str
    value: float
    component: str | None = None
    amount: Amount | None = None
    isotonic: bool = False

    def __post_init__(self):
        if self.quantity not in PROPERTIES:
            raise InputError(f"unknown target property {self.quantity!r}; choose one of "
                                 + ", ".join(PROPERTIES))
        if not math.isfinite(self.value):
            raise InputError(f"the target {self.quantity} must be a finite number")
        if self.quantity == "concentration":
            if self.amount is None or self.component is None:
                raise InputError("a concentration target needs a component and a unit")
            if self.amount.basis not in _CONC_BASES:
                raise InputError(f"{self.amount.text!r} is not a concentration; use % w/w, "
                                     "% w/v, % v/v, ppm, g/L, mg/mL, M, mM or mol/kg")
        if self.quantity in ("water_activity", "equilibrium_relative_humidity") and \
                not (0.0 < self.value < 1.0):
            raise InputError(f"a {self.prop.label} target must lie between "
                             f"{self.display(0.0):g} and {self.display(1.0):g}, got "
                             f"{self.display(self.value):g}")
        if self.quantity in ("osmolality", "osmolarity", "density", "vapor_pressure",
                             "freezing_point_depression", "concentration") and self.value < 0:
            raise InputError(f"a {PROPERTIES[self.quantity].label} target cannot be "
                                 f"negative, got {self.display(self.value):g} {self.unit}")

    # --- constructors (SI in) ----------------------------------------------------------
    @classmethod
    def freezing_point(cls, T: float) -> "Target":
        """Freezing point ``T`` [K]."""
        return cls("freezing_point", float(T))

    @classmethod
    def freezing_point_depression(cls, dT: float) -> "Target":
        """Freezing-point depression ``dT`` [K]."""
        return cls("freezing_point_depression", float(dT))

    @classmethod
    def osmolality(cls, b: float | str = "isotonic",
                   isotonic: float = ISOTONIC_OSMOLALITY) -> "Target":
        """Osmolality ``b`` [mol/kg], or ``"isotonic"`` (``isotonic`` [mol/kg])."""
        if isinstance(b, str):
            if b.strip().lower() not in ("isotonic", "iso"):
                raise InputError(f"osmolality {b!r}: give a number (mOsm/kg) or 'isotonic'")
            return cls("osmolality", float(isotonic), isotonic=True)
        return cls("osmolality", float(b), isotonic=abs(float(b) - isotonic) <= 1e-12)

    @classmethod
    def osmolarity(cls, c: float) -> "Target":
        """Calculated osmolarity Σ ν c ``c`` [mol/m³ = mOsm/L]."""
        return cls("osmolarity", float(c))

    @classmethod
    def water_activity(cls, a_w: float) -> "Target":
        return cls("water_activity", float(a_w))

    @classmethod
    def boiling_point(cls, T: float) -> "Target":
        """Boiling point ``T`` [K] at the pressure the solve is given."""
        return cls("boiling_point", float(T))

    @classmethod
    def vapor_pressure(cls, p: float) -> "Target":
        """Vapor pressure ``p`` [Pa] at the temperature the solve is given."""
        return cls("vapor_pressure", float(p))

    @classmethod
    def density(cls, rho: float) -> "Target":
        """Solution density ``rho`` [kg/m³] at the temperature the solve is given."""
        return cls("density", float(rho))

    @classmethod
    def concentration(cls, component: str, text: str) -> "Target":
        """Concentration of ``component`` written as a chemist types it, e.g. ``"0.9 % w/v"``."""
        number, amount = parse_quantity(text)
        return cls("concentration", number * amount.value_si, component, amount)

    # --- display -------------------------------------------------------------------------
    @property
    def prop(self) -> _Prop:
        return PROPERTIES[self.quantity]

    @property
    def unit(self) -> str:
        return self.amount.text if self.quantity == "concentration" else self.prop.unit

    @property
    def label(self) -> str:
        if self.quantity == "concentration":
            return f"concentration of {self.component} ({self.amount.text})"
        return self.prop.label

    def display(self, value_si: float) -> float:
        """A value of this property in the display unit (°C, mOsm/kg, kPa, g/mL, typed unit)."""
        if self.quantity == "concentration":
            return value_si / self.amount.value_si
        return value_si * self.prop.scale + self.prop.offset

    def fmt(self, value_si: float) -> str:
        u = self.unit
        v = self.display(value_si)
        return f"{v:.6g}{(' ' + u) if u else ''}"

    @property
    def tolerance(self) -> float:
        """Absolute tolerance of the achieved value [SI]."""
        if self.quantity == "concentration":
            return 1e-9 * abs(self.value) + 1e-15
        return self.prop.tol


_NUM_UNIT = re.compile(r"^\s*(?P<num>[-+]?[0-9]*[.,]?[0-9]+(?:[eE][-+]?[0-9]+)?)\s*(?P<unit>.*)$")


# ---------------------------------------------------------------------------- measuring
@dataclass
class _Conditions:
    T: float
    P: float
    model: str
    rho_measured: float | None
    T_prep: float


def _measure(res: ResolvedRecipe, target: Target, cond: _Conditions, comp_row: int | None) -> float:
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


def _measure_ev(ev: Evaluation, target: Target, comp_row: int | None) -> float:
    q = target.quantity
    if q == "density":
        return ev.rho
    if q == "concentration":
        return component_concentration(ev.resolved, comp_row, target.amount, ev.rho)
    return _from_props(ev.props, q)


# ---------------------------------------------------------------------------- solubility
# ---------------------------------------------------------------------------- the solve
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




_LIMIT_WORDS = {"solubility": "solubility reached", "eutectic": "eutectic reached",
                "water": "no water left", "cap": f"{W_CAP * 100:g} % w/w reached",
                "model": "the model's range ends"}


class _Infeasible(Exception):
    pass


@dataclass
class _Limit:
    kind: str
    x: float
    value: float          # property at the limit [SI], NaN if none


def solve_target(recipe: Recipe, vary: str, target: Target, *, library: Library | None = None,
                 T: float = 298.15, P: float = P_ATM, model: str = "nonideal",
                 rho_measured: float | None = None, T_prep: float = T_PREP,
                 xtol_rel: float = 1e-13) -> TargetResult:
    """The amount of ingredient ``vary`` that gives ``recipe`` the property ``target``.

    recipe : the recipe (:func:`solutions.recipe.read_recipe`)
    vary : the ingredient to adjust, as typed in the recipe or by library name; an
        ingredient not in the recipe is added as a new row in % w/v (q.s. to volume),
        % w/w (balance or q.s. to mass) or g (otherwise)
    target : a :class:`Target` (SI)
    T : temperature of the solution [K] (water activity, osmolality, vapor pressure,
        density and concentrations are at T)
    P : external pressure [Pa] (boiling point)
    model : activity model, as :func:`solutions.evaluate.evaluate`
    rho_measured : a measured density [kg/m³]; it belongs to one composition, so it is
        refused for a density target and flagged otherwise
    T_prep : temperature at which the recipe's volumes are read [K]

    Returns a :class:`TargetResult`; raises :class:`TargetError` when the target cannot be
    reached (with the nearest reachable value), :class:`RecipeError` for bad input.
    """
    lib = library or default_library()
    cond = _Conditions(float(T), float(P), model, rho_measured, float(T_prep))
    if rho_measured is not None and target.quantity == "density":
        raise InputError("a density target cannot be solved with a measured density "
                             "(--density): drop the measured value")
    row, ing = find_row(recipe, vary, lib)
    sv = solvent_row(recipe)
    if row is not None and sv is not None and row.row == sv.row:
        raise RecipeError(f"{row.text} is the solvent; vary a solute (to reach a concentration "
                          "by adding water use the 'dilute' command)", row.row, "ingredient",
                          row.text)
    if ing.is_water:
        raise RecipeError("water is the solvent and cannot be the varied ingredient")
    original = None
    if row is None:
        unit = new_row_unit(recipe)
        row = RecipeRow(max(r.row for r in recipe.rows) + 1, ing, parse_unit(unit), 0.0, 1.0,
                        str(vary))
        recipe = replace(recipe, rows=(*recipe.rows, row))
    else:
        original = float(row.number)
    comp_row = None
    if target.quantity == "concentration":
        crow, _ = find_row(recipe, target.component, lib)
        if crow is None:
            raise RecipeError(f"the target component {target.component!r} is not in the recipe")
        comp_row = crow.row
    caveats = []
    if rho_measured is not None:
        caveats.append(Caveat("measured-density", "the measured density given was applied to "
                              "the adjusted recipe, whose composition differs from the one "
                              "measured; re-measure it", None))

    solver = _Solver(recipe, row, target, cond, comp_row)
    x = solver.solve(original)
    final = with_number(recipe, row.row, x)
    res = resolve(final, T_prep=cond.T_prep, rho_measured=rho_measured)
    ev = evaluate(res, T=cond.T, P=cond.P, model=model, rho_measured=rho_measured,
                  T_prep=cond.T_prep)
    achieved = _measure_ev(ev, target, comp_row)
    if not (abs(achieved - target.value) <= target.tolerance):
        raise TargetError(f"the solver stopped at {x:.6g} {row.amount.text} of {row.text}, where "
                          f"the {target.label} is {target.fmt(achieved)}, not the target "
                          f"{target.fmt(target.value)}; this is a bug, please report it",
                          target.display(achieved), target.unit)
    caveats.extend(solver.caveats)
    varied = next(r for r in final.rows if r.row == row.row)
    e_method = None
    if target.quantity == "osmolality" and target.isotonic:
        e_method = e_value_isotonic(res, row.row)
    return TargetResult(target, ev, final, varied, original, achieved, solver.iterations,
                        solver.calls, caveats, e_method, comp_row)


class _Solver:
    """The bracket search and brentq for one (recipe, row, target)."""

    def __init__(self, recipe, row, target, cond, comp_row):
        self.recipe, self.row, self.target, self.cond = recipe, row, target, cond
        self.comp_row = comp_row
        self.calls = 0
        self.iterations = 0
        self.caveats: list[Caveat] = []
        key = row.ingredient.solute
        self.sol = solubility_limit(key, cond.T)
        self.eut = eutectic(key) if target.prop.needs == "freezing" else None
        if self.sol is not None and self.sol[1]["extrapolated"]:
            info = self.sol[1]
            self.caveats.append(Caveat(
                "solubility", f"the solubility of {row.ingredient.name} is tabulated for "
                f"{info['T_min'] - 273.15:g}–{info['T_max'] - 273.15:g} °C only; the nearest "
                "value limits the search", row.ingredient.name))
        self.sv = solvent_row(recipe)

    # --- one point -------------------------------------------------------------------
    def resolved(self, x: float) -> ResolvedRecipe:
        try:
            res = resolve(with_number(self.recipe, self.row.row, x), T_prep=self.cond.T_prep,
                          rho_measured=self.cond.rho_measured)
        except RecipeError as exc:
            raise _Infeasible(str(exc)) from None
        if not float(res.composition.m_solvent[0]) > 0:
            raise _Infeasible("no water left")
        return res

    def _ratio(self, res: ResolvedRecipe) -> tuple[float, float]:
        """(dissolved varied solute per water [kg/kg], mass fraction of the varied row)."""
        c = res.composition
        j = next(i for i, r in enumerate(res.solute_rows) if r.row == self.row.row)
        key = res.solute_rows[j].ingredient.solute
        m = sum(float(c.n[0, i]) * s.M_solute for i, s in enumerate(c.solutes) if s.solute == key)
        return m / float(c.m_solvent[0]), float(res.pure_kg[j]) / float(c.m_total[0])

    def limit_kind(self, x: float) -> str | None:
        """Which limit ``x`` is beyond (None when within all)."""
        try:
            res = self.resolved(x)
        except _Infeasible:
            return "water"
        r, w = self._ratio(res)
        if self.sol is not None and r > self.sol[0]:
            return "solubility"
        if self.eut is not None and r > self.eut[0]:
            return "eutectic"
        if w > W_CAP:
            return "cap"
        return None

    def f(self, x: float) -> float:
        """Property minus target at ``x`` [SI]; NaN outside the model."""
        self.calls += 1
        res = self.resolved(x)
        with np.errstate(all="ignore"):
            v = _measure(res, self.target, self.cond, self.comp_row)
        return v - self.target.value if math.isfinite(v) else math.nan

    # --- search ---------------------------------------------------------------------
    def _bisect(self, good: float, bad: float, ok: Callable[[float], bool],
                n: int = 60) -> tuple[float, float]:
        """Narrow [good, bad] around the edge of ``ok`` (true at good, false at bad)."""
        for _ in range(n):
            mid = 0.5 * (good + bad)
            if mid in (good, bad) or abs(bad - good) <= 1e-12 * abs(bad):
                break
            if ok(mid):
                good = mid
            else:
                bad = mid
        return good, bad

    def _towards_nan(self, a: float, fa: float, bad: float):
        """f is finite at ``a`` and NaN at ``bad``: a bracket of the root inside, or the
        finite edge. Returns ("bracket", lo, hi) or ("edge", x, f(x))."""
        for _ in range(50):
            mid = 0.5 * (a + bad)
            if mid in (a, bad) or bad - a <= 1e-12 * bad:
                break
            fm = self.f(mid)
            if not math.isfinite(fm):
                bad = mid
            elif np.sign(fm) != np.sign(fa):
                return "bracket", a, mid
            else:
                a, fa = mid, fm
        return "edge", a, fa

    def solve(self, start: float | None) -> float:
        t = self.target
        f0 = self.f(0.0)
        if not math.isfinite(f0):
            raise TargetError(f"the {t.label} of this recipe without {self.row.text} is outside "
                              "the model's range, so the search cannot start")
        if abs(f0) <= t.tolerance:
            return 0.0
        if self.limit_kind(0.0) is not None:
            raise TargetError(f"the recipe is already beyond a limit ({self.limit_kind(0.0)}) "
                              f"without any {self.row.text}")
        visited = [(0.0, f0)]
        prev, fprev = 0.0, f0
        x = start if (start and start > 0) else 1.0
        for _ in range(200):
            kind = self.limit_kind(x)
            if kind is not None:
                b, over = self._bisect(prev, x, lambda z: self.limit_kind(z) is None)
                kind = self.limit_kind(over) or kind
                fb = self.f(b) if b > prev else fprev
                if not math.isfinite(fb):
                    how, e, fe = self._towards_nan(prev, fprev, b)
                    if how == "bracket":
                        return self._brentq(e, fe)
                    if b - e > 1e-6 * b:  # NaN right at a physical limit is that limit's
                        kind = "model"
                    b, fb = e, fe
                visited.append((b, fb))
                if np.sign(fb) != np.sign(fprev) and b > prev:
                    return self._brentq(prev, b)
                limit = _Limit(kind, b, fb + t.value)
                break
            fx = self.f(x)
            if not math.isfinite(fx):
                how, e, fe = self._towards_nan(prev, fprev, x)
                if how == "bracket":
                    return self._brentq(e, fe)
                visited.append((e, fe))
                limit = _Limit("model", e, fe + t.value)
                break
            visited.append((x, fx))
            if np.sign(fx) != np.sign(fprev):
                return self._brentq(prev, x)
            x_next = 2.0 * x
            if abs(fx) < abs(fprev):
                # approaching: step a little past the secant's crossing, so a property that
                # turns back beyond its fitted range is not stepped over (1.1x to 2x)
                x_sec = x + fx * (x - prev) / (fprev - fx)
                x_next = x + min(max(1.25 * (x_sec - x), 0.1 * x), x)
            prev, fprev = x, fx
            x = x_next
        else:  # pragma: no cover - 2^200 is beyond any recipe
            raise TargetError(f"no bracket found for the {t.label}")
        self._unreachable(visited, limit)

    def _brentq(self, a: float, b: float) -> float:
        from scipy.optimize import brentq  # imported here: heavy, only the solve needs it

        x, r = brentq(self.f, a, b, xtol=max(abs(b), 1e-300) * 1e-14, rtol=1e-13,
                      maxiter=200, full_output=True)
        self.iterations = r.iterations
        if not r.converged:
            raise TargetError(f"brentq did not converge for the {self.target.label}")
        return float(x)

    # --- why not -------------------------------------------------------------------
    def _unreachable(self, visited, limit: _Limit):
        t = self.target
        name, unit = self.row.text, self.row.amount.text
        vals = [(x, fx + t.value) for x, fx in visited if math.isfinite(fx)]
        x_near, p_near = min(vals, key=lambda v: abs(v[1] - t.value))
        p0 = vals[0][1]
        tgt = t.fmt(t.value)
        nearest = t.display(p_near)
        scale = max(abs(p0), abs(t.value), 1e-300)
        spread = max(abs(p - p0) for _, p in vals)
        if spread <= max(t.tolerance, 1e-12 * scale):
            raise TargetError(f"{name} does not change the {t.label} of this recipe (it stays "
                              f"{t.fmt(p0)}); the target {tgt} needs another ingredient",
                              nearest, t.unit)
        if x_near == 0.0:
            far = max(vals, key=lambda v: abs(v[1] - p0))
            raise TargetError(
                f"{name} moves the {t.label} the wrong way: without any {name} it is "
                f"{t.fmt(p0)}, and adding {name} takes it further from the target {tgt} "
                f"(to {t.fmt(far[1])} at {far[0]:.4g} {unit})", t.display(p0), t.unit)
        if abs(x_near - limit.x) > 1e-6 * max(limit.x, 1e-300):
            # the property turned back before the limit (outside a model's fitted range)
            raise TargetError(
                f"the {t.label} comes closest to the target {tgt} at {x_near:.4g} {unit} of "
                f"{name} ({t.fmt(p_near)}) and turns back beyond it (outside the range the "
                f"model was fitted on); the search stopped at {limit.x:.4g} {unit} "
                f"({_LIMIT_WORDS.get(limit.kind, limit.kind)})", nearest, t.unit)
        xb = f"{limit.x:.4g} {unit}"
        pb = t.fmt(limit.value) if math.isfinite(limit.value) else "not defined"
        ing = self.row.ingredient
        if limit.kind == "solubility":
            r_sat, info = self.sol
            why = (f"{name} cannot dissolve beyond its solubility, {r_sat * 100:.4g} g per 100 g "
                   f"water at {self.cond.T - 273.15:.4g} °C (solubility.csv: {info['name']}); "
                   f"at that limit ({xb}) the {t.label} is {pb}, short of the target {tgt}")
        elif limit.kind == "eutectic":
            r_e, T_e, row = self.eut
            w_e = float(row["eutectic_mass_pct"])
            why = (f"beyond the {row['name']}–water eutectic ({w_e:g} % "
                   f"w/w, {T_e - 273.15:.4g} °C; eutectics.csv) ice is no longer the only solid "
                   f"that forms, so adding {name} cannot lower the freezing point further; at "
                   f"the eutectic composition ({xb}) the model gives a {t.label} of {pb}, "
                   f"short of the target {tgt}")
        elif limit.kind == "water":
            sb = self.sv.amount.basis if self.sv is not None else None
            if sb is Basis.QS_VOLUME:
                why = (f"the q.s. volume is already full: at {xb} of {name} no water is left "
                       f"to make up to {self.sv.number:g} {self.sv.amount.text}; the "
                       f"{t.label} there is {pb}, short of the target {tgt}")
            elif sb is Basis.QS_MASS:
                why = (f"the q.s. mass is already full: at {xb} of {name} no water is left "
                       f"to make up to {self.sv.number:g} {self.sv.amount.text}; the "
                       f"{t.label} there is {pb}, short of the target {tgt}")
            elif sb is Basis.BALANCE:
                why = (f"a % w/w balance recipe cannot exceed 100 %: at {xb} of {name} the "
                       f"rows leave no room for water; the {t.label} there is {pb}, short of "
                       f"the target {tgt}")
            else:
                why = (f"at {xb} of {name} the solutes would take the whole solution (no water "
                       f"left); the {t.label} there is {pb}, short of the target {tgt}")
        elif limit.kind == "cap":
            why = (f"even at {W_CAP * 100:g} % w/w {ing.name} ({xb}), practically the pure "
                   f"ingredient, the {t.label} only reaches {pb}, short of the target {tgt}")
        else:
            why = (f"beyond {xb} of {name} the {t.label} leaves the model's range (it cannot "
                   f"be computed there); the last computed value is {pb}, short of the "
                   f"target {tgt}")
        raise TargetError(why, nearest, t.unit)
