"""Henry's constants of gases in water: IAPWS Guideline G7-04 (2004).

IAPWS, "Guideline on the Henry's Constant and Vapor-Liquid Distribution Constant for Gases
in H2O and D2O at High Temperatures" (Kyoto, 2004), based on R. Fernández-Prini, J. L. Alvarez
and A. H. Harvey, J. Phys. Chem. Ref. Data 32, 903 (2003). Only the H2O part is implemented.

The Henry's constant is defined by the fugacity of the dissolved gas, k_H = lim f2/x2
(x2 → 0), at the saturation pressure of the solvent, and correlated as (guideline eq. 3)

    ln(k_H / p1*) = A/T_R + B τ^0.355 / T_R + C T_R^−0.41 e^τ,   T_R = T/T_c,  τ = 1 − T_R,

with p1* the vapor pressure of water from the guideline's eq. 4 (the six-term equation of
Wagner & Pruß (1993), IAPWS supplementary release on saturation properties),

    ln(p1*/p_c) = T_R^−1 Σ a_i τ^b_i.

A, B, C and each gas's temperature range (the range of the data fitted) are in
``solutions/data/iapws_henry.csv`` (guideline Table 2); the verification values of the
guideline (ln(k_H/1 GPa) at 300, 400, 500, 600 K) are tests in ``tests/test_gas_henry.py``.

Range: the guideline's stated range per gas (e.g. CO2 274.19–642.66 K). Fillers and cold
rooms run at 0–4 °C, a little below some stated ranges: down to 273.15 K the equation is used
with a :class:`~solutions.errors.Caveat` naming the stated range; below 273.15 K or above the
stated upper limit it is refused (:class:`GasRangeError`).
"""
from __future__ import annotations

import csv
import difflib
from dataclasses import dataclass
from functools import cache
from importlib import resources

import numpy as np

from ..constants import P_CRIT, T_CRIT, T_ZERO_C
from ..errors import Caveat, OutOfRangeError, SolutionsError

__all__ = ["Gas", "gases", "get_gas", "henry_constant", "vapor_pressure_g704",
           "temperature_caveats", "check_temperature", "UnknownGasError", "GasRangeError",
           "T_LOWEST"]

#: lowest temperature at which the equation is used at all [K] (0 °C; below the stated
#: range of most gases, with a caveat)
T_LOWEST = T_ZERO_C

#: guideline eq. 4 (Wagner & Pruß 1993 saturation-pressure equation): a_i, b_i
_A_I = (-7.85951783, 1.84408259, -11.7866497, 22.6807411, -15.9618719, 1.80122502)
_B_I = (1.0, 1.5, 3.0, 3.5, 4.0, 7.5)


class UnknownGasError(SolutionsError, KeyError):
    """A gas name that the Henry's-constant table does not hold; lists the known ones."""

    def __init__(self, name: str, known: tuple[str, ...], suggestions: tuple[str, ...] = ()):
        self.name, self.known, self.suggestions = name, known, suggestions
        msg = f"unknown gas {name!r}"
        if suggestions:
            msg += " (did you mean " + " or ".join(suggestions) + "?)"
        msg += "; known gases: " + ", ".join(known)
        super().__init__(msg)

    def __str__(self) -> str:
        return self.args[0]


class GasRangeError(OutOfRangeError):
    """A temperature or pressure outside what the gas-solubility model accepts."""


@dataclass(frozen=True)
class Gas:
    """One gas of guideline Table 2.

    A, B, C : coefficients of guideline eq. 3 [1]
    T_min, T_max : range of the data fitted [K]
    M : molar mass [kg/mol] (from the formula)
    """

    key: str
    formula: str
    name: str
    synonyms: tuple[str, ...]
    A: float
    B: float
    C: float
    T_min: float
    T_max: float
    M: float
    source: str


def _norm(s: str) -> str:
    return "".join(str(s).strip().lower().replace("_", "-").split())


@cache
def gases() -> dict[str, Gas]:
    """Every gas of the table, by key."""
    from ..ingredients import molar_mass_from_formula
    path = resources.files("solutions.data") / "iapws_henry.csv"
    with path.open(encoding="utf-8", newline="") as fh:
        rows = list(csv.DictReader(ln for ln in fh if not ln.startswith("#")))
    out = {}
    for r in rows:
        out[r["key"]] = Gas(r["key"], r["formula"], r["name"],
                            tuple(s for s in r["synonyms"].split("|") if s),
                            float(r["A"]), float(r["B"]), float(r["C"]),
                            float(r["T_min_K"]), float(r["T_max_K"]),
                            molar_mass_from_formula(r["formula"]), r["source"])
    return out


@cache
def _aliases() -> dict[str, str]:
    out = {}
    for g in gases().values():
        for s in (g.key, g.name, g.formula, *g.synonyms):
            out[_norm(s)] = g.key
    return out


def get_gas(name: str | Gas) -> Gas:
    """The gas called ``name`` (key, name, formula or synonym; case and spaces ignored).

    >>> get_gas("CO2").key, get_gas("Carbon Dioxide").formula
    ('carbon-dioxide', 'CO2')
    """
    if isinstance(name, Gas):
        return name
    key = _aliases().get(_norm(name))
    if key is None:
        known = tuple(gases())
        close = tuple(difflib.get_close_matches(_norm(name), list(_aliases()), n=3, cutoff=0.6))
        raise UnknownGasError(str(name), known, tuple(dict.fromkeys(_aliases()[c] for c in close)))
    return gases()[key]


def vapor_pressure_g704(T):
    """Vapor pressure of water as guideline G7-04 computes it (its eq. 4) [Pa].

    T : temperature [K], 273.15 ≤ T ≤ 647.096 (not checked here; callers check).

    ln(p1*/p_c) = T_R^−1 Σ a_i τ^b_i with T_R = T/T_c, τ = 1 − T_R (Wagner & Pruß 1993).
    It agrees with IAPWS-IF97's saturation line within 0.02 % from 0 to 100 °C (tested).
    """
    T = np.asarray(T, dtype=float)
    Tr = T / T_CRIT
    tau = 1.0 - Tr
    s = sum(a * tau ** b for a, b in zip(_A_I, _B_I))
    return P_CRIT * np.exp(s / Tr)


def check_temperature(T, gas: str | Gas) -> None:
    """Refuse temperatures [K] below 273.15 K or above the gas's stated upper limit."""
    g = get_gas(gas)
    T = np.atleast_1d(np.asarray(T, dtype=float))
    bad = ~((T >= T_LOWEST - 1e-9) & (T <= g.T_max))
    if np.any(bad):
        t = float(T[np.argmax(bad)])
        raise GasRangeError(
            f"temperature for {g.name} in water", t - T_ZERO_C, T_LOWEST - T_ZERO_C,
            g.T_max - T_ZERO_C, "°C",
            f"IAPWS G7-04 states {g.T_min - T_ZERO_C:.2f}…{g.T_max - T_ZERO_C:.2f} °C for "
            f"{g.formula}; it is used down to 0 °C with a warning, not beyond")


def temperature_caveats(T, gas: str | Gas) -> list[Caveat]:
    """A caveat when some T [K] lies below the guideline's stated range (but ≥ 0 °C)."""
    g = get_gas(gas)
    T = np.atleast_1d(np.asarray(T, dtype=float))
    low = T < g.T_min - 1e-9
    if not np.any(low):
        return []
    t = float(T[low].min())
    return [Caveat("model-range",
                   f"Henry's constant of {g.name}: {t - T_ZERO_C:.4g} °C is below the range "
                   f"IAPWS G7-04 states for {g.formula} ({g.T_min - T_ZERO_C:.2f}–"
                   f"{g.T_max - T_ZERO_C:.2f} °C); its equation is extrapolated (by at most "
                   f"{g.T_min - T_ZERO_C:.2f} K)", g.name, about="gas")]


def henry_constant(T, gas: str | Gas, *, check: bool = True):
    """Henry's constant k_H of ``gas`` in pure water at T [Pa], IAPWS G7-04 eq. 3.

    T : temperature [K], broadcast; 273.15 K ≤ T ≤ the gas's T_max (else GasRangeError).
    gas : key, name or formula (see :func:`gases`).
    check : refuse temperatures outside 273.15 K … T_max (``False`` only to reproduce the
        guideline's verification table, which goes to 600 K for every gas).

    k_H = lim f2/x2 at the saturation pressure of water; x2 = f2/k_H for a dilute gas.
    Below the stated T_min (down to 0 °C) the equation is extrapolated; callers attach
    :func:`temperature_caveats`.

    >>> round(float(np.log(henry_constant(300.0, "CO2") / 1e9)), 4)   # guideline: -1.7508
    -1.7508
    """
    g = get_gas(gas)
    if check:
        check_temperature(T, g)
    T = np.asarray(T, dtype=float)
    Tr = T / T_CRIT
    tau = 1.0 - Tr
    ln_k = g.A / Tr + g.B * tau ** 0.355 / Tr + g.C * Tr ** -0.41 * np.exp(tau)
    out = vapor_pressure_g704(T) * np.exp(ln_k)
    return float(out) if out.ndim == 0 else out
