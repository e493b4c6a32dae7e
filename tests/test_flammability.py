"""Flammability data against the standards they come from, and a consistency check with
the pure-liquid vapor pressures (flash point ≈ temperature where p* = LFL · P)."""
import csv

import numpy as np
import pytest
from scipy.optimize import brentq

from solutions.errors import SolutionsError
from solutions.flammability import (
    FlammabilityDataError,
    flammability_data,
    flammable_keys,
    flash_point_pure,
    lower_flammability_limit,
)
from solutions.solvents import pure_vapor_pressure

P_ATM = 101325.0


@pytest.mark.parametrize("key, fp_C, lfl", [
    ("ethanol", 13.0, 0.033), ("methanol", 12.0, 0.060),
    ("2-propanol", 12.0, 0.020), ("acetone", -20.0, 0.025),
])
def test_nfpa_497_values(key, fp_C, lfl):
    """NFPA 497 (2008), Table 4.4.2: closed-cup flash point and LFL (vol %)."""
    assert flash_point_pure(key) == pytest.approx(fp_C + 273.15, abs=1e-9)
    assert lower_flammability_limit(key) == pytest.approx(lfl, abs=1e-12)


def test_acetic_acid_lfl_from_iec():
    """IEC 60079-20-1 (2010): acetic acid LFL 4.0 vol %; NFPA 497 flash point 39 °C."""
    assert lower_flammability_limit("acetic acid") == 0.04
    assert flash_point_pure("acetic acid") == pytest.approx(312.15)


@pytest.mark.parametrize("key", ["ethanol", "methanol", "2-propanol", "acetone"])
def test_flash_point_consistent_with_vapor_pressure(key):
    """The closed-cup flash point lies near the temperature where the pure liquid's vapor
    pressure reaches LFL × 1 atm (the usual flash-point estimate, e.g. Crowl & Louvar,
    Chemical Process Safety, ch. 6); closed-cup values sit 0–6 K above it."""
    lfl = lower_flammability_limit(key)
    T_est = brentq(lambda T: pure_vapor_pressure(T, key) - lfl * P_ATM, 200.0, 400.0)
    assert -1.0 <= flash_point_pure(key) - T_est <= 6.0


def test_missing_values_raise_not_none():
    """A liquid without a sourced LFL raises (a KeyError subclass of SolutionsError)
    naming the ingredient; an unknown key suggests close matches."""
    with pytest.raises(FlammabilityDataError) as info:
        lower_flammability_limit("ethylene glycol")
    assert isinstance(info.value, KeyError) and isinstance(info.value, SolutionsError)
    assert "ethylene glycol" in str(info.value) and "lower flammability limit" in str(info.value)
    with pytest.raises(FlammabilityDataError) as info:
        flash_point_pure("ethanoll")
    assert "ethanol" in info.value.suggestions


def test_table_rows_are_sourced_and_physical():
    for key in flammable_keys():
        row = flammability_data(key)
        assert len(row.source) > 30
        if row.flash_point_K is not None:
            assert 200.0 < row.flash_point_K < 500.0
        if row.LFL is not None:
            assert 0.0 < row.LFL < (row.UFL or 1.0) <= 1.0


def test_reference_table_of_aqueous_ethanol_is_monotone():
    """The aqueous-ethanol flash-point reference table (tests/reference) is readable and
    falls as the alcohol content rises, towards the pure-ethanol value (13 °C, NFPA 497)."""
    with open("tests/reference/flash_points_aqueous.csv", encoding="utf-8") as fh:
        rows = [r for r in csv.DictReader(fh) if r["solute"] == "ethanol"]
    abv = np.array([float(r["abv_pct_at_20C"]) for r in rows])
    fp = np.array([float(r["flash_point_C"]) for r in rows])
    assert np.all(np.diff(abv) > 0) and np.all(np.diff(fp) <= 0)
    assert fp[-1] >= flash_point_pure("ethanol") - 273.15
