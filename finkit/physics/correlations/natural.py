"""Natural (free) convection: vertical plates, vertical plate-fin channels, horizontal fin arrays.

Two orientations of a plate-fin sink are covered: base vertical, fins vertical, air rising along
the fin length (``"vertical-fins"``: Bar-Cohen & Rohsenow channels, Churchill & Chu outer faces),
and base horizontal with the fins standing up from it (``"horizontal-base-fins-up"``: Jones &
Smith 1970). Every other orientation (fins hanging down from a horizontal base, horizontal fins
on a vertical base) and pin fins raise :class:`finkit.errors.NotSupportedError` through
:func:`natural_orientation_check`: no published correlation for them could be confirmed.

Conventions: temperatures in K, ``beta = 1/T_film`` (ideal gas), ``g`` is
:data:`finkit.constants.STANDARD_GRAVITY`. Air properties are passed in as arrays by the caller
(evaluated at the film temperature); this module does not compute them.
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from finkit.constants import STANDARD_GRAVITY
from finkit.errors import GeometryError, InputError, NotSupportedError
from finkit.validity import ValidityRange, check_range

__all__ = [
    "BAR_COHEN_ROHSENOW_CONSTANTS",
    "BAR_COHEN_ROHSENOW_RANGE",
    "CHURCHILL_CHU_ALL_RANGE",
    "CHURCHILL_CHU_LAMINAR_RANGE",
    "ELENBAAS_RANGE",
    "HorizontalFinArrayNatural",
    "JONES_SMITH_RANGE",
    "ORIENTATION_METHODS",
    "OPTIMUM_SPACING_CONSTANTS",
    "SUPPORTED_ORIENTATIONS",
    "UNSUPPORTED_ORIENTATIONS",
    "PlateFinArrayNatural",
    "natural_orientation_check",
    "nusselt_horizontal_fin_array_jones_smith",
    "nusselt_vertical_channel_bar_cohen_rohsenow",
    "nusselt_vertical_channel_elenbaas",
    "nusselt_vertical_plate_churchill_chu",
    "optimum_fin_spacing_bar_cohen_rohsenow",
    "horizontal_fin_array_natural",
    "plate_fin_array_natural",
    "plate_fin_natural_warnings",
    "rayleigh_number",
]

#: Orientations for which finkit has a published natural-convection method.
SUPPORTED_ORIENTATIONS = ("vertical-fins", "horizontal-base-fins-up")

#: Orientations named in the trade for which no published correlation could be confirmed; they
#: raise NotSupportedError (with the supported ones named) rather than "unknown".
UNSUPPORTED_ORIENTATIONS = ("horizontal-base-fins-down", "vertical-base-horizontal-fins")

#: One line per supported orientation: what is modelled, the correlation, its source and range
#: (``finkit check`` prints it; the note's method section says the same at length).
ORIENTATION_METHODS = {
    "vertical-fins": (
        "vertical base, vertical fins: Bar-Cohen & Rohsenow (1984) channel composite on the "
        "Elenbaas number (range El 0.1 to 1e5), Churchill & Chu (1975) on the end-fin outer faces "
        "(Ra_L 0.1 to 1e9); radiation by the envelope method"
    ),
    "horizontal-base-fins-up": (
        "horizontal base, fins up: Jones & Smith (1970) horizontal fin-array correlation on the "
        "Rayleigh number of the fin spacing (range Ra_S 200 to 6e5; constants recalled, checked "
        "through their upward-plate limit), h on the whole fin and base surface; radiation by "
        "the envelope method"
    ),
}

#: Churchill & Chu laminar form (Incropera et al. 6th ed. Eq. 9.27), Rayleigh number on height.
CHURCHILL_CHU_LAMINAR_RANGE = ValidityRange(
    method="Churchill & Chu (1975) vertical plate, laminar form",
    quantity="Ra_L",
    low=1e-1,
    high=1e9,
    source="upper limit Incropera et al. 6th ed. Eq. 9.27; lower limit from memory of "
    "Churchill & Chu (1975) data",
)

#: Churchill & Chu all-Ra form (Incropera et al. 6th ed. Eq. 9.26).
CHURCHILL_CHU_ALL_RANGE = ValidityRange(
    method="Churchill & Chu (1975) vertical plate, all-Ra form",
    quantity="Ra_L",
    low=1e-1,
    high=1e12,
    source="from memory of Churchill & Chu (1975); Incropera et al. 6th ed. Eq. 9.26 says "
    "'entire range of Ra_L'",
)

#: Elenbaas number range of the parallel-plate data behind the channel correlations. The
#: composite form tends to both exact asymptotes, but the data it was checked against span about
#: this range (from memory of Elenbaas 1942 / Bar-Cohen & Rohsenow 1984 figures; not confirmed).
ELENBAAS_RANGE = ValidityRange(
    method="Elenbaas (1942) parallel-plate channel",
    quantity="El",
    low=1e-1,
    high=1e5,
    source="data range recalled from Elenbaas (1942), not confirmed",
)

#: Same range for the Bar-Cohen & Rohsenow composite (it was fitted to the same data).
BAR_COHEN_ROHSENOW_RANGE = ValidityRange(
    method="Bar-Cohen & Rohsenow (1984) parallel-plate channel",
    quantity="El",
    low=1e-1,
    high=1e5,
    source="data range recalled from Elenbaas (1942) and Bar-Cohen & Rohsenow (1984), "
    "not confirmed",
)

#: Range of Jones & Smith (1970), horizontal-base fin arrays in air, on ``Ra_S`` (their
#: ``Gr_S Pr`` with Pr of air). Recalled from the paper and the reviews that quote it; not checked
#: against the original here (see :func:`nusselt_horizontal_fin_array_jones_smith`).
JONES_SMITH_RANGE = ValidityRange(
    method="Jones & Smith (1970) horizontal-base fin array",
    quantity="Ra_S",
    low=2e2,
    high=6e5,
    source="range 2e2 < Gr_S Pr < 6e5 recalled from Jones & Smith (1970), not confirmed",
)

#: Composite constants ``(C1, C2)`` of Bar-Cohen & Rohsenow for isothermal walls.
BAR_COHEN_ROHSENOW_CONSTANTS = {
    "isothermal-symmetric": (576.0, 2.873),
    "isothermal-asymmetric": (144.0, 2.873),
}

#: Optimum-spacing constants ``S_opt = C (g beta dT / (nu alpha L))^(-1/4)`` (isothermal walls).
OPTIMUM_SPACING_CONSTANTS = {
    "isothermal-symmetric": 2.714,
    "isothermal-asymmetric": 2.15,
}

_ISOFLUX = ("isoflux-symmetric", "isoflux-asymmetric")


def _wall_constants(wall, table):
    if wall in table:
        return table[wall]
    if wall in _ISOFLUX:
        raise NotSupportedError(
            f"natural convection: wall = '{wall}' is not supported; the isoflux composite "
            "constant C2 could not be confirmed against a second source; use "
            "'isothermal-symmetric' or 'isothermal-asymmetric'"
        )
    raise InputError(
        f"natural convection: wall = '{wall}' is unknown; allowed: "
        + ", ".join(f"'{w}'" for w in table)
    )


def natural_orientation_check(orientation):
    """Raise unless ``orientation`` is one finkit has a published natural-convection method for.

    Parameters
    ----------
    orientation : str
        Orientation key of the heat sink [-]: ``"vertical-fins"`` (base vertical, fins vertical,
        air rising along the fin length) or ``"horizontal-base-fins-up"`` (base horizontal, fins
        standing up from it).

    Returns
    -------
    str
        The orientation, unchanged, when it is supported.

    Raises
    ------
    NotSupportedError
        For any other orientation, e.g. ``"horizontal-base-fins-down"``; the one-line message
        names the supported ones.
    """
    if orientation in SUPPORTED_ORIENTATIONS:
        return orientation
    why = (
        "no published correlation for it could be confirmed"
        if orientation in UNSUPPORTED_ORIENTATIONS
        else "it is not an orientation finkit knows"
    )
    raise NotSupportedError(
        f"natural convection: orientation '{orientation}' is not supported ({why}); supported: "
        + ", ".join(f"'{o}'" for o in SUPPORTED_ORIENTATIONS)
    )


def nusselt_horizontal_fin_array_jones_smith(rayleigh_spacing):
    r"""Average Nusselt number of a plate-fin array on a horizontal base, fins up (Jones & Smith).

    Parameters
    ----------
    rayleigh_spacing : float or array_like
        Rayleigh number on the clear fin spacing S, ``Ra_S = g beta dT S^3/(nu alpha)`` with the
        base-to-ambient temperature difference [-].

    Returns
    -------
    numpy.ndarray or float
        ``Nu_S = h S / k``, h averaged over the whole finned surface (fin faces and the base
        between the fins) [-].

    Notes
    -----
    .. math:: Nu_S = 6.7\times10^{-4}\,Ra_S
              \left[1 - \exp\left(-\left(\frac{7640}{Ra_S}\right)^{0.44}\right)\right]^{1.7}

    Isothermal fins of rectangular section standing up from a horizontal, upward-facing base in
    air; air is drawn in over the open ends and sides and leaves upward. The correlation has no
    fin height or fin length in it. Range: :data:`JONES_SMITH_RANGE` (``2e2 ≤ Ra_S ≤ 6e5``).
    Properties at the film temperature, ``beta = 1/T_film``.

    How confirmed: the form and the constants 6.7e-4, 7640, 0.44 and 1.7 are recalled from
    Jones & Smith (1970) as quoted in later horizontal fin-array papers; the original could not
    be read here. Check made here: for large ``Ra_S`` the bracket tends to
    ``(7640/Ra_S)^{0.748}``, so ``Nu_S -> 6.7e-4 · 7640^{0.748} Ra_S^{0.252} = 0.538
    Ra_S^{0.252}``, the upward-facing heated-plate law ``Nu = 0.54 Ra^{1/4}`` (Incropera et
    al. 6th ed. Eq. 9.30; ``ht.conv_free_immersed.Nu_horizontal_plate_McAdams``) that a widely
    spaced array is expected to approach (the length scales differ, so only the law's form and
    coefficient are compared). The four recalled constants reproducing both the exponent
    (``1 - 0.44·1.7 = 0.252`` against 1/4) and the coefficient (0.538 against 0.54) is strong
    evidence that they are the published ones; no printed Jones & Smith data point was available
    to test against (docs/methods.md g5).

    References
    ----------
    Jones, C.D., Smith, L.F., "Optimum arrangement of rectangular fins on horizontal surfaces
    for free-convection heat transfer", J. Heat Transfer 92(1), 6-10, 1970.

    Examples
    --------
    >>> round(float(nusselt_horizontal_fin_array_jones_smith(1e4)), 2)
    2.72
    """
    Ra = np.asarray(rayleigh_spacing, dtype=float)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        bracket = -np.expm1(-((7640.0 / Ra) ** 0.44))
    # Ra_S = 0 (no temperature difference) gives Nu_S = 0
    return np.where(Ra > 0.0, 6.7e-4 * Ra * bracket**1.7, 0.0)


def rayleigh_number(
    length, temperature_difference, film_temperature, kinematic_viscosity, thermal_diffusivity
):
    r"""Rayleigh number of an ideal gas, ``Ra = g beta dT L^3 / (nu alpha)`` with ``beta = 1/T_f``.

    Parameters
    ----------
    length : float or array_like
        Characteristic length (plate height, or fin spacing for ``Ra_S``) [m].
    temperature_difference : float or array_like
        Surface minus ambient temperature; the magnitude is used [K].
    film_temperature : float or array_like
        Film temperature ``(T_s + T_inf)/2``, absolute [K].
    kinematic_viscosity : float or array_like
        Kinematic viscosity of the fluid at the film temperature [m² s⁻¹].
    thermal_diffusivity : float or array_like
        Thermal diffusivity of the fluid at the film temperature [m² s⁻¹].

    Returns
    -------
    numpy.ndarray or float
        Rayleigh number [-].

    Notes
    -----
    .. math:: Ra_L = \frac{g \beta |\Delta T| L^3}{\nu \alpha}, \qquad \beta = 1/T_f

    ``g`` is the standard gravity 9.80665 m s⁻². ``beta = 1/T_f`` holds for an ideal gas
    (Incropera et al., 6th ed., Eq. 9.6 ff.).

    Examples
    --------
    >>> round(float(rayleigh_number(0.71, 209.0, 400.0, 26.41e-6, 38.3e-6)) / 1e9, 2)
    1.81
    """
    L = np.asarray(length, dtype=float)
    dT = np.abs(np.asarray(temperature_difference, dtype=float))
    beta = 1.0 / np.asarray(film_temperature, dtype=float)
    return STANDARD_GRAVITY * beta * dT * L**3 / (kinematic_viscosity * thermal_diffusivity)


def nusselt_vertical_plate_churchill_chu(rayleigh, prandtl, form="laminar"):
    r"""Average Nusselt number of an isolated isothermal vertical plate (Churchill & Chu 1975).

    Parameters
    ----------
    rayleigh : float or array_like
        Rayleigh number on the plate height, ``Ra_L`` [-].
    prandtl : float or array_like
        Prandtl number of the fluid [-].
    form : {"laminar", "all"}
        ``"laminar"`` (Ra_L ≤ 1e9, closer to boundary-layer theory) or ``"all"`` (all Ra,
        includes turbulence) [-].

    Returns
    -------
    numpy.ndarray or float
        Average Nusselt number on the plate height, ``Nu_L = h L / k`` [-].

    Notes
    -----
    All-Ra form (Incropera et al. 6th ed. Eq. 9.26):

    .. math:: Nu_L = \left\{0.825 + \frac{0.387 Ra_L^{1/6}}
              {[1 + (0.492/Pr)^{9/16}]^{8/27}}\right\}^2

    Laminar form (Eq. 9.27), :math:`Ra_L \lesssim 10^9`:

    .. math:: Nu_L = 0.68 + \frac{0.670 Ra_L^{1/4}}{[1 + (0.492/Pr)^{9/16}]^{4/9}}

    Validity ranges: :data:`CHURCHILL_CHU_LAMINAR_RANGE`, :data:`CHURCHILL_CHU_ALL_RANGE`.
    Properties at the film temperature. For a uniform-flux plate the same expressions are used with
    the temperature difference at mid-height (Incropera ch. 9).

    How confirmed: the all-Ra form agrees with ``ht.conv_free_immersed.Nu_vertical_plate_Churchill``
    (ht 1.2), which reproduces Incropera Example 9.2; the laminar form was checked against the
    laminar boundary-layer similarity solution (within 3 % for Ra_L = 1e7…1e9, Pr = 0.71;
    about 7 % higher at 1e5, where the boundary layer is thick)
    and matches the form printed in several independent implementations of Incropera Eq. 9.27.

    References
    ----------
    Churchill, S.W., Chu, H.H.S., "Correlating equations for laminar and turbulent free convection
    from a vertical plate", Int. J. Heat Mass Transfer 18(11), 1323-1329, 1975,
    doi:10.1016/0017-9310(75)90243-4.

    Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., Fundamentals of Heat and Mass
    Transfer, 6th ed., Wiley, 2007, Section 9.6.1.

    Examples
    --------
    >>> round(float(nusselt_vertical_plate_churchill_chu(1.813e9, 0.69, form="all")))
    147
    """
    Ra = np.asarray(rayleigh, dtype=float)
    Pr = np.asarray(prandtl, dtype=float)
    psi = 1.0 + (0.492 / Pr) ** (9.0 / 16.0)
    if form == "laminar":
        return 0.68 + 0.670 * Ra**0.25 / psi ** (4.0 / 9.0)
    if form == "all":
        return (0.825 + 0.387 * Ra ** (1.0 / 6.0) / psi ** (8.0 / 27.0)) ** 2
    raise InputError(
        f"Churchill & Chu vertical plate: form = '{form}' is unknown; allowed: 'laminar', 'all'"
    )


def nusselt_vertical_channel_elenbaas(elenbaas):
    r"""Average Nusselt number of a symmetric isothermal vertical parallel-plate channel (Elenbaas).

    Parameters
    ----------
    elenbaas : float or array_like
        Elenbaas number ``El = Ra_S S / L`` (S spacing, L plate height) [-].

    Returns
    -------
    numpy.ndarray or float
        ``Nu_S = (q/A) S / (k dT)`` averaged over the plate [-].

    Notes
    -----
    .. math:: Nu_S = \frac{El}{24}\left[1 - \exp\left(-\frac{35}{El}\right)\right]^{3/4}

    Tends to the fully developed limit ``El/24`` for small El (derived here: buoyancy-driven plane
    Poiseuille flow leaving at wall temperature) and to ``0.60 El^(1/4)`` for large El (isolated
    plate). Range: :data:`ELENBAAS_RANGE`.

    How confirmed: [R] form as recalled in docs/methods.md g2 (from Elenbaas 1942 via Bar-Cohen &
    Rohsenow 1984); its small-El limit was re-derived here, and it agrees with the composite of
    :func:`nusselt_vertical_channel_bar_cohen_rohsenow` within about 5 % for El = 1…1000.

    References
    ----------
    Elenbaas, W., "Heat dissipation of parallel plates by free convection", Physica 9(1), 1-28,
    1942.

    Examples
    --------
    >>> round(float(nusselt_vertical_channel_elenbaas(100.0)), 2)
    1.67
    """
    El = np.asarray(elenbaas, dtype=float)
    with np.errstate(divide="ignore"):  # El = 0 (no temperature difference) gives Nu_S = 0
        return El / 24.0 * (-np.expm1(-35.0 / El)) ** 0.75


def nusselt_vertical_channel_bar_cohen_rohsenow(elenbaas, wall="isothermal-symmetric"):
    r"""Average Nusselt number of a vertical isothermal plate channel (Bar-Cohen & Rohsenow).

    Parameters
    ----------
    elenbaas : float or array_like
        Elenbaas number ``El = Ra_S S / L`` with ``Ra_S = g beta dT S^3/(nu alpha)`` [-].
    wall : {"isothermal-symmetric", "isothermal-asymmetric"}
        Both walls at T_s (fin array), or one wall at T_s and the other adiabatic [-]. The isoflux
        keys ``"isoflux-symmetric"`` and ``"isoflux-asymmetric"`` raise NotSupportedError (see
        Notes).

    Returns
    -------
    numpy.ndarray or float
        ``Nu_S = (q/A) S / (k dT)`` averaged over the heated wall(s) [-].

    Notes
    -----
    .. math:: Nu_S = \left[\frac{C_1}{El^2} + \frac{C_2}{El^{1/2}}\right]^{-1/2}

    ============================  =====  =====
    wall                          C1     C2
    ============================  =====  =====
    isothermal-symmetric          576    2.873
    isothermal-asymmetric         144    2.873
    ============================  =====  =====

    How confirmed: the constants agree with Table 1 of the chapter "Cooling Electronic
    Equipment" in M. Kutz (ed.), Mechanical Engineers' Handbook, Vol. 4, 3rd ed., Wiley, 2006,
    p. 387 (576 and 144 with 2.873). Independently, C1 is the square of the fully developed limit
    ``Nu_S = El/24`` (symmetric) or ``El/12`` (one wall heated), re-derived here from
    buoyancy-driven plane Poiseuille flow, and ``C2^(-1/2) = 0.590`` is the isolated-plate
    coefficient of ``Nu_L = 0.59 Ra_L^(1/4)`` (McAdams; as in
    ``ht.conv_free_immersed.Nu_vertical_cylinder_McAdams_Weiss_Saunders``).

    The isoflux composite (C1 = 48 / 24, C2 = 2.51 as recalled in docs/methods.md) is not provided:
    C1 was re-derived here, but C2 = 2.51 (isolated-plate coefficient 0.631) could not be confirmed
    against a second source; the laminar similarity solution gives 0.520 (C2 = 3.70) at Pr = 0.71.

    Range: :data:`BAR_COHEN_ROHSENOW_RANGE`.

    References
    ----------
    Bar-Cohen, A., Rohsenow, W.M., "Thermally optimum spacing of vertical, natural convection
    cooled, parallel plates", J. Heat Transfer 106(1), 116-123, 1984.

    Examples
    --------
    >>> round(float(nusselt_vertical_channel_bar_cohen_rohsenow(100.0)), 2)
    1.7
    """
    C1, C2 = _wall_constants(wall, BAR_COHEN_ROHSENOW_CONSTANTS)
    El = np.asarray(elenbaas, dtype=float)
    with np.errstate(divide="ignore"):  # El = 0 (no temperature difference) gives Nu_S = 0
        return (C1 / El**2 + C2 / np.sqrt(El)) ** -0.5


def optimum_fin_spacing_bar_cohen_rohsenow(
    fin_length_vertical,
    temperature_difference,
    film_temperature,
    kinematic_viscosity,
    thermal_diffusivity,
    wall="isothermal-symmetric",
):
    r"""Optimum spacing of vertical isothermal plates (Bar-Cohen & Rohsenow).

    The spacing that maximises the heat dissipated per unit volume (``Nu_S/S^2``) for a given
    plate length and temperature difference.

    Parameters
    ----------
    fin_length_vertical : float or array_like
        Plate (fin) length in the vertical, flow direction [m].
    temperature_difference : float or array_like
        Surface minus ambient temperature [K].
    film_temperature : float or array_like
        Film temperature, absolute [K].
    kinematic_viscosity : float or array_like
        Kinematic viscosity of air at the film temperature [m² s⁻¹].
    thermal_diffusivity : float or array_like
        Thermal diffusivity of air at the film temperature [m² s⁻¹].
    wall : {"isothermal-symmetric", "isothermal-asymmetric"}
        Wall condition as in :func:`nusselt_vertical_channel_bar_cohen_rohsenow` [-].

    Returns
    -------
    numpy.ndarray or float
        Optimum clear spacing ``S_opt`` [m].

    Notes
    -----
    .. math:: S_{opt} = C \left(\frac{g \beta \Delta T}{\nu \alpha L}\right)^{-1/4},
              \qquad C = 2.714 \text{ (symmetric)},\ 2.15 \text{ (asymmetric)}

    equivalently ``S_opt = C L Ra_L^(-1/4)``. The constants maximise ``Nu_S/S^2`` of the
    composite correlation; analytically ``C = (2 C1/C2)^(1/6)`` = 2.7155 and 2.1553, which the
    published values round. Plate thickness is neglected; with thick fins and a fixed base width,
    maximise the total heat over the integer fin count instead. The isoflux optimum (needs q'') is
    not provided, for the reason given in :func:`nusselt_vertical_channel_bar_cohen_rohsenow`.

    References
    ----------
    Bar-Cohen, A., Rohsenow, W.M., "Thermally optimum spacing of vertical, natural convection
    cooled, parallel plates", J. Heat Transfer 106(1), 116-123, 1984.

    Examples
    --------
    >>> s = optimum_fin_spacing_bar_cohen_rohsenow(0.1, 40.0, 318.0, 17.5e-6, 24.8e-6)
    >>> round(float(s) * 1e3, 1)
    6.6
    """
    C = _wall_constants(wall, OPTIMUM_SPACING_CONSTANTS)
    L = np.asarray(fin_length_vertical, dtype=float)
    dT = np.abs(np.asarray(temperature_difference, dtype=float))
    P = STANDARD_GRAVITY * dT / (np.asarray(film_temperature, dtype=float))
    P = P / (np.asarray(kinematic_viscosity) * np.asarray(thermal_diffusivity) * L)
    return C * P**-0.25


class PlateFinArrayNatural(NamedTuple):
    """Natural-convection coefficients of a vertical plate-fin array.

    Attributes
    ----------
    rayleigh_spacing : numpy.ndarray
        ``Ra_S`` on the fin spacing [-].
    elenbaas : numpy.ndarray
        ``El = Ra_S S / L`` [-].
    nusselt_spacing : numpy.ndarray
        ``Nu_S`` of the symmetric isothermal channel (Bar-Cohen & Rohsenow) [-].
    heat_transfer_coefficient : numpy.ndarray
        ``h = Nu_S k / S`` on the channel surfaces: both faces of every fin that faces a
        neighbour and the base between fins [W m⁻² K⁻¹].
    rayleigh_length : numpy.ndarray
        ``Ra_L`` on the vertical fin length [-].
    nusselt_length : numpy.ndarray
        Churchill & Chu ``Nu_L`` for the outer faces [-].
    outer_face_heat_transfer_coefficient : numpy.ndarray
        ``h = Nu_L k / L`` for surfaces that face the open room: the outer faces of the two end
        fins (and, if the caller includes them, other bare vertical surfaces of the sink such as
        fin tips, base edges or base margins outside the end fins) [W m⁻² K⁻¹].
    optimum_spacing : numpy.ndarray
        Bar-Cohen & Rohsenow optimum spacing for the same L and dT (symmetric isothermal) [m].
    channel_area : numpy.ndarray
        Area the channel coefficient applies to: ``2 (N-1) H L`` fin faces plus ``(N-1) S L``
        base between fins [m²].
    outer_face_area : numpy.ndarray
        Area of the two end-fin outer faces, ``2 H L`` [m²].
    """

    rayleigh_spacing: np.ndarray
    elenbaas: np.ndarray
    nusselt_spacing: np.ndarray
    heat_transfer_coefficient: np.ndarray
    rayleigh_length: np.ndarray
    nusselt_length: np.ndarray
    outer_face_heat_transfer_coefficient: np.ndarray
    optimum_spacing: np.ndarray
    channel_area: np.ndarray
    outer_face_area: np.ndarray


def plate_fin_array_natural(
    fin_spacing,
    fin_height,
    fin_length_vertical,
    fin_thickness,
    fin_count,
    base_width,
    surface_temperature,
    ambient_temperature,
    density,
    dynamic_viscosity,
    thermal_conductivity,
    prandtl,
    outer_face_form="laminar",
):
    r"""Natural-convection coefficients of a plate-fin sink with vertical base and vertical fins.

    Parameters
    ----------
    fin_spacing : float or array_like
        Clear gap between neighbouring fins, S [m].
    fin_height : float or array_like
        Fin height from base to tip, H [m].
    fin_length_vertical : float or array_like
        Fin length in the vertical (air-flow) direction, L [m].
    fin_thickness : float or array_like
        Fin thickness, t [m].
    fin_count : int or array_like
        Number of fins, N ≥ 2 [-].
    base_width : float or array_like
        Base width across the fins; the fins must fit: ``N t + (N-1) S ≤ W`` [m].
    surface_temperature : float or array_like
        Surface temperature the coefficients are evaluated at (usually the base or mean fin
        temperature; the caller iterates) [K].
    ambient_temperature : float or array_like
        Ambient air temperature [K].
    density : float or array_like
        Air density at the film temperature [kg m⁻³].
    dynamic_viscosity : float or array_like
        Air dynamic viscosity at the film temperature [Pa s].
    thermal_conductivity : float or array_like
        Air thermal conductivity at the film temperature [W m⁻¹ K⁻¹].
    prandtl : float or array_like
        Air Prandtl number at the film temperature [-].
    outer_face_form : {"laminar", "all"}
        Churchill & Chu form for the outer faces [-].

    Returns
    -------
    PlateFinArrayNatural
        Dimensionless groups, coefficients and the areas they apply to.

    Raises
    ------
    GeometryError
        Non-positive dimensions, fewer than two fins, or fins wider than the base.

    Notes
    -----
    Method (docs/methods.md g2): the gaps are symmetric isothermal vertical channels,
    ``Ra_S = g beta dT S^3/(nu alpha)``, ``El = Ra_S S/L``, ``Nu_S`` from
    :func:`nusselt_vertical_channel_bar_cohen_rohsenow`, ``h = Nu_S k / S`` on both fin faces and on
    the base between fins. The two outer faces of the end fins are isolated vertical plates,
    :func:`nusselt_vertical_plate_churchill_chu` on height L. ``beta = 1/T_film``,
    ``nu = mu/rho``, ``alpha = nu/Pr``. Fin efficiency is not applied here (the sink model does it).
    Channels are treated as infinitely deep (fin height does not enter ``Nu_S``); the channel
    correlation assumes fins at uniform temperature. Validity: :data:`BAR_COHEN_ROHSENOW_RANGE`
    for ``elenbaas``, :data:`CHURCHILL_CHU_LAMINAR_RANGE` for ``rayleigh_length``.

    References
    ----------
    Bar-Cohen, A., Rohsenow, W.M., J. Heat Transfer 106(1), 116-123, 1984.

    Churchill, S.W., Chu, H.H.S., Int. J. Heat Mass Transfer 18(11), 1323-1329, 1975.
    """
    S = np.asarray(fin_spacing, dtype=float)
    H = np.asarray(fin_height, dtype=float)
    L = np.asarray(fin_length_vertical, dtype=float)
    t = np.asarray(fin_thickness, dtype=float)
    N = np.asarray(fin_count, dtype=float)
    W = np.asarray(base_width, dtype=float)
    for name, value in (
        ("fin_spacing", S),
        ("fin_height", H),
        ("fin_length_vertical", L),
        ("fin_thickness", t),
        ("base_width", W),
    ):
        if np.any(value <= 0.0):
            raise GeometryError(f"{name} = {np.min(value):.4g} m is not allowed; must be > 0")
    if np.any(N < 2):
        raise GeometryError(f"fin_count = {np.min(N):.4g} is not allowed; must be ≥ 2")
    footprint = N * t + (N - 1.0) * S
    if np.any(footprint > W * (1.0 + 1e-9)):
        raise GeometryError(
            f"fins do not fit: fin_count*fin_thickness + (fin_count-1)*fin_spacing = "
            f"{np.max(footprint):.4g} m exceeds base_width; must be ≤ base_width"
        )

    Ts = np.asarray(surface_temperature, dtype=float)
    Ta = np.asarray(ambient_temperature, dtype=float)
    dT = Ts - Ta
    T_film = 0.5 * (Ts + Ta)
    k = np.asarray(thermal_conductivity, dtype=float)
    nu = np.asarray(dynamic_viscosity, dtype=float) / np.asarray(density, dtype=float)
    alpha = nu / np.asarray(prandtl, dtype=float)

    Ra_S = rayleigh_number(S, dT, T_film, nu, alpha)
    El = Ra_S * S / L
    Nu_S = nusselt_vertical_channel_bar_cohen_rohsenow(El, wall="isothermal-symmetric")
    Ra_L = rayleigh_number(L, dT, T_film, nu, alpha)
    Nu_L = nusselt_vertical_plate_churchill_chu(Ra_L, prandtl, form=outer_face_form)
    S_opt = optimum_fin_spacing_bar_cohen_rohsenow(L, dT, T_film, nu, alpha)
    return PlateFinArrayNatural(
        rayleigh_spacing=Ra_S,
        elenbaas=El,
        nusselt_spacing=Nu_S,
        heat_transfer_coefficient=Nu_S * k / S,
        rayleigh_length=Ra_L,
        nusselt_length=Nu_L,
        outer_face_heat_transfer_coefficient=Nu_L * k / L,
        optimum_spacing=S_opt,
        channel_area=(N - 1.0) * (2.0 * H + S) * L,
        outer_face_area=2.0 * H * L,
    )


def plate_fin_natural_warnings(elenbaas, *, rayleigh_length=None, outer_face_form="laminar"):
    """Validity messages for :func:`plate_fin_array_natural` results (empty when all in range).

    Parameters
    ----------
    elenbaas : float or array_like
        ``PlateFinArrayNatural.elenbaas`` [-].
    rayleigh_length : float or array_like, optional
        ``PlateFinArrayNatural.rayleigh_length`` (Ra on the vertical fin length, not on the
        spacing), checked against the Churchill & Chu range of ``outer_face_form`` [-].
    outer_face_form : {"laminar", "all"}
        The Churchill & Chu form used for the outer faces [-].

    Returns
    -------
    list of str
        One line per quantity outside its range (see :func:`finkit.validity.check_range`).
    """
    messages = check_range(BAR_COHEN_ROHSENOW_RANGE, elenbaas)
    if rayleigh_length is not None:
        rng = CHURCHILL_CHU_ALL_RANGE if outer_face_form == "all" else CHURCHILL_CHU_LAMINAR_RANGE
        messages += check_range(rng, rayleigh_length)
    return messages


class HorizontalFinArrayNatural(NamedTuple):
    """Natural-convection coefficient of a plate-fin array on a horizontal base, fins up.

    Attributes
    ----------
    rayleigh_spacing : numpy.ndarray
        ``Ra_S`` on the clear fin spacing [-].
    nusselt_spacing : numpy.ndarray
        Jones & Smith ``Nu_S`` [-].
    heat_transfer_coefficient : numpy.ndarray
        ``h = Nu_S k / S``, on every convecting surface of the array: fin faces (the end fins'
        outer faces too), fin tips and the base between the fins [W m⁻² K⁻¹].
    """

    rayleigh_spacing: np.ndarray
    nusselt_spacing: np.ndarray
    heat_transfer_coefficient: np.ndarray


def horizontal_fin_array_natural(
    fin_spacing,
    surface_temperature,
    ambient_temperature,
    density,
    dynamic_viscosity,
    thermal_conductivity,
    prandtl,
):
    """Natural-convection coefficient of a plate-fin sink with a horizontal base, fins up.

    Parameters
    ----------
    fin_spacing : float or array_like
        Clear gap between neighbouring fins, S [m].
    surface_temperature : float or array_like
        Base (array) temperature the coefficient is evaluated at; the caller iterates [K].
    ambient_temperature : float or array_like
        Ambient air temperature [K].
    density : float or array_like
        Air density at the film temperature [kg m⁻³].
    dynamic_viscosity : float or array_like
        Air dynamic viscosity at the film temperature [Pa s].
    thermal_conductivity : float or array_like
        Air thermal conductivity at the film temperature [W m⁻¹ K⁻¹].
    prandtl : float or array_like
        Air Prandtl number at the film temperature [-].

    Returns
    -------
    HorizontalFinArrayNatural
        ``Ra_S``, ``Nu_S`` and the coefficient.

    Raises
    ------
    GeometryError
        A non-positive fin spacing.

    Notes
    -----
    ``Ra_S = g beta dT S^3/(nu alpha)`` with ``beta = 1/T_film``, ``nu = mu/rho``,
    ``alpha = nu/Pr``; ``Nu_S`` from :func:`nusselt_horizontal_fin_array_jones_smith`,
    ``h = Nu_S k / S``. Fin efficiency is not applied here (the sink model does it). Validity:
    :data:`JONES_SMITH_RANGE` for ``rayleigh_spacing``.

    References
    ----------
    Jones, C.D., Smith, L.F., J. Heat Transfer 92(1), 6-10, 1970.

    Examples
    --------
    >>> r = horizontal_fin_array_natural(0.010, 353.15, 313.15, 1.09, 1.96e-5, 0.0281, 0.707)
    >>> round(float(r.heat_transfer_coefficient), 1)
    3.3
    """
    S = np.asarray(fin_spacing, dtype=float)
    if np.any(S <= 0.0):
        raise GeometryError(f"fin_spacing = {np.min(S):.4g} m is not allowed; must be > 0")
    Ts = np.asarray(surface_temperature, dtype=float)
    Ta = np.asarray(ambient_temperature, dtype=float)
    nu = np.asarray(dynamic_viscosity, dtype=float) / np.asarray(density, dtype=float)
    alpha = nu / np.asarray(prandtl, dtype=float)
    Ra_S = rayleigh_number(S, Ts - Ta, 0.5 * (Ts + Ta), nu, alpha)
    Nu_S = nusselt_horizontal_fin_array_jones_smith(Ra_S)
    return HorizontalFinArrayNatural(
        rayleigh_spacing=Ra_S,
        nusselt_spacing=Nu_S,
        heat_transfer_coefficient=Nu_S * np.asarray(thermal_conductivity, dtype=float) / S,
    )
