"""Gas in the formulation: Henry's law for carbonation, dissolved oxygen, sealed headspaces.

* :mod:`solutions.gas.iapws_henry` — Henry's constants of gases in water, IAPWS G7-04 (2004);
* :mod:`solutions.gas.salting_out` — salting-out by the other solutes (Weisenberger &
  Schumpe 1996 Sechenov model);
* :mod:`solutions.gas.dissolved` — the questions asked of a recipe: dissolved gas at a partial
  pressure, in air, or at a carbonation in volumes; a sealed container warmed or cooled.
"""
from .dissolved import (GasInputError, GasResult, dissolved_curve, dissolved_gas,
                        sealed_pressure_curve)
from .iapws_henry import GasRangeError, UnknownGasError, gases, get_gas, henry_constant
from .salting_out import salting_out

__all__ = ["GasInputError", "GasRangeError", "GasResult", "UnknownGasError", "dissolved_curve",
           "dissolved_gas", "gases", "get_gas", "henry_constant", "salting_out",
           "sealed_pressure_curve"]
