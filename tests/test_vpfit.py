"""Vapor-pressure fitting against IAPWS water and NIST Antoine coefficients, plus statistics,
flags, table reading and the command line."""
import csv
import json
from importlib import resources

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy import stats

from solutions.cli import main
from solutions.constants import R
from solutions.ingredients import M_WATER
from solutions.vpfit import (VaporDataError, antoine_fit, antoine_pressure, antoine_temperature,
                             clausius_clapeyron_fit, find_kink, fit_vapor_pressure,
                             read_vapor_pressure_table)
from solutions.water import saturation_pressure, sublimation_pressure

@pytest.fixture(scope="module")
def iapws():
    """The iapws package (IAPWS-95), an outside reference used only in tests. Only the checks
    that ask for it skip where it is missing; the recorded steam-table values always run."""
    return pytest.importorskip("iapws")


def iapws95_dH_dZ(iapws, T):
    """Enthalpy of vaporization [J/mol] and ΔZ = Z_vapor − Z_liquid of water on the saturation
    line at T [K], from IAPWS-95 (the ``iapws`` package, a reference used only in tests)."""
    liq, vap = iapws.IAPWS95(T=T, x=0), iapws.IAPWS95(T=T, x=1)
    M = 0.018015268  # kg/mol, the IAPWS-95 molar mass (R6-95(2018))
    dH = (vap.h - liq.h) * 1e3 * M
    P = liq.P * 1e6
    dZ = P * M / (R * T) * (1 / vap.rho - 1 / liq.rho)
    return dH, dZ


# ------------------------------------------------------------------ Clausius–Clapeyron
def test_cc_near_100C_exceeds_the_steam_table_enthalpy():
    """CC fit of IAPWS-IF97 saturation pressures over 95–105 °C. IAPWS-95 gives
    Δh_vap = 2256.4 kJ/kg at 100 °C (40.65 kJ/mol; IAPWS-95 steam tables, from memory); the CC
    fit returns ΔH/ΔZ, 0.5–1.0 kJ/mol higher (vapor non-ideality near 1 atm)."""
    T = np.linspace(368.15, 378.15, 11)
    cc = clausius_clapeyron_fit(T, saturation_pressure(T))
    assert 500.0 < cc.dH - 2256.4 * M_WATER * 1e3 < 1000.0
    assert cc.dH_ci95[0] < cc.dH < cc.dH_ci95[1]


def test_cc_near_100C_differs_from_iapws95_by_the_dZ_effect(iapws):
    """The same fit against IAPWS-95 (iapws package): its Δh_vap at 100 °C is the steam
    tables' 2256.4 kJ/kg within 0.02 kJ/mol, and CC's ΔH equals ΔH/ΔZ within 0.05 kJ/mol."""
    T = np.linspace(368.15, 378.15, 11)
    cc = clausius_clapeyron_fit(T, saturation_pressure(T))
    dH, dZ = iapws95_dH_dZ(iapws, 373.15)
    assert dH / 1e3 == pytest.approx(2256.4 * M_WATER, abs=0.02)
    assert cc.dH - dH > 500.0                       # over 0.5 kJ/mol near 100 °C
    assert cc.dH == pytest.approx(dH / dZ, abs=50.0)


def test_cc_near_25C_matches_the_steam_table_enthalpy():
    """At 20–30 °C vapor non-ideality is small: CC within 0.1 kJ/mol of IAPWS-95's
    Δh_vap = 2441.7 kJ/kg at 25 °C (43.99 kJ/mol; IAPWS-95 steam tables, from memory)."""
    T = np.linspace(293.15, 303.15, 11)
    cc = clausius_clapeyron_fit(T, saturation_pressure(T))
    assert cc.dH == pytest.approx(2441.7 * M_WATER * 1e3, abs=100.0)


def test_cc_near_25C_matches_iapws95(iapws):
    """The same fit against IAPWS-95 (iapws package): Δh_vap = 2441.7 kJ/kg within
    0.02 kJ/mol, CC within 0.1 kJ/mol of it and within 0.03 kJ/mol of ΔH/ΔZ."""
    T = np.linspace(293.15, 303.15, 11)
    cc = clausius_clapeyron_fit(T, saturation_pressure(T))
    dH, dZ = iapws95_dH_dZ(iapws, 298.15)
    assert dH / 1e3 == pytest.approx(2441.7 * M_WATER, abs=0.02)
    assert abs(cc.dH - dH) < 100.0
    assert cc.dH == pytest.approx(dH / dZ, abs=30.0)


def test_cc_statistics_match_scipy_linregress():
    """Standard error of the slope and the t-interval against scipy.stats.linregress."""
    rng = np.random.default_rng(7)
    T = np.linspace(290, 350, 9)
    P = saturation_pressure(T) * np.exp(rng.normal(0, 0.01, T.size))
    cc = clausius_clapeyron_fit(T, P)
    ref = stats.linregress(1 / T, np.log(P))
    assert cc.slope == pytest.approx(ref.slope, rel=1e-10)
    assert cc.slope_se == pytest.approx(ref.stderr, rel=1e-8)
    half = stats.t.ppf(0.975, T.size - 2) * ref.stderr * R
    assert cc.dH_ci95[1] - cc.dH == pytest.approx(half, rel=1e-8)


# ------------------------------------------------------------------------------ Antoine
def _nist_ethanol_row():
    path = resources.files("solutions.data") / "solvents.csv"
    with path.open(encoding="utf-8") as fh:
        rows = [r for r in csv.DictReader(fh) if r["solvent"] == "ethanol"]
    return {k: float(rows[0][k]) for k in ("A", "B", "C", "T_min_K", "T_max_K")}


def test_antoine_refit_recovers_nist_ethanol_coefficients():
    """Points generated from the NIST WebBook ethanol row (log10(p/bar) = 5.24677 −
    1598.673/(T/K − 46.424), 292.77–366.63 K) refit to the same curve in kPa/°C form:
    A = 5.24677 + 2, B = 1598.673, C = −46.424 + 273.15."""
    n = _nist_ethanol_row()
    assert (n["A"], n["B"], n["C"]) == (5.24677, 1598.673, -46.424)
    T = np.linspace(n["T_min_K"], n["T_max_K"], 15)
    P = 1e5 * 10 ** (n["A"] - n["B"] / (T + n["C"]))
    fit = antoine_fit(T[::-1], P[::-1])        # order does not matter
    assert fit.A == pytest.approx(7.24677, rel=1e-7)
    assert fit.B == pytest.approx(1598.673, rel=1e-7)
    assert fit.C == pytest.approx(226.726, rel=1e-7)
    r = fit_vapor_pressure(T, P)
    # ethanol normal boiling point 78.29 °C (CRC Handbook, from memory); NIST row gives 78.30
    assert r.to_dict()["normal_boiling_point_C"] == pytest.approx(78.29, abs=0.05)


def test_water_normal_boiling_point_from_if97_points():
    """IAPWS-IF97: the saturation temperature at 101.325 kPa is 373.124 K (99.974 °C)."""
    T = np.linspace(353.15, 378.15, 12)
    r = fit_vapor_pressure(T, saturation_pressure(T), at_pressure=50e3)
    d = r.to_dict()
    assert d["normal_boiling_point_C"] == pytest.approx(99.974, abs=0.01)
    # IAPWS-IF97 saturation temperature at 50 kPa, as the iapws package gives it: 354.467 K
    # (recorded here; test_if97_saturation_temperature_at_50kPa checks the record)
    assert d["boiling_point_at_pressure_C"] == pytest.approx(354.467 - 273.15, abs=0.02)


def test_if97_saturation_temperature_at_50kPa(iapws):
    """The recorded 354.467 K above is the iapws package's IF97 T_sat(50 kPa)."""
    assert iapws.IAPWS97(P=0.05, x=0).T == pytest.approx(354.467, abs=0.001)


def test_boiling_point_far_outside_data_is_not_given():
    T = np.linspace(283.15, 313.15, 8)
    d = fit_vapor_pressure(T, saturation_pressure(T)).to_dict()
    assert d["normal_boiling_point_C"] is None
    assert any(w["kind"] == "extrapolation" for w in d["warnings_detail"])


@settings(max_examples=60, deadline=None)
@given(A=st.floats(5.5, 8.0), B=st.floats(900.0, 2500.0), C=st.floats(150.0, 280.0),
       t=st.floats(-20.0, 150.0))
def test_antoine_round_trip(A, B, C, t):
    T = t + 273.15
    assert float(antoine_temperature(antoine_pressure(T, A, B, C), A, B, C)) == \
        pytest.approx(T, rel=1e-10)


@settings(max_examples=40, deadline=None)
@given(dH=st.floats(20e3, 60e3), T0=st.floats(250.0, 400.0), span=st.floats(5.0, 80.0))
def test_cc_recovers_exact_dH(dH, T0, span):
    """Points on an exact CC line give back its ΔH with a zero-width interval."""
    T = np.linspace(T0, T0 + span, 6)
    P = 1e5 * np.exp(-dH / R * (1 / T - 1 / T0))
    cc = clausius_clapeyron_fit(T, P)
    assert cc.dH == pytest.approx(dH, rel=1e-9)
    assert cc.dH_ci95[1] - cc.dH_ci95[0] < 1e-6 * dH


# ------------------------------------------------------------------------------- flags
def test_outlier_flagged_by_row():
    T = np.linspace(293.15, 363.15, 12)
    P = saturation_pressure(T)
    assert fit_vapor_pressure(T, P).outliers == []
    P[5] *= 1.05
    r = fit_vapor_pressure(T, P, rows=range(2, 14))
    assert r.outliers == [7]


def test_phase_change_and_ice_points_flagged():
    """Points over ice (IAPWS R14-08) below the triple point joined to points over liquid water:
    the kink and the ice rows are flagged; liquid-only data from 0 to 100 °C show no kink."""
    Ti = np.linspace(250.0, 272.0, 7)
    Tl = np.linspace(275.0, 300.0, 7)
    T = np.r_[Ti, Tl]
    P = np.r_[sublimation_pressure(Ti), saturation_pressure(Tl)]
    r = fit_vapor_pressure(T, P)
    assert r.kink_T is not None and 272.0 < r.kink_T < 275.0
    assert r.ice_rows == list(range(1, 8))
    TL = np.linspace(273.16, 373.15, 15)
    assert find_kink(TL, saturation_pressure(TL)) is None


def test_too_few_points():
    with pytest.raises(VaporDataError, match="at least 3 points"):
        fit_vapor_pressure([300.0, 310.0], [3e3, 6e3])
    r = fit_vapor_pressure([300.0, 310.0, 320.0], saturation_pressure(np.array([300., 310, 320])))
    assert r.antoine is None and r.normal_boiling_point is None
    assert any(c.kind == "too-few-points" for c in r.caveats)
    with pytest.raises(VaporDataError, match="at least 4 points"):
        antoine_fit([300.0, 310.0, 320.0], [1e3, 2e3, 3e3])


def test_repeated_and_unsorted_temperatures():
    T = np.array([330.0, 300.0, 315.0, 300.0, 345.0, 330.0, 360.0])
    P = saturation_pressure(T)
    a = fit_vapor_pressure(T, P)
    order = np.argsort(T)
    b = fit_vapor_pressure(T[order], P[order])
    assert a.cc.dH == pytest.approx(b.cc.dH, rel=1e-12)
    assert a.antoine.A == pytest.approx(b.antoine.A, rel=1e-6)


# ------------------------------------------------------------------------------ reading
def test_units_by_header(tmp_path):
    T_C = np.array([20.0, 40.0, 60.0, 80.0, 95.0])
    P = saturation_pressure(T_C + 273.15)
    a = tmp_path / "a.csv"
    a.write_text("temperature_C,pressure_kPa\n" + "".join(
        f"{t},{p / 1e3}\n" for t, p in zip(T_C, P)))
    b = tmp_path / "b.csv"
    b.write_text("temperature_F,pressure_mmHg,note\n" + "".join(
        f"{t * 1.8 + 32},{p / 133.322387415},x\n" for t, p in zip(T_C, P)))
    da, db = read_vapor_pressure_table(a), read_vapor_pressure_table(b)
    assert np.allclose(da.T, db.T, rtol=1e-12) and np.allclose(da.P, db.P, rtol=1e-12)
    assert da.rows == (2, 3, 4, 5, 6)
    g = tmp_path / "g.csv"
    g.write_text("temperature_K,pressure_barg\n" + "".join(
        f"{t + 273.15},{p / 1e5 - 1.01325}\n" for t, p in zip(T_C, P)))
    dg = read_vapor_pressure_table(g)
    assert dg.gauge and np.allclose(dg.P, da.P, rtol=1e-9)
    fit = fit_vapor_pressure(dg.T, dg.P, gauge=dg.gauge).to_dict()
    assert any(w["kind"] == "gauge" for w in fit["warnings_detail"])


@pytest.mark.parametrize("text, match", [
    ("temperature_C,temperature_K,pressure_kPa\n20,293.15,2.3\n", "mixed units"),
    ("temperature_C,pressure_kPa\n20,2.3\n40,abc\n", r"row 3, column 'pressure_kPa', value 'abc'"),
    ("temperature_C,pressure_kPa\n20,2.3\n40,-7\n", "row 3.*must be positive"),
    ("temp,pres\n20,2.3\n", "header needs a temperature column"),
    ("temperature_C,pressure_furlongs\n20,2.3\n", "unknown pressure unit"),
])
def test_bad_tables(tmp_path, text, match):
    p = tmp_path / "bad.csv"
    p.write_text(text)
    with pytest.raises(VaporDataError, match=match):
        read_vapor_pressure_table(p)


# ------------------------------------------------------------------------------- CLI
def test_cli_json(tmp_path, capsys):
    T_C = np.linspace(60, 100, 9)
    p = tmp_path / "w.csv"
    p.write_text("temperature_C,pressure_kPa\n" + "".join(
        f"{t:.2f},{saturation_pressure(t + 273.15) / 1e3:.5f}\n" for t in T_C))
    assert main(["fit-vapor-pressure", str(p), "--at-pressure", "80 kPa", "--json"]) == 0
    d = json.loads(capsys.readouterr().out)
    for k in ("dH_vap_kJ_per_mol", "dH_vap_stderr_kJ_per_mol", "dH_vap_ci95_kJ_per_mol",
              "antoine", "normal_boiling_point_C", "boiling_point_at_pressure_C", "points",
              "outliers", "warnings", "warnings_detail"):
        assert k in d, k
    assert set(d["antoine"]) >= {"A", "B", "C", "T_min_C", "T_max_C"}
    assert d["normal_boiling_point_C"] == pytest.approx(99.974, abs=0.02)
    assert main(["fit-vapor-pressure", str(p)]) == 0
    assert "ΔH_vap" in capsys.readouterr().out


def test_cli_bad_data_exit_2(tmp_path, capsys):
    p = tmp_path / "one.csv"
    p.write_text("temperature_C,pressure_kPa\n20,2.3\n")
    assert main(["fit-vapor-pressure", str(p)]) == 2
    assert "at least 3 points" in capsys.readouterr().err
    assert main(["fit-vapor-pressure", str(tmp_path / "missing.csv")]) == 2


# ------------------------------------------------------------------------- dashboard
def _vp_page():
    import streamlit as st

    from solutions.ui.vpfit import render_vpfit
    render_vpfit(st)


def test_dashboard_section_shows_the_library_numbers():
    """The example table's ΔH and normal boiling point on the page are the library's (AppTest)."""
    from streamlit.testing.v1 import AppTest

    from solutions.ui.vpfit import example_table, fit_table
    at = AppTest.from_function(_vp_page, default_timeout=60).run()
    assert not at.exception
    d = fit_table(example_table()).result
    shown = {m.label: m.value for m in at.metric}
    assert shown["ΔH_vap (Clausius–Clapeyron)"] == f"{d['dH_vap_kJ_per_mol']:.2f} kJ/mol"
    assert shown["Normal boiling point"] == f"{d['normal_boiling_point_C']:.2f} °C"


def test_dashboard_charts_and_errors():
    from solutions.ui.vpfit import antoine_chart, cc_chart, example_table, fit_table
    out = fit_table(example_table(), 50.0)
    cc_chart(out.result, out.points).to_dict()
    antoine_chart(out.result, out.points).to_dict()
    assert "at least 3 points" in fit_table("temperature_C,pressure_kPa\n20,2.3\n").error


# ------------------------------------------------------------------- no escaped exception
_cell = st.one_of(st.floats(-1e3, 1e4).map(repr), st.sampled_from(["nan", "inf", ""]),
                  st.text(alphabet="0123456789.,-eE abc°", max_size=8))


@settings(max_examples=150, deadline=None)
@given(cells=st.lists(st.tuples(_cell, _cell), min_size=0, max_size=8),
       header=st.sampled_from(["temperature_C,pressure_kPa", "temperature_K,pressure_mmHg",
                               "temperature_F,pressure_psi", "t,p"]))
def test_any_table_fits_or_says_why(cells, header):
    """Whatever the cells, reading and fitting either succeed with finite numbers or raise the
    package's own VaporDataError (a ValueError)."""
    text = header + "\n" + "".join(f'"{a}","{b}"\n' for a, b in cells)
    try:
        data = read_vapor_pressure_table(text)
        fit = fit_vapor_pressure(data.T, data.P, rows=data.rows)
    except VaporDataError:
        return
    d = fit.to_dict()
    assert np.isfinite(d["dH_vap_kJ_per_mol"])
    json.dumps(d, allow_nan=True)


def test_studentized_residuals_equal_leave_one_out_prediction_errors():
    """Externally studentized residuals by their definition (Belsley, Kuh & Welsch 1980): the
    error of predicting point i from a line fitted without it, over that prediction's standard
    error. Checked on the CC line with noisy IF97 points."""
    from solutions.vpfit import studentized_residuals
    rng = np.random.default_rng(3)
    T = np.linspace(290, 350, 8)
    P = saturation_pressure(T) * np.exp(rng.normal(0, 0.02, T.size))
    cc = clausius_clapeyron_fit(T, P)
    t = studentized_residuals(cc.residuals, cc.leverage, 2)
    x, y = 1 / T, np.log(P)
    for i in range(T.size):
        keep = np.arange(T.size) != i
        X = np.column_stack([np.ones(keep.sum()), x[keep]])
        coef, *_ = np.linalg.lstsq(X, y[keep], rcond=None)
        r = y[keep] - X @ coef
        s2 = r @ r / (keep.sum() - 2)
        xi = np.array([1.0, x[i]])
        se = np.sqrt(s2 * (1 + xi @ np.linalg.inv(X.T @ X) @ xi))
        assert t[i] == pytest.approx((y[i] - xi @ coef) / se, rel=1e-8)
