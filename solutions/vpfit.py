"""Vapor-pressure fitting: Clausius–Clapeyron and Antoine fits of measured (T, p) pairs.

* **Clausius–Clapeyron** (CC): ``ln p = a + m / T`` by ordinary least squares; the enthalpy of
  vaporization is ``ΔH = −m R`` with its standard error ``s_m R`` and a 95 % interval from Student's
  t distribution with ``n − 2`` degrees of freedom. The exact Clapeyron equation reads
  ``d ln p / d(1/T) = −ΔH / (R ΔZ)`` with ``ΔZ = Z_vapor − Z_liquid``, so the CC fit returns a mean
  of ``ΔH/ΔZ`` over the interval, which differs from the true ΔH by about ``ΔH (1/ΔZ − 1)``: small
  near room temperature, over 0.5 kJ/mol near 100 °C for water (vapor non-ideality).
* **Antoine**: ``log10(p/kPa) = A − B / (C + t/°C)``, fitted by least squares in ``log10 p``
  (variable projection over C, then a joint polish); valid over the data's temperature range only.
  From it the normal boiling point (101.325 kPa) and the boiling point at a stated pressure.

Checks: fewer than 3 points (4 for Antoine) are refused; points whose externally studentized
residual exceeds 3 (and that lie more than 0.2 % off the curve, so that rounding in a table is not
taken for a bad point) are flagged; a kink in ``ln p`` against ``1/T`` (two straight lines fitting
far better than one smooth curve) is flagged as a probable phase change, and points below the triple
point of water that lie on the IAPWS sublimation curve are flagged as vapor over ice. Unsorted data
and repeated temperatures are fine.

Functions take and return SI (K, Pa, J/mol); the Antoine coefficients are in their conventional
units (kPa, °C), as stated.

References: Clapeyron (1834) / Clausius (1850), in any physical chemistry text; Antoine, C. (1888)
C. R. Acad. Sci. 107, 681; Belsley, Kuh & Welsch (1980) Regression Diagnostics (studentized
residuals); IAPWS R14-08(2011) (sublimation pressure); IAPWS-IF97 (water's saturation line).
"""
from __future__ import annotations

import csv
import io
import math
import re
from dataclasses import dataclass, field
from pathlib import Path

import numpy as np

from .constants import P_ATM, R, T_TRIPLE, T_ZERO_C
from .errors import Caveat, NumberError, SolutionsError, UnitParseError, merge_caveats
from .units import parse_pressure, parse_temperature, read_number

__all__ = ["VaporPressureData", "CCFit", "AntoineFit", "VaporPressureFit", "VaporDataError",
           "read_vapor_pressure_table", "clausius_clapeyron_fit", "antoine_fit",
           "antoine_pressure", "antoine_temperature", "OUTLIER_MIN_REL", "studentized_residuals",
           "find_kink",
           "fit_vapor_pressure", "DZ_NOTE", "EXTRAPOLATION_MARGIN_K", "OUTLIER_T"]

#: a boiling point further than this beyond the data's temperatures is not given [K]
EXTRAPOLATION_MARGIN_K = 10.0
#: externally studentized residual above which a point is flagged
OUTLIER_T = 3.0
#: ... and only when the point is also this far off the curve, relative in p [1]: below it a
#: deviation is at the level of rounding in a table given to 4–5 figures
OUTLIER_MIN_REL = 0.002
#: ln 10
_LN10 = math.log(10.0)

DZ_NOTE = ("The Clausius–Clapeyron fit gives a mean ΔH_vap over the fitted interval; it differs "
           "from the true enthalpy of vaporization by about ΔH(1/ΔZ − 1) (ΔZ = Z_vapor − "
           "Z_liquid, vapor non-ideality): small near room temperature, over 0.5 kJ/mol near "
           "100 °C for water.")


class VaporDataError(SolutionsError, ValueError):
    """A vapor-pressure table cannot be used; names the row (1-based, header = row 1), column
    and value."""

    def __init__(self, reason: str, row: int | None = None, column: str | None = None,
                 value: str | None = None):
        self.reason, self.row, self.column, self.value = reason, row, column, value
        where = []
        if row is not None:
            where.append(f"row {row}")
        if column:
            where.append(f"column {column!r}")
        if value is not None:
            where.append(f"value {value!r}")
        super().__init__((", ".join(where) + ": " if where else "") + reason)


# ------------------------------------------------------------------------------ reading
@dataclass(frozen=True)
class VaporPressureData:
    """Measured points in SI: ``T`` [K], ``P`` [Pa], and each point's row in the file."""

    T: np.ndarray
    P: np.ndarray
    rows: tuple[int, ...]
    temperature_column: str = "temperature"
    pressure_column: str = "pressure"
    gauge: bool = False


_HEADER = re.compile(r"^\s*(?P<q>temperature|temp|t|pressure|p)\s*[_\s(\[/]\s*(?P<u>[^)\]]+?)"
                     r"\s*[)\]]?\s*$", re.IGNORECASE)


def _header_unit(name: str) -> tuple[str, str] | None:
    """("temperature"|"pressure", unit text) from a header such as ``temperature_C`` or
    ``pressure (mmHg)``; None for any other column."""
    m = _HEADER.match(name or "")
    if not m:
        return None
    q = m.group("q").lower()
    return ("temperature" if q.startswith("t") else "pressure", m.group("u").strip())


def read_vapor_pressure_table(source, *, decimal: str = ".") -> VaporPressureData:
    """Read a CSV/TSV of measured vapor pressures.

    source : a path, or the table's text
    decimal : the decimal mark of the numbers (``"."`` or ``","``)

    The header names one temperature column and one pressure column with their units, e.g.
    ``temperature_C`` / ``temperature_K`` / ``temperature_F`` and ``pressure_kPa`` /
    ``pressure_mmHg`` / ``pressure_bar`` / ``pressure_psi`` (any spelling of the closed unit
    vocabulary); other columns are ignored. Empty lines are skipped. Raises
    :class:`VaporDataError` naming the row, column and value of anything it cannot read.
    """
    if isinstance(source, Path) or (isinstance(source, str) and "\n" not in source
                                    and len(source) < 4096 and Path(source).exists()):
        try:
            text = Path(source).read_text(encoding="utf-8-sig")
        except (OSError, UnicodeDecodeError) as exc:
            raise VaporDataError(f"cannot read the file: {exc}") from None
    elif isinstance(source, str) and "\n" not in source and not ("," in source or "\t" in source):
        raise VaporDataError(f"file not found: {source}")
    else:
        text = source if isinstance(source, str) else source.read()
        if isinstance(text, bytes):
            text = text.decode("utf-8-sig")
    lines = [ln for ln in text.splitlines() if ln.strip() and not ln.lstrip().startswith("#")]
    if not lines:
        raise VaporDataError("the table is empty")
    delim = "\t" if "\t" in lines[0] else (";" if (";" in lines[0] and decimal == ",")
                                           or lines[0].count(";") > lines[0].count(",") else ",")
    reader = list(csv.reader(io.StringIO("\n".join(lines)), delimiter=delim))
    header = [h.strip() for h in reader[0]]
    tcols, pcols = [], []
    for j, h in enumerate(header):
        hu = _header_unit(h)
        if hu and hu[0] == "temperature":
            tcols.append((j, h, hu[1]))
        elif hu:
            pcols.append((j, h, hu[1]))
    if len(tcols) != 1 or len(pcols) != 1:
        found = ", ".join(repr(h) for h in header)
        if len(tcols) > 1 or len(pcols) > 1:
            raise VaporDataError("mixed units: give one temperature column and one pressure "
                                 f"column (found {found})", row=1)
        raise VaporDataError("the header needs a temperature column (temperature_C, "
                             "temperature_K or temperature_F) and a pressure column "
                             f"(pressure_kPa, pressure_mmHg, pressure_bar…); found {found}",
                             row=1)
    (jt, ht, ut), (jp, hp, up) = tcols[0], pcols[0]
    try:
        parse_temperature(1000.0, default_unit=ut)
    except UnitParseError as exc:
        raise VaporDataError(f"unknown temperature unit {ut!r} ({exc.reason})", row=1,
                             column=ht) from None
    try:
        parse_pressure(1.0, default_unit=up, ambient=0.0)
        gauge = parse_pressure(1.0, default_unit=up, ambient=1.0) != parse_pressure(
            1.0, default_unit=up, ambient=0.0)
    except UnitParseError as exc:
        raise VaporDataError(f"unknown pressure unit {up!r} ({exc.reason})", row=1,
                             column=hp) from None
    T, P, rows = [], [], []
    for i, rec in enumerate(reader[1:], start=2):
        cells = [c.strip() for c in rec]
        tc = cells[jt] if jt < len(cells) else ""
        pc = cells[jp] if jp < len(cells) else ""
        if not tc and not pc:
            continue
        vals = []
        for cell, col, unit, kind in ((tc, ht, ut, "t"), (pc, hp, up, "p")):
            try:
                x = read_number(cell, decimal=decimal)
            except NumberError as exc:
                raise VaporDataError(f"not a number ({exc.reason})", row=i, column=col,
                                     value=cell) from None
            if x is None:
                raise VaporDataError("the cell is empty", row=i, column=col, value=cell)
            try:
                vals.append(parse_temperature(x, default_unit=unit) if kind == "t"
                            else parse_pressure(x, default_unit=unit))
            except UnitParseError as exc:
                raise VaporDataError(exc.reason, row=i, column=col, value=cell) from None
        T.append(vals[0])
        P.append(vals[1])
        rows.append(i)
    return VaporPressureData(np.array(T, dtype=float), np.array(P, dtype=float), tuple(rows),
                             ht, hp, gauge)


# ---------------------------------------------------------------------------- fitting
@dataclass(frozen=True)
class CCFit:
    """Clausius–Clapeyron line ``ln(p/Pa) = intercept + slope / T``.

    slope [K], intercept [1] and their standard errors; dH = −slope R [J/mol] with standard error
    and 95 % interval [J/mol]; T_mean = 1 / mean(1/T) [K]; residuals in ln p; dof = n − 2.
    """

    slope: float
    intercept: float
    slope_se: float
    intercept_se: float
    dH: float
    dH_se: float
    dH_ci95: tuple[float, float]
    T_mean: float
    residuals: np.ndarray
    leverage: np.ndarray
    dof: int


def _check_points(T, P, n_min: int, what: str):
    T = np.asarray(T, dtype=float).ravel()
    P = np.asarray(P, dtype=float).ravel()
    if T.shape != P.shape:
        raise VaporDataError(f"{T.size} temperatures but {P.size} pressures")
    if T.size < n_min:
        raise VaporDataError(f"the {what} needs at least {n_min} points, got {T.size}")
    if not (np.all(np.isfinite(T)) and np.all(T > 0)):
        raise VaporDataError("temperatures must be finite and above absolute zero")
    if not (np.all(np.isfinite(P)) and np.all(P > 0)):
        raise VaporDataError("pressures must be finite and positive")
    return T, P


def clausius_clapeyron_fit(T, P) -> CCFit:
    """Least-squares Clausius–Clapeyron fit of ``ln p`` against ``1/T``.

    T : temperatures [K] (any order, repeats allowed), at least 3 points at 2 or more distinct T
    P : vapor pressures [Pa]

    ``ΔH = −R · slope``; ``s(ΔH) = R · s(slope)``; 95 % interval ``ΔH ± t(0.975, n−2) s(ΔH)``.
    """
    T, P = _check_points(T, P, 3, "Clausius–Clapeyron fit")
    x, y = 1.0 / T, np.log(P)
    if np.ptp(x) <= 1e-12 * np.mean(x):
        raise VaporDataError("all temperatures are the same: a slope cannot be fitted")
    n = x.size
    X = np.column_stack([np.ones(n), x])
    coef, *_ = np.linalg.lstsq(X, y, rcond=None)
    res = y - X @ coef
    dof = n - 2
    s2 = float(res @ res) / dof if dof > 0 else 0.0
    XtX_inv = np.linalg.inv(X.T @ X)
    se = np.sqrt(np.diag(XtX_inv) * s2)
    lev = np.einsum("ij,jk,ik->i", X, XtX_inv, X)
    dH, dH_se = -coef[1] * R, se[1] * R
    from scipy import stats  # imported here: heavy, only the fits need it

    tq = stats.t.ppf(0.975, dof)
    return CCFit(slope=float(coef[1]), intercept=float(coef[0]), slope_se=float(se[1]),
                 intercept_se=float(se[0]), dH=float(dH), dH_se=float(dH_se),
                 dH_ci95=(float(dH - tq * dH_se), float(dH + tq * dH_se)),
                 T_mean=float(1.0 / np.mean(x)), residuals=res, leverage=lev, dof=dof)


def studentized_residuals(residuals, leverage, n_params: int) -> np.ndarray | None:
    """Externally studentized residuals ``e_i / (s_(i) sqrt(1 − h_ii))`` (Belsley, Kuh & Welsch
    1980); ``None`` when there are too few points (n − p − 1 < 1)."""
    e = np.asarray(residuals, dtype=float)
    h = np.clip(np.asarray(leverage, dtype=float), 0.0, 1.0 - 1e-12)
    n = e.size
    if n - n_params - 1 < 1:
        return None
    sse = float(e @ e)
    s2_i = (sse - e ** 2 / (1.0 - h)) / (n - n_params - 1)
    scale = math.sqrt(sse / max(n - n_params, 1)) if sse > 0 else 0.0
    floor = (1e-9 * scale) ** 2 + 1e-300  # exact data: every residual is noise
    return e / np.sqrt(np.maximum(s2_i, floor) * (1.0 - h))


@dataclass(frozen=True)
class AntoineFit:
    """``log10(p/kPa) = A − B / (C + t/°C)`` fitted over ``T_min_C``…``T_max_C`` [°C];
    residuals in log10 p; leverage of each point; rms of the residuals."""

    A: float
    B: float
    C: float
    T_min_C: float
    T_max_C: float
    residuals: np.ndarray
    leverage: np.ndarray
    rms: float


def antoine_pressure(T, A: float, B: float, C: float):
    """Vapor pressure [Pa] at ``T`` [K] from Antoine coefficients in kPa and °C:
    ``p = 1000 · 10^(A − B / (C + T − 273.15))``."""
    t = np.asarray(T, dtype=float) - T_ZERO_C
    return 1e3 * 10.0 ** (A - B / (C + t))


def antoine_temperature(P, A: float, B: float, C: float):
    """Temperature [K] at which the Antoine curve reaches ``P`` [Pa] (coefficients in kPa, °C):
    ``t = B / (A − log10(p/kPa)) − C``; NaN where the curve never reaches ``P``."""
    lp = np.log10(np.asarray(P, dtype=float) / 1e3)
    den = A - lp
    with np.errstate(divide="ignore", invalid="ignore"):
        t = np.where(den > 0, B / den - C, np.nan)
    return t + T_ZERO_C


def _linear_AB(t, y, C):
    """Best A, B for fixed C (log10 p = A − B z, z = 1/(C + t)) and the residuals."""
    z = 1.0 / (C + t)
    X = np.column_stack([np.ones_like(z), -z])
    coef, *_ = np.linalg.lstsq(X, y, rcond=None)
    return coef[0], coef[1], y - X @ coef


def antoine_fit(T, P) -> AntoineFit:
    """Least-squares Antoine fit in ``log10(p/kPa)``.

    T : temperatures [K], at least 4 points at 3 or more distinct temperatures
    P : vapor pressures [Pa]

    For each C the best A and B follow by linear least squares, so the sum of squares is minimised
    over C alone (bounded so that C + t > 0 at every point), then A, B, C are polished together.
    """
    T, P = _check_points(T, P, 4, "Antoine fit")
    if np.unique(np.round(T, 9)).size < 3:
        raise VaporDataError("the Antoine fit needs at least 3 distinct temperatures")
    t, y = T - T_ZERO_C, np.log10(P / 1e3)
    lo = -float(np.min(t)) + 1e-3          # C + t > 0 everywhere
    span = float(np.ptp(t))

    def sse(C):
        return float(np.sum(_linear_AB(t, y, C)[2] ** 2))

    # grid over C + t_min on a log scale, then a bounded refinement around the best node
    grid = lo + np.logspace(-2, 4, 241) * max(span, 1.0)
    vals = np.array([sse(c) for c in grid])
    k = int(np.argmin(vals))
    a, b = grid[max(k - 1, 0)], grid[min(k + 1, grid.size - 1)]
    from scipy import optimize  # imported here: heavy, only the fits need it

    Cbest = optimize.minimize_scalar(sse, bounds=(a, b), method="bounded",
                                     options={"xatol": 1e-10 * max(abs(b), 1.0)}).x
    A0, B0, _ = _linear_AB(t, y, Cbest)

    def fun(p):
        return p[0] - p[1] / (p[2] + t) - y

    sol = optimize.least_squares(fun, [A0, B0, Cbest], x_scale="jac", xtol=1e-15, ftol=1e-15,
                                 gtol=1e-15, max_nfev=2000,
                                 bounds=([-np.inf, -np.inf, lo], [np.inf, np.inf, np.inf]))
    A, B, C = (float(v) for v in sol.x)
    if sum(fun(sol.x) ** 2) > sse(Cbest):  # keep the better of the two
        A, B, C = float(A0), float(B0), float(Cbest)
    res = -fun(np.array([A, B, C]))
    J = np.column_stack([np.ones_like(t), -1.0 / (C + t), B / (C + t) ** 2])
    try:
        lev = np.einsum("ij,jk,ik->i", J, np.linalg.pinv(J.T @ J), J)
    except np.linalg.LinAlgError:
        lev = np.full(t.size, 3.0 / t.size)
    return AntoineFit(A=A, B=B, C=C, T_min_C=float(np.min(t)), T_max_C=float(np.max(t)),
                      residuals=res, leverage=lev, rms=float(np.sqrt(np.mean(res ** 2))))


def find_kink(T, P, *, ratio: float = 10.0) -> float | None:
    """Temperature [K] where ``ln p`` against ``1/T`` bends sharply, or ``None``.

    Two straight lines (split at the best point, at least 3 points each side) are compared with
    one quadratic in 1/T (a smooth curve with as many parameters less one): a kink, as at a phase
    change, is flagged when the two lines' sum of squares is ``ratio`` times smaller. Needs 7 or
    more points at distinct temperatures; returns the temperature midway between the two sides.
    """
    T = np.asarray(T, dtype=float)
    P = np.asarray(P, dtype=float)
    order = np.argsort(T)
    x, y = 1.0 / T[order], np.log(P[order])
    if np.unique(np.round(x, 15)).size < 7:
        return None
    q = np.polyfit(x - x.mean(), y, 2, full=True)
    sse_q = float(np.sum((np.polyval(q[0], x - x.mean()) - y) ** 2))
    best, where = np.inf, None
    for k in range(3, x.size - 2):
        if x[k - 1] == x[k]:
            continue
        s = 0.0
        for xs, ys in ((x[:k], y[:k]), (x[k:], y[k:])):
            c = np.polyfit(xs, ys, 1)
            s += float(np.sum((np.polyval(c, xs) - ys) ** 2))
        if s < best:
            best, where = s, k
    scale = 1e-14 * float(np.sum((y - y.mean()) ** 2)) + 1e-300
    if where is not None and sse_q > ratio * best and sse_q > scale:
        return float(0.5 * (T[order][where - 1] + T[order][where]))
    return None


# ----------------------------------------------------------------------- the whole job
@dataclass
class VaporPressureFit:
    """Both fits of one data set, the boiling points, the flagged points and the caveats."""

    T: np.ndarray
    P: np.ndarray
    rows: tuple[int, ...]
    cc: CCFit
    antoine: AntoineFit | None
    studentized: np.ndarray | None
    outliers: list[int]
    kink_T: float | None
    normal_boiling_point: float | None       # [K]
    at_pressure: float | None = None         # [Pa]
    boiling_point_at_pressure: float | None = None  # [K]
    caveats: list = field(default_factory=list)
    ice_rows: list = field(default_factory=list)

    def to_dict(self) -> dict:
        cav = merge_caveats(self.caveats)
        kj = 1e-3
        ant = None
        if self.antoine is not None:
            a = self.antoine
            ant = {"A": a.A, "B": a.B, "C": a.C, "T_min_C": a.T_min_C, "T_max_C": a.T_max_C,
                   "form": "log10(p/kPa) = A - B/(C + t/°C)", "rms_log10_residual": a.rms}
        pts = []
        for i in range(self.T.size):
            pts.append({
                "row": self.rows[i], "temperature_C": float(self.T[i] - T_ZERO_C),
                "pressure_kPa": float(self.P[i] / 1e3),
                "cc_residual_ln": float(self.cc.residuals[i]),
                "antoine_residual_log10": (None if self.antoine is None
                                           else float(self.antoine.residuals[i])),
                "studentized_residual": (None if self.studentized is None
                                         else float(self.studentized[i])),
                "outlier": self.rows[i] in self.outliers,
                "over_ice": self.rows[i] in self.ice_rows})
        d = {"n_points": int(self.T.size),
             "dH_vap_kJ_per_mol": self.cc.dH * kj,
             "dH_vap_stderr_kJ_per_mol": self.cc.dH_se * kj,
             "dH_vap_ci95_kJ_per_mol": [self.cc.dH_ci95[0] * kj, self.cc.dH_ci95[1] * kj],
             "clausius_clapeyron": {"slope_K": self.cc.slope, "intercept_ln_Pa": self.cc.intercept,
                                    "slope_stderr_K": self.cc.slope_se,
                                    "T_mean_C": self.cc.T_mean - T_ZERO_C,
                                    "form": "ln(p/Pa) = intercept + slope/(T/K)",
                                    "note": DZ_NOTE},
             "antoine": ant,
             "normal_boiling_point_C": (None if self.normal_boiling_point is None
                                        else self.normal_boiling_point - T_ZERO_C)}
        if self.at_pressure is not None:
            d["at_pressure_kPa"] = self.at_pressure / 1e3
            d["boiling_point_at_pressure_C"] = (None if self.boiling_point_at_pressure is None
                                                else self.boiling_point_at_pressure - T_ZERO_C)
        d["kink_near_C"] = None if self.kink_T is None else self.kink_T - T_ZERO_C
        d["points"] = pts
        d["outliers"] = list(self.outliers)
        d["warnings"] = [c.message for c in cav]
        d["warnings_detail"] = [c.to_dict() for c in cav]
        d["notes"] = [DZ_NOTE]
        d["cautions"] = []
        return d


def _boiling_point(fit: AntoineFit, P: float, label: str, cav: list) -> float | None:
    Tb = float(antoine_temperature(P, fit.A, fit.B, fit.C))
    lo, hi = fit.T_min_C + T_ZERO_C, fit.T_max_C + T_ZERO_C
    if not math.isfinite(Tb):
        cav.append(Caveat("extrapolation", f"The Antoine curve never reaches {P / 1e3:g} kPa: "
                          f"no {label}.", about="vapor"))
        return None
    if Tb < lo - EXTRAPOLATION_MARGIN_K or Tb > hi + EXTRAPOLATION_MARGIN_K:
        cav.append(Caveat("extrapolation", (
            f"The {label} ({Tb - T_ZERO_C:.1f} °C by the Antoine fit) lies more than "
            f"{EXTRAPOLATION_MARGIN_K:g} K outside the data ({fit.T_min_C:.1f}…{fit.T_max_C:.1f} "
            "°C): not given; measure closer to it."), about="vapor"))
        return None
    if not (lo <= Tb <= hi):
        cav.append(Caveat("extrapolation", (
            f"The {label} ({Tb - T_ZERO_C:.2f} °C) is extrapolated beyond the data "
            f"({fit.T_min_C:.1f}…{fit.T_max_C:.1f} °C)."), about="vapor"))
    return Tb


def fit_vapor_pressure(T, P, *, rows=None, at_pressure: float | None = None,
                       water_check: bool = True, gauge: bool = False) -> VaporPressureFit:
    """Clausius–Clapeyron and Antoine fits with boiling points and flags.

    T : temperatures [K]; P : pressures [Pa]; rows : each point's label (file row), default 1…n
    at_pressure : a pressure [Pa] at which to give the boiling point
    water_check : flag points below water's triple point that lie on the IAPWS sublimation curve
    gauge : the pressures were read as gauge and made absolute by adding 101.325 kPa (warns)
    """
    T, P = _check_points(T, P, 3, "Clausius–Clapeyron fit")
    rows = tuple(rows) if rows is not None else tuple(range(1, T.size + 1))
    cav: list[Caveat] = []
    if gauge:
        cav.append(Caveat("gauge", "The pressure column is gauge: 101.325 kPa was added to every "
                          "value; a vapor pressure is absolute, so check the column's unit.",
                          about="vapor"))
    cc = clausius_clapeyron_fit(T, P)
    ant = None
    if T.size >= 4 and np.unique(np.round(T, 9)).size >= 3:
        ant = antoine_fit(T, P)
    else:
        cav.append(Caveat("too-few-points", "The Antoine fit needs at least 4 points at 3 "
                          "distinct temperatures: only the Clausius–Clapeyron fit is given.",
                          about="vapor"))
    if ant is not None and T.size >= 5:
        stud = studentized_residuals(ant.residuals, ant.leverage, 3)
        rel = np.abs(ant.residuals) * _LN10          # log10 residual → relative in p
    else:
        stud = studentized_residuals(cc.residuals, cc.leverage, 2)
        rel = np.abs(cc.residuals)
    outliers = [] if stud is None else [
        rows[i] for i in np.flatnonzero((np.abs(stud) > OUTLIER_T) & (rel > OUTLIER_MIN_REL))]
    if stud is None:
        cav.append(Caveat("too-few-points", "Too few points to test residuals for outliers.",
                          about="vapor"))
    if outliers:
        cav.append(Caveat("outlier", (
            "Points that do not fit (studentized residual above 3, more than 0.2 % off the "
            "curve): rows "
            + ", ".join(str(r) for r in outliers) + "; check them and refit without them."),
            about="vapor"))
    kink = find_kink(T, P)
    if kink is not None:
        cav.append(Caveat("phase-change", (
            f"ln p against 1/T bends sharply near {kink - T_ZERO_C:.1f} °C: the data probably "
            "cross a phase change (e.g. solid and liquid); fit each side separately."),
            about="vapor"))
    ice_rows = []
    if water_check and np.any(T < T_TRIPLE):
        from .water import sublimation_pressure
        below = np.flatnonzero(T < T_TRIPLE)
        p_sub = sublimation_pressure(np.maximum(T[below], 50.0))
        on_ice = below[np.abs(P[below] / p_sub - 1.0) < 0.03]
        ice_rows = [rows[i] for i in on_ice]
        if ice_rows:
            cav.append(Caveat("phase-change", (
                "Rows " + ", ".join(str(r) for r in ice_rows) + " lie below water's triple point "
                "(0.01 °C) on the ice sublimation curve (IAPWS R14-08): that is vapor over ice, "
                "not over liquid; leave them out of a vaporization fit."), component="water",
                about="vapor"))
    nbp = bp = None
    if ant is not None:
        nbp = _boiling_point(ant, P_ATM, "normal boiling point", cav)
        if at_pressure is not None:
            if not (at_pressure > 0):
                raise VaporDataError(f"the pressure for the boiling point must be positive, got "
                                     f"{at_pressure:g} Pa")
            bp = _boiling_point(ant, at_pressure, f"boiling point at {at_pressure / 1e3:g} kPa",
                                cav)
    elif at_pressure is not None:
        cav.append(Caveat("too-few-points", "No boiling point without an Antoine fit.",
                          about="vapor"))
    return VaporPressureFit(T=T, P=P, rows=rows, cc=cc, antoine=ant, studentized=stud,
                            outliers=outliers, kink_T=kink, normal_boiling_point=nbp,
                            at_pressure=at_pressure, boiling_point_at_pressure=bp,
                            caveats=merge_caveats(cav), ice_rows=ice_rows)
