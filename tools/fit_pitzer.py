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
(solutions/data/tables/crc_aqueous_20C_electrolytes.csv) for K2CO3, Na3C6H5O7, NaC2H3O2.

De-icer salts (potassium formate KHCO2, potassium acetate KC2H3O2): freezing points from the
correlation of Melinder (2010) (coefficients in solutions/data/tables/
melinder2010_potassium_formate_acetate_freezing.csv), evaluated every 2.5 % w/w from 2.5 %
to the correlation's upper limit; the 12.5, 27.5 and 42.5 % points are held out. Along a
freezing curve T falls as b rises, so a temperature slope cannot be told apart from a
composition term: where constant parameters miss (potassium acetate), β0 and Cφ take a
linear term in (T − 298.15 K) (form ``linear_dT``) and the set is stated valid only over
the fitted freezing temperatures. Run: python tools/fit_pitzer.py
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
MELINDER_TABLE = (ROOT / "solutions" / "data" / "tables"
                  / "melinder2010_potassium_formate_acetate_freezing.csv")
T_REF = 298.15  # reference temperature of the linear_dT form [K]
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
# de-icer salts fitted to the Melinder (2010) correlation: key -> (formula, ν_M, ν_X, z_M, z_X,
# parameters given a linear T term)
MELINDER_SALTS = {
    "KHCO2": ("KHCO2", 1, 1, 1, -1, ()),
    "KC2H3O2": ("KC2H3O2", 1, 1, 1, -1, ("beta0", "Cphi")),
}
MELINDER_HOLD_OUT = (12.5, 27.5, 42.5)
MELINDER_SOURCE = ("fitted by tools/fit_pitzer.py (β0, β1, Cφ{lin}; α = 2, b = 1.2) to freezing "
                   "points every 2.5 % w/w from the correlation of Melinder Å. (2010) Properties "
                   "of Secondary Working Fluids for Indirect Systems, IIR (coefficients in "
                   "solutions/data/tables/melinder2010_potassium_formate_acetate_freezing.csv, "
                   "read in a public transcription; book tables not seen); 12.5, 27.5, 42.5 % "
                   "held out; valid along the fitted freezing curve only")
SOURCE = ("fitted by tools/fit_pitzer.py (β0, β1, Cφ; α = 2, b = 1.2; temperature-independent) "
          "to the freezing points of CRC Handbook 102nd ed. (2021) Concentrative Properties of "
          "Aqueous Solutions")


def _design(b, T, nuM, nuX, zM, zX, linear_T=()):
    """Response y and design matrix of the φ equation at (b, T); columns β0, β1, Cφ, then
    (T − 298.15) times each parameter named in ``linear_T``."""
    nu = nuM + nuX
    phi = -np.log(ice_water_activity(T)) / (nu * b * M_WATER)
    sI = np.sqrt(0.5 * b * (nuM * zM ** 2 + nuX * zX ** 2))
    y = phi - 1 - abs(zM * zX) * (-debye_huckel_Aphi(T) * sI / (1 + B_PITZER * sI))
    k1 = b * 2 * nuM * nuX / nu
    X = np.stack([k1, k1 * np.exp(-ALPHA * sI), b ** 2 * 2 * (nuM * nuX) ** 1.5 / nu], axis=1)
    cols = {"beta0": 0, "beta1": 1, "Cphi": 2}
    extra = [X[:, cols[p]] * (T - T_REF) for p in linear_T]
    return y, (np.column_stack([X, *extra]) if extra else X)


def _weights(b, dT, nu):
    # δ(ln a_w) = ν b M_w δφ, and δ(ΔT) ≈ δ(ln a_w) / 0.0097 K⁻¹ near 0 °C
    return nu * b * M_WATER / 0.0097 / np.maximum(0.03 * dT, 0.15)


def fit(b, dT, nuM, nuX, zM, zX, linear_T=()):
    """Weighted least squares; returns (coefficients, worst |residual| / allowance).
    Coefficients: β0, β1, Cφ, then the T slopes of the parameters in ``linear_T``."""
    T = T0 - dT
    y, X = _design(b, T, nuM, nuX, zM, zX, linear_T)
    wt = _weights(b, dT, nuM + nuX)
    if b.max() < 1.5:  # too short a range to pin the third virial term: Cφ = 0
        X = X[:, :2]
    coef, *_ = np.linalg.lstsq(X * wt[:, None], y * wt, rcond=None)
    coef = np.append(coef, 0.0) if len(coef) == 2 else coef
    resid = (X @ coef[:X.shape[1]] - y) * wt
    return coef, float(np.max(np.abs(resid)))


def fit_check(coef, b, dT, nuM, nuX, zM, zX, linear_T=()):
    """Weighted residuals of given coefficients on rows not used in the fit."""
    T = T0 - dT
    y, X = _design(b, T, nuM, nuX, zM, zX, linear_T)
    resid = (X @ coef - y) * _weights(b, dT, nuM + nuX)
    return resid, float(np.max(np.abs(resid)))


def melinder_points(key):
    """(mass % w/w, freezing-point depression [K]) on the 2.5 % grid from the Melinder (2010)
    correlation coefficients in the sourced table."""
    tab = pd.read_csv(MELINDER_TABLE)
    d = tab[tab.salt == key].sort_values("term_i")
    x = np.arange(2.5, float(d.x_max_mass_pct.iloc[0]) + 1e-9, 2.5)
    dx = x - float(d.x_base_mass_pct.iloc[0])
    t_f = sum(c * dx ** int(i) for i, c in zip(d.term_i, d.coefficient_C))
    return x, -t_f


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
    for key, (formula, nuM, nuX, zM, zX, lin) in MELINDER_SALTS.items():
        rows = [r for r in rows if r["salt"] != key]
        x, dT = melinder_points(key)
        held = np.isin(x, MELINDER_HOLD_OUT)
        M = molar_mass_from_formula(formula)
        b_all = x / 100 / ((1 - x / 100) * M)
        b, d = b_all[~held], dT[~held]
        coef, worst = fit(b, d, nuM, nuX, zM, zX, lin)
        _, worst_h = fit_check(coef, b_all[held], dT[held], nuM, nuX, zM, zX, lin)
        print(f"{key:10s} n={len(b):2d} b<={b.max():.3f} coef={np.round(coef, 6).tolist()}  "
              f"worst/allowance≈{worst:.2f}; held-out {x[held].tolist()}: {worst_h:.2f}")
        T_lo = np.floor(T0 - dT.max() - 0.5)
        T_hi = np.ceil(T0 - dT.min())
        slope = dict(zip(lin, coef[3:]))
        for name, v in zip(("beta0", "beta1", "Cphi"), coef[:3]):
            lin_row = name in slope
            rows.append({**{k: "" for k in fields}, "salt": key, "nu_M": str(nuM),
                         "nu_X": str(nuX), "z_M": str(zM), "z_X": str(zX),
                         "alpha1": str(ALPHA), "alpha2": "0.0",
                         "b_max_mol_per_kg": f"{b_all.max() * 1.01:.4g}",
                         "b_max_source": "highest molality of the fitted points (+1 %), the "
                                         "upper limit of the Melinder (2010) correlation",
                         "set": "fitted", "T_min_K": f"{T_lo:.2f}", "T_max_K": f"{T_hi:.2f}",
                         "param": name, "form": "linear_dT" if lin_row else "const",
                         "a1": repr(float(v)),
                         "a2": repr(float(slope[name])) if lin_row else "",
                         "source": MELINDER_SOURCE.format(
                             lin=(" + linear T terms of " + ", ".join(lin)) if lin else "")})
    with open(OUT, "w", newline="", encoding="utf-8") as fh:
        w = csv.DictWriter(fh, fieldnames=fields)
        w.writeheader()
        w.writerows(rows)


if __name__ == "__main__":
    main()
