"""Unit and basis parsing: what a chemist types becomes an explicit basis and SI factor."""
import pytest

from solutions.errors import UnitParseError
from solutions.errors import NumberError
from solutions.units import (Basis, parse_pressure, parse_temperature, parse_unit, read_number,
                            vocabulary)


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


@pytest.mark.parametrize("text, basis, si", [
    # clinical conventions (common practice in clinical chemistry): g% = g/dL, mg% = mg/dL
    ("g%", Basis.MASS_PER_VOLUME, 10.0), ("mg%", Basis.MASS_PER_VOLUME, 0.01),
    ("mg/dL", Basis.MASS_PER_VOLUME, 0.01), ("g/100 mL", Basis.MASS_PER_VOLUME, 10.0),
    ("mg/kg", Basis.MASS_FRACTION, 1e-6), ("ppb", Basis.MASS_FRACTION, 1e-9),
    ("uM", Basis.MOLARITY, 1e-3), ("μg/mL", Basis.MASS_PER_VOLUME, 1e-3),
    ("mcg", Basis.MASS, 1e-9), ("cc", Basis.VOLUME, 1e-6), ("ml", Basis.VOLUME, 1e-6),
    ("mmol/kg", Basis.MOLALITY, 1e-3), ("% ABV", Basis.VOLUME_FRACTION, 1e-2),
])
def test_trade_spellings(text, basis, si):
    """Spellings of the trade read as the trade means them (SI brochure factors)."""
    a = parse_unit(text)
    assert a.basis is basis
    assert a.value_si == pytest.approx(si, rel=1e-12)


@pytest.mark.parametrize("text, reason", [
    ("gr", "grains"), ("%", "% w/w"), ("ppt", "per thousand"), ("MM", "millimolal"),
    ("mm", "millimolar"), ("ML", "mL"), ("Mg", "mg"), ("mol%", "mole-fraction"),
    ("furlong", "not a recipe unit"), ("blorp", "not a recipe unit"), ("", "empty"),
    ("m/s", "not a recipe unit"), ("__import__('os')", "not a recipe unit"),
    ("mg/" * 5000, "at most"), ("G", "not a recipe unit"),
])
def test_bad_units_say_why(text, reason):
    """Anything outside the closed vocabulary is refused with the reason or nearest spellings."""
    with pytest.raises(UnitParseError, match=reason):
        parse_unit(text)


def test_refusal_names_nearest_spellings():
    with pytest.raises(UnitParseError, match="did you mean 'mg/mL'"):
        parse_unit("mg/mml")


def test_vocabulary_is_consistent():
    """Every accepted spelling has a quantity and a positive factor; no spelling twice."""
    seen = set()
    for s in vocabulary():
        assert s.text not in seen
        seen.add(s.text)
        if s.quantity != "refused":
            assert s.factor > 0


@pytest.mark.parametrize("cell, decimal, value", [
    ("0.9", ".", 0.9), ("0,9", ",", 0.9), ("1e-3", ".", 1e-3), ("\u22121.5", ".", -1.5),
    ("  12 ", ".", 12.0), ("", ".", None), (None, ".", None), (float("nan"), ".", None),
    (3, ".", 3.0), (".5", ".", 0.5),
])
def test_read_number(cell, decimal, value):
    assert read_number(cell, decimal=decimal) == value


@pytest.mark.parametrize("cell, decimal, reason", [
    ("NaN", ".", "not a number"), ("nan", ".", "not a number"), ("inf", ".", "not a number"),
    ("1,000", ".", "thousands"), ("0,9", ".", "decimal comma"), ("1.000", ",", "comma"),
    ("1.000,0", ",", "comma"), ("1 000", ".", "space"), ("1_000", ".", "not a number"),
    ("0x10", ".", "not a number"), ("1e999", ".", "finite"), (True, ".", "not a number"),
    (float("inf"), ".", "finite"), ("nine", ".", "not a number"),
])
def test_read_number_refuses(cell, decimal, reason):
    """NaN is never 1, a thousands separator is never guessed, inf is never a number."""
    with pytest.raises(NumberError, match=reason):
        read_number(cell, decimal=decimal)


@pytest.mark.parametrize("text, K", [
    ("25", 298.15), ("25 °C", 298.15), ("25C", 298.15), ("298.15 K", 298.15),
    ("77 °F", 298.15), ("-40 F", 233.15), ("0 degC", 273.15), (4, 277.15),
])
def test_parse_temperature(text, K):
    """Celsius and Fahrenheit by their definitions (BIPM; T/K = (t/°F + 459.67)·5/9)."""
    assert parse_temperature(text) == pytest.approx(K, abs=1e-9)


@pytest.mark.parametrize("text, Pa", [
    ("101.325", 101325.0), ("1 atm", 101325.0), ("1 bar", 1e5), ("2.5 barg", 351325.0),
    ("30 psig", 30 * 6894.757293168361 + 101325.0), ("14.696 psi", 14.696 * 6894.757293168361),
    ("760 mmHg", 760 * 133.322387415), ("0.1 MPa", 1e5), ("200 kPag", 301325.0),
])
def test_parse_pressure(text, Pa):
    """Gauge spellings add the ambient pressure; everything else is absolute (NIST SP 811
    conversion factors: 1 psi = 6894.757 Pa, 1 mmHg = 133.3224 Pa)."""
    assert parse_pressure(text) == pytest.approx(Pa, rel=1e-12)


@pytest.mark.parametrize("text, reason", [
    ("-300 °C", "absolute zero"), ("0 K", "absolute zero"), ("25 X", "temperature unit"),
])
def test_parse_temperature_refuses(text, reason):
    with pytest.raises(UnitParseError, match=reason):
        parse_temperature(text)


@pytest.mark.parametrize("text, reason", [
    ("-5 kPa", "positive"), ("-2 barg", "gauge"), ("3 furlongs", "pressure unit"),
])
def test_parse_pressure_refuses(text, reason):
    with pytest.raises(UnitParseError, match=reason):
        parse_pressure(text)
