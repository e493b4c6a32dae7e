"""Colligative properties of a composition: vapor pressure, freezing and boiling points,
osmolality and osmotic pressure, under a chosen activity model.

Everything follows from the solvent activity a (water activity a_w in water):

* vapor pressure of the solvent over the solution  p = a(T) · p*(T)
  (p* from IAPWS-IF97 for water, Antoine for other solvents); below the solution's
  freezing point the stable phase is ice and the pressure over ice is reported;
* freezing point: the T where the solution's a_w equals that of ice,
  a_w(T) = p_ice(T) / p_liq(T) (IAPWS R14-08 sublimation over Murphy–Koop supercooled
  liquid; Koop et al. 2000). The ideal model uses the enthalpy-of-fusion relation of
  :func:`solutions.water.ice_water_activity_thermo`, the dilute model ΔT = K_f Σ ν b;
* boiling point at external pressure P: the T where a(T) · p*(T) = P (non-volatile
  solutes); with volatile organics (ethanol, …) the bubble point, where the total
  vapor pressure of water and organics equals P (:mod:`solutions.vle`), so the
  "elevation" is negative for alcohols; the dilute model uses ΔT = K_b Σ ν b;
* with volatile organics, the vapor pressure is the total over the liquid, with the
  partial pressures and the flash point (Liaw et al. 2002) beside it;
* osmolality −ln a_w / M_w, osmotic coefficient φ = osmolality / Σ ν b, osmotic
  pressure Π = −R T ln a_w / V_w with V_w = M_w / ρ_w(T), and the calculated
  osmolarity Σ ν c (the ideal count printed on labels).

Depressions and elevations are temperature differences [K]. On the ice-activity scale
pure water and ice coexist at the triple point (273.16 K); the freezing point at
101.325 kPa is reported as 273.15 K − ΔT_f, which removes the 0.01 K offset of the
pressure (common practice for solution freezing points).

All root finding is vectorized (``solutions.roots``, Chandrupatla 1997, numpy only), so a
sweep of many compositions is one call. The freezing search does the composition sums of
ln a_w once, evaluates only the functions of T at each step, and starts from a tight bracket
(:func:`_solve_freezing`): a million compositions in about a second.
"""
from __future__ import annotations

import warnings
from dataclasses import dataclass, field
from functools import cache

import numpy as np

from . import roots
from .activity.models import ActivityTerms, activity_terms, check_model, describe_model
from .composition import Composition
from .constants import P_ATM, P_CRIT, P_TRIPLE, R, T_CRIT, T_MELT, T_TRIPLE
from .errors import (Caveat, DataError, OutOfRangeError, group_outside_temperatures,
                     group_temperature_ranges, merge_caveats)
from .water import (ice_water_activity_thermo, ln_ice_water_activity, saturation_pressure,
                    saturation_temperature, sublimation_pressure,
                    supercooled_vapor_pressure, water_density)

__all__ = ["ColligativeResult", "colligative", "freezing_point", "boiling_point",
           "vapor_pressure_pure", "R", "T_MELT", "T_TRIPLE", "P_ATM"]

T_FREEZE_MIN = 190.0  # K, lowest freezing point searched (below every solution here)
T_ICE_THERMO_MIN = 236.0  # K, lowest T of the enthalpy-of-fusion ice relation
#: a composition more than this factor past the highest molality its activity data reach
#: gets no activity-derived result (withheld with the reason) instead of an extrapolation
DATA_MARGIN = 1.10


@cache
def _ln_ice_at_triple() -> float:
    """ln a_ice at the triple point on the scale used for freezing (IAPWS R14-08 sublimation
    over Murphy–Koop supercooled liquid): −7e-8, not exactly 0, because the two published
    equations meet there only to their precision (about 1e-5 K). Freezing uses ln a_ice
    minus this offset, so pure water freezes at exactly the triple point on that scale and a
    trace of solute gives a trace of depression, never a failed bracket. Evaluated on an
    array, as the freezing residual is, so that the two agree to the last bit."""
    return float(ln_ice_water_activity(np.array([T_TRIPLE]))[0])


def _ln_ice(T):
    """ln a_w of a solution at equilibrium with ice at ``T`` [K], referred to the triple
    point (:func:`_ln_ice_at_triple`): the non-ideal model's freezing condition."""
    out = ln_ice_water_activity(T)
    out -= _ln_ice_at_triple()
    return out


def _ln_ice_thermo(T):
    """ln a_w at equilibrium with ice from the enthalpy of fusion, referred to 273.15 K
    (:func:`solutions.water.ice_water_activity_thermo`): the ideal model's condition."""
    return np.log(ice_water_activity_thermo(T))


def _tag(c: Caveat, about: str) -> Caveat:
    """Tag a caveat with what it bears on; a withheld-for-want-of-data caveat bears on every
    activity-derived result wherever it was raised."""
    if c.kind == "beyond-data" and "T_min_K" not in (c.extra or {}):
        return c   # past the composition data: every activity-derived value is withheld
    return c.tagged(about)


def beyond_data(terms: ActivityTerms, bs, T=None) -> tuple[np.ndarray, list[Caveat]]:
    """Compositions whose activity model would be extrapolated past its data by more than
    :data:`DATA_MARGIN` (salts: in molality; organics: :meth:`ActivityTerms.withheld`, in
    mole fraction, or colder than their data when ``T`` [K] is given), shape (N,), and a
    caveat naming each solute and limit. The non-ideal model only: the ideal and dilute
    models are defined everywhere."""
    n = len(np.atleast_1d(bs[0])) if bs else 1
    mask = np.zeros(n, bool)
    out: list[Caveat] = []
    if terms.model != "nonideal":
        return mask, out
    for label, kind, par, b in zip(terms.labels, terms.kinds, terms.params, bs):
        if kind != "pitzer" or par[1] is None:
            continue
        limit = par[1].b_max
        far = np.atleast_1d(np.asarray(b, dtype=float)) > DATA_MARGIN * limit
        if np.any(far):
            mask |= far
            worst = float(np.max(np.atleast_1d(b)[far]))
            out.append(Caveat(
                "beyond-data", f"{label} at {worst:.4g} mol/kg is past the {limit:.4g} mol/kg "
                f"that its Pitzer parameters reach (by more than {100 * (DATA_MARGIN - 1):.0f} "
                "%): water activity, vapor pressure, osmolality, osmotic pressure, freezing and "
                "boiling points are not reported rather than extrapolated", label,
                {"molality": worst, "b_max": limit, "margin": DATA_MARGIN}))
    m2, c2 = terms.withheld(bs, T if T is not None else np.full(n, np.nan))
    return mask | np.broadcast_to(m2, mask.shape), out + list(c2)


@dataclass
class ColligativeResult:
    """Colligative properties of N compositions (arrays of shape (N,)); ``None`` entries
    in the arrays are never used: where a value could not be found it is NaN *and* a
    caveat says why, and :meth:`value` turns it into ``None`` for output."""

    model: str
    model_name: str
    T: np.ndarray                       # [K]
    P: np.ndarray                       # [Pa]
    water_activity: np.ndarray          # [1] (solvent activity for other solvents)
    vapor_pressure: np.ndarray          # [Pa] over the stable phase at T
    vapor_pressure_liquid: np.ndarray   # [Pa] over the (possibly supercooled) solution
    vapor_pressure_pure: np.ndarray     # [Pa] pure solvent at T
    freezing_point: np.ndarray          # [K] at 101.325 kPa
    freezing_point_depression: np.ndarray   # [K]
    boiling_point: np.ndarray           # [K] at P
    boiling_point_elevation: np.ndarray     # [K]
    osmolality: np.ndarray              # [mol/kg] (osmol/kg)
    osmotic_coefficient: np.ndarray     # [1]
    osmotic_pressure: np.ndarray        # [Pa]
    osmolarity: np.ndarray | None       # [mol/m³] calculated, ideal count; needs rho
    below_freezing: np.ndarray          # bool: T below the freezing point (ice is stable)
    caveats: list[Caveat] = field(default_factory=list)
    # with volatile organics (else None): partial pressures [Pa] by component name, water
    # first (over the stable phase), and the flash point [K] (NaN: none, a caveat says why)
    partial_pressures: dict[str, np.ndarray] | None = None
    flash_point: np.ndarray | None = None

    @property
    def vapor_composition(self) -> dict[str, np.ndarray] | None:
        """Vapor mole fractions by component name, or None without volatile organics."""
        if self.partial_pressures is None:
            return None
        tot = sum(self.partial_pressures.values())
        return {k: v / tot for k, v in self.partial_pressures.items()}

    @property
    def vapor_pressure_lowering(self) -> np.ndarray:
        """Lowering of the solvent's own vapor pressure, p*(T) (1 − a) [Pa] (Raoult's
        measure; with volatile solutes the total vapor pressure can exceed p*)."""
        return self.vapor_pressure_pure * (1.0 - self.water_activity)


# ------------------------------------------------------------------ solvent curves
def _solvent_name(comp: Composition) -> str:
    return comp.solvent.solute


def _constants(comp: Composition):
    from .solvents import solvent_constants
    return solvent_constants(_solvent_name(comp))


def vapor_pressure_pure(comp: Composition, T):
    """Vapor pressure of the pure (liquid) solvent [Pa] at ``T`` [K], and caveats."""
    T = np.asarray(T, dtype=float)
    if comp.solvent.is_water:
        out = np.zeros_like(T)
        hi = T >= T_MELT
        if np.any(T > T_CRIT):
            raise OutOfRangeError("temperature", float(np.max(T)), 123.0, T_CRIT, "K",
                                  "liquid water does not exist above the critical point "
                                  "(647.096 K, 22.064 MPa)")
        if np.any(hi):
            out = np.where(hi, saturation_pressure(np.where(hi, T, 300.0)), out)
        if np.any(~hi):
            out = np.where(~hi, supercooled_vapor_pressure(np.where(~hi, T, 260.0)), out)
        return out, []
    from .vle import pure_vapor_pressure
    return pure_vapor_pressure(T, _solvent_name(comp))


# ------------------------------------------------------------------ freezing point
def freezing_point(comp: Composition, model: str = "nonideal", terms: ActivityTerms | None = None):
    """Freezing point at 101.325 kPa [K] and depression [K], shape (N,), with caveats.

    Examples
    --------
    1 % w/w NaCl: freezing-point depression 0.59 K (CRC Handbook 102nd ed., Concentrative
    Properties of Aqueous Solutions, 20 °C table, in solutions/data/tables):

    >>> import numpy as np
    >>> from solutions.composition import Composition
    >>> from solutions.ingredients import default_library
    >>> lib = default_library()
    >>> comp = Composition.from_mass_fractions((lib.get("NaCl"),), np.array([[0.01]]),
    ...                                        lib.get("water"))
    >>> Tf, dT, caveats = freezing_point(comp)
    >>> round(float(dT[0]), 2)
    0.59
    """
    model = check_model(model)
    terms = terms or activity_terms(comp, model)
    bs = terms.molalities(comp)
    caveats: list[Caveat] = []
    N = comp.N
    if not comp.solvent.is_water:
        return _freezing_nonaqueous(comp, terms, bs, model)
    from .limits import eutectic_caveats
    caveats.extend(eutectic_caveats(comp))
    if model == "dilute":
        Kf = _constants(comp).Kf_K_kg_per_mol
        dT = Kf * comp.particle_molality()
        return T_MELT - dT, dT, caveats
    no_solute = comp.particle_molality() == 0
    if model == "ideal":
        ln_ice, lo, hi = _ln_ice_thermo, T_ICE_THERMO_MIN, T_MELT
        T0 = T_MELT
    else:
        ln_ice, lo, hi = _ln_ice, T_FREEZE_MIN, T_TRIPLE
        T0 = T_TRIPLE
    # arrays of shape (N,) are updated in place: a sweep of a million compositions keeps
    # only the molalities, the roots and the depressions
    Tf = _solve_freezing(terms, bs, ln_ice, lo, hi, N)
    dT = T0 - Tf
    dT[no_solute] = 0.0
    Tf[~np.isfinite(Tf)] = T_MELT
    far, cav = beyond_data(terms, bs, Tf)
    caveats.extend(cav)
    dT[far] = np.nan
    bad = ~np.isfinite(dT) & ~far
    if np.any(bad):
        caveats.append(Caveat("model-range",
                              "no freezing point is reported: the model finds no ice "
                              f"equilibrium between {lo - 273.15:.0f} °C and 0 °C for this "
                              "composition, which lies outside the range its data cover (not "
                              "a sign that the solution would not freeze)", None,
                              about="freezing"))
    Tf = np.subtract(T_MELT, dT, out=Tf)
    if np.any(np.isfinite(dT)):
        Tf[bad] = T_MELT    # range notes at the melting point where no root was found
        caveats.extend(terms.caveats(bs, Tf))
        Tf[bad] = np.nan
    return Tf, dT, caveats


def _solve_freezing(terms: ActivityTerms, bs, ln_ice, lo: float, hi: float, N: int):
    """Roots of ln a_w(b, T) = ln_ice(T) in [lo, hi] [K], shape (N,) (NaN where none).

    Solved :data:`solutions.roots.ROOT_CHUNK` compositions at a time, so the working arrays
    stay small; for each chunk the composition sums of ln a_w are done once
    (:meth:`ActivityTerms.at_compositions`) and the search evaluates the functions of T
    only. The search starts from a tight bracket: T₁ is the ice temperature of the water
    activity at ``hi``, T₂ that of the water activity at T₁ (a fixed-point step, which
    contracts by (∂ln a_w/∂T)/(d ln a_ice/dT), a few hundredths), and the bracket is T₂ ±
    (|T₂ − T₁|/4 + 0.1 mK). Where that bracket holds no root the search runs on the whole
    [lo, hi], so every root found on [lo, hi] before is still found, to the tolerance.
    """
    Tf = np.empty(N)
    table = _ice_inverse(ln_ice, lo, hi)
    for k in range(0, N, roots.ROOT_CHUNK):
        sl = slice(k, min(k + roots.ROOT_CHUNK, N))
        n = sl.stop - k
        ln_aw, args = terms.at_compositions([b[sl] for b in bs])
        args = [np.broadcast_to(a, (n,)) for a in args]

        def f(T, *args):
            r = ln_aw(T, *args)
            r -= ln_ice(T)
            return r
        with np.errstate(all="ignore"):
            T1 = _ice_temperature(ln_aw(hi, *args), table)
            T2 = _ice_temperature(ln_aw(T1, *args), table)
            d = np.abs(T2 - T1)
            d *= 0.25
            d += 1e-4
        Tc = _bracketed_root(f, np.maximum(T2 - d, lo), np.minimum(T2 + d, hi), args, n)
        miss = np.isnan(Tc)
        if np.any(miss):
            Tc[miss] = _bracketed_root(f, lo, hi, [a[miss] for a in args], int(miss.sum()))
        Tf[sl] = Tc
    return Tf


@cache
def _ice_inverse(ln_ice, lo: float, hi: float, n: int = 4096):
    """T as a function of y = ln_ice(T) on [lo, hi] [K], tabulated at n equally spaced y
    (a first guess only; the root is then found on the exact equation): (y₀, 1/Δy, T)."""
    Tg = np.linspace(lo, hi, 16 * n)
    yg = ln_ice(Tg)
    y = np.linspace(yg[0], yg[-1], n)
    return float(y[0]), (n - 1) / float(y[-1] - y[0]), np.interp(y, yg, Tg)


def _ice_temperature(y, table) -> np.ndarray:
    """The tabulated inverse of the ice curve (:func:`_ice_inverse`) at ``y`` [1], clipped
    to the table's range; linear between nodes."""
    y0, inv_dy, Ty = table
    u = np.asarray(y, dtype=float) - y0
    u *= inv_dy
    np.clip(u, 0.0, Ty.size - 1.0, out=u)
    u[np.isnan(u)] = 0.0
    i = u.astype(np.intp)
    np.minimum(i, Ty.size - 2, out=i)
    u -= i
    lo = Ty[i]
    return lo + u * (Ty[i + 1] - lo)


def _freezing_nonaqueous(comp, terms, bs, model):
    c = _constants(comp)
    caveats = []
    if c.melting_point_K is None:
        raise DataError(f"no melting point for {comp.solvent.name} in solvent_constants.csv")
    nu_b = comp.particle_molality()
    if model == "dilute" or c.enthalpy_of_fusion_J_per_mol is None:
        if c.Kf_K_kg_per_mol is None:
            if c.enthalpy_of_fusion_J_per_mol is None:
                raise DataError(f"no cryoscopic data for {comp.solvent.name}")
            Kf = R * c.melting_point_K ** 2 * comp.solvent.M / c.enthalpy_of_fusion_J_per_mol
            caveats.append(Caveat("model-range", f"K_f of {comp.solvent.name} computed from its "
                                  "enthalpy of fusion (R T_m² M / ΔH_fus)", comp.solvent.name))
        else:
            Kf = c.Kf_K_kg_per_mol
        dT = Kf * nu_b
        return c.melting_point_K - dT, dT, caveats
    ln_a = terms.ln_a(bs, c.melting_point_K)
    # van't Hoff with constant ΔH_fus: ln a = −ΔH/R (1/T − 1/T_m)
    Tf = 1.0 / (1.0 / c.melting_point_K - R * ln_a / c.enthalpy_of_fusion_J_per_mol)
    caveats.append(Caveat("model-range", f"freezing of {comp.solvent.name}: ideal solution with "
                          "a constant enthalpy of fusion", comp.solvent.name))
    return Tf, c.melting_point_K - Tf, caveats


# ------------------------------------------------------------------ boiling point
def boiling_point(comp: Composition, P=P_ATM, model: str = "nonideal",
                  terms: ActivityTerms | None = None):
    """Boiling point [K] at external pressure ``P`` [Pa] and elevation [K], with caveats.

    Examples
    --------
    0.1 mol/kg glucose at 101.325 kPa: K_b b = 0.513 × 0.1 = 0.0513 K with water's
    ebullioscopic constant from the CRC Handbook (Section 15). The result is about 1.5 %
    lower, within 0.001 K, because p* (IAPWS-IF97) includes the vapor's non-ideality
    (ΔZ ≈ 0.985 at 100 °C), which the K_b formula leaves out:

    >>> from solutions.composition import Composition
    >>> from solutions.ingredients import default_library
    >>> lib = default_library()
    >>> comp = Composition.from_molalities((lib.get("glucose anhydrous"),), [[0.1]],
    ...                                    lib.get("water"))
    >>> Tb, dT, caveats = boiling_point(comp, 101325.0)
    >>> bool(abs(dT[0] - 0.513 * 0.1) < 0.001)
    True
    """
    model = check_model(model)
    terms = terms or activity_terms(comp, model)
    bs = terms.molalities(comp)
    N = comp.N
    P = np.broadcast_to(np.asarray(P, dtype=float), (N,))
    caveats: list[Caveat] = []
    volatile = _volatile_names(comp, terms)
    if volatile and model != "nonideal":
        caveats.append(Caveat("volatile-solute",
                              f"{', '.join(volatile)} is volatile: the {model} model counts "
                              "only the water's vapor, so the boiling point shown is too high; "
                              "the non-ideal model gives the bubble point", volatile[0]))
    if volatile and model == "nonideal":
        from .vle import bubble_point
        T_pure = np.asarray(saturation_temperature(P), dtype=float)
        Tb, _, _, cav = bubble_point(comp, P, model, terms)
        caveats.extend(cav)
        return Tb, Tb - T_pure, caveats
    if comp.solvent.is_water:
        if np.any(P < P_TRIPLE) or np.any(P > P_CRIT):
            bad = float(P[(P < P_TRIPLE) | (P > P_CRIT)][0])
            raise OutOfRangeError("pressure", bad / 1e3, P_TRIPLE / 1e3, P_CRIT / 1e3, "kPa",
                                  "water boils only between its triple point and its critical "
                                  "point")
        T_pure = np.asarray(saturation_temperature(P), dtype=float)
        ln_p = np.log(P)

        def psat(T):
            return saturation_pressure(np.clip(T, T_TRIPLE, T_CRIT))
    else:
        from .solvents import antoine_boiling_temperature, antoine_vapor_pressure
        name = _solvent_name(comp)
        T_pure = np.asarray(antoine_boiling_temperature(P, name), dtype=float)
        ln_p = np.log(P)

        def psat(T):
            with warnings.catch_warnings():
                warnings.simplefilter("ignore")
                return antoine_vapor_pressure(T, name, extrapolate=True)
    nu_b = comp.particle_molality()
    if model == "dilute":
        c = _constants(comp)
        if c.Kb_K_kg_per_mol is None:
            raise DataError(f"no ebullioscopic constant for {comp.solvent.name}")
        dT = c.Kb_K_kg_per_mol * nu_b
        if np.any(np.abs(P - P_ATM) > 1.0):
            caveats.append(Caveat("model-range", "the dilute model's K_b is the 1 atm value; "
                                  "at other pressures it is only indicative", None))
        return T_pure + dT, dT, caveats

    def f(T, *args):
        *b, lnp = args
        return terms.ln_a(list(b), T) + np.log(psat(T)) - lnp

    T_hi_max = 647.0 if comp.solvent.is_water else float(np.max(T_pure)) + 150.0
    Tb = _bracketed_root(f, T_pure - 1e-9, np.minimum(T_pure + 100.0, T_hi_max),
                         [*bs, ln_p], N)
    dT = Tb - T_pure
    dT = np.where(nu_b == 0, 0.0, dT)
    if np.any(~np.isfinite(dT)):
        caveats.append(Caveat("model-range", "boiling point more than 100 K above the pure "
                              "solvent's, outside the model; not reported", None))
    else:
        caveats.extend(terms.caveats(bs, T_pure + dT))
    return T_pure + dT, dT, caveats


def _volatile_names(comp: Composition, terms: ActivityTerms) -> list[str]:
    """Names of the dissolved volatile organics of an aqueous composition."""
    if not comp.solvent.is_water:
        return []
    from .vle import volatile_keys
    vk = set(volatile_keys())
    groups = [(lab, cols) for lab, cols in zip(terms.labels, terms.columns)]
    return [lab for lab, cols in groups if comp.solutes[cols[0]].solute in vk]


#: share of the vapor [1] from which the organics' part is explained in a note
VOLATILE_NOTE_SHARE = 0.01


def _volatile_reading(names, partial, p_pure, with_boiling: bool) -> Caveat:
    """How to read the vapor figures of a solution whose solutes are volatile too."""
    solutes = " and ".join(names[1:])
    if len(p_pure) == 1:
        parts = " + ".join(f"{n.lower()} {float(v[0]) / 1e3:.4g} kPa"
                           for n, v in partial.items())
        total = f" ({parts})"
    else:
        total = ""
    text = (f"{solutes} evaporate{'s' if len(names) == 2 else ''} with the water: the vapor "
            f"pressure is the total over the solution{total}, which can exceed pure water's; "
            "the vapor-pressure lowering is of water's own partial pressure (Raoult)")
    if with_boiling:
        text += ("; the boiling point is the mixture's bubble point, which lies below pure "
                 "water's when the volatile part is large enough (a negative elevation)")
    return Caveat("volatile-solute", text, None,
                  about="vapor boiling" if with_boiling else "vapor")


def _bracketed_root(f, lo, hi, bs, N):
    """Vectorized root of f(T, *bs) in [lo, hi] (:func:`solutions.roots.bracketed_root`)."""
    return roots.bracketed_root(f, lo, hi, bs, N, xatol=1e-9, xrtol=1e-13)


# ------------------------------------------------------------------ everything at once
def colligative(comp: Composition, T, P=P_ATM, model: str = "nonideal", rho=None,
                with_boiling: bool = True, with_freezing: bool = True) -> ColligativeResult:
    """All colligative properties of ``comp`` at ``T`` [K] and external ``P`` [Pa].

    rho : solution density at T [kg/m³], for the calculated osmolarity (optional).

    Examples
    --------
    NaCl 1 mol/kg at 25 °C: osmotic coefficient 0.936 (Robinson & Stokes 1959, App. 8.10,
    0.9355, from memory; Pitzer & Mayorga 1973's parameters give 0.9359), so
    a_w = exp(−2 × 0.018015 × 0.936) = 0.9668:

    >>> from solutions.composition import Composition
    >>> from solutions.ingredients import default_library
    >>> lib = default_library()
    >>> comp = Composition.from_molalities((lib.get("NaCl"),), [[1.0]], lib.get("water"))
    >>> r = colligative(comp, 298.15)
    >>> round(float(r.osmotic_coefficient[0]), 3), round(float(r.water_activity[0]), 4)
    (0.936, 0.9668)
    """
    model = check_model(model)
    N = comp.N
    T = np.broadcast_to(np.asarray(T, dtype=float), (N,)).copy()
    P = np.broadcast_to(np.asarray(P, dtype=float), (N,)).copy()
    terms = activity_terms(comp, model)
    bs = terms.molalities(comp)
    caveats: list[Caveat] = []
    ln_a = terms.ln_a(bs, T)
    caveats.extend(_tag(c, "activity") for c in terms.caveats(bs, T))
    a = np.exp(ln_a)
    p_pure, cav = vapor_pressure_pure(comp, T)
    caveats.extend(_tag(c, "vapor") for c in cav)
    p_liq = a * p_pure

    nan = np.full(N, np.nan)
    Tf, dTf, below = nan, nan, np.zeros(N, bool)
    if with_freezing:
        Tf, dTf, cav = freezing_point(comp, model, terms)
        caveats.extend(_tag(c, "freezing") for c in cav)
        below = np.isfinite(Tf) & (T < Tf - 1e-9)
    p_stable = p_liq.copy()
    if comp.solvent.is_water and np.any(below):
        p_ice = sublimation_pressure(np.where(below, T, 260.0))
        p_stable = np.where(below, p_ice, p_liq)
        i = int(np.argmax(below))
        caveats.append(Caveat(
            "ice", f"{T[i] - 273.15:.4g} °C is below the freezing point "
            f"({Tf[i] - 273.15:.4g} °C): ice is the stable phase, so the vapor pressure shown "
            f"is over ice ({p_ice[i] / 1e3:.4g} kPa); over the supercooled liquid it would be "
            f"{p_liq[i] / 1e3:.4g} kPa", None,
            {"vapor_pressure_ice_kPa": float(p_ice[i] / 1e3),
             "vapor_pressure_supercooled_kPa": float(p_liq[i] / 1e3)}, about="vapor"))
    partial = None
    flash = None
    if model == "nonideal" and _volatile_names(comp, terms):
        from .vle import flash_point, vapor
        vap = vapor(comp, T, model, terms)
        caveats.extend(_tag(c, "vapor") for c in vap.caveats)
        organic = vap.partial_pressures[:, 1:].sum(axis=1)
        p_stable = p_stable + organic
        p_liq = p_liq + organic
        partial = {n: vap.partial_pressures[:, i] for i, n in enumerate(vap.names)}
        partial[vap.names[0]] = p_stable - organic
        # how to read the vapor figures, where the organics' share of the vapor shows
        share = organic / np.where(p_stable > 0, p_stable, np.inf)
        if len(vap.names) > 1 and np.any(share >= VOLATILE_NOTE_SHARE):
            caveats.append(_volatile_reading(vap.names, partial, p_pure, with_boiling))
        flash, cav = flash_point(comp, model, terms)
        caveats.extend(_tag(c, "vapor") for c in cav)
    Tb, dTb = nan, nan
    if with_boiling:
        Tb, dTb, cav = boiling_point(comp, P, model, terms)
        caveats.extend(_tag(c, "boiling") for c in cav)

    above = np.isfinite(Tb) & (T > Tb + 1e-9)
    if np.any(above):
        i = int(np.argmax(above))
        caveats.append(Caveat(
            "boiling", f"{T[i] - 273.15:.4g} °C is above the boiling point at {P[i] / 1e3:.4g} kPa "
            f"({Tb[i] - 273.15:.4g} °C): the solution boils in an open vessel; in a closed one its "
            f"vapor pressure ({p_liq[i] / 1e3:.4g} kPa) builds up — use a rated pressure vessel",
            None, {"vapor_pressure_kPa": float(p_liq[i] / 1e3)}, about="vapor"))
    far, cav = beyond_data(terms, bs, T)
    # a_w above 1 cannot exist with solutes present (a_w = 1 to rounding is a trace of solute)
    impossible = ~np.isfinite(ln_a) | ((ln_a > 0.0) & (comp.particle_molality() > 0))
    if np.any(impossible & ~far):
        caveats.append(Caveat(
            "beyond-data", "the activity model gives a water activity above 1 for a "
            "solution with solutes, which cannot exist: activity-derived results are not "
            "reported", None))
    withheld = far | impossible
    if np.all(withheld):
        # nothing activity-derived is reported: range notes and "not reported" messages from
        # the freezing and boiling searches would only repeat the reason, less clearly
        caveats = [c for c in caveats if c.kind not in ("model-range", "volatile-solute",
                                                        "ideal-fallback", "ice", "boiling")
                   or c.about in ("density", "recipe")]
    if np.any(withheld):
        caveats.extend(cav)
        ln_a = np.where(withheld, np.nan, ln_a)
        a = np.exp(ln_a)
        p_liq = np.where(withheld, np.nan, p_liq)
        p_stable = np.where(withheld, np.nan, p_stable)
        Tf, dTf, Tb, dTb = (np.where(withheld, np.nan, v) for v in (Tf, dTf, Tb, dTb))
    Ms = comp.solvent.M
    osmolality = -ln_a / Ms
    nu_b = comp.particle_molality()
    with np.errstate(invalid="ignore", divide="ignore"):
        phi = np.where(nu_b > 0, osmolality / np.where(nu_b > 0, nu_b, 1.0), 1.0)
    if comp.solvent.is_water:
        Tw = np.clip(T, 273.15, 623.15)
        # the liquid's molar volume: above the normal boiling point, at its own saturation
        rho_w = water_density(Tw, np.maximum(P_ATM, 1.0001 * saturation_pressure(Tw)))
    else:
        rho_w = comp.solvent.rho_pure or 1000.0
    Pi = -R * T * ln_a / (Ms / rho_w)
    osmolarity = comp.particle_molarity(rho) if rho is not None else None
    return ColligativeResult(model, describe_model(model), T, P, a, p_stable, p_liq, p_pure,
                             Tf, dTf, Tb, dTb, osmolality, phi, Pi, osmolarity, below,
                             merge_caveats(group_outside_temperatures(group_temperature_ranges(caveats))),
                             partial, flash)
