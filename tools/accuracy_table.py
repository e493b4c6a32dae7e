"""Print the freezing-point accuracy table of the README: the default model's and the
dilute-ideal (ΔT = i K_f b) errors against published freezing points.

Run from the project root: python tools/accuracy_table.py
"""
from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import pandas as pd

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from solutions.colligative import freezing_point  # noqa: E402
from solutions.composition import Composition  # noqa: E402
from solutions.ingredients import default_library  # noqa: E402

# (table file, solute in table, library name, max mass %) — the project's accuracy targets
CASES = [
    ("electrolytes", "Sodium chloride", "NaCl", 20),
    ("electrolytes", "Potassium chloride", "KCl", 15),
    ("electrolytes", "Calcium chloride", "CaCl2", 25),
    ("nonelectrolytes", "Sucrose", "sucrose", 50),
    ("nonelectrolytes", "D-Glucose", "glucose anhydrous", 40),
    ("nonelectrolytes", "Glycerol", "glycerol", 50),
    ("nonelectrolytes", "1,2-Ethanediol", "ethylene glycol", 60),
    ("nonelectrolytes", "Methanol", "methanol", 50),
    ("nonelectrolytes", "Ethanol", "ethanol", 10),
    ("nonelectrolytes", "Urea", "urea", 44),
]


def rows():
    lib = default_library()
    for kind, solute, name, wmax in CASES:
        t = pd.read_csv(ROOT / "solutions" / "data" / "tables" / f"crc_aqueous_20C_{kind}.csv")
        d = t[(t.solute == solute) & (t.mass_pct <= wmax)].dropna(
            subset=["freezing_point_depression_K"])
        w = d.mass_pct.to_numpy()[:, None] / 100
        comp = Composition.from_mass_fractions((lib.get(name),), w, lib.get("water"))
        ref = d.freezing_point_depression_K.to_numpy()
        out = {"solute": name, "range": f"≤ {d.mass_pct.max():g} %", "n": len(ref)}
        for model in ("nonideal", "dilute"):
            _, dT, _ = freezing_point(comp, model)
            err = dT - ref
            allow = np.maximum(0.15, 0.03 * ref)
            i = int(np.argmax(np.abs(err) / allow))
            out[model] = (float(np.max(np.abs(err))), float(np.max(np.abs(err) / allow)),
                          float(d.mass_pct.iloc[i]))
        yield out


def main():
    print("| solute | range (w/w) | points | default: max abs error | dilute ideal: max abs error |")
    print("|---|---|---|---|---|")
    for r in rows():
        nd, di = r["nonideal"], r["dilute"]
        print(f"| {r['solute']} | {r['range']} | {r['n']} | {nd[0]:.2f} K "
              f"({nd[1]:.2f} of allowance) | {di[0]:.2f} K ({di[1]:.1f} of allowance) |")


if __name__ == "__main__":
    main()
