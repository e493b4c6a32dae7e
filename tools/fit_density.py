"""Fit apparent specific volumes of solutes that have no published density coefficients.

Reads the CRC Handbook 20 °C tables in solutions/data/tables/, fits for each solute the
apparent specific volume of the solute,

    v_app(w) = (1/rho - (1 - w)/rho_w) / w  =  a0 + a1 w + a2 w^2 + a3 w^3   [m³/kg]

(w = solute mass fraction, rho_w = water density at 20 °C from IAPWS-IF97), by linear
least squares weighted to minimise the error in density, and appends the rows to
solutions/data/density_apparent.csv with form ``vapp_poly``. Run from the project root:

    python tools/fit_density.py

The fit is reproducible; tests/test_density.py checks the result against the same tables.
For each solute the script also prints a hold-out error: the same fit made on every other
row of the table and checked on the rows left out.

Ethanol, glycerol and propylene glycol are not fitted here: they use published density
correlations over w and T (OIML R 22, Volk & Kähler 2018, Melinder 2010; see
solutions/density.py), whose rows in density_apparent.csv this script keeps. Ethylene
glycol is fitted here at 20 °C and its row keeps the form ``melinder``: Melinder's
correlation then supplies only the change with temperature.
"""
from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import pandas as pd

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from solutions.water import water_density  # noqa: E402

TABLES = ROOT / "solutions" / "data" / "tables"
OUT = ROOT / "solutions" / "data" / "density_apparent.csv"

# CRC solute name -> our solute key, molar mass of the dissolved basis override (g/mol)
FITS = {
    "1,2-Ethanediol": "ethylene glycol",
    "D-Glucose": "glucose",
    "D-Fructose": "fructose",
    "D-Mannitol": "mannitol",
    "D-Lactose": "lactose",
    "Maltose": "maltose",
    "Urea": "urea",
    "Tris(hydroxymethyl)methylamine": "tromethamine",
    "Citric acid": "citric acid",
    "Methanol": "methanol",
    "2-Propanol": "2-propanol",
    "Acetone": "acetone",
    "D-Lactic acid": "lactic acid",
    # the table's mass % for this salt is of the anhydrous salt (its molality column says so)
    "Sodium citrate dihydrate": "trisodium citrate",
    # the Laliberté (2009) set for this salt deviates 0.4 % from the CRC table at 20 °C
    "Potassium carbonate": "K2CO3",
    # Laliberté's sucrose set reaches 50.7 %; syrups go to the table's 84 %. The CRC fit sets
    # the 20 °C values and Laliberté's set only their change with temperature (form
    # crc_laliberte, its coefficients in density_correlations.csv)
    "Sucrose": "sucrose",
}
#: solutes whose row takes a form that shifts the CRC 20 °C fit with temperature:
#: (form, T_min_K, T_max_K of the shifting correlation)
SHIFTED = {"sucrose": ("crc_laliberte", 288.15, 328.15)}
DEGREE = 3
# Quartic where a cubic misses the table by more than 0.2 %: the CRC 2-propanol table has
# 15 rows up to 20 % and then only 40, 60, 80 and 100 % (cubic: 0.25 %, quartic: 0.16 %).
# Between those last rows the curve is not pinned by data (cubic, quartic and quintic fits
# differ there by up to 0.6 %), and an every-other-row hold-out is not meaningful.
DEGREES = {"2-propanol": 4}
T_SHIFT_SOURCE = {"melinder": (
    " (20 °C values, to 60 %); change with temperature: Melinder, A. (2010) Properties of "
    "Secondary Working Fluids for Indirect Systems, IIR/IIF, density polynomial "
    "(solutions/data/density_correlations.csv), 0-100 degC"),
    "crc_laliberte": (
    " (20 °C values, to 84 %); change with temperature: Laliberté M. (2009) J. Chem. Eng. "
    "Data 54, 1725, sucrose coefficients (solutions/data/density_correlations.csv), 15-55 "
    "degC, held at its 50.66 % value above that")}
SOURCE = ("fitted by tools/fit_density.py (polynomial apparent specific volume) to CRC Handbook "
          "102nd ed. (2021) Concentrative Properties of Aqueous Solutions, 20 °C")


def fit_one(w: np.ndarray, rho: np.ndarray, rho_w: float, degree: int = DEGREE):
    """Fit v_app(w) to (w, rho); return the coefficients and the largest relative
    density error on the fitted rows."""
    v_app = (1.0 / rho - (1.0 - w) / rho_w) / w
    # density error δρ ≈ ρ² w δv: weight rows by ρ² w so the fit minimises density error
    wt = rho ** 2 * w
    A = np.vander(w, degree + 1, increasing=True) * wt[:, None]
    coef, *_ = np.linalg.lstsq(A, v_app * wt, rcond=None)
    return coef, np.max(np.abs(predict(coef, w, rho_w) / rho - 1.0))


def predict(coef, w, rho_w):
    """Density [kg/m³] from fitted coefficients at mass fractions ``w``."""
    return 1.0 / ((1.0 - w) / rho_w + w * (np.vander(w, len(coef), increasing=True) @ coef))


def holdout_error(w: np.ndarray, rho: np.ndarray, rho_w: float, degree: int = DEGREE) -> float:
    """Largest relative density error on the odd rows of a fit made on the even rows."""
    coef, _ = fit_one(w[::2], rho[::2], rho_w, degree)
    return float(np.max(np.abs(predict(coef, w[1::2], rho_w) / rho[1::2] - 1.0)))


def main() -> None:
    tab = pd.concat([pd.read_csv(p) for p in sorted(TABLES.glob("crc_aqueous_20C_*.csv"))])
    rho_w = float(water_density(293.15))
    rows = []
    for crc, key in FITS.items():
        d = tab[(tab.solute == crc) & (tab.mass_pct > 0)]
        if d.empty:
            print(f"skip {crc}: not in tables")
            continue
        w = d.mass_pct.to_numpy() / 100
        rho = d.density_g_per_cm3.to_numpy() * 1e3
        degree = DEGREES.get(key, DEGREE)
        coef, err = fit_one(w, rho, rho_w, degree)
        hold = holdout_error(w, rho, rho_w, degree)
        print(f"{key:20s} n={len(w):3d} w<={w.max():.2f} max density error {err * 100:.3f} % "
              f"(hold-out {hold * 100:.3f} %)")
        form, T_min, T_max = SHIFTED.get(key, ("vapp_poly", 288.15, 298.15))
        rows.append(dict(solute=key, form=form, c0=repr(float(coef[0])), c1=repr(float(coef[1])),
                         c2=repr(float(coef[2])), c3=repr(float(coef[3])),
                         c4=repr(float(coef[4])) if len(coef) > 4 else "", T_min_K=T_min,
                         T_max_K=T_max, w_max=round(float(w.max()), 4),
                         source=SOURCE + T_SHIFT_SOURCE.get(form, "")))
    old = pd.read_csv(OUT)
    new = pd.DataFrame(rows)
    # rows of another form (published T-dependent correlation) keep their form and range
    # and take only the 20 °C coefficients
    keep_form = old[(old.form != "vapp_poly") & old.solute.isin(new.solute)
                    & ~old.solute.isin(list(SHIFTED))]
    for _, r in keep_form.iterrows():
        i = new.index[new.solute == r.solute][0]
        for col in ("form", "T_min_K", "T_max_K", "w_max"):
            new.loc[i, col] = r[col]
        new.loc[i, "source"] = SOURCE + T_SHIFT_SOURCE.get(r.form, "")
    old = old[(old.form != "vapp_poly") & ~old.solute.isin(new.solute)]
    new = new.astype(object).where(new.notna(), "")
    pd.concat([old, new]).to_csv(OUT, index=False)


if __name__ == "__main__":
    main()
