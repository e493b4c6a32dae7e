"""The README tells a new user the truth: its unit list is the closed vocabulary, its target
options are the registry's, its JSON keys are the evaluation's, and its two commands are the
ones CI runs."""
from pathlib import Path

from solutions.properties import PROPERTIES, targets
from solutions.units import vocabulary

ROOT = Path(__file__).resolve().parents[1]
README = (ROOT / "README.md").read_text(encoding="utf-8")


def test_every_spelling_is_listed():
    for s in vocabulary():
        assert f"`{s.text}`" in README, s.text


def test_every_target_option_and_property_key_is_listed():
    for p in targets().values():
        assert f"`{p.flag}`" in README, p.flag
    for p in PROPERTIES:
        assert f'"{p.key}"' in README, p.key


def test_the_two_commands_are_there_and_ci_runs_the_test_command():
    assert "pip install -e . && streamlit run streamlit_app.py" in README
    test_command = 'pip install -e ".[test]" && python -m pytest'
    assert test_command in README
    assert test_command in (ROOT / ".ci" / "run").read_text(encoding="utf-8")
