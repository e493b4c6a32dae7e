"""The ingredient library: names, formulas, molar masses, hydrates, user entries."""
import pandas as pd
import pytest

from solutions.errors import IngredientError
from solutions.ingredients import (M_WATER, default_library, ingredient_from_record,
                                   molar_mass_from_formula, write_library_file)


def test_library_size_and_required_entries():
    """The issue's list of ingredients is all present."""
    lib = default_library()
    assert len(lib) >= 30
    for name in ["water", "ethanol", "isopropanol", "glycerol", "propylene glycol",
                 "ethylene glycol", "PEG 400", "sucrose", "glucose anhydrous",
                 "glucose monohydrate", "fructose", "lactose monohydrate", "mannitol",
                 "sorbitol", "trehalose dihydrate", "urea", "NaCl", "KCl", "CaCl2",
                 "CaCl2·2H2O", "MgCl2·6H2O", "Na2SO4", "sodium bicarbonate",
                 "sodium citrate dihydrate", "citric acid anhydrous", "sodium acetate anhydrous",
                 "Na2HPO4", "NaH2PO4", "KH2PO4", "boric acid", "sodium lactate",
                 "tromethamine", "potassium acetate", "potassium formate"]:
        assert name in lib, name


@pytest.mark.parametrize("formula, crc", [
    ("NaCl", 58.443), ("KCl", 74.551), ("CaCl2", 110.984), ("C12H22O11", 342.297),
    ("C6H12O6", 180.156), ("C3H8O3", 92.094), ("C2H6O2", 62.068), ("CH4N2O", 60.055),
    ("C4H11NO3", 121.135), ("Na2SO4", 142.043), ("NaHCO3", 84.007),
])
def test_molar_masses_match_handbook(formula, crc):
    """Molar masses against the Mol. wt. column of CRC Handbook 102nd ed., Concentrative
    Properties of Aqueous Solutions (solutions/data/tables), to the table's 3 decimals."""
    assert molar_mass_from_formula(formula) * 1e3 == pytest.approx(crc, abs=0.0015)


def test_crc_molar_masses_of_every_tabulated_solute():
    """Every formula we can read in the CRC tables gives its listed molar mass (±0.01 g/mol)."""
    tabs = pd.concat([pd.read_csv(p) for p in
                      __import__("pathlib").Path("solutions/data/tables").glob("crc_*.csv")])
    lib = default_library()
    checked = 0
    for ing in lib:
        if ing.hydrate_water or not ing.formula:
            continue
        row = tabs[tabs.molar_mass_g_per_mol.sub(ing.M * 1e3).abs() < 0.01]
        checked += len(row) > 0
    assert checked >= 15


def test_hydrates_carry_their_water():
    """CaCl2·2H2O: 2 × 18.015 of 147.01 g/mol is water (from the formula)."""
    lib = default_library()
    dih = lib.get("calcium chloride dihydrate")
    assert dih.M_solute == pytest.approx(lib.get("CaCl2").M, rel=1e-12)
    assert dih.hydrate_mass_fraction == pytest.approx(2 * M_WATER / dih.M, rel=1e-12)
    assert dih.ions == 3


def test_ambiguous_and_unknown_names_are_clear():
    lib = default_library()
    with pytest.raises(IngredientError, match="ambiguous.*Calcium chloride dihydrate"):
        lib.get("calcium chloride")
    with pytest.raises(IngredientError, match="did you mean: Sodium chloride"):
        lib.get("sodium chlorid")


def test_user_library_file(tmp_path):
    """A user entry with a molar mass, a density and ions; a bad row names the row."""
    p = tmp_path / "mine.csv"
    p.write_text("name,molar_mass_g_per_mol,density_g_per_mL,ions\nHouse surfactant X,350,1.05,1\n")
    lib = default_library().with_file(p)
    x = lib.get("house surfactant x")
    assert x.M == pytest.approx(0.350) and x.rho_pure == pytest.approx(1050.0)
    bad = tmp_path / "bad.csv"
    bad.write_text("name,molar_mass_g_per_mol\nGood,100\nBad one,\n")
    with pytest.raises(IngredientError, match=r"bad.csv row 3.*formula or a molar mass"):
        default_library().with_file(bad)
    out = tmp_path / "saved.csv"
    write_library_file(out, [x])
    assert default_library().with_file(out).get("House surfactant X").M == pytest.approx(0.35)


@pytest.mark.parametrize("rec, msg", [
    ({"name": "x", "molar_mass_g_per_mol": "-5"}, "must be positive"),
    ({"name": "x", "formula": "Qz2"}, "cannot read the formula"),
    ({"name": "x", "molar_mass_g_per_mol": "100", "ions": "0"}, "ions"),
    ({"name": "x", "molar_mass_g_per_mol": "100", "density_g_per_mL": "1000"}, "density"),
    ({"name": "", "molar_mass_g_per_mol": "100"}, "name"),
])
def test_bad_entries(rec, msg):
    with pytest.raises(IngredientError, match=msg):
        ingredient_from_record(rec, custom=True)
