"""The one list of solution properties: every output surface and the target solver read it.

Each :class:`Property` row says where the value comes from (a field of the colligative
result or of the evaluation, in SI), how it is shown (label, display unit by scale and
offset, significant figures), which warnings bear on it (the ``about`` tags of
:class:`~solutions.errors.Caveat`), whether it has a dilute-ideal figure beside it, and
whether it can be a design target (its name and command-line flag). A new property is one
row here and its computation where its ``field`` points.

JSON keys (``solution.<key>``) are a documented, stable interface: they are the ``key``
column, so do not rename a row's key.
"""
from __future__ import annotations

from dataclasses import dataclass

__all__ = ["Property", "PROPERTIES", "by_key", "targets", "display_rows", "about_groups",
           "TargetProperty", "target_properties"]


@dataclass(frozen=True)
class Property:
    """One solution property.

    key : the JSON key under ``solution`` (its unit is in the name)
    label : how a person reads it ("Freezing point")
    unit : display unit ("°C"; "" for a pure number)
    scale, offset : display value = SI value × scale + offset
    sig : significant figures shown
    source : "props" (a field of :class:`~solutions.colligative.ColligativeResult`) or
        "evaluation" (an attribute of :class:`~solutions.evaluate.Evaluation`)
    field : the attribute read, in SI
    about : the caveat tags that bear on it ("activity", "freezing", "boiling", "vapor",
        "density")
    dilute : a dilute-ideal figure is shown beside it
    water_only : ``None`` unless the solvent is water
    target : the target name, if it can be a design target (``None`` otherwise)
    flag : its command-line option (``target --<flag> VALUE``)
    tol : how close a solved target must come [SI]
    needs : which part of the model a target needs computed ("freezing", "boiling", "")
    """

    key: str
    label: str
    unit: str
    scale: float
    offset: float
    sig: int
    source: str
    field: str
    about: tuple[str, ...] = ()
    dilute: bool = False
    water_only: bool = False
    target: str | None = None
    flag: str | None = None
    tol: float = 0.0
    needs: str = ""

    def display(self, si: float) -> float:
        return si * self.scale + self.offset

    def to_si(self, shown: float) -> float:
        return (shown - self.offset) / self.scale


_A, _F, _B, _V, _D = ("activity",), ("freezing",), ("boiling",), ("vapor",), ("density",)

PROPERTIES: tuple[Property, ...] = (
    Property("density_g_per_mL", "Density", "g/mL", 1e-3, 0.0, 5, "evaluation", "rho", _D,
             target="density", flag="--target-density", tol=1e-6),
    Property("volume_mL", "Volume", "mL", 1e6, 0.0, 5, "evaluation", "volume", _D),
    Property("mass_g", "Mass", "g", 1e3, 0.0, 5, "evaluation", "mass"),
    Property("water_activity", "Water activity", "", 1.0, 0.0, 4, "props", "water_activity",
             _A, dilute=True, target="water_activity", flag="--water-activity", tol=1e-9),
    Property("equilibrium_relative_humidity_percent", "Equilibrium relative humidity", "%",
             100.0, 0.0, 3, "props", "water_activity", _A, water_only=True,
             target="equilibrium_relative_humidity", flag="--equilibrium-relative-humidity",
             tol=1e-9),
    Property("vapor_pressure_kPa", "Vapor pressure", "kPa", 1e-3, 0.0, 4, "props",
             "vapor_pressure", _A + _V, target="vapor_pressure", flag="--vapor-pressure",
             tol=1e-4, needs="freezing"),
    Property("vapor_pressure_lowering_kPa", "Vapor-pressure lowering", "kPa", 1e-3, 0.0, 3,
             "props", "vapor_pressure_lowering", _A + _V),
    Property("freezing_point_C", "Freezing point", "°C", 1.0, -273.15, 3, "props",
             "freezing_point", _F, dilute=True, target="freezing_point",
             flag="--freezing-point", tol=1e-6, needs="freezing"),
    Property("freezing_point_depression_K", "Freezing-point depression", "K", 1.0, 0.0, 3,
             "props", "freezing_point_depression", _F, dilute=True,
             target="freezing_point_depression", flag="--freezing-point-depression",
             tol=1e-6, needs="freezing"),
    Property("boiling_point_C", "Boiling point", "°C", 1.0, -273.15, 3, "props",
             "boiling_point", _B, dilute=True, target="boiling_point", flag="--boiling-point",
             tol=1e-6, needs="boiling"),
    Property("boiling_point_elevation_K", "Boiling-point elevation", "K", 1.0, 0.0, 3, "props",
             "boiling_point_elevation", _B, dilute=True),
    Property("flash_point_C", "Flash point", "°C", 1.0, -273.15, 3, "props", "flash_point",
             _V),
    Property("osmolality_mOsm_per_kg", "Osmolality", "mOsm/kg", 1e3, 0.0, 3, "props",
             "osmolality", _A, dilute=True, target="osmolality", flag="--osmolality",
             tol=1e-7),
    Property("osmolarity_mOsm_per_L", "Calculated osmolarity", "mOsm/L", 1.0, 0.0, 3, "props",
             "osmolarity", _D, target="osmolarity", flag="--osmolarity", tol=1e-5),
    Property("osmotic_coefficient", "Osmotic coefficient", "", 1.0, 0.0, 3, "props",
             "osmotic_coefficient", _A),
    Property("osmotic_pressure_kPa", "Osmotic pressure", "kPa", 1e-3, 0.0, 3, "props",
             "osmotic_pressure", _A, dilute=True),
)

_BY_KEY = {p.key: p for p in PROPERTIES}


def by_key(key: str) -> Property:
    """The property whose JSON key is ``key``."""
    return _BY_KEY[key]


def targets() -> dict[str, Property]:
    """The properties that can be design targets, by target name."""
    return {p.target: p for p in PROPERTIES if p.target}


@dataclass(frozen=True)
class TargetProperty:
    """A property as a design target: target name, label in running text ("freezing point"),
    display unit, display = SI × scale + offset, tolerance of the achieved value [SI] and the
    part of the model it needs ("freezing", "boiling" or "")."""

    key: str
    label: str
    unit: str
    scale: float
    offset: float
    tol: float
    needs: str = ""


def target_properties() -> dict[str, TargetProperty]:
    """The design targets by name: the registry's target rows, plus the concentration of a
    recipe row (its unit is the one typed with the target)."""
    out = {name: TargetProperty(p.target, p.label[0].lower() + p.label[1:], p.unit, p.scale,
                                p.offset, p.tol, p.needs) for name, p in targets().items()}
    out["concentration"] = TargetProperty("concentration", "concentration", "", 1.0, 0.0, 0.0)
    return out


def display_rows() -> list[tuple[str, str, str]]:
    """(key, label, unit) of every property, in display order."""
    return [(p.key, p.label, p.unit) for p in PROPERTIES]


def about_groups() -> dict[str, tuple[str, ...]]:
    """Caveat ``about`` tag → the property keys it bears on ("" bears on every model value)."""
    out: dict[str, list[str]] = {}
    for p in PROPERTIES:
        for tag in p.about:
            out.setdefault(tag, []).append(p.key)
    model = [p.key for p in PROPERTIES if p.source == "props" and p.key != "osmolarity_mOsm_per_L"]
    out[""] = model
    out["recipe"] = []
    return {k: tuple(v) for k, v in out.items()}
