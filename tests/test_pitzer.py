"""Tests of the single-salt Pitzer model (solutions.activity.pitzer)."""
from __future__ import annotations

import csv
from pathlib import Path

import numpy as np
import pytest
from scipy.optimize import brentq

from solutions.activity import pitzer
from solutions.activity.pitzer import (
    M_WATER,
    debye_huckel_Aphi,
    ln_water_activity,
    load_pitzer_salts,
    osmotic_coefficient,
    pitzer_parameters,
    validity,
)
from solutions.errors import Caveat, OutOfRangeError

ROOT = Path(__file__).resolve().parent.parent
CRC_FILE = ROOT / "solutions" / "data" / "tables" / "crc_aqueous_20C_electrolytes.csv"
PITZER_FILE = ROOT / "solutions" / "data" / "pitzer_binary.csv"


@pytest.fixture(scope="module")
def salts():
    return load_pitzer_salts()


def _phi_from_25C_parameters(nu_M, nu_X, z_M, z_X, beta0, beta1, cphi, b, aphi=0.392):
    """Pitzer's phi with constant parameters (alpha1 = 2, b = 1.2), as used by Pitzer & Mayorga."""
    nu = nu_M + nu_X
    sI = np.sqrt(0.5 * b * (nu_M * z_M**2 + nu_X * z_X**2))
    return (1 - abs(z_M * z_X) * aphi * sI / (1 + 1.2 * sI)
            + b * 2 * nu_M * nu_X / nu * (beta0 + beta1 * np.exp(-2 * sI))
            + b**2 * 2 * (nu_M * nu_X) ** 1.5 / nu * cphi)


# --------------------------------------------------------------------------- A_phi

def test_aphi_25C():
    """A_phi(25 °C) = 0.3915 kg^0.5 mol^-0.5 (Pitzer 1991, ch. 3, common value)."""
    assert abs(debye_huckel_Aphi(298.15) - 0.3915) <= 0.0005


def test_aphi_0C():
    """A_phi(0 °C) ≈ 0.3770 (value given in the project specification, attributed to the
    Pitzer (1991) tabulation; not re-checked). Archer & Wang-based fits give 0.3764."""
    assert abs(debye_huckel_Aphi(273.15) - 0.3770) <= 0.001


def test_aphi_is_the_crp94_chebyshev_series():
    """Clegg, Rard & Pitzer (1994) Table 11: A_phi = Σ a_k T_k(X), X = (2T − 607.3)/139,
    summed here by numpy's Chebyshev routine from the table's coefficients; the model sums
    the same polynomial in powers of X. Equal within 1e-15 over 234.15–353.15 K."""
    T = np.linspace(234.15, 353.15, 20001)
    series = np.polynomial.chebyshev.chebval((2 * T - 607.3) / 139, pitzer._APHI_CRP94)
    assert np.max(np.abs(debye_huckel_Aphi(T) - series)) < 1e-15


def test_each_piece_evaluated_only_where_it_applies(salts):
    """A_phi, binary parameters and mixing parameters on arrays that span their hand-over
    windows (both pieces evaluated, then selected or blended) equal, to the last bit, the
    same temperatures one at a time (only the piece that applies evaluated)."""
    T = np.concatenate([np.linspace(250.0, 390.0, 141), [273.15, 298.15, 353.15, 373.15]])
    one = np.array([debye_huckel_Aphi(t) for t in T])
    assert np.array_equal(debye_huckel_Aphi(T), one)
    for name in ("NaCl", "MgCl2", "Na2SO4"):
        arr = pitzer_parameters(salts[name], T)
        for p in ("beta0", "beta1", "beta2", "Cphi"):
            assert np.array_equal(arr[p], [pitzer_parameters(salts[name], t)[p] for t in T])
    for par in pitzer.load_mixing_parameters().values():
        assert np.array_equal(par(T), [par(t) for t in T])


def test_aphi_pieces_are_joined_smoothly():
    """No jump where the CRP94 fit hands over to Møller (1988), and held values outside."""
    T = np.linspace(340.0, 390.0, 5001)
    A = debye_huckel_Aphi(T)
    # slope is about 1.2e-3 K^-1, so steps of 0.01 K must stay near 1.2e-5
    assert np.max(np.abs(np.diff(A))) < 2e-5
    assert np.max(np.abs(np.diff(A, 2))) < 1e-7
    assert np.all(np.diff(A) > 0)
    assert debye_huckel_Aphi(220.0) == pytest.approx(debye_huckel_Aphi(234.15), abs=1e-12)
    with pytest.raises(OutOfRangeError):
        debye_huckel_Aphi(-1.0)


# ------------------------------------------------------------- 25 °C osmotic coefficients

@pytest.mark.parametrize("b, phi_ref", [(0.1, 0.932), (1.0, 0.936), (3.0, 1.045), (6.0, 1.271)])
def test_nacl_osmotic_coefficient_25C(salts, b, phi_ref):
    """NaCl, 25 °C: Robinson & Stokes (1959) Electrolyte Solutions, App. 8.10.
    Values FROM MEMORY, NOT VERIFIED against the table (the table could not be
    consulted); tolerance 0.005 accordingly."""
    assert abs(osmotic_coefficient(salts["NaCl"], b, 298.15) - phi_ref) <= 0.005


@pytest.mark.parametrize("b, phi_ref", [(1.0, 0.899), (4.0, 0.965)])
def test_kcl_osmotic_coefficient_25C(salts, b, phi_ref):
    """KCl, 25 °C: Robinson & Stokes (1959) App. 8.10. Values FROM MEMORY, NOT VERIFIED;
    tolerance 0.005."""
    assert abs(osmotic_coefficient(salts["KCl"], b, 298.15) - phi_ref) <= 0.005


# Pitzer & Mayorga (1973) Table I lists beta0, beta1, Cphi of 1-1 salts; Table VI lists
# (4/3)beta0, (4/3)beta1, (2^(5/2)/3)Cphi of 2-1 and 1-2 salts: CaCl2 0.4212, 2.152,
# -0.00064; MgCl2 0.4698, 2.242, 0.00979; Na2SO4 0.0261, 1.484, 0.00938.
PM73_TABLE = {
    # Table I (1-1 salts): beta0, beta1, Cphi as tabulated
    "NaCl": (1, 1, 1, -1, 0.0765, 0.2664, 0.00127),
    "KCl": (1, 1, 1, -1, 0.04835, 0.2122, -0.00084),
    "CaCl2": (1, 2, 2, -1, 0.4212 * 3 / 4, 2.152 * 3 / 4, -0.00064 * 3 / 2**2.5),
    "MgCl2": (1, 2, 2, -1, 0.4698 * 3 / 4, 2.242 * 3 / 4, 0.00979 * 3 / 2**2.5),
    "Na2SO4": (2, 1, 1, -2, 0.0261 * 3 / 4, 1.484 * 3 / 4, 0.00938 * 3 / 2**2.5),
}


@pytest.mark.parametrize("name", sorted(PM73_TABLE))
@pytest.mark.parametrize("b", [0.1, 0.5, 1.0, 2.0])
def test_25C_agrees_with_pitzer_mayorga_1973(salts, name, b):
    """At 25 °C the temperature functions reproduce phi from the 25 °C parameters of
    Pitzer & Mayorga (1973) Tables I and VI (values from a public transcription of the
    tables; fitted to the Robinson & Stokes data with sigma(phi) of a few 0.001): within
    0.003 for the 1-1 salts and 0.01 for the others, up to 2 mol/kg."""
    nu_M, nu_X, z_M, z_X, b0, b1, c = PM73_TABLE[name]
    ref = _phi_from_25C_parameters(nu_M, nu_X, z_M, z_X, b0, b1, c, b)
    tol = 0.003 if abs(z_M * z_X) == 1 else 0.01
    assert abs(osmotic_coefficient(salts[name], b, 298.15) - ref) <= tol


def test_saturated_nacl_water_activity_25C(salts):
    """Saturated NaCl (6.15 mol/kg) at 25 °C: a_w = 0.7528 (Greenspan 1977, J. Res. NBS
    81A, 89, Table 2; value as given in the project specification)."""
    aw = np.exp(ln_water_activity(salts["NaCl"], 6.15, 298.15))
    assert abs(aw - 0.7528) <= 0.003


def test_ln_water_activity_definition(salts):
    """ln a_w = -phi nu b M_w with M_w = 0.018015268 kg/mol."""
    s = salts["CaCl2"]
    b, T = 1.5, 268.15
    assert ln_water_activity(s, b, T) == pytest.approx(
        -osmotic_coefficient(s, b, T) * 3 * b * 0.018015268, rel=1e-14)
    assert M_WATER == 0.018015268


# ------------------------------------------------------- transcription cross-check

SMW90_MGCL2 = {  # Spencer, Møller & Weare (1990): a1, a2 (T), a6 (T^2), a9 (T^3), a3 (1/T), a4 (ln T)
    "beta0": (3.13852913e2, 2.61769099e-1, -2.46268460e-4, 1.15764787e-7, -5.53133381e3, -6.21616862e1),
    "beta1": (-3.18432525e4, -2.86710358e1, 2.78892838e-2, -1.3279705e-5, 5.24032958e5, 6.40770396e3),
    "Cphi": (5.9532e-2, -2.49949e-4, 2.41831e-7, 0.0, 0.0, 0.0),
}


@pytest.mark.parametrize("param, tol", [("beta0", 1e-4), ("beta1", 1e-3), ("Cphi", 1e-5)])
def test_low_set_reproduces_smw90_mgcl2(salts, param, tol):
    """The low-T MgCl2 coefficients (refit form) reproduce the original Spencer, Møller &
    Weare (1990) MgCl2 functions (coefficients from a public transcription of their table)
    over 213-298 K. Checks the form and the transcription of both."""
    T = np.linspace(213.15, 298.15, 35)
    a = SMW90_MGCL2[param]
    ref = a[0] + a[1] * T + a[2] * T**2 + a[3] * T**3 + a[4] / T + a[5] * np.log(T)
    low = salts["MgCl2"].sets[0]
    assert low.label == "low"
    assert np.max(np.abs(getattr(low, param)(T) - ref)) <= tol


# -------------------------------------------------------------- freezing points (CRC)

def _crc_rows(formula, max_mass_pct):
    assert CRC_FILE.exists(), f"project data file {CRC_FILE} is missing"
    out = []
    with open(CRC_FILE, newline="", encoding="utf-8") as fh:
        for r in csv.DictReader(fh):
            if r["formula"] != formula or not r["freezing_point_depression_K"].strip():
                continue
            if float(r["mass_pct"]) <= max_mass_pct:
                out.append((float(r["mass_pct"]), float(r["molality_mol_per_kg"]),
                            float(r["freezing_point_depression_K"])))
    assert out, f"no CRC freezing points for {formula} in {CRC_FILE.name}"
    return out


def _ice_activity():
    from solutions.water import ice_water_activity
    return ice_water_activity


def _freezing_depression(salt, b, ice_aw):
    """T_f(pure water) - T_f(solution), T_f from ln a_w(b, T) = ln a_w^ice(T).

    The ice activity used is 1 at the triple point, so pure water "freezes" at 273.16 K
    in this calculation; measuring the depression from there keeps the 0.01 K offset
    out of the comparison.
    """
    T0 = 273.16

    def f(T):
        return ln_water_activity(salt, b, T) - np.log(ice_aw(T))
    return T0 - brentq(f, 200.0, T0 - 1e-9, xtol=1e-8)


@pytest.mark.parametrize("formula, max_pct", [
    ("NaCl", 20.0), ("KCl", 15.0), ("CaCl2", 22.0), ("MgCl2", 100.0), ("Na2SO4", 100.0),
    ("NaHCO3", 100.0),
])
def test_freezing_point_depression_vs_crc(salts, formula, max_pct):
    """Freezing-point depressions from ln a_w(b, T) = ln a_w^ice(T) agree with CRC Handbook
    of Chemistry and Physics, 102nd ed. (2021), 'Concentrative Properties of Aqueous
    Solutions' (solutions/data/tables/crc_aqueous_20C_electrolytes.csv) within
    max(0.15 K, 3 %). CaCl2 is tested to 22 mass %: see the next test."""
    ice_aw = _ice_activity()
    salt = salts[formula]
    for pct, b, dT_crc in _crc_rows(formula, max_pct):
        dT = _freezing_depression(salt, b, ice_aw)
        tol = max(0.15, 0.03 * dT_crc)
        assert abs(dT - dT_crc) <= tol, (formula, pct, b, dT, dT_crc)


def test_cacl2_24pct_known_deviation(salts):
    """CaCl2 24 mass % (2.845 mol/kg): CRC 102nd ed. gives 25.3 K; the low-temperature
    set (Spencer, Møller & Weare 1990) gives about 1.1 K more (+4.5 %). Recorded here as a
    known limitation with a 6 % bound so that a regression beyond it is caught."""
    ice_aw = _ice_activity()
    rows = [r for r in _crc_rows("CaCl2", 24.0) if r[0] == 24.0]
    assert len(rows) == 1, "CRC CaCl2 24 % row missing"
    _, b, dT_crc = rows[0]
    assert dT_crc == 25.3
    dT = _freezing_depression(salts["CaCl2"], b, ice_aw)
    assert 0.0 < dT - dT_crc <= 0.06 * dT_crc


# ----------------------------------------------------------- continuity of the sets

@pytest.mark.parametrize("name", ["NaCl", "KCl", "CaCl2", "MgCl2", "Na2SO4", "K2SO4", "MgSO4"])
def test_phi_continuous_across_set_blend(salts, name):
    """phi has no jump where the low-T set hands over to the high-T set (273.15-298.15 K)."""
    s = salts[name]
    b = min(2.0, s.b_max)
    T = np.linspace(268.15, 303.15, 3501)
    phi = osmotic_coefficient(s, b, T)
    assert np.all(np.isfinite(phi))
    assert np.max(np.abs(np.diff(phi))) < 5e-4


def test_low_set_alone_below_blend_window(salts):
    """Below 273.15 K only the low-T set is used."""
    s = salts["NaCl"]
    low = s.sets[0]
    p = pitzer_parameters(s, 260.0)
    assert p["beta0"] == pytest.approx(float(low.beta0(260.0)), rel=0, abs=0)


# ------------------------------------------------------------------ vectorization

def test_vectorized_shapes(salts):
    """Arrays in, broadcast-shaped arrays out; scalars in, scalar out."""
    s = salts["NaCl"]
    b = np.array([0.1, 1.0, 3.0])[:, None]
    T = np.array([253.15, 273.15, 298.15, 373.15])
    phi = osmotic_coefficient(s, b, T)
    assert phi.shape == (3, 4)
    lnaw = ln_water_activity(s, b, T)
    assert lnaw.shape == (3, 4)
    for i in range(3):
        for j in range(4):
            assert phi[i, j] == pytest.approx(osmotic_coefficient(s, float(b[i, 0]), float(T[j])),
                                              rel=1e-13)
    assert np.ndim(osmotic_coefficient(s, 1.0, 298.15)) == 0
    assert debye_huckel_Aphi(np.array([273.15, 298.15])).shape == (2,)
    assert osmotic_coefficient(s, [0.0, 0.5], 298.15).shape == (2,)
    assert osmotic_coefficient(s, 0.0, 298.15) == 1.0


# ---------------------------------------------------------------------- validity

def test_validity_inside_is_empty(salts):
    assert validity(salts["NaCl"], np.array([0.5, 3.0]), np.array([260.0, 350.0])) == []


def test_validity_reports_out_of_range_without_raising(salts):
    s = salts["NaH2PO4"]
    cav = validity(s, [0.5, 8.0], 310.0)
    assert all(isinstance(c, Caveat) and c.kind == "model-range" and c.component == "NaH2PO4"
               for c in cav)
    quantities = sorted(c.extra["quantity"] for c in cav)
    assert quantities == ["molality", "temperature"]
    # the model still returns numbers there
    assert np.all(np.isfinite(osmotic_coefficient(s, [0.5, 8.0], 310.0)))


def test_validity_flags_held_aphi(salts):
    cav = validity(salts["CaCl2"], 4.0, 225.0)
    assert any("A_phi" in c.message for c in cav)


def test_negative_molality_raises(salts):
    with pytest.raises(OutOfRangeError):
        osmotic_coefficient(salts["NaCl"], -0.1, 298.15)
    with pytest.raises(OutOfRangeError):
        osmotic_coefficient(salts["NaCl"], 0.1, 0.0)


# ------------------------------------------------------------------------- data

def test_loader_keys_and_fields(salts):
    for key in ["NaCl", "KCl", "CaCl2", "MgCl2", "Na2SO4", "NaHCO3", "K2SO4", "MgSO4",
                "KH2PO4", "NaH2PO4", "Na2HPO4", "K2HPO4", "NaC2H3O2", "KC2H3O2", "KHCO2"]:
        s = salts[key]
        assert s.name == key
        assert s.b == 1.2
        assert s.nu_M * s.z_M + s.nu_X * s.z_X == 0
        assert s.T_min <= s.T_max and 200.0 <= s.T_min <= 298.15
        assert s.source
    assert salts["NaCl"].T_min == 213.15 and salts["NaCl"].T_max == 573.15
    assert load_pitzer_salts() is not load_pitzer_salts()  # callers get their own dict
    assert pitzer._load.cache_info().currsize >= 1


def test_every_row_has_a_source():
    with open(PITZER_FILE, newline="", encoding="utf-8") as fh:
        rows = list(csv.DictReader(fh))
    assert rows
    for r in rows:
        assert r["source"].strip(), r
        assert r["b_max_source"].strip(), r
    memory = {r["salt"] for r in rows if "from memory" in r["source"]}
    assert memory == set()


# =============================================================== mixtures of salts

from hypothesis import given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402
from scipy.integrate import quad  # noqa: E402

from solutions.activity.pitzer import (  # noqa: E402
    ion_charges,
    ion_label,
    load_mixing_parameters,
    load_salt_ions,
    pitzer_mixture,
    unsymmetrical_J,
)
from solutions.errors import SolutionsError  # noqa: E402

IONS_FILE = ROOT / "solutions" / "data" / "pitzer_salt_ions.csv"
MIXING_FILE = ROOT / "solutions" / "data" / "pitzer_mixing.csv"


def _J_by_quadrature(x):
    """Pitzer (1975) eq. 45 / Pitzer (1991) eq. B-13, integrated numerically."""
    def f(y):
        q = -(x / y) * np.exp(-y)
        return (1.0 + q + 0.5 * q * q - np.exp(q)) * y * y
    return quad(f, 0.0, np.inf, limit=400, epsabs=1e-13)[0] / x


@pytest.mark.parametrize("x", [0.01, 0.1, 0.5, 1.0, 2.0, 5.0, 20.0, 80.0])
def test_J_matches_its_defining_integral(x):
    """Harvie's Chebyshev series (Pitzer 1991, App. B, Table B-1) against the integral
    that defines J (Pitzer 1975 eq. 45), to 1e-9 (the series is good to about 3e-10), and
    J' against a central difference of J. Also the
    published limit J -> x/4 - 1 for large x (Pitzer 1975)."""
    J, Jp = unsymmetrical_J(x)
    assert J == pytest.approx(_J_by_quadrature(x), rel=1e-7, abs=1e-9)
    h = 1e-4 * x
    Jh = unsymmetrical_J(np.array([x - h, x + h]))[0]
    assert Jp == pytest.approx((Jh[1] - Jh[0]) / (2 * h), rel=1e-6)
    if x >= 80.0:
        assert J == pytest.approx(x / 4 - 1, rel=0.02)


def test_J_at_zero_and_vectorized():
    J, Jp = unsymmetrical_J(np.array([0.0, 1e-8, 1.0, 1.0 + 1e-12]))
    assert J[0] == 0.0 and Jp[0] == 0.0
    assert abs(J[1]) < 1e-9  # the series is good to about 3e-10
    assert J[2] == pytest.approx(J[3], abs=1e-10)  # the two series meet at x = 1


# ------------------------------------------------------------------ the ion table

NEW_SALT_KEYS = ["KHCO2", "NaHCO2", "KC2H3O2", "NaC2H3O2", "NaC3H5O3", "Na3C6H5O7", "K2SO4",
                 "(NH4)2SO4", "NH4Cl", "NaNO3", "Ca(NO3)2"]


def test_every_binary_salt_has_ions_with_matching_charges(salts):
    """Each salt of pitzer_binary.csv is in pitzer_salt_ions.csv with the same charges and
    stoichiometry, and every row is electrically neutral with a source."""
    ions = load_salt_ions()
    for name, s in salts.items():
        si = ions[name]
        assert (si.z_cation, si.z_anion, si.nu_cation, si.nu_anion) == (s.z_M, s.z_X, s.nu_M,
                                                                         s.nu_X)
    for key in NEW_SALT_KEYS:
        assert key in ions
    for si in ions.values():
        assert si.nu_cation * si.z_cation + si.nu_anion * si.z_anion == 0
        assert si.source.strip()
    assert ions["Na3C6H5O7"].anion == "citrate" and ions["Na3C6H5O7"].z_anion == -3
    assert ion_charges()["Ca"] == 2 and ion_charges()["SO4"] == -2


def test_ion_labels():
    assert ion_label("Na", 1) == "Na⁺"
    assert ion_label("SO4", -2) == "SO4²⁻"
    assert ion_label("citrate", -3) == "citrate³⁻"


def test_ion_table_rejects_unbalanced_row(tmp_path):
    bad = tmp_path / "ions.csv"
    bad.write_text("salt,cation,z_cation,nu_cation,anion,z_anion,nu_anion,source\n"
                   "CaCl,Ca,2,1,Cl,-1,1,test\n", encoding="utf-8")
    with pytest.raises(SolutionsError, match="CaCl is not electrically neutral"):
        pitzer._load_salt_ions(str(bad))


# -------------------------------------------------------------- the mixing table

def test_mixing_table_shape_and_sources():
    """Every θ/ψ row names ions of the ion table with the right signs, a range and a source."""
    charges = ion_charges()
    with open(MIXING_FILE, newline="", encoding="utf-8") as fh:
        rows = list(csv.DictReader(fh))
    assert len(rows) >= 70
    for r in rows:
        assert r["source"].strip()
        assert float(r["T_min_K"]) <= float(r["T_max_K"])
        zi, zj = charges[r["ion_1"]], charges[r["ion_2"]]
        assert zi * zj > 0
        if r["param"] == "psi":
            assert charges[r["ion_3"]] * zi < 0
    mix = load_mixing_parameters()
    for pair in [("Na", "K"), ("Na", "Ca"), ("Na", "Mg"), ("K", "Ca"), ("K", "Mg"),
                 ("Ca", "Mg"), ("Cl", "SO4"), ("Cl", "HCO3"), ("Cl", "CO3"), ("SO4", "HCO3")]:
        assert ("theta", frozenset(pair)) in mix


@pytest.mark.parametrize("kind, ions, T, value, tol", [
    # Harvie, Møller & Weare (1984) Table 2, 25 °C (high set at 25 °C)
    ("theta", ("Na", "Mg"), 298.15, 0.07, 1e-12),
    ("psi", ("Na", "Mg", "Cl"), 298.15, -0.012, 1e-12),
    ("psi", ("K", "Mg", "SO4"), 298.15, -0.048, 1e-12),
    ("theta", ("Cl", "HCO3"), 298.15, 0.03, 1e-12),
    # Møller (1988): theta(Na, Ca) = 0.05, psi(Na, Ca, Cl) = -0.003 from 25 °C up
    ("theta", ("Na", "Ca"), 320.0, 0.05, 1e-12),
    ("psi", ("Na", "Ca", "Cl"), 320.0, -0.003, 1e-12),
    # Greenberg & Møller (1989) eq. 3: theta(Na, K) = -0.0502312111 + 14.0213141/T
    ("theta", ("Na", "K"), 350.0, -0.0502312111 + 14.0213141 / 350.0, 1e-12),
    # Spencer, Møller & Weare (1990) low-T set (frezchem.dat): value a1 at 25 °C is
    # theta(Na, K) = -0.00948; below 0 °C the low set alone is used
    ("theta", ("Na", "K"), 263.15, -0.00948 + 612.415 * (1 / 263.15 - 1 / 298.15)
     + 3.02995 * np.log(263.15 / 298.15) - 0.00369038 * (263.15 - 298.15), 1e-12),
])
def test_mixing_parameter_values(kind, ions, T, value, tol):
    key = ("theta", frozenset(ions)) if kind == "theta" else ("psi", frozenset(ions[:2]),
                                                                ions[2])
    assert load_mixing_parameters()[key](T) == pytest.approx(value, abs=tol)


def test_mixing_parameters_continuous_across_blend():
    T = np.linspace(268.0, 303.0, 3501)
    for p in load_mixing_parameters().values():
        v = p(T)
        assert np.all(np.isfinite(v))
        assert np.max(np.abs(np.diff(v))) < 5e-4, p.ions


# -------------------------------------------------------- single salt ≡ binary model

@pytest.mark.parametrize("name", sorted(load_pitzer_salts()))
def test_single_salt_mixture_equals_binary(salts, name):
    """A mixture of one salt is that salt's binary model, to 1e-12."""
    s = salts[name]
    mix = pitzer_mixture([name])
    b = np.linspace(0.0, s.b_max, 13)
    T = np.linspace(250.0, 340.0, 13)
    m = mix.ion_molalities(b[:, None])
    assert np.max(np.abs(mix.osmotic_coefficient(m, T) - osmotic_coefficient(s, b, T))) <= 1e-12
    assert np.max(np.abs(mix.ln_water_activity(m, T) - ln_water_activity(s, b, T))) <= 1e-12
    assert mix.notes == ()


def test_composition_sums_give_the_same_water_activity():
    """ln a_w split into composition-only sums and the functions of T (what a freezing-point
    search evaluates at each step) equals the direct evaluation, to 1e-14, for a six-salt
    brine with unsymmetrical mixing terms over 250–350 K, at zero molality too."""
    mix = pitzer_mixture(["NaCl", "KCl", "CaCl2", "MgCl2", "Na2SO4", "NaHCO3"])
    rng = np.random.default_rng(4)
    b = rng.uniform(0.0, 1.0, (400, 6)) * (rng.random((400, 6)) < 0.7)
    b[0] = 0.0
    m = mix.ion_molalities(b)
    T = rng.uniform(250.0, 350.0, 400)
    c, sums = mix.ln_water_activity_sums(m)
    split = c + mix.ln_water_activity_at(T, *sums)
    assert np.max(np.abs(split - mix.ln_water_activity(m, T))) < 1e-14
    keep = rng.random(400) < 0.5   # any subset of the sums is that subset of compositions
    part = c[keep] + mix.ln_water_activity_at(T[keep], *(v[keep] for v in sums))
    assert np.max(np.abs(part - mix.ln_water_activity(m[keep], T[keep]))) < 1e-14


def test_zero_molality_gives_phi_one():
    mix = pitzer_mixture(["NaCl", "MgSO4"])
    assert mix.osmotic_coefficient(np.zeros((2, 4)), 298.15).tolist() == [1.0, 1.0]
    assert mix.ln_water_activity(np.zeros(4), 298.15).tolist() == [0.0]


def test_cross_pair_uses_its_own_binary(salts):
    """NaCl + MgSO4: the Na⁺-SO4²⁻ pair takes Na2SO4's parameters and Mg²⁺-Cl⁻ takes
    MgCl2's, though neither salt was named."""
    mix = pitzer_mixture(["NaCl", "MgSO4"])
    names = {(mix.ions[c], mix.ions[a]): s.name for c, a, s in mix.pairs}
    assert names == {("Na", "Cl"): "NaCl", ("Na", "SO4"): "Na2SO4",
                     ("Mg", "Cl"): "MgCl2", ("Mg", "SO4"): "MgSO4"}
    assert mix.notes == ()


def test_missing_pair_and_mixing_parameters_are_named():
    """NaCl + NH4Cl (no NH4Cl binary, no θ(Na⁺, NH4⁺)): B = C = 0 and θ = ψ = 0, each said."""
    mix = pitzer_mixture(["NaCl", "NH4Cl"])
    text = " | ".join(c.message for c in mix.notes)
    if "NH4Cl" not in load_pitzer_salts():
        assert "no Pitzer parameters for ion pair NH4⁺-Cl⁻:" in text
    assert "taken as zero: θ and ψ of Na⁺-NH4⁺ (" in text
    assert all(c.kind == "missing-parameters" for c in mix.notes)
    # a pair with θ but without some ψ names only the missing triplets
    text = " | ".join(c.message for c in pitzer_mixture(["NaCl", "KCl", "KH2PO4"]).notes)
    assert "ψ of Na⁺-K⁺-H2PO4⁻" in text and "θ and ψ of Cl⁻-H2PO4⁻" in text


def test_unknown_salt_raises():
    with pytest.raises(SolutionsError, match="no ions known for salt 'NaXyz'"):
        pitzer_mixture(["NaXyz"])


def test_mixture_temperature_caveats():
    """θ(Na⁺, Mg²⁺) is published for 25 °C (high set) and down to -60 °C (low set): at
    40 °C it is used unchanged and the caveat says so; at 10 °C nothing is said."""
    mix = pitzer_mixture(["NaCl", "MgCl2"])
    m = mix.ion_molalities(np.array([[1.0, 0.3]]))
    assert not mix.caveats(m, 283.15)
    msgs = [c.message for c in mix.caveats(m, 313.15)]
    assert any(t.startswith("θ(Na⁺, Mg²⁺): temperature 40 °C is outside") for t in msgs)


def test_unsymmetrical_term_matters():
    """Break the model on purpose: without the ^Eθ terms, NaCl + MgCl2 at I = 3 mol/kg
    moves by more than 0.005 in phi (so the tests comparing with an outside
    implementation would catch a missing or wrong J)."""
    mix = pitzer_mixture(["NaCl", "MgCl2"])
    m = mix.ion_molalities(np.array([[1.5, 0.5]]))
    phi = mix.osmotic_coefficient(m, 298.15)[0]
    orig = pitzer._xJp
    try:
        pitzer._xJp = lambda x: np.zeros_like(x)
        phi_broken = mix.osmotic_coefficient(m, 298.15)[0]
    finally:
        pitzer._xJp = orig
    assert abs(phi - phi_broken) > 0.005


SALT_NAMES = sorted(load_pitzer_salts())


@settings(max_examples=150, deadline=None)
@given(st.lists(st.sampled_from(SALT_NAMES), min_size=1, max_size=4, unique=True),
       st.lists(st.floats(0.0, 1.0), min_size=4, max_size=4),
       st.floats(258.15, 333.15))
def test_mixture_bounds_property(names, fractions, T):
    """Any mix of built-in salts, each within b_max / (number of salts), 258-333 K:
    phi finite and > 0, a_w in (0, 1], no exception."""
    salts = load_pitzer_salts()
    mix = pitzer_mixture(names)
    b = np.array([[f * salts[n].b_max / len(names) for n, f in zip(names, fractions)]])
    m = mix.ion_molalities(b)
    phi = mix.osmotic_coefficient(m, T)
    ln_a = mix.ln_water_activity(m, T)
    assert np.all(np.isfinite(phi)) and np.all(phi > 0)
    assert np.all(ln_a <= 0.0) and np.all(np.exp(ln_a) > 0.0)
    assert isinstance(mix.caveats(m, T), list)


def test_denormal_molalities_stay_finite():
    """Found by the property test: CaCl2 + K2CO3 with 5e-324 mol/kg of K2CO3 gave NaN
    (1/I overflowed in the unsymmetrical term); phi must be finite and ~1 there."""
    mix = pitzer_mixture(["CaCl2", "K2CO3"])
    for b in ([0.0, 5e-324], [5e-324, 5e-324], [1e-160, 1e-170]):
        phi = mix.osmotic_coefficient(mix.ion_molalities(np.array([b])), 259.0)
        assert np.isfinite(phi[0]) and phi[0] == pytest.approx(1.0, abs=1e-6)


@settings(max_examples=100, deadline=None)
@given(st.sampled_from(SALT_NAMES), st.floats(0.0, 1.0), st.floats(213.15, 373.15))
def test_single_salt_equals_binary_property(name, frac, T):
    """Any built-in salt, molality up to its b_max, -60 to 100 °C: mixture == binary."""
    s = load_pitzer_salts()[name]
    b = frac * s.b_max
    mix = pitzer_mixture([name])
    phi = mix.osmotic_coefficient(mix.ion_molalities(np.array([[b]])), T)[0]
    assert phi == pytest.approx(float(osmotic_coefficient(s, b, T)), abs=1e-12)


def test_mixture_phi_continuous_in_temperature():
    """A six-salt brine, -5 to 30 °C in 0.01 K steps: phi has no step where the low and
    high parameter sets hand over (largest step < 2e-5 per 0.01 K)."""
    mix = pitzer_mixture(["NaCl", "KCl", "CaCl2", "MgCl2", "Na2SO4", "NaHCO3"])
    T = np.linspace(268.15, 303.15, 3501)
    b = np.tile([[1.0, 0.2, 0.2, 0.3, 0.1, 0.01]], (T.size, 1))
    phi = mix.osmotic_coefficient(mix.ion_molalities(b), T)
    assert np.all(np.isfinite(phi))
    assert np.max(np.abs(np.diff(phi))) < 2e-5


def test_one_note_per_salt_used_outside_its_temperatures():
    """A coolant with dipotassium phosphate, whose Pitzer parameters are for 25 °C only,
    evaluated at 25 °C with its freezing and boiling points: one note names both
    temperatures it is used at, with the salt named as the recipe names it."""
    from solutions.evaluate import evaluate
    from solutions.recipe import read_recipe
    d = evaluate(read_recipe("recipes/chiller_coolant.csv")).to_dict()
    notes = [w for w in d["warnings"] if "K2HPO4" in w and "25 °C only" in w]
    assert len(notes) == 1, notes
    assert notes[0].startswith("Dipotassium phosphate (K2HPO4)")
    assert "the freezing point" in notes[0] and "the boiling point" in notes[0]


def test_a_pair_of_ions_from_two_salts_is_named_by_its_ions():
    """Potassium chloride and sodium acetate together bring K⁺ and acetate⁻: the note on
    the K⁺-acetate⁻ parameters names the pair by its ions (no ingredient of the recipe is
    potassium acetate), not by a bare formula."""
    from solutions.evaluate import evaluate
    from solutions.recipe import read_recipe
    d = evaluate(read_recipe("recipes/buffered_eye_rinse.csv")).to_dict()
    assert any(w.startswith("the K⁺-acetate⁻ pair (KC2H3O2)") for w in d["warnings"])
    assert not any(w.startswith("KC2H3O2") for w in d["warnings"])
