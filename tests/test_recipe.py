"""Recipe reading and resolution: any mix of bases to masses, and every bad input named."""
import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings, strategies as st

from solutions.errors import RecipeError
from solutions.ingredients import M_WATER, default_library
from solutions.recipe import parse_batch, read_recipe, resolve

CRC = pd.concat([pd.read_csv(f"solutions/data/tables/crc_aqueous_20C_{k}.csv")
                 for k in ("electrolytes", "nonelectrolytes")])


def R(text, **kw):
    return read_recipe("ingredient,amount,unit\n" + text, **kw)


def test_saline_q_s_to_volume():
    """0.9 % w/v NaCl q.s. 1000 mL weighs 9.000 g NaCl (definition of % w/v) and the solution
    is ~1.0046 g/mL at 20 °C (CRC 20 °C table: 1.0053 at 1 % w/w, 1.0018 at 0.5 %), read by
    linear interpolation at its mass fraction (0.896 % w/w) within 0.3 kg/m³ (the table's
    last digit and the curvature between its rows). Ideal mixing with solid NaCl (2165
    kg/m³) gives 1003.0 kg/m³ and fails; the bare range 1001.8-1005.3 did not."""
    res = resolve(R("sodium chloride,0.9,% w/v\nwater,q.s. to 1000,mL"))
    assert res.weighed_kg[0] == pytest.approx(9.0e-3, rel=1e-12)
    assert res.volume_prep == pytest.approx(1e-3, rel=1e-12)
    pct = 100 * 9.0 / res.rho_prep                        # % w/w in 1 L of solution
    crc = 1.0018 + (pct - 0.5) * (1.0053 - 1.0018) / (1.0 - 0.5)
    assert res.rho_prep == pytest.approx(crc * 1e3, abs=0.3)


def test_sugar_mole_fraction_fact():
    """1 mol of sugar in 1 kg of water: solute mole fraction about 1.8 % (common practice)."""
    c = resolve(R("sucrose,1,mol\nwater,1000,g")).composition
    assert c.mole_fraction()[0, 0] == pytest.approx(1 / (1 + 1 / M_WATER), rel=1e-12)
    assert round(c.mole_fraction()[0, 0] * 100, 1) == 1.8


def test_co2_fact():
    """10 g CO2 in 1 kg water is about 0.23 mol/kg and about 0.23 mol/L (common practice).
    CO2 is defined inline by its formula."""
    r = read_recipe("ingredient,amount,unit,formula\ncarbon dioxide,10,g,CO2\nwater,1000,g,\n")
    res = resolve(r)
    c = res.composition
    assert round(c.molality()[0, 0], 2) == 0.23
    assert round(c.molarity(res.rho_prep)[0, 0] / 1e3, 2) == 0.23


def test_dilute_molarity_close_to_molality():
    """A dilute solution's molarity and molality are nearly equal (common practice)."""
    res = resolve(R("potassium chloride,10,mM\nwater,q.s. to 1,L"))
    c = res.composition
    assert c.molarity(res.rho_prep)[0, 0] / 1e3 == pytest.approx(c.molality()[0, 0], rel=0.005)


@pytest.mark.parametrize("solute, key", [("Sodium chloride", "NaCl"),
                                         ("Calcium chloride", "CaCl2"),
                                         ("Sucrose", "sucrose"), ("Glycerol", "glycerol"),
                                         ("D-Glucose", "glucose anhydrous")])
def test_molality_and_molarity_match_crc_table(solute, key):
    """Resolving 'x % w/w, water balance' gives the molality column of the CRC Handbook
    102nd ed. Concentrative Properties table (20 °C) to its 3 decimals, and the molarity
    column within 0.3 % (that needs the density model)."""
    d = CRC[(CRC.solute == solute) & (CRC.mass_pct <= 40)]
    for _, row in d.iterrows():
        res = resolve(R(f"{key},{row.mass_pct},% w/w\nwater,balance,"))
        c = res.composition
        assert c.molality()[0, 0] == pytest.approx(row.molality_mol_per_kg, abs=0.0011 + 0.001 * row.molality_mol_per_kg)
        assert c.molarity(res.rho_prep)[0, 0] / 1e3 == pytest.approx(row.molarity_mol_per_L, rel=0.003, abs=0.0011)


def test_hydrate_water_joins_the_solvent():
    """147.01 g CaCl2·2H2O (1 mol) in 1000 g water: molality 1/(1.000 + 0.036) mol/kg."""
    lib = default_library()
    dih = lib.get("CaCl2·2H2O")
    res = resolve(R(f"CaCl2·2H2O,{dih.M * 1e3},g\nwater,1000,g"))
    assert res.composition.molality()[0, 0] == pytest.approx(1 / (1 + 2 * M_WATER), rel=1e-12)
    assert res.composition.m_solvent[0] == pytest.approx(1 + 2 * M_WATER, rel=1e-12)


def test_assay_scales_what_is_weighed():
    """98 % assay: weigh 9/0.98 g to put 9 g of NaCl in."""
    r = read_recipe("ingredient,amount,unit,assay_%\nNaCl,9,g,98\nwater,991,g,\n")
    res = resolve(r)
    assert res.weighed_kg[0] == pytest.approx(9e-3 / 0.98, rel=1e-12)
    assert res.composition.m[0, 0] == pytest.approx(9e-3, rel=1e-12)


def test_mixed_bases_in_one_recipe():
    """g, mL of a liquid, mM, % w/v and mol/kg together resolve consistently."""
    res = resolve(R("glycerol,10,mL\nNaCl,150,mM\nsucrose,2,% w/v\nurea,0.1,mol/kg\n"
                    "CaCl2·2H2O,0.2,g\nwater,q.s. to 500,mL"))
    c, V = res.composition, res.volume_prep
    lib = default_library()
    assert res.weighed_kg[0] == pytest.approx(10e-6 * lib.get("glycerol").rho_pure, rel=1e-12)
    assert c.n[0, 1] / V == pytest.approx(150.0, rel=1e-9)
    assert c.m[0, 2] / V == pytest.approx(20.0, rel=1e-9)
    assert c.molality()[0, 3] == pytest.approx(0.1, rel=1e-9)
    assert V == pytest.approx(500e-6, rel=1e-12)


def test_no_qs_row_batch_is_the_sum():
    res = resolve(R("NaCl,5,g\nwater,95,g"))
    assert res.m_total == pytest.approx(0.1, rel=1e-12)
    assert res.composition.mass_fraction()[0, 0] == pytest.approx(0.05, rel=1e-12)


def test_batch_scaling():
    """Scaling to 5 L keeps every intensive value and makes the volume 5 L."""
    r = R("NaCl,0.9,% w/v\nwater,q.s. to 1000,mL")
    a, b = resolve(r), resolve(r, batch=parse_batch("5 L"))
    assert b.volume_prep == pytest.approx(5e-3, rel=1e-12)
    assert b.weighed_kg[0] == pytest.approx(5 * a.weighed_kg[0], rel=1e-12)


def test_decimal_comma_and_tsv_paste():
    """A block pasted from a spreadsheet with decimal commas."""
    r = read_recipe("ingredient\tamount\tunit\nsodium chloride\t0,9\t% w/v\nwater\tq.s. to 1000\tmL\n",
                    decimal=",")
    assert resolve(r).weighed_kg[0] == pytest.approx(9e-3, rel=1e-12)


def test_amount_with_unit_in_one_cell():
    r = read_recipe("ingredient,amount\nNaCl,0.9 % w/v\nwater,q.s. to 100 mL\n")
    res = resolve(r)
    assert res.weighed_kg[0] == pytest.approx(0.9e-3, rel=1e-12)


@pytest.mark.parametrize("text, msg", [
    ("NaCl,60,% w/w\nsucrose,50,% w/w\nwater,balance,", r"row 2.*add up to 110 %, over 100 %"),
    ("NaCl,400,g\nwater,q.s. to 100,mL", r"row 2.*q.s. to 100 mL is too little"),
    ("NaCl,1,g\nwater,q.s. to 100,mL\npurified water,q.s. to 10,mL", r"two q.s./balance rows"),
    ("NaCl,-1,g\nwater,100,g", r"row 1, 'NaCl', column 'amount': amount must be positive, got -1"),
    ("NaCl,0,g\nwater,100,g", r"row 1.*amount must be positive"),
    ("NaCl,1,furlong\nwater,100,g", r"row 1, 'NaCl', column 'unit': unit 'furlong'"),
    ("unobtainium,1,g\nwater,100,g", r"row 1, 'unobtainium', column 'ingredient'.*not in the ingredient library"),
    ("NaCl,abc,g\nwater,100,g", r"row 1.*'abc' is not a number"),
    ("NaCl,,g\nwater,100,g", r"row 1.*amount is empty"),
    ("NaCl,0,9,g\nwater,100,g", r"row 1"),
    ("NaCl,10,mL\nwater,100,g", r"row 1.*needs its density"),
    ("NaCl,5,g\nwater,balance,", r"balance fills to 100 % w/w.*batch is undefined"),
    ("NaCl,5,% w/w\nwater,90,% w/w", r"do not add up"),
    ("NaCl,5,g", r"no solvent"),
    ("calcium chloride,1,g\nwater,100,g", r"ambiguous"),
    ("water,q.s.,mL\nNaCl,1,g", r"q.s. needs the final amount"),
])
def test_bad_recipes_name_row_and_reason(text, msg):
    with pytest.raises(RecipeError, match=msg):
        resolve(R(text))


def test_missing_columns():
    with pytest.raises(RecipeError, match="no 'amount' column"):
        read_recipe("ingredient,qtty\nNaCl,1\n")


def test_missing_file():
    with pytest.raises(RecipeError, match="not found"):
        read_recipe("nope/does_not_exist.csv")


SOLUTES = ["NaCl", "KCl", "sucrose", "glycerol", "urea", "glucose anhydrous", "CaCl2·2H2O",
           "ethylene glycol"]


@settings(max_examples=40, deadline=None)
@given(st.lists(st.tuples(st.sampled_from(SOLUTES), st.floats(0.1, 60.0)), min_size=1,
                max_size=4, unique_by=lambda t: t[0]),
       st.sampled_from(["% w/w", "mol/kg", "% w/v", "mM", "g/L"]))
def test_round_trip_between_bases(items, basis):
    """Grams → any basis → back to grams returns the input (property-based)."""
    base = R("".join(f"{n},{g},g\n" for n, g in items) + "water,100,g")
    res = resolve(base)
    c, V = res.composition, res.volume_prep
    if basis == "% w/w":
        vals = res.pure_kg / res.m_total * 100  # % w/w of the form as weighed
    elif basis == "mol/kg":
        vals = c.molality()[0]
    elif basis == "% w/v":
        vals = res.pure_kg / V / 10
    elif basis == "mM":
        vals = c.n[0] / V
    else:
        vals = res.pure_kg / V
    water = {"% w/w": "water,balance,", "mol/kg": f"water,{c.m_solvent[0] * 1e3 - sum(res.pure_kg * 1e3 * [default_library().get(n).hydrate_mass_fraction for n, _ in items]):.17g},g"}
    tail = water.get(basis, f"water,q.s. to {V * 1e6:.17g},mL")
    back = resolve(R("".join(f"{n},{v:.17g},{basis}\n" for (n, _), v in zip(items, vals)) + tail),
                   batch=("mass", res.m_total))
    np.testing.assert_allclose(back.pure_kg, res.pure_kg, rtol=1e-9)


def test_dense_syrup_by_volume_is_resolved_not_refused():
    """100 g of sucrose per 100 mL of solution is a heavy syrup, denser than water: the
    CRC Handbook's 20 °C sucrose table (solutions/data/tables) gives 0.943 g/mL of sucrose
    at 70 % w/w (1.3472 g/mL) and 1.129 g/mL at 80 % w/w (1.4117 g/mL), so 1.000 g/mL lies
    at 73.1 % w/w by linear interpolation. Resolving at water's density first would find
    no room for the water and refuse it."""
    res = resolve(read_recipe("ingredient,amount,unit\nsucrose,100,% w/v\n"
                              "water,q.s. to 100,mL\n"))
    w = float(res.composition.mass_fraction()[0, 0])
    assert w == pytest.approx(0.7306, abs=0.002)
    assert res.rho_prep / 1e3 == pytest.approx(1.3472 + (1.4117 - 1.3472) * 0.306, rel=3e-3)
    # past pure sucrose's own density (about 1.59 g/mL, from memory) no solution holds it
    with pytest.raises(RecipeError, match="q.s. to 100 mL is too little"):
        resolve(read_recipe("ingredient,amount,unit\nsucrose,170,% w/v\n"
                            "water,q.s. to 100,mL\n"))
