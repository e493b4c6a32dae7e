"""One call from a recipe to every basis and property: the object every front end shows.

:func:`evaluate` resolves a recipe, computes its density at the stated temperature, its
composition in every basis and its colligative properties under the chosen model (and,
beside them, the dilute-ideal figures), and gathers every warning and caution.
:meth:`Evaluation.to_dict` is the JSON of ``python -m solutions evaluate --json``; its key
names are a documented, stable interface (README, "JSON output").

Basis conventions: an ingredient's mass-based figures (mass, mass fraction, g/L, ppm)
refer to the form as weighed (a hydrate with its water; assay not applied), amounts and
molalities to moles of that ingredient (= moles of dissolved solute); the water row's mass
is the water added, while the solution's ``solvent_mass_g`` counts all water, crystal water
included, and mole fractions are of the species actually in solution.
"""
from __future__ import annotations

import datetime as _dt
import math
from dataclasses import dataclass, field

import numpy as np

from ._version import __version__
from .colligative import P_ATM, ColligativeResult, colligative
from .density import solution_density
from .errors import Caveat, OptionError, caveat_fields, merge_caveats
from .concentration import in_basis
from .properties import PROPERTIES, Property
from .recipe import Recipe, ResolvedRecipe, T_PREP, resolve
from .units import Basis

__all__ = ["Evaluation", "evaluate", "component_table", "cautions_for", "USES"]

#: what a product is for: "any" keeps every caution, "technical" (not for the body) drops tonicity
USES = ("any", "technical")

# two figures shown beside the vapor pressure (not properties in their own right)
_VP_LIQUID = Property("vapor_pressure_liquid_kPa", "Vapor pressure over the liquid", "kPa", 1e-3,
                      0.0, 4, "props", "vapor_pressure_liquid")
_VP_PURE = Property("vapor_pressure_pure_kPa", "Vapor pressure of the pure solvent", "kPa", 1e-3,
                    0.0, 4, "props", "vapor_pressure_pure")


@dataclass
class Evaluation:
    resolved: ResolvedRecipe
    T: float                 # [K]
    P: float                 # [Pa]
    model: str
    rho: float               # solution density at T [kg/m³]
    density_method: str
    props: ColligativeResult
    dilute: ColligativeResult
    warnings: list[Caveat] = field(default_factory=list)
    cautions: list[tuple[str, str]] = field(default_factory=list)  # (tag, message)
    use: str = "any"         # "technical": stated not for the body

    @property
    def composition(self):
        return self.resolved.composition

    @property
    def volume(self) -> float:
        """Solution volume at T [m³]."""
        return float(self.composition.m_total[0] / self.rho)

    def components(self) -> list[dict]:
        return component_table(self.resolved, self.rho)

    @property
    def mass(self) -> float:
        """Solution mass [kg]."""
        return float(self.composition.m_total[0])

    def value(self, prop: Property, dilute: bool = False) -> float | None:
        """One property's display value from the registry row ``prop``; ``None`` where it
        cannot be computed (a caveat says why) or does not apply (water only)."""
        if prop.water_only and not self.composition.solvent.is_water:
            return None
        if dilute and self.value(prop) is None:
            return None  # no textbook figure beside a value withheld for want of data
        if dilute and prop.about == ("boiling",) and len(self.props.partial_pressures or {}) > 1:
            return None  # K_b b assumes non-volatile solutes: meaningless beside a bubble point
        src = (self.dilute if dilute else self.props) if prop.source == "props" else self
        x = getattr(src, prop.field)
        if x is None:
            return None
        v = float(np.asarray(x).reshape(-1)[0])
        return None if not math.isfinite(v) else prop.display(v)

    def solution(self) -> dict:
        p, c = self.props, self.composition
        out = {
            "density_method": self.density_method,
            "solvent": c.solvent.name,
            "solvent_mass_g": float(c.m_solvent[0] * 1e3),
            "temperature_C": self.T - 273.15,
            "pressure_kPa": self.P / 1e3,
            **{q.key: self.value(q) for q in PROPERTIES},
            "vapor_pressure_liquid_kPa": self.value(_VP_LIQUID),
            "vapor_pressure_pure_kPa": self.value(_VP_PURE),
            "partial_pressures_kPa": self._partials(1e-3),
            "vapor_composition": self._vapor_composition(),
            "model": p.model,
            "model_description": p.model_name,
            "dilute_ideal": {q.key: self.value(q, dilute=True) for q in PROPERTIES if q.dilute},
        }
        return out

    def _partials(self, scale: float) -> dict:
        """{component name: partial pressure} over the solution; water alone when no
        volatile organic is dissolved."""
        p = self.props
        if p.partial_pressures is None:
            v = float(np.asarray(p.vapor_pressure).reshape(-1)[0])
            return {self.composition.solvent.name: v * scale if math.isfinite(v) else None}
        out = {}
        for k, arr in p.partial_pressures.items():
            v = float(np.asarray(arr).reshape(-1)[0])
            out[k] = v * scale if math.isfinite(v) else None
        return out

    def _vapor_composition(self) -> dict:
        pp = self._partials(1.0)
        if any(v is None for v in pp.values()):
            return {k: None for k in pp}
        tot = sum(pp.values())
        return {k: (v / tot if tot > 0 else None) for k, v in pp.items()}

    def to_dict(self) -> dict:
        r = self.resolved
        return {
            "tool": {"name": "solutions", "version": __version__,
                     "date": _dt.date.today().isoformat()},
            "recipe_name": r.recipe.name,
            "conditions": {"temperature_C": self.T - 273.15, "pressure_kPa": self.P / 1e3,
                           "model": self.model, "volumes_read_at_C": r.T_prep - 273.15,
                           "use": self.use},
            "components": self.components(),
            "solution": self.solution(),
            "recipe": r.recipe.as_written(),
            **caveat_fields(self.warnings),
            "cautions": [msg for _, msg in self.cautions],
            "cautions_detail": [{"tag": tag, "message": msg} for tag, msg in self.cautions],
        }


def component_table(res: ResolvedRecipe, rho: float) -> list[dict]:
    """One record per recipe row (solvent included) in every basis, at density ``rho``.

    A solute's mass-based figures are of the form as weighed (a hydrate with its water);
    the solvent row's figures count all the solvent in the solution (crystal water
    included), while ``weigh_g`` is the solvent to add."""
    c = res.composition
    m_tot, m_s = float(c.m_total[0]), float(c.m_solvent[0])
    V = m_tot / rho
    n_w = float(c.n_solvent[0])
    n_all = float(c.n.sum()) + n_w

    def bases(m, n):
        kw = dict(m=m, n=n, m_total=m_tot, m_solvent=m_s, volume=V)
        w = float(in_basis(Basis.MASS_FRACTION, **kw))
        gl = float(in_basis(Basis.MASS_PER_VOLUME, **kw))
        return {"mass_g": m * 1e3, "amount_mol": n, "mass_fraction": w, "mole_fraction": n / n_all,
                "molality_mol_per_kg": float(in_basis(Basis.MOLALITY, **kw)),
                "molarity_mol_per_L": float(in_basis(Basis.MOLARITY, **kw)) / 1e3,
                "mass_per_volume_g_per_L": gl, "percent_w_v": gl / 10.0, "ppm": w * 1e6}

    out = []
    for j, row in enumerate(res.solute_rows):
        ing = row.ingredient
        n = float(c.n[0, j])
        out.append({"ingredient": row.text, "library_name": ing.name, "row": row.row,
                    "formula": ing.formula, "molar_mass_g_per_mol": ing.M * 1e3,
                    **bases(float(res.pure_kg[j]), n),
                    "weigh_g": float(res.weighed_kg[j]) * 1e3,
                    "dissolved_mass_g": n * ing.M_solute * 1e3, "ions": ing.ions})
    w = res.solvent_row
    rec = {"ingredient": w.text if w is not None else c.solvent.name,
           "library_name": c.solvent.name, "row": w.row if w is not None else None,
           "formula": c.solvent.formula, "molar_mass_g_per_mol": c.solvent.M * 1e3,
           **bases(m_s, n_w), "weigh_g": res.water_added_kg * 1e3, "dissolved_mass_g": m_s * 1e3,
           "ions": None, "solvent": True}
    rec["molality_mol_per_kg"] = None
    out.append(rec)
    return out


def cautions_for(ev_or_res, props: ColligativeResult | None = None, *,
                 use: str = "any") -> list[tuple[str, str]]:
    """The usual cautions for what this recipe's numbers could be used for, each with a tag
    saying what it is about: ``ingredient``, ``tonicity``, ``freezing`` or ``vessel``.

    ``use="technical"`` states that the product is not for the body: only then is the
    tonicity caution left out."""
    res = ev_or_res.resolved if isinstance(ev_or_res, Evaluation) else ev_or_res
    props = props or (ev_or_res.props if isinstance(ev_or_res, Evaluation) else None)
    out = []
    for ing in {r.ingredient.key: r.ingredient for r in res.recipe.rows}.values():
        if ing.caution:
            out.append(("ingredient", f"{ing.name}: {ing.caution}."))
    comp = res.composition
    osm = (float(np.asarray(props.osmolality).reshape(-1)[0]) if props is not None
           else float("nan"))
    if not math.isfinite(osm):  # withheld: the ideal particle count still says how strong
        osm = float(comp.particle_molality()[0])
    # tonicity matters for things that meet the body: osmolalities near physiological
    # (hypotonic to strongly hypertonic); a coolant or syrup at thousands of mOsm/kg is no
    # injectable, and the caution would only be noise there
    if comp.solvent.is_water and use != "technical" and not (math.isfinite(osm) and osm > 1.5):
        out.append(("tonicity", "Osmolality and tonicity here are model estimates. Anything to be injected, "
                   "infused or put in the eye must be confirmed by measurement (e.g. "
                   "freezing-point osmometry) and meet your pharmacopoeia and licensed "
                   "practice; sterility, pH and particulates are outside this tool."))
    if props is not None:
        dT = float(np.asarray(props.freezing_point_depression).reshape(-1)[0])
        if math.isfinite(dT) and dT > 1.0:
            out.append(("freezing", "Freezing points are estimates for the liquid–ice equilibrium. For freeze "
                       "protection, keep a margin, confirm with a measured freezing point, and "
                       "follow the equipment maker's and local codes' requirements; slush can "
                       "form above the stated point in real systems."))
    fp = getattr(props, "flash_point", None) if props is not None else None
    if fp is not None and np.isfinite(np.asarray(fp, dtype=float).reshape(-1)[0]):
        from .vle import FLASH_CAUTION
        out.append(("flammable", FLASH_CAUTION))
    out.append(("vessel", "Vapor pressure rises steeply with temperature: never heat a closed or "
                          "sealed vessel unless it is rated and fitted with pressure relief."))
    return out


def evaluate(recipe: Recipe | ResolvedRecipe, *, T: float = 298.15, P: float = P_ATM,
             model: str = "nonideal", rho_measured: float | None = None,
             batch: tuple[str, float] | None = None, T_prep: float = T_PREP,
             use: str = "any") -> Evaluation:
    """Resolve (if needed) and evaluate a recipe at ``T`` [K] and ``P`` [Pa].

    rho_measured : measured solution density [kg/m³], used for volumes at T_prep and T.
    use : ``"any"`` (default) or ``"technical"`` (not for the body: no tonicity caution).
    """
    if use not in USES:
        raise OptionError("use", use, f"choose one of {', '.join(USES)}")
    res = recipe if isinstance(recipe, ResolvedRecipe) else resolve(
        recipe, batch=batch, T_prep=T_prep, rho_measured=rho_measured)
    comp = res.composition
    dres = solution_density(comp, T, measured=rho_measured)
    rho = float(dres.rho[0])
    props = colligative(comp, T, P, model, rho=rho)
    dilute = colligative(comp, T, P, "dilute", rho=rho) if props.model != "dilute" else props
    from .ingredients import acid_base_caveats
    from .limits import solubility_caveats
    from .vle import FLASH_CAUTION
    warnings = merge_caveats([*(c.tagged("density") for c in (*res.caveats, *dres.caveats)),
                              *(c for c in props.caveats if c.message != FLASH_CAUTION),
                              *solubility_caveats(comp, T),
                              *(c.tagged("recipe") for c in acid_base_caveats(comp.solutes))])
    ev = Evaluation(res, float(T), float(P), props.model, rho, dres.method, props, dilute,
                    warnings, use=use)
    ev.cautions = cautions_for(ev, use=use)
    return ev
