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

Beside the model, an isotonic osmolality target also gets the amount by the
sodium-chloride-equivalent (E-value) method (:mod:`solutions.isotonic`). The result and the
words for an unreachable target are in :mod:`solutions.target_result`.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .colligative import P_ATM
from .concentration import CONCENTRATION_BASES as _CONC_BASES, component_concentration
from .errors import Caveat, InputError, RecipeError, TargetError
from .evaluate import evaluate
from .ingredients import Library, default_library
from .isotonic import ISOTONIC_NACL_G_PER_100ML, ISOTONIC_OSMOLALITY, e_value_isotonic
from .limits import e_values, eutectic, solubility_limit
from .properties import TargetProperty, target_properties
from .recipe import (T_PREP, Recipe, ResolvedRecipe, find_row, parse_quantity, resolve,
                     solvent_row, with_new_row, with_number)
from .roots import bisect_edge, finite_edge
from .target_result import (Limit, SolveConditions, TargetResult, measure, measure_evaluation,
                            unreachable)
from .units import Amount

__all__ = ["Target", "TargetResult", "solve_target", "solubility_limit", "eutectic", "e_values",
           "e_value_isotonic", "component_concentration", "ISOTONIC_OSMOLALITY",
           "ISOTONIC_NACL_G_PER_100ML", "W_CAP", "PROPERTIES"]

#: highest mass fraction of the varied ingredient searched (practically the pure ingredient)
W_CAP = 0.98


#: the target properties by name (the registry's target rows, plus a row's concentration)
PROPERTIES: dict[str, TargetProperty] = target_properties()


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
    def prop(self) -> TargetProperty:
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


# ---------------------------------------------------------------------------- the solve
class _Infeasible(Exception):
    pass


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
    cond = SolveConditions(float(T), float(P), model, rho_measured, float(T_prep))
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
    original = None if row is None else float(row.number)
    if row is None:
        recipe, row = with_new_row(recipe, ing, str(vary))
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
    achieved = measure_evaluation(ev, target, comp_row)
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
            v = measure(res, self.target, self.cond, self.comp_row)
        return v - self.target.value if math.isfinite(v) else math.nan

    # --- search ---------------------------------------------------------------------
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
                b, over = bisect_edge(lambda z: self.limit_kind(z) is None, prev, x)
                kind = self.limit_kind(over) or kind
                fb = self.f(b) if b > prev else fprev
                if not math.isfinite(fb):
                    how, e, fe = finite_edge(self.f, prev, fprev, b)
                    if how == "bracket":
                        return self._brentq(e, fe)
                    if b - e > 1e-6 * b:  # NaN right at a physical limit is that limit's
                        kind = "model"
                    b, fb = e, fe
                visited.append((b, fb))
                if np.sign(fb) != np.sign(fprev) and b > prev:
                    return self._brentq(prev, b)
                limit = Limit(kind, b, fb + t.value)
                break
            fx = self.f(x)
            if not math.isfinite(fx):
                how, e, fe = finite_edge(self.f, prev, fprev, x)
                if how == "bracket":
                    return self._brentq(e, fe)
                visited.append((e, fe))
                limit = Limit("model", e, fe + t.value)
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
        raise unreachable(t, self.row, visited, limit, T=self.cond.T, solubility=self.sol,
                          eutectic=self.eut, solvent=self.sv, w_cap=W_CAP)

    def _brentq(self, a: float, b: float) -> float:
        from scipy.optimize import brentq  # imported here: heavy, only the solve needs it

        x, r = brentq(self.f, a, b, xtol=max(abs(b), 1e-300) * 1e-14, rtol=1e-13,
                      maxiter=200, full_output=True)
        # f exactly 0 at an end: brentq returns it uniterated, its iteration count unset
        self.iterations = r.iterations if r.function_calls > 2 else 0
        if not r.converged:
            raise TargetError(f"brentq did not converge for the {self.target.label}")
        return float(x)
