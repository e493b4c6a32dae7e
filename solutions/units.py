"""Units at the edge: the closed vocabulary of what a chemist types, and the one number reader.

A recipe amount is a number and a *unit text*. Every unit text the tool accepts is listed,
with its meaning, in ``solutions/data/vocabulary.csv``; anything else is refused with the
nearest listed spellings. Nothing is handed to a general-purpose unit library to guess, so
``gr`` is never grains, ``g%`` is the clinical grams per 100 mL, ``ppt`` and ``%`` alone are
refused as ambiguous, and ``MM``/``ML``/``Mg`` are refused with what was probably meant.

Some unit texts are true units (``g``, ``mL``, ``mmol``, ``mg/mL``, ``mM``, ``mol/kg``); others
name a concentration *basis* (``% w/w``, ``% w/v``, ``% v/v``, ``ppm``) or the solvent rule
(``q.s.``, ``balance``). :func:`parse_unit` turns either into an :class:`Amount` carrying an
explicit :class:`Basis` and an SI factor, so physics code never sees a unit string.
:func:`parse_temperature` and :func:`parse_pressure` read options such as ``4 °C`` or
``2.5 barg`` the same way. :func:`read_number` is the only way a typed number is read.

SI inside: kg, m³, mol, mol/m³, mol/kg, kg/m³, K, Pa.
"""
from __future__ import annotations

import csv
import difflib
import enum
import math
import re
from dataclasses import dataclass
from functools import cache
from importlib import resources

from .constants import P_ATM
from .errors import NumberError, UnitParseError

__all__ = ["Basis", "Amount", "parse_unit", "is_solvent_rule", "read_number",
           "parse_temperature", "parse_pressure", "vocabulary", "MAX_UNIT_LENGTH"]

#: unit texts longer than this are refused at once (no unit spelling is near it)
MAX_UNIT_LENGTH = 40
#: densities a liquid (a solution or a pure liquid) can have here [g/mL]; a value 1000×
#: inside this range was typed in kg/m³
LIQUID_DENSITY_G_PER_ML = (0.5, 3.0)


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


_BASIS_OF = {"mass": Basis.MASS, "volume": Basis.VOLUME, "amount": Basis.AMOUNT,
             "mass_fraction": Basis.MASS_FRACTION, "mass_per_volume": Basis.MASS_PER_VOLUME,
             "volume_fraction": Basis.VOLUME_FRACTION, "molarity": Basis.MOLARITY,
             "molality": Basis.MOLALITY}


@dataclass(frozen=True)
class Spelling:
    """One line of the vocabulary."""

    text: str
    quantity: str
    factor: float
    offset: float
    gauge: bool
    exact_case: bool
    note: str


@cache
def vocabulary() -> tuple[Spelling, ...]:
    """Every accepted (and every knowingly refused) unit spelling, from vocabulary.csv."""
    path = resources.files("solutions.data") / "vocabulary.csv"
    with path.open(encoding="utf-8", newline="") as fh:
        lines = [ln for ln in fh if not ln.startswith("#")]
    out = []
    for r in csv.DictReader(lines):
        refused = r["quantity"] == "refused"
        out.append(Spelling(_squash(r["spelling"]), r["quantity"],
                            0.0 if refused else float(r["factor_si"]),
                            0.0 if refused else float(r["offset"]),
                            (not refused) and r["gauge"] == "1", r["case"] == "exact", r["note"]))
    return tuple(out)


@cache
def _index(context: str) -> tuple[dict[str, Spelling], dict[str, list[Spelling]]]:
    """(exact spelling → entry, lower-case spelling → entries matched regardless of case)."""
    wanted = {"amount": set(_BASIS_OF) | {"refused"}, "temperature": {"temperature"},
              "pressure": {"pressure"}}[context]
    exact: dict[str, Spelling] = {}
    loose: dict[str, list[Spelling]] = {}
    for s in vocabulary():
        if s.quantity not in wanted:
            continue
        exact[s.text] = s
        if not s.exact_case:
            loose.setdefault(s.text.lower(), []).append(s)
    return exact, loose


def _squash(text: str) -> str:
    """Spaces out, one micro sign, plain digits: the form spellings are compared in."""
    t = str(text).strip().replace("μ", "µ").replace("³", "3").replace("·", "")
    return re.sub(r"\s+", "", t)


def _lookup(text: str, context: str) -> Spelling:
    raw = "" if text is None else str(text)
    if len(raw) > MAX_UNIT_LENGTH:
        raise UnitParseError(raw[:MAX_UNIT_LENGTH] + "…", f"a unit is at most {MAX_UNIT_LENGTH} "
                             "characters; write e.g. g, mL, % w/v, mM or mol/kg")
    t = _squash(raw)
    exact, loose = _index(context)
    candidates = [t]
    if re.match(r"^u[a-zA-Z]", t):                      # ug, uL, umol, uM: micro
        candidates.append("µ" + t[1:])
    if "/u" in t:
        candidates.append(t.replace("/u", "/µ"))
    for c in candidates:
        if c in exact:
            return exact[c]
    for c in candidates:
        hits = loose.get(c.lower(), [])
        if len(hits) == 1:
            return hits[0]
    names = sorted({s.text for s in exact.values() if s.quantity != "refused"})
    close = difflib.get_close_matches(t, names, n=4, cutoff=0.5) or \
        difflib.get_close_matches(t.lower(), [n.lower() for n in names], n=4, cutoff=0.5)
    shown = [next(n for n in names if n.lower() == c.lower()) for c in close]
    hint = ("; did you mean " + " or ".join(repr(s) for s in shown) + "?") if shown else ""
    kind = {"amount": "recipe unit", "temperature": "temperature unit",
            "pressure": "pressure unit"}[context]
    raise UnitParseError(raw, f"not a {kind} this tool reads{hint} (the accepted spellings "
                              "are listed in the README)")


_QS_WORDS = ("q.s.", "qs", "q.s", "qsad", "q.s.ad", "qsto", "q.s.to")
_BALANCE_WORDS = ("balance", "bal", "bal.", "rest", "remainder", "to100%")


def is_solvent_rule(text: str) -> bool:
    """True when an amount cell reads like q.s. or balance (e.g. ``"q.s. to 1000"``)."""
    t = re.sub(r"\s+", "", str(text).strip().lower())
    return t.startswith(_QS_WORDS) or t in _BALANCE_WORDS or t.startswith("balance")


def parse_unit(text: str, *, solvent_rule: bool = False) -> Amount:
    """Parse a unit text into an :class:`Amount` per unit of the typed number.

    ``solvent_rule`` says the amount cell read q.s./balance, so a mass or volume unit
    means "q.s. to that mass/volume" and a percent by mass means "balance".

    >>> parse_unit("% w/v").basis, parse_unit("% w/v").value_si
    (<Basis.MASS_PER_VOLUME: 'mass/volume'>, 10.0)
    >>> round(parse_unit("mM").value_si, 12)  # mol/m³
    1.0
    >>> parse_unit("g%").basis   # clinical grams per 100 mL
    <Basis.MASS_PER_VOLUME: 'mass/volume'>
    """
    raw = str(text) if text is not None else ""
    if not _squash(raw):
        if solvent_rule:
            return Amount(Basis.BALANCE, 1.0, raw)
        raise UnitParseError(raw, "the unit is empty; write e.g. g, mL, % w/v, mM or mol/kg")
    s = _lookup(raw, "amount")
    if s.quantity == "refused":
        raise UnitParseError(raw, s.note)
    basis = _BASIS_OF[s.quantity]
    if solvent_rule:
        if basis is Basis.MASS_FRACTION and s.factor == 1e-2:
            return Amount(Basis.BALANCE, 1.0, raw)
        if basis is Basis.MASS:
            return Amount(Basis.QS_MASS, s.factor, raw)
        if basis is Basis.VOLUME:
            return Amount(Basis.QS_VOLUME, s.factor, raw)
        raise UnitParseError(raw, "q.s. needs a final mass or volume unit (g, kg, mL, L); "
                                  "balance fills to 100 % w/w")
    return Amount(basis, s.factor, raw)


# ------------------------------------------------------------------------------ numbers
_NUMBER = re.compile(r"^[+-]?(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?$")
_MAX_NUMBER_TEXT = 40


def read_number(cell, *, decimal: str = ".") -> float | None:
    """The one reader of a typed number: a finite float, or ``None`` for an empty cell.

    ``decimal`` is the decimal mark the user chose (``"."`` or ``","``). Grouping
    separators are never guessed: ``1,000`` with a decimal point and ``1.000`` with a
    decimal comma are refused, as are NaN, inf, spaces inside a number and words. Raises
    :class:`~solutions.errors.NumberError` (a ``ValueError``) whose ``reason`` says why.

    >>> read_number("0,9", decimal=","), read_number("1e-3"), read_number(" ")
    (0.9, 0.001, None)
    """
    if cell is None or isinstance(cell, bool):
        if isinstance(cell, bool):
            raise NumberError(str(cell), "is not a number")
        return None
    if isinstance(cell, (int, float)) or type(cell).__module__ == "numpy":
        try:
            x = float(cell)
        except (TypeError, ValueError):
            raise NumberError(str(cell), "is not a number") from None
        if math.isnan(x):
            return None  # an empty spreadsheet cell arrives as NaN
        if not math.isfinite(x):
            raise NumberError(str(cell), "is not a finite number")
        return x
    t = str(cell).strip().replace("\u2212", "-").replace("\u2009", " ")
    if not t:
        return None
    if len(t) > _MAX_NUMBER_TEXT:
        raise NumberError(t[:_MAX_NUMBER_TEXT] + "…", "is not a number (too long)")
    if t.lower().lstrip("+-") in ("nan", "inf", "infinity", "na", "n/a", "none", "null"):
        raise NumberError(t, "is not a number")
    if " " in t:
        raise NumberError(t, "has a space inside; write the number without grouping spaces")
    if decimal == ",":
        if "." in t:
            raise NumberError(t, "has a '.' although decimals are read with a comma; write "
                                 "decimals as 0,9 and no thousands separators")
        t = t.replace(",", ".", 1) if t.count(",") == 1 else t
    elif "," in t:
        if re.fullmatch(r"[+-]?[0-9]{1,3},[0-9]{3}", t):
            raise NumberError(t, "is ambiguous: a thousands separator or a decimal comma? "
                                 "write it without thousands separators (e.g. 1000), or choose "
                                 "decimal comma (the dashboard's 'decimal comma' box or "
                                 "--decimal-comma)")
        if re.fullmatch(r"[+-]?[0-9]+,[0-9]+", t):
            raise NumberError(t, "looks like a decimal comma; choose decimal comma "
                                 "(the dashboard's 'decimal comma' box or --decimal-comma), "
                                 "or write a point")
        raise NumberError(t, "has a comma; write numbers without thousands separators")
    if not _NUMBER.match(t):
        raise NumberError(t, "is not a number")
    x = float(t)
    if not math.isfinite(x):
        raise NumberError(t, "is not a finite number")
    return x


_NUM_THEN_UNIT = re.compile(r"^\s*(?P<num>[-+\u2212]?[0-9.,]*[0-9](?:[eE][-+]?[0-9]+)?)\s*"
                            r"(?P<unit>.*?)\s*$")


def _split(text: str, default_unit: str) -> tuple[float, str]:
    m = _NUM_THEN_UNIT.match(str(text))
    if not m:
        raise UnitParseError(str(text), f"write a number and a unit, e.g. '25 {default_unit}'")
    x = read_number(m.group("num"))
    return x, m.group("unit") or default_unit


def parse_temperature(text, *, default_unit: str = "°C") -> float:
    """A typed temperature (``25``, ``25 °C``, ``298.15 K``, ``77 °F``) in kelvin.

    A bare number is in ``default_unit``. Refuses temperatures at or below absolute zero.

    >>> parse_temperature("4 °C"), parse_temperature("32 F"), parse_temperature("300 K")
    (277.15, 273.15, 300.0)
    """
    if isinstance(text, (int, float)) and not isinstance(text, bool):
        x, unit = read_number(text), default_unit
    else:
        x, unit = _split(text, default_unit)
    s = _lookup(unit, "temperature")
    T = x * s.factor + s.offset
    if not (T > 0.0):
        raise UnitParseError(str(text), "a temperature must be above absolute zero "
                                        "(−273.15 °C, 0 K)")
    return round(T, 10)


def parse_pressure(text, *, default_unit: str = "kPa", ambient: float = P_ATM) -> float:
    """A typed pressure in Pa, absolute. Gauge spellings (``barg``, ``psig``, ``kPag``) add
    ``ambient`` [Pa]; every other spelling is absolute. A bare number is in ``default_unit``.

    >>> parse_pressure("1 atm"), parse_pressure("0 barg"), parse_pressure("100")
    (101325.0, 101325.0, 100000.0)
    """
    if isinstance(text, (int, float)) and not isinstance(text, bool):
        x, unit = read_number(text), default_unit
    else:
        x, unit = _split(text, default_unit)
    s = _lookup(unit, "pressure")
    P = x * s.factor + (ambient if s.gauge else 0.0)
    if not (P > 0.0) or not math.isfinite(P):
        raise UnitParseError(str(text), "an absolute pressure must be positive"
                                        + (" (a gauge pressure below −1 atm cannot exist)"
                                           if s.gauge else ""))
    return P
