"""Fit NRTL water–solute parameters for sugars, polyols, urea and small organic acids.

Model (1 = water, 2 = solute), τ_ij = a_ij + b_ij / T, α fixed per solute:

    ln a_w = ln x_1 + ln γ_1(x_1; τ_12, τ_21, α)        (solutions.activity.nrtl)

Data, each from a sourced table under solutions/data/tables/:

* freezing points — CRC Handbook 102nd ed. (2021), Concentrative Properties of Aqueous
  Solutions (20 °C table, freezing-point column). At the freezing point the solution's water
  activity equals that of ice, ln a_w(x, T_f) = ln a_ice(T_f) (``ice_water_activity``, on the
  same triple-point scale as ``tools/fit_activity.py`` and ``colligative.freezing_point``).
* sucrose only — water activity from the Starzak & Peacock (1997) correlation of 1197 published
  points, mostly boiling-point elevations (``sucrose_water_activity_correlation.csv``), on a grid
  5–80 % w/w at 25, 50, 75 and 100 °C, 5–70 % at 0 °C and 5–85 % at 120 °C
  (``SUCROSE_GRID``).

Every third point of each table (indices 1, 4, 7, …) is held out of the fit; the script prints
the fit and held-out errors beside those of the Norrish-form coefficients already in
``nonelectrolyte_activity.csv``, and writes the rows of ``solutions/data/nrtl_water.csv``
(rows for other solutes already in that file are kept).

Where the data are freezing points only (every solute but sucrose), they span a few kelvin
below 0 °C, which cannot separate a from b: b is set to 0 (τ independent of T; the water
activity of sugar solutions changes little between the freezing point and room temperature,
Miyawaki et al. 1997 Biosci. Biotechnol. Biochem. 61, 466) and the row's T range is the data's.
α is 0.3 unless the training points miss half their allowance with it (freezing points
max(0.15 K, 3 %), water activity 0.005); then the α among (0.2, 0.47, −0.3, −0.5, −1.0) with
the smallest worst error/allowance is taken (negative α as used for aqueous systems by Marina &
Tassios 1973, Ind. Eng. Chem. Process Des. Dev. 12, 67). A very small ridge term keeps the τ's
finite where the data fix only their combination.

Run: python tools/fit_nrtl_sugars.py
"""
from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import pandas as pd
from scipy.optimize import least_squares

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from solutions.activity.nonelectrolytes import (  # noqa: E402
    load_nonelectrolytes, ln_water_activity)
from solutions.activity.nrtl import ln_gamma_binary  # noqa: E402
from solutions.colligative import R, T_TRIPLE  # noqa: E402
from solutions.ingredients import M_WATER  # noqa: E402
from solutions.water import ice_water_activity  # noqa: E402

TABLES = ROOT / "solutions" / "data" / "tables"
OUT = ROOT / "solutions" / "data" / "nrtl_water.csv"
COLUMNS = ["solute", "a12", "b12_K", "a21", "b21_K", "alpha", "x2_max", "w_max", "T_min_K",
           "T_max_K", "data", "source"]
CRC_TABLE = "crc_aqueous_20C_nonelectrolytes.csv"
CRC_SOURCE = ("CRC Handbook of Chemistry and Physics 102nd ed. (2021), Concentrative Properties "
              "of Aqueous Solutions (20 °C table, freezing-point column)")
SP_SOURCE = ("Starzak & Peacock (1997) Zuckerindustrie 122, 380-387, water-activity correlation "
             "of 1197 published points (parameters read at cultures-sucre.com)")
CRC = {
    "Sucrose": "sucrose", "D-Glucose": "glucose", "D-Fructose": "fructose", "Urea": "urea",
    "D-Mannitol": "mannitol", "Maltose": "maltose", "D-Lactose": "lactose",
    "Citric acid": "citric acid", "D-Lactic acid": "lactic acid", "Acetic acid": "acetic acid",
    "Tris(hydroxymethyl)methylamine": "tromethamine",
}
M_SUCROSE = 0.34229648  # [kg/mol] C12H22O11, IUPAC 2013 standard atomic weights
ALPHA_DEFAULT = 0.3
# (T [°C], highest w) of the sucrose correlation grid, every 5 % w/w from 5 %: supersaturated
# beyond about 67 % at 25 °C; 120 °C and 85 % is the boiling curve of a confectioners' syrup
SUCROSE_GRID = ((0.0, 0.70), (25.0, 0.80), (50.0, 0.80), (75.0, 0.80), (100.0, 0.80),
                (120.0, 0.85))
ALPHAS_OTHER = (0.2, 0.47, -0.3, -0.5, -1.0)   # tried only when 0.3 misses half the allowance
SIGMA_AW = 0.001         # weight of a correlation a_w point [1]


def ln_aw_nrtl(p, x2, T, alpha):
    """ln a_w of the binary at solute mole fraction x2 and T [K]; p = (a12, b12, a21, b21)."""
    a12, b12, a21, b21 = p
    lg1, _ = ln_gamma_binary(1.0 - x2, a12 + b12 / T, a21 + b21 / T, alpha)
    return np.log1p(-x2) + lg1


def x_from_molality(b):
    return b * M_WATER / (1.0 + b * M_WATER)


def sucrose_correlation(x2, T):
    """a_w of aqueous sucrose from the Starzak & Peacock (1997) correlation (table values)."""
    t = pd.read_csv(TABLES / "sucrose_water_activity_correlation.csv", comment="#")
    v = dict(zip(t.parameter, t.value))
    lng = v["Q"] / (R * T) * x2 ** 2 * (1.0 + v["a"] * x2 + v["b"] * x2 ** 2)
    return np.exp(lng) * (1.0 - x2)


def _bisect_T(f, n, lo=200.0, hi=T_TRIPLE, iters=60):
    """Vectorized bisection for the temperature where f(T) changes sign, f > 0 at hi."""
    lo = np.full(n, lo)
    hi = np.full(n, hi)
    for _ in range(iters):
        mid = 0.5 * (lo + hi)
        pos = f(mid) > 0
        hi = np.where(pos, mid, hi)
        lo = np.where(pos, lo, mid)
    return 0.5 * (lo + hi)


def freezing_dT(ln_aw):
    """Freezing-point depression [K] for each ln a_w: ln a_ice(T_f) = ln a_w, ΔT = T_tp − T_f."""
    ln_aw = np.atleast_1d(np.asarray(ln_aw, dtype=float))
    return T_TRIPLE - _bisect_T(lambda T: np.log(ice_water_activity(T)) - ln_aw, ln_aw.size)


def nrtl_freezing_dT(p, x2, alpha):
    """Freezing-point depression [K] of the NRTL binary at solute mole fractions x2."""
    x2 = np.atleast_1d(np.asarray(x2, dtype=float))
    return T_TRIPLE - _bisect_T(
        lambda T: np.log(ice_water_activity(T)) - ln_aw_nrtl(p, x2, T, alpha), x2.size)


def load_sets():
    """{solute: dict(frz=DataFrame, aw=DataFrame|None)} with a 'hold' column (True = held out)."""
    crc = pd.read_csv(TABLES / CRC_TABLE)
    sets = {}
    for name, key in CRC.items():
        d = crc[crc.solute == name].dropna(subset=["freezing_point_depression_K",
                                                  "molality_mol_per_kg"])
        d = d[d.freezing_point_depression_K > 0].reset_index(drop=True)
        frz = pd.DataFrame({"w": d.mass_pct / 100, "x2": x_from_molality(d.molality_mol_per_kg),
                            "dT": d.freezing_point_depression_K})
        frz["T"] = T_TRIPLE - frz.dT
        frz["hold"] = np.arange(len(frz)) % 3 == 1
        sets[key] = {"frz": frz, "aw": None}
    rows = []
    for T_C, wmax in SUCROSE_GRID:
        w = np.round(np.arange(0.05, wmax + 1e-9, 0.05), 2)
        x2 = (w / M_SUCROSE) / (w / M_SUCROSE + (1 - w) / M_WATER)
        T = T_C + 273.15
        for wi, xi in zip(w, x2):
            rows.append((wi, xi, T, float(sucrose_correlation(xi, T))))
    aw = pd.DataFrame(rows, columns=["w", "x2", "T", "a_w"])
    aw["hold"] = np.arange(len(aw)) % 3 == 1
    sets["sucrose"]["aw"] = aw
    return sets


def residuals(q, data, alpha, with_b):
    p = (q[0], q[1] * 300.0, q[2], q[3] * 300.0) if with_b else (q[0], 0.0, q[1], 0.0)
    frz = data["frz"]
    ln_ice = np.log(ice_water_activity(frz["T"].to_numpy()))
    # slope d ln a_ice / dT near each T_f turns an ln a_w residual into kelvin
    slope = (np.log(ice_water_activity(frz["T"].to_numpy() + 0.01)) - ln_ice) / 0.01
    r_f = (ln_aw_nrtl(p, frz.x2.to_numpy(), frz["T"].to_numpy(), alpha) - ln_ice) / slope
    r = [r_f / (0.01 + 0.01 * frz.dT.to_numpy())]
    if data["aw"] is not None:
        aw = data["aw"]
        model = np.exp(ln_aw_nrtl(p, aw.x2.to_numpy(), aw["T"].to_numpy(), alpha))
        r.append((model - aw.a_w.to_numpy()) / SIGMA_AW)
    r.append(1e-3 * np.asarray(q))  # ridge: keeps τ's finite where data fix one combination
    return np.concatenate(r), p


def subset(data, held):
    out = {"frz": data["frz"][data["frz"].hold == held], "aw": None}
    if data["aw"] is not None:
        out["aw"] = data["aw"][data["aw"].hold == held]
    return out


def score(p, data, alpha):
    """Worst training error / allowance: freezing max(0.15 K, 3 %), a_w 0.005."""
    frz = data["frz"]
    dT = nrtl_freezing_dT(p, frz.x2.to_numpy(), alpha)
    s = float(np.max(np.abs(dT - frz.dT) / np.maximum(0.15, 0.03 * frz.dT)))
    if data["aw"] is not None:
        aw = data["aw"]
        a = np.exp(ln_aw_nrtl(p, aw.x2.to_numpy(), aw["T"].to_numpy(), alpha))
        s = max(s, float(np.max(np.abs(a - aw.a_w) / 0.005)))
    return s


def fit_alpha(data, alpha, with_b):
    best = None
    starts = ([-1, 1, 0, 0], [1, -1, 0, 0], [0, 0, 0, 0], [3, -3, 0, 0], [-3, 3, 0, 0],
              [1, -1, 1, -1], [-1, 1, -1, 1], [5, 5, 0, 0])
    for start in starts:
        q0 = start if with_b else start[:2]
        sol = least_squares(lambda q: residuals(q, data, alpha, with_b)[0], q0, method="trf",
                            max_nfev=4000)
        if best is None or sol.cost < best.cost:
            best = sol
    return residuals(best.x, data, alpha, with_b)[1]


def fit_one(key, data):
    """(alpha, (a12, b12, a21, b21), training score) fitted on the non-held-out points."""
    with_b = data["aw"] is not None
    train = subset(data, False)
    p = fit_alpha(train, ALPHA_DEFAULT, with_b)
    best = (score(p, train, ALPHA_DEFAULT), ALPHA_DEFAULT, p)
    if best[0] > 0.5:
        for alpha in ALPHAS_OTHER:
            p = fit_alpha(train, alpha, with_b)
            s = score(p, train, alpha)
            if s < best[0]:
                best = (s, alpha, p)
    return best[1], best[2]


def errors(key, data, p, alpha):
    """Per point absolute errors: freezing ΔT [K] and a_w [1], for NRTL and the Norrish row."""
    norrish = load_nonelectrolytes().get(key)
    frz = data["frz"]
    out = frz.copy()
    out["dT_nrtl"] = nrtl_freezing_dT(p, frz.x2.to_numpy(), alpha)
    if norrish is not None:
        b = frz.x2 / ((1 - frz.x2) * M_WATER)
        out["dT_norrish"] = freezing_dT(ln_water_activity(norrish, b.to_numpy()))
    aw = None
    if data["aw"] is not None:
        aw = data["aw"].copy()
        aw["aw_nrtl"] = np.exp(ln_aw_nrtl(p, aw.x2.to_numpy(), aw["T"].to_numpy(), alpha))
        if norrish is not None:
            b = aw.x2 / ((1 - aw.x2) * M_WATER)
            aw["aw_norrish"] = np.exp(ln_water_activity(norrish, b.to_numpy()))
    return out, aw


def monotone_and_bounded(p, alpha, x2_max, T_lo, T_hi):
    x = np.linspace(1e-6, x2_max, 400)
    for T in (T_lo, T_hi):
        a = np.exp(ln_aw_nrtl(p, x, T, alpha))
        if not (np.all(a > 0) and np.all(a <= 1) and np.all(np.diff(a) < 0)):
            return False
    return True


def report(key, frz, aw):
    def line(mask, label):
        f = frz[mask]
        allow = np.maximum(0.15, 0.03 * f.dT)
        err = np.abs(f.dT_nrtl - f.dT)
        s = (f"  {label:9s} n={len(f):2d} freezing max|err| NRTL {err.max():.3f} K"
             f" (worst/allowance {np.max(err / allow):.2f})")
        if "dT_norrish" in f:
            s += f"; Norrish {np.abs(f.dT_norrish - f.dT).max():.3f} K"
        return s
    print(line(~frz.hold, "fit"))
    print(line(frz.hold, "held-out"))
    if aw is not None:
        for held, label in ((False, "fit"), (True, "held-out")):
            a = aw[aw.hold == held]
            err = np.abs(a.aw_nrtl - a.a_w).max()
            s = f"  {label:9s} n={len(a):2d} a_w max|err| NRTL {err:.4f}"
            if "aw_norrish" in a:
                s += f"; Norrish {np.abs(a.aw_norrish - a.a_w).max():.4f}"
            print(s)
        a25 = aw[(np.abs(aw["T"] - 298.15) < 1e-6) & (aw.w <= 0.65 + 1e-9)]
        print(f"  25 °C to 65 % w/w: a_w max|err| NRTL "
              f"{np.abs(a25.aw_nrtl - a25.a_w).max():.4f}, "
              f"Norrish {np.abs(a25.aw_norrish - a25.a_w).max():.4f}")


def main() -> None:
    sets = load_sets()
    rows = []
    for key, data in sets.items():
        alpha, p = fit_one(key, data)
        frz, aw = errors(key, data, p, alpha)
        x2_max = float(max(frz.x2.max(), aw.x2.max() if aw is not None else 0.0))
        w_max = float(max(frz.w.max(), aw.w.max() if aw is not None else 0.0))
        T_min = float(frz["T"].min())
        T_max = float(aw["T"].max()) if aw is not None else float(frz["T"].max())
        ok = monotone_and_bounded(p, alpha, x2_max, T_min, T_max)
        print(f"{key:13s} alpha={alpha} a12={p[0]:.4f} b12={p[1]:.1f} a21={p[2]:.4f} "
              f"b21={p[3]:.1f}  x2<={x2_max:.4f} w<={w_max:.2f} T {T_min:.2f}-{T_max:.2f} K"
              f"  bounded&monotone={ok}")
        report(key, frz, aw)
        if not ok:
            print(f"  {key}: a_w not bounded and decreasing over the data range: row not written")
            continue
        if aw is not None:
            data_txt = (f"freezing points {frz.w.min() * 100:.1f}-{frz.w.max() * 100:.0f} % w/w "
                        f"({T_min:.2f}-{frz['T'].max():.2f} K); water activity from the "
                        f"correlation 5-{aw.w.max() * 100:.0f} % w/w at 273.15-"
                        f"{aw['T'].max():.2f} K; every third point held out")
            src = CRC_SOURCE + "; " + SP_SOURCE + "; NRTL fit by tools/fit_nrtl_sugars.py"
        else:
            data_txt = (f"freezing points only, {frz.w.min() * 100:.1f}-"
                        f"{frz.w.max() * 100:.0f} % w/w ({T_min:.2f}-{T_max:.2f} K); temperature "
                        "dependence not fitted (b = 0); every third point held out")
            src = CRC_SOURCE + "; NRTL fit by tools/fit_nrtl_sugars.py"
        rows.append(dict(solute=key, a12=round(p[0], 6), b12_K=round(p[1], 3), a21=round(p[2], 6),
                         b21_K=round(p[3], 3), alpha=alpha, x2_max=round(x2_max, 5),
                         w_max=round(w_max, 4), T_min_K=round(T_min, 2), T_max_K=round(T_max, 2),
                         data=data_txt, source=src))
    new = pd.DataFrame(rows, columns=COLUMNS)
    if OUT.exists():
        old = pd.read_csv(OUT)
        new = pd.concat([old[~old.solute.isin(new.solute)], new], ignore_index=True)
    new.to_csv(OUT, index=False)
    print(f"wrote {len(rows)} rows to {OUT.relative_to(ROOT)}")


if __name__ == "__main__":
    main()
