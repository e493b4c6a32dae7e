"""Bad input through the command line: every case gives the right result or one clear
refusal (exit 2, the message naming what is wrong and where), never a traceback, never a
silent wrong number. The catalogue is a table: input, expected exit status, expected words.

The reference for the right results is common practice: 0.9 g% is 0.9 g per 100 mL
(clinical convention), a trace of salt freezes at 0 °C to within its tiny depression.
"""
from __future__ import annotations

import contextlib
import io
import json
import time

import pytest

from solutions.cli import main

SALINE_QS = "water,q.s. to 1000,mL\n"


def run(argv):
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        try:
            code = main(argv)
        except SystemExit as exc:  # argparse refusals
            code = exc.code
    return code, out.getvalue(), err.getvalue()


def write(tmp_path, text, name="r.csv", mode="w"):
    p = tmp_path / name
    if mode == "wb":
        p.write_bytes(text)
    else:
        p.write_text(text, encoding="utf-8")
    return str(p)


RECIPES = [
    # (recipe text, expected exit, words the message must contain)
    ("ingredient,amount,unit\nsodium chloride,NaN,% w/v\n" + SALINE_QS, 2,
     ["row 1", "amount", "'NaN' is not a number"]),
    ("ingredient,amount,unit\nsodium chloride,nan,% w/v\n" + SALINE_QS, 2, ["'nan' is not a number"]),
    ("ingredient,amount,unit\nsodium chloride,9,gr\n" + SALINE_QS, 2, ["row 1", "unit", "grains"]),
    ("ingredient,amount,unit\nsodium chloride,154,MM\n" + SALINE_QS, 2, ["millimolal"]),
    ("ingredient,amount,unit\nsodium chloride,1,mol%\n" + SALINE_QS, 2, ["mole-fraction"]),
    ("ingredient,amount,unit\nsodium chloride,9,ppt\n" + SALINE_QS, 2, ["per thousand"]),
    ("ingredient,amount,unit\nsodium chloride,9,Mg\n" + SALINE_QS, 2, ["did you mean mg"]),
    ("ingredient,amount,unit\nsodium chloride,9,g\nwater,1,ML\n", 2, ["did you mean mL"]),
    ("ingredient,amount,unit\nsodium chloride,1,__import__('os')\n" + SALINE_QS, 2,
     ["row 1", "unit"]),
    ("ingredient,amount,unit\nsodium chloride,1," + "mg/" * 5000 + "\n" + SALINE_QS, 2,
     ["row 1"]),
    ("ingredient,amount,unit,molar_mass\nmy salt,9,g,\"1,000\"\n" + SALINE_QS + "\n", 2,
     ["row 1", "molar_mass", "ambiguous"]),
    ("ingredient,amount,unit,assay_%\nsodium chloride,9,g,0.995\n" + SALINE_QS, 2,
     ["row 1", "did you mean 99.5 %"]),
    ("ingredient,amount,unit,density\nmy oil,9,mL,920\n" + SALINE_QS, 2,
     ["row 1", "did you mean 0.92"]),
    ("ingredient,amount,unit\nsodium chloride,0,9,% w/v\n" + SALINE_QS, 2,
     ["row 1", "4 fields", "decimal comma"]),
    ("ingredient,amount,unit\nglycerol,60,% w/w\npropylene glycol,40,% w/w\nwater,balance,\n", 2,
     ["row 3", "nothing for the balance"]),
    ("", 2, ["empty"]),
    ("   \n\n  \n", 2, ["empty"]),
    ("ingredient,amount,unit\n", 2, ["no ingredient rows"]),
    ("ingredient,amount,unit\n# a comment\n\nunobtainium,1,g\nwater,100,g\n", 2,
     ["row 3", "unobtainium"]),
    ("ingredient,amount,unit\nsodium chloride #2,1,g\nwater,100,g\n", 2, ["sodium chloride #2"]),
    ("ingredient,amount,unit\n\x1b[31msodium chloride,1,g\nwater,100,g\n", 2, ["row 1"]),
    # 252 g per 100 mL is more than any such solution weighs (a typed 25.2, or % w/w meant)
    ("ingredient,amount,unit\nsodium chloride,252,% w/v\nwater,100,g\n", 2,
     ["row 1", "amount", "2.52 g of solute per mL", "grams per 100 mL"]),
]


@pytest.mark.parametrize("text, code, words", RECIPES)
def test_bad_recipe_catalogue(tmp_path, text, code, words):
    start = time.perf_counter()
    got, out, err = run(["evaluate", write(tmp_path, text)])
    assert time.perf_counter() - start < 20  # bounded, not a speed assertion: it must not hang
    assert got == code, err
    for w in words:
        assert w in err, err
    assert "Traceback" not in err and "internal error" not in err
    assert "\x1b" not in err and "\x1b" not in out


OPTIONS = [
    (["--density", "1000"], ["--density", "did you mean 1"]),
    (["--density", "-1"], ["--density", "between 0.5 and 3"]),
    (["--density", "nan"], ["--density", "not a number"]),
    (["-T", "nan"], ["--temperature"]),
    (["-T", "-300"], ["--temperature", "absolute zero"]),
    (["-T", "500"], ["--temperature", "374 °C"]),
    (["--pressure", "-5"], ["--pressure", "positive"]),
    (["--pressure", "5 furlongs"], ["--pressure", "pressure unit"]),
    (["--batch", "1e308 L"], ["batch", "outside the sizes"]),
    (["--batch", "5 mM"], ["batch", "mass or a volume"]),
]


@pytest.mark.parametrize("extra, words", OPTIONS)
def test_bad_option_catalogue(tmp_path, extra, words):
    path = write(tmp_path, "ingredient,amount,unit\nsodium chloride,0.9,% w/v\n" + SALINE_QS)
    code, _, err = run(["evaluate", path, *extra])
    assert code == 2, err
    for w in words:
        assert w in err, err


def test_nan_target_is_refused(tmp_path):
    path = write(tmp_path, "ingredient,amount,unit\nsodium chloride,0.9,% w/v\n" + SALINE_QS)
    code, _, err = run(["target", path, "--vary", "sodium chloride", "--water-activity", "nan"])
    assert code == 2 and "not a number" in err


def test_decimal_comma_refuses_points_and_thousands(tmp_path):
    for bad in ('"1.000"', '"1.000,0"'):
        path = write(tmp_path, "ingredient;amount;unit;molar_mass\nmy salt;9;g;" + bad +
                     "\nwater;q.s. to 1000;mL\n")
        code, _, err = run(["evaluate", path, "--decimal-comma"])
        assert code == 2 and "molar_mass" in err, err


def test_decimal_comma_on_a_comma_separated_file(tmp_path):
    """A comma-separated file read with decimal commas: numbers with commas must be quoted;
    the header is still found (it was refused as having no 'ingredient' column)."""
    path = write(tmp_path, 'ingredient,amount,unit\nsodium chloride,"0,9",% w/v\n' + SALINE_QS)
    code, out, err = run(["evaluate", path, "--decimal-comma", "--json"])
    assert code == 0, err
    d = json.loads(out)
    assert d["components"][0]["mass_g"] == pytest.approx(9.0, rel=1e-9)


def test_clinical_g_percent_is_w_v(tmp_path):
    """0.9 g% is 0.9 g per 100 mL (clinical convention, common practice): 9 g in 1 L."""
    path = write(tmp_path, "ingredient,amount,unit\nsodium chloride,0.9,g%\n" + SALINE_QS)
    code, out, err = run(["evaluate", path, "--json"])
    assert code == 0, err
    assert json.loads(out)["components"][0]["mass_g"] == pytest.approx(9.0, rel=1e-9)


def test_semicolon_in_a_first_line_comment(tmp_path):
    path = write(tmp_path, "# saline; for the eye rinse line\ningredient,amount,unit\n"
                 "sodium chloride,0.9,% w/v\n" + SALINE_QS)
    code, out, err = run(["evaluate", path, "--json"])
    assert code == 0, err


@pytest.mark.parametrize("ppm", [1e-3, 0.05, 0.5, 1.0])
def test_trace_solute_freezes_near_zero(tmp_path, ppm):
    """A trace of NaCl: ΔTf = 2 × 1.86 K kg/mol × b (dilute limit, exact as b → 0; CRC K_f)."""
    path = write(tmp_path, f"ingredient,amount,unit\nsodium chloride,{ppm},ppm\nwater,balance,\n")
    code, out, err = run(["evaluate", path, "--json"])
    assert code == 0, err
    s = json.loads(out)["solution"]
    b = ppm * 1e-6 / 0.058443
    assert s["freezing_point_depression_K"] == pytest.approx(2 * 1.86 * b, rel=0.01)


def test_empty_and_bad_workbooks(tmp_path):
    bad = write(tmp_path, b"not a zip file at all", name="r.xlsx", mode="wb")
    code, _, err = run(["evaluate", bad])
    assert code == 2 and "workbook" in err


def test_empty_library_file(tmp_path):
    path = write(tmp_path, "ingredient,amount,unit\nsodium chloride,0.9,% w/v\n" + SALINE_QS)
    lib = write(tmp_path, "", name="lib.csv")
    code, _, err = run(["evaluate", path, "--library", lib])
    assert code == 2, err
