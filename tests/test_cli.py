"""The command line: stable JSON keys, readable table, clear errors with exit status 2."""
import json
import subprocess
import sys
from pathlib import Path

import pytest

from solutions.cli import main

RECIPES = sorted(Path("recipes").glob("*.csv"))
COMPONENT_KEYS = {"ingredient", "mass_g", "amount_mol", "mass_fraction", "mole_fraction",
                  "molality_mol_per_kg", "molarity_mol_per_L", "mass_per_volume_g_per_L"}
SOLUTION_KEYS = {"mass_g", "volume_mL", "density_g_per_mL", "water_activity",
                 "vapor_pressure_kPa", "vapor_pressure_lowering_kPa", "freezing_point_C",
                 "freezing_point_depression_K", "boiling_point_C", "boiling_point_elevation_K",
                 "osmolality_mOsm_per_kg", "osmolarity_mOsm_per_L", "osmotic_coefficient",
                 "osmotic_pressure_kPa", "model"}


@pytest.mark.parametrize("path", RECIPES, ids=[p.stem for p in RECIPES])
def test_evaluate_json_on_every_demo_recipe(path, capsys):
    """Every demo recipe gives every documented key, with numbers (no NaN) and a model."""
    assert main(["evaluate", str(path), "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    assert len(d["components"]) >= 2
    for c in d["components"]:
        assert COMPONENT_KEYS <= set(c)
    assert SOLUTION_KEYS <= set(d["solution"])
    withheld = any(w["kind"] == "beyond-data" for w in d["warnings_detail"])
    for k in SOLUTION_KEYS - {"model"}:
        v = d["solution"][k]
        # a number, or null with the reason (past the data a model was fitted to)
        assert isinstance(v, (int, float)) or (v is None and withheld), k
    assert d["solution"]["model"] == "nonideal"
    assert isinstance(d["warnings"], list) and d["cautions"]


def test_model_option_and_table(capsys):
    assert main(["evaluate", "recipes/saline_rinse.csv", "--model", "dilute", "--json"]) == 0
    assert json.loads(capsys.readouterr().out)["solution"]["model"] == "dilute"
    assert main(["evaluate", "recipes/saline_rinse.csv", "-T", "37"]) == 0
    out = capsys.readouterr().out
    assert "Freezing point" in out and "Osmolality" in out and "mOsm/kg" in out


def test_pressure_changes_boiling_point(capsys):
    """At 20 kPa water boils near 60.06 °C (IAPWS-IF97 T_sat(20 kPa) = 333.21 K)."""
    main(["evaluate", "recipes/saline_rinse.csv", "--pressure", "20", "--json"])
    s = json.loads(capsys.readouterr().out)["solution"]
    assert 60.05 < s["boiling_point_C"] < 60.2


@pytest.mark.parametrize("content, msg", [
    ("ingredient,amount,unit\nunobtainium,1,g\nwater,100,g\n", "row 1, 'unobtainium'"),
    ("ingredient,amount,unit\nNaCl,1,parsec\nwater,100,g\n", "column 'unit'"),
    ("ingredient,amount,unit\nNaCl,300,g\nwater,q.s. to 100,mL\n", "too little"),
])
def test_bad_input_exit_2_no_traceback(tmp_path, content, msg):
    p = tmp_path / "bad.csv"
    p.write_text(content)
    r = subprocess.run([sys.executable, "-m", "solutions", "evaluate", str(p)],
                       capture_output=True, text=True)
    assert r.returncode == 2
    assert msg in r.stderr and "Traceback" not in r.stderr
    assert r.stdout == ""


def test_missing_file_exit_2(capsys):
    assert main(["evaluate", "no/such/recipe.csv"]) == 2
    assert "not found" in capsys.readouterr().err


def test_ingredients_listing(capsys):
    assert main(["ingredients", "--json"]) == 0
    names = [r["name"] for r in json.loads(capsys.readouterr().out)]
    assert "Sodium chloride" in names and len(names) >= 30


def test_every_command_prints_its_help(capsys):
    """--help of every command exits 0 and lists its options (a '%' in a generated help text,
    e.g. the relative humidity's unit, must not break argparse's formatting)."""
    from solutions.cli import build_parser
    from solutions.properties import targets
    commands = next(a for a in build_parser()._actions if a.dest == "command").choices
    for name in commands:
        with pytest.raises(SystemExit) as exc:
            main([name, "--help"])
        assert exc.value.code == 0, name
        out = capsys.readouterr().out
        if name == "target":
            assert all(p.flag in out for p in targets().values())


@pytest.mark.parametrize("argv", [["evaluate", "recipes/saline_rinse.csv", "--json"],
                                  ["evaluate", "recipes/chiller_coolant.csv"],
                                  ["evaluate", "recipes/maple_glaze_syrup.csv", "-T", "60"],
                                  ["ingredients"]])
def test_light_commands_do_not_import_the_heavy_stack(argv):
    """The command line stays quick because these commands never import the data-frame,
    SciPy or page libraries (their import alone costs tenths of a second; see
    tests/bench_cli.py for the times). Read from ``python -X importtime``."""
    import subprocess
    import sys
    from pathlib import Path
    root = Path(__file__).resolve().parents[1]
    r = subprocess.run([sys.executable, "-X", "importtime", "-m", "solutions", *argv],
                       cwd=root, capture_output=True, text=True, timeout=120)
    assert r.returncode == 0, r.stderr[-2000:]
    loaded = {line.split("|")[-1].strip().split(".")[0]
              for line in r.stderr.splitlines() if line.startswith("import time:")}
    assert not loaded & {"pandas", "scipy", "streamlit", "altair", "pyarrow"}, \
        sorted(loaded & {"pandas", "scipy", "streamlit", "altair", "pyarrow"})


def test_no_numpy_notes_reach_the_user(tmp_path):
    """A recipe far past solubility (2343 g of KCl in 100 g of water; 35.5 g dissolve at
    25 °C, the library's solubility table) is answered with its warnings and withheld
    values, without numpy's division and overflow notes on stderr."""
    import subprocess
    import sys
    from pathlib import Path
    path = tmp_path / "kcl.csv"
    path.write_text("ingredient,amount,unit\npotassium chloride,2343,g\nwater,100,g\n")
    r = subprocess.run([sys.executable, "-m", "solutions", "evaluate", str(path)],
                       cwd=Path(__file__).resolve().parents[1], capture_output=True,
                       text=True, timeout=120)
    assert r.returncode == 0, r.stderr
    assert "exceeds its solubility" in r.stdout
    assert "Warning" not in r.stderr and r.stderr == "", r.stderr
