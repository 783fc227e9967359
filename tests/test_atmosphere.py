"""Tests of finkit.physics.properties.atmosphere against U.S. Standard Atmosphere 1976 values."""

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from finkit.errors import InputError
from finkit.physics.properties.atmosphere import (
    ALTITUDE_RANGE,
    geopotential_altitude,
    pressure_at_altitude,
    standard_atmosphere,
)

# Source: U.S. Standard Atmosphere 1976 (NOAA-S/T 76-1562), Table I, geometric altitude in
# metres: z [m], p [Pa], T [K], rho [kg/m3] as printed (5 significant figures).
# From memory: these table values were recalled, not looked up; the fluids cross-check below
# is the independent confirmation.
USSA_1976_TABLE_I = [
    (0.0, 101325.0, 288.150, 1.2250),
    (1000.0, 89876.0, 281.651, 1.1117),
    (2000.0, 79501.0, 275.154, 1.0066),
    (3000.0, 70121.0, 268.659, 0.90925),
    (5000.0, 54048.0, 255.676, 0.73643),
    (11000.0, 22700.0, 216.774, 0.36480),
    (15000.0, 12111.0, 216.650, 0.19476),
    (20000.0, 5529.3, 216.650, 0.088910),
]


@pytest.mark.published
@pytest.mark.parametrize(("altitude", "pressure", "temperature", "density"), USSA_1976_TABLE_I)
def test_us_standard_atmosphere_1976_table(altitude, pressure, temperature, density):
    # Tolerance from 5 printed significant figures: rtol 1e-4 (p, rho); T printed to 1 mK.
    state = standard_atmosphere(altitude)
    np.testing.assert_allclose(state.pressure, pressure, rtol=1e-4)
    np.testing.assert_allclose(state.temperature, temperature, atol=1e-3)
    np.testing.assert_allclose(state.density, density, rtol=1e-4)
    np.testing.assert_allclose(pressure_at_altitude(altitude), pressure, rtol=1e-4)


@pytest.mark.published
def test_against_fluids_atmosphere_1976():
    # Cross-check: fluids 1.3 ATMOSPHERE_1976 (P, T, rho) over the whole supported range.
    from fluids import ATMOSPHERE_1976

    altitude = np.linspace(*ALTITUDE_RANGE, 97)
    state = standard_atmosphere(altitude)
    reference = [ATMOSPHERE_1976(float(z)) for z in altitude]
    np.testing.assert_allclose(state.pressure, [r.P for r in reference], rtol=1e-9)
    np.testing.assert_allclose(state.temperature, [r.T for r in reference], rtol=1e-9)
    np.testing.assert_allclose(state.density, [r.rho for r in reference], rtol=1e-9)
    np.testing.assert_allclose(geopotential_altitude(altitude), [r.H for r in reference])


@pytest.mark.published
def test_layer_boundary_values():
    # Source: U.S. Standard Atmosphere 1976, layer table: at H = 11 km geopotential
    # T = 216.65 K and p = 22632 Pa (22632.06 computed with the 1976 constants).
    z_tropopause = 11000.0 * 6356766.0 / (6356766.0 - 11000.0)  # geometric altitude of H = 11 km
    state = standard_atmosphere(z_tropopause)
    np.testing.assert_allclose(state.temperature, 216.65, atol=1e-9)
    np.testing.assert_allclose(state.pressure, 22632.0, rtol=5e-5)
    # Continuity across the boundary (both layer formulas meet).
    below, above = standard_atmosphere([z_tropopause - 1e-3, z_tropopause + 1e-3]).pressure
    assert abs(above / below - 1.0) < 1e-6


@pytest.mark.identity
def test_geopotential_shortcut_difference():
    # Source: finkit methods reference, section k: the shortcut 101325 (1 - 2.25577e-5 z)^5.25588
    # ignores the geopotential conversion and is 0.05 % low at 5 km.
    z = 5000.0
    shortcut = 101325.0 * (1.0 - 2.25577e-5 * z) ** 5.25588
    assert shortcut / pressure_at_altitude(z) - 1.0 == pytest.approx(-5.3e-4, abs=0.5e-4)


@pytest.mark.identity
@settings(max_examples=60, deadline=None)
@given(
    st.floats(min_value=ALTITUDE_RANGE[0], max_value=ALTITUDE_RANGE[1] - 1.0),
    st.floats(min_value=0.5, max_value=100.0),
)
def test_pressure_falls_with_altitude_and_obeys_hydrostatics(z, dz):
    # dp/dz = -rho g(z), g(z) = g0 (r0/(r0+z))^2 (the 1976 gravity law): over a step of at
    # most 100 m the midpoint estimate is accurate to (dz/H_scale)^2/12 < 3e-5.
    z2 = min(z + dz, ALTITUDE_RANGE[1])
    if z2 - z < 0.5:
        return
    p1, p2 = standard_atmosphere([z, z2]).pressure
    assert p2 < p1
    zm = 0.5 * (z + z2)
    g = 9.80665 * (6356766.0 / (6356766.0 + zm)) ** 2
    rho_mean = (p1 - p2) / (g * (z2 - z))
    rho_mid = standard_atmosphere(zm).density
    assert rho_mean == pytest.approx(float(rho_mid), rel=2e-4)


@pytest.mark.shape
def test_scalar_and_array_agree():
    altitude = np.array([[0.0, 1500.0], [9000.0, 18000.0]])
    state = standard_atmosphere(altitude)
    assert state.pressure.shape == (2, 2)
    assert np.ndim(standard_atmosphere(1500.0).pressure) == 0
    assert float(state.pressure[0, 1]) == float(standard_atmosphere(1500.0).pressure)


@pytest.mark.parametrize("altitude", [-1000.0, 20001.0, np.nan, [0.0, 25000.0]])
def test_outside_range_raises(altitude):
    with pytest.raises(InputError) as info:
        standard_atmosphere(altitude)
    message = str(info.value)
    assert message.startswith("altitude = ")
    assert "-610 to 20000 m" in message
    with pytest.raises(InputError):
        pressure_at_altitude(altitude)
