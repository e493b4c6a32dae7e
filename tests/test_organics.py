"""NRTL organic term: table, published freezing points over the whole fitted range,
bounds (hypothesis), withheld compositions, and checks that the tests can fail."""
from __future__ import annotations

import dataclasses

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from solutions.activity import organics
from solutions.activity.models import activity_terms
from solutions.activity.nrtl import ln_gamma_binary
from solutions.colligative import freezing_point
from solutions.composition import Composition
from solutions.ingredients import default_library
from solutions.water import water_density

LIB = default_library()
WATER = LIB.get("water")
TABLES = "solutions/data/tables/"


def _ingredient(key):
    """The library ingredient of a dissolved-solute key (its anhydrous form when the key is
    a generic name shared by several forms)."""
    try:
        return LIB.get(key)
    except Exception:
        return next(i for i in LIB if i.solute == key and not i.hydrate_water)


def binary(key, w):
    return Composition.from_mass_fractions((_ingredient(key),), np.asarray(w, float)[:, None],
                                           WATER)


def crc(solute, wmax):
    t = pd.read_csv(TABLES + "crc_aqueous_20C_nonelectrolytes.csv")
    return t[(t.solute == solute) & (t.mass_pct <= wmax)].dropna(
        subset=["freezing_point_depression_K"])


def tol(ref):
    return np.maximum(0.15, 0.03 * ref)


# --------------------------------------------------------------------- the table
def test_table_shape_and_sources():
    """Every row: the required columns, a source naming the fit and its data, α in (0, 1],
    ranges ordered, and the solute known to the ingredient library."""
    df = pd.read_csv("solutions/data/nrtl_water.csv")
    for col in ("solute", "a12", "b12_K", "a21", "b21_K", "alpha", "x2_max", "w_max",
                "T_min_K", "T_max_K", "data", "source"):
        assert col in df.columns
    assert df.source.str.contains("fit_nrtl").all()
    assert ((df.alpha >= -1.0) & (df.alpha <= 1.5) & (df.alpha != 0)).all()
    assert (df.T_min_K < df.T_max_K).all()
    assert ((df.x2_max > 0) & (df.x2_max <= 1)).all()
    assert set(df.solute) <= {i.solute for i in LIB}
    pairs = organics.load_nrtl_water()
    assert set(pairs) >= {"ethylene glycol", "propylene glycol", "glycerol", "ethanol",
                          "methanol", "2-propanol", "acetone"}


def test_table_error_names_row_and_column(tmp_path, monkeypatch):
    err = organics.NrtlDataError(5, "alpha", "2.0 outside (0, 1.5]")
    assert str(err) == "nrtl_water.csv row 5, column 'alpha': 2.0 outside (0, 1.5]"
    assert isinstance(err, ValueError)


def test_multicomponent_term_reduces_to_binary():
    """One organic: the multicomponent NRTL term equals the closed binary form
    (Renon & Prausnitz 1968), a consistency check of the τ/α matrices."""
    p = organics.load_nrtl_water()["ethanol"]
    x2 = np.linspace(0.01, 0.99, 9)
    T = 330.0
    lg = organics.ln_gammas([p], np.column_stack([1 - x2, x2]), T)
    t12, t21 = p.taus(T)
    l1, l2 = ln_gamma_binary(1 - x2, t12, t21, p.alpha)
    np.testing.assert_allclose(lg[:, 0], l1, rtol=1e-12, atol=1e-14)
    np.testing.assert_allclose(lg[:, 1], l2, rtol=1e-12, atol=1e-14)


def test_pure_component_limits():
    """γ → 1 for the pure component (both ends), every pair."""
    for p in organics.load_nrtl_water().values():
        lg = organics.ln_gammas([p], [[1.0, 0.0], [0.0, 1.0]], 280.0)
        assert abs(lg[0, 0]) < 1e-12 and abs(lg[1, 1]) < 1e-12


# --------------------------------------------------------------------- published freezing points
FREEZING = [
    # (CRC name, key, w max %)
    ("1,2-Ethanediol", "ethylene glycol", 60),
    ("Methanol", "methanol", 50),
    ("Glycerol", "glycerol", 40),
    ("2-Propanol", "2-propanol", 20),
    ("Acetone", "acetone", 10),
]


@pytest.mark.parametrize("name, key, wmax", FREEZING, ids=[f[1] for f in FREEZING])
def test_freezing_points_crc(name, key, wmax):
    """CRC Handbook 102nd ed. (2021) Concentrative Properties of Aqueous Solutions
    (tables/crc_aqueous_20C_nonelectrolytes.csv): freezing-point depressions within
    max(0.15 K, 3 %) from 0.5 % to the stated mass % (ethylene glycol to 60 %: −51.23 °C,
    methanol to 50 %: −54.5 °C)."""
    d = crc(name, wmax)
    ref = d.freezing_point_depression_K.to_numpy()
    _, dT, _ = freezing_point(binary(key, d.mass_pct / 100))
    err = np.abs(dT - ref)
    if key == "ethylene glycol":
        assert ref.max() == pytest.approx(51.23)
    if key == "methanol":
        assert ref.max() == pytest.approx(54.5)
    np.testing.assert_array_less(err, tol(ref) * FACTOR.get(key, 1.0))


# tolerance factors over max(0.15 K, 3 %), where a pair cannot meet it (none at present)
FACTOR: dict[str, float] = {}


def test_glycerol_to_60_percent_lange():
    """Lange's Handbook 15th ed. Table 5.13 p. 5.85 (glycerol by weight): 50 % → −22.0 °C,
    60 % → −33.6 °C, within 5 % (3 % was the target: Lange's column runs warmer than the
    CRC one where both exist, 10 %: −1.6 against −2.32 °C, and the fit meets both tables
    at once to 0.98 K). The old Norrish fit stopped at 40 % and gave −29.5 °C at 60 %."""
    Tf, _, _ = freezing_point(binary("glycerol", [0.50, 0.60]))
    np.testing.assert_allclose(Tf - 273.15, [-22.0, -33.6], rtol=0.05)


def test_propylene_glycol_lange_by_volume():
    """Lange's Handbook 15th ed. Table 5.13 p. 5.85 (propylene glycol by volume, with
    the specific gravity at 15.6 °C): 20 vol % → −6.7 °C, 40 % → −20.6 °C, 50 % → −33.3 °C;
    volume % turned into mass % as w = φ (ρ_PG/ρ_w) / SG with the pure densities at 20 °C.
    Within max(0.6 K, 5 %) (3 % was the target): the table gives 0.1 °C, its steps are
    irregular (1.7, 2.8, 2.2 K per 5 vol % around 20 %), the conversion adds ±0.3 % in w,
    and the fit to all ten rows misses by up to 1.55 K at 50 vol %."""
    ratio = LIB.get("propylene glycol").rho_pure / float(water_density(293.15))
    phi = np.array([0.20, 0.40, 0.50])
    sg = np.array([1.017, 1.032, 1.040])
    ref = np.array([-6.7, -20.6, -33.3])
    Tf, _, _ = freezing_point(binary("propylene glycol", phi * ratio / sg))
    np.testing.assert_array_less(np.abs(Tf - 273.15 - ref), np.maximum(0.6, 0.05 * -ref))


def test_ethanol_freezing_within_fitted_range():
    """CRC (as above), ethanol 0.5–10 % w/w (the freezing points used in the fit, with the
    whole isobaric VLE table): within max(0.15 K, 3 %)."""
    d = crc("Ethanol", 10)
    ref = d.freezing_point_depression_K.to_numpy()
    _, dT, _ = freezing_point(binary("ethanol", d.mass_pct / 100))
    np.testing.assert_array_less(np.abs(dT - ref), tol(ref))


def test_ethanol_freezing_beyond_fit_is_flagged():
    """Above 10 % w/w the ethanol freezing points were not fitted (see tools/fit_nrtl.py);
    at 40 % (CRC: −29.26 °C) the result carries a model-range caveat for the temperature."""
    Tf, _, cav = freezing_point(binary("ethanol", [0.40]))
    assert any(c.kind in ("model-range", "beyond-data") and "Ethanol" in c.message for c in cav)


# --------------------------------------------------------------------- the tests can fail
def test_raoult_fails_the_published_checks():
    """Breaking the model on purpose: with every τ = 0 (ideal solution) the ethylene
    glycol CRC check above fails by far (CRC 60 % → ΔT 51.23 K)."""
    d = crc("1,2-Ethanediol", 60)
    ref = d.freezing_point_depression_K.to_numpy()
    comp = binary("ethylene glycol", d.mass_pct / 100)
    terms = activity_terms(comp)
    p = terms.params[0]
    broken = dataclasses.replace(terms, params=(dataclasses.replace(p, a12=0.0, a21=0.0),))
    _, dT, _ = freezing_point(comp, terms=broken)
    assert np.max(np.abs(dT - ref) / tol(ref)) > 3.0


# --------------------------------------------------------------------- bounds (hypothesis)
PAIRS = organics.load_nrtl_water()
# composition sweep limit (no pure organic: a_w = 0 there) and the freezing sweep limit:
# the fitted freezing points (ethanol: 10 % w/w, its VLE covers the rest at 78–100 °C)
LIMITS = {k: min(p.w_max, 0.99) for k, p in PAIRS.items()}
FREEZE_LIMITS = {k: (0.10 if "vle" in p.data else p.w_max) for k, p in PAIRS.items()}
# sucrose's row reaches 85 % w/w through its water-activity correlation, but its freezing
# points only to 42 % (CRC): colder than that data the freezing point is withheld
FREEZE_LIMITS["sucrose"] = 0.42


@settings(max_examples=25, deadline=None)
@given(key=st.sampled_from(sorted(LIMITS)), n=st.integers(5, 40))
def test_sweep_bounds_and_monotone_freezing(key, n):
    """From 0 to each solute's data limit: a_w in (0, 1] from −23 to 100 °C, and the
    freezing point falls with concentration up to the fitted freezing points."""
    w = np.linspace(0.0, LIMITS[key], n)
    comp = binary(key, w)
    terms = activity_terms(comp)
    bs = terms.molalities(comp)
    for T in (250.0, 273.15, 298.15, 373.15):
        a = np.exp(terms.ln_a(bs, T))
        assert np.all((a > 0) & (a <= 1.0 + 1e-12))
    Tf, _, _ = freezing_point(binary(key, np.linspace(0.0, FREEZE_LIMITS[key], n)))
    assert np.all(np.isfinite(Tf))
    assert np.all(np.diff(Tf) <= 1e-9)


@settings(max_examples=25, deadline=None)
@given(w1=st.floats(0.0, 0.3), w2=st.floats(0.0, 0.3))
def test_glycol_mixture_bounds(w1, w2):
    """Ethylene + propylene glycol mixtures (organic–organic τ = 0): a_w in (0, 1], and a
    caveat names the missing organic–organic parameters when both are present."""
    comp = Composition.from_mass_fractions(
        (LIB.get("ethylene glycol"), LIB.get("propylene glycol")), np.array([[w1, w2]]), WATER)
    terms = activity_terms(comp)
    bs = terms.molalities(comp)
    a = np.exp(terms.ln_a(bs, 260.0))
    assert 0 < a[0] <= 1.0 + 1e-12
    if w1 > 0 and w2 > 0:
        assert any("no published NRTL parameters between" in c.message
                   for c in terms.caveats(bs, 260.0))


# --------------------------------------------------------------------- withheld
def test_withheld_beyond_data():
    """Propylene glycol's data end at 49.9 % w/w: 50 % is kept, 70 % withheld with a
    "beyond-data" caveat naming the component and the limit."""
    comp = binary("propylene glycol", [0.50, 0.70])
    terms = activity_terms(comp)
    mask, cav = terms.withheld(terms.molalities(comp), 298.15)
    assert mask.tolist() == [False, True]
    assert cav and cav[0].kind == "beyond-data"
    assert "Propylene glycol" in cav[0].message and "49.9 % w/w" in cav[0].message


def test_withheld_norrish_solute(monkeypatch):
    """A solute without NRTL parameters keeps its Norrish fit, withheld beyond 1.1 × its
    fitted molality (sucrose's Norrish fit: 2.116 mol/kg). Every built-in organic has NRTL
    parameters now, so sucrose's are hidden here to reach the fallback."""
    rows = {k: v for k, v in organics.load_nrtl_water().items() if k != "sucrose"}
    monkeypatch.setattr(organics, "load_nrtl_water", lambda: rows)
    comp = Composition.from_molalities((LIB.get("sucrose"),), np.array([[2.0], [2.5]]), WATER)
    terms = activity_terms(comp)
    mask, cav = terms.withheld(terms.molalities(comp), 298.15)
    assert terms.kinds[0] == "norrish"
    assert mask.tolist() == [False, True]
    assert cav[0].kind == "beyond-data"


def test_combining_rule_caveat():
    """Salt + organic: the combining rule is stated."""
    comp = Composition.from_molalities((LIB.get("NaCl"), LIB.get("glycerol")),
                                       np.array([[0.5, 1.0]]), WATER)
    terms = activity_terms(comp)
    assert any(c.kind == "combining-rule" and "Ross" in c.message for c in terms.notes)


def test_closed_water_form_equals_multicomponent_nrtl():
    """ln a_w of water with one to five organics in the closed form (τ = 0 between organics)
    equals ln x_w + ln γ_w of the general multicomponent NRTL expression (Renon & Prausnitz
    1968; nrtl.ln_gamma) to 1e-12 over 240–370 K; any subset of the composition sums gives
    that subset of compositions."""
    pairs_all = organics.load_nrtl_water()
    keys = sorted(pairs_all)
    rng = np.random.default_rng(6)
    for k in range(1, 6):
        pairs = [pairs_all[x] for x in rng.choice(keys, size=k, replace=False)]
        bs = [rng.uniform(0.0, 15.0, 300) * (rng.random(300) < 0.7) for _ in pairs]
        T = rng.uniform(240.0, 370.0, 300)
        x = organics.mole_fractions(bs)
        ref = np.log(x[:, 0]) + organics.ln_gammas(pairs, x, T)[:, 0]
        np.testing.assert_allclose(organics.ln_water_activity(pairs, bs, T), ref, rtol=1e-12,
                                   atol=1e-14)
        c, sums = organics.ln_water_activity_sums(pairs, bs)
        keep = rng.random(300) < 0.5
        part = c[keep] + organics.ln_water_activity_at(pairs, T[keep], *(v[keep] for v in sums))
        np.testing.assert_allclose(part, ref[keep], rtol=1e-12, atol=1e-14)

def test_one_range_note_per_ingredient_not_per_temperature():
    """A syrup evaluated at 25 °C, with its freezing and boiling points: glucose's data
    (freezing points only, −5 to 0 °C) are used at all three temperatures; the warnings say
    so once, naming the three, instead of three times."""
    from solutions.evaluate import evaluate
    from solutions.recipe import read_recipe
    d = evaluate(read_recipe("ingredient,amount,unit\nsucrose,550,g\n"
                             "glucose monohydrate,120,g\nwater,330,g\n")).to_dict()
    notes = [w for w in d["warnings"] if w.startswith("activity of Glucose monohydrate")]
    assert len(notes) == 1, notes
    assert "the solution's temperature" in notes[0] and "the freezing point" in notes[0] \
        and "the boiling point" in notes[0]
    assert "-0 °C" not in " ".join(d["warnings"])
