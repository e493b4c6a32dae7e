"""Build solutions/data/solubility.csv from the published tables under solutions/data/tables/.

Input: ``tables/crc_aqueous_solubility_inorganic.csv`` (CRC Handbook, "Aqueous Solubility of
Inorganic Compounds at Various Temperatures": mass % of the anhydrous solute in the saturated
solution, 0-100 °C). Each formula is matched to the library's dissolved solute by molar mass
(molmass atomic weights); the value is converted to g of anhydrous solute per 100 g water,
s = 100 w / (100 − w). The rows of solubility.csv that come from other sources (sugars, the
NaCl 20/25 °C rows read from the CRC molality table) are kept as they are.

Output columns: ingredient (the dissolved-solute key, as limits.py and targeting.py read it),
ingredient_key (a library key of that solute, anhydrous form where there is one), formula,
T_C, solubility_g_per_100g_water, source.

Run: python tools/build_solubility.py
"""
from __future__ import annotations

import csv
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from solutions.ingredients import default_library, molar_mass_from_formula  # noqa: E402

OUT = ROOT / "solutions" / "data" / "solubility.csv"
TABLE = ROOT / "solutions" / "data" / "tables" / "crc_aqueous_solubility_inorganic.csv"
FIELDS = ["ingredient", "ingredient_key", "formula", "T_C", "solubility_g_per_100g_water",
          "source"]
# rows from these sources are kept when the table is rebuilt
KEEP = ("Mohos", "Hudson", "Gillis", "molality of saturated solution")


def solute_of(formula: str, lib) -> tuple[str, str]:
    """(solute key, library key) of the library entry whose dissolved solute is ``formula``."""
    M = molar_mass_from_formula(formula)
    hits = [i for i in lib if i.kind != "solvent" and abs(i.M_solute - M) < 1e-6
            and i.formula and i.solution_pct_w_w is None]
    solutes = {i.solute for i in hits}
    if len(solutes) != 1:
        raise SystemExit(f"{formula}: matches solutes {sorted(solutes)}; fix the table")
    best = sorted(hits, key=lambda i: (i.hydrate_water, i.key))[0]
    return best.solute, best.key


def main() -> None:
    lib = default_library()
    old = list(csv.DictReader(open(OUT, encoding="utf-8")))
    kept = []
    for r in old:
        if any(k in r["source"] for k in KEEP):
            if r["ingredient"] in lib:  # a name: store the solute key, as for the other rows
                ing = lib.get(r["ingredient"])
                r["ingredient"], r["ingredient_key"] = ing.solute, ing.key
            elif not r.get("ingredient_key"):  # a generic name of several forms
                r["ingredient_key"] = ""
            kept.append({k: r.get(k, "") for k in FIELDS})
    have = {(lib.get(r["ingredient"]).solute if r["ingredient"] in lib else r["ingredient"],
             float(r["T_C"])) for r in kept}
    rows = list(kept)
    for r in csv.DictReader(open(TABLE, encoding="utf-8")):
        solute, key = solute_of(r["formula"], lib)
        if (solute, float(r["T_C"])) in have:
            continue
        w = float(r["mass_pct"])
        rows.append({"ingredient": solute, "ingredient_key": key, "formula": r["formula"],
                     "T_C": r["T_C"], "solubility_g_per_100g_water": f"{100 * w / (100 - w):.4g}",
                     "source": r["source"] + "; converted here to g anhydrous solute per 100 g "
                                             "water, s = 100 w/(100 - w)"})
    with open(OUT, "w", newline="", encoding="utf-8") as fh:
        w = csv.DictWriter(fh, fieldnames=FIELDS)
        w.writeheader()
        w.writerows(rows)
    print(f"{len(rows)} rows ({len(kept)} kept from other sources)")


if __name__ == "__main__":
    main()
