"""Session state of the dashboard: defaults, presets, conditions and the session's library.

Streamlit reruns the page script top to bottom; :func:`init_state` fills any missing key
with its default at the top of every run, so widgets always find their values. Keys of
widgets are the keys of :data:`DEFAULTS`.
"""
from __future__ import annotations

import json
from pathlib import Path
from typing import MutableMapping

import pandas as pd

from ..errors import SolutionsError
from ..ingredients import Ingredient, Library, default_library, ingredient_from_record
from .compute import Conditions
from .design import TARGET_CHOICES
from .tables import DEFAULT_BASES, blank_table, demo_recipes, frame_from_text

__all__ = ["DEFAULTS", "PRESSURE_PRESETS", "CUSTOM_PRESSURE", "MODEL_OPTIONS",
           "BATCH_UNITS", "EDITOR_KEY", "init_state", "load_demo", "conditions_from",
           "library_token", "build_library", "custom_ingredient"]

DEMO_DIR = Path(__file__).resolve().parents[2] / "recipes"
FIRST_DEMO = "saline_rinse"
EDITOR_KEY = "recipe_editor"

#: named external pressures [kPa]; the altitude figure is the standard atmosphere's
#: pressure at 2000 m (79.5 kPa, ISO 2533 — from memory, rounded)
PRESSURE_PRESETS = {
    "Sea level (101.325 kPa)": 101.325,
    "Mountain lab, ~2000 m (79.5 kPa)": 79.5,
    "Vacuum evaporator (20 kPa)": 20.0,
}
CUSTOM_PRESSURE = "Other pressure…"

MODEL_OPTIONS = {
    "nonideal": "Non-ideal (default)",
    "ideal": "Ideal solution (Raoult)",
    "dilute": "Dilute ideal (textbook constants)",
}

BATCH_UNITS = ["g", "kg", "mL", "L"]

DEFAULTS = {
    "demo_dir": str(DEMO_DIR),     # the app sets its own folder before init_state
    "recipe_name": FIRST_DEMO,
    "demo": FIRST_DEMO,
    "decimal_comma": False,
    "paste_text": "",
    "load_notes": [],
    "custom_ingredients": [],      # records for ingredient_from_record
    "library_path": "my_ingredients.csv",
    "library_message": "",
    "T_C": 25.0,
    "pressure_preset": "Sea level (101.325 kPa)",
    "P_kPa": 101.325,
    "model": "nonideal",
    "use_batch": False,
    "batch_size": 1.0,
    "batch_unit": "L",
    "use_measured_density": False,
    "rho_measured": 1.000,
    "T_prep_C": 20.0,
    "bases": list(DEFAULT_BASES),
    # "Design and batch": target, scale-up, dilution (the ingredient boxes take their
    # options from the recipe, so they start at their first option instead)
    "tg_property": "freezing_point",
    **{f"tg_value_{k}": c.default for k, c in TARGET_CHOICES.items()},
    "tg_basis": "% w/v",
    "target_request": None,        # TargetRequest of the last Solve; None = nothing asked
    "design_message": "",          # after loading the adjusted recipe into the table
    "wo_size": 5.0,
    "wo_unit": "L",
    "dl_to_value": 1.0,
    "dl_to_unit": "% w/w",
    "dl_final_value": 1.0,
    "dl_final_unit": "L",
    "dilution_request": None,      # DilutionRequest of the last "Plan the dilution"
}


def load_demo(state: MutableMapping, name: str, *, reset_edits: bool = True,
              folder: Path | None = None) -> None:
    """Put demo recipe ``name`` of ``folder`` (default :data:`DEMO_DIR`) into the recipe
    table, and reset the table's edits unless ``reset_edits`` is false."""
    path = demo_recipes(folder or state.get("demo_dir") or DEMO_DIR).get(name)
    if path is None:
        state["recipe_table"] = blank_table()
        state["load_notes"] = [f"no demo recipe named {name!r}"]
    else:
        df, notes = frame_from_text(path.read_text(encoding="utf-8-sig"))
        state["recipe_table"] = df
        state["load_notes"] = notes
        state["recipe_name"] = name
    if reset_edits:
        state.pop(EDITOR_KEY, None)


def init_state(state: MutableMapping) -> None:
    """Fill every missing session key with its default (a copy, never shared)."""
    for k, v in DEFAULTS.items():
        if k not in state:
            state[k] = list(v) if isinstance(v, list) else v
    if "recipe_table" not in state:
        # edits already waiting for the editor (a test, a restored session) are kept
        load_demo(state, state["demo"], reset_edits=False)


def conditions_from(state: MutableMapping) -> Conditions:
    """The sidebar's conditions as a :class:`Conditions`."""
    batch = (f"{state['batch_size']:g} {state['batch_unit']}"
             if state.get("use_batch") and state.get("batch_size") else None)
    rho = float(state["rho_measured"]) if state.get("use_measured_density") and \
        state.get("rho_measured") else None
    return Conditions(T_C=float(state["T_C"]), P_kPa=float(state["P_kPa"]),
                      model=state["model"], rho_measured_g_per_mL=rho, batch_text=batch,
                      T_prep_C=float(state["T_prep_C"]))


def library_token(state: MutableMapping) -> str:
    """A text that changes whenever the session's library would: its custom entries, the
    user library file's path and its modification time."""
    path = Path(str(state.get("library_path") or "")).expanduser()
    mtime = path.stat().st_mtime if path.is_file() else None
    return json.dumps({"custom": state.get("custom_ingredients", []),
                       "file": str(path) if str(state.get("library_path") or "") else "",
                       "mtime": mtime}, sort_keys=True)


def build_library(token: str) -> tuple[Library, str]:
    """The library of a session from its :func:`library_token`: the built-in library,
    the user's file if it exists, then this session's entries. Returns (library, message);
    a bad user file is reported and skipped."""
    spec = json.loads(token)
    lib, msg = default_library(), ""
    if spec["file"] and spec["mtime"] is not None:
        try:
            lib = lib.with_file(spec["file"])
        except SolutionsError as exc:
            msg = f"your library file was not loaded: {exc}"
    if spec["custom"]:
        lib = lib.copy()
        for rec in spec["custom"]:
            lib.add(ingredient_from_record(rec, custom=True))
    return lib, msg


def custom_ingredient(name: str, formula: str = "", molar_mass: float | None = None,
                      density: float | None = None, ions: float | None = 1.0) -> dict:
    """A library record from the new-ingredient form; raises the library's
    :class:`~solutions.errors.IngredientError` if it is not a valid ingredient."""
    rec = {"name": (name or "").strip(), "formula": (formula or "").strip(),
           "molar_mass_g_per_mol": "" if molar_mass in (None, 0) else molar_mass,
           "density_g_per_mL": "" if density in (None, 0) else density,
           "ions": 1.0 if ions in (None, 0) else ions,
           "source": "user entry (dashboard)"}
    ingredient_from_record(rec, custom=True)   # validates
    return rec


def session_ingredients(state: MutableMapping) -> list[Ingredient]:
    """This session's custom ingredients, as library entries."""
    return [ingredient_from_record(r, custom=True) for r in state.get("custom_ingredients", [])]


def table_or_blank(state: MutableMapping) -> pd.DataFrame:
    t = state.get("recipe_table")
    return t if isinstance(t, pd.DataFrame) else blank_table()


__all__ += ["session_ingredients", "table_or_blank", "DEMO_DIR", "FIRST_DEMO"]
