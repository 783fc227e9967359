"""Properties of dry air versus temperature and absolute pressure.

Three ways to get the same seven properties (an :class:`AirProperties` tuple):

- :func:`air_properties` -- the default: CoolProp values from a table shipped with finkit,
  interpolated (fast, vectorised, error vs direct CoolProp below 0.001 %).
- :func:`air_properties_coolprop` -- direct CoolProp calls (the reference; slow).
- :func:`air_properties_sutherland` -- closed forms (ideal gas, Sutherland laws, a c_p fit);
  no dependency, for cross-checks and hand calculations (errors of about 1-3 %).

Humid air is out of scope: every function here is for dry air.
"""

from __future__ import annotations

import functools
from typing import NamedTuple

import numpy as np

from finkit.errors import InputError, PropertyRangeError
from finkit.interpolation import uniform_spline_coefficients
from finkit.validity import ValidityRange

__all__ = [
    "AIR_TABLE_FILE",
    "AIR_TABLE_PRESSURE_RANGE",
    "AIR_TABLE_TEMPERATURE_RANGE",
    "AIR_SPECIFIC_GAS_CONSTANT",
    "SUTHERLAND_AIR_VALIDITY",
    "AirGrid",
    "AirProperties",
    "air_properties",
    "air_properties_coolprop",
    "air_properties_sutherland",
    "air_property_source",
    "tabulate_air_coolprop",
]

#: Temperatures covered by :func:`air_properties` (inclusive) [K].
AIR_TABLE_TEMPERATURE_RANGE = (200.0, 500.0)
#: Absolute pressures covered by :func:`air_properties` (inclusive) [Pa]. The low end covers
#: the standard atmosphere up to 20 km (5.47 kPa).
AIR_TABLE_PRESSURE_RANGE = (5.0e3, 120.0e3)
#: Specific gas constant of dry air used by the closed forms [J kg⁻¹ K⁻¹] (docs/methods.md k;
#: R* / M = 8.31451 / 0.02896546 = 287.049 in CoolProp).
AIR_SPECIFIC_GAS_CONSTANT = 287.05

#: Range over which the closed forms of :func:`air_properties_sutherland` were checked against
#: CoolProp to the accuracy stated in its docstring (the c_p fit is from that range).
SUTHERLAND_AIR_VALIDITY = ValidityRange(
    method="closed-form air properties (ideal gas, Sutherland, c_p fit)",
    quantity="T",
    low=273.15,
    high=423.15,
    source="c_p fitted to CoolProp at 1 atm, 273-423 K (finkit methods reference, section k)",
)

# Table grid: 5 K steps with one node of margin beyond each end of the public range, and
# pressure nodes spanning the public range with margin. Properties are fitted as
# f(T, p) = a(T) + b(T) p  (least squares over the pressure nodes at each temperature node),
# and a(T), b(T) are cubic splines in T.
_GRID_TEMPERATURE = np.arange(195.0, 505.0 + 0.5, 5.0)
_GRID_PRESSURE = np.linspace(4.0e3, 125.0e3, 9)


class AirProperties(NamedTuple):
    """Thermophysical properties of dry air at a temperature and pressure.

    Every field has the broadcast shape of the inputs (a NumPy scalar for scalar inputs).

    Attributes
    ----------
    density : ndarray
        Mass density ρ [kg m⁻³].
    dynamic_viscosity : ndarray
        Dynamic viscosity μ [Pa s].
    kinematic_viscosity : ndarray
        Kinematic viscosity ν = μ/ρ [m² s⁻¹].
    thermal_conductivity : ndarray
        Thermal conductivity k [W m⁻¹ K⁻¹].
    specific_heat : ndarray
        Isobaric specific heat c_p [J kg⁻¹ K⁻¹].
    prandtl : ndarray
        Prandtl number Pr = μ c_p / k [-].
    thermal_diffusivity : ndarray
        Thermal diffusivity α = k/(ρ c_p) [m² s⁻¹].
    """

    density: np.ndarray
    dynamic_viscosity: np.ndarray
    kinematic_viscosity: np.ndarray
    thermal_conductivity: np.ndarray
    specific_heat: np.ndarray
    prandtl: np.ndarray
    thermal_diffusivity: np.ndarray


def _shown(values: np.ndarray) -> str:
    """Format the offending value(s) for a one-line message."""
    finite = values[np.isfinite(values)]
    if values.size == 1 or finite.size == 0:
        return f"{values.flat[0]:.6g}"
    lo, hi = float(finite.min()), float(finite.max())
    extra = " (and non-finite values)" if finite.size < values.size else ""
    return f"{lo:.6g} to {hi:.6g}{extra}" if lo != hi else f"{lo:.6g}{extra}"


def _require_in(name: str, values: np.ndarray, low: float, high: float, unit: str, hint: str):
    """Raise InputError naming ``name`` if any value is outside [low, high] or not finite."""
    bad = ~((values >= low) & (values <= high))  # NaN counts as bad
    if np.any(bad):
        raise PropertyRangeError(
            f"{name} = {_shown(values[bad])} {unit} is outside the allowed range "
            f"{low:.6g} to {high:.6g} {unit}{hint}"
        )


def _require_positive(name: str, values: np.ndarray, unit: str):
    bad = ~(np.isfinite(values) & (values > 0.0))
    if np.any(bad):
        raise InputError(f"{name} = {_shown(values[bad])} {unit} is not allowed; it must be > 0")


def _finish(density, dynamic_viscosity, thermal_conductivity, specific_heat) -> AirProperties:
    """Derived groups, and NumPy scalars for 0-d results."""
    kinematic = dynamic_viscosity / density
    prandtl = dynamic_viscosity * specific_heat / thermal_conductivity
    diffusivity = thermal_conductivity / (density * specific_heat)
    fields = (
        density,
        dynamic_viscosity,
        kinematic,
        thermal_conductivity,
        specific_heat,
        prandtl,
        diffusivity,
    )
    return AirProperties(*(np.asarray(f, dtype=float)[()] for f in fields))


# --------------------------------------------------------------------------------------------
# Table of CoolProp values (shipped in finkit/data, regenerated by finkit/data/make_air_table.py)
# --------------------------------------------------------------------------------------------

#: File name of the shipped table inside ``finkit/data``.
AIR_TABLE_FILE = "air_coolprop_table.csv"


class AirGrid(NamedTuple):
    """CoolProp dry-air values on the table grid (what the shipped file holds).

    Attributes
    ----------
    temperature : ndarray
        Grid temperatures, shape (n_T,) [K].
    pressure : ndarray
        Grid pressures, shape (n_p,) [Pa].
    compressibility : ndarray
        Compressibility factor Z, shape (n_T, n_p) [-].
    dynamic_viscosity : ndarray
        Shape (n_T, n_p) [Pa s].
    thermal_conductivity : ndarray
        Shape (n_T, n_p) [W m⁻¹ K⁻¹].
    specific_heat : ndarray
        Isobaric specific heat, shape (n_T, n_p) [J kg⁻¹ K⁻¹].
    gas_constant : float
        Specific gas constant R*/M of CoolProp's air model [J kg⁻¹ K⁻¹].
    coolprop_version : str
        CoolProp version (and git revision) that produced the values.
    """

    temperature: np.ndarray
    pressure: np.ndarray
    compressibility: np.ndarray
    dynamic_viscosity: np.ndarray
    thermal_conductivity: np.ndarray
    specific_heat: np.ndarray
    gas_constant: float
    coolprop_version: str


def tabulate_air_coolprop(temperature=_GRID_TEMPERATURE, pressure=_GRID_PRESSURE) -> AirGrid:
    """Evaluate CoolProp's dry-air model on a temperature x pressure grid.

    Used by ``finkit/data/make_air_table.py`` to write the shipped table, and by the tests to
    check it.

    Parameters
    ----------
    temperature : array_like, optional
        Grid temperatures (default 195 to 505 K in 5 K steps) [K].
    pressure : array_like, optional
        Grid pressures (default 9 values, 4 to 125 kPa) [Pa].

    Returns
    -------
    AirGrid
        Z, μ, k and c_p at every grid point, with R*/M and the CoolProp version.
    """
    import CoolProp

    temperature = np.asarray(temperature, dtype=float)
    pressure = np.asarray(pressure, dtype=float)
    state = CoolProp.AbstractState("HEOS", "Air")
    values = np.empty((4, temperature.size, pressure.size))
    for i, t in enumerate(temperature):
        for j, p in enumerate(pressure):
            state.update(CoolProp.PT_INPUTS, float(p), float(t))
            values[:, i, j] = (
                state.compressibility_factor(),
                state.viscosity(),
                state.conductivity(),
                state.cpmass(),
            )
    revision = getattr(CoolProp, "__gitrevision__", "?")[:10]
    return AirGrid(
        temperature,
        pressure,
        *values,
        gas_constant=float(state.gas_constant() / state.molar_mass()),
        coolprop_version=f"{CoolProp.__version__} ({revision})",
    )


def _read_air_grid() -> AirGrid:
    """Read the shipped table (CSV with ``#`` header lines; see make_air_table.py)."""
    from importlib.resources import files

    text = (files("finkit") / "data" / AIR_TABLE_FILE).read_text(encoding="utf-8")
    header = {}
    for line in text.splitlines():
        if line.startswith("#") and "=" in line:
            name, _, value = line[1:].partition("=")
            header[name.strip()] = value.strip()
    rows = np.loadtxt(text.splitlines(), delimiter=",", comments="#", dtype=float)
    temperature = np.unique(rows[:, 0])
    pressure = np.unique(rows[:, 1])
    shape = (temperature.size, pressure.size)
    order = np.lexsort((rows[:, 1], rows[:, 0]))  # temperature-major, then pressure
    rows = rows[order]
    return AirGrid(
        temperature,
        pressure,
        *(rows[:, c].reshape(shape) for c in range(2, 6)),
        gas_constant=float(header["gas_constant"]),
        coolprop_version=header["coolprop_version"],
    )


class _AirInterpolant(NamedTuple):
    t0: float  # first temperature node [K]
    step: float  # node spacing [K]
    intervals: int  # number of spline intervals
    gas_constant: float  # R*/M used with Z [J kg⁻¹ K⁻¹]
    coolprop_version: str
    # coefficients[channel][part][power] -> array over intervals; part 0 = a(T), 1 = b(T);
    # power 0..3 multiplies dx**(3 - power) (scipy PPoly order).
    coefficients: tuple


@functools.cache
def _air_interpolant() -> _AirInterpolant:
    """Fit the interpolant to the shipped table, once per process (a few ms)."""
    grid = _read_air_grid()
    steps = np.diff(grid.temperature)
    if not np.allclose(steps, steps[0]):
        raise RuntimeError("finkit air table: temperature grid is not uniform")
    design = np.column_stack([np.ones(grid.pressure.size), grid.pressure])
    coefficients = []
    for values in (
        grid.compressibility,
        grid.dynamic_viscosity,
        grid.thermal_conductivity,
        grid.specific_heat,
    ):
        # Least-squares line in p at every temperature node: f = a + b p.
        ab, *_ = np.linalg.lstsq(design, values.T, rcond=None)  # (2, n_T)
        parts = []
        for part in range(2):
            c = uniform_spline_coefficients(grid.temperature, ab[part])  # (4, n_T - 1)
            parts.append(tuple(np.ascontiguousarray(c[m]) for m in range(4)))
        coefficients.append(tuple(parts))
    return _AirInterpolant(
        t0=float(grid.temperature[0]),
        step=float(steps[0]),
        intervals=grid.temperature.size - 1,
        gas_constant=grid.gas_constant,
        coolprop_version=grid.coolprop_version,
        coefficients=tuple(coefficients),
    )


def air_property_source() -> str:
    """One line naming the property source and version, for the provenance of a note.

    Returns
    -------
    str
        E.g. ``"CoolProp 8.0.0 (ae81610e7d) dry air (Lemmon et al. 2000; Lemmon & Jacobsen
        2004), tabulated in finkit, 200-500 K, 5-120 kPa"``.
    """
    lo_t, hi_t = AIR_TABLE_TEMPERATURE_RANGE
    lo_p, hi_p = AIR_TABLE_PRESSURE_RANGE
    return (
        f"CoolProp {_air_interpolant().coolprop_version} dry air (Lemmon et al. 2000; "
        f"Lemmon & Jacobsen 2004), tabulated in finkit, {lo_t:g}-{hi_t:g} K, "
        f"{lo_p / 1e3:g}-{hi_p / 1e3:g} kPa"
    )


def air_properties(temperature, pressure=101325.0) -> AirProperties:
    r"""Dry-air properties from CoolProp, tabulated and interpolated (fast, vectorised).

    Parameters
    ----------
    temperature : float or array_like
        Absolute temperature, 200 to 500 K [K].
    pressure : float or array_like, default 101325.0
        Absolute pressure, 5 to 120 kPa [Pa]. Broadcasts with ``temperature``.

    Returns
    -------
    AirProperties
        Density, dynamic and kinematic viscosity, thermal conductivity, c_p, Prandtl number and
        thermal diffusivity, each with the broadcast shape of the inputs.

    Raises
    ------
    InputError
        If any temperature or pressure lies outside the table range (or is not finite). The
        message names the field and the allowed range; use :func:`air_properties_coolprop`
        for states outside it.

    Notes
    -----
    Source of the values: CoolProp's dry-air model, i.e. the Lemmon et al. (2000) equation of
    state and the Lemmon & Jacobsen (2004) viscosity and conductivity equations [1]_ [2]_ [3]_.

    The compressibility factor Z, μ, k and c_p were evaluated with CoolProp on a grid of
    63 temperatures (195 to 505 K, 5 K steps) times 9 pressures (4 to 125 kPa) and shipped as
    ``finkit/data/air_coolprop_table.csv`` (regenerate with ``finkit/data/make_air_table.py``).
    On first use in a process, at each grid temperature each property is fitted by a straight
    line in pressure, :math:`f(T, p) = a(T) + b(T)\,p` (least squares over the 9 pressures; the
    departure from ideal-gas behaviour is, to first order, proportional to density), and
    :math:`a(T)`, :math:`b(T)` become cubic splines in T. Density follows from
    :math:`\rho = p / (Z R T)` with CoolProp's R*/M. The derived groups come from the
    interpolated values: :math:`\nu = \mu/\rho`, :math:`\Pr = \mu c_p/k`,
    :math:`\alpha = k/(\rho c_p)`.

    Error of the shortcut, checked in ``tests/test_air.py`` against direct CoolProp calls at
    random states over the whole range: below 1e-5 relative (0.001 %) for every field; the
    test's limit is 1e-4.

    What the pressure terms are worth (CoolProp, 200-500 K, 5-120 kPa): treating μ, k and
    c_p as pressure-independent (1-atm values) would be wrong by up to 0.12 %, 0.26 % and
    0.42 % respectively (at 200 K; up to 0.07 %, 0.11 % and 0.15 % above 300 K), and the ideal
    gas (Z = 1) by up to 0.28 % in density (Z = 0.997 at 200 K and 120 kPa; below 0.04 % above
    300 K).

    Why a shipped table rather than one built at run time: importing CoolProp takes about 2 s
    per process, which every command would pay; the shipped values make a result depend on the
    finkit version only, not on the CoolProp installed; and the generator writes a
    deterministic file, so a CoolProp upgrade shows up as a reviewable diff. The tests compare
    the table with the installed CoolProp. :func:`air_property_source` names the CoolProp
    version that produced the table.

    References
    ----------
    .. [1] E. W. Lemmon, R. T. Jacobsen, S. G. Penoncello, D. G. Friend, "Thermodynamic
       properties of air and mixtures of nitrogen, argon, and oxygen from 60 to 2000 K at
       pressures to 2000 MPa", J. Phys. Chem. Ref. Data 29(3), 331-385, 2000.
       doi:10.1063/1.1285884
    .. [2] E. W. Lemmon, R. T. Jacobsen, "Viscosity and thermal conductivity equations for
       nitrogen, oxygen, argon, and air", Int. J. Thermophys. 25(1), 21-69, 2004.
       doi:10.1023/B:IJOT.0000022327.04529.f3
    .. [3] I. H. Bell, J. Wronski, S. Quoilin, V. Lemort, "Pure and pseudo-pure fluid
       thermophysical property evaluation and the open-source thermophysical property library
       CoolProp", Ind. Eng. Chem. Res. 53(6), 2498-2508, 2014. doi:10.1021/ie4033999

    Examples
    --------
    >>> props = air_properties(300.0)
    >>> round(float(props.density), 3), round(float(props.prandtl), 3)
    (1.177, 0.707)
    """
    temperature, pressure = np.broadcast_arrays(
        np.asarray(temperature, dtype=float), np.asarray(pressure, dtype=float)
    )
    hint = "; use air_properties_coolprop for other states"
    _require_in("temperature", temperature, *AIR_TABLE_TEMPERATURE_RANGE, "K", hint)
    _require_in("pressure", pressure, *AIR_TABLE_PRESSURE_RANGE, "Pa", hint)

    table = _air_interpolant()
    index = np.floor((temperature - table.t0) / table.step).astype(np.intp)
    index = np.clip(index, 0, table.intervals - 1)
    dx = temperature - (table.t0 + table.step * index)

    def channel(c):
        (a0, a1, a2, a3), (b0, b1, b2, b3) = table.coefficients[c]
        a = ((a0[index] * dx + a1[index]) * dx + a2[index]) * dx + a3[index]
        b = ((b0[index] * dx + b1[index]) * dx + b2[index]) * dx + b3[index]
        return a + b * pressure

    compressibility = channel(0)
    density = pressure / (compressibility * table.gas_constant * temperature)
    return _finish(density, channel(1), channel(2), channel(3))


def air_properties_coolprop(temperature, pressure=101325.0) -> AirProperties:
    """Dry-air properties by direct CoolProp calls (the slow reference).

    Parameters
    ----------
    temperature : float or array_like
        Absolute temperature [K]; dry-air gas states only (CoolProp's equations cover
        60 to 2000 K).
    pressure : float or array_like, default 101325.0
        Absolute pressure [Pa]. Broadcasts with ``temperature``.

    Returns
    -------
    AirProperties
        As :func:`air_properties`, straight from ``CoolProp.CoolProp.PropsSI(..., 'Air')``
        (outputs ``D``, ``V``, ``L``, ``C``; the groups derived from them).

    Raises
    ------
    InputError
        If a temperature or pressure is not a finite positive number, or CoolProp returns no
        finite value for a state (e.g. outside its equations' range).

    Notes
    -----
    About 7 µs per state and property with array inputs (CoolProp loops in C++), about
    90 µs per scalar call. Use it for states outside the table of :func:`air_properties` and
    to check that table.

    References
    ----------
    .. [1] I. H. Bell, J. Wronski, S. Quoilin, V. Lemort, "Pure and pseudo-pure fluid
       thermophysical property evaluation and the open-source thermophysical property library
       CoolProp", Ind. Eng. Chem. Res. 53(6), 2498-2508, 2014. doi:10.1021/ie4033999
    """
    from CoolProp.CoolProp import PropsSI

    temperature, pressure = np.broadcast_arrays(
        np.asarray(temperature, dtype=float), np.asarray(pressure, dtype=float)
    )
    _require_positive("temperature", temperature, "K")
    _require_positive("pressure", pressure, "Pa")
    shape = temperature.shape
    t_flat = np.ascontiguousarray(temperature.ravel())
    p_flat = np.ascontiguousarray(pressure.ravel())
    out = []
    for key in ("D", "V", "L", "C"):
        try:
            value = np.asarray(PropsSI(key, "T", t_flat, "P", p_flat, "Air"), dtype=float)
        except ValueError as err:  # CoolProp rejects the state outright
            raise InputError(
                f"temperature/pressure = {_shown(t_flat)} K / {_shown(p_flat)} Pa: "
                f"CoolProp has no dry-air value ({str(err).splitlines()[0]})"
            ) from None
        bad = ~np.isfinite(value)
        if np.any(bad):
            raise InputError(
                f"temperature/pressure = {_shown(t_flat[bad])} K / {_shown(p_flat[bad])} Pa: "
                "CoolProp has no dry-air gas value there (allowed: gas states, 60 to 2000 K)"
            )
        out.append(value.reshape(shape))
    return _finish(*out)


def air_properties_sutherland(temperature, pressure=101325.0) -> AirProperties:
    r"""Dry-air properties from closed forms: ideal gas, Sutherland laws and a c_p fit.

    Dependency-free, for cross-checks and hand calculations. Less accurate than
    :func:`air_properties`; see Notes.

    Parameters
    ----------
    temperature : float or array_like
        Absolute temperature [K]; checked against CoolProp over 273-423 K
        (:data:`SUTHERLAND_AIR_VALIDITY`).
    pressure : float or array_like, default 101325.0
        Absolute pressure [Pa]. Broadcasts with ``temperature``; only density depends on it.

    Returns
    -------
    AirProperties
        As :func:`air_properties`.

    Raises
    ------
    InputError
        If a temperature or pressure is not a finite positive number.

    Notes
    -----
    .. math::

        \rho = \frac{p}{R T}, \quad R = 287.05\ \mathrm{J\,kg^{-1}\,K^{-1}}

        \mu = \frac{1.458\times 10^{-6}\, T^{1.5}}{T + 110.4}

        k = 0.0241 \left(\frac{T}{273.15}\right)^{1.5} \frac{273.15 + 194}{T + 194}

        c_p = 1033.0154 - 0.213749\,T + 4.164144\times 10^{-4}\,T^2

    The viscosity law is the one defined in the U.S. Standard Atmosphere 1976 (also ISO 2533);
    its constants were confirmed against the implementation in ``fluids.ATMOSPHERE_1976``.
    The conductivity law is the Sutherland form tabulated by White (k0 = 0.0241 W m⁻¹ K⁻¹ at
    273 K, S = 194 K); it was recalled, its S = 194 K confirmed by an independent quotation of
    the same law (S = 194.4 K), and its accuracy checked against CoolProp (below). The c_p
    quadratic was fitted to CoolProp at 1 atm, 273-423 K (finkit methods reference, k).

    Deviation from CoolProp at 1 atm, 273-423 K (checked in ``tests/test_air.py``): density
    within ±0.06 %, μ −1.0 to −0.3 %, k −1.1 to +0.5 %, c_p within 0.002 %, Pr −1.5 to
    +0.8 %. Outside that range the c_p fit is an extrapolation (over 200-500 K: k −3.2 to
    +0.6 %, Pr −2.0 to +3.0 %).

    References
    ----------
    .. [1] NOAA, NASA, USAF, "U.S. Standard Atmosphere, 1976", NOAA-S/T 76-1562, U.S.
       Government Printing Office, 1976.
    .. [2] F. M. White, "Viscous Fluid Flow", 3rd ed., McGraw-Hill, 2006, ch. 1 (Sutherland-law
       constants for gases).
    """
    temperature, pressure = np.broadcast_arrays(
        np.asarray(temperature, dtype=float), np.asarray(pressure, dtype=float)
    )
    _require_positive("temperature", temperature, "K")
    _require_positive("pressure", pressure, "Pa")
    t = temperature
    density = pressure / (AIR_SPECIFIC_GAS_CONSTANT * t)
    viscosity = 1.458e-6 * t**1.5 / (t + 110.4)
    conductivity = 0.0241 * (t / 273.15) ** 1.5 * (273.15 + 194.0) / (t + 194.0)
    specific_heat = 1033.0154 - 0.213749 * t + 4.164144e-4 * t**2
    return _finish(density, viscosity, conductivity, specific_heat)
