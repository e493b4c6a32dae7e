"""The composition: the one hand-off between what the chemist wrote and what physics needs.

A :class:`Composition` holds, in SI, the amount of every dissolved component and of the
solvent, with a leading axis for many compositions (``N`` rows; a single recipe is
``N = 1``). Masses are of the *dissolved* form: a hydrate's crystal water is already
counted in the solvent. Everything here is mass and amount only; anything that needs a
volume takes the solution density ``rho`` [kg/m³] as an argument.

Symbols: ``m`` mass [kg], ``n`` amount [mol], ``M`` molar mass [kg/mol], ``w`` mass
fraction, ``x`` mole fraction (formula units), ``b`` molality [mol/kg solvent], ``c``
molarity [mol/m³], ``rho`` density [kg/m³].
"""
from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .errors import InputError
from .ingredients import Ingredient

__all__ = ["Composition"]


@dataclass(frozen=True)
class Composition:
    """Amounts of ``k`` solutes in a solvent, for ``N`` compositions.

    solutes : the ingredients (as weighed); ``M_solute`` is what is dissolved
    n : amount of each solute [mol], shape (N, k)
    m_solvent : mass of solvent, crystal water included [kg], shape (N,)
    solvent : the solvent ingredient (water unless stated)
    """

    solutes: tuple[Ingredient, ...]
    n: np.ndarray
    m_solvent: np.ndarray
    solvent: Ingredient
    labels: tuple[str, ...] = field(default=())

    def __post_init__(self):
        n = np.atleast_2d(np.asarray(self.n, dtype=float))
        ms = np.atleast_1d(np.asarray(self.m_solvent, dtype=float))
        if n.shape[1] != len(self.solutes):
            raise InputError(f"n has {n.shape[1]} columns for {len(self.solutes)} solutes")
        if ms.shape != (n.shape[0],):
            raise InputError(f"m_solvent shape {ms.shape} does not match n rows {n.shape[0]}")
        object.__setattr__(self, "n", n)
        object.__setattr__(self, "m_solvent", ms)
        if not self.labels:
            object.__setattr__(self, "labels", tuple(s.name for s in self.solutes))

    # --- construction -------------------------------------------------------------
    @classmethod
    def from_molalities(cls, solutes, b, solvent, m_solvent=1.0) -> "Composition":
        """Composition from molalities ``b`` [mol/kg], shape (N, k), per ``m_solvent`` kg."""
        b = np.atleast_2d(np.asarray(b, dtype=float))
        ms = np.broadcast_to(np.asarray(m_solvent, dtype=float), (b.shape[0],)).copy()
        return cls(tuple(solutes), b * ms[:, None], ms, solvent)

    @classmethod
    def from_mass_fractions(cls, solutes, w, solvent, m_total=1.0) -> "Composition":
        """Composition from solute mass fractions ``w`` (dissolved basis), shape (N, k)."""
        w = np.atleast_2d(np.asarray(w, dtype=float))
        mt = np.broadcast_to(np.asarray(m_total, dtype=float), (w.shape[0],))
        M = np.array([s.M_solute for s in solutes])
        return cls(tuple(solutes), w * mt[:, None] / M, mt * (1.0 - w.sum(axis=1)), solvent)

    def scaled(self, factor) -> "Composition":
        """The same solution in ``factor`` times the quantity (intensive values unchanged)."""
        f = np.asarray(factor, dtype=float)
        return Composition(self.solutes, self.n * np.reshape(f, (-1, 1)),
                           self.m_solvent * f, self.solvent, self.labels)

    def concentrated(self, factor) -> "Composition":
        """Solutes times ``factor`` in the same solvent (0 = pure solvent, 2 = twice)."""
        f = np.asarray(factor, dtype=float).reshape(-1)
        n = self.n[:1] * f[:, None] if self.N == 1 else self.n * f[:, None]
        ms = np.broadcast_to(self.m_solvent[:1] if self.N == 1 else self.m_solvent, (n.shape[0],))
        return Composition(self.solutes, n, ms.copy(), self.solvent, self.labels)

    # --- sizes and basic arrays ---------------------------------------------------
    @property
    def N(self) -> int:
        return self.n.shape[0]

    @property
    def k(self) -> int:
        return self.n.shape[1]

    @property
    def M(self) -> np.ndarray:
        """Molar masses of the dissolved solutes [kg/mol], shape (k,)."""
        return np.array([s.M_solute for s in self.solutes], dtype=float)

    @property
    def ions(self) -> np.ndarray:
        """Ideal particles per formula unit, shape (k,)."""
        return np.array([s.ions for s in self.solutes], dtype=float)

    @property
    def m(self) -> np.ndarray:
        """Mass of each dissolved solute [kg], shape (N, k)."""
        return self.n * self.M

    @property
    def m_total(self) -> np.ndarray:
        """Mass of the whole solution [kg], shape (N,)."""
        return self.m.sum(axis=1) + self.m_solvent

    @property
    def n_solvent(self) -> np.ndarray:
        return self.m_solvent / self.solvent.M

    # --- concentration bases (mass and amount only) ------------------------------
    def mass_fraction(self) -> np.ndarray:
        """w_i = m_i / m_total [1], shape (N, k)."""
        return self.m / self.m_total[:, None]

    def solvent_mass_fraction(self) -> np.ndarray:
        return self.m_solvent / self.m_total

    def mole_fraction(self) -> np.ndarray:
        """x_i = n_i / (Σ n_j + n_solvent), solutes counted as formula units [1]."""
        total = self.n.sum(axis=1) + self.n_solvent
        return self.n / total[:, None]

    def solvent_mole_fraction(self) -> np.ndarray:
        return self.n_solvent / (self.n.sum(axis=1) + self.n_solvent)

    def molality(self) -> np.ndarray:
        """b_i = n_i / m_solvent [mol/kg], shape (N, k)."""
        return self.n / self.m_solvent[:, None]

    def particle_molality(self) -> np.ndarray:
        """Σ ν_i b_i, the ideal osmole count per kg of solvent [mol/kg], shape (N,)."""
        return self.molality() @ self.ions

    def ppm(self) -> np.ndarray:
        """Parts per million by mass (w/w) [1e-6], shape (N, k)."""
        return self.mass_fraction() * 1e6

    # --- bases that need the solution density -----------------------------------
    def volume(self, rho) -> np.ndarray:
        """Solution volume V = m_total / rho [m³]."""
        return self.m_total / np.asarray(rho, dtype=float)

    def molarity(self, rho) -> np.ndarray:
        """c_i = n_i / V [mol/m³], shape (N, k)."""
        return self.n / self.volume(rho)[:, None]

    def mass_per_volume(self, rho) -> np.ndarray:
        """ρ_i = m_i / V [kg/m³ = g/L], shape (N, k)."""
        return self.m / self.volume(rho)[:, None]

    def particle_molarity(self, rho) -> np.ndarray:
        """Σ ν_i c_i, the ideal osmole count per volume [mol/m³], shape (N,)."""
        return self.molarity(rho) @ self.ions
