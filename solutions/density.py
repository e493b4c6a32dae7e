"""Density of aqueous solutions from apparent specific volumes of the solutes.

The solution's specific volume is the water's plus each solute's apparent one:

    1/rho = w_w / rho_w(T) + Σ_i w_i / rho_app,i(w_s, T)

with w_s = 1 − w_w the total solute mass fraction (Laliberté & Cooper 2004, eq. 4 and
their mixing rule, which evaluates every solute at the total solute fraction; for one
solute this is exact, for several it is the stated approximation). Water follows
IAPWS-IF97. Per solute, ``solutions/data/density_apparent.csv`` names one form:

``laliberte``
    rho_app = (c0 w_s + c1) exp(1e-6 (t + c4)²) / (w_s + c2 + c3 t)   [kg/m³], t in °C;
    coefficients from Laliberté (2009), valid over the table's T and w ranges.
``oiml_ethanol``, ``melinder``, ``volk_glycerol``
    a published density correlation of the water + solute binary over w and T, turned
    into the solute's apparent specific volume against the correlation's own water,
    v_app(w, T) = (1/rho_bin(w, T) − (1 − w)/rho_bin(0, T)) / w. Ethanol: OIML R 22
    (1975), 0–100 %, −20 to 40 °C. Ethylene and propylene glycol: Melinder (2010),
    0–60 %, 0–100 °C; for ethylene glycol the CRC 20 °C table (to 60 %, fitted as for
    ``vapp_poly``, coefficients c0..c3 in the same row) sets the 20 °C values and
    Melinder's correlation only their change with T (the two differ by up to 0.1 % at
    20 °C). From 60 % to the pure glycol the apparent volume is interpolated linearly to
    the pure liquid's specific volume (Perry's Table 2-32), flagged.
    Glycerol: Volk & Kähler (2018), 0–100 %, fitted 15–30 °C, used 0–40 °C (agrees with
    Melinder's glycerol data within 0.1 % there, tests/test_density.py).
    Coefficients: ``solutions/data/density_correlations.csv``.
``crc_laliberte``
    sucrose: the CRC 20 °C table fitted as for ``vapp_poly`` (c0..c3, to 84 %) sets the
    20 °C values, Laliberté's (2009) coefficients (``density_correlations.csv``, 15–55 °C,
    to 50.7 %) only their change with T, held at its 50.7 % value above that (flagged
    away from 20 °C).
``vapp_poly``
    1/rho_app = c0 + c1 w_s + c2 w_s² + c3 w_s³ (+ c4 w_s⁴)   [m³/kg]; fitted by
    tools/fit_density.py to the CRC Handbook 20 °C tables. Away from 20 °C a liquid solute with a pure-liquid
    density equation (``solutions/data/liquid_density.csv``, Perry's Table 2-32 / VDI
    Heat Atlas) shifts its apparent volume by its own thermal expansion,
    1/rho_L(T) − 1/rho_L(20 °C), i.e. the excess volume is held at its 20 °C value; a
    solid solute keeps its 20 °C apparent volume. Either way outside 15–25 °C the result
    carries a warning.

A solute with no form falls back to ideal volume additivity (its pure-liquid density at T
where an equation exists, else at 20 °C, else a listed analogue), flagged in the output.
A measured density always wins.

References
----------
Laliberté, M.; Cooper, W. E. (2004) J. Chem. Eng. Data 49, 1141–1151.
Laliberté, M. (2009) J. Chem. Eng. Data 54, 1725–1760.
OIML R 22 (1975) International Alcoholometric Tables.
Melinder, Å. (2010) Properties of Secondary Working Fluids for Indirect Systems, IIR.
Volk, A.; Kähler, C. J. (2018) Exp. Fluids 59, 75.
Green, D. W.; Perry, R. H. (2008) Perry's Chemical Engineers' Handbook, 8th ed., Table 2-32.
"""
from __future__ import annotations

from dataclasses import dataclass
from functools import cache
from importlib import resources

import numpy as np

from ._csvtable import read_rows
from .composition import Composition
from .errors import Caveat, DataError, IngredientError, OutOfRangeError
from .water import saturation_pressure, water_density

__all__ = ["DensityResult", "solution_density", "solvent_density", "apparent_density", "density_table",
           "pure_liquid_density", "liquid_density_keys", "ethanol_water_density",
           "glycol_water_density", "glycerol_water_density"]

T20 = 293.15          # K, reference temperature of the CRC tables
_W_FLOOR = 1e-6       # below this solute fraction the apparent volume is taken at it

# Isomers and near relatives used when a solute has no density data of its own. An
# estimate, flagged in every result (common practice for formulation estimates).
_ANALOGUES = {
    "sorbitol": "mannitol",      # C6H14O6 isomers
    "trehalose": "sucrose",      # C12H22O11 isomers
    "sodium lactate": "sodium acetate",
    "glycine": "urea",
}


@cache
def density_table() -> dict[str, dict]:
    """Rows of density_apparent.csv keyed by solute key (loaded once)."""
    path = resources.files("solutions.data") / "density_apparent.csv"
    return {r["solute"]: r for r in read_rows(path)}


def apparent_density(row: dict, w_s, T):
    """Apparent density of one solute, rho_app [kg/m³], at total solute fraction ``w_s``
    [1] and temperature ``T`` [K], from one row of the density table."""
    w_s = np.asarray(w_s, dtype=float)
    T = np.asarray(T, dtype=float)
    t = T - 273.15
    form = row["form"]
    if form == "laliberte":
        c0, c1, c2, c3, c4 = (float(row[k]) for k in ("c0", "c1", "c2", "c3", "c4"))
        return (c0 * w_s + c1) * np.exp(1e-6 * (t + c4) ** 2) / (w_s + c2 + c3 * t)
    if form == "vapp_poly":
        c0, c1, c2, c3 = (float(row[k]) for k in ("c0", "c1", "c2", "c3"))
        c4 = _coef_or_zero(row.get("c4"))
        v = c0 + w_s * (c1 + w_s * (c2 + w_s * (c3 + w_s * c4)))
        key = row["solute"]
        if key in _liquid_table():
            lo, hi = liquid_density_range(key)
            Tc = np.clip(T, lo, hi)
            v = v + 1.0 / pure_liquid_density(Tc, key) - 1.0 / pure_liquid_density(T20, key)
        return 1.0 / (v + 0.0 * t)
    if form == "crc_laliberte":
        return 1.0 / _v_app_crc_laliberte(row, w_s, T)
    if form in _BINARY:
        return 1.0 / _binary_apparent_volume(row, w_s, T)
    raise ValueError(f"unknown density form {form!r} for {row['solute']!r}")


def _v_app_crc_laliberte(row: dict, w_s, T):
    """Apparent specific volume [m³/kg]: the CRC 20 °C polynomial (c0..c3 of the row) plus
    the change with temperature of Laliberté's (2009) apparent volume at the same
    composition, taken at Laliberté's highest composition above it."""
    c0, c1, c2, c3 = (float(row[k]) for k in ("c0", "c1", "c2", "c3"))
    v20 = c0 + w_s * (c1 + w_s * (c2 + w_s * c3))
    c = _correlations()["laliberte_" + row["solute"].replace(" ", "_")]
    k = tuple(c[("c", i, 0)] for i in range(5))
    wc = np.minimum(w_s, c[("w_max", 0, 0)])

    def v_lal(t):
        return (wc + k[2] + k[3] * t) / ((k[0] * wc + k[1]) * np.exp(1e-6 * (t + k[4]) ** 2))
    return v20 + v_lal(np.asarray(T, dtype=float) - 273.15) - v_lal(T20 - 273.15)


def _coef_or_zero(value) -> float:
    """A coefficient from the table; an empty cell (NaN after reading) is zero."""
    try:
        x = float(value)
    except (TypeError, ValueError):
        return 0.0
    return 0.0 if x != x else x


# ------------------------------------------------------------------ pure liquids
@cache
def _liquid_table() -> dict[str, dict]:
    path = resources.files("solutions.data") / "liquid_density.csv"
    return {r["key"]: r for r in read_rows(path, as_text=("source",))}


def liquid_density_keys() -> tuple[str, ...]:
    """Solute keys with a pure-liquid density equation."""
    return tuple(sorted(_liquid_table()))


def liquid_density_range(key: str) -> tuple[float, float]:
    """(T_min, T_max) [K] of the pure-liquid density equation of ``key``."""
    r = _liquid_row(key)
    return float(r["T_min_K"]), float(r["T_max_K"])


def _liquid_row(key: str) -> dict:
    table = _liquid_table()
    if key not in table:
        raise IngredientError(str(key), "no pure-liquid density equation (known: "
                              + ", ".join(sorted(table)) + ")")
    return table[key]


def pure_liquid_density(T, key: str):
    """Density of a pure liquid at saturation [kg/m³] at ``T`` [K].

    Parameters
    ----------
    T : float or array_like
        Temperature [K], within the row's ``T_min_K``–``T_max_K``.
    key : str
        Solute key (``"ethylene glycol"``, ``"glycerol"`` ...); see :func:`liquid_density_keys`.

    Equations (``solutions/data/liquid_density.csv``)
    --------------------------------------------------
    ``dippr105``:     rho = M C1 / C2^(1 + (1 − T/C3)^C4), C1 in kmol/m³ (Perry's Table 2-32)
    ``ppds_density``: rho = rho_c + A τ^0.35 + B τ^(2/3) + C τ + D τ^(4/3), τ = 1 − T/Tc
                      (VDI Heat Atlas D3.1)

    Raises :class:`~solutions.errors.OutOfRangeError` outside the equation's range.

    Ethylene glycol at 20 °C: 1113.5 kg/m³ (CRC Handbook, Physical Constants of Organic
    Compounds, 1.1135 g/cm³), within 0.5 kg/m³:

    >>> rho = float(pure_liquid_density(293.15, "ethylene glycol"))
    >>> bool(abs(rho - 1113.5) < 0.5), round(rho, 1)
    (True, 1113.7)
    """
    r = _liquid_row(key)
    T = np.asarray(T, dtype=float)
    lo, hi = float(r["T_min_K"]), float(r["T_max_K"])
    if np.any((T < lo) | (T > hi)):
        bad = float(T[(T < lo) | (T > hi)].flat[0])
        raise OutOfRangeError(f"temperature for the liquid density of {key}", bad, lo, hi, "K")
    C1, C2, C3, C4 = (float(r[k]) for k in ("C1", "C2", "C3", "C4"))
    if r["form"] == "dippr105":
        return 1e3 * C1 / C2 ** (1.0 + (1.0 - T / C3) ** C4) * float(r["M_g_per_mol"]) * 1e-3
    if r["form"] == "ppds_density":
        tau = 1.0 - T / float(r["Tc_K"])
        return (float(r["rhoc_kg_per_m3"]) + C1 * tau ** 0.35 + C2 * tau ** (2.0 / 3.0)
                + C3 * tau + C4 * tau ** (4.0 / 3.0))
    raise ValueError(f"unknown liquid-density form {r['form']!r} for {key!r}")


# ------------------------------------------------------------------ binary correlations
@cache
def _correlations() -> dict[str, dict]:
    path = resources.files("solutions.data") / "density_correlations.csv"
    out: dict[str, dict] = {}
    for r in read_rows(path):
        key = (r["kind"], int(r["i"]), int(r["j"]))
        out.setdefault(r["correlation"], {})[key] = float(r["value"])
    return out


def ethanol_water_density(w, T):
    """Density of ethanol + water [kg/m³] at ethanol mass fraction ``w`` [1] and ``T`` [K].

    OIML R 22 (1975) general formula, p the mass fraction and t in °C:

        rho = A1 + Σ_{k=2}^{12} A_k p^(k−1) + Σ_{k=1}^{6} B_k (t − 20)^k
              + Σ_{i=1}^{5} Σ_k C_ik p^k (t − 20)^i

    Valid for 0 ≤ p ≤ 1 and −20 to +40 °C (the standard's range); the function evaluates
    the polynomial anywhere, range checks are the caller's (``solution_density`` warns).

    OIML R 22 Table I, 50 % ethanol by mass at 20 °C: 913.77 kg/m³.

    >>> round(float(ethanol_water_density(0.5, 293.15)), 2)
    913.77
    """
    c = _correlations()["oiml_ethanol"]
    p = np.asarray(w, dtype=float)
    dt = np.asarray(T, dtype=float) - T20
    rho = sum(c[("A", k, 0)] * p ** (k - 1) for k in range(1, 13))
    rho = rho + sum(c[("B", k, 0)] * dt ** k for k in range(1, 7))
    for (kind, i, k), v in c.items():
        if kind == "C":
            rho = rho + v * p ** k * dt ** i
    return rho


def glycol_water_density(w, T, key: str):
    """Density of ethylene or propylene glycol + water [kg/m³] (Melinder 2010).

    rho = Σ_i Σ_j c_ij (x − x_m)^i (t − t_m)^j with x = 100 w [mass %], t in °C.
    Valid 0 ≤ w ≤ 0.6, from the freezing point to 100 °C (limits of the Modelica
    IBPSA/Buildings media that distribute the coefficients).

    Propylene glycol 40 % w/w at 20 °C: 1.032 g/mL (Melinder 2010 tables), within 1 kg/m³:

    >>> rho = float(glycol_water_density(0.4, 293.15, "propylene glycol"))
    >>> bool(abs(rho - 1032.0) < 1.0), round(rho, 1)
    (True, 1032.3)
    """
    name = "melinder_" + key.replace(" ", "_")
    if name not in _correlations():
        raise IngredientError(str(key), "no Melinder density correlation (ethylene glycol, "
                              "propylene glycol)")
    c = _correlations()[name]
    dx = 100.0 * np.asarray(w, dtype=float) - c[("xm", 0, 0)]
    dt = np.asarray(T, dtype=float) - 273.15 - c[("tm", 0, 0)]
    rho = 0.0
    for (kind, i, j), v in c.items():
        if kind == "c":
            rho = rho + v * dx ** i * dt ** j
    return rho + 0.0 * dx * dt


def glycerol_water_density(w, T):
    """Density of glycerol + water [kg/m³] (Volk & Kähler 2018).

    rho = κ / (w/rho_g + (1 − w)/rho_w), rho_g = 1273 − 0.612 t,
    rho_w = 1000 (1 − |(t − 3.98)/615|^1.71), κ = 1 + A sin(w^1.31 π)^0.81,
    A = 1.78e-6 t² − 1.82e-4 t + 1.41e-2, t in °C. Fitted 15–30 °C, 0 ≤ w ≤ 1.

    Glycerol 50 % w/w at 20 °C against the CRC Handbook 102nd ed. 'Concentrative
    Properties of Aqueous Solutions' rows for 48 % and 52 % (1.1200 and 1.1308 g/cm³),
    interpolated to 1125.4 kg/m³, within 1 kg/m³:

    >>> rho = float(glycerol_water_density(0.5, 293.15))
    >>> bool(abs(rho - (1120.0 + 1130.8) / 2) < 1.0), round(rho, 1)
    (True, 1126.1)
    """
    c = {k[0]: v for k, v in _correlations()["volk_glycerol"].items()}
    w = np.asarray(w, dtype=float)
    t = np.asarray(T, dtype=float) - 273.15
    rho_g = c["rho_g0"] + c["rho_g1"] * t
    rho_w = c["w_a"] * (1.0 - np.abs((t - c["w_t0"]) / c["w_s"]) ** c["w_e"])
    A = c["A2"] * t ** 2 + c["A1"] * t + c["A0"]
    kappa = 1.0 + A * np.sin(np.clip(w, 0.0, 1.0) ** c["e_w"] * np.pi) ** c["e_s"]
    return kappa / (w / rho_g + (1.0 - w) / rho_w)


_MELINDER_W_MAX = 0.6


def _binary_rho(row: dict, w, T):
    form, key = row["form"], row["solute"]
    if form == "oiml_ethanol":
        return ethanol_water_density(w, T)
    if form == "melinder":
        return glycol_water_density(w, T, key)
    return glycerol_water_density(w, T)


def _v_app_binary(row, w, T):
    w = np.maximum(w, _W_FLOOR)
    return (1.0 / _binary_rho(row, w, T) - (1.0 - w) / _binary_rho(row, 0.0, T)) / w


def _v_app_melinder(row, w, T):
    """Melinder's apparent volume; where the row also carries a CRC 20 °C polynomial
    (c0..c3), that sets the composition dependence and Melinder only the change with T."""
    v = _v_app_binary(row, w, T)
    if _coef_or_zero(row.get("c0")) == 0.0:
        return v
    c0, c1, c2, c3 = (float(row[k]) for k in ("c0", "c1", "c2", "c3"))
    return c0 + w * (c1 + w * (c2 + w * c3)) + v - _v_app_binary(row, w, np.full_like(T, T20))


def _binary_apparent_volume(row: dict, w_s, T):
    """Apparent specific volume [m³/kg] of the solute from its binary correlation.

    Outside the correlation's temperature range the polynomial is not evaluated (it
    diverges: OIML R 22 at 80 °C is 1 % off for pure ethanol); instead the apparent volume
    at the nearest end of the range is shifted by the pure solute's own expansion,
    1/rho_L(T) − 1/rho_L(T_end), i.e. the excess volume is held at the range end (flagged
    by the range caveat)."""
    w_s, T = np.broadcast_arrays(np.asarray(w_s, dtype=float), np.asarray(T, dtype=float))
    T_end = np.clip(T, float(row["T_min_K"]), float(row["T_max_K"]))
    v = _binary_apparent_volume_in_range(row, w_s, T_end)
    key = row["solute"]
    if key in _liquid_table() and np.any(T != T_end):
        lo, hi = liquid_density_range(key)
        v = v + (1.0 / pure_liquid_density(np.clip(T, lo, hi), key)
                 - 1.0 / pure_liquid_density(np.clip(T_end, lo, hi), key))
    return v


def _binary_apparent_volume_in_range(row: dict, w_s, T):
    if row["form"] != "melinder":
        return _v_app_binary(row, w_s, T)
    wm = _MELINDER_W_MAX
    v = _v_app_melinder(row, np.minimum(w_s, wm), T)
    high = w_s > wm
    if np.any(high):
        lo, hi = liquid_density_range(row["solute"])
        v_pure = 1.0 / pure_liquid_density(np.clip(T, lo, hi), row["solute"])
        f = (w_s - wm) / (1.0 - wm)
        v = np.where(high, v + f * (v_pure - v), v)
    return v


_BINARY = ("oiml_ethanol", "melinder", "volk_glycerol")


@dataclass(frozen=True)
class DensityResult:
    rho: np.ndarray                  # [kg/m³], shape (N,)
    method: str                      # "measured", "apparent volumes", "ideal additivity", ...
    caveats: tuple[Caveat, ...]


def solution_density(comp: Composition, T, measured=None) -> DensityResult:
    """Density [kg/m³] of each composition at ``T`` [K], with the method and caveats.

    ``measured`` [kg/m³] (scalar or shape (N,)) overrides the model.
    """
    T = np.asarray(T, dtype=float)
    if measured is not None:
        rho = np.broadcast_to(np.asarray(measured, dtype=float), (comp.N,)).copy()
        return DensityResult(rho, "measured (given)", ())
    caveats: list[Caveat] = []
    if not comp.solvent.is_water:
        return _ideal_nonaqueous(comp, T)
    table = density_table()
    w = comp.mass_fraction()
    w_s = w.sum(axis=1)
    Tw = np.clip(T, 273.15, 623.15)
    # liquid water above its normal boiling point exists only at its saturation pressure
    rho_w = water_density(Tw, np.maximum(101325.0, 1.0001 * saturation_pressure(Tw)))
    if np.any(T < 273.15):
        caveats.append(Caveat("model-range", "density below 0 °C uses water's density at 0 °C"))
    v = comp.solvent_mass_fraction() / rho_w
    fallback = []
    for j, ing in enumerate(comp.solutes):
        key = ing.solute
        row = table.get(key)
        note = None
        if row is None and key in _ANALOGUES and _ANALOGUES[key] in table:
            row = table[_ANALOGUES[key]]
            note = (f"no density data for {ing.name}; its apparent volume is taken from "
                    f"{_ANALOGUES[key]} (an estimate)")
        if row is not None:
            rho_app = apparent_density(row, w_s, T)
            caveats.extend(_range_caveats(ing.name, row, w_s, T))
            if note:
                caveats.append(Caveat("ideal-fallback", note, ing.name))
        else:
            rho_app = _ideal_apparent_density(ing, T)
            fallback.append(ing.name)
        v = v + w[:, j] / rho_app
    method = "apparent volumes"
    if fallback:
        method += " + ideal additivity for " + ", ".join(fallback)
        for name in fallback:
            ing = next(s for s in comp.solutes if s.name == name)
            basis = ("its pure-liquid density at the solution temperature"
                     if ing.solute in _liquid_table() else
                     "its pure-liquid density at 20 °C" if ing.rho_pure else
                     "a typical solid apparent density of 1.5 g/mL (rough estimate)")
            caveats.append(Caveat("ideal-fallback",
                                  f"no solution-density data for {name}: ideal volume "
                                  f"additivity with {basis}; measure the density if "
                                  "volumes matter", name))
    return DensityResult(1.0 / v, method, tuple(caveats))


def _ideal_apparent_density(ing, T=None):
    if T is not None and ing.solute in _liquid_table():
        lo, hi = liquid_density_range(ing.solute)
        return pure_liquid_density(np.clip(np.asarray(T, dtype=float), lo, hi), ing.solute)
    if ing.rho_pure:
        return ing.rho_pure
    return 1500.0  # typical of dissolved organic solids; flagged where used


def _ideal_nonaqueous(comp: Composition, T) -> DensityResult:
    rho_s = comp.solvent.rho_pure or 1000.0
    v = comp.solvent_mass_fraction() / rho_s
    for j, ing in enumerate(comp.solutes):
        v = v + comp.mass_fraction()[:, j] / _ideal_apparent_density(ing)
    cav = Caveat("ideal-fallback",
                 f"density in {comp.solvent.name} by ideal volume additivity at the pure "
                 "liquids' 20 °C densities (no temperature dependence); measure it if "
                 "volumes matter", comp.solvent.name)
    return DensityResult(1.0 / v, "ideal additivity (non-aqueous)", (cav,))


def _range_caveats(name: str, row: dict, w_s, T) -> list[Caveat]:
    out = []
    t = np.atleast_1d(np.asarray(T, dtype=float)) - 273.15
    tmin, tmax, wmax = (float(row["T_min_K"]) - 273.15, float(row["T_max_K"]) - 273.15,
                        float(row["w_max"]))
    if np.any(t < tmin - 0.5) or np.any(t > tmax + 0.5):
        extra = ""
        if row["form"] == "vapp_poly":
            if row["solute"] in _liquid_table():
                extra = (" (fitted at 20 °C only; the solute's excess volume is held at its "
                         "20 °C value and its pure-liquid expansion applied)")
            else:
                extra = (" (fitted at 20 °C only; solute's apparent volume held at its "
                         "20 °C value)")
        out.append(Caveat("model-range",
                          f"density data for {name} cover {tmin:g}–{tmax:g} °C{extra}; "
                          f"result at {_fmt_range(t)} °C is extrapolated", name,
                          {"T_min_C": tmin, "T_max_C": tmax}))
    ws = np.atleast_1d(w_s)
    if row["form"] == "crc_laliberte":
        w_lal = _correlations()["laliberte_" + row["solute"].replace(" ", "_")][("w_max", 0, 0)]
        if np.any(ws > w_lal * 1.001) and np.any(np.abs(t - 20.0) > 5.0):
            out.append(Caveat("model-range",
                              f"density of {name} above {w_lal * 100:.3g} % w/w at "
                              f"{_fmt_range(t)} °C: the 20 °C table reaches "
                              f"{wmax * 100:.3g} %, its change with temperature is known to "
                              f"{w_lal * 100:.3g} % and held there (an estimate)", name,
                              {"w_max_T": w_lal}))
    if np.any(ws > wmax * 1.001):
        if row["form"] == "melinder":
            out.append(Caveat("model-range",
                              f"density correlation for {name} reaches {wmax * 100:.3g} % w/w; "
                              f"at {ws.max() * 100:.3g} % its apparent volume is interpolated "
                              "between the correlation and the pure liquid (an estimate)", name,
                              {"w_max": wmax}))
        else:
            out.append(Caveat("model-range",
                              f"density data for {name} reach {wmax * 100:.3g} % w/w total solutes; "
                              f"this solution has {ws.max() * 100:.3g} % (extrapolated)", name,
                              {"w_max": wmax}))
    return out


def _fmt_range(t) -> str:
    lo, hi = float(np.min(t)), float(np.max(t))
    return f"{lo:.4g}" if abs(hi - lo) < 1e-9 else f"{lo:.4g}–{hi:.4g}"


def solvent_density(res_or_comp, T: float) -> float:
    """Density of the pure solvent [kg/m³] at ``T`` [K]: IAPWS-IF97 for water, else the
    library's liquid density (a resolved recipe or a composition)."""
    comp = getattr(res_or_comp, "composition", res_or_comp)
    if comp.solvent.is_water:
        return float(water_density(T))
    if comp.solvent.rho_pure:
        return float(comp.solvent.rho_pure)
    raise DataError(f"no liquid density for the solvent {comp.solvent.name}")
