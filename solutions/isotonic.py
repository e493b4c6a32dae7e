"""Isotonicity by the sodium-chloride-equivalent (E-value) method, shown beside the model.

The E-value of an ingredient is the mass of sodium chloride with the same osmotic effect
as 1 g of it (common practice in pharmaceutical compounding). A solution is taken as
isotonic when the sum of E × (g per 100 mL) over its ingredients equals 0.9 g per 100 mL;
the amount of one ingredient that makes it so is (0.9 − Σ others) / E of that ingredient.
E-values are single-concentration approximations: the activity model is the primary result.
"""
from __future__ import annotations

import re
from typing import Mapping

from .limits import e_value_table
from .recipe import ResolvedRecipe

__all__ = ["e_value_isotonic", "ISOTONIC_OSMOLALITY", "ISOTONIC_NACL_G_PER_100ML"]

#: osmolality taken as isotonic with body fluids [mol/kg] (290 mOsm/kg, common practice)
ISOTONIC_OSMOLALITY = 0.290
#: NaCl concentration taken as isotonic for the E-value method [g/100 mL] (common practice)
ISOTONIC_NACL_G_PER_100ML = 0.9


def _norm(text: str) -> str:
    return re.sub(r"[\s_\-,]+", "", str(text).strip().lower().replace("·", "."))


def e_value_isotonic(res: ResolvedRecipe, row_id: int, e_values_override: Mapping[str, float]
                     | None = None, nacl_isotonic: float = ISOTONIC_NACL_G_PER_100ML) -> dict:
    """Amount of recipe row ``row_id`` that makes the recipe isotonic by the E-value method.

    c_X = (0.9 − Σ_{j≠X} E_j c_j) / E_X, with c in g per 100 mL of the recipe's volume at its
    preparation temperature (mass of the form as weighed) and E the sodium chloride
    equivalent of that form (``e_values.csv``; ``e_values_override`` maps a library key,
    library name or the name as typed to E and wins). Returns a dict with
    ``available`` False and a ``reason`` when some E-value is missing.
    """
    table = e_value_table()
    over = {_norm(k): float(v) for k, v in (e_values_override or {}).items()}
    V = res.volume_prep
    per100 = lambda m: m / V / 10.0  # noqa: E731  kg / m³ → g / 100 mL
    items, missing = [], []
    for j, r in enumerate(res.solute_rows):
        ing = r.ingredient
        E, src, derived = None, "", ""
        for k in (r.text, ing.key, ing.name):
            if _norm(k) in over:
                E, src = over[_norm(k)], "given"
                break
        if E is None and ing.key in table:
            e = table[ing.key]
            E, src, derived = e["E"], e["source"], e["derived"]
        if E is None:
            missing.append(r.text)
        items.append({"ingredient": r.text, "row": r.row, "E": E, "source": src,
                      "derived": derived, "g_per_100_mL": per100(float(res.pure_kg[j])),
                      "nacl_equivalent_g_per_100_mL": None if E is None else
                      E * per100(float(res.pure_kg[j]))})
    out = {"isotonic_nacl_g_per_100_mL": nacl_isotonic, "volume_mL": V * 1e6,
           "volume_read_at_C": res.T_prep - 273.15, "ingredients": items,
           "note": "sodium-chloride-equivalent method (common practice): E-values are "
                   "single-concentration approximations; the model result is the primary one"}
    if missing:
        out.update(available=False, reason="no E-value for " + ", ".join(missing)
                   + " in e_values.csv")
        return out
    X = next(i for i in items if i["row"] == row_id)
    if not X["E"]:
        out.update(available=False, reason=f"the E-value of {X['ingredient']} is zero")
        return out
    others = sum(i["nacl_equivalent_g_per_100_mL"] for i in items if i["row"] != row_id)
    c = (nacl_isotonic - others) / X["E"]
    out.update(available=True, varied=X["ingredient"], E_varied=X["E"],
               others_nacl_equivalent_g_per_100_mL=others,
               g_per_100_mL=c, g_in_batch=c * V * 1e4,
               model_g_per_100_mL=X["g_per_100_mL"], model_g_in_batch=X["g_per_100_mL"] * V * 1e4,
               difference_percent=(c / X["g_per_100_mL"] - 1.0) * 100.0
               if X["g_per_100_mL"] > 0 else None)
    if c < 0:
        out["note"] += ("; the other ingredients alone are already hypertonic by this method, "
                        "so none should be added")
    return out
