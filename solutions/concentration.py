"""One concentration service: a component's concentration in any basis, from its mass and
amount and the solution's mass, solvent mass and volume (all SI, scalars or arrays).

Every place that states a concentration (the evaluation's component table, the target
solver, the dilution planner) calls :func:`in_basis`, so a basis means the same everywhere:

* mass fraction w = m / m_total [1]
* mass per volume = m / V [kg/m³ = g/L]
* molarity c = n / V [mol/m³]
* molality b = n / m_solvent [mol/kg]
* volume fraction φ = (m / ρ_pure) / V [1], ρ_pure the pure liquid's density

:func:`component_concentration` reads those amounts off one row of a resolved recipe.
"""
from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from .density import solvent_density
from .errors import InputError
from .units import Basis

if TYPE_CHECKING:
    from .recipe import ResolvedRecipe
    from .units import Amount

__all__ = ["in_basis", "CONCENTRATION_BASES", "component_concentration"]

#: the bases a concentration can be stated in
CONCENTRATION_BASES = (Basis.MASS_FRACTION, Basis.MASS_PER_VOLUME, Basis.MOLARITY,
                       Basis.MOLALITY, Basis.VOLUME_FRACTION)


def in_basis(basis: Basis, *, m, n, m_total, m_solvent, volume, rho_pure=None, name: str = ""):
    """Concentration in ``basis`` [SI unit of the basis, see :class:`~solutions.units.Basis`].

    m : mass of the component [kg]; n : its amount [mol]; m_total : solution mass [kg];
    m_solvent : solvent mass [kg]; volume : solution volume [m³]; rho_pure : the pure
    component's liquid density [kg/m³] (volume fraction only).

    >>> float(in_basis(Basis.MASS_PER_VOLUME, m=0.009, n=0.154, m_total=1.0046,
    ...                  m_solvent=0.9955, volume=1e-3))   # 9 g in 1 L: 9 g/L (definition)
    9.0
    """
    m, n = np.asarray(m, dtype=float), np.asarray(n, dtype=float)
    if basis is Basis.MASS_FRACTION:
        out = m / m_total
    elif basis is Basis.MASS_PER_VOLUME:
        out = m / volume
    elif basis is Basis.MOLARITY:
        out = n / volume
    elif basis is Basis.MOLALITY:
        out = n / m_solvent
    elif basis is Basis.VOLUME_FRACTION:
        if not rho_pure:
            raise InputError(f"% v/v of {name or 'this ingredient'} needs its liquid density")
        out = m / rho_pure / volume
    else:
        raise InputError(f"{basis.value} is not a concentration basis")
    return out[()] if np.ndim(out) == 0 else out


def component_concentration(res: ResolvedRecipe, row_id: int, amount: Amount, rho: float) -> float:
    """Concentration of recipe row ``row_id`` in ``amount.basis`` [SI of the basis], at solution
    density ``rho`` [kg/m³]; mass bases count the form as weighed (as the evaluate output), the
    solvent row counts all the solvent."""
    c = res.composition
    m_tot = float(c.m_total[0])
    if res.solvent_row is not None and res.solvent_row.row == row_id:
        ing = res.solvent_row.ingredient
        m = float(c.m_solvent[0])
        n = m / ing.M
        rho_i = solvent_density(c, res.T_prep)
    else:
        j = next(i for i, r in enumerate(res.solute_rows) if r.row == row_id)
        ing = res.solute_rows[j].ingredient
        m, n, rho_i = float(res.pure_kg[j]), float(c.n[0, j]), ing.rho_pure
    return float(in_basis(amount.basis, m=m, n=n, m_total=m_tot, m_solvent=float(c.m_solvent[0]),
                          volume=m_tot / rho, rho_pure=rho_i, name=ing.name))
