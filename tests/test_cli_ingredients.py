"""`python -m solutions ingredients [TEXT]`: finding an ingredient by any name a chemist uses,
and the data the package holds for it.

Published numbers checked here: molar masses from standard atomic weights (IUPAC) as listed
in common references, the octanol/water partition coefficient and pKa of methylparaben.
"""
import contextlib
import io
import json
import subprocess
import sys

import pytest
from hypothesis import HealthCheck, given, settings, strategies as st

from solutions.activity.models import activity_terms
from solutions.catalog import find_ingredients, ingredient_record
from solutions.cli import main
from solutions.ingredients import _norm, default_library

LIB = default_library()


def _json(capsys, *argv):
    assert main(["ingredients", *argv, "--json"]) == 0
    return json.loads(capsys.readouterr().out)


def test_tris_finds_tromethamine(capsys):
    """"Tris" is the bench name of tromethamine, C4H11NO3, 121.14 g/mol (PubChem CID 6503,
    from memory); it comes first because a synonym matches exactly."""
    recs = _json(capsys, "tris")
    assert recs[0]["name"] == "Tromethamine"
    assert recs[0]["molar_mass_g_per_mol"] == pytest.approx(121.14, abs=0.01)
    assert recs[0]["formula"] == "C4H11NO3"


@pytest.mark.parametrize("text", ["TRIS BASE", "tris-base", "trisbase", " Tris_Base "])
def test_case_space_dash_insensitive(text, capsys):
    """Spelling variants of one synonym find the same entry."""
    assert _json(capsys, text)[0]["key"] == "tromethamine"


def test_epsom_finds_the_heptahydrate_and_its_other_form(capsys):
    """Epsom salt is MgSO4·7H2O, 246.47 g/mol; anhydrous MgSO4 is 120.37 g/mol (CRC Handbook,
    Physical Constants of Inorganic Compounds, from memory). Both molar masses are shown so the
    chemist sees which form is weighed."""
    recs = _json(capsys, "epsom")
    assert [r["name"] for r in recs] == ["Magnesium sulfate heptahydrate"]
    r = recs[0]
    assert r["molar_mass_g_per_mol"] == pytest.approx(246.47, abs=0.01)
    assert r["hydrate_water"] == 7
    forms = {f["key"]: f["molar_mass_g_per_mol"] for f in r["forms"]}
    assert forms == {"magnesium_sulfate_anhydrous": pytest.approx(120.37, abs=0.01)}


def test_wfi_finds_water(capsys):
    """WFI (water for injection) is water, M = 18.015268 g/mol (IAPWS-95 release, molar mass
    of ordinary water)."""
    recs = _json(capsys, "WFI")
    assert [r["key"] for r in recs] == ["water"]
    assert recs[0]["molar_mass_g_per_mol"] == pytest.approx(18.015268, abs=2e-3)
    assert recs[0]["vapor_pressure"] is True


def test_methylparaben_json_has_partition_data(capsys):
    """Methylparaben: log K_ow 1.96 (Hansch, Leo & Hoekman 1995, Exploring QSAR, from memory)
    and pKa 8.17 (CRC Handbook, dissociation constants of organic acids, from memory)."""
    r = _json(capsys, "methylparaben")[0]
    assert r["log_Kow"] == pytest.approx(1.96, abs=0.005)
    assert r["pKa"] == pytest.approx(8.17, abs=0.005)
    assert r["partition_data"] is True


def test_json_lists_every_field():
    """Every record has every library column and every data flag."""
    keys = {"key", "name", "synonyms", "formula", "molar_mass_g_per_mol", "hydrate_water",
            "solute", "kind", "ions", "solution_pct_w_w", "density_g_per_mL", "acid_base",
            "source", "caution", "custom", "forms", "activity_model", "density_data",
            "vapor_pressure", "solubility", "eutectic", "E_value", "log_Kow", "pKa",
            "partition_data"}
    for ing in LIB:
        assert keys <= set(ingredient_record(ing, LIB)), ing.key


def test_sodium_chloride_flags_match_the_models(capsys):
    """The flags are what the models use: the activity kind chosen by activity_terms, and
    the NaCl–ice eutectic −21.1 °C at 23.3 % w/w (Lange's Handbook 15th ed., Table 5.13)."""
    r = _json(capsys, "sodium chloride")[0]
    assert r["key"] == "sodium_chloride"
    from solutions.composition import Composition
    kinds = activity_terms(Composition.from_molalities((LIB.get("sodium_chloride"),), [[0.1]],
                                                       LIB.get("water"))).kinds
    assert kinds == ("pitzer",) and r["activity_model"] == "Pitzer binary"
    assert r["eutectic"]["T_C"] == pytest.approx(-21.1, abs=0.05)
    assert r["eutectic"]["mass_pct"] == pytest.approx(23.3, abs=0.05)
    assert r["E_value"] == pytest.approx(1.0)
    assert r["density_data"] == "solution-density table"


def test_text_shows_forms_and_data(capsys):
    assert main(["ingredients", "epsom"]) == 0
    out = capsys.readouterr().out
    assert "Magnesium sulfate heptahydrate" in out and "other forms" in out
    assert "120.37 g/mol" in out and "Pitzer binary" in out


def test_nonsense_exits_2_with_a_message():
    r = subprocess.run([sys.executable, "-m", "solutions", "ingredients", "qwzxv"],
                       capture_output=True, text=True)
    assert r.returncode == 2 and r.stdout == ""
    assert "no ingredient matches 'qwzxv'" in r.stderr and "Traceback" not in r.stderr


def test_misspelling_offers_close_names(capsys):
    assert main(["ingredients", "glycerinne"]) == 2
    err = capsys.readouterr().err
    assert "close names" in err and "Glycerol" in err


def test_listing_without_text_is_unchanged(capsys):
    assert main(["ingredients"]) == 0
    lines = capsys.readouterr().out.splitlines()
    assert len(lines) == len(LIB) and lines[0].startswith(next(iter(LIB)).name)


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.text(min_size=1, max_size=12))
def test_any_text_matches_only_entries_that_contain_it(text):
    """Whatever is typed: no exception, and every hit holds the typed text (normalised) in
    its key, name, a synonym or its formula."""
    q = _norm(text).replace(".", "")
    for ing in find_ingredients(LIB, text):
        fields = (ing.key, ing.name, *ing.synonyms, ing.formula)
        assert not q or any(q in _norm(f).replace(".", "") for f in fields if f)


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.text(min_size=1, max_size=8))
def test_cli_never_escapes_an_exception(text):
    """Any typed text gives exit 0 (matches) or 2 (none, or blank), never a crash."""
    with contextlib.redirect_stdout(io.StringIO()), contextlib.redirect_stderr(io.StringIO()):
        try:
            code = main(["ingredients", text])
        except SystemExit as exc:   # text that reads as an option: argparse's clean refusal
            code = exc.code
        assert code in (0, 2)


def test_user_library_entries_are_found_and_marked(tmp_path, capsys):
    lib = tmp_path / "mine.csv"
    lib.write_text("name,formula,synonyms,ions\nHarrowgate blue dye,C16H18ClN3S,hg blue,2\n",
                   encoding="utf-8")
    assert main(["ingredients", "HG-Blue", "--library", str(lib)]) == 0
    out = capsys.readouterr().out
    assert "Harrowgate blue dye" in out and "your library" in out
