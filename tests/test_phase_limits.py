"""Phase-limit data: solubility vs temperature, ice eutectics, and the explicit gaps."""
import numpy as np
import pandas as pd
import pytest

from solutions.ingredients import default_library

LIB = default_library()
SOL = pd.read_csv("solutions/data/solubility.csv")
EUT = pd.read_csv("solutions/data/eutectics.csv")
GAPS = pd.read_csv("solutions/data/phase_limit_gaps.csv")
CRC = pd.read_csv("solutions/data/tables/crc_aqueous_solubility_inorganic.csv")


def _solutes():
    out = {}
    for ing in LIB:
        if ing.kind != "solvent":
            out.setdefault(ing.solute, ing)
    return out


def test_every_solute_has_a_limit_or_an_explicit_gap():
    """Each dissolved solute of the library has solubility rows or a 'miscible' / 'no
    published limit' row, and an ice eutectic or a 'no published limit' row: never silent."""
    sol, eut = set(SOL.ingredient), set(EUT.solute)
    gaps = {(r.ingredient, r.limit) for r in GAPS.itertuples()}
    for key in _solutes():
        assert key in sol or (key, "solubility") in gaps, key
        assert key in eut or (key, "eutectic") in gaps, key
        assert not (key in sol and (key, "solubility") in gaps), key
    assert set(GAPS.status) <= {"miscible", "no published limit"}


def test_solubility_rows_are_readable_by_both_consumers():
    """Each row's ``ingredient`` is the dissolved-solute key that limits.py matches
    (case-insensitive) and resolves through the library."""
    from solutions.limits import solute_keys as _solute_keys
    keys = {k.lower() for k in _solutes()}
    for name in set(SOL.ingredient):
        assert name.lower() in keys, name
        assert _solute_keys(name, LIB), name
    assert (SOL.solubility_g_per_100g_water > 0).all()
    assert SOL.source.str.len().min() > 20
    assert SOL.T_C.between(0, 100).all()


@pytest.mark.parametrize("formula, T, mass_pct", [
    ("KCl", 20, 25.39), ("K2SO4", 25, 10.7), ("NH4Cl", 0, 22.92), ("(NH4)2SO4", 25, 43.3),
    ("NaNO3", 20, 46.6), ("MgSO4", 20, 25.1), ("Na2CO3", 30, 28.7), ("KC2H3O2", 25, 72.92),
])
def test_solubility_converted_from_published_mass_percent(formula, T, mass_pct):
    """CRC Handbook 'Aqueous Solubility of Inorganic Compounds at Various Temperatures'
    (mass % of anhydrous solute; transcription named in the table): the stored g per 100 g
    water equals 100 w/(100 − w) of the published w."""
    assert ((CRC.formula == formula) & (CRC.T_C == T) & (CRC.mass_pct == mass_pct)).any()
    row = SOL[(SOL.formula == formula) & (SOL.T_C == T)]
    assert len(row) == 1
    assert row.solubility_g_per_100g_water.iloc[0] == pytest.approx(
        100 * mass_pct / (100 - mass_pct), rel=5e-4)


def test_sodium_chloride_keeps_its_25C_row():
    """NaCl 25 °C: 6.153 mol/kg (CRC 98th ed. molality table) = 35.96 g/100 g water, and the
    mass-% table's 26.45 % (35.96 g/100 g) agrees."""
    row = SOL[(SOL.ingredient == "NaCl") & (SOL.T_C == 25)]
    assert len(row) == 1 and row.solubility_g_per_100g_water.iloc[0] == pytest.approx(35.96)
    assert 100 * 26.45 / 73.55 == pytest.approx(35.96, abs=0.005)


def test_hydrate_transitions_show_in_the_data():
    """Na2SO4 and Na2CO3 dissolve best near 32-40 °C (decahydrate → anhydrous / monohydrate
    transition; CRC table): the stored series rises then falls."""
    for f in ["Na2SO4", "Na2CO3"]:
        s = SOL[SOL.formula == f].sort_values("T_C")
        i = int(np.argmax(s.solubility_g_per_100g_water.to_numpy()))
        assert 30 <= s.T_C.iloc[i] <= 40, f
