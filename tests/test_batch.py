"""Tests of solutions.batch: weigh-out sheets for a batch, and dilution from a stock.

Published densities are CRC Handbook 102nd ed. (2021) 'Concentrative Properties of Aqueous
Solutions' at 20 °C (solutions/data/tables/crc_aqueous_20C_nonelectrolytes.csv), quoted at
their 4 decimals. The ``iapws`` package is used only as an outside check of water's density.
"""
from __future__ import annotations

import json
from pathlib import Path

import numpy as np
import pytest

from solutions import cli
from solutions.batch import dilution_plan, weigh_out
from solutions.errors import RecipeError, TargetError
from solutions.recipe import parse_batch, read_recipe, resolve

ROOT = Path(__file__).resolve().parents[1]
RECIPES = ROOT / "recipes"


def _recipe(text: str):
    return read_recipe(text.strip() + "\n")


# ----------------------------------------------------------------------------- weigh-out
def test_weigh_out_to_5_litres():
    """The demo eye rinse (q.s. to 500 mL) scaled to 5 L: every mass ×10, final volume 5 L at
    20 °C, and the water to add is its mass over water's density at 20 °C (IAPWS-95 via the
    iapws package: 998.207 kg/m³ at 20 °C, 101.325 kPa)."""
    rho_w = 998.207          # IAPWS-95 at 20 °C, 101.325 kPa (recorded; checked below)
    recipe = read_recipe(RECIPES / "buffered_eye_rinse.csv")
    sheet = weigh_out(recipe, parse_batch("5 L"))
    base = resolve(recipe)
    assert sheet.scale_factor == pytest.approx(10.0, rel=1e-12)
    d = sheet.to_dict()
    rows = d["weigh_out"]
    np.testing.assert_allclose([r["weigh_g"] for r in rows[:-1]],
                               base.weighed_kg * 1e4, rtol=1e-12)
    assert rows[0]["weigh_g"] == pytest.approx(0.58 / 100 * 5000, rel=1e-12)  # 0.58 % w/v
    water = rows[-1]
    assert water["solvent"] and water["weigh_g"] == pytest.approx(base.water_added_kg * 1e4,
                                                                  rel=1e-12)
    assert water["volume_mL"] == pytest.approx(water["weigh_g"] / rho_w * 1e3, rel=2e-6)
    assert "q.s." not in water["note"] and "add about" in water["note"]
    assert d["final"]["volume_mL"] == pytest.approx(5000.0, rel=1e-12)
    assert d["final"]["mass_g"] == pytest.approx(sum(r["weigh_g"] for r in rows), rel=1e-12)
    assert d["final"]["density_g_per_mL"] == pytest.approx(d["final"]["mass_g"] / 5000.0)
    # the components are those evaluate --json gives for the batch
    assert [c["mass_g"] for c in d["components"][:-1]] == pytest.approx(
        [r["pure_mass_g"] for r in rows[:-1]], rel=1e-12)


def test_recorded_water_density_at_20C_is_iapws95():
    """The 998.207 kg/m³ used above is IAPWS-95 water at 20 °C, 101.325 kPa (iapws package,
    an outside reference used only in tests; this check alone skips without it)."""
    iapws = pytest.importorskip("iapws")
    assert iapws.IAPWS95(T=293.15, P=0.101325).rho == pytest.approx(998.207, abs=0.001)


def test_weigh_out_by_mass_balance_recipe():
    """A % w/w balance recipe scaled to 20 kg: each row is its percentage of 20 kg."""
    recipe = read_recipe(RECIPES / "chiller_coolant.csv")
    d = weigh_out(recipe, parse_batch("20 kg")).to_dict()
    w = {r["ingredient"]: r["weigh_g"] for r in d["weigh_out"]}
    assert w["propylene glycol"] == pytest.approx(7600.0, rel=1e-12)
    assert w["dipotassium phosphate"] == pytest.approx(100.0, rel=1e-12)
    assert w["water"] == pytest.approx(12300.0, rel=1e-12)
    pg = d["weigh_out"][0]
    assert pg["liquid_volume_mL_20C"] == pytest.approx(7600.0 / 1.036, rel=1e-9)


def test_weigh_out_hydrate_and_assay():
    """A hydrate is weighed with its crystal water; a 98 % assay raises the mass to weigh
    by 1/0.98."""
    recipe = _recipe("""ingredient,amount,unit,assay_%
calcium chloride dihydrate,14.7,g,98
water,q.s. to 100,mL,""")
    sheet = weigh_out(recipe, parse_batch("1 L"))
    row = sheet.to_dict()["weigh_out"][0]
    assert row["pure_mass_g"] == pytest.approx(147.0, rel=1e-12)
    assert row["weigh_g"] == pytest.approx(147.0 / 0.98, rel=1e-12)
    M, M_anh = 147.01, 110.98           # CaCl2·2H2O and CaCl2, g/mol (standard atomic weights)
    assert row["crystal_water_g"] == pytest.approx(147.0 * (1 - M_anh / M), rel=1e-3)
    assert "crystal water" in row["note"] and "assay" in row["note"]


def test_cli_scale(tmp_path, capsys):
    p = tmp_path / "saline.csv"
    p.write_text((RECIPES / "saline_rinse.csv").read_text())
    assert cli.main(["scale", str(p), "--batch", "5 L", "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    assert {"components", "weigh_out", "final", "solution", "batch"} <= set(d)
    assert d["components"][0]["mass_g"] == pytest.approx(45.0, rel=1e-12)   # 0.9 % of 5 L
    assert d["batch"] == {"kind": "volume", "mass_g": None, "volume_mL": pytest.approx(5000.0)}
    assert cli.main(["scale", str(p), "--batch", "5 L"]) == 0
    out = capsys.readouterr().out
    assert "Weigh-out sheet" in out and "5000 mL at 20 °C" in out


# ----------------------------------------------------------------------------- dilution
def test_dilute_ethylene_glycol_40_to_20_percent():
    """40 % w/w ethylene glycol diluted to 20 % w/w, 1 L at 20 °C. Mass balance: glycol is
    conserved (0.40 m_stock = 0.20 m_final) and m_stock + m_water = m_final. The final volume
    comes from the mixture's density, which the CRC table gives as 1.0241 g/mL at 20 % (and
    1.0514 at 40 %); the model is within 0.0005 g/mL. From the CRC densities this particular
    dilution is nearly additive (stock + water − final = +0.01 mL per kg, below the 0.05 mL
    the 4-decimal densities resolve), so the model's volume change must be below 0.3 mL."""
    stock = _recipe("ingredient,amount,unit\nethylene glycol,40,% w/w\nwater,balance,")
    plan = dilution_plan(stock, "ethylene glycol", "20 % w/w", "1 L")
    assert 0.40 * plan.m_stock == pytest.approx(0.20 * plan.m_final, rel=1e-12)
    assert plan.m_stock + plan.m_diluent == pytest.approx(plan.m_final, rel=1e-15)
    assert plan.V_final == pytest.approx(1e-3, rel=1e-12)
    assert plan.V_final == plan.m_final / plan.rho_final
    assert plan.rho_final / 1e3 == pytest.approx(1.0241, abs=5e-4)
    assert plan.rho_stock / 1e3 == pytest.approx(1.0514, abs=5e-4)
    d = plan.to_dict()["dilution"]
    assert abs(d["volume_change_on_mixing_mL"]) < 0.3
    assert plan.achieved == pytest.approx(20.0, rel=1e-9)
    ev = plan.evaluation.to_dict()
    assert ev["components"][0]["mass_fraction"] == pytest.approx(0.20, rel=1e-9)


def test_dilute_ethanol_volumes_are_not_additive():
    """60 % w/w ethanol diluted to 20 % w/w, 1 kg. CRC 20 °C densities: 0.8911 g/mL (60 %),
    0.9687 g/mL (20 %), water 0.99820 g/mL, so 333.3 g stock (374.07 mL) + 666.7 g water
    (667.87 mL) = 1041.94 mL give 1032.31 mL: a contraction of 9.6 mL. The model must show a
    contraction of 9.6 ± 1.5 mL (its ethanol apparent-volume fit is within ~0.0013 g/mL of
    the CRC densities at 60 %)."""
    stock = _recipe("ingredient,amount,unit\nethanol,60,% w/w\nwater,balance,")
    plan = dilution_plan(stock, "ethanol", "20 % w/w", "1 kg")
    assert plan.m_stock * 1e3 == pytest.approx(1000 / 3, rel=1e-12)
    V_sum = (plan.V_stock + plan.V_diluent) * 1e6
    V_final = plan.V_final * 1e6
    crc_change = 1000 / 0.9687 - (1000 / 3 / 0.8911 + 2000 / 3 / 0.99820)
    assert crc_change == pytest.approx(-9.6, abs=0.1)
    assert V_final - V_sum == pytest.approx(crc_change, abs=1.5)
    assert V_final == pytest.approx(1000 / 0.9687, rel=1e-3)
    assert "not additive" in plan.text()


def test_dilute_saline_to_volume_percent_w_v():
    """10 % w/v NaCl stock to 0.9 % w/v, 500 mL: 4.5 g NaCl in the final 500 mL at 20 °C by
    definition of % w/v, and the stock volume is about 45 mL."""
    stock = _recipe("ingredient,amount,unit\nsodium chloride,10,% w/v\nwater,q.s. to 1000,mL")
    plan = dilution_plan(stock, "NaCl", "0.9 % w/v", "500 mL")
    nacl_g = float(plan.final.pure_kg[0]) * 1e3
    assert nacl_g == pytest.approx(4.5, rel=1e-9)
    assert plan.V_final * 1e6 == pytest.approx(500.0, rel=1e-12)
    assert plan.V_stock * 1e6 == pytest.approx(45.0, rel=1e-9)
    assert "Achieved: 0.9 % w/v" in plan.text()


def test_dilute_unreachable_and_bad_input(tmp_path, capsys):
    """A stock cannot be diluted up: exit 3 with the stock's concentration as nearest."""
    p = tmp_path / "eg.csv"
    p.write_text("ingredient,amount,unit\nethylene glycol,40,% w/w\nwater,balance,\n")
    code = cli.main(["dilute", str(p), "--ingredient", "ethylene glycol", "--to",
                     "50 % w/w", "--final", "1 kg"])
    err = capsys.readouterr().err
    assert code == 3 and "cannot raise it" in err and "nearest reachable: 40 % w/w" in err
    stock = read_recipe(p)
    with pytest.raises(TargetError):
        dilution_plan(stock, "ethylene glycol", "41 % w/w", "1 kg")
    with pytest.raises(RecipeError, match="not in the stock"):
        dilution_plan(stock, "glycerol", "10 % w/w", "1 kg")
    with pytest.raises(RecipeError, match="not a concentration"):
        dilution_plan(stock, "ethylene glycol", "10 g", "1 kg")
    assert cli.main(["dilute", str(p), "--ingredient", "ethylene glycol", "--to", "20 % w/w",
                     "--final", "1 kg", "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    assert d["dilution"]["stock"]["mass_g"] == pytest.approx(500.0, rel=1e-12)
    assert d["dilution"]["diluent"]["mass_g"] == pytest.approx(500.0, rel=1e-12)
