"""Fit NRTL parameters of water(1)–organic(2) pairs to published freezing points and
isobaric vapor–liquid equilibria, and write ``solutions/data/nrtl_water.csv``.

    python tools/fit_nrtl.py            # fit, print fit and held-out errors, write the table
    python tools/fit_nrtl.py --check    # fit and print only (the table is not written)

Data (every table names its source in a ``source`` column), under
``solutions/data/tables/``:

* ``crc_aqueous_20C_nonelectrolytes.csv``: CRC freezing-point depressions of ethylene
  glycol, ethanol, methanol, 2-propanol, acetone and glycerol by mass %;
* ``lange_glycerol_freezing_points.csv``: glycerol at 50 and 60 % by mass (below 40 %
  the CRC table is finer; the two disagree at 10 %: Lange −1.6 °C, CRC −2.32 °C);
* ``lange_propylene_glycol_freezing_points.csv``: propylene glycol by volume % with
  the mixture's specific gravity, converted here to mass % as
  w = φ ρ_PG / (SG ρ_w), with ρ_PG/ρ_w the ratio of the pure densities at 20 °C
  (ingredient table and IAPWS water), an approximation of the 15.6 °C ratio;
* ``vle_ethanol_water_101kPa.csv``: ethanol–water bubble temperatures and vapor mole
  fractions at 101.325 kPa.

Model: NRTL with τ_ij = a_ij + b_ij / T and α = 0.3 (common practice for aqueous
organic pairs). Two exceptions, where the data ask for them:

* a freezing-only pair whose fit with τ independent of T at α = 0.3 misses a published
  point by more than max(0.15 K, 3 %) gets τ = a + b/T (the freezing points span tens
  of kelvin, which lets b be fitted, though confounded with composition: values at room
  temperature are then an extrapolation and carry a caveat; only |b| ≤ 1500 K is
  accepted), and if that still misses,
  τ independent of T with α fitted (bounds 0.1–1.0: below 0.1 the fits became steep
  and fragile just past the data); the best of the three by the
  largest error over the target is kept;
* ethanol: its freezing points (228–273 K) and boiling points (351–373 K) cannot both
  be met by τ = a + b/T (joint fit to freezing points to 60 %: 7 K off in freezing,
  2.3 K in bubble point, 10 K in the flash points it then predicts; the extended form
  a + b/T + e ln T met both ranges better but interpolated to near-ideal behaviour at
  20–50 °C, 20 K off in flash points). The fit therefore takes the whole isobaric VLE
  table and the freezing points to 10 % w/w only (``FIT_W_LIMIT``); the freezing points
  above 10 % are a held-out comparison, printed, and the table's ``T_min_K`` says
  where the fitted temperatures end.

Conditions:

* freezing: ln(x_w γ_w(T_f)) = ln a_ice(T_f), with a_ice from IAPWS R14-08 over
  Murphy–Koop supercooled water (:func:`solutions.water.ice_water_activity`) on the
  triple-point scale (T_f = 273.16 K − ΔT_f, as :mod:`solutions.colligative` uses);
  residual: the activity mismatch divided by d ln a_ice / dT (a temperature error),
  over the target tolerance max(0.15 K, 3 % of ΔT_f);
* VLE (modified Raoult's law, ideal vapor): bubble temperature residual over 0.3 K and
  vapor mole fraction residual over 0.015 (the target tolerances).

Every residual is thus in units of its tolerance, so the fit minimises the quantity
the accuracy tests check.

Where a pair has freezing data only, the temperature dependence can hardly be told apart
from the composition dependence: first b_12 = b_21 = 0 is tried (τ independent of T,
i.e. a_w at fixed composition independent of T, common practice for polyol and glycol
solutions), then the steps listed above; the table's ``data`` column says ``freezing``.

Held-out check: each pair is first fitted on two thirds of its points (every third
point held out) and the error on the held-out points is printed beside the fit error;
the written parameters come from the fit to all points.
"""
from __future__ import annotations

import argparse
from multiprocessing import Pool
import sys
import warnings
from pathlib import Path

import numpy as np
import pandas as pd
from scipy.optimize import brentq, least_squares

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

from solutions.activity.nrtl import ln_gamma_binary  # noqa: E402
from solutions.constants import P_ATM, T_TRIPLE, T_ZERO_C  # noqa: E402
from solutions.ingredients import M_WATER, default_library  # noqa: E402
from solutions.solvents import antoine_vapor_pressure  # noqa: E402
from solutions.water import ice_water_activity, saturation_pressure, water_density  # noqa: E402

TABLES = ROOT / "solutions" / "data" / "tables"
OUT = ROOT / "solutions" / "data" / "nrtl_water.csv"
ALPHA = 0.3
_alpha = ALPHA  # the α of the evaluation in progress
# start of the ethanol fit
ETHANOL_START = (3.3, -1000.0, -0.9, 700.0)
B_MAX_FREEZING_K = 1500.0
# highest mass fraction of freezing points used in the fit (the rest are compared only)
FIT_W_LIMIT = {"ethanol": 0.10}

CRC_NAMES = {"1,2-Ethanediol": "ethylene glycol", "Ethanol": "ethanol", "Methanol": "methanol", "2-Propanol": "2-propanol",
             "Acetone": "acetone", "Glycerol": "glycerol"}
# highest mass fraction fitted per solute (the ice branch of each published table)
W_LIMIT = {"ethanol": 0.60, "methanol": 0.50, "2-propanol": 0.20, "acetone": 0.10,
           "glycerol": 0.60, "ethylene glycol": 0.60, "propylene glycol": 0.60}


def molar_mass(solute: str) -> float:
    lib = default_library()
    return lib.get(solute).M


def x_solute(w, M):
    """Solute mole fraction of a binary with solute mass fraction w."""
    n2 = w / M
    return n2 / (n2 + (1.0 - w) / M_WATER)


def load_freezing() -> pd.DataFrame:
    """All freezing points as (solute, w, T_f on the triple-point scale [K], source)."""
    rows = []
    crc = pd.read_csv(TABLES / "crc_aqueous_20C_nonelectrolytes.csv")
    for name, key in CRC_NAMES.items():
        d = crc[(crc.solute == name) & crc.freezing_point_depression_K.notna()]
        for r in d.itertuples():
            rows.append((key, r.mass_pct / 100, T_TRIPLE - r.freezing_point_depression_K,
                         "CRC"))
    gl = pd.read_csv(TABLES / "lange_glycerol_freezing_points.csv")
    for r in gl[gl.mass_pct > 40].itertuples():  # CRC's finer table covers 0–40 %
        rows.append(("glycerol", r.mass_pct / 100, T_TRIPLE + r.freezing_point_C, "Lange"))
    pg = pd.read_csv(TABLES / "lange_propylene_glycol_freezing_points.csv")
    ratio = default_library().get("propylene glycol").rho_pure / float(
        water_density(293.15))
    for r in pg.itertuples():
        w = r.volume_pct / 100 * ratio / r.specific_gravity_15C
        rows.append(("propylene glycol", w, T_TRIPLE + r.freezing_point_C, "Lange"))
    df = pd.DataFrame(rows, columns=["solute", "w", "Tf", "table"])
    df = df[df.apply(lambda r: r.w <= W_LIMIT[r.solute] + 1e-9, axis=1)]
    return df.reset_index(drop=True)


def load_vle() -> pd.DataFrame:
    d = pd.read_csv(TABLES / "vle_ethanol_water_101kPa.csv")
    d["T"] = d.T_C + T_ZERO_C
    d["P"] = d.P_kPa * 1e3
    return d


def p_pure(T, solute):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        return antoine_vapor_pressure(T, solute, extrapolate=True)


def taus(p, T):
    a12, b12, a21, b21, *e = p
    e12, e21 = e if e else (0.0, 0.0)
    return a12 + b12 / T + e12 * np.log(T), a21 + b21 / T + e21 * np.log(T)


def ln_aw(p, x2, T):
    t12, t21 = taus(p, T)
    lg1, _ = ln_gamma_binary(1.0 - x2, t12, t21, _alpha)
    return np.log1p(-x2) + lg1


def freezing_error(p, x2, Tf):
    """[K]: (ln a_w(model) − ln a_ice) / (d ln a_ice / dT) at the published T_f."""
    h = 1e-3
    slope = (np.log(ice_water_activity(Tf + h)) - np.log(ice_water_activity(Tf - h))) / (2 * h)
    return (ln_aw(p, x2, Tf) - np.log(ice_water_activity(Tf))) / slope


def bubble(p, x2, P, solute):
    """Bubble temperature [K] and vapor mole fraction of the organic at pressure P."""
    def f(T):
        t12, t21 = taus(p, T)
        lg1, lg2 = ln_gamma_binary(1.0 - x2, t12, t21, _alpha)
        return ((1 - x2) * np.exp(lg1) * saturation_pressure(T)
                + x2 * np.exp(lg2) * p_pure(T, solute)) / P - 1.0
    T = brentq(f, 300.0, 400.0, xtol=1e-8)
    t12, t21 = taus(p, T)
    _, lg2 = ln_gamma_binary(1.0 - x2, t12, t21, _alpha)
    return T, x2 * np.exp(lg2) * p_pure(T, solute) / P


def unpack(q, mode):
    """(a12, b12, a21, b21, e12, e21, alpha) from the fitted vector of each mode."""
    if mode == "a":
        return (q[0], 0.0, q[1], 0.0, 0.0, 0.0, ALPHA)
    if mode == "a-alpha":
        return (q[0], 0.0, q[1], 0.0, 0.0, 0.0, q[2])
    if mode == "ab":
        return (*q[:4], 0.0, 0.0, ALPHA)
    return (*q[:6], ALPHA)


def residuals(q, fz, vle, solute, mode):
    global _alpha
    *p, _alpha = unpack(q, mode)
    M = molar_mass(solute)
    Tf = fz.Tf.to_numpy()
    tol = np.maximum(0.15, 0.03 * (T_TRIPLE - Tf))
    out = [freezing_error(p, x_solute(fz.w.to_numpy(), M), Tf) / tol]
    for r in vle.itertuples():
        try:
            T, y = bubble(p, r.x_solute, r.P, solute)
        except ValueError:
            T, y = 400.0, 0.0
        out.append(np.array([(T - r.T) / 0.3, (y - r.y_solute) / 0.015]))
    return np.concatenate(out)


def _solve(mode, q0, fz, vle, solute, bounds=(-np.inf, np.inf)):
    return least_squares(residuals, np.asarray(q0, float), args=(fz, vle, solute, mode),
                         x_scale="jac", bounds=bounds)


def fit_pair(solute, fz, vle):
    """Parameters (a12, b12, a21, b21, e12, e21, alpha) for one pair."""
    if len(vle):
        fz = fz[fz.w <= FIT_W_LIMIT.get(solute, 1.0)]
        res = _solve("ab", ETHANOL_START, fz, vle, solute)
        return unpack(res.x, "ab")
    depression = T_TRIPLE - fz.Tf.to_numpy()
    target = np.maximum(0.15, 0.03 * depression)

    def worst(p):
        return float(np.max(errors(p, solute, fz, vle)[0] / target))

    # 1. τ independent of T, α = 0.3
    best = min((_solve("a", (a, b), fz, vle, solute) for a in (-2, 0, 2) for b in (-1, 0, 2)),
               key=lambda r: r.cost)
    p = unpack(best.x, "a")
    if worst(p) <= 1.0:
        return p
    # 2. τ = a + b/T, α = 0.3 (the freezing points span a temperature range)
    with np.errstate(all="ignore"):
        cands = [unpack(_solve("ab", q0, fz, vle, solute).x, "ab")
                 for q0 in ((p[0], 0.0, p[2], 0.0), (1.0, 0.0, -1.0, 0.0),
                            (-2.0, 300.0, 2.0, -300.0), (2.0, -300.0, -2.0, 300.0))]
    # only a moderate temperature dependence is believed from freezing points alone:
    # |b| up to B_MAX_FREEZING_K (the τ change from the coldest point to 25 °C stays
    # below about 1); steeper ones are artefacts of the confounding and are dropped
    cands = [c for c in cands if max(abs(c[1]), abs(c[3])) <= B_MAX_FREEZING_K]
    p2 = min(cands, key=worst) if cands else p
    if worst(p2) <= 1.0:
        return p2
    # 3. τ independent of T, α fitted
    with np.errstate(all="ignore"):
        best = min((_solve("a-alpha", (a, b, al), fz, vle, solute,
                           ([-np.inf, -np.inf, 0.1], [np.inf, np.inf, 1.0]))
                    for a in (-5, -2, 2) for b in (-1, 2, 25, 100)
                    for al in (0.1, 0.3, 0.6)),
                   key=lambda r: r.cost)
    p3 = unpack(best.x, "a-alpha")
    return min((p, p2, p3), key=worst)


def errors(p, solute, fz, vle):
    global _alpha
    *p, _alpha = p
    M = molar_mass(solute)
    ef = np.abs(freezing_error(p, x_solute(fz.w.to_numpy(), M), fz.Tf.to_numpy()))
    eT, ey = [], []
    for r in vle.itertuples():
        T, y = bubble(p, r.x_solute, r.P, solute)
        eT.append(abs(T - r.T))
        ey.append(abs(y - r.y_solute))
    return ef, np.array(eT), np.array(ey)


def describe(ef, eT, ey):
    s = f"freezing max {ef.max():.2f} K mean {ef.mean():.2f} K (n={len(ef)})" if len(ef) else ""
    if len(eT):
        s += f"; bubble T max {eT.max():.2f} K, y max {ey.max():.4f} (n={len(eT)})"
    return s


def _fit_one(job):
    """Held-out check, final fit and table row of one solute: (printout, row)."""
    solute, fzall, vleall = job
    with np.errstate(all="ignore"), warnings.catch_warnings():
        warnings.simplefilter("ignore")
        return _fit_one_inner(solute, fzall, vleall)


def _fit_one_inner(solute, fzall, vleall):
    fz = fzall[fzall.solute == solute].reset_index(drop=True)
    vle = vleall[vleall.solute == solute].reset_index(drop=True)
    keep_f = np.arange(len(fz)) % 3 != 1
    keep_v = np.arange(len(vle)) % 3 != 1
    p_ho = fit_pair(solute, fz[keep_f], vle[keep_v])
    fit_e = describe(*errors(p_ho, solute, fz[keep_f], vle[keep_v]))
    ho_e = describe(*errors(p_ho, solute, fz[~keep_f], vle[~keep_v]))
    p = fit_pair(solute, fz, vle)
    all_e = describe(*errors(p, solute, fz, vle))
    text = (f"{solute}:\n  held-out fit: fitted points {fit_e}\n"
          f"                held-out points {ho_e}\n  final fit (all points): {all_e}\n"
          f"  a12={p[0]:.6g} b12={p[1]:.6g} K a21={p[2]:.6g} b21={p[3]:.6g} K "
          f"e12={p[4]:.6g} e21={p[5]:.6g} alpha={p[6]:.4g}")
    M = molar_mass(solute)
    fz = fz[fz.w <= FIT_W_LIMIT.get(solute, 1.0)]
    w_max = float(fz.w.max())
    x_max = float(x_solute(w_max, M))
    T_lo = float(fz.Tf.min())
    T_hi = float(fz.Tf.max())
    kinds = ["freezing"]
    tables = sorted(set(fz.table))
    src = ("NRTL fit by tools/fit_nrtl.py to freezing points "
           f"of {' and '.join('CRC Handbook 102nd ed. Concentrative Properties of Aqueous Solutions' if t == 'CRC' else 'Lange Handbook 15th ed. Table 5.13' for t in tables)}")
    if len(vle):
        kinds.append("vle")
        x_max = 1.0
        w_max = 1.0
        T_hi = float(vle["T"].max())
        src += (f" to {fz.w.max() * 100:.0f} % w/w only, and the isobaric VLE at 101.325 kPa"
                " of Carey and Lewis (1932) over the whole range")
    else:
        src += ("; no VLE or water-activity data used: "
                + ("tau(T) fitted to the freezing points alone" if p[1] or p[3]
                   else "tau taken independent of T"))
    if p[6] != ALPHA:
        src += f"; alpha fitted ({p[6]:.3g}) because alpha 0.3 missed the data"
    return text, dict(solute=solute, a12=p[0], b12_K=p[1], a21=p[2], b21_K=p[3],
                     alpha=p[6], x2_max=round(x_max, 5), w_max=round(w_max, 4),
                     T_min_K=round(T_lo, 2), T_max_K=round(T_hi, 2),
                     data="+".join(kinds), source=src + " (tables under "
                     "solutions/data/tables/)", e12_lnT=p[4], e21_lnT=p[5])


def main(argv=None) -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--check", action="store_true", help="do not write the table")
    args = ap.parse_args(argv)
    fzall = load_freezing()
    vleall = load_vle()
    solutes = sorted(fzall.solute.unique())
    with Pool(2) as pool:
        results = pool.map(_fit_one, [(s, fzall, vleall) for s in solutes])
    rows = []
    for text, row in results:
        print(text)
        rows.append(row)
    out = pd.DataFrame(rows)
    if not args.check:
        out.to_csv(OUT, index=False, float_format="%.9g")
        print(f"wrote {OUT.relative_to(ROOT)}")


if __name__ == "__main__":
    main()
