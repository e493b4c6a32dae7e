"""Batches: scale a recipe to a batch and write its weigh-out sheet; dilute a stock.

Weigh-out. :func:`weigh_out` resolves the recipe for the batch (a mass, e.g. 20 kg, or a
volume at the preparation temperature, e.g. 5 L; :func:`solutions.recipe.resolve`) and lists
each ingredient's mass to weigh — in the form weighed (a hydrate with its crystal water) and
corrected for assay (``weigh = pure / assay``) — and the water to add as an estimated mass
*and* volume, V_w = m_w / ρ_w(T_prep) (IAPWS-IF97 water at the preparation temperature), not
"q.s.". For a q.s. recipe that water is the density model's estimate: add most of it, then
make up to the mark.

Dilution. :func:`dilution_plan` mixes a mass fraction α of stock with 1 − α of diluent (the
stock's solvent, water) and solves, with :func:`scipy.optimize.brentq` on the mixed
composition, for the α whose concentration of one ingredient equals the target (any basis:
% w/w, % w/v, % v/v, ppm, g/L, M, mM, mol/kg). Volumes — the final one and those inside
volume-based concentrations — are at the preparation temperature T_prep, where volumetric
glassware is read, and come from the solution-density model of the mixture, so they are not
additive: V_stock + V_diluent ≠ V_final in general. The mixture is then evaluated at T like
any recipe.
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .colligative import P_ATM
from .composition import Composition
from .concentration import CONCENTRATION_BASES, component_concentration, in_basis
from .density import solution_density, solvent_density
from .errors import Caveat, RecipeError, TargetError, caveat_fields
from .evaluate import Evaluation, evaluate
from .ingredients import Library, default_library
from .recipe import (T_PREP, Recipe, RecipeRow, ResolvedRecipe, find_row, parse_batch,
                     parse_quantity, resolve)
from .limits import solubility_caveats
from .units import Basis, parse_unit

__all__ = ["WeighOut", "weigh_out", "DilutionPlan", "dilution_plan", "solvent_density"]


# ---------------------------------------------------------------------------- weigh-out
@dataclass
class WeighOut:
    """A recipe scaled to a batch: what to weigh, the water to add, what comes out."""

    recipe: Recipe
    batch: tuple[str, float]          # ("mass", kg) or ("volume", m³ at T_prep)
    base: ResolvedRecipe              # the recipe as written
    resolved: ResolvedRecipe          # scaled to the batch
    evaluation: Evaluation
    caveats: list[Caveat] = field(default_factory=list)

    @property
    def scale_factor(self) -> float:
        """Batch mass over the recipe's own mass [1]."""
        return self.resolved.m_total / self.base.m_total

    @property
    def water_volume(self) -> float:
        """Volume of the water to add at the preparation temperature [m³]."""
        return self.resolved.water_added_kg / solvent_density(self.resolved, self.resolved.T_prep)

    def rows(self) -> list[dict]:
        res = self.resolved
        c = res.composition
        written = {w["row"]: w for w in res.recipe.as_written()}
        out = []
        for j, r in enumerate(res.solute_rows):
            ing = r.ingredient
            amount, unit = written[r.row]["amount"], written[r.row]["unit"]
            pure = float(res.pure_kg[j])
            dissolved = float(c.n[0, j]) * ing.M_solute
            rec = {
                "ingredient": r.text, "library_name": ing.name, "row": r.row,
                "formula": ing.formula, "recipe_amount": amount, "recipe_unit": unit,
                "assay_percent": r.assay * 100.0,
                "weigh_g": float(res.weighed_kg[j]) * 1e3,
                "pure_mass_g": pure * 1e3,
                "dissolved_mass_g": dissolved * 1e3,
                "crystal_water_g": (pure - dissolved) * 1e3,
                "liquid_volume_mL_20C": (pure / ing.rho_pure * 1e6) if ing.rho_pure else None,
            }
            notes = []
            if ing.hydrate_water:
                notes.append(f"weigh the {ing.name.lower()} ({ing.formula}); its "
                             f"{rec['crystal_water_g']:.4g} g of crystal water joins the water")
            if r.assay != 1.0:
                notes.append(f"corrected for assay {r.assay * 100:g} %: "
                             f"{rec['pure_mass_g']:.6g} g pure")
            rec["note"] = "; ".join(notes)
            out.append(rec)
        w = res.solvent_row
        T_prep = res.T_prep
        rho_w = solvent_density(res, T_prep)
        water = {
            "ingredient": w.text if w is not None else c.solvent.name,
            "library_name": c.solvent.name, "row": w.row if w is not None else None,
            "formula": c.solvent.formula,
            "recipe_amount": written[w.row]["amount"] if w is not None else None,
            "recipe_unit": written[w.row]["unit"] if w is not None else "",
            "weigh_g": res.water_added_kg * 1e3,
            "volume_mL": res.water_added_kg / rho_w * 1e6,
            "volume_temperature_C": T_prep - 273.15,
            "solvent_density_g_per_mL": rho_w / 1e3, "solvent": True,
        }
        rule = w.amount.basis if w is not None else None
        if rule is Basis.QS_VOLUME:
            water["note"] = (f"estimated by the density model: add about {water['weigh_g']:.5g} "
                             f"g ({water['volume_mL']:.5g} mL at {T_prep - 273.15:g} °C), then "
                             f"make up to {res.volume_prep * 1e6:.6g} mL")
        elif rule is Basis.QS_MASS:
            water["note"] = f"add water to a total of {res.m_total * 1e3:.6g} g"
        else:
            water["note"] = ""
        out.append(water)
        return out

    def to_dict(self) -> dict:
        """``evaluate --json`` of the batch plus ``batch``, ``scale_factor``, ``weigh_out``
        and ``final`` (volume and density at the preparation temperature)."""
        ev = self.evaluation
        d = ev.to_dict()
        d.update(caveat_fields([*ev.warnings, *self.caveats]))
        kind, v = self.batch
        d["batch"] = {"kind": kind, "mass_g": v * 1e3 if kind == "mass" else None,
                      "volume_mL": v * 1e6 if kind == "volume" else None}
        d["scale_factor"] = self.scale_factor
        d["weigh_out"] = self.rows()
        res = self.resolved
        d["final"] = {"mass_g": res.m_total * 1e3, "volume_mL": res.volume_prep * 1e6,
                      "density_g_per_mL": res.rho_prep / 1e3,
                      "volume_temperature_C": res.T_prep - 273.15,
                      "volume_mL_at_T": ev.volume * 1e6, "density_g_per_mL_at_T": ev.rho / 1e3,
                      "temperature_C": ev.T - 273.15}
        return d

    def text(self) -> str:
        d = self.to_dict()
        f = d["final"]
        kind, v = self.batch
        size = f"{v:.6g} kg" if kind == "mass" else f"{v * 1e3:.6g} L"
        lines = [f"Weigh-out sheet: {d['recipe_name'] or 'recipe'}, batch {size} "
                 f"(× {self.scale_factor:.6g} of the recipe as written)", ""]
        head = ["ingredient", "as written", "weigh [g]", "volume [mL]", "note"]
        rows = []
        for r in d["weigh_out"]:
            aw = r["recipe_amount"]
            aw = f"{aw:.6g}" if isinstance(aw, float) else (str(aw) if aw is not None else "")
            vol = r.get("volume_mL") if r.get("solvent") else r.get("liquid_volume_mL_20C")
            rows.append([r["ingredient"], f"{aw} {r['recipe_unit']}".strip(),
                         f"{r['weigh_g']:.6g}", "" if vol is None else f"{vol:.6g}", r["note"]])
        widths = [max(len(h), *(len(x[i]) for x in rows)) for i, h in enumerate(head[:-1])]
        lines.append("  ".join(h.ljust(w) for h, w in zip(head[:-1], widths)) + "  note")
        for x in rows:
            lines.append("  ".join(v.ljust(w) if i in (0, 1) else v.rjust(w)
                                   for i, (v, w) in enumerate(zip(x[:-1], widths)))
                         + ("  " + x[-1] if x[-1] else ""))
        lines.append("")
        lines.append(f"Expected: {f['mass_g']:.6g} g, {f['volume_mL']:.6g} mL at "
                     f"{f['volume_temperature_C']:g} °C (density {f['density_g_per_mL']:.5g} "
                     f"g/mL); {f['volume_mL_at_T']:.6g} mL at {f['temperature_C']:g} °C")
        lines.append("Volumes of liquid ingredients are at 20 °C (library densities); the water "
                     "volume at the preparation temperature.")
        if d["warnings"]:
            lines += ["", "Warnings:"] + [f"  - {w}" for w in d["warnings"]]
        if d["cautions"]:
            lines += ["", "Cautions:"] + [f"  - {c}" for c in d["cautions"]]
        return "\n".join(lines)


def weigh_out(recipe: Recipe, batch: tuple[str, float], *, T: float = 298.15,
              P: float = P_ATM, model: str = "nonideal", rho_measured: float | None = None,
              T_prep: float = T_PREP, library: Library | None = None) -> WeighOut:
    """Scale ``recipe`` to ``batch`` and write its weigh-out sheet.

    batch : ``("mass", kg)`` or ``("volume", m³)`` (:func:`solutions.recipe.parse_batch`);
        a volume is at ``T_prep``
    T, P, model : conditions of the evaluation [K], [Pa]
    rho_measured : a measured density of the solution at T_prep [kg/m³]
    T_prep : temperature at which volumes are read [K]
    """
    base = resolve(recipe, T_prep=T_prep, rho_measured=rho_measured)
    res = resolve(recipe, batch=batch, T_prep=T_prep, rho_measured=rho_measured)
    ev = evaluate(res, T=T, P=P, model=model, rho_measured=rho_measured, T_prep=T_prep)
    return WeighOut(recipe, batch, base, res, ev, solubility_caveats(res.composition, T))




# ---------------------------------------------------------------------------- dilution
@dataclass
class DilutionPlan:
    """How much stock and diluent make the target; the mixture's evaluation."""

    stock: ResolvedRecipe
    row: RecipeRow                    # the ingredient whose concentration is set
    target_number: float              # in the target's unit
    target_unit: str
    alpha: float                      # stock mass / final mass [1]
    m_final: float                    # [kg]
    rho_final: float                  # mixture density at T_prep [kg/m³]
    rho_stock: float                  # stock density at T_prep [kg/m³]
    rho_diluent: float                # [kg/m³] at T_prep
    achieved: float                   # in the target's unit, at T_prep
    stock_value: float                # the stock's concentration, target's unit
    iterations: int
    final: ResolvedRecipe
    evaluation: Evaluation
    caveats: list[Caveat] = field(default_factory=list)

    @property
    def m_stock(self) -> float:
        return self.alpha * self.m_final

    @property
    def m_diluent(self) -> float:
        return (1.0 - self.alpha) * self.m_final

    @property
    def V_stock(self) -> float:
        """Stock volume at T_prep [m³]."""
        return self.m_stock / self.rho_stock

    @property
    def V_diluent(self) -> float:
        return self.m_diluent / self.rho_diluent

    @property
    def V_final(self) -> float:
        return self.m_final / self.rho_final

    def to_dict(self) -> dict:
        ev = self.evaluation
        d = ev.to_dict()
        d.update(caveat_fields([*ev.warnings, *self.caveats]))
        solvent = self.stock.composition.solvent.name
        d["dilution"] = {
            "ingredient": self.row.text, "target": self.target_number, "unit": self.target_unit,
            "achieved": self.achieved, "stock_concentration": self.stock_value,
            "iterations": self.iterations, "stock_mass_fraction": self.alpha,
            "volume_temperature_C": self.final.T_prep - 273.15,
            "stock": {"mass_g": self.m_stock * 1e3, "volume_mL": self.V_stock * 1e6,
                      "density_g_per_mL": self.rho_stock / 1e3},
            "diluent": {"ingredient": solvent, "mass_g": self.m_diluent * 1e3,
                        "volume_mL": self.V_diluent * 1e6,
                        "density_g_per_mL": self.rho_diluent / 1e3},
            "final": {"mass_g": self.m_final * 1e3, "volume_mL": self.V_final * 1e6,
                      "density_g_per_mL": self.rho_final / 1e3},
            "volume_change_on_mixing_mL": (self.V_final - self.V_stock - self.V_diluent) * 1e6,
        }
        return d

    def text(self) -> str:
        x = self.to_dict()["dilution"]
        t = x["volume_temperature_C"]
        s, w, f = x["stock"], x["diluent"], x["final"]
        dv = x["volume_change_on_mixing_mL"]
        lines = [
            f"Dilute to {self.target_number:g} {self.target_unit} {self.row.text} "
            f"(stock: {self.stock_value:.6g} {self.target_unit})",
            f"  stock    {s['mass_g']:.6g} g  ({s['volume_mL']:.6g} mL at {t:g} °C, "
            f"{s['density_g_per_mL']:.5g} g/mL)",
            f"  {w['ingredient'].lower():<8} {w['mass_g']:.6g} g  ({w['volume_mL']:.6g} mL at "
            f"{t:g} °C)",
            f"  final    {f['mass_g']:.6g} g  ({f['volume_mL']:.6g} mL at {t:g} °C, "
            f"{f['density_g_per_mL']:.5g} g/mL)",
            (f"Volumes are not additive: {s['volume_mL'] + w['volume_mL']:.6g} mL of stock and "
             f"{w['ingredient'].lower()} give {f['volume_mL']:.6g} mL ({dv:+.3g} mL on mixing); "
             "weigh, or make up to the final volume."
             if abs(dv) > 1e-4 * f["volume_mL"] else
             f"Volumes add up here to within {abs(dv):.2g} mL (the density model's estimate); "
             "weighing is still the surer way."),
            f"Achieved: {self.achieved:.8g} {self.target_unit} ({self.iterations} brentq "
            "iterations)"]
        d = self.to_dict()
        if d["warnings"]:
            lines += ["", "Warnings:"] + [f"  - {m}" for m in d["warnings"]]
        return "\n".join(lines)


def _mix(stock: ResolvedRecipe, alpha: float) -> Composition:
    """α kg of stock + (1 − α) kg of its solvent, per kg of mixture."""
    c = stock.composition
    m = stock.m_total
    a = np.atleast_1d(np.asarray(alpha, dtype=float))
    return Composition(c.solutes, c.n[0][None, :] * (a[:, None] / m),
                       c.m_solvent[0] * a / m + (1.0 - a), c.solvent, c.labels)


def _mix_concentration(stock: ResolvedRecipe, j: int, basis: Basis, alpha: float,
                       T_prep: float) -> tuple[float, float]:
    """(concentration of stock row j [SI of basis], density [kg/m³]) of the mixture at T_prep."""
    comp = _mix(stock, alpha)
    rho = float(solution_density(comp, T_prep).rho[0])
    ing = comp.solutes[j]
    c = in_basis(basis, m=alpha * float(stock.pure_kg[j]) / stock.m_total, n=float(comp.n[0, j]),
                 m_total=1.0, m_solvent=float(comp.m_solvent[0]), volume=1.0 / rho,
                 rho_pure=ing.rho_pure, name=ing.name)
    return float(c), rho


def dilution_plan(recipe: Recipe, ingredient: str, to_text: str, final_text: str, *,
                  library: Library | None = None, T: float = 298.15, P: float = P_ATM,
                  model: str = "nonideal", rho_measured: float | None = None,
                  T_prep: float = T_PREP) -> DilutionPlan:
    """Stock and diluent that make ``final_text`` of ``to_text`` of ``ingredient``.

    recipe : the stock solution
    ingredient : the stock ingredient whose concentration is set (as typed or library name)
    to_text : target concentration as typed, e.g. ``"20 % w/w"``, ``"0.9 % w/v"``, ``"50 mM"``
    final_text : final amount, a mass or a volume (at T_prep), e.g. ``"1 kg"``, ``"500 mL"``
    T, P, model : conditions of the mixture's evaluation [K], [Pa]
    rho_measured : measured density of the stock at T_prep [kg/m³] (the mixture's density
        always comes from the model)
    T_prep : temperature of the volumes [K]
    """
    lib = library or default_library()
    stock = resolve(recipe, T_prep=T_prep, rho_measured=rho_measured)
    row, _ = find_row(recipe, ingredient, lib)
    if row is None:
        raise RecipeError(f"{ingredient!r} is not in the stock recipe")
    if stock.solvent_row is not None and row.row == stock.solvent_row.row:
        raise RecipeError(f"{row.text} is the solvent; choose a dissolved ingredient")
    j = next(i for i, r in enumerate(stock.solute_rows) if r.row == row.row)
    number, amount = parse_quantity(to_text)
    if amount.basis not in CONCENTRATION_BASES:
        raise RecipeError(f"{to_text!r} is not a concentration; use % w/w, % w/v, % v/v, ppm, "
                          "g/L, mg/mL, M, mM or mol/kg")
    if not number > 0:
        raise RecipeError(f"the target concentration must be positive, got {to_text!r}")
    kind, size = parse_batch(final_text)
    target = number * amount.value_si
    c1, rho1 = _mix_concentration(stock, j, amount.basis, 1.0, T_prep)
    unit = amount.text
    tol = 1e-10 * target
    if target > c1 + tol:
        raise TargetError(f"the stock has only {c1 / amount.value_si:.6g} {unit} {row.text}; "
                          f"adding diluent cannot raise it to {number:g} {unit}",
                          c1 / amount.value_si, unit)
    iterations = 0
    if abs(target - c1) <= tol:
        alpha = 1.0
    else:
        from scipy.optimize import brentq  # imported here: heavy, only this needs it

        def f(a):
            return _mix_concentration(stock, j, amount.basis, a, T_prep)[0] - target
        alpha, r = brentq(f, 0.0, 1.0, xtol=1e-15, rtol=1e-14, full_output=True)
        iterations = r.iterations
    c, rho_mix = _mix_concentration(stock, j, amount.basis, alpha, T_prep)
    m_final = size if kind == "mass" else size * rho_mix
    rho_stock = rho_measured if rho_measured is not None else stock.rho_prep

    # the mixture as a recipe of weighed masses, resolved and evaluated like any recipe
    f_stock = alpha * m_final / stock.m_total
    g = parse_unit("g")
    rows = [RecipeRow(r.row, r.ingredient, g, float(stock.pure_kg[i]) * f_stock * 1e3, 1.0, r.text)
            for i, r in enumerate(stock.solute_rows)]
    water_g = (stock.water_added_kg * f_stock + (1.0 - alpha) * m_final) * 1e3
    sv = stock.solvent_row
    rows.append(RecipeRow(sv.row if sv is not None else max(r.row for r in rows) + 1,
                          stock.composition.solvent, g, water_g, 1.0,
                          sv.text if sv is not None else stock.composition.solvent.name))
    rows.sort(key=lambda r: r.row)
    mixed = Recipe(tuple(rows), (recipe.name + " diluted").strip())
    final = resolve(mixed, T_prep=T_prep)
    ev = evaluate(final, T=T, P=P, model=model, T_prep=T_prep)
    achieved = component_concentration(final, row.row, amount, final.rho_prep)
    if not (abs(achieved - target) <= 1e-9 * target and abs(final.m_total - m_final)
            <= 1e-9 * m_final):
        raise TargetError(f"the dilution solve ended at {achieved / amount.value_si:.8g} {unit} "
                          f"instead of {number:g} {unit}; this is a bug, please report it",
                          achieved / amount.value_si, unit)
    caveats = solubility_caveats(final.composition, T)
    if rho_measured is not None:
        caveats.append(Caveat("measured-density", "the measured density applies to the stock; "
                              "the mixture's density is the model's", None))
    return DilutionPlan(stock, row, number, unit, float(alpha), float(m_final),
                        float(final.rho_prep), float(rho_stock),
                        solvent_density(stock, T_prep), achieved / amount.value_si,
                        c1 / amount.value_si, iterations, final, ev, caveats)
