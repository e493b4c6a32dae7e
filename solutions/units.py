"""Units at the edge: the package's one pint registry and the parser for what a chemist types.

A recipe amount is a number and a *unit text*. Some unit texts are true units (``g``,
``mL``, ``mmol``, ``mg/mL``, ``mM``, ``mol/kg``); others name a concentration *basis*
that pint cannot express (``% w/w``, ``% w/v``, ``% v/v``, ``ppm``) or the solvent rule
(``q.s.``, ``balance``). :func:`parse_unit` turns either into an :class:`Amount`
carrying an explicit :class:`Basis` and an SI factor, so physics code never sees a
unit string.

SI inside: kg, m³, mol, mol/m³, mol/kg, kg/m³.
"""
from __future__ import annotations

import enum
import re
from dataclasses import dataclass
from functools import cache
from importlib import resources

import pint

from .errors import UnitParseError

__all__ = ["ureg", "Q_", "Basis", "Amount", "parse_unit", "is_solvent_rule"]


@cache
def _registry() -> pint.UnitRegistry:
    reg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    reg.load_definitions(str(resources.files("solutions.data") / "units.txt"))
    return reg


ureg: pint.UnitRegistry = _registry()
Q_ = ureg.Quantity


class Basis(enum.Enum):
    """How a recipe row states its quantity. The SI value of an :class:`Amount` is in the
    unit given in brackets."""

    MASS = "mass"                      # [kg] of the ingredient as weighed
    VOLUME = "volume"                  # [m³] of the pure (liquid) ingredient
    AMOUNT = "amount"                  # [mol]
    MASS_FRACTION = "mass fraction"    # [1] of the whole solution (% w/w, ppm)
    MASS_PER_VOLUME = "mass/volume"    # [kg/m³] of solution (% w/v, mg/mL, g/L)
    VOLUME_FRACTION = "volume fraction"  # [1] pure-ingredient volume per solution volume (% v/v)
    MOLARITY = "molarity"              # [mol/m³] of solution
    MOLALITY = "molality"              # [mol/kg] of solvent
    QS_VOLUME = "q.s. to volume"       # [m³] final solution volume
    QS_MASS = "q.s. to mass"           # [kg] final solution mass
    BALANCE = "balance"                # solvent makes up the rest to 100 % w/w

    @property
    def is_solvent_rule(self) -> bool:
        return self in (Basis.QS_VOLUME, Basis.QS_MASS, Basis.BALANCE)


@dataclass(frozen=True)
class Amount:
    """A parsed amount: ``value_si`` in the SI unit of ``basis`` (see :class:`Basis`)."""

    basis: Basis
    value_si: float
    text: str  # the unit text as typed, for messages and for writing the recipe back


_SPACES = re.compile(r"\s+")

# Concentration bases written as percent or parts-per: pure numbers to pint, so ours.
_PERCENT_BASES = {
    "%w/w": Basis.MASS_FRACTION, "%wt": Basis.MASS_FRACTION, "wt%": Basis.MASS_FRACTION,
    "w/w%": Basis.MASS_FRACTION, "%(w/w)": Basis.MASS_FRACTION, "%m/m": Basis.MASS_FRACTION,
    "%": Basis.MASS_FRACTION, "mass%": Basis.MASS_FRACTION,
    "%w/v": Basis.MASS_PER_VOLUME, "w/v%": Basis.MASS_PER_VOLUME, "%(w/v)": Basis.MASS_PER_VOLUME,
    "%m/v": Basis.MASS_PER_VOLUME,
    "%v/v": Basis.VOLUME_FRACTION, "v/v%": Basis.VOLUME_FRACTION, "%(v/v)": Basis.VOLUME_FRACTION,
    "vol%": Basis.VOLUME_FRACTION,
}
# factor to SI for each percent-like basis: % w/v is g per 100 mL = 10 kg/m³
_PERCENT_FACTOR = {Basis.MASS_FRACTION: 1e-2, Basis.MASS_PER_VOLUME: 10.0,
                   Basis.VOLUME_FRACTION: 1e-2}
_PARTS = {"ppm": 1e-6, "ppmw": 1e-6, "ppm(w/w)": 1e-6, "ppmw/w": 1e-6, "ppb": 1e-9}

_QS_WORDS = ("q.s.", "qs", "q.s", "qsad", "q.s.ad", "qsto", "q.s.to")
_BALANCE_WORDS = ("balance", "bal", "bal.", "rest", "remainder", "to100%")

# Unit spellings a chemist types that pint reads differently or not at all.
_ALIASES = {
    "m": "molal", "molal": "molal",            # 'm' in a recipe is molal, never metre
    "mm": "mmol/kg",                            # lower-case mm: millimolal
    "cc": "mL", "ul": "µL", "ug": "µg", "um": "µM", "mcg": "µg",
    "lit": "L", "litre": "L", "liter": "L", "litres": "L", "liters": "L",
}

_DIMENSION_BASIS = {
    "[mass]": Basis.MASS,
    "[length] ** 3": Basis.VOLUME,
    "[substance]": Basis.AMOUNT,
    "[mass] / [length] ** 3": Basis.MASS_PER_VOLUME,
    "[substance] / [length] ** 3": Basis.MOLARITY,
    "[substance] / [mass]": Basis.MOLALITY,
}


def is_solvent_rule(text: str) -> bool:
    """True when an amount cell reads like q.s. or balance (e.g. ``"q.s. to 1000"``)."""
    t = _SPACES.sub("", str(text).strip().lower())
    return t.startswith(_QS_WORDS) or t in _BALANCE_WORDS or t.startswith("balance")


def _normalise(text: str) -> str:
    t = str(text).strip().replace("μ", "µ").replace("·", "*")
    return _SPACES.sub("", t)


def parse_unit(text: str, *, solvent_rule: bool = False) -> Amount:
    """Parse a unit text into an :class:`Amount` per unit of the typed number.

    ``solvent_rule`` says the amount cell read q.s./balance, so a mass or volume unit
    means "q.s. to that mass/volume" and a percent means "balance".

    >>> parse_unit("% w/v").basis, parse_unit("% w/v").value_si
    (<Basis.MASS_PER_VOLUME: 'mass/volume'>, 10.0)
    >>> round(parse_unit("mM").value_si, 12)  # mol/m³
    1.0
    """
    raw = str(text) if text is not None else ""
    t = _normalise(raw)
    low = t.lower()
    if not t:
        if solvent_rule:
            return Amount(Basis.BALANCE, 1.0, raw)
        raise UnitParseError(raw, "the unit is empty; write e.g. g, mL, % w/v, mM or mol/kg")
    if low in _PERCENT_BASES:
        basis = _PERCENT_BASES[low]
        if solvent_rule:
            if basis is not Basis.MASS_FRACTION:
                raise UnitParseError(raw, "balance can only fill to 100 % w/w")
            return Amount(Basis.BALANCE, 1.0, raw)
        return Amount(basis, _PERCENT_FACTOR[basis], raw)
    if low in _PARTS:
        return Amount(Basis.MASS_FRACTION, _PARTS[low], raw)
    if low in ("mol/l", "m(mol/l)"):
        t = "mol/L"
    unit_text = _ALIASES.get(low, _ALIASES.get(t, t))
    if t == "M":  # upper-case M is molar; pint agrees, but keep it explicit
        unit_text = "mol/L"
    if t == "mM":
        unit_text = "mmol/L"
    if t in ("µM", "uM"):
        unit_text = "µmol/L"
    try:
        q = ureg.Quantity(1.0, unit_text)
    except (pint.errors.PintError, AttributeError, TypeError, ValueError, SyntaxError) as exc:
        raise UnitParseError(raw, "unknown unit; use g, mg, kg, µg, mL, L, µL, mol, mmol, "
                                  "µmol, % w/w, % w/v, % v/v, ppm, mg/mL, g/L, M, mM, µM, "
                                  "mol/L or mol/kg") from exc
    dim = str(q.dimensionality)
    basis = _DIMENSION_BASIS.get(dim)
    if basis is None:
        raise UnitParseError(raw, f"a unit of {dim} is not a recipe amount")
    value_si = float(q.to_base_units().magnitude)
    if solvent_rule:
        if basis is Basis.MASS:
            return Amount(Basis.QS_MASS, value_si, raw)
        if basis is Basis.VOLUME:
            return Amount(Basis.QS_VOLUME, value_si, raw)
        raise UnitParseError(raw, "q.s. needs a final mass or volume unit (g, kg, mL, L)")
    return Amount(basis, value_si, raw)
