"""Fit water-activity correlations of non-electrolytes to published freezing points.

At the freezing point a solution's water activity equals that of ice at the same
temperature, a_w = a_ice(T_f) (IAPWS sublimation over Murphy–Koop supercooled liquid),
so a freezing-point table is a water-activity table. For each solute this fits the
Norrish (1966) equation extended by higher terms,

    ln a_w = ln x_w + K1 x_s² + K2 x_s³ + K3 x_s⁴ + K4 x_s⁵ + K5 x_s⁶

(x_s solute mole fraction, x_w = 1 − x_s), weighted so the fit minimises the relative
error of the freezing-point depression, and writes solutions/data/nonelectrolyte_activity.csv.
The number of terms grows with the concentration range so short tables are not over-fitted.

Sources: CRC Handbook 102nd ed. (2021), Concentrative Properties of Aqueous Solutions (20 °C
table, freezing-point column) in solutions/data/tables/; propylene glycol from the coolant
table tests/reference/coolant_freezing.csv when present. Run: python tools/fit_activity.py
"""
from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import pandas as pd
from scipy.optimize import brentq

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from solutions.colligative import T_TRIPLE  # noqa: E402
from solutions.ingredients import M_WATER, molar_mass_from_formula  # noqa: E402
from solutions.water import ice_water_activity  # noqa: E402

TABLES = ROOT / "solutions" / "data" / "tables"
OUT = ROOT / "solutions" / "data" / "nonelectrolyte_activity.csv"
CRC_SOURCE = ("Norrish-form fit by tools/fit_activity.py to freezing points of CRC Handbook "
              "102nd ed. (2021) Concentrative Properties of Aqueous Solutions")

CRC = {
    "Sucrose": "sucrose", "D-Glucose": "glucose", "D-Fructose": "fructose",
    "Glycerol": "glycerol", "1,2-Ethanediol": "ethylene glycol", "Ethanol": "ethanol",
    "Methanol": "methanol", "2-Propanol": "2-propanol", "D-Mannitol": "mannitol",
    "D-Lactose": "lactose", "Maltose": "maltose", "Urea": "urea",
    "Tris(hydroxymethyl)methylamine": "tromethamine", "Citric acid": "citric acid",
    "Acetone": "acetone", "Acetic acid": "acetic acid", "D-Lactic acid": "lactic acid",
}
# Where three terms cannot follow a table to its end, fit the range formulators use.
W_MAX = {"Ethanol": 50.0, "Methanol": 50.0}


def T_pure() -> float:
    """Temperature where ice and pure liquid water coexist on this ice-activity scale [K]:
    the triple point, where a_ice = 1 by construction of the ratio."""
    return T_TRIPLE


def fit(x_s: np.ndarray, dT: np.ndarray, T0: float, nterms: int):
    ln_aw = np.log(ice_water_activity(T0 - dT))
    y = ln_aw - np.log1p(-x_s)
    wt = 1.0 / np.maximum(0.03 * dT, 0.15)
    A = np.stack([x_s ** (2 + k) for k in range(nterms)], axis=1)
    # residual in ln a_w ≈ 0.0097 K⁻¹ × residual in ΔT near 0 °C: weight as ΔT error
    coef, *_ = np.linalg.lstsq(A * (wt / 0.0097)[:, None], y * wt / 0.0097, rcond=None)
    K = np.zeros(5)
    K[:nterms] = coef
    return K


def predict_dT(x_s, K, T0):
    ln_aw = np.log1p(-x_s) + sum(K[k] * x_s ** (2 + k) for k in range(5))
    return np.array([T0 - brentq(lambda T: np.log(ice_water_activity(T)) - a, 150.0, T0)
                     for a in ln_aw])



def main() -> None:
    T0 = T_pure()
    tab = pd.read_csv(TABLES / "crc_aqueous_20C_nonelectrolytes.csv")
    sets = []
    for crc, key in CRC.items():
        d = tab[(tab.solute == crc)].dropna(subset=["freezing_point_depression_K",
                                                    "molality_mol_per_kg"])
        d = d[(d.freezing_point_depression_K > 0) & (d.mass_pct <= W_MAX.get(crc, 100.0))]
        sets.append((key, d.molality_mol_per_kg.to_numpy(), d.mass_pct.to_numpy(),
                     d.freezing_point_depression_K.to_numpy(), CRC_SOURCE + " (20 °C table)"))
    ref = ROOT / "tests" / "reference" / "coolant_freezing.csv"
    if ref.exists():
        c = pd.read_csv(ref)
        pg = c[c.solute.str.lower().str.contains("propylene")].dropna(
            subset=["volume_pct", "freezing_point_C"])
        pg = pg[pg.volume_pct > 0]
        M = molar_mass_from_formula("C3H8O2")
        # antifreeze tables give % by volume of the pure liquids mixed: convert with the
        # pure densities at 20 °C (propylene glycol from the ingredient library, water IF97)
        from solutions.ingredients import default_library
        from solutions.water import water_density
        rho_pg, rho_w = default_library().get("propylene glycol").rho_pure, water_density(293.15)
        v = pg.volume_pct.to_numpy() / 100
        w = v * rho_pg / (v * rho_pg + (1 - v) * rho_w)
        src = str(pg.source.iloc[0]) if len(pg) else ""
        sets.append(("propylene glycol", w / ((1 - w) * M), w * 100,
                     -pg.freezing_point_C.to_numpy(),
                     "Norrish-form fit by tools/fit_activity.py to " + src
                     + " (volume % converted to mass % with pure densities at 20 °C)"))
    rows = []
    for key, b, wpct, dT, src in sets:
        if len(b) < 3:
            print(f"skip {key}: {len(b)} points")
            continue
        x_s = b * M_WATER / (1 + b * M_WATER)
        xmax = float(x_s.max())
        # terms grow with the range; a short or scattered table gets no more than three
        nterms = 1 if xmax < 0.03 else (2 if xmax < 0.1 else (3 if xmax < 0.2 or len(b) < 20
                                                              else 5))
        K = fit(x_s, dT, T0, nterms)
        pred = predict_dT(x_s, K, T0)
        err = np.abs(pred - dT)
        rel = np.max(err / np.maximum(dT * 0.03, 0.15))
        print(f"{key:18s} n={len(b):2d} x<={xmax:.3f} terms={nterms} K={K.round(3)} "
              f"max|err|={err.max():.3f} K  worst/allowance={rel:.2f}")
        rows.append(dict(solute=key, form="norrish",
                         **{f"K{k + 1}": repr(float(K[k])) for k in range(5)}, b_max=round(float(b.max()), 4),
                         w_max=round(float(wpct.max()) / 100, 4),
                         T_min_K=round(273.15 - float(dT.max()), 2), T_max_K=298.15, source=src))
    pd.DataFrame(rows).to_csv(OUT, index=False)


if __name__ == "__main__":
    main()
