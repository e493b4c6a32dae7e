"""Pure-water properties: saturation line, liquid density, ice equilibria.

All functions take and return SI values (K, Pa, kg/m^3, J/mol) and broadcast
over numpy arrays.
"""
from solutions.water.density import water_density
from solutions.water.iapws_ice import (
    enthalpy_of_fusion,
    enthalpy_of_sublimation,
    enthalpy_of_vaporization_supercooled,
    ice_water_activity,
    ice_water_activity_thermo,
    ln_ice_water_activity,
    sublimation_pressure,
    supercooled_vapor_pressure,
)
from solutions.water.iapws_if97 import (
    liquid_density,
    saturation_pressure,
    saturation_temperature,
    specific_volume_liquid,
)

__all__ = [
    "enthalpy_of_fusion",
    "enthalpy_of_sublimation",
    "enthalpy_of_vaporization_supercooled",
    "ice_water_activity",
    "ice_water_activity_thermo",
    "liquid_density",
    "ln_ice_water_activity",
    "saturation_pressure",
    "saturation_temperature",
    "specific_volume_liquid",
    "sublimation_pressure",
    "supercooled_vapor_pressure",
    "water_density",
]
