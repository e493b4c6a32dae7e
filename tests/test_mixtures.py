"""Multi-electrolyte mixtures against an outside standard: seawater (TEOS-10)."""
import numpy as np
import pytest

from solutions.colligative import freezing_point
from solutions.composition import Composition
from solutions.ingredients import default_library

LIB = default_library()

# Reference-Composition seawater of Millero et al. (2008) Deep-Sea Res. I 55, 50, Table 4,
# S_R = 35.16504 g/kg, as salts (mol per kg of seawater). Ion masses from memory (Na+ 10.78145,
# Mg2+ 1.28372, Ca2+ 0.41208, K+ 0.39910, Cl- 19.35271, SO4 2.71235, HCO3 0.10481, Br- 0.06728
# g/kg); bromide is counted as chloride, minor ions dropped; the salts add up to 35.08 g/kg.
SEAWATER = {"NaCl": 0.4105, "MgCl2": 0.052817, "Na2SO4": 0.028236, "CaCl2": 0.010282,
            "KCl": 0.010208, "sodium bicarbonate": 0.001718}


def seawater():
    ings = tuple(LIB.get(k) for k in SEAWATER)
    n = np.array([list(SEAWATER.values())])
    m_salts = float((n * np.array([i.M for i in ings])).sum())
    return Composition(ings, n, np.array([1.0 - m_salts]), LIB.get("water"))


def test_seawater_freezing_point_against_teos10():
    """TEOS-10 (IOC, SCOR & IAPSO 2010) via the `gsw` package, an outside reference:
    air-free seawater of S_A = 35.16504 g/kg freezes at −1.919 °C at the surface. Six salts
    combined by the Ross rule with Pitzer binaries land within 0.05 K; the dilute-ideal
    estimate is 0.2 K off. The published −1.919 °C is asserted here; the `gsw` check of that
    record is test_recorded_seawater_freezing_point_is_teos10 (skips without gsw)."""
    ref = -1.919
    Tf, _, _ = freezing_point(seawater())
    assert Tf[0] - 273.15 == pytest.approx(ref, abs=0.05)
    Tf_dilute, _, _ = freezing_point(seawater(), "dilute")
    assert abs(Tf_dilute[0] - 273.15 - ref) > 0.15


def test_recorded_seawater_freezing_point_is_teos10():
    """gsw.t_freezing(S_A = 35.16504 g/kg, 0 dbar, air-free) is the recorded −1.919 °C."""
    gsw = pytest.importorskip("gsw")
    assert float(gsw.t_freezing(35.16504, 0.0, 0.0)) == pytest.approx(-1.919, abs=0.001)
