"""Properties of the media finkit works with: dry air, the standard atmosphere, solids."""

from finkit.physics.properties.air import (
    AIR_TABLE_PRESSURE_RANGE,
    AIR_TABLE_TEMPERATURE_RANGE,
    AirProperties,
    air_properties,
    air_properties_coolprop,
    air_properties_sutherland,
    air_property_source,
)
from finkit.physics.properties.atmosphere import (
    ALTITUDE_RANGE,
    StandardAtmosphere,
    geopotential_altitude,
    pressure_at_altitude,
    standard_atmosphere,
)
from finkit.physics.properties.materials import (
    FINISHES,
    Material,
    get_material,
    list_materials,
    material_emissivity,
)

__all__ = [
    "AIR_TABLE_PRESSURE_RANGE",
    "AIR_TABLE_TEMPERATURE_RANGE",
    "ALTITUDE_RANGE",
    "FINISHES",
    "AirProperties",
    "Material",
    "StandardAtmosphere",
    "air_properties",
    "air_properties_coolprop",
    "air_properties_sutherland",
    "air_property_source",
    "geopotential_altitude",
    "get_material",
    "list_materials",
    "material_emissivity",
    "pressure_at_altitude",
    "standard_atmosphere",
]
