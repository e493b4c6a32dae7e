"""The ``gas`` command: JSON keys, text summary, typed units, clear refusals with exit 2."""
import json
import subprocess
import sys

import pytest

from solutions.cli import main
from solutions.gas import dissolved_gas
from solutions.recipe import read_recipe

KEYS = {"gas", "temperature_C", "henry_constant_GPa", "salting_out_factor",
        "partial_pressure_kPa", "total_pressure_kPa", "gauge_pressure_kPa",
        "dissolved_mole_fraction", "dissolved_mmol_per_kg", "dissolved_mg_per_L", "volumes",
        "warnings", "warnings_detail", "cautions"}
SEALED = {"warm_pressure_kPa", "warm_gauge_pressure_kPa", "headspace_fraction",
          "fill_total_pressure_kPa"}


def run(capsys, *args):
    rc = main(["gas", *args, "--json"])
    return rc, json.loads(capsys.readouterr().out)


def test_json_keys_and_numbers_match_the_library(capsys):
    rc, d = run(capsys, "recipes/saline_rinse.csv", "--gas", "oxygen", "--air", "-T", "20")
    assert rc == 0 and KEYS <= set(d)
    lib = dissolved_gas(read_recipe("recipes/saline_rinse.csv"), "O2", 293.15, air=True)
    assert d["dissolved_mg_per_L"] == pytest.approx(lib.to_dict()["dissolved_mg_per_L"],
                                                    rel=1e-12)
    assert d["gas"] == "oxygen" and d["total_pressure_kPa"] == pytest.approx(101.325)
    assert len(d["warnings"]) == len(d["warnings_detail"])


def test_volumes_with_sealed_container(capsys):
    rc, d = run(capsys, "recipes/saline_rinse.csv", "--gas", "carbon-dioxide", "-T", "4 °C",
                "--volumes", "2.5", "--headspace-fraction", "0.05", "--warm-to", "95 F",
                "--rating", "3 barg")
    assert rc == 0 and (KEYS | SEALED) <= set(d)
    assert d["volumes"] == pytest.approx(2.5, rel=1e-12)
    assert d["warm_temperature_C"] == pytest.approx(35.0)
    assert d["rating_kPa_gauge"] == pytest.approx(300.0)
    assert d["gauge_pressure_kPa"] == pytest.approx(d["total_pressure_kPa"] - 101.325)
    assert any("burst" in c for c in d["cautions"])


def test_typed_pressures(capsys):
    """'1.5 barg' is gauge (adds the ambient); '250' is kPa absolute."""
    _, a = run(capsys, "recipes/saline_rinse.csv", "--gas", "CO2", "--partial-pressure",
               "1.5 barg", "--ambient", "100")
    assert a["partial_pressure_kPa"] == pytest.approx(250.0)
    _, b = run(capsys, "recipes/saline_rinse.csv", "--gas", "CO2", "--partial-pressure", "250")
    assert b["partial_pressure_kPa"] == pytest.approx(250.0)
    _, c = run(capsys, "recipes/saline_rinse.csv", "--gas", "O2", "--air", "--pressure",
               "0.84 bar")
    assert c["total_pressure_kPa"] == pytest.approx(84.0)


def test_text_output(capsys):
    assert main(["gas", "recipes/saline_rinse.csv", "--gas", "N2", "--air"]) == 0
    out = capsys.readouterr().out
    assert "nitrogen (N2)" in out and "mg/L" in out and "caution:" in out


@pytest.mark.parametrize("args, msg", [
    (["--gas", "nitrous-oxide", "--air"], "known gases: helium"),
    (["--gas", "CO2", "--partial-pressure", "0"], "positive"),
    (["--gas", "CO2", "-T", "-5", "--volumes", "3"], "-5 °C is outside the range [0, "),
    (["--gas", "CO2", "--volumes", "30"], "[0, 1000] kPa"),
    (["--gas", "CO2", "--volumes", "3", "--headspace-fraction", "1.2", "--warm-to", "30"],
     "headspace fraction 1.2 is outside the open range (0, 1)"),
    (["--gas", "CO2", "--volumes", "3", "--headspace-fraction", "0.1"], "needs both"),
    (["--gas", "CO2", "--volumes", "lots"], "is not a number"),
])
def test_bad_input_exit_2_one_line(args, msg):
    r = subprocess.run([sys.executable, "-m", "solutions", "gas", "recipes/saline_rinse.csv",
                        *args], capture_output=True, text=True)
    assert r.returncode == 2, r.stderr
    assert msg in r.stderr and "Traceback" not in r.stderr
    assert r.stderr.count("\n") == 1


def test_one_of_the_three_is_required():
    r = subprocess.run([sys.executable, "-m", "solutions", "gas", "recipes/saline_rinse.csv",
                        "--gas", "CO2"], capture_output=True, text=True)
    assert r.returncode == 2 and "one of the arguments" in r.stderr
