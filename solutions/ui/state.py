"""Session state of the dashboard: defaults, presets, conditions and the session's library.

Streamlit reruns the page script top to bottom; :func:`init_state` fills any missing key
with its default at the top of every run, so widgets always find their values. Keys of
widgets are the keys of :data:`DEFAULTS`.
"""
from __future__ import annotations

import dataclasses
import functools
import hashlib
import io
import json
from dataclasses import dataclass
from pathlib import Path
from typing import MutableMapping

import pandas as pd

from ..errors import SolutionsError
from ..ingredients import (Ingredient, Library, default_library, ingredient_from_record,
                           write_library_file)
from .compute import Conditions
from . import design as D
from .design import TARGET_CHOICES
from .safe import user_library_path
from .tables import (DEFAULT_BASES, EDITOR_COLUMNS, blank_table, clean_table,
                     demo_recipes, frame_from_text, frame_from_upload)

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
    "library_message": "",
    "use": "body",                 # "body": may meet the body; "technical": never does
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
    "design_tool": "target",       # the design section's switch
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
                      T_prep_C=float(state["T_prep_C"]),
                      use="technical" if state.get("use") == "technical" else None)


def library_token(state: MutableMapping) -> str:
    """A text that changes whenever the session's library would: its custom entries, the
    user library file (:func:`~solutions.ui.safe.user_library_path`) and its
    modification time."""
    path = user_library_path()
    try:
        mtime = path.stat().st_mtime if path.is_file() else None
    except OSError:
        mtime = None
    return json.dumps({"custom": state.get("custom_ingredients", []),
                       "file": str(path), "mtime": mtime}, sort_keys=True)


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
    return clean_table(t) if isinstance(t, pd.DataFrame) else blank_table()


__all__ += ["session_ingredients", "table_or_blank", "DEMO_DIR", "FIRST_DEMO"]


# ------------------------------------------------------------------ one key for every cache
@dataclass(frozen=True)
class PageKey:
    """Everything a page update depends on, hashable: the recipe table as CSV text, the
    session library's token, the sidebar's conditions, the decimal mark and the recipe's
    name. Every cached computation of the page is keyed by it (plus its own request)."""

    table_csv: str
    token: str
    cond: Conditions
    decimal: str = "."
    name: str = ""

    @functools.cached_property
    def digest(self) -> str:
        """A short digest of every field: what the page's caches hash (Streamlit would
        otherwise convert the whole key to a dict and hash it field by field each run)."""
        return hashlib.blake2b(repr(self).encode(), digest_size=16).hexdigest()

    def table(self) -> pd.DataFrame:
        """The recipe table back from its CSV text (every cell a string)."""
        return pd.read_csv(io.StringIO(self.table_csv), dtype=str,
                           keep_default_na=False).reindex(columns=EDITOR_COLUMNS,
                                                          fill_value="")


#: ``hash_funcs`` of every cache keyed by a :class:`PageKey`
HASH_FUNCS = {PageKey: lambda key: key.digest}


def page_key(state: MutableMapping, table: pd.DataFrame) -> PageKey:
    """The :class:`PageKey` of session ``state`` with the editor's ``table``."""
    return PageKey(clean_table(table).to_csv(index=False), library_token(state),
                   conditions_from(state), "," if state.get("decimal_comma") else ".",
                   str(state.get("recipe_name") or ""))


#: widgets whose value must outlive runs that do not draw them (a run that stops at
#: "No results" does not draw the design section; Streamlit forgets the value of a widget
#: it did not draw, so writing the key back at the top of each run keeps it)
KEPT_WIDGETS = ("design_tool", "tg_vary", "tg_add", "tg_property", "tg_component", "tg_basis", "wo_size",
                "wo_unit", "dl_ingredient", "dl_to_value", "dl_to_unit", "dl_final_value",
                "dl_final_unit", "batch_size", "batch_unit", "rho_measured",
                *(f"tg_value_{k}" for k in TARGET_CHOICES))


#: "More tools": (title, module of solutions.ui, function, prefix of its widget keys).
#: Only the tool the user picks is drawn, so the inputs of the others are kept as above
#: (file uploaders and chart selections cannot be written and are not kept).
TOOLS = (("Gas in solution", "gas", "render_gas", "gas_"),
         ("Partition between liquids", "partition", "render_partition", "pt_"),
         ("Vapor-pressure fit", "vpfit", "render_vpfit", "vp_"))
NOT_WRITABLE = ("vp_upload",)


def keep_widget_values(state: MutableMapping) -> None:
    """Write every :data:`KEPT_WIDGETS` value, and the inputs of the tools not shown in
    this run (see :data:`TOOLS`), back into ``state``."""
    for k in KEPT_WIDGETS + ("more_tool",):
        if k in state:
            state[k] = state[k]
    hidden = tuple(prefix for title, _, _, prefix in TOOLS if title != state.get("more_tool"))
    for k in list(state.keys()):
        if (isinstance(k, str) and k.startswith(hidden) and k not in NOT_WRITABLE
                and "chart" not in k):
            state[k] = state[k]


# ------------------------------------------------------------------ callbacks
# Each takes the session state (any mutable mapping), so each is tested on a plain dict.
def _new_table(state: MutableMapping, table: pd.DataFrame, name: str | None,
               notes: list[str]) -> None:
    state["demo"] = None  # the table is no longer a demo
    state["recipe_table"] = table
    if name is not None:
        state["recipe_name"] = name
    state["load_notes"] = notes
    state.pop(EDITOR_KEY, None)


def on_demo(state: MutableMapping) -> None:
    """The demo box changed, or "Reload demo" was pressed."""
    if state.get("demo") is not None:
        load_demo(state, state["demo"])


def on_clear(state: MutableMapping) -> None:
    _new_table(state, blank_table(3), "my recipe", [])


def on_paste(state: MutableMapping) -> None:
    """Read the paste box into the table; a block the page cannot read leaves the table
    as it was, with the reason in the notes."""
    try:
        df, notes = frame_from_text(state.get("paste_text") or "",
                                    decimal_comma=bool(state.get("decimal_comma")))
    except SolutionsError as exc:
        state["load_notes"] = [f"the pasted block was not read: {exc}"]
        return
    _new_table(state, df, "pasted recipe", notes)


def on_upload(state: MutableMapping) -> None:
    """Read the uploaded file (CSV, TSV, TXT or XLSX) into the table."""
    f = state.get("upload")
    if f is None:
        return
    name = Path(str(getattr(f, "name", "") or "upload")).name
    try:
        df, notes = frame_from_upload(name, f.getvalue(),
                                      decimal_comma=bool(state.get("decimal_comma")))
    except SolutionsError as exc:
        state["load_notes"] = [f"{name!r} was not read: {exc}"]
        return
    _new_table(state, df, Path(name).stem[:80] or "uploaded recipe", notes)


def on_solve(state: MutableMapping, key: str) -> None:
    state["target_request"] = (dataclasses.astuple(D.request_from(state)), key)
    state["design_message"] = ""


def on_plan_dilution(state: MutableMapping, key: str) -> None:
    state["dilution_request"] = (dataclasses.astuple(D.dilution_request_from(state)), key)


def on_load_adjusted(state: MutableMapping, frame: pd.DataFrame, name: str, note: str) -> None:
    _new_table(state, frame, name, [note])
    state["target_request"] = None
    state["design_message"] = note


def on_bases(state: MutableMapping) -> None:
    state["bases"] = list(state["bases_pick"])


def on_preset(state: MutableMapping) -> None:
    if state.get("pressure_preset") in PRESSURE_PRESETS:
        state["P_kPa"] = PRESSURE_PRESETS[state["pressure_preset"]]


def on_pressure_typed(state: MutableMapping) -> None:
    match = [k for k, v in PRESSURE_PRESETS.items() if abs(v - state["P_kPa"]) < 1e-9]
    state["pressure_preset"] = match[0] if match else CUSTOM_PRESSURE


def on_add_ingredient(state: MutableMapping) -> None:
    try:
        rec = custom_ingredient(state.get("new_name"), state.get("new_formula"),
                                state.get("new_molar_mass"), state.get("new_density"),
                                state.get("new_ions"))
    except SolutionsError as exc:
        state["library_message"] = f"error: {exc}"
        return
    others = [r for r in state["custom_ingredients"] if r["name"].lower() != rec["name"].lower()]
    state["custom_ingredients"] = [*others, rec]
    state["library_message"] = f"added {rec['name']!r} for this session"


def on_save_library(state: MutableMapping) -> None:
    """Write the session's ingredients to the app's own file
    (:func:`~solutions.ui.safe.user_library_path`), never to a typed path."""
    path = user_library_path()
    try:
        path.parent.mkdir(parents=True, exist_ok=True)
        write_library_file(path, session_ingredients(state))
    except (SolutionsError, OSError) as exc:
        reason = exc.strerror if isinstance(exc, OSError) and exc.strerror else str(exc)
        state["library_message"] = f"error: could not save your ingredients: {reason}"
        return
    state["library_message"] = (f"saved {len(state['custom_ingredients'])} ingredient(s) "
                                "to your ingredient file")


__all__ += ["PageKey", "page_key", "KEPT_WIDGETS", "keep_widget_values", "on_demo",
            "on_clear", "on_paste", "on_upload", "on_solve", "on_plan_dilution",
            "on_load_adjusted", "on_bases", "on_preset", "on_pressure_typed",
            "on_add_ingredient", "on_save_library"]
