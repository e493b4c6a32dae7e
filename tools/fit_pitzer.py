"""Fit single-salt Pitzer parameters (β0, β1, Cφ) for salts with no published set here,
to published freezing points.

At the freezing point a_w = a_ice(T_f), so a freezing-point table gives the osmotic
coefficient φ = −ln a_w / (ν b M_w) at T_f. The Pitzer equation for φ is linear in β0, β1
and Cφ once A_φ(T_f) is known (A_φ from solutions.activity.pitzer), so the fit is a
weighted linear least squares that minimises the relative error of the depression. The
parameters are taken as independent of temperature: the rows written to
solutions/data/pitzer_binary.csv are valid from the lowest fitted freezing point to 25 °C,
and results elsewhere carry a warning.

Source data: CRC Handbook 102nd ed. (2021), Concentrative Properties of Aqueous Solutions
(solutions/data/tables/crc_aqueous_20C_electrolytes.csv). Run: python tools/fit_pitzer.py
"""
from __future__ import annotations

import csv
import sys
from pathlib import Path

import numpy as np
import pandas as pd

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from solutions.activity.pitzer import B_PITZER, debye_huckel_Aphi  # noqa: E402
from solutions.colligative import T_TRIPLE  # noqa: E402
from solutions.ingredients import M_WATER, molar_mass_from_formula  # noqa: E402
from solutions.water import ice_water_activity  # noqa: E402

OUT = ROOT / "solutions" / "data" / "pitzer_binary.csv"
T0 = T_TRIPLE  # a_ice = 1 at the triple point on the sublimation/liquid ratio scale
ALPHA = 2.0

# salt key: (CRC solute, anhydrous formula, nu_M, nu_X, z_M, z_X)
# Na2CO3 is no longer fitted here: the Marion (2001) set is used (see pitzer_binary_README.md);
# the CRC table's sodium carbonate rows from 2 % on lie 6-13 % below three published sets.
SALTS = {
    "K2CO3": ("Potassium carbonate", "K2CO3", 2, 1, 1, -2),
    # the table's mass % for this salt is of the anhydrous salt (its molality column says so)
    "Na3C6H5O7": ("Sodium citrate dihydrate", "Na3C6H5O7", 3, 1, 1, -3),
    # no published Pitzer set was found for sodium acetate (Kim & Frederick 1988 not seen)
    "NaC2H3O2": ("Sodium acetate", "NaC2H3O2", 1, 1, 1, -1),
}
# rows (mass %) kept out of the fit and used only to check it (tests/test_pitzer_data.py)
HOLD_OUT = {"NaC2H3O2": (1.0, 4.0, 7.0)}
SOURCE = ("fitted by tools/fit_pitzer.py (β0, β1, Cφ; α = 2, b = 1.2; temperature-independent) "
          "to the freezing points of CRC Handbook 102nd ed. (2021) Concentrative Properties of "
          "Aqueous Solutions")


def fit(b, dT, nuM, nuX, zM, zX):
    nu = nuM + nuX
    T = T0 - dT
    phi = -np.log(ice_water_activity(T)) / (nu * b * M_WATER)
    I = 0.5 * b * (nuM * zM ** 2 + nuX * zX ** 2)
    sI = np.sqrt(I)
    f = -debye_huckel_Aphi(T) * sI / (1 + B_PITZER * sI)
    y = phi - 1 - abs(zM * zX) * f
    k1 = b * 2 * nuM * nuX / nu
    X = np.stack([k1, k1 * np.exp(-ALPHA * sI), b ** 2 * 2 * (nuM * nuX) ** 1.5 / nu], axis=1)
    # δ(ln a_w) = ν b M_w δφ, and δ(ΔT) ≈ δ(ln a_w) / 0.0097 K⁻¹ near 0 °C
    wt = nu * b * M_WATER / 0.0097 / np.maximum(0.03 * dT, 0.15)
    if b.max() < 1.5:  # too short a range to pin the third virial term: Cφ = 0
        X = X[:, :2]
    coef, *_ = np.linalg.lstsq(X * wt[:, None], y * wt, rcond=None)
    coef = np.append(coef, 0.0) if len(coef) == 2 else coef
    resid = (X @ coef[:X.shape[1]] - y) * wt
    return coef, float(np.max(np.abs(resid)))


def fit_check(coef, b, dT, nuM, nuX, zM, zX):
    """Weighted residuals of given coefficients on rows not used in the fit."""
    nu = nuM + nuX
    T = T0 - dT
    phi = -np.log(ice_water_activity(T)) / (nu * b * M_WATER)
    sI = np.sqrt(0.5 * b * (nuM * zM ** 2 + nuX * zX ** 2))
    y = phi - 1 - abs(zM * zX) * (-debye_huckel_Aphi(T) * sI / (1 + B_PITZER * sI))
    k1 = b * 2 * nuM * nuX / nu
    X = np.stack([k1, k1 * np.exp(-ALPHA * sI), b ** 2 * 2 * (nuM * nuX) ** 1.5 / nu], axis=1)
    wt = nu * b * M_WATER / 0.0097 / np.maximum(0.03 * dT, 0.15)
    resid = (X @ coef - y) * wt
    return resid, float(np.max(np.abs(resid)))


def main() -> None:
    tab = pd.read_csv(ROOT / "solutions" / "data" / "tables" / "crc_aqueous_20C_electrolytes.csv")
    rows = list(csv.DictReader(open(OUT, encoding="utf-8")))
    fields = list(rows[0].keys())
    rows = [r for r in rows if r["salt"] not in SALTS]
    for key, (crc, formula, nuM, nuX, zM, zX) in SALTS.items():
        d = tab[tab.solute == crc].dropna(subset=["freezing_point_depression_K"])
        held = d[d.mass_pct.isin(HOLD_OUT.get(key, ()))]
        d = d[~d.mass_pct.isin(HOLD_OUT.get(key, ()))]
        M = molar_mass_from_formula(formula)
        w = d.mass_pct.to_numpy() / 100
        b = w / ((1 - w) * M)
        dT = d.freezing_point_depression_K.to_numpy()
        coef, worst = fit(b, dT, nuM, nuX, zM, zX)
        print(f"{key:10s} n={len(b):2d} b<={b.max():.3f} β0={coef[0]:.5f} β1={coef[1]:.5f} "
              f"Cφ={coef[2]:.6f}  worst/allowance≈{worst:.2f}")
        if len(held):
            wh = held.mass_pct.to_numpy() / 100
            bh = wh / ((1 - wh) * M)
            _, worst_h = fit_check(coef, bh, held.freezing_point_depression_K.to_numpy(),
                                   nuM, nuX, zM, zX)
            print(f"{'':10s} held-out rows {list(held.mass_pct)}: worst/allowance≈{worst_h:.2f}")
        for name, v in zip(("beta0", "beta1", "Cphi"), coef):
            rows.append({**{k: "" for k in fields}, "salt": key, "nu_M": str(nuM),
                         "nu_X": str(nuX), "z_M": str(zM), "z_X": str(zX),
                         "alpha1": str(ALPHA), "alpha2": "0.0",
                         "b_max_mol_per_kg": f"{b.max() * 1.01:.4g}",
                         "b_max_source": "highest molality of the fitted table rows (+1 %)",
                         "set": "fitted", "T_min_K": f"{np.floor(T0 - dT.max() - 0.5):.2f}",
                         "T_max_K": "298.15", "param": name, "form": "const",
                         "a1": repr(float(v)), "source": SOURCE})
    with open(OUT, "w", newline="", encoding="utf-8") as fh:
        w = csv.DictWriter(fh, fieldnames=fields)
        w.writeheader()
        w.writerows(rows)


if __name__ == "__main__":
    main()
