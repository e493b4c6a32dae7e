"""Pitzer ion-interaction model for aqueous solutions of one strong electrolyte.

The model gives the osmotic coefficient phi of water in a solution of a single
salt M_nuM X_nuX at molality b and temperature T, and from it the water
activity. The parameters beta0, beta1, beta2 and C^phi are functions of
temperature taken from published parameter sets; they are stored, with their
equation forms, valid ranges and sources, in ``solutions/data/pitzer_binary.csv``
(see ``pitzer_binary_README.md`` beside it).

Equations (Pitzer 1991, ch. 3, eqs. 17-20)::

    phi - 1 = |zM zX| f^phi + b (2 nuM nuX / nu) B^phi
              + b^2 (2 (nuM nuX)^(3/2) / nu) C^phi
    f^phi   = -A_phi sqrt(I) / (1 + 1.2 sqrt(I))
    B^phi   = beta0 + beta1 exp(-alpha1 sqrt(I)) + beta2 exp(-alpha2 sqrt(I))
    I       = b (nuM zM^2 + nuX zX^2) / 2
    ln a_w  = -phi nu b M_w

References
----------
Pitzer, K. S. (1991) Activity Coefficients in Electrolyte Solutions, 2nd ed.,
CRC Press, ch. 3.
Pitzer, K. S. & Mayorga, G. (1973) J. Phys. Chem. 77, 2300-2308.
Clegg, S. L., Rard, J. A. & Pitzer, K. S. (1994) J. Chem. Soc. Faraday Trans.
90, 1875-1894 (A_phi, Appendix II / Table 11).
Møller, N. (1988) Geochim. Cosmochim. Acta 52, 821-837 (A_phi and eq. 13).
"""
from __future__ import annotations

import csv
from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path

import numpy as np

from solutions.errors import Caveat, OutOfRangeError, SolutionsError

#: Molar mass of water [kg/mol] (IAPWS value).
M_WATER = 0.018015268
#: Pitzer's universal constant b [kg^0.5 mol^-0.5] (Pitzer 1991, common value).
B_PITZER = 1.2
#: Reference temperature of the ``phreeqc_analytic`` and ``linear_dT`` forms [K].
T_REF = 298.15
#: Window [K] over which a salt's low-temperature and high-temperature
#: parameter sets are blended (weight of the high set rises smoothly 0 -> 1).
BLEND_WINDOW = (273.15, 298.15)
#: Range [K] of the Clegg, Rard & Pitzer (1994) A_phi fit.
APHI_CRP94_RANGE = (234.15, 373.15)
#: Range [K] of the Møller (1988) A_phi equation.
APHI_M88_RANGE = (273.15, 573.15)
#: Window [K] over which A_phi passes from the CRP94 fit to the Møller equation.
APHI_SWITCH = (353.15, 373.15)

_DATA_FILE = Path(__file__).resolve().parent.parent / "data" / "pitzer_binary.csv"
_PARAMS = ("beta0", "beta1", "beta2", "Cphi")

# Clegg, Rard & Pitzer (1994) Table 11: Chebyshev coefficients of A_phi in
# X = (2T - 607.3)/139; the first is halved as in their eq. (AII1).
_APHI_CRP94 = np.array([
    0.797256081240 / 2, 0.573389669896e-1, 0.977632177788e-3,
    0.489973732417e-2, -0.313151784342e-2, 0.179145971002e-2,
    -0.920584241844e-3, 0.443862726879e-3, -0.203661129991e-3,
    0.900924147948e-4, -0.388189392385e-4, 0.164245088592e-4,
    -0.686031972567e-5, 0.283455806377e-5, -0.115641433004e-5,
    0.461489672579e-6, -0.177069754948e-6, 0.612464488231e-7,
    -0.175689013085e-7,
])
# Møller (1988) A_phi coefficients for his eq. 13 form.
_APHI_M88 = (3.36901532e-1, -6.32100430e-4, 9.14252359e00, -1.35143986e-2,
             2.26089488e-3, 1.92118597e-6, 4.52586464e1, 0.0)

_FORM_NCOEF = {"const": 1, "linear_dT": 2, "M88_eq13": 8, "phreeqc_analytic": 6}


def _m88_eq13(T: np.ndarray, a) -> np.ndarray:
    """Møller (1988) eq. 13 / Greenberg & Møller (1989) eq. 3."""
    return (a[0] + a[1] * T + a[2] / T + a[3] * np.log(T) + a[4] / (T - 263.0)
            + a[5] * T**2 + a[6] / (680.0 - T) + a[7] / (T - 227.0))


def _phreeqc_analytic(T: np.ndarray, a) -> np.ndarray:
    """A0 + A1(1/T - 1/Tr) + A2 ln(T/Tr) + A3(T - Tr) + A4(T^2 - Tr^2) + A5(1/T^2 - 1/Tr^2)."""
    Tr = T_REF
    return (a[0] + a[1] * (1.0 / T - 1.0 / Tr) + a[2] * np.log(T / Tr)
            + a[3] * (T - Tr) + a[4] * (T**2 - Tr**2) + a[5] * (1.0 / T**2 - 1.0 / Tr**2))


@dataclass(frozen=True)
class TFunction:
    """One Pitzer parameter as a published function of temperature.

    ``form`` names the equation (see ``pitzer_binary_README.md``):

    - ``const``: P = a1
    - ``linear_dT``: P = a1 + a2 (T - 298.15)   (25 °C value + first derivative)
    - ``M88_eq13``: P = a1 + a2 T + a3/T + a4 ln T + a5/(T-263) + a6 T^2
      + a7/(680-T) + a8/(T-227)   (Møller 1988 eq. 13)
    - ``phreeqc_analytic``: P = a1 + a2 (1/T - 1/Tr) + a3 ln(T/Tr) + a4 (T-Tr)
      + a5 (T^2-Tr^2) + a6 (1/T^2 - 1/Tr^2), Tr = 298.15 K
    """

    form: str
    coeffs: tuple[float, ...]

    def __call__(self, T) -> np.ndarray:
        T = np.asarray(T, dtype=float)
        a = self.coeffs
        if self.form == "const":
            return np.full_like(T, a[0])
        if self.form == "linear_dT":
            return a[0] + a[1] * (T - T_REF)
        with np.errstate(divide="ignore", invalid="ignore"):
            if self.form == "M88_eq13":
                return _m88_eq13(T, a)
            if self.form == "phreeqc_analytic":
                return _phreeqc_analytic(T, a)
        raise SolutionsError(f"unknown Pitzer temperature-function form {self.form!r}")


_ZERO = TFunction("const", (0.0,))


@dataclass(frozen=True)
class PitzerParameterSet:
    """One published parameter set of a salt, valid over [T_min, T_max] [K]."""

    label: str
    T_min: float
    T_max: float
    beta0: TFunction
    beta1: TFunction
    beta2: TFunction
    Cphi: TFunction
    source: str


@dataclass(frozen=True)
class PitzerSalt:
    """Pitzer description of one salt M_nuM X_nuX.

    Attributes
    ----------
    name : formula as keyed in ``pitzer_binary.csv`` (e.g. ``"NaCl"``)
    nu_M, nu_X : stoichiometric numbers of cation and anion [-]
    z_M, z_X : charge numbers (z_X < 0) [-]
    alpha1, alpha2 : exponents of the beta1, beta2 terms [kg^0.5 mol^-0.5]
    b : Pitzer's b = 1.2 [kg^0.5 mol^-0.5]
    T_min, T_max : temperature range covered by the parameter sets [K]
    b_max : highest molality the parameters are meant for [mol/kg]
    source : citations of all sets, ``"; "``-separated
    sets : the parameter sets (one, or a low-T and a high-T set)
    """

    name: str
    nu_M: int
    nu_X: int
    z_M: int
    z_X: int
    alpha1: float
    alpha2: float
    b: float
    T_min: float
    T_max: float
    b_max: float
    source: str
    sets: tuple[PitzerParameterSet, ...] = field(repr=False)
    b_max_source: str = field(default="", repr=False, compare=False)

    @property
    def nu(self) -> int:
        """Ions per formula unit [-]."""
        return self.nu_M + self.nu_X


def _float(text: str, row: int, column: str) -> float:
    try:
        return float(text)
    except ValueError:
        raise SolutionsError(f"{_DATA_FILE.name} row {row}, column {column!r}: "
                             f"{text!r} is not a number") from None


@lru_cache(maxsize=None)
def _load(path: str) -> dict[str, PitzerSalt]:
    rows: dict[str, list[tuple[int, dict]]] = {}
    with open(path, newline="", encoding="utf-8") as fh:
        for i, r in enumerate(csv.DictReader(fh), start=2):
            rows.setdefault(r["salt"], []).append((i, r))
    salts: dict[str, PitzerSalt] = {}
    for name, items in rows.items():
        first = items[0][1]
        head = {k: first[k] for k in ("nu_M", "nu_X", "z_M", "z_X", "alpha1", "alpha2",
                                      "b_max_mol_per_kg")}
        by_set: dict[str, dict] = {}
        for i, r in items:
            if any(r[k] != v for k, v in head.items()):
                raise SolutionsError(f"{Path(path).name} row {i}: salt {name!r} has "
                                     "inconsistent charges, alphas or b_max between rows")
            form = r["form"]
            if form not in _FORM_NCOEF:
                raise SolutionsError(f"{Path(path).name} row {i}: unknown form {form!r}")
            n = _FORM_NCOEF[form]
            raw = [r[f"a{k}"] for k in range(1, 9)]
            if any(x.strip() for x in raw[n:]):
                raise SolutionsError(f"{Path(path).name} row {i}: form {form!r} takes {n} "
                                     "coefficients, more are given")
            coeffs = tuple(_float(x, i, f"a{k + 1}") if x.strip() else 0.0
                           for k, x in enumerate(raw[:n]))
            if r["param"] not in _PARAMS:
                raise SolutionsError(f"{Path(path).name} row {i}: unknown parameter "
                                     f"{r['param']!r}")
            s = by_set.setdefault(r["set"], {"T_min": _float(r["T_min_K"], i, "T_min_K"),
                                             "T_max": _float(r["T_max_K"], i, "T_max_K"),
                                             "sources": []})
            if r["param"] in s:
                raise SolutionsError(f"{Path(path).name} row {i}: {r['param']} given twice "
                                     f"for {name} set {r['set']!r}")
            s[r["param"]] = TFunction(form, coeffs)
            if r["source"] not in s["sources"]:
                s["sources"].append(r["source"])
        sets = []
        for label, s in by_set.items():
            for p in ("beta0", "beta1", "Cphi"):
                if p not in s:
                    raise SolutionsError(f"{Path(path).name}: {name} set {label!r} lacks {p}")
            sets.append(PitzerParameterSet(label, s["T_min"], s["T_max"], s["beta0"],
                                           s["beta1"], s.get("beta2", _ZERO), s["Cphi"],
                                           " + ".join(s["sources"])))
        sets.sort(key=lambda st: (st.T_min, st.T_max))
        if len(sets) > 2:
            raise SolutionsError(f"{Path(path).name}: {name} has more than two parameter sets")
        if len(sets) == 2 and not (sets[0].T_max >= BLEND_WINDOW[1]
                                   and sets[1].T_max > sets[0].T_max):
            raise SolutionsError(f"{Path(path).name}: {name} sets do not fit the blend window "
                                 f"{BLEND_WINDOW} K")
        all_sources = []
        for st in sets:
            for src in st.source.split(" + "):
                if src not in all_sources:
                    all_sources.append(src)
        salts[name] = PitzerSalt(
            name=name, nu_M=int(head["nu_M"]), nu_X=int(head["nu_X"]), z_M=int(head["z_M"]),
            z_X=int(head["z_X"]), alpha1=float(head["alpha1"]), alpha2=float(head["alpha2"]),
            b=B_PITZER, T_min=min(st.T_min for st in sets), T_max=max(st.T_max for st in sets),
            b_max=float(head["b_max_mol_per_kg"]), source="; ".join(all_sources),
            sets=tuple(sets), b_max_source=first["b_max_source"])
    return salts


def load_pitzer_salts() -> dict[str, PitzerSalt]:
    """All salts of ``solutions/data/pitzer_binary.csv``, keyed by formula.

    Returns
    -------
    dict[str, PitzerSalt]
        A fresh dict on every call (the parsed file is cached).

    Raises
    ------
    SolutionsError
        If the data file is malformed (the message names the row).
    """
    return dict(_load(str(_DATA_FILE)))


def _smoothstep(x: np.ndarray) -> np.ndarray:
    x = np.clip(x, 0.0, 1.0)
    return x * x * (3.0 - 2.0 * x)


def debye_huckel_Aphi(T):
    """Debye-Hückel slope A_phi of the osmotic coefficient of water at 0.1 MPa.

    Parameters
    ----------
    T : float or array_like
        Temperature [K].

    Returns
    -------
    float or ndarray
        A_phi [kg^0.5 mol^-0.5], same shape as ``T``.

    Equation
    --------
    234.15-373.15 K: Chebyshev series of Clegg, Rard & Pitzer (1994), App. II,
    Table 11, A_phi = sum_k a_k T_k(X), X = (2T - 607.3)/139 (a fit to the
    dielectric constant of Archer & Wang 1990). Above 373.15 K: Møller (1988),
    A_phi = a1 + a2 T + a3/T + a4 ln T + a5/(T-263) + a6 T^2 + a7/(680-T).
    The two are blended smoothly over 353.15-373.15 K, where they differ by
    less than 0.0007. Below 234.15 K the value at 234.15 K is held (the series
    diverges outside its range); above 573.15 K the value at 573.15 K is held.

    Validity
    --------
    234.15-573.15 K (values outside are held constant, not extrapolated).
    A_phi(298.15 K) = 0.39148, A_phi(273.15 K) = 0.37642.

    References
    ----------
    Clegg, Rard & Pitzer (1994) J. Chem. Soc. Faraday Trans. 90, 1875.
    Archer & Wang (1990) J. Phys. Chem. Ref. Data 19, 371.
    Møller (1988) Geochim. Cosmochim. Acta 52, 821.
    """
    T = np.asarray(T, dtype=float)
    if np.any(T <= 0):
        bad = float(np.min(T))
        raise OutOfRangeError("temperature", bad, 0.0, None, "K",
                              "absolute temperature must be positive")
    Tc = np.clip(T, *APHI_CRP94_RANGE)
    crp = np.polynomial.chebyshev.chebval((2.0 * Tc - 607.3) / 139.0, _APHI_CRP94)
    Tm = np.clip(T, APHI_SWITCH[0], APHI_M88_RANGE[1])
    m88 = _m88_eq13(Tm, _APHI_M88)
    w = _smoothstep((T - APHI_SWITCH[0]) / (APHI_SWITCH[1] - APHI_SWITCH[0]))
    out = (1.0 - w) * crp + w * m88
    return out[()] if out.ndim == 0 else out


def _blend_weight(T: np.ndarray) -> np.ndarray:
    lo, hi = BLEND_WINDOW
    return _smoothstep((T - lo) / (hi - lo))


def pitzer_parameters(salt: PitzerSalt, T) -> dict[str, np.ndarray]:
    """beta0, beta1, beta2, Cphi of ``salt`` at temperature ``T``.

    Parameters
    ----------
    salt : PitzerSalt
    T : float or array_like
        Temperature [K].

    Returns
    -------
    dict
        ``{"beta0", "beta1", "beta2", "Cphi"}`` -> arrays shaped like ``T``
        [kg/mol for the betas, kg^2/mol^2 for Cphi].

    Notes
    -----
    A salt with a low-temperature and a high-temperature set uses the low set
    below 273.15 K, the high set above 298.15 K and, in between, a blend with
    weight w = 3x^2 - 2x^3 (x = (T - 273.15)/25 K) on the high set, so phi is
    continuous with a continuous first temperature derivative. Outside every
    set's range the nearest set is extrapolated (``validity`` reports it).
    """
    T = np.asarray(T, dtype=float)
    sets = salt.sets
    if len(sets) == 1:
        s = sets[0]
        return {p: np.broadcast_to(getattr(s, p)(T), T.shape).astype(float) for p in _PARAMS}
    low, high = sets
    w = _blend_weight(T)
    out = {}
    for p in _PARAMS:
        pl = getattr(low, p)(T)
        ph = getattr(high, p)(T)
        # The unused set may sit on a pole of its equation (e.g. 1/(T-263));
        # select rather than multiply by a zero weight.
        with np.errstate(invalid="ignore", over="ignore"):
            mixed = (1.0 - w) * pl + w * ph
        out[p] = np.where(w <= 0.0, pl, np.where(w >= 1.0, ph, mixed))
    return out


def _check_inputs(b: np.ndarray, T: np.ndarray) -> None:
    if np.any(b < 0):
        raise OutOfRangeError("molality", float(np.min(b)), 0.0, None, "mol/kg",
                              "molality cannot be negative")
    if np.any(T <= 0):
        raise OutOfRangeError("temperature", float(np.min(T)), 0.0, None, "K",
                              "absolute temperature must be positive")


def osmotic_coefficient(salt: PitzerSalt, b, T):
    """Osmotic coefficient phi of water in an aqueous solution of one salt.

    Parameters
    ----------
    salt : PitzerSalt
        From :func:`load_pitzer_salts`.
    b : float or array_like
        Molality of the salt (formula units) [mol/kg of water], >= 0.
    T : float or array_like
        Temperature [K]; broadcast against ``b``.

    Returns
    -------
    float or ndarray
        phi [-], shape of ``np.broadcast(b, T)``.

    Equation
    --------
    phi = 1 - |zM zX| A_phi sqrt(I)/(1 + b sqrt(I))
            + b (2 nuM nuX/nu) (beta0 + beta1 e^(-alpha1 sqrt I) + beta2 e^(-alpha2 sqrt I))
            + b^2 (2 (nuM nuX)^1.5/nu) Cphi
    (Pitzer 1991, ch. 3), with A_phi from :func:`debye_huckel_Aphi` and the
    parameters from :func:`pitzer_parameters`.

    Validity
    --------
    The salt's [T_min, T_max] and b <= b_max; outside, values are extrapolated
    and :func:`validity` returns caveats. Never raises for that.

    Raises
    ------
    OutOfRangeError
        For b < 0 or T <= 0.

    References
    ----------
    Pitzer (1991); parameter sources in ``salt.source``.
    """
    b = np.asarray(b, dtype=float)
    T = np.asarray(T, dtype=float)
    b, T = np.broadcast_arrays(b, T)
    _check_inputs(b, T)
    par = pitzer_parameters(salt, T)
    nM, nX = salt.nu_M, salt.nu_X
    nu = nM + nX
    zz = abs(salt.z_M * salt.z_X)
    sI = np.sqrt(0.5 * b * (nM * salt.z_M**2 + nX * salt.z_X**2))
    fphi = -debye_huckel_Aphi(T) * sI / (1.0 + salt.b * sI)
    Bphi = (par["beta0"] + par["beta1"] * np.exp(-salt.alpha1 * sI)
            + (par["beta2"] * np.exp(-salt.alpha2 * sI) if salt.alpha2 > 0 else 0.0))
    phi = (1.0 + zz * fphi + b * (2.0 * nM * nX / nu) * Bphi
           + b**2 * (2.0 * (nM * nX) ** 1.5 / nu) * par["Cphi"])
    phi = np.asarray(phi, dtype=float)
    return phi[()] if phi.ndim == 0 else phi


def ln_water_activity(salt: PitzerSalt, b, T):
    """Natural logarithm of the water activity of a single-salt solution.

    Parameters
    ----------
    salt : PitzerSalt
    b : float or array_like
        Salt molality [mol/kg].
    T : float or array_like
        Temperature [K].

    Returns
    -------
    float or ndarray
        ln a_w [-] = -phi nu b M_w, M_w = 0.018015268 kg/mol.

    Validity, references
    --------------------
    As :func:`osmotic_coefficient`.
    """
    b = np.asarray(b, dtype=float)
    out = np.asarray(-osmotic_coefficient(salt, b, T) * salt.nu * b * M_WATER, dtype=float)
    return out[()] if out.ndim == 0 else out


def _range_caveat(salt: PitzerSalt, quantity: str, unit: str, values: np.ndarray,
                  low: float | None, high: float | None, what: str) -> Caveat | None:
    v = values[np.isfinite(values)]
    if v.size == 0:
        return None
    below = v[v < low] if low is not None else v[:0]
    above = v[v > high] if high is not None else v[:0]
    if below.size == 0 and above.size == 0:
        return None
    worst = float(below.min()) if below.size else float(above.max())
    if unit == "K":  # chemists read temperatures in °C
        shown, u = worst - 273.15, "°C"
        lo = "-inf" if low is None else f"{low - 273.15:.4g}"
        hi = "+inf" if high is None else f"{high - 273.15:.4g}"
    else:
        shown, u = worst, unit
        lo = "0" if low is None and quantity == "molality" else (
            "-inf" if low is None else f"{low:g}")
        hi = "+inf" if high is None else f"{high:g}"
    if u == "°C" and lo == hi:
        msg = (f"{salt.name}: {what} are for {lo} °C only; used unchanged at {shown:.4g} °C "
               "(extrapolated)")
    else:
        msg = (f"{salt.name}: {quantity} {shown:.4g} {u} is outside the range {lo} to {hi} {u} "
               f"of {what}; the value is extrapolated")
    return Caveat("model-range", msg, component=salt.name,
                  extra={"quantity": quantity, "value": worst, "low": low, "high": high,
                         "unit": unit, "model": what})


def validity(salt: PitzerSalt, b, T) -> list[Caveat]:
    """Caveats for (b, T) points outside the ranges the parameters were fitted on.

    Parameters
    ----------
    salt : PitzerSalt
    b : float or array_like
        Salt molality [mol/kg].
    T : float or array_like
        Temperature [K].

    Returns
    -------
    list[Caveat]
        At most one caveat each (kind ``"model-range"``, component = salt name)
        for: temperature outside [salt.T_min, salt.T_max]; molality above
        salt.b_max; temperature outside the range of the A_phi equation.
        Empty when every point is inside. Never raises for range problems.
    """
    b, T = np.broadcast_arrays(np.asarray(b, dtype=float), np.asarray(T, dtype=float))
    out = []
    for c in (
        _range_caveat(salt, "temperature", "K", T.ravel(), salt.T_min, salt.T_max,
                      "its Pitzer parameters"),
        _range_caveat(salt, "molality", "mol/kg", b.ravel(), None, salt.b_max,
                      "the Pitzer parameters"),
        _range_caveat(salt, "temperature", "K", T.ravel(), APHI_CRP94_RANGE[0],
                      APHI_M88_RANGE[1], "the Debye-Hückel slope A_phi (held constant outside)"),
    ):
        if c is not None:
            out.append(c)
    return out


__all__ = [
    "M_WATER", "PitzerSalt", "PitzerParameterSet", "TFunction", "debye_huckel_Aphi",
    "ln_water_activity", "load_pitzer_salts", "osmotic_coefficient", "pitzer_parameters",
    "validity",
]

