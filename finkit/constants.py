"""Physical constants and exact unit conversions used inside finkit (SI)."""

#: Stefan-Boltzmann constant [W m⁻² K⁻⁴] (CODATA 2018, exact since the 2019 SI redefinition).
STEFAN_BOLTZMANN = 5.670374419e-8
#: Standard acceleration of gravity [m s⁻²] (exact, CGPM 1901).
STANDARD_GRAVITY = 9.80665
#: Standard sea-level pressure [Pa] (ISO 2533).
STANDARD_PRESSURE = 101325.0
#: 0 °C in kelvin [K].
ZERO_CELSIUS = 273.15
#: One cubic foot per minute in m³ s⁻¹ (exact: 0.3048³ / 60).
CUBIC_FOOT_PER_MINUTE = 0.3048**3 / 60.0
