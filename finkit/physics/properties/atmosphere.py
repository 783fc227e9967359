r"""Standard atmosphere: pressure, temperature and density versus geometric altitude.

The U.S. Standard Atmosphere 1976, which below 32 km is identical to the ISO 2533 standard
atmosphere (and ICAO's), in its two lowest layers: the troposphere (lapse rate 6.5 K/km up to
11 km geopotential) and the isothermal lower stratosphere (216.65 K, 11 to 20 km geopotential).

Use :func:`pressure_at_altitude` for the ambient pressure of a design case and combine it with
the case's own design ambient temperature; the standard temperature is a reference profile,
not a design value.

Why finkit has its own: ``fluids.ATMOSPHERE_1976`` (a test dependency, and the cross-check of
this module in tests/test_atmosphere.py) takes one altitude per object; this closed form takes
arrays. Measured on 10 000 altitudes: 0.65 ms here against 16.5 ms in a loop over fluids (about
25x), with the same pressure to 1e-15 relative; sweeps and Monte Carlo call it on arrays.
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from finkit.constants import STANDARD_GRAVITY, STANDARD_PRESSURE
from finkit.errors import InputError

__all__ = [
    "ALTITUDE_RANGE",
    "StandardAtmosphere",
    "geopotential_altitude",
    "pressure_at_altitude",
    "standard_atmosphere",
]

#: Geometric altitudes supported [m]: from -610 m (below the lowest dry land, the Dead Sea
#: shore at about -430 m; the same lower limit as ``fluids.ATMOSPHERE_1976``) up to 20 km
#: (the top of the isothermal layer is at 20 km geopotential = 20 063 m geometric; finkit stops
#: at 20 000 m, where the pressure, 5.53 kPa, is still inside the air-property table).
ALTITUDE_RANGE = (-610.0, 20000.0)

# U.S. Standard Atmosphere 1976 constants (confirmed against fluids.atmosphere and the
# Public Domain Aeronautical Software layer program, which use the same values).
_EARTH_RADIUS = 6356766.0  # r0 [m], for the geopotential conversion
_MOLAR_MASS = 0.0289644  # M0 [kg mol⁻¹]
_GAS_CONSTANT = 8.31432  # R* [J mol⁻¹ K⁻¹] (the 1976 value)
_SEA_LEVEL_TEMPERATURE = 288.15  # T0 [K]
_LAPSE_RATE = -0.0065  # dT/dH in the troposphere [K m⁻¹]
_TROPOPAUSE = 11000.0  # H of the tropopause [m geopotential]
_TROPOPAUSE_TEMPERATURE = _SEA_LEVEL_TEMPERATURE + _LAPSE_RATE * _TROPOPAUSE  # 216.65 K
_HYDROSTATIC = STANDARD_GRAVITY * _MOLAR_MASS / _GAS_CONSTANT  # g0 M0 / R* [K m⁻¹]
_TROPOPAUSE_PRESSURE = STANDARD_PRESSURE * (_TROPOPAUSE_TEMPERATURE / _SEA_LEVEL_TEMPERATURE) ** (
    -_HYDROSTATIC / _LAPSE_RATE
)  # 22632.06 Pa


class StandardAtmosphere(NamedTuple):
    """Standard-atmosphere state at a geometric altitude.

    Attributes
    ----------
    pressure : ndarray
        Absolute pressure [Pa].
    temperature : ndarray
        Standard temperature [K].
    density : ndarray
        Density ρ = p M0 / (R* T) [kg m⁻³].
    """

    pressure: np.ndarray
    temperature: np.ndarray
    density: np.ndarray


def _checked_altitude(altitude) -> np.ndarray:
    z = np.asarray(altitude, dtype=float)
    lo, hi = ALTITUDE_RANGE
    bad = ~((z >= lo) & (z <= hi))  # NaN counts as bad
    if np.any(bad):
        shown = z[bad]
        text = f"{shown.flat[0]:.6g}" if shown.size == 1 else f"{np.nanmin(shown):.6g} (and more)"
        raise InputError(
            f"altitude = {text} m is outside the supported range {lo:g} to {hi:g} m "
            "(U.S. Standard Atmosphere 1976 troposphere and lower stratosphere)"
        )
    return z


def geopotential_altitude(altitude):
    """Geopotential altitude H from geometric altitude z (U.S. Standard Atmosphere 1976).

    Parameters
    ----------
    altitude : float or array_like
        Geometric altitude z above mean sea level [m].

    Returns
    -------
    ndarray
        Geopotential altitude :math:`H = r_0 z / (r_0 + z)`, r0 = 6 356 766 m [m].
    """
    z = np.asarray(altitude, dtype=float)
    return (_EARTH_RADIUS * z / (_EARTH_RADIUS + z))[()]


def standard_atmosphere(altitude) -> StandardAtmosphere:
    r"""Pressure, temperature and density of the standard atmosphere at a geometric altitude.

    Parameters
    ----------
    altitude : float or array_like
        Geometric altitude above mean sea level, -610 to 20 000 m [m].

    Returns
    -------
    StandardAtmosphere
        Pressure [Pa], temperature [K] and density [kg m⁻³], each with the shape of
        ``altitude`` (NumPy scalars for a scalar).

    Raises
    ------
    InputError
        If an altitude lies outside -610 to 20 000 m or is not finite.

    Notes
    -----
    With the geopotential altitude :math:`H = r_0 z/(r_0 + z)`, :math:`r_0` = 6 356 766 m,
    and :math:`\beta = g_0 M_0 / R^*` (g0 = 9.80665 m s⁻², M0 = 0.0289644 kg mol⁻¹,
    R* = 8.31432 J mol⁻¹ K⁻¹):

    .. math::

        T = 288.15 - 0.0065\,H, \quad
        p = 101325 \left(\frac{T}{288.15}\right)^{\beta/0.0065}
        \qquad (H \le 11\ \mathrm{km})

        T = 216.65, \quad
        p = p_{11} \exp\left(-\frac{\beta (H - 11000)}{216.65}\right)
        \qquad (11 < H \le 20\ \mathrm{km})

    with :math:`p_{11}` = 22 632.06 Pa and the exponent :math:`\beta/0.0065` = 5.255877;
    :math:`\rho = p M_0/(R^* T)`. The common shortcut :math:`101325 (1 - 2.25577\times
    10^{-5} z)^{5.25588}` ignores the geopotential conversion (-0.05 % at 5 km).

    The constants and layer values were confirmed against ``fluids.ATMOSPHERE_1976`` (source
    code) and a public program computing the 1976 layer-boundary pressures; the results are
    checked in ``tests/test_atmosphere.py`` against published table values and fluids.

    References
    ----------
    .. [1] NOAA, NASA, USAF, "U.S. Standard Atmosphere, 1976", NOAA-S/T 76-1562, U.S.
       Government Printing Office, Washington D.C., 1976.
    .. [2] ISO 2533:1975, "Standard Atmosphere", International Organization for
       Standardization, 1975.

    Examples
    --------
    >>> round(float(standard_atmosphere(1000.0).pressure))
    89876
    """
    z = _checked_altitude(altitude)
    h = _EARTH_RADIUS * z / (_EARTH_RADIUS + z)
    in_troposphere = h <= _TROPOPAUSE
    h_tropo = np.minimum(h, _TROPOPAUSE)  # keep both branches finite before np.where
    t_tropo = _SEA_LEVEL_TEMPERATURE + _LAPSE_RATE * h_tropo
    p_tropo = STANDARD_PRESSURE * (t_tropo / _SEA_LEVEL_TEMPERATURE) ** (
        -_HYDROSTATIC / _LAPSE_RATE
    )
    p_strato = _TROPOPAUSE_PRESSURE * np.exp(
        -_HYDROSTATIC * (np.maximum(h, _TROPOPAUSE) - _TROPOPAUSE) / _TROPOPAUSE_TEMPERATURE
    )
    temperature = np.where(in_troposphere, t_tropo, _TROPOPAUSE_TEMPERATURE)
    pressure = np.where(in_troposphere, p_tropo, p_strato)
    density = pressure * _MOLAR_MASS / (_GAS_CONSTANT * temperature)
    return StandardAtmosphere(pressure[()], temperature[()], density[()])


def pressure_at_altitude(altitude):
    """Standard-atmosphere absolute pressure at a geometric altitude.

    Parameters
    ----------
    altitude : float or array_like
        Geometric altitude above mean sea level, -610 to 20 000 m [m].

    Returns
    -------
    ndarray
        Absolute pressure [Pa] (a NumPy scalar for a scalar altitude).

    Raises
    ------
    InputError
        If an altitude lies outside -610 to 20 000 m or is not finite.

    Notes
    -----
    The pressure of :func:`standard_atmosphere`; see there for the equations and sources.

    Examples
    --------
    >>> round(float(pressure_at_altitude(0.0)))
    101325
    """
    return standard_atmosphere(altitude).pressure
