"""Unit and basis parsing: what a chemist types becomes an explicit basis and SI factor."""
import pytest

from solutions.errors import UnitParseError
from solutions.units import Basis, parse_unit, ureg


@pytest.mark.parametrize("text, basis, si", [
    ("g", Basis.MASS, 1e-3), ("mg", Basis.MASS, 1e-6), ("kg", Basis.MASS, 1.0),
    ("µg", Basis.MASS, 1e-9), ("ug", Basis.MASS, 1e-9),
    ("mL", Basis.VOLUME, 1e-6), ("L", Basis.VOLUME, 1e-3), ("µL", Basis.VOLUME, 1e-9),
    ("mol", Basis.AMOUNT, 1.0), ("mmol", Basis.AMOUNT, 1e-3), ("µmol", Basis.AMOUNT, 1e-6),
    ("% w/w", Basis.MASS_FRACTION, 1e-2), ("wt%", Basis.MASS_FRACTION, 1e-2),
    ("% w/v", Basis.MASS_PER_VOLUME, 10.0), ("% v/v", Basis.VOLUME_FRACTION, 1e-2),
    ("mg/mL", Basis.MASS_PER_VOLUME, 1.0), ("g/L", Basis.MASS_PER_VOLUME, 1.0),
    ("mol/L", Basis.MOLARITY, 1e3), ("M", Basis.MOLARITY, 1e3), ("mM", Basis.MOLARITY, 1.0),
    ("µM", Basis.MOLARITY, 1e-3), ("mol/kg", Basis.MOLALITY, 1.0), ("m", Basis.MOLALITY, 1.0),
    ("ppm", Basis.MASS_FRACTION, 1e-6),
])
def test_amount_units(text, basis, si):
    """SI definitions (BIPM SI brochure): 1 L = 1e-3 m³, 1 M = 1 mol/L = 1e3 mol/m³;
    % w/v = g per 100 mL = 10 kg/m³ and ppm (w/w) = 1e-6 (common practice)."""
    a = parse_unit(text)
    assert a.basis is basis
    assert a.value_si == pytest.approx(si, rel=1e-12)


def test_solvent_rules():
    """q.s. to a volume or mass, and balance (to 100 % w/w)."""
    assert parse_unit("mL", solvent_rule=True).basis is Basis.QS_VOLUME
    assert parse_unit("g", solvent_rule=True).basis is Basis.QS_MASS
    assert parse_unit("", solvent_rule=True).basis is Basis.BALANCE
    assert parse_unit("% w/w", solvent_rule=True).basis is Basis.BALANCE


@pytest.mark.parametrize("text, reason", [
    ("furlong", "not a recipe amount"), ("blorp", "unknown unit"), ("", "empty"), ("m/s", "not a recipe amount"),
])
def test_bad_units_say_why(text, reason):
    with pytest.raises(UnitParseError, match=reason):
        parse_unit(text)


def test_one_registry():
    """The package has one pint registry and it knows our added units."""
    import solutions.units as u
    assert u.ureg is ureg
    assert ureg.Quantity(1, "molal").to("mol/kg").magnitude == 1.0
