"""Write tests/reference/mixtures_pitzer_hmw84.csv: osmotic coefficients of salt mixtures at
25 °C computed by an outside implementation of the Pitzer equations, for tests that must
run where that implementation is not installed.

Reference: the open-source `pytzer` package (Humphreys & Schiller; version recorded in the
file), with the parameters of Harvie, Møller & Weare (1984) Geochim. Cosmochim. Acta 48,
723, Table 2, as pytzer transcribes them, Harvie's J(x) and Møller's (1988) A_phi. Cases:
NaCl + KCl, CaCl2, MgCl2, Na2SO4, each salt giving half the ionic strength, I = 0.5, 1, 2,
3 mol/kg. Needs pytzer (and jax); run: python tools/reference_mixtures_pytzer.py
"""
from __future__ import annotations

import csv
from pathlib import Path

OUT = Path(__file__).resolve().parents[1] / "tests" / "reference" / "mixtures_pitzer_hmw84.csv"
T25 = 298.15
PRESSURE_DBAR = 10.10325  # 1 atm in pytzer's unit
PAIRS = [("Na", "Cl"), ("K", "Cl"), ("Ca", "Cl"), ("Mg", "Cl"), ("Na", "SO4"), ("K", "SO4"),
         ("Mg", "SO4")]
THETA = [("K", "Na"), ("Ca", "Na"), ("Mg", "Na"), ("Ca", "K"), ("Ca", "Mg"), ("Cl", "SO4")]
PSI_CCA = [("K", "Na", "Cl"), ("Ca", "Na", "Cl"), ("Mg", "Na", "Cl"), ("Ca", "K", "Cl"),
           ("Ca", "Mg", "Cl"), ("K", "Na", "SO4"), ("Mg", "Na", "SO4")]
PSI_CAA = [("Na", "Cl", "SO4"), ("K", "Cl", "SO4"), ("Mg", "Cl", "SO4")]
# salt -> (cation, nu_cation, anion, nu_anion, ionic strength per mol/kg of salt)
SALTS = {"NaCl": ("Na", 1, "Cl", 1, 1.0), "KCl": ("K", 1, "Cl", 1, 1.0),
         "CaCl2": ("Ca", 1, "Cl", 2, 3.0), "MgCl2": ("Mg", 1, "Cl", 2, 3.0),
         "Na2SO4": ("Na", 2, "SO4", 1, 3.0)}
IONS = ["Na", "K", "Ca", "Mg", "Cl", "SO4"]


def hmw84_reference():
    """A function (ion molalities dict, T) -> phi by pytzer with HMW84 parameters."""
    import jax
    jax.config.update("jax_enable_x64", True)
    import pytzer as pz
    from pytzer import debyehueckel as dh, parameters as prm, unsymmetrical as unsym

    lib = pz.Library(name="HMW84-subset")
    lib.update_Aphi(dh.Aosm_M88)
    lib.update_func_J(unsym.Harvie)
    for c, a in PAIRS:
        lib.update_ca(c, a, getattr(prm, f"bC_{c}_{a}_HMW84"))
    for i, j in THETA:
        (lib.update_aa if i in ("Cl", "SO4") else lib.update_cc)(
            i, j, getattr(prm, f"theta_{i}_{j}_HMW84"))
    for i, j, k in PSI_CCA:
        lib.update_cca(i, j, k, getattr(prm, f"psi_{i}_{j}_{k}_HMW84"))
    for c, a1, a2 in PSI_CAA:
        lib.update_caa(c, a1, a2, getattr(prm, f"psi_{c}_{a1}_{a2}_HMW84"))
    model = pz.set_library(pz, lib)
    ions = lib.cations + lib.anions

    def phi(molalities: dict, T: float = T25) -> float:
        full = {i: 0.0 for i in ions}
        full.update(molalities)
        return float(model.osmotic_coefficient(full, T, PRESSURE_DBAR))

    return phi, pz.__version__


def cases():
    """(label, salt molalities dict, ionic strength) of the reference table."""
    out = []
    for other in ("KCl", "CaCl2", "MgCl2", "Na2SO4"):
        for I in (0.5, 1.0, 2.0, 3.0):
            out.append((f"NaCl+{other}", {"NaCl": I / 2, other: I / 2 / SALTS[other][4]}, I))
    return out


def ion_molalities(salt_b: dict) -> dict:
    m = {}
    for s, b in salt_b.items():
        c, nc, a, na, _ = SALTS[s]
        m[c] = m.get(c, 0.0) + nc * b
        m[a] = m.get(a, 0.0) + na * b
    return m


def rows():
    phi, version = hmw84_reference()
    src = (f"pytzer {version} (open-source Pitzer implementation) with Harvie, Møller & Weare "
           "(1984) Table 2 parameters as transcribed there, Harvie's J, Møller (1988) A_phi; "
           "written by tools/reference_mixtures_pytzer.py")
    for label, salt_b, I in cases():
        m = ion_molalities(salt_b)
        yield {"mixture": label, "I_mol_per_kg": I, "T_K": T25,
               **{f"b_{s}": f"{b:.12g}" for s, b in salt_b.items()},
               **{f"m_{i}": f"{m.get(i, 0.0):.12g}" for i in IONS},
               "phi": f"{phi(m):.10f}", "source": src}


def main() -> None:
    data = list(rows())
    cols = ["mixture", "I_mol_per_kg", "T_K", "b_NaCl", "b_KCl", "b_CaCl2", "b_MgCl2",
            "b_Na2SO4"] + [f"m_{i}" for i in IONS] + ["phi", "source"]
    with open(OUT, "w", newline="", encoding="utf-8") as fh:
        w = csv.DictWriter(fh, cols, restval="0", lineterminator="\n")
        w.writeheader()
        w.writerows(data)
    print(f"wrote {len(data)} rows to {OUT}")


if __name__ == "__main__":
    main()
