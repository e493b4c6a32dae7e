"""Gas dissolved in a recipe: carbonation, dissolved oxygen, sealed headspaces.

Three ways to state the gas, one answer (:class:`GasResult`):

* a partial pressure of the gas over the liquid;
* equilibrium with air at a total pressure (``air=True``): the gas's partial pressure is its
  dry-air mole fraction (``solutions/data/dry_air.csv``, common practice) times the total
  pressure less the solution's vapor pressure;
* a carbonation in *volumes*: litres of gas, counted as an ideal gas at 0 °C and 101.325 kPa
  (22.414 L/mol, :data:`solutions.constants.V_MOLAR_STP`), dissolved per litre of liquid at the
  stated temperature. This is the beverage trade's convention (common practice).

Physics (dilute gas, ideal vapor phase): Henry's law with the IAPWS G7-04 constant of the gas in
pure water, x0 = p/k_H, gives the molar solubility in water c0 = x0 ρw/Mw; salting-out by the
other solutes (Weisenberger & Schumpe 1996) multiplies it by f: c = f ρw p /(Mw k_H) = S(T) p.
S(T) [mol m⁻³ Pa⁻¹] is linear in p, so a volumes figure turns into a pressure and back exactly.
Fugacity coefficients and the Poynting factor are left out: for CO2 they lower the solubility
by roughly 1–2 % per 0.3 MPa (ln φ = B p/(RT) with B ≈ −120 cm³/mol at 25 °C, from memory);
past :data:`P_CAVEAT` a caveat says so, and partial pressures past :data:`P_MAX` are refused.

A **sealed container** (``headspace_fraction`` f of the container volume at filling): at the
filling temperature T1 the liquid holds the gas at p1 and the headspace holds gas at p1, the
solution's vapor and optionally air trapped at sealing. Warmed (or cooled) to T2, the gas
redistributes by mass balance,

    N = S(T1) p1 V_L1 + p1 V_H1/(R T1) = S(T2) p2 V_L2 + p2 V_H2/(R T2),

with V_L2 = m/ρ(T2) (the liquid's own expansion shrinks the headspace) and trapped air as an
ideal, insoluble gas (which slightly overstates the pressure). Total pressure = p2 + the
solution's vapor pressure at T2 + air; gauge = total − ambient.
"""
from __future__ import annotations

import csv
import math
import re
from dataclasses import dataclass, field
from functools import cache
from importlib import resources

import numpy as np

from ..constants import P_ATM, R, T_ZERO_C, V_MOLAR_STP
from ..errors import Caveat, SolutionsError, merge_caveats
from ..ingredients import M_WATER
from .iapws_henry import (Gas, GasRangeError, get_gas, henry_constant,
                          temperature_caveats)
from .salting_out import salting_out

__all__ = ["GasResult", "LiquidState", "dissolved_gas", "liquid_state", "air_fraction",
           "dissolved_curve", "sealed_pressure_curve", "GasInputError", "P_MAX", "P_CAVEAT",
           "HENRY_MODEL", "gas_cautions"]

HENRY_MODEL = "IAPWS G7-04 (2004) Henry's constant in H2O, ideal gas phase, dilute limit"
#: largest partial pressure of the gas accepted [Pa]: past it the ideal-gas, Poynting-free
#: Henry's law is off by more than ~5 % for CO2 (our limit, see the module docstring)
P_MAX = 1.0e6
#: partial pressure above which a caveat names the neglected non-ideality [Pa]
P_CAVEAT = 0.5e6
#: below this temperature [K] the G7-04 CO2 constant departs from dedicated low-temperature
#: correlations by more than 2.5 % (tests/test_gas_henry.py compares it with Weiss 1974)
CO2_COLD = 283.15


class GasInputError(SolutionsError, ValueError):
    """A gas question that cannot be answered as asked: names the value and what is allowed."""


@cache
def _air() -> dict[str, float]:
    path = resources.files("solutions.data") / "dry_air.csv"
    with path.open(encoding="utf-8", newline="") as fh:
        rows = list(csv.DictReader(ln for ln in fh if not ln.startswith("#")))
    return {r["gas"]: float(r["mole_fraction"]) for r in rows}


def air_fraction(gas) -> float:
    """Mole fraction of ``gas`` in dry air (common practice); raises if air holds none."""
    g = get_gas(gas)
    y = _air().get(g.key)
    if y is None:
        raise GasInputError(f"{g.name} is not a listed component of air; in equilibrium with "
                            "air only " + ", ".join(_air()) + " can be asked for (give a "
                            "partial pressure instead)")
    return y


def gas_cautions(gas: Gas) -> list[tuple[str, str]]:
    """Cautions that always travel with a gas result (tag, message)."""
    out = [("vessel", "Pressurised containers can burst: the pressures here are model "
            "estimates. Defer to the container maker's pressure rating (with its safety "
            "margin) and to local pressure-equipment codes, and confirm carbonation by "
            "measurement.")]
    if gas.key in ("carbon-dioxide",):
        out.append(("gas", "Carbon dioxide is an asphyxiant and toxic at high concentration: "
                    "vent filling rooms, cold stores and enclosed spaces, and monitor CO2 there."))
    elif gas.key in ("nitrogen", "argon", "helium", "neon", "krypton", "xenon",
                     "sulfur-hexafluoride"):
        out.append(("gas", f"{gas.name.capitalize()} displaces oxygen: asphyxiation hazard in "
                    "enclosed spaces (sparging, purging, cold stores); ventilate and monitor "
                    "oxygen."))
    if gas.key in ("hydrogen", "methane", "ethane", "carbon-monoxide", "hydrogen-sulfide"):
        out.append(("gas", f"{gas.name.capitalize()} is flammable"
                    + (" and toxic" if gas.key in ("carbon-monoxide", "hydrogen-sulfide") else "")
                    + ": follow the gas supplier's safety data sheet and local codes."))
    if gas.key == "oxygen":
        out.append(("gas", "Oxygen-enriched atmospheres feed fires; dissolved-oxygen figures "
                    "for oxygen-sensitive products are estimates — confirm by measurement."))
    return out


@dataclass(frozen=True)
class LiquidState:
    """What the gas model needs of the liquid at one temperature."""

    T: float               # [K]
    rho: float             # solution density [kg/m³]
    p_vapor: float         # solvent vapor pressure over the liquid [Pa]
    w_water: float         # mass fraction of water in the solution [1]
    b_solutes: float       # Σ solute molality (formula units) [mol/kg water]
    kH: float              # Henry's constant in pure water [Pa]
    f_salt: float          # salting-out factor c/c0 [1]
    salting_model: str
    S: float               # molar solubility per pressure [mol/(m³ Pa)]
    caveats: tuple[Caveat, ...]


def liquid_state(res, T: float, gas, model: str = "nonideal") -> LiquidState:
    """Density, vapor pressure, Henry's constant and salting-out of a resolved recipe at T [K]."""
    from ..colligative import colligative
    from ..density import solution_density
    g = get_gas(gas)
    comp = res.composition
    if not comp.solvent.is_water:
        raise GasInputError(f"the gas model is for aqueous solutions; this recipe's solvent is "
                            f"{comp.solvent.name}")
    kH = henry_constant(T, g)
    dres = solution_density(comp, T)
    rho = float(dres.rho[0])
    props = colligative(comp, T, P_ATM, model, rho=rho, with_boiling=False)
    pv = float(np.asarray(props.vapor_pressure_liquid).reshape(-1)[0])
    so = salting_out(comp, rho, T, g)
    f = float(so.factor[0])
    from ..water import water_density
    rho_w = float(water_density(T))
    S = f * rho_w / (M_WATER * kH)
    w_water = float(comp.m_solvent[0] / comp.m_total[0])
    b_sol = float(comp.n[0].sum() / comp.m_solvent[0])
    cav = [*(c.tagged("density") for c in dres.caveats), *props.caveats, *so.caveats,
           *temperature_caveats(T, g)]
    if g.key == "carbon-dioxide" and T < CO2_COLD:
        cav.append(Caveat("model-range", "carbon dioxide below 10 °C: the IAPWS G7-04 Henry's "
                          "constant is 2.5–5 % above Weiss (1974) (less CO2 dissolves per kPa, "
                          "so the pressure for a given carbonation comes out that much higher); "
                          "published low-temperature data differ among themselves by about 2 %",
                          g.name, about="gas"))
    return LiquidState(float(T), rho, pv, w_water, b_sol, float(kH), f, so.model, S,
                       tuple(merge_caveats(cav)))


@dataclass
class GasResult:
    """Dissolved gas in a recipe's liquid at one temperature, and optionally a sealed pack."""

    gas: Gas
    mode: str                      # "partial-pressure", "air" or "volumes"
    state: LiquidState
    p_gas: float                   # equilibrium partial pressure of the gas [Pa]
    p_total: float                 # gas (or air) + solution vapor [Pa]
    ambient: float                 # [Pa]
    c: float                       # dissolved gas [mol/m³ of solution]
    air_mole_fraction: float | None = None
    sealed: dict | None = None
    warnings: list[Caveat] = field(default_factory=list)
    cautions: list[tuple[str, str]] = field(default_factory=list)

    @property
    def b(self) -> float:
        """Dissolved gas per kg of water [mol/kg]."""
        return self.c / (self.state.rho * self.state.w_water)

    @property
    def x(self) -> float:
        """Mole fraction of dissolved gas in the solution (solutes as formula units) [1]."""
        return self.b / (self.b + 1.0 / M_WATER + self.state.b_solutes)

    @property
    def volumes(self) -> float:
        """Litres of gas at 0 °C and 101.325 kPa per litre of liquid at T [1]."""
        return self.c * V_MOLAR_STP

    def to_dict(self) -> dict:
        s = self.state
        out = {
            "gas": self.gas.key, "gas_name": self.gas.name, "formula": self.gas.formula,
            "mode": self.mode,
            "temperature_C": s.T - T_ZERO_C,
            "henry_constant_GPa": s.kH / 1e9,
            "henry_model": HENRY_MODEL,
            "salting_out_factor": s.f_salt,
            "salting_out_model": s.salting_model,
            "partial_pressure_kPa": self.p_gas / 1e3,
            "vapor_pressure_kPa": s.p_vapor / 1e3,
            "total_pressure_kPa": self.p_total / 1e3,
            "ambient_pressure_kPa": self.ambient / 1e3,
            "gauge_pressure_kPa": (self.p_total - self.ambient) / 1e3,
            "dissolved_mole_fraction": self.x,
            "dissolved_mmol_per_kg": self.b * 1e3,
            "dissolved_mg_per_L": self.c * self.gas.M * 1e3,
            "volumes": self.volumes,
            "density_g_per_mL": s.rho / 1e3,
            "air_mole_fraction": self.air_mole_fraction,
        }
        if self.sealed is not None:
            out.update(self.sealed)
        out["warnings"] = [c.message for c in self.warnings]
        out["warnings_detail"] = [c.to_dict() for c in self.warnings]
        out["cautions"] = [m for _, m in self.cautions]
        out["cautions_detail"] = [{"tag": t, "message": m} for t, m in self.cautions]
        return out


@dataclass(frozen=True)
class _Liquid:
    """A bare composition standing in for a resolved recipe."""

    composition: object


def _resolved(recipe):
    from ..composition import Composition
    from ..recipe import ResolvedRecipe, resolve
    if isinstance(recipe, Composition):
        if recipe.N != 1:
            raise GasInputError(f"one composition at a time, got {recipe.N}")
        return _Liquid(recipe)
    return recipe if isinstance(recipe, ResolvedRecipe) else resolve(recipe)


def _check_p_gas(p: float, g: Gas, what: str) -> list[Caveat]:
    if not (p > 0.0) or not math.isfinite(p):
        raise GasRangeError(f"{what} of {g.name}", p / 1e3, 0.0, P_MAX / 1e3, "kPa",
                            "a partial pressure must be positive")
    if p > P_MAX:
        raise GasRangeError(f"{what} of {g.name}", p / 1e3, 0.0, P_MAX / 1e3, "kPa",
                            "past the range of the ideal-gas Henry's-law model")
    if p > P_CAVEAT:
        return [Caveat("model-range", f"{g.name} at {p / 1e3:.4g} kPa: the ideal-gas Henry's "
                       "law without fugacity and Poynting corrections overstates the dissolved "
                       f"amount by a few per cent above {P_CAVEAT / 1e3:g} kPa", g.name,
                       about="gas")]
    return []


def dissolved_gas(recipe, gas, T: float, *, partial_pressure: float | None = None,
                  air: bool = False, total_pressure: float = P_ATM,
                  volumes: float | None = None, headspace_fraction: float | None = None,
                  warm_to: float | None = None, trapped_air: float = 0.0,
                  rating: float | None = None, ambient: float = P_ATM,
                  model: str = "nonideal") -> GasResult:
    """Dissolved ``gas`` in the liquid of ``recipe`` at ``T`` [K], stated one of three ways.

    recipe : a :class:`~solutions.recipe.Recipe`, :class:`~solutions.recipe.ResolvedRecipe`
        or a one-row :class:`~solutions.composition.Composition`
    gas : gas key, name or formula (``solutions/data/iapws_henry.csv``)
    T : temperature of the liquid [K] (filling temperature for a sealed container)
    partial_pressure : partial pressure of the gas [Pa], or
    air : equilibrium with air at ``total_pressure`` [Pa] (default 101.325 kPa), or
    volumes : carbonation, L of gas (0 °C, 101.325 kPa) per L of liquid [1]
    headspace_fraction : headspace / container volume at filling, 0 < f < 1 [1]
    warm_to : temperature the sealed container reaches [K] (needs ``headspace_fraction``)
    trapped_air : partial pressure of air in the headspace at sealing [Pa] (default 0)
    rating : container rating, gauge [Pa]; a caution when a pressure passes it
    ambient : ambient pressure for gauge figures [Pa] (default 101.325 kPa)
    model : activity model for the solution's vapor pressure

    Raises :class:`GasInputError` / :class:`~solutions.gas.iapws_henry.GasRangeError`
    (both ``ValueError``) naming the value and the allowed range.
    """
    g = get_gas(gas)
    asked = sum(x is not None and x is not False for x in (partial_pressure, volumes, air or None))
    if asked != 1:
        raise GasInputError("state exactly one of: a partial pressure, equilibrium with air, "
                            "or a carbonation in volumes")
    if not (ambient > 0):
        raise GasInputError(f"ambient pressure {ambient / 1e3:g} kPa must be positive")
    res = _resolved(recipe)
    st = liquid_state(res, T, g, model)
    cav: list[Caveat] = [*st.caveats]
    y_air = None
    if partial_pressure is not None:
        mode, p = "partial-pressure", float(partial_pressure)
        cav += _check_p_gas(p, g, "partial pressure")
        p_total = p + st.p_vapor
    elif volumes is not None:
        mode, v = "volumes", float(volumes)
        if not (v > 0.0) or not math.isfinite(v):
            raise GasInputError(f"carbonation {v:g} volumes must be positive")
        p = v / V_MOLAR_STP / st.S
        if p > P_MAX:
            raise GasRangeError(f"partial pressure of {g.name} needed for {v:g} volumes at "
                                f"{T - T_ZERO_C:.4g} °C", p / 1e3, 0.0, P_MAX / 1e3, "kPa",
                                "past the range of the ideal-gas Henry's-law model")
        cav += _check_p_gas(p, g, "partial pressure")
        p_total = p + st.p_vapor
    else:
        mode = "air"
        y_air = air_fraction(g)
        P = float(total_pressure)
        if not (P > st.p_vapor):
            raise GasInputError(f"total pressure {P / 1e3:g} kPa must exceed the solution's "
                                f"vapor pressure ({st.p_vapor / 1e3:.4g} kPa) at "
                                f"{T - T_ZERO_C:.4g} °C")
        if P > P_MAX:
            raise GasRangeError("total air pressure", P / 1e3, st.p_vapor / 1e3, P_MAX / 1e3,
                                "kPa", "past the range of the ideal-gas Henry's-law model")
        p = y_air * (P - st.p_vapor)
        p_total = P
    c = st.S * p
    out = GasResult(g, mode, st, p, p_total, float(ambient), c, y_air)
    cautions = gas_cautions(g)
    if g.key == "carbon-dioxide":
        cav.append(Caveat("chemistry", "carbon dioxide: the figures are physically dissolved "
                          "CO2; CO2 also reacts to bicarbonate, which adds to the total in "
                          "neutral or alkaline liquids (negligible in acidic drinks)", g.name,
                          about="gas"))
    if headspace_fraction is not None or warm_to is not None:
        if headspace_fraction is None or warm_to is None:
            raise GasInputError("a sealed container needs both a headspace fraction and the "
                                "temperature it warms to")
        fh = float(headspace_fraction)
        if not (0.0 < fh < 1.0):
            raise GasInputError(f"headspace fraction {fh:g} is outside the open range (0, 1)")
        if not (trapped_air >= 0.0):
            raise GasInputError(f"trapped air {trapped_air / 1e3:g} kPa must not be negative")
        air_part = float(trapped_air)
        if mode == "air" and air_part == 0.0:
            air_part = p_total - p - st.p_vapor      # the rest of the air, as insoluble gas
        sealed, scav = _sealed(res, g, st, p, fh, float(warm_to), air_part, float(ambient),
                               model)
        cav += scav
        out.sealed = sealed
        if sealed["warm_pressure_kPa"] is None:
            cautions.append(("vessel", sealed.pop("_hydraulic")))
        else:
            sealed.pop("_hydraulic", None)
    if rating is not None:
        gauges = [("at filling", out.p_total - out.ambient)]
        if out.sealed is not None and out.sealed.get("warm_gauge_pressure_kPa") is not None:
            gauges.append((f"at {out.sealed['warm_temperature_C']:.4g} °C",
                           out.sealed["warm_gauge_pressure_kPa"] * 1e3))
        over = [(w, pg) for w, pg in gauges if pg > rating]
        if over:
            w, pg = max(over, key=lambda t: t[1])
            cautions.insert(0, ("vessel", f"The estimated gauge pressure {w} ({pg / 1e3:.4g} kPa) "
                                f"exceeds the stated container rating ({rating / 1e3:.4g} kPa "
                                "gauge): do not fill or store this way; lower the carbonation, "
                                "enlarge the headspace, keep it cooler or use a higher-rated "
                                "container."))
        if out.sealed is not None:
            out.sealed["rating_kPa_gauge"] = rating / 1e3
    out.warnings = merge_caveats(cav)
    out.cautions = cautions
    return out


def _sealed(res, g: Gas, st1: LiquidState, p1: float, fh: float, T2: float,
            p_air1: float, ambient: float, model: str) -> tuple[dict, list[Caveat]]:
    """Mass balance of the gas between liquid and headspace from T1 to T2 (per m³ container)."""
    st2 = liquid_state(res, T2, g, model)
    V_L1, V_H1 = 1.0 - fh, fh
    m = V_L1 * st1.rho
    N = st1.S * p1 * V_L1 + p1 * V_H1 / (R * st1.T)
    n_air = p_air1 * V_H1 / (R * st1.T)
    V_L2 = m / st2.rho
    V_H2 = 1.0 - V_L2
    fill_total = p1 + st1.p_vapor + p_air1
    out = {"headspace_fraction": fh, "warm_temperature_C": T2 - T_ZERO_C,
           "trapped_air_kPa": p_air1 / 1e3,
           "fill_total_pressure_kPa": fill_total / 1e3,
           "fill_gauge_pressure_kPa": (fill_total - ambient) / 1e3,
           "warm_headspace_fraction": V_H2,
           "warm_partial_pressure_kPa": None, "warm_vapor_pressure_kPa": st2.p_vapor / 1e3,
           "warm_pressure_kPa": None, "warm_gauge_pressure_kPa": None,
           "warm_dissolved_mg_per_L": None, "warm_volumes": None, "_hydraulic": ""}
    cav = [c for c in st2.caveats]
    if V_H2 <= 1e-3 * fh:
        out["_hydraulic"] = (f"At {T2 - T_ZERO_C:.4g} °C the liquid expands to fill the "
                             "container: the pressure rises without bound (hydraulic burst "
                             "risk). Leave a larger headspace.")
        cav.append(Caveat("sealed", f"sealed container at {T2 - T_ZERO_C:.4g} °C: the liquid "
                          "fills the container, no pressure can be given", g.name,
                          about="gas"))
        return out, cav
    p2 = N / (st2.S * V_L2 + V_H2 / (R * T2))
    p_air2 = n_air * R * T2 / V_H2
    total2 = p2 + st2.p_vapor + p_air2
    if p2 > P_MAX:
        cav.append(Caveat("model-range", f"sealed container at {T2 - T_ZERO_C:.4g} °C: "
                          f"{g.name} at {p2 / 1e3:.4g} kPa is past the model's {P_MAX / 1e3:g} "
                          "kPa; the pressure shown is an extrapolation", g.name, about="gas"))
    elif p2 > P_CAVEAT:
        cav += _check_p_gas(p2, g, "warm partial pressure")
    c2 = st2.S * p2
    out.update({"warm_partial_pressure_kPa": p2 / 1e3, "warm_pressure_kPa": total2 / 1e3,
                "warm_gauge_pressure_kPa": (total2 - ambient) / 1e3,
                "warm_dissolved_mg_per_L": c2 * g.M * 1e3,
                "warm_volumes": c2 * V_MOLAR_STP})
    if p_air1 > 0:
        cav.append(Caveat("sealed", "trapped air is counted as an insoluble ideal gas, which "
                          "slightly overstates the warm pressure", "air", about="gas"))
    return out, cav


def dissolved_curve(recipe, gas, temperatures, *, partial_pressure: float | None = None,
                    air: bool = False, total_pressure: float = P_ATM,
                    model: str = "nonideal") -> dict:
    """Dissolved gas against temperature at a fixed partial pressure or in air.

    temperatures : [K], each within the gas's range (see :func:`dissolved_gas`)
    Returns {"T_C", "mg_per_L", "volumes", "mmol_per_kg", "notes"} (lists; notes: one caveat
    message per kind of caveat and component, the first met along the curve).
    """
    res = _resolved(recipe)
    T_C, mg, vol, mmol, notes = [], [], [], [], []
    for T in np.atleast_1d(np.asarray(temperatures, dtype=float)):
        r = dissolved_gas(res, gas, float(T), partial_pressure=partial_pressure, air=air,
                          total_pressure=total_pressure, model=model)
        d = r.to_dict()
        T_C.append(float(T) - T_ZERO_C)
        mg.append(d["dissolved_mg_per_L"])
        vol.append(d["volumes"])
        mmol.append(d["dissolved_mmol_per_kg"])
        notes.extend(r.warnings)
    return {"T_C": T_C, "mg_per_L": mg, "volumes": vol, "mmol_per_kg": mmol,
            "notes": _first_of_each(notes)}


def _first_of_each(caveats) -> list[str]:
    """Caveat messages, one for each wording that differs only in its numbers."""
    seen, out = set(), []
    for c in caveats:
        k = re.sub(r"[-−]?\d+(?:\.\d+)?", "#", c.message)
        if k not in seen:
            seen.add(k)
            out.append(c.message)
    return out


def sealed_pressure_curve(recipe, gas, T_fill: float, temperatures, *,
                          headspace_fraction: float, partial_pressure: float | None = None,
                          volumes: float | None = None, trapped_air: float = 0.0,
                          ambient: float = P_ATM, model: str = "nonideal") -> dict:
    """Pressure in a sealed container against the temperature it reaches.

    Returns {"T_C", "total_kPa", "gauge_kPa", "partial_kPa", "notes"}; a temperature at
    which the liquid fills the container gives ``None``.
    """
    res = _resolved(recipe)
    out = {"T_C": [], "total_kPa": [], "gauge_kPa": [], "partial_kPa": [], "notes": []}
    for T2 in np.atleast_1d(np.asarray(temperatures, dtype=float)):
        r = dissolved_gas(res, gas, T_fill, partial_pressure=partial_pressure, volumes=volumes,
                          headspace_fraction=headspace_fraction, warm_to=float(T2),
                          trapped_air=trapped_air, ambient=ambient, model=model)
        s = r.sealed
        out["T_C"].append(float(T2) - T_ZERO_C)
        out["total_kPa"].append(s["warm_pressure_kPa"])
        out["gauge_kPa"].append(s["warm_gauge_pressure_kPa"])
        out["partial_kPa"].append(s["warm_partial_pressure_kPa"])
        out["notes"].extend(r.warnings)
    out["notes"] = _first_of_each(out["notes"])
    return out
