"""Non-aqueous solvents: Antoine vapor pressure and tabulated solvent constants.

Data files (loaded once, on first use):

* ``solutions/data/solvents.csv``: Antoine coefficients in the NIST Chemistry
  WebBook form log10(P/bar) = A - B / (T/K + C), one row per fitted
  temperature range (a solvent may have several rows);
* ``solutions/data/solvent_constants.csv``: molar mass, melting and normal
  boiling points, enthalpies of fusion and vaporization, and the cryoscopic
  and ebullioscopic constants Kf, Kb, each row with its source;
* ``solutions/data/vapor_pressure.csv``: one continuous vapor-pressure equation
  per volatile or semi-volatile ingredient (keyed by the ingredient's ``solute``
  key), valid from its ``T_min_K`` to ``T_max_K``, for :func:`pure_vapor_pressure`.

Two curves exist for ethanol, methanol, 2-propanol and acetone: the NIST Antoine
rows (narrow fitted ranges; :func:`antoine_vapor_pressure`, kept for the
non-aqueous solvent code) and the wide-range equations of ``vapor_pressure.csv``
(:func:`pure_vapor_pressure`, triple point to critical point). They agree within
about 1 % (2-propanol: 3 %) where both apply (checked in tests/test_solvents.py).
Where two Antoine rows of one solvent overlap, log P is blended linearly in T across
the overlap so that the curve has no step.

Ethanol's second NIST row (364.8–513.91 K, A = 4.92531, B = 1432.526, C = −61.819, as
read from a third-party transcription) was removed: it meets the first row with a
6.5 % step at 366.6 K, lies 7 % below Perry's Table 2-8 equation over its whole range
and gives 57 bar instead of ethanol's critical pressure (61.5 bar) at 513.9 K, so the
transcription is suspect. Above 366.63 K use :func:`pure_vapor_pressure`.
"""
from __future__ import annotations

import csv
import difflib
import math
import warnings
from dataclasses import dataclass
from functools import cache
from importlib import resources

import numpy as np

from .errors import IngredientError, OutOfRangeError

__all__ = [
    "VaporPressureRangeError",
    "VaporPressureExtrapolationWarning",
    "pure_vapor_pressure",
    "pure_vapor_pressure_range",
    "pure_vapor_pressure_source",
    "volatile_keys",
    "AntoineCoefficients",
    "AntoineRangeError",
    "AntoineExtrapolationWarning",
    "SolventConstants",
    "antoine_boiling_temperature",
    "antoine_coefficients",
    "antoine_vapor_pressure",
    "known_solvents",
    "solvent_constants",
]

_BAR = 1.0e5  # Pa

# Other names chemists type for the same solvent; keys are normalised (lower case).
_ALIASES = {
    "h2o": "water",
    "ethyl alcohol": "ethanol",
    "etoh": "ethanol",
    "methyl alcohol": "methanol",
    "meoh": "methanol",
    "propanone": "acetone",
    "propan-2-one": "acetone",
    "dimethyl ketone": "acetone",
    "isopropanol": "2-propanol",
    "isopropyl alcohol": "2-propanol",
    "propan-2-ol": "2-propanol",
    "ipa": "2-propanol",
    "glycerin": "glycerol",
    "glycerine": "glycerol",
    "propane-1,2,3-triol": "glycerol",
}


class AntoineRangeError(OutOfRangeError):
    """Temperature or pressure outside every fitted range of a solvent's Antoine equation.

    A :class:`ValueError` (through :class:`~solutions.errors.OutOfRangeError`);
    ``solvent`` names the solvent and ``low``/``high`` give the valid range.
    """

    def __init__(self, solvent: str, quantity: str, value: float, low: float,
                 high: float, unit: str, detail: str = ""):
        self.solvent = solvent
        super().__init__(f"{quantity} for the Antoine equation of {solvent}",
                         value, low, high, unit, detail)


class AntoineExtrapolationWarning(UserWarning):
    """An Antoine equation was evaluated outside its fitted range on request."""


@dataclass(frozen=True)
class AntoineCoefficients:
    """One fitted range: log10(P/bar) = A - B / (T/K + C) for Tmin_K <= T <= Tmax_K."""

    solvent: str
    A: float
    B: float
    C: float
    Tmin_K: float
    Tmax_K: float
    source: str


@dataclass(frozen=True)
class SolventConstants:
    """Tabulated constants of a pure solvent (SI units; ``None`` where not sourced)."""

    solvent: str
    molar_mass_kg_per_mol: float
    melting_point_K: float | None
    enthalpy_of_fusion_J_per_mol: float | None
    normal_boiling_point_K: float | None
    enthalpy_of_vaporization_J_per_mol: float | None
    Kf_K_kg_per_mol: float | None
    Kb_K_kg_per_mol: float | None
    source: str


def _normalise(name: str) -> str:
    key = " ".join(str(name).strip().lower().split())
    return _ALIASES.get(key, key)


def _read_csv(filename: str) -> list[dict[str, str]]:
    with (resources.files("solutions.data") / filename).open(encoding="utf-8", newline="") as fh:
        return list(csv.DictReader(fh))


@cache
def _antoine_table() -> dict[str, tuple[AntoineCoefficients, ...]]:
    table: dict[str, list[AntoineCoefficients]] = {}
    for row in _read_csv("solvents.csv"):
        name = _normalise(row["solvent"])
        table.setdefault(name, []).append(AntoineCoefficients(
            solvent=name, A=float(row["A"]), B=float(row["B"]), C=float(row["C"]),
            Tmin_K=float(row["T_min_K"]), Tmax_K=float(row["T_max_K"]), source=row["source"]))
    # Rows sorted by range so that the lower-temperature fit wins in an overlap.
    return {k: tuple(sorted(v, key=lambda r: r.Tmin_K)) for k, v in table.items()}


def _opt(text: str) -> float | None:
    text = text.strip()
    return float(text) if text else None


@cache
def _constants_table() -> dict[str, SolventConstants]:
    out = {}
    for row in _read_csv("solvent_constants.csv"):
        name = _normalise(row["solvent"])
        out[name] = SolventConstants(
            solvent=name,
            molar_mass_kg_per_mol=float(row["molar_mass_kg_per_mol"]),
            melting_point_K=_opt(row["melting_point_K"]),
            enthalpy_of_fusion_J_per_mol=_opt(row["enthalpy_of_fusion_J_per_mol"]),
            normal_boiling_point_K=_opt(row["normal_boiling_point_K"]),
            enthalpy_of_vaporization_J_per_mol=_opt(row["enthalpy_of_vaporization_J_per_mol"]),
            Kf_K_kg_per_mol=_opt(row["Kf_K_kg_per_mol"]),
            Kb_K_kg_per_mol=_opt(row["Kb_K_kg_per_mol"]),
            source=row["source"],
        )
    return out


def _unknown(name: str, known) -> IngredientError:
    known = sorted(known)
    return IngredientError(str(name), "no data for this solvent (known: " + ", ".join(known) + ")",
                           tuple(difflib.get_close_matches(_normalise(name), known, n=3)))


def known_solvents() -> tuple[str, ...]:
    """Names of the solvents that have Antoine coefficients."""
    return tuple(sorted(_antoine_table()))


def antoine_coefficients(solvent: str) -> tuple[AntoineCoefficients, ...]:
    """All fitted Antoine ranges of ``solvent``, lowest temperature range first.

    Raises :class:`~solutions.errors.IngredientError` (a KeyError) for an
    unknown solvent.
    """
    table = _antoine_table()
    key = _normalise(solvent)
    if key == "water":
        # Water has a reference-quality saturation line; an Antoine fit would be a step back.
        raise IngredientError(str(solvent), "no Antoine coefficients for water; use "
                              "solutions.water.saturation_pressure (IAPWS-IF97) instead")
    if key not in table:
        raise _unknown(solvent, table)
    return table[key]


def _ranges_text(rows) -> str:
    return ", ".join(f"[{r.Tmin_K:g}, {r.Tmax_K:g}] K" for r in rows)


def antoine_vapor_pressure(T, solvent: str, *, extrapolate: bool = False):
    """Vapor pressure of a pure non-aqueous solvent from the Antoine equation.

    Parameters
    ----------
    T : float or array_like
        Temperature [K].
    solvent : str
        Solvent name (e.g. ``"ethanol"``, ``"2-propanol"`` or ``"isopropanol"``).
    extrapolate : bool, keyword-only
        If False (default) a temperature outside every fitted range raises
        :class:`AntoineRangeError`. If True such points are evaluated with the
        nearest fitted range and an :class:`AntoineExtrapolationWarning` is issued.

    Returns
    -------
    float or ndarray
        Vapor pressure [Pa], same shape as ``T``.

    Equation
    --------
    log10(P / bar) = A - B / (T/K + C)   (NIST Chemistry WebBook form),
    with A, B, C and the range [Tmin, Tmax] from ``solutions/data/solvents.csv``.
    Where a solvent has several rows, each T uses the first row (lowest
    range) that contains it.

    References
    ----------
    NIST Chemistry WebBook, NIST Standard Reference Database 69, "Phase change
    data" of each compound; original references in the data file.

    Examples
    --------
    Ethanol at its normal boiling point, 351.39 K (CRC Handbook, Physical Constants of
    Organic Compounds), boils at 101.325 kPa: within 0.5 %.

    >>> P = antoine_vapor_pressure(351.39, "ethanol")
    >>> bool(abs(P / 101325.0 - 1) < 0.005)
    True
    """
    rows = antoine_coefficients(solvent)
    name = rows[0].solvent
    T = np.asarray(T, dtype=float)
    A, B, C, inside = _pick_rows(rows, T, extrapolate, name, "temperature",
                                 lambda r: (r.Tmin_K, r.Tmax_K), "K")
    P = _BAR * 10.0**_blend_overlaps(rows, T, A - B / (T + C))
    return float(P) if T.ndim == 0 else P


def _blend_overlaps(rows, T, log10p):
    """Where two fitted rows overlap, [lo, hi] = [Tmin of the upper row, Tmax of the
    lower], replace log10 P by a blend linear in T from the lower row (at lo) to the
    upper row (at hi), so that P(T) is continuous where the rows meet."""
    out = np.array(log10p, dtype=float, copy=True)
    for low, up in zip(rows[:-1], rows[1:]):
        lo, hi = up.Tmin_K, low.Tmax_K
        if hi <= lo:
            continue
        inside = (T >= lo) & (T <= hi)
        if np.any(inside):
            f = (T - lo) / (hi - lo)
            blend = ((1.0 - f) * (low.A - low.B / (T + low.C))
                     + f * (up.A - up.B / (T + up.C)))
            out = np.where(inside, blend, out)
    return out


def _pick_rows(rows, x, extrapolate, name, quantity, bounds, unit):
    """Choose, per element of x, the coefficients of the first row whose range holds it."""
    lows = np.array([bounds(r)[0] for r in rows])
    highs = np.array([bounds(r)[1] for r in rows])
    xe = x[..., None]
    hit = (xe >= lows) & (xe <= highs)
    inside = hit.any(axis=-1) | np.isnan(x)
    idx = np.argmax(hit, axis=-1)
    if not np.all(inside):
        outside = ~inside
        lo, hi = float(lows.min()), float(highs.max())
        if not extrapolate:
            value = float(x[outside].flat[0])
            raise AntoineRangeError(
                name, quantity, value, lo, hi, unit,
                f"fitted range(s) {_ranges_text(rows)}; pass extrapolate=True to evaluate anyway")
        # Nearest range: distance to the closer end of each range.
        dist = np.maximum(lows - xe, xe - highs)
        idx = np.where(outside, np.argmin(dist, axis=-1), idx)
        warnings.warn(
            f"Antoine equation of {name} evaluated outside its fitted range(s) "
            f"{_ranges_text(rows)} ({int(outside.sum())} point(s), e.g. "
            f"{quantity} {float(x[outside].flat[0]):g} {unit})",
            AntoineExtrapolationWarning, stacklevel=3)
    A = np.array([r.A for r in rows])[idx]
    B = np.array([r.B for r in rows])[idx]
    C = np.array([r.C for r in rows])[idx]
    return A, B, C, inside


def antoine_boiling_temperature(P, solvent: str, *, extrapolate: bool = False):
    """Boiling temperature of a pure solvent at pressure ``P`` (inverse Antoine equation).

    Parameters
    ----------
    P : float or array_like
        Pressure [Pa].
    solvent : str
        Solvent name.
    extrapolate : bool, keyword-only
        As in :func:`antoine_vapor_pressure`: if False a pressure whose boiling
        temperature falls outside every fitted range raises AntoineRangeError.

    Returns
    -------
    float or ndarray
        Temperature [K] at which the vapor pressure equals ``P``.

    Equation
    --------
    T/K = B / (A - log10(P/bar)) - C, from the row whose pressure range
    [P(Tmin), P(Tmax)] contains P (Antoine P(T) is increasing in T).

    Examples
    --------
    2-Propanol boils at 355.36 K at 101.325 kPa (CRC Handbook, Physical Constants of
    Organic Compounds): within 0.3 K.

    >>> bool(abs(antoine_boiling_temperature(101325.0, "2-propanol") - 355.36) < 0.3)
    True
    """
    rows = antoine_coefficients(solvent)
    name = rows[0].solvent
    P = np.asarray(P, dtype=float)
    if np.any(P <= 0.0):
        raise AntoineRangeError(name, "pressure", float(P[P <= 0.0].flat[0]), 0.0, math.inf,
                                "Pa", "pressure must be positive")

    def p_at(r, T):
        return _BAR * 10.0**(r.A - r.B / (T + r.C))

    # The pressure bounds are widened by 1e-12 so that P(Tmin) computed elsewhere,
    # differing in the last bit, still maps back inside the range.
    A, B, C, _ = _pick_rows(rows, P, extrapolate, name, "pressure",
                            lambda r: (p_at(r, r.Tmin_K) * (1 - 1e-12),
                                       p_at(r, r.Tmax_K) * (1 + 1e-12)), "Pa")
    T = B / (A - np.log10(P / _BAR)) - C
    target = np.log10(P / _BAR)
    for _ in range(8):
        # Newton steps on the blended curve; a no-op outside the rows' overlaps
        resid = _blend_overlaps(rows, T, A - B / (T + C)) - target
        if not np.any(resid):
            break
        h = 1e-4
        slope = (_blend_overlaps(rows, T + h, A - B / (T + h + C))
                 - _blend_overlaps(rows, T - h, A - B / (T - h + C))) / (2 * h)
        T = T - resid / slope
    return float(T) if P.ndim == 0 else T


def solvent_constants(name: str) -> SolventConstants:
    """Tabulated constants of a pure solvent (water included).

    Parameters
    ----------
    name : str
        Solvent name or common synonym (``"isopropanol"``, ``"glycerin"`` ...).

    Returns
    -------
    SolventConstants
        Molar mass [kg/mol], melting point [K], enthalpy of fusion [J/mol],
        normal boiling point [K], enthalpy of vaporization at the normal
        boiling point [J/mol], cryoscopic constant Kf and ebullioscopic
        constant Kb [K kg/mol], and the source text. Values that could not be
        sourced are ``None``.

    Raises
    ------
    IngredientError
        For an unknown name (a KeyError), with close matches suggested.

    Examples
    --------
    The CRC Handbook cryoscopic and ebullioscopic constants of water, 1.86 and
    0.513 K kg/mol, follow from the tabulated melting and boiling points and
    enthalpies, K = R T^2 M / Delta H:

    >>> from solutions.colligative import R
    >>> w = solvent_constants("water")
    >>> K_f = R * w.melting_point_K**2 * w.molar_mass_kg_per_mol / w.enthalpy_of_fusion_J_per_mol
    >>> K_b = (R * w.normal_boiling_point_K**2 * w.molar_mass_kg_per_mol
    ...        / w.enthalpy_of_vaporization_J_per_mol)
    >>> round(K_f, 2), round(K_b, 3)
    (1.86, 0.513)
    """
    table = _constants_table()
    key = _normalise(name)
    if key not in table:
        raise _unknown(name, table)
    return table[key]


# --------------------------------------------------------------------------
# Wide-range vapor pressures of pure liquids, keyed by ingredient solute key
# --------------------------------------------------------------------------

class VaporPressureRangeError(OutOfRangeError):
    """Temperature outside the range of a pure liquid's vapor-pressure equation.

    A :class:`ValueError` (through :class:`~solutions.errors.OutOfRangeError`);
    ``key`` names the liquid, ``low``/``high`` [K] give the equation's range.
    """

    def __init__(self, key: str, value: float, low: float, high: float, detail: str = ""):
        self.key = key
        super().__init__(f"temperature for the vapor pressure of {key}", value, low, high,
                         "K", detail)


class VaporPressureExtrapolationWarning(UserWarning):
    """A pure-liquid vapor pressure was evaluated outside its equation's range on request."""


@dataclass(frozen=True)
class _VaporPressureRow:
    key: str
    form: str
    c: tuple[float, ...]
    Tc_K: float | None
    Pc_Pa: float | None
    T_min_K: float
    T_max_K: float
    source: str


# Water's curve comes from solutions.water, not from vapor_pressure.csv: the IAPWS-IF97
# saturation line from the triple point to the critical point, and below the triple point
# the supercooled-liquid equation of Murphy & Koop (2005) down to its 123 K limit.
_WATER_T_TRIPLE = 273.16
_WATER_RANGE = (123.0, 647.096)


@cache
def _vapor_pressure_table() -> dict[str, _VaporPressureRow]:
    out = {}
    for row in _read_csv("vapor_pressure.csv"):
        out[row["key"]] = _VaporPressureRow(
            key=row["key"], form=row["form"],
            c=tuple(float(row[k]) for k in ("C1", "C2", "C3", "C4", "C5") if row[k].strip()),
            Tc_K=_opt(row["Tc_K"]), Pc_Pa=_opt(row["Pc_Pa"]),
            T_min_K=float(row["T_min_K"]), T_max_K=float(row["T_max_K"]), source=row["source"])
    return out


def volatile_keys() -> tuple[str, ...]:
    """Ingredient ``solute`` keys that :func:`pure_vapor_pressure` knows (water included)."""
    return tuple(sorted(("water", *_vapor_pressure_table())))


def _vp_row(key: str) -> _VaporPressureRow:
    table = _vapor_pressure_table()
    if key not in table:
        known = volatile_keys()
        raise IngredientError(str(key), "no pure-liquid vapor pressure for this key (known: "
                              + ", ".join(known) + ")",
                              tuple(difflib.get_close_matches(str(key), known, n=3)))
    return table[key]


def pure_vapor_pressure_range(key: str) -> tuple[float, float]:
    """(T_min, T_max) [K] of the vapor-pressure equation of ``key``."""
    if key == "water":
        return _WATER_RANGE
    r = _vp_row(key)
    return r.T_min_K, r.T_max_K


def pure_vapor_pressure_source(key: str) -> str:
    """Citation of the vapor-pressure equation used for ``key``."""
    if key == "water":
        return ("IAPWS-IF97 saturation line (solutions.water.saturation_pressure), "
                "273.16-647.096 K; below 273.16 K supercooled liquid water, Murphy & Koop (2005) Q. J. R. Meteorol. "
                "Soc. 131, 1539, Eq. (10) (solutions.water.supercooled_vapor_pressure)")
    return _vp_row(key).source


def _evaluate_vp(r: _VaporPressureRow, T):
    if r.form == "dippr101":
        C1, C2, C3, C4, C5 = r.c
        return np.exp(C1 + C2 / T + C3 * np.log(T) + C4 * T**C5)
    if r.form == "wagner25":
        A, B, C, D = r.c
        tau = np.clip(1.0 - T / r.Tc_K, 0.0, None)
        return r.Pc_Pa * np.exp(r.Tc_K / T * (A * tau + B * tau**1.5 + C * tau**2.5 + D * tau**5))
    if r.form == "antoine_ln":
        A, B, C = r.c
        return np.exp(A - B / (T + C))
    raise ValueError(f"unknown vapor-pressure form {r.form!r} for {r.key!r}")


def pure_vapor_pressure(T, key: str, *, extrapolate: bool = False):
    """Vapor pressure of a pure liquid ingredient [Pa] at ``T`` [K].

    Parameters
    ----------
    T : float or array_like
        Temperature [K].
    key : str
        The ingredient's ``solute`` key as in ``ingredients.csv`` (``"ethanol"``,
        ``"2-propanol"``, ``"ethylene glycol"``, ``"dimethyl sulfoxide"`` ...);
        :func:`volatile_keys` lists them. ``"water"`` uses IAPWS-IF97 (supercooled
        liquid below 273.16 K: Murphy & Koop 2005).
    extrapolate : bool, keyword-only
        If False (default) a temperature outside the equation's range raises
        :class:`VaporPressureRangeError`. If True such points are evaluated with the
        same equation and a :class:`VaporPressureExtrapolationWarning` names the
        liquid, the range and the point.

    Returns
    -------
    float or ndarray
        Vapor pressure [Pa], same shape as ``T``.

    Equations (per row of ``solutions/data/vapor_pressure.csv``)
    --------------------------------------------------------------
    ``dippr101``:    ln(P/Pa) = C1 + C2/T + C3 ln T + C4 T^C5   (Perry's Table 2-8)
    ``wagner25``:   ln(P/Pc) = (Tc/T)(A τ + B τ^1.5 + C τ^2.5 + D τ^5), τ = 1 − T/Tc
                     (VDI Heat Atlas D3.1; Poling et al. 2001 Appendix A)
    ``antoine_ln``:  ln(P/Pa) = A − B/(T + C)                    (Landolt-Börnstein IV/20)

    Each is one continuous curve over its range (for the Perry rows: triple point
    to critical point).

    References
    ----------
    Green, D. W.; Perry, R. H. (2008) Perry's Chemical Engineers' Handbook, 8th ed.,
    Table 2-8. VDI Heat Atlas, 2nd ed. (2010), D3.1. Wagner, W.; Pruß, A. (2002) and
    IAPWS-IF97 for water. Per-row citations in the data file.

    Examples
    --------
    Ethanol at its NIST normal boiling point (351.44 K) boils at one atmosphere,
    101.325 kPa, within 0.5 %:

    >>> P = pure_vapor_pressure(351.44, "ethanol")
    >>> bool(abs(P / 101325.0 - 1) < 0.005), round(P / 1000, 1)
    (True, 101.2)
    """
    T = np.asarray(T, dtype=float)
    lo, hi = pure_vapor_pressure_range(key)
    outside = (T < lo) | (T > hi)
    if np.any(outside):
        bad = float(T[outside].flat[0])
        if not extrapolate or key == "water":
            raise VaporPressureRangeError(key, bad, lo, hi,
                                          "the equation's range" + (
                                              "" if key == "water" else
                                              "; pass extrapolate=True to evaluate anyway"))
        warnings.warn(f"vapor pressure of {key} evaluated outside its equation's range "
                      f"[{lo:g}, {hi:g}] K ({int(outside.sum())} point(s), e.g. {bad:g} K)",
                      VaporPressureExtrapolationWarning, stacklevel=2)
    if key == "water":
        from .water import saturation_pressure, supercooled_vapor_pressure
        liquid = T >= _WATER_T_TRIPLE
        P = np.where(liquid, saturation_pressure(np.where(liquid, T, 300.0)),
                     supercooled_vapor_pressure(np.where(liquid, 260.0, T)))
    else:
        P = _evaluate_vp(_vp_row(key), T)
    return float(P) if T.ndim == 0 else P
