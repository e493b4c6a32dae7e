"""Non-aqueous solvents: Antoine vapor pressure and tabulated solvent constants.

Data files (loaded once, on first use):

* ``solutions/data/solvents.csv``: Antoine coefficients in the NIST Chemistry
  WebBook form log10(P/bar) = A - B / (T/K + C), one row per fitted
  temperature range (a solvent may have several rows);
* ``solutions/data/solvent_constants.csv``: molar mass, melting and normal
  boiling points, enthalpies of fusion and vaporization, and the cryoscopic
  and ebullioscopic constants Kf, Kb, each row with its source.
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
            Tmin_K=float(row["Tmin_K"]), Tmax_K=float(row["Tmax_K"]), source=row["source"]))
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
    """
    rows = antoine_coefficients(solvent)
    name = rows[0].solvent
    T = np.asarray(T, dtype=float)
    A, B, C, inside = _pick_rows(rows, T, extrapolate, name, "temperature",
                                 lambda r: (r.Tmin_K, r.Tmax_K), "K")
    P = _BAR * 10.0**(A - B / (T + C))
    return float(P) if T.ndim == 0 else P


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
    """
    table = _constants_table()
    key = _normalise(name)
    if key not in table:
        raise _unknown(name, table)
    return table[key]
