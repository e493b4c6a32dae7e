"""Flammability data of pure volatile ingredients: closed-cup flash point and the lower
(and upper) flammability limit in air.

Data: ``solutions/data/flammability.csv``, one row per ingredient ``solute`` key (as in
``ingredients.csv``), each with its source (NFPA 497, IEC 60079-20-1; values recalled
from memory are marked so). Limits are volume fractions of vapor in air at about 25 °C
and 101.325 kPa.

These are the pure liquids' values. A mixture's flash point follows from them with a
vapor-liquid model (Le Chatelier's rule on the partial pressures at the flash point);
any such estimate, and these data themselves, carry the caution that flash points are
measured by a standard closed-cup method (ASTM D56/D93, ISO 2719/3679) and that the
classification of a liquid for storage and transport follows the measured value and
the local code, not a calculation.

References
----------
NFPA 497 (2008) Recommended Practice for the Classification of Flammable Liquids, Gases,
or Vapors. IEC 60079-20-1 (2010) Explosive atmospheres – Material characteristics for
gas and vapour classification.
"""
from __future__ import annotations

import csv
import difflib
from dataclasses import dataclass
from functools import cache
from importlib import resources

from .errors import SolutionsError

__all__ = ["FlammabilityDataError", "FlammabilityData", "flammability_data",
           "flammable_keys", "flash_point_pure", "lower_flammability_limit", "FLASH_POINT_CAUTION"]

FLASH_POINT_CAUTION = (
    "Flash points and flammability limits here are handbook values or estimates; "
    "classify and store flammable liquids by a measured closed-cup flash point "
    "(ASTM D56/D93, ISO 2719/3679) and the local fire code.")


class FlammabilityDataError(SolutionsError, KeyError):
    """No sourced flammability value for an ingredient (``key``, ``quantity``)."""

    def __init__(self, key: str, quantity: str, reason: str, suggestions: tuple[str, ...] = ()):
        self.key, self.quantity, self.suggestions = key, quantity, tuple(suggestions)
        msg = f"{quantity} of {key!r}: {reason}"
        if suggestions:
            msg += " (did you mean: " + ", ".join(suggestions) + "?)"
        super().__init__(msg)

    def __str__(self) -> str:  # KeyError would otherwise repr() the message
        return self.args[0]


@dataclass(frozen=True)
class FlammabilityData:
    """One row: flash point [K], LFL and UFL [volume fraction], reference T [K], source."""

    key: str
    cas: str
    flash_point_K: float | None
    LFL: float | None
    UFL: float | None
    T_ref_K: float
    source: str


def _opt(text: str) -> float | None:
    text = (text or "").strip()
    return float(text) if text else None


@cache
def _table() -> dict[str, FlammabilityData]:
    with (resources.files("solutions.data") / "flammability.csv").open(
            encoding="utf-8", newline="") as fh:
        rows = list(csv.DictReader(fh))
    return {r["key"]: FlammabilityData(
        key=r["key"], cas=r["cas"], flash_point_K=_opt(r["flash_point_closed_cup_K"]),
        LFL=_opt(r["LFL_vol_fraction"]), UFL=_opt(r["UFL_vol_fraction"]),
        T_ref_K=float(r["T_ref_K"]), source=r["source"]) for r in rows}


def flammable_keys() -> tuple[str, ...]:
    """Ingredient keys with a flammability row."""
    return tuple(sorted(_table()))


def flammability_data(key: str) -> FlammabilityData:
    """The whole row for ``key`` (raises :class:`FlammabilityDataError`, a KeyError)."""
    table = _table()
    if key not in table:
        raise FlammabilityDataError(key, "flammability data", "no row in flammability.csv",
                                    tuple(difflib.get_close_matches(str(key), table, n=3)))
    return table[key]


def flash_point_pure(key: str) -> float:
    """Closed-cup flash point of the pure liquid ``key`` [K].

    Raises :class:`FlammabilityDataError` (a KeyError) when no sourced value exists.

    >>> flash_point_pure("ethanol") - 273.15   # NFPA 497: 13 °C
    13.0
    """
    row = flammability_data(key)
    if row.flash_point_K is None:
        raise FlammabilityDataError(key, "flash point", "not sourced (see flammability.csv)")
    return row.flash_point_K


def lower_flammability_limit(key: str) -> float:
    """Lower flammability limit of the vapor of ``key`` in air [volume fraction, 0–1],
    near 25 °C and 101.325 kPa.

    Raises :class:`FlammabilityDataError` (a KeyError) when no sourced value exists.

    >>> lower_flammability_limit("2-propanol")  # NFPA 497: 2.0 vol %
    0.02
    """
    row = flammability_data(key)
    if row.LFL is None:
        raise FlammabilityDataError(key, "lower flammability limit",
                                    "not sourced (see flammability.csv)")
    return row.LFL
