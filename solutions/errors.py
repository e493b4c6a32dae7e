"""One error family for the package, and the warning that travels with results.

Every concrete error also subclasses a built-in (``ValueError`` or ``KeyError``)
so callers that do not know this package still catch it, and every error
carries the fields that explain it (row, column, value, allowed range), so the
command line and the dashboard can show *where* the problem is.
"""
from __future__ import annotations

from dataclasses import dataclass, field, replace


class SolutionsError(Exception):
    """Base class of every error this package raises on purpose."""


class OutOfRangeError(SolutionsError, ValueError):
    """A value lies outside the range a function or model is defined on.

    Parameters
    ----------
    quantity : what was out of range, in words (e.g. ``"temperature"``)
    value : the offending value, in the unit named by ``unit``
    low, high : the allowed range (``None`` for an open end)
    unit : unit of ``value``, ``low`` and ``high`` as text (e.g. ``"K"``)
    """

    def __init__(self, quantity: str, value: float, low: float | None,
                 high: float | None, unit: str = "", detail: str = ""):
        self.quantity, self.value, self.low, self.high, self.unit = (
            quantity, value, low, high, unit)
        lo = "-inf" if low is None else f"{low:g}"
        hi = "+inf" if high is None else f"{high:g}"
        u = f" {unit}" if unit else ""
        msg = f"{quantity} {value:g}{u} is outside the range [{lo}, {hi}]{u}"
        if detail:
            msg += f": {detail}"
        super().__init__(msg)


class UnitParseError(SolutionsError, ValueError):
    """An amount or unit string could not be understood."""

    def __init__(self, text: str, reason: str):
        self.text, self.reason = text, reason
        super().__init__(f"cannot read unit {text!r}: {reason}")


class NumberError(SolutionsError, ValueError):
    """A typed number could not be read; ``text`` is what was typed, ``reason`` why not."""

    def __init__(self, text: str, reason: str):
        self.text, self.reason = text, reason
        super().__init__(f"{text!r} {reason}")


class IngredientError(SolutionsError, KeyError):
    """An ingredient is unknown or its library entry is incomplete or invalid."""

    def __init__(self, name: str, reason: str, suggestions: tuple[str, ...] = ()):
        self.name, self.reason, self.suggestions = name, reason, tuple(suggestions)
        msg = f"ingredient {name!r}: {reason}"
        if suggestions:
            msg += " (did you mean: " + ", ".join(suggestions) + "?)"
        super().__init__(msg)

    def __str__(self) -> str:  # KeyError would otherwise repr() the message
        return self.args[0]


class RecipeError(SolutionsError, ValueError):
    """A recipe cannot be resolved; names the row (1-based, as a spreadsheet shows it)."""

    def __init__(self, reason: str, row: int | None = None, column: str | None = None,
                 ingredient: str | None = None):
        self.reason, self.row, self.column, self.ingredient = reason, row, column, ingredient
        where = []
        if row is not None:
            where.append(f"row {row}")
        if ingredient:
            where.append(repr(ingredient))
        if column:
            where.append(f"column {column!r}")
        prefix = (", ".join(where) + ": ") if where else ""
        super().__init__(prefix + reason)


class InputError(SolutionsError, ValueError):
    """A value given to the tool (a target, a setting, an array shape) cannot be used."""


class DataError(SolutionsError, LookupError):
    """The data a computation needs are not in the tool's data files (the message names them)."""


class OptionError(SolutionsError, ValueError):
    """A command-line option or a page setting has a value the tool cannot use."""

    def __init__(self, option: str, value, reason: str):
        self.option, self.value, self.reason = option, value, reason
        super().__init__(f"{option} {value!r}: {reason}")


class TargetError(SolutionsError, ValueError):
    """A design target cannot be reached; carries the nearest reachable value."""

    def __init__(self, reason: str, nearest: float | None = None, unit: str = ""):
        self.reason, self.nearest, self.unit = reason, nearest, unit
        msg = reason
        if nearest is not None:
            msg += f" (nearest reachable: {nearest:.6g}{(' ' + unit) if unit else ''})"
        super().__init__(msg)


@dataclass(frozen=True)
class Caveat:
    """A warning that travels with a result: what, about which component, why.

    ``kind`` is a short machine-readable tag (``"model-range"``, ``"solubility"``,
    ``"eutectic"``, ``"ideal-fallback"``, ``"ice"``, ``"boiling"`` ...); ``about`` says which
    results it bears on: ``"density"`` (density, volume, molarity), ``"activity"``
    (properties at the solution temperature), ``"freezing"``, ``"boiling"``, ``"vapor"``
    (vapor pressure) or ``"recipe"``, or several of them separated by spaces; empty when it
    bears on everything.
    """

    kind: str
    message: str
    component: str | None = None
    extra: dict = field(default_factory=dict, compare=False, hash=False)
    about: str = ""

    def tagged(self, about: str) -> "Caveat":
        """This caveat with ``about`` set, unless it already says what it is about."""
        return self if self.about else replace(self, about=about)

    def to_dict(self) -> dict:
        return {"message": self.message, "kind": self.kind, "component": self.component,
                "about": self.about}

    def __str__(self) -> str:
        return self.message


def caveat_fields(caveats) -> dict:
    """The result envelope's warning fields, both from one list: ``warnings`` (messages)
    and ``warnings_detail`` (kind, component, about), each caveat once."""
    cav = merge_caveats(caveats)
    return {"warnings": [c.message for c in cav], "warnings_detail": [c.to_dict() for c in cav]}


def merge_caveats(caveats) -> list[Caveat]:
    """The caveats in order, each message once."""
    seen, out = set(), []
    for c in caveats:
        if c.message not in seen:
            seen.add(c.message)
            out.append(c)
    return out


_AT = {"boiling": "the boiling point", "freezing": "the freezing point",
       "activity": "the solution's temperature", "vapor": "the solution's temperature"}


def group_outside_temperatures(caveats) -> list[Caveat]:
    """One caveat per component whose data are used outside their temperature span at
    several temperatures (the solution's, its freezing point, its boiling point) instead
    of one per temperature. Such caveats carry ``extra["head"]`` (what the data span) and
    ``extra["outside_K"]`` (the temperature used)."""
    out, groups = [], {}
    for c in caveats:
        x = c.extra or {}
        if c.kind == "model-range" and "outside_K" in x and "head" in x:
            groups.setdefault((c.component, x["head"]), []).append(c)
        else:
            out.append(c)
    for (component, head), cs in groups.items():
        if len(cs) == 1:
            out.append(cs[0])
            continue
        used = [f"{float(c.extra['outside_K']) - 273.15:.4g} °C "
                f"({_AT.get(c.about, 'the temperature used')})" for c in cs]
        listed = ", ".join(used[:-1]) + " and " + used[-1]
        extra = {k: v for k, v in cs[0].extra.items() if k not in ("outside_K",)}
        extra["outside_K"] = [float(c.extra["outside_K"]) for c in cs]
        out.append(Caveat("model-range", f"{head}; used at {listed}: extrapolated",
                          component, extra, about=""))
    return out


def group_temperature_ranges(caveats) -> list[Caveat]:
    """One caveat per temperature instead of one per parameter used outside its temperature
    range (the same fact, many parameters): "at 100.1 °C (the boiling point) the parameters
    of A, B and C are extrapolated"."""
    out, groups = [], {}
    for c in caveats:
        x = c.extra or {}
        if c.kind == "model-range" and x.get("quantity") == "temperature" and \
                x.get("unit") == "K" and "value" in x:
            groups.setdefault((c.about, round(float(x["value"]), 1)), []).append(c)
        else:
            out.append(c)
    for (about, T), cs in groups.items():
        names = list(dict.fromkeys(c.component or "?" for c in cs))
        if len(names) == 1:
            out.append(cs[0])
            continue
        where = _AT.get(about, "the temperature used")
        out.append(Caveat(
            "model-range", f"at {float(cs[0].extra['value']) - 273.15:.4g} °C ({where}) the "
            "parameters of "
            f"{', '.join(names[:-1])} and {names[-1]} are used outside the temperature ranges "
            "their sources state: extrapolated", ", ".join(names),
            {"quantity": "temperature", "value": T, "unit": "K", "parameters": names},
            about=about))
    return out
