"""Pitzer ion-interaction model for aqueous solutions of strong electrolytes.

Two levels: one salt (:func:`osmotic_coefficient`, below) and any mixture of salts
(:func:`pitzer_mixture`, at the end of the module: every ion in the total ionic
strength, every cation-anion pair with its binary parameters, θ and ψ mixing terms from
``pitzer_mixing.csv`` and the unsymmetrical-mixing terms of Pitzer 1975). For one salt
the two agree to rounding.

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
# The same series as a polynomial in powers of X (numpy's cheb2poly, once): summed by
# Horner's rule it equals the Chebyshev sum within 1e-16 over -1 <= X <= 1, at half the cost.
_APHI_CRP94_POWERS = tuple(float(c) for c in np.polynomial.chebyshev.cheb2poly(_APHI_CRP94))
# Møller (1988) A_phi coefficients for his eq. 13 form.
_APHI_M88 = (3.36901532e-1, -6.32100430e-4, 9.14252359e00, -1.35143986e-2,
             2.26089488e-3, 1.92118597e-6, 4.52586464e1, 0.0)

_FORM_NCOEF = {"const": 1, "linear_dT": 2, "M88_eq13": 8, "phreeqc_analytic": 6}


def _m88_eq13(T: np.ndarray, a) -> np.ndarray:
    """Møller (1988) eq. 13 / Greenberg & Møller (1989) eq. 3."""
    return (a[0] + a[1] * T + a[2] / T + a[3] * np.log(T) + a[4] / (T - 263.0)
            + a[5] * T**2 + a[6] / (680.0 - T) + a[7] / (T - 227.0))


def _phreeqc_basis(T: np.ndarray) -> tuple[np.ndarray, ...]:
    """The functions of T that the ``phreeqc_analytic`` coefficients multiply."""
    Tr = T_REF
    return (1.0 / T - 1.0 / Tr, np.log(T / Tr), T - Tr, T**2 - Tr**2, 1.0 / T**2 - 1.0 / Tr**2)


def _phreeqc_analytic(T: np.ndarray, a, basis=None) -> np.ndarray:
    """A0 + A1(1/T - 1/Tr) + A2 ln(T/Tr) + A3(T - Tr) + A4(T^2 - Tr^2) + A5(1/T^2 - 1/Tr^2);
    ``basis``: :func:`_phreeqc_basis` of T when already computed (shared by the parameters
    of one set)."""
    u = _phreeqc_basis(T) if basis is None else basis
    return a[0] + a[1] * u[0] + a[2] * u[1] + a[3] * u[2] + a[4] * u[3] + a[5] * u[4]


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

    def __call__(self, T, bases: dict | None = None) -> np.ndarray:
        """Value at ``T`` [K]. ``bases``: a dict shared by several functions evaluated at
        the same ``T`` (the parameters of one set), so that the functions of T a form's
        coefficients multiply are computed once."""
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
                if bases is None:
                    return _phreeqc_analytic(T, a)
                if self.form not in bases:
                    bases[self.form] = _phreeqc_basis(T)
                return _phreeqc_analytic(T, a, bases[self.form])
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

    def values(self, T: np.ndarray) -> dict[str, np.ndarray]:
        """beta0, beta1, beta2, Cphi at ``T`` [K], arrays shaped like ``T``."""
        bases: dict = {}
        return {p: np.broadcast_to(getattr(self, p)(T, bases), T.shape).astype(float)
                for p in _PARAMS}


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


def _tfunction(r: dict, i: int, where: str) -> "TFunction":
    """The temperature function of one data row (columns ``form``, ``a1`` … ``a8``)."""
    form = r["form"].strip()
    if form not in _FORM_NCOEF:
        raise SolutionsError(f"{where} row {i}: unknown form {form!r}")
    n = _FORM_NCOEF[form]
    cells = [r[f"a{k}"] for k in range(1, 9)]
    if any(x.strip() for x in cells[n:]):
        raise SolutionsError(f"{where} row {i}: form {form!r} takes {n} coefficients, "
                             "more are given")
    return TFunction(form, tuple(_float(x, i, f"a{k + 1}") if x.strip() else 0.0
                                 for k, x in enumerate(cells[:n])))


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
            tf = _tfunction(r, i, Path(path).name)
            if r["param"] not in _PARAMS:
                raise SolutionsError(f"{Path(path).name} row {i}: unknown parameter "
                                     f"{r['param']!r}")
            s = by_set.setdefault(r["set"], {"T_min": _float(r["T_min_K"], i, "T_min_K"),
                                             "T_max": _float(r["T_max_K"], i, "T_max_K"),
                                             "sources": []})
            if r["param"] in s:
                raise SolutionsError(f"{Path(path).name} row {i}: {r['param']} given twice "
                                     f"for {name} set {r['set']!r}")
            s[r["param"]] = tf
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
    dielectric constant of Archer & Wang 1990), summed as the same polynomial
    in powers of X. Above 373.15 K: Møller (1988),
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

    Examples
    --------
    A_phi = 0.3915 at 25 degC (Pitzer 1991; Archer & Wang 1990 give 0.39148).

    >>> print(f"{debye_huckel_Aphi(298.15):.4f}")
    0.3915
    """
    T = np.asarray(T, dtype=float)
    if np.any(T <= 0):
        bad = float(np.min(T))
        raise OutOfRangeError("temperature", bad, 0.0, None, "K",
                              "absolute temperature must be positive")
    # each equation is evaluated only where it has weight (below the switch window the
    # blend is the Chebyshev series exactly, above it the Møller equation exactly)
    crp = m88 = None
    if not np.all(T >= APHI_SWITCH[1]):
        X = np.clip(T, *APHI_CRP94_RANGE)
        X *= 2.0
        X -= 607.3
        X /= 139.0
        crp = np.full_like(X, _APHI_CRP94_POWERS[-1])
        for a in _APHI_CRP94_POWERS[-2::-1]:
            crp *= X
            crp += a
    if not np.all(T <= APHI_SWITCH[0]):
        Tm = np.clip(T, APHI_SWITCH[0], APHI_M88_RANGE[1])
        m88 = _m88_eq13(Tm, _APHI_M88)
    if m88 is None:
        out = np.asarray(crp, dtype=float)
    elif crp is None:
        out = np.asarray(m88, dtype=float)
    else:
        w = _smoothstep((T - APHI_SWITCH[0]) / (APHI_SWITCH[1] - APHI_SWITCH[0]))
        out = (1.0 - w) * crp + w * m88
    return out[()] if out.ndim == 0 else out


def _blend_weight(T: np.ndarray) -> np.ndarray:
    lo, hi = BLEND_WINDOW
    return _smoothstep((T - lo) / (hi - lo))


def _blended(low, high, T: np.ndarray):
    """``low(T)`` below :data:`BLEND_WINDOW`, ``high(T)`` above it, the smooth blend
    (1 − w) low + w high inside; ``low`` and ``high`` return a value or a dict of values.
    Where every T lies on one side only that side's set is evaluated; the unused set may
    sit on a pole of its equation (e.g. 1/(T-263)), so it is selected, never multiplied
    by a zero weight."""
    lo, hi = BLEND_WINDOW
    if np.all(T <= lo):
        return low(T)
    if np.all(T >= hi):
        return high(T)
    w = _blend_weight(T)
    pl, ph = low(T), high(T)

    def mix(a, b):
        with np.errstate(invalid="ignore", over="ignore"):
            mixed = (1.0 - w) * a + w * b
        return np.where(w <= 0.0, a, np.where(w >= 1.0, b, mixed))
    if isinstance(pl, dict):
        return {p: mix(pl[p], ph[p]) for p in pl}
    return mix(pl, ph)


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
        return sets[0].values(T)
    low, high = sets
    return _blended(low.values, high.values, T)


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

    Examples
    --------
    NaCl at 1 mol/kg and 25 degC: phi = 0.936 (Robinson & Stokes 1959, Electrolyte
    Solutions, App. 8.10, 0.9355, from memory; the 25 degC parameters of Pitzer &
    Mayorga 1973, fitted to those data, give 0.9359).

    >>> salts = load_pitzer_salts()
    >>> print(f"{osmotic_coefficient(salts['NaCl'], 1.0, 298.15):.3f}")
    0.936
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

    Examples
    --------
    Saturated NaCl (6.15 mol/kg, CRC solubility) at 25 degC: a_w = 0.7529
    (Greenspan 1977, J. Res. NBS 81A, 89: 75.29 % relative humidity), within 0.001.

    >>> import numpy as np
    >>> a_w = np.exp(ln_water_activity(load_pitzer_salts()["NaCl"], 6.15, 298.15))
    >>> bool(abs(a_w - 0.7529) < 0.001)
    True
    """
    b = np.asarray(b, dtype=float)
    out = np.asarray(-osmotic_coefficient(salt, b, T) * salt.nu * b * M_WATER, dtype=float)
    return out[()] if out.ndim == 0 else out


def _range_caveat(name: str, quantity: str, unit: str, values: np.ndarray,
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
        msg = (f"{name}: {what} are for {lo} °C only; used unchanged at {shown:.4g} °C "
               "(extrapolated)")
    else:
        msg = (f"{name}: {quantity} {shown:.4g} {u} is outside the range {lo} to {hi} {u} "
               f"of {what}; the value is extrapolated")
    extra = {"quantity": quantity, "value": worst, "low": low, "high": high, "unit": unit,
             "model": what}
    if u == "°C":   # several temperatures of one salt become one note (errors.group_outside_temperatures)
        extra["head"] = (f"{name}: {what} are for {lo} °C only" if lo == hi else
                         f"{name}: {what} cover {lo} to {hi} °C")
        extra["outside_K"] = worst
    return Caveat("model-range", msg, component=name, extra=extra)


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
        _range_caveat(salt.name, "temperature", "K", T.ravel(), salt.T_min, salt.T_max,
                      "its Pitzer parameters"),
        _range_caveat(salt.name, "molality", "mol/kg", b.ravel(), None, salt.b_max,
                      "the Pitzer parameters"),
        _range_caveat(salt.name, "temperature", "K", T.ravel(), APHI_CRP94_RANGE[0],
                      APHI_M88_RANGE[1], "the Debye-Hückel slope A_phi (held constant outside)"),
    ):
        if c is not None:
            out.append(c)
    return out


# ============================================================================
# Mixtures of electrolytes
# ============================================================================

_IONS_FILE = Path(__file__).resolve().parent.parent / "data" / "pitzer_salt_ions.csv"
_MIXING_FILE = Path(__file__).resolve().parent.parent / "data" / "pitzer_mixing.csv"

_SUPERSCRIPT = str.maketrans("0123456789+-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁺⁻")


def ion_label(name: str, z: int) -> str:
    """Readable label of an ion: ``ion_label("SO4", -2)`` -> ``"SO4²⁻"``."""
    charge = ("" if abs(z) == 1 else str(abs(z))) + ("+" if z > 0 else "-")
    return name + charge.translate(_SUPERSCRIPT)


@dataclass(frozen=True)
class SaltIons:
    """The ions one formula unit of a salt gives in water (full dissociation).

    Attributes
    ----------
    salt : key as in ``pitzer_salt_ions.csv`` (``"NaCl"``, ``"Na3C6H5O7"`` ...)
    cation, anion : ion names (``"Na"``, ``"SO4"``, ``"citrate"`` ...)
    z_cation, z_anion : charge numbers (z_anion < 0) [-]
    nu_cation, nu_anion : ions per formula unit [-]
    source : where the stoichiometry comes from
    """

    salt: str
    cation: str
    z_cation: int
    nu_cation: int
    anion: str
    z_anion: int
    nu_anion: int
    source: str


@lru_cache(maxsize=None)
def _load_salt_ions(path: str) -> dict[str, SaltIons]:
    out: dict[str, SaltIons] = {}
    charges: dict[str, int] = {}
    name = Path(path).name
    with open(path, newline="", encoding="utf-8") as fh:
        for i, r in enumerate(csv.DictReader(fh), start=2):
            try:
                row = SaltIons(r["salt"].strip(), r["cation"].strip(), int(r["z_cation"]),
                               int(r["nu_cation"]), r["anion"].strip(), int(r["z_anion"]),
                               int(r["nu_anion"]), r["source"].strip())
            except (KeyError, ValueError, AttributeError) as exc:
                raise SolutionsError(f"{name} row {i}: cannot read ({exc})") from None
            if row.salt in out:
                raise SolutionsError(f"{name} row {i}: salt {row.salt!r} listed twice")
            if row.z_cation <= 0 or row.z_anion >= 0 or row.nu_cation < 1 or row.nu_anion < 1:
                raise SolutionsError(f"{name} row {i}: {row.salt}: charges must be cation > 0 "
                                     "> anion and stoichiometric numbers >= 1")
            if row.nu_cation * row.z_cation + row.nu_anion * row.z_anion != 0:
                raise SolutionsError(f"{name} row {i}: {row.salt} is not electrically neutral")
            for ion, z in ((row.cation, row.z_cation), (row.anion, row.z_anion)):
                if charges.setdefault(ion, z) != z:
                    raise SolutionsError(f"{name} row {i}: ion {ion!r} has charge {z} here and "
                                         f"{charges[ion]} elsewhere")
            out[row.salt] = row
    return out


def load_salt_ions() -> dict[str, SaltIons]:
    """Salt key -> :class:`SaltIons`, from ``solutions/data/pitzer_salt_ions.csv``.

    Raises
    ------
    SolutionsError
        If the file is malformed, a salt is not neutral, or one ion is given two charges.
    """
    return dict(_load_salt_ions(str(_IONS_FILE)))


def ion_charges() -> dict[str, int]:
    """Ion name -> charge number, for every ion of ``pitzer_salt_ions.csv``."""
    out: dict[str, int] = {}
    for s in _load_salt_ions(str(_IONS_FILE)).values():
        out[s.cation] = s.z_cation
        out[s.anion] = s.z_anion
    return out


@dataclass(frozen=True)
class MixingParameter:
    """A published mixing parameter θ_ij or ψ_ijk as a function of temperature.

    ``ions`` are (i, j) for θ (two ions of the same sign) and (i, j, k) for ψ (i, j of
    one sign, k of the other). ``sets`` are (label, T_min [K], T_max [K], TFunction,
    source), one or two (``low`` below 25 °C, ``high`` from 0 or 25 °C up), blended over
    the same window as the binary parameters (:data:`BLEND_WINDOW`) so that a mixture
    uses, at each temperature, mixing parameters from the same model as its binaries.
    """

    kind: str
    ions: tuple[str, ...]
    sets: tuple[tuple[str, float, float, TFunction, str], ...]

    @property
    def T_min(self) -> float:
        return min(s[1] for s in self.sets)

    @property
    def T_max(self) -> float:
        return max(s[2] for s in self.sets)

    @property
    def source(self) -> str:
        return "; ".join(dict.fromkeys(s[4] for s in self.sets))

    def label(self, charges: dict[str, int]) -> str:
        sym = "θ" if self.kind == "theta" else "ψ"
        return f"{sym}(" + ", ".join(ion_label(i, charges[i]) for i in self.ions) + ")"

    def __call__(self, T) -> np.ndarray:
        """Value at ``T`` [K] [kg/mol for θ, kg²/mol² for ψ], shape of ``T``."""
        T = np.asarray(T, dtype=float)
        if len(self.sets) == 1:
            return np.broadcast_to(self.sets[0][3](T), T.shape).astype(float)
        return np.broadcast_to(_blended(self.sets[0][3], self.sets[1][3], T),
                               T.shape).astype(float)


def _mixing_key(kind: str, ions) -> tuple:
    if kind == "theta":
        return ("theta", frozenset(ions[:2]))
    return ("psi", frozenset(ions[:2]), ions[2])


@lru_cache(maxsize=None)
def _load_mixing(path: str) -> dict[tuple, MixingParameter]:
    name = Path(path).name
    charges = ion_charges()
    raw: dict[tuple, list] = {}
    with open(path, newline="", encoding="utf-8") as fh:
        for i, r in enumerate(csv.DictReader(fh), start=2):
            kind = r["param"].strip()
            if kind not in ("theta", "psi"):
                raise SolutionsError(f"{name} row {i}: unknown parameter {kind!r}")
            ions = tuple(r[f"ion_{k}"].strip() for k in (1, 2, 3) if r[f"ion_{k}"].strip())
            if len(ions) != (2 if kind == "theta" else 3):
                raise SolutionsError(f"{name} row {i}: {kind} takes {2 if kind == 'theta' else 3}"
                                     f" ions, got {ions}")
            unknown = [x for x in ions if x not in charges]
            if unknown:
                raise SolutionsError(f"{name} row {i}: ion(s) {unknown} are not in "
                                     f"{_IONS_FILE.name}")
            zi, zj = charges[ions[0]], charges[ions[1]]
            if ions[0] == ions[1] or zi * zj <= 0 or (kind == "psi" and charges[ions[2]] * zi >= 0):
                raise SolutionsError(f"{name} row {i}: {kind}{ions}: the first two ions must be "
                                     "different ions of one sign (and the third of the other)")
            tf = _tfunction(r, i, name)
            entry = (r["set"].strip(), _float(r["T_min_K"], i, "T_min_K"),
                     _float(r["T_max_K"], i, "T_max_K"), tf,
                     r["source"].strip())
            key = _mixing_key(kind, ions)
            if any(e[0] == entry[0] for e in raw.get(key, [])[1:]):
                raise SolutionsError(f"{name} row {i}: {kind}{ions} set {entry[0]!r} given twice")
            raw.setdefault(key, [(kind, ions)]).append(entry)
    out = {}
    for key, (head, *sets) in raw.items():
        sets.sort(key=lambda s: (s[1], s[2]))
        if len(sets) > 2:
            raise SolutionsError(f"{name}: {head[0]}{head[1]} has more than two sets")
        if len(sets) == 2 and not (sets[0][2] >= BLEND_WINDOW[1] and sets[1][2] >= sets[0][2]):
            raise SolutionsError(f"{name}: {head[0]}{head[1]} sets do not fit the blend window "
                                 f"{BLEND_WINDOW} K")
        out[key] = MixingParameter(head[0], head[1], tuple(sets))
    return out


def load_mixing_parameters() -> dict[tuple, MixingParameter]:
    """All θ and ψ of ``solutions/data/pitzer_mixing.csv``.

    Keys are ``("theta", frozenset({i, j}))`` and ``("psi", frozenset({i, j}), k)``
    (ion names as in ``pitzer_salt_ions.csv``), so the order of i and j does not matter.
    """
    return dict(_load_mixing(str(_MIXING_FILE)))


# Harvie's Chebyshev approximation of Pitzer's J(x): Pitzer (1991) ch. 3, App. B,
# eqs. B-21 to B-30, coefficients a_0 ... a_20 of Table B-1 (x <= 1: middle column;
# x > 1: last column). Digits as transcribed in the open-source pytzer package
# (unsymmetrical.py); checked against the defining integral (eq. B-13) in the tests.
_J_COEF_LOW = np.array([
    1.925154014814667, -0.060076477753119, -0.029779077456514, -0.007299499690937,
    0.000388260636404, 0.000636874599598, 0.000036583601823, -0.000045036975204,
    -0.000004537895710, 0.000002937706971, 0.000000396566462, -0.000000202099617,
    -0.000000025267769, 0.000000013522610, 0.000000001229405, -0.000000000821969,
    -0.000000000050847, 0.000000000046333, 0.000000000001943, -0.000000000002563,
    -0.000000000010991,
])
_J_COEF_HIGH = np.array([
    0.628023320520852, 0.462762985338493, 0.150044637187895, -0.028796057604906,
    -0.036552745910311, -0.001668087945272, 0.006519840398744, 0.001130378079086,
    -0.000887171310131, -0.000242107641309, 0.000087294451594, 0.000034682122751,
    -0.000004583768938, -0.000003548684306, -0.000000250453880, 0.000000216991779,
    0.000000080779570, 0.000000004558555, -0.000000006944757, -0.000000002849257,
    0.000000000237816,
])


def unsymmetrical_J(x):
    """Pitzer's function J(x) of unsymmetrical mixing and its derivative J'(x).

    Parameters
    ----------
    x : float or array_like
        x_ij = 6 z_i z_j A_phi sqrt(I) [-], >= 0.

    Returns
    -------
    (J, dJ/dx) : arrays shaped like ``x`` [-]

    Equation
    --------
    J(x) = (1/x) ∫_0^∞ (1 + q + q²/2 - e^q) y² dy, q = -(x/y) e^(-y) (Pitzer 1975,
    eq. 45; Pitzer 1991, eq. B-13), evaluated by Harvie's Chebyshev series: for
    x <= 1, z = 4 x^(1/5) - 2; for x > 1, z = (40/9) x^(-1/10) - 22/9; Clenshaw sums
    b_k = z b_(k+1) - b_(k+2) + a_k, d_k = b_(k+1) + z d_(k+1) - d_(k+2); then
    J = x/4 - 1 + (b_0 - b_2)/2 and J' = 1/4 + (dz/dx)(d_0 - d_2)/2.
    J(0) = 0; x J'(x) -> 0 as x -> 0.

    Validity
    --------
    All x >= 0 (the series covers 0 < x <= 1 and x > 1; error about 1e-10).

    References
    ----------
    Pitzer, K. S. (1975) J. Solution Chem. 4, 249-265.
    Pitzer (1991), ch. 3, App. B, Table B-1 (C. E. Harvie's method).
    """
    x = np.asarray(x, dtype=float)
    J = np.zeros(x.shape)
    Jp = np.zeros(x.shape)
    low = (x > 0.0) & (x <= 1.0)
    high = x > 1.0
    for sel, coef in ((low, _J_COEF_LOW), (high, _J_COEF_HIGH)):
        xs = x[sel]
        if xs.size == 0:
            continue
        if coef is _J_COEF_LOW:
            z, dz = 4.0 * xs**0.2 - 2.0, 0.8 * xs**-0.8
        else:
            z, dz = (40.0 / 9.0) * xs**-0.1 - 22.0 / 9.0, -(4.0 / 9.0) * xs**-1.1
        b0 = b1 = b2 = d0 = d1 = d2 = np.zeros_like(xs)
        for a in coef[::-1]:
            b2, b1 = b1, b0
            d2, d1 = d1, d0
            b0 = z * b1 - b2 + a
            d0 = b1 + z * d1 - d2
        J[sel] = 0.25 * xs - 1.0 + 0.5 * (b0 - b2)
        Jp[sel] = 0.25 + 0.5 * dz * (d0 - d2)
    return (J[()], Jp[()]) if x.ndim == 0 else (J, Jp)


def _xJp(x: np.ndarray) -> np.ndarray:
    """x J'(x), 0 at x = 0."""
    return np.where(x > 0.0, x * unsymmetrical_J(x)[1], 0.0)


@dataclass(frozen=True)
class PitzerMixture:
    """The Pitzer model of one set of salts dissolved together, ready to evaluate.

    Built by :func:`pitzer_mixture` once per recipe; :meth:`osmotic_coefficient` and
    :meth:`ln_water_activity` are then pure vectorized functions of the ion molalities
    and T.

    Attributes
    ----------
    salts : the salts the mixture was built from (keys of ``pitzer_salt_ions.csv``)
    ions : ion names; ``z`` their charge numbers
    stoich : ions per formula unit, shape (n_salts, n_ions)
    pairs : (cation index, anion index, PitzerSalt or None) for every cation-anion
        pair; None = no binary parameters (B = C = 0, with a caveat in ``notes``)
    like : (i, j, θ_ij or None, ((k, ψ_ijk), ...)) for every pair of different ions of
        the same sign; missing θ or ψ are zero (named in ``notes``)
    notes : caveats that do not depend on composition or temperature
    """

    salts: tuple[str, ...]
    ions: tuple[str, ...]
    z: np.ndarray
    stoich: np.ndarray
    pairs: tuple
    like: tuple
    notes: tuple[Caveat, ...] = ()

    def labels(self) -> tuple[str, ...]:
        return tuple(ion_label(n, int(z)) for n, z in zip(self.ions, self.z))

    def ion_molalities(self, b) -> np.ndarray:
        """Ion molalities [mol/kg], shape (N, n_ions), from salt molalities ``b``.

        b : salt molalities [mol/kg], shape (N, n_salts), or a list of n_salts arrays (N,).
        """
        if isinstance(b, (list, tuple)):
            b = np.stack([np.asarray(x, dtype=float) for x in b], axis=-1)
        b = np.asarray(b, dtype=float)
        return b @ self.stoich

    def _check(self, m, T):
        m = np.asarray(m, dtype=float)
        if m.ndim == 1:
            m = m[None, :]
        if m.shape[-1] != len(self.ions):
            raise SolutionsError(f"ion molalities have {m.shape[-1]} columns for "
                                 f"{len(self.ions)} ions {self.ions}")
        T = np.broadcast_to(np.asarray(T, dtype=float), m.shape[:1])
        _check_inputs(m, T)
        return m, T

    def osmotic_coefficient(self, m, T) -> np.ndarray:
        """Osmotic coefficient phi of water in the mixture [-], shape (N,).

        Parameters
        ----------
        m : array_like
            Ion molalities [mol/kg of water], shape (N, n_ions) (or (n_ions,)).
        T : float or array_like
            Temperature [K], scalar or shape (N,).

        Equation
        --------
        (Σ_i m_i)(phi - 1) = 2 [ -A_phi I^(3/2)/(1 + 1.2 I^(1/2))
            + Σ_c Σ_a m_c m_a (B^phi_ca + Z C_ca)
            + Σ_(c<c') m_c m_c' (Φ^phi_cc' + Σ_a m_a ψ_cc'a)
            + Σ_(a<a') m_a m_a' (Φ^phi_aa' + Σ_c m_c ψ_aa'c) ]
        with I = ½ Σ m_i z_i², Z = Σ m_i |z_i|,
        B^phi = β0 + β1 e^(-α1 √I) + β2 e^(-α2 √I), C = C^phi/(2 √|z_c z_a|),
        Φ^phi_ij = θ_ij + ^Eθ_ij + I ^Eθ'_ij, and
        ^Eθ_ij + I ^Eθ'_ij = z_i z_j/(8I) [x_ij J'(x_ij) - ½ x_ii J'(x_ii) - ½ x_jj J'(x_jj)],
        x_ij = 6 z_i z_j A_phi √I (Pitzer 1991, ch. 3; Harvie, Møller & Weare 1984,
        eqs. A1-A8). phi = 1 where every molality is zero.

        Validity
        --------
        That of the binary and mixing parameters (see :meth:`caveats`). For one salt it
        equals :func:`osmotic_coefficient` of that salt.

        References
        ----------
        Pitzer (1991) ch. 3; Pitzer (1975) J. Solution Chem. 4, 249;
        Harvie, Møller & Weare (1984) Geochim. Cosmochim. Acta 48, 723.
        """
        m, T = self._check(m, T)
        S = self._S(T, self._sums(m))
        total = m.sum(axis=1)
        with np.errstate(invalid="ignore", divide="ignore"):
            phi = np.where(total > 0.0, 1.0 + 2.0 * S / np.where(total > 0, total, 1.0), 1.0)
        return phi

    def _sums(self, m: np.ndarray) -> tuple[np.ndarray, ...]:
        """The factors of the osmotic sum S that depend on composition only, each (N,), in
        the order :meth:`_S` reads them: I^(3/2)/(1 + b √I); for each pair with parameters
        m_c m_a, m_c m_a e^(-α1 √I) (and e^(-α2 √I) where α2 > 0) and m_c m_a Z/(2 √|z_c z_a|);
        √I if some like pair has unequal charges; for each like pair m_i m_j (with θ),
        m_i m_j m_k (each ψ) and, for unequal charges, (m_i m_j / I) z_i z_j / 8."""
        z = self.z
        I = 0.5 * (m @ (z * z))
        Z = m @ np.abs(z)
        sI = np.sqrt(I)
        out = [I * sI / (1.0 + B_PITZER * sI)]
        for c, a, salt in self.pairs:
            if salt is None:
                continue
            mm = m[:, c] * m[:, a]
            out.append(mm)
            out.append(mm * np.exp(-salt.alpha1 * sI))
            if salt.alpha2 > 0:
                out.append(mm * np.exp(-salt.alpha2 * sI))
            out.append(mm * Z / (2.0 * np.sqrt(abs(z[c] * z[a]))))
        if any(z[i] != z[j] for i, j, _t, _p in self.like):
            out.append(sI)
        safe_I = np.where(I > 0.0, I, 1.0)
        for i, j, theta, psis in self.like:
            mm = m[:, i] * m[:, j]
            if theta is not None:
                out.append(mm)
            out.extend(mm * m[:, k] for k, _psi in psis)
            if z[i] != z[j]:
                # m_i m_j / I -> 0 as I -> 0; dividing before multiplying by z z/8 and
                # x J' keeps the product finite down to denormal molalities
                out.append(np.where(I > 0.0, mm / safe_I, 0.0) * (z[i] * z[j] / 8.0))
        return tuple(out)

    def _S(self, T, sums) -> np.ndarray:
        """S(T) = -A_phi I^(3/2)/(1 + b √I) + Σ_c Σ_a m_c m_a (B^phi_ca + Z C_ca) + Σ_(i<j)
        like m_i m_j (Φ^phi_ij + Σ_k m_k ψ_ijk) (see :meth:`osmotic_coefficient`), from the
        composition sums of :meth:`_sums`: only the temperature functions are evaluated."""
        z = self.z
        it = iter(sums)
        Aphi = debye_huckel_Aphi(T)
        S = -Aphi * next(it)
        for _c, _a, salt in self.pairs:
            if salt is None:
                continue
            par = pitzer_parameters(salt, T)
            S += par["beta0"] * next(it)
            S += par["beta1"] * next(it)
            if salt.alpha2 > 0:
                S += par["beta2"] * next(it)
            S += par["Cphi"] * next(it)
        if any(z[i] != z[j] for i, j, _t, _p in self.like):
            x_unit = 6.0 * Aphi * next(it)   # x_ij / (z_i z_j)
            xJp: dict[float, np.ndarray] = {}

            def xjp(zz):
                if zz not in xJp:
                    xJp[zz] = _xJp(zz * x_unit)
                return xJp[zz]
        for i, j, theta, psis in self.like:
            if theta is not None:
                S += theta(T) * next(it)
            for _k, psi in psis:
                S += psi(T) * next(it)
            if z[i] != z[j]:
                zi, zj = float(z[i]), float(z[j])
                S += next(it) * (xjp(zi * zj) - 0.5 * xjp(zi * zi) - 0.5 * xjp(zj * zj))
        return S

    def ln_water_activity(self, m, T) -> np.ndarray:
        """ln a_w = -M_w (Σ_i m_i) phi [-], shape (N,); arguments as
        :meth:`osmotic_coefficient`. M_w = 0.018015268 kg/mol."""
        m, T = self._check(m, T)
        return -M_WATER * m.sum(axis=1) * self.osmotic_coefficient(m, T)

    def ln_water_activity_sums(self, m) -> tuple[np.ndarray, tuple[np.ndarray, ...]]:
        """ln a_w split for many temperatures at fixed composition: ``(c, sums)`` with
        ln a_w(m, T) = c + :meth:`ln_water_activity_at` ``(T, *sums)`` (to rounding), where
        c = -M_w Σ_i m_i [-] and ``sums`` are composition-only arrays (N,); the same subset
        of every array gives the same subset of compositions.

        m : ion molalities [mol/kg], shape (N, n_ions).
        """
        m = np.asarray(m, dtype=float)
        if m.ndim == 1:
            m = m[None, :]
        _check_inputs(m, np.ones(1))
        return -M_WATER * m.sum(axis=1), self._sums(m)

    def ln_water_activity_at(self, T, *sums) -> np.ndarray:
        """The temperature-dependent part -2 M_w S(T) of ln a_w [-] from the sums of
        :meth:`ln_water_activity_sums`; T [K], scalar or shaped like the sums."""
        S = self._S(np.asarray(T, dtype=float), sums)
        S *= -2.0 * M_WATER
        return S

    def caveats(self, m, T) -> list[Caveat]:
        """The fixed notes, plus a caveat for each binary or mixing parameter used
        outside its temperature range (one per parameter, worst value)."""
        m, T = self._check(m, T)
        out = list(self.notes)
        Tr = T.ravel()
        for _c, _a, salt in self.pairs:
            if salt is not None:
                c = _range_caveat(salt.name, "temperature", "K", Tr, salt.T_min, salt.T_max,
                                  "its Pitzer parameters")
                if c is not None:
                    out.append(c)
        charges = dict(zip(self.ions, (int(v) for v in self.z)))
        for _i, _j, theta, psis in self.like:
            for p in ((theta,) if theta is not None else ()) + tuple(q for _k, q in psis):
                c = _range_caveat(p.label(charges), "temperature", "K", Tr, p.T_min, p.T_max,
                                  "its mixing parameter")
                if c is not None:
                    out.append(c)
        return out


def _pair_salts(salt_ions: dict[str, SaltIons], binaries: dict[str, PitzerSalt]):
    """(cation, anion) -> PitzerSalt for every salt with both ions and binary parameters."""
    out = {}
    for key, s in salt_ions.items():
        if key in binaries:
            b = binaries[key]
            if (b.z_M, b.z_X, b.nu_M, b.nu_X) != (s.z_cation, s.z_anion, s.nu_cation,
                                                 s.nu_anion):
                raise SolutionsError(f"{key}: charges or stoichiometry differ between "
                                     f"{_IONS_FILE.name} and {_DATA_FILE.name}")
            out.setdefault((s.cation, s.anion), b)
    return out


def pitzer_mixture(salts) -> PitzerMixture:
    """The Pitzer mixture model of the salts ``salts`` dissolved together.

    Parameters
    ----------
    salts : iterable of str
        Salt keys of ``pitzer_salt_ions.csv`` (``"NaCl"``, ``"MgSO4"`` ...).

    Returns
    -------
    PitzerMixture
        Every cation of the salts meets every anion: a pair uses the binary parameters
        of the salt made of those two ions (``pitzer_binary.csv``), whether or not that
        salt is among ``salts`` (Na⁺-SO4²⁻ in NaCl + MgSO4 uses Na2SO4); a pair with no
        binary parameters gets B = C = 0 and a caveat. Every pair of different ions of
        one sign gets θ (and ψ with each ion of the other sign) from
        ``pitzer_mixing.csv``, or zero with a caveat naming what is missing.

    Raises
    ------
    SolutionsError
        For a salt not in ``pitzer_salt_ions.csv``.
    """
    table = _load_salt_ions(str(_IONS_FILE))
    salts = tuple(salts)
    for s in salts:
        if s not in table:
            raise SolutionsError(f"no ions known for salt {s!r}; add it to {_IONS_FILE.name}")
    ions: dict[str, int] = {}
    for s in salts:
        ions.setdefault(table[s].cation, table[s].z_cation)
        ions.setdefault(table[s].anion, table[s].z_anion)
    names = tuple(ions)
    z = np.array([ions[n] for n in names], dtype=float)
    idx = {n: k for k, n in enumerate(names)}
    stoich = np.zeros((len(salts), len(names)))
    for r, s in enumerate(salts):
        stoich[r, idx[table[s].cation]] += table[s].nu_cation
        stoich[r, idx[table[s].anion]] += table[s].nu_anion
    lab = {n: ion_label(n, ions[n]) for n in names}
    binaries = _load(str(_DATA_FILE))
    pair_salt = _pair_salts(table, binaries)
    mixing = _load_mixing(str(_MIXING_FILE))
    cations = [n for n in names if ions[n] > 0]
    anions = [n for n in names if ions[n] < 0]
    notes: list[Caveat] = []
    pairs, no_pair = [], []
    for c in cations:
        for a in anions:
            salt = pair_salt.get((c, a))
            pairs.append((idx[c], idx[a], salt))
            if salt is None:
                no_pair.append(f"{lab[c]}-{lab[a]}")
    if no_pair:
        notes.append(Caveat(
            "missing-parameters",
            f"no Pitzer parameters for ion pair{'s' if len(no_pair) > 1 else ''} "
            + ", ".join(no_pair) + ": short-range interaction taken as zero (Debye-Hückel "
            "term only), so the water activity is approximate",
            ", ".join(no_pair), extra={"pairs": no_pair}))
    like, no_theta, no_psi = [], [], []
    for group, other in ((cations, anions), (anions, cations)):
        for p in range(len(group)):
            for q in range(p + 1, len(group)):
                i, j = group[p], group[q]
                theta = mixing.get(("theta", frozenset((i, j))))
                if theta is None:
                    no_theta.append(f"{lab[i]}-{lab[j]}")
                psis = []
                for k in other:
                    psi = mixing.get(("psi", frozenset((i, j)), k))
                    if psi is not None:
                        psis.append((idx[k], psi))
                    elif theta is not None:  # a pair without θ is reported once, whole
                        no_psi.append(f"{lab[i]}-{lab[j]}-{lab[k]}")
                like.append((idx[i], idx[j], theta, tuple(psis)))
    if no_theta or no_psi:
        parts = ([f"θ and ψ of {', '.join(no_theta)}"] if no_theta else []) + (
            [f"ψ of {', '.join(no_psi)}"] if no_psi else [])
        notes.append(Caveat(
            "missing-parameters",
            "no published mixing parameters in the data, taken as zero: " + "; ".join(parts)
            + " (the electrostatic unsymmetrical-mixing term is still included)",
            ", ".join(no_theta + no_psi), extra={"theta": no_theta, "psi": no_psi}))
    return PitzerMixture(salts, names, z, stoich, tuple(pairs), tuple(like), tuple(notes))


__all__ = [
    "M_WATER", "MixingParameter", "PitzerMixture", "PitzerSalt", "PitzerParameterSet",
    "SaltIons", "TFunction", "debye_huckel_Aphi", "ion_charges", "ion_label",
    "ln_water_activity", "load_mixing_parameters", "load_pitzer_salts", "load_salt_ions",
    "osmotic_coefficient", "pitzer_mixture", "pitzer_parameters", "unsymmetrical_J",
    "validity",
]
