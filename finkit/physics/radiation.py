"""Thermal radiation from heat-sink surfaces to large surroundings.

Surfaces are diffuse and gray with one total hemispherical emissivity; the surroundings are large
(black) at ``surroundings_temperature``. Temperatures are absolute (K) everywhere.

The fin-array model is the envelope method: each channel between two fins is a two-surface
enclosure (the channel walls and the channel openings), and surfaces that see the room directly
(fin tips, end-fin outer faces, base edges) radiate with their own emissivity. The whole sink is
treated as isothermal at one mean surface temperature.
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from finkit.constants import STEFAN_BOLTZMANN
from finkit.errors import GeometryError, InputError

__all__ = [
    "EnvelopeRadiation",
    "PlateFinRadiation",
    "channel_effective_emissivity",
    "envelope_radiation",
    "pin_fin_radiation",
    "plate_fin_radiation",
    "radiation_coefficient_linearised",
]


def _check_emissivity(emissivity):
    e = np.asarray(emissivity, dtype=float)
    if np.any((e < 0.0) | (e > 1.0)):
        bad = e[(e < 0.0) | (e > 1.0)].ravel()[0]
        raise InputError(f"emissivity = {bad:.4g} is not allowed; must be between 0 and 1")
    return e


def _check_temperature(name, value):
    T = np.asarray(value, dtype=float)
    if np.any(T <= 0.0):
        raise InputError(f"{name} = {np.min(T):.4g} K is not allowed; must be > 0 K (absolute)")
    return T


def _four_power_factor(Ts, Tsur):
    """``(Ts + Tsur)(Ts^2 + Tsur^2)``, so that ``Ts^4 - Tsur^4 = factor (Ts - Tsur)``."""
    return (Ts + Tsur) * (Ts**2 + Tsur**2)


def radiation_coefficient_linearised(emissivity, surface_temperature, surroundings_temperature):
    r"""Radiation heat transfer coefficient of a surface in large surroundings.

    Parameters
    ----------
    emissivity : float or array_like
        Total hemispherical emissivity of the surface [-].
    surface_temperature : float or array_like
        Surface temperature, absolute [K].
    surroundings_temperature : float or array_like
        Temperature of the large surroundings, absolute [K].

    Returns
    -------
    numpy.ndarray or float
        ``h_r`` such that ``q'' = h_r (T_s - T_sur)`` exactly [W m⁻² K⁻¹].

    Notes
    -----
    .. math:: h_r = \varepsilon \sigma (T_s + T_{sur})(T_s^2 + T_{sur}^2)

    (Incropera et al., 6th ed., Eq. 1.9). It is exact for the given pair of temperatures; it is
    "linearised" only in that it is then held fixed while other temperatures change.

    References
    ----------
    Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., Fundamentals of Heat and Mass
    Transfer, 6th ed., Wiley, 2007, Section 1.2.3.

    Examples
    --------
    >>> round(float(radiation_coefficient_linearised(1.0, 300.0, 300.0)), 2)
    6.12
    """
    e = _check_emissivity(emissivity)
    Ts = _check_temperature("surface_temperature", surface_temperature)
    Tsur = _check_temperature("surroundings_temperature", surroundings_temperature)
    return e * STEFAN_BOLTZMANN * _four_power_factor(Ts, Tsur)


def channel_effective_emissivity(emissivity, opening_area, wall_area):
    r"""Apparent emissivity of an isothermal gray cavity seen through its opening.

    Parameters
    ----------
    emissivity : float or array_like
        Emissivity of the cavity walls [-].
    opening_area : float or array_like
        Area of the (flat or convex) opening(s), ``A_o`` [m²].
    wall_area : float or array_like
        Area of the isothermal cavity walls, ``A_w ≥ A_o`` [m²].

    Returns
    -------
    numpy.ndarray or float
        ``eps_eff`` such that ``q = eps_eff sigma A_o (T_s^4 - T_sur^4)`` [-].

    Notes
    -----
    Two-surface enclosure (Incropera et al. 6th ed., Section 13.3, Eq. 13.23): the walls (gray,
    ``eps``, ``A_w``) and the openings (black at ``T_sur``, ``A_o``). A flat opening cannot see
    itself, so ``F_ow = 1`` and reciprocity gives ``A_w F_wo = A_o``. The network has the surface
    resistance ``(1-eps)/(eps A_w)`` in series with the space resistance ``1/A_o``:

    .. math:: q = \frac{\sigma (T_s^4 - T_{sur}^4)}{\frac{1-\varepsilon}{\varepsilon A_w}
              + \frac{1}{A_o}},
              \qquad
              \varepsilon_{eff} = \frac{1}{1 + \frac{1-\varepsilon}{\varepsilon}
              \frac{A_o}{A_w}} = \frac{\varepsilon A_w}{\varepsilon A_w + (1-\varepsilon) A_o}

    Limits: ``eps = 1`` gives 1; ``A_o = A_w`` (a flat plate) gives ``eps``; a deep cavity
    ``A_o/A_w -> 0`` gives 1. Assumption: uniform radiosity over the walls, which overestimates the
    exchange of deep, low-emissivity channels (checked here against a discretised radiosity
    solution of a 2-D U-channel: within 4 % for eps ≥ 0.8 and depth/spacing ≤ 10, but up to
    +33 % for eps = 0.1 at depth/spacing = 10). Where several non-coplanar openings see each
    other (channel front and open ends), their mutual view is neglected.

    References
    ----------
    Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., Fundamentals of Heat and Mass
    Transfer, 6th ed., Wiley, 2007, Section 13.3.

    Examples
    --------
    >>> round(float(channel_effective_emissivity(0.8, 0.25, 1.0)), 3)
    0.941
    """
    e = _check_emissivity(emissivity)
    Ao = np.asarray(opening_area, dtype=float)
    Aw = np.asarray(wall_area, dtype=float)
    return e * Aw / (e * Aw + (1.0 - e) * Ao)


class EnvelopeRadiation(NamedTuple):
    """Radiation from an isothermal body through its convex envelope.

    Attributes
    ----------
    heat_rate : numpy.ndarray
        Net radiation to the surroundings [W].
    effective_emissivity : numpy.ndarray
        Apparent emissivity referred to the envelope area [-].
    conductance : numpy.ndarray
        ``heat_rate / (T_s - T_sur)``, finite also at zero difference [W K⁻¹].
    equivalent_heat_transfer_coefficient : numpy.ndarray
        ``conductance / surface_area``: a radiation coefficient to add to the convective one on the
        same (wetted) surface [W m⁻² K⁻¹].
    """

    heat_rate: np.ndarray
    effective_emissivity: np.ndarray
    conductance: np.ndarray
    equivalent_heat_transfer_coefficient: np.ndarray


def envelope_radiation(
    emissivity, surface_area, envelope_area, surface_temperature, surroundings_temperature
):
    r"""Radiation from an isothermal gray body to large surroundings through its convex envelope.

    Parameters
    ----------
    emissivity : float or array_like
        Emissivity of the body surface [-].
    surface_area : float or array_like
        Whole radiating surface of the body (pins, tips, exposed base) [m²].
    envelope_area : float or array_like
        Area of the convex envelope (shrink-wrap) of the body that faces the surroundings [m²].
    surface_temperature : float or array_like
        Uniform surface temperature, absolute [K].
    surroundings_temperature : float or array_like
        Temperature of the large surroundings, absolute [K].

    Returns
    -------
    EnvelopeRadiation
        Heat rate, apparent emissivity, conductance and equivalent coefficient.

    Notes
    -----
    All radiation that leaves the body for the surroundings crosses its convex envelope, and a
    convex surface does not see itself, so body and envelope form the two-surface enclosure of
    :func:`channel_effective_emissivity` with ``A_o = envelope_area``, ``A_w = surface_area``:
    ``q = eps_eff sigma A_env (T_s^4 - T_sur^4)``. For a convex body (``A_w = A_env``) it reduces
    to ``eps sigma A (T_s^4 - T_sur^4)``. Same assumptions (isothermal, uniform radiosity), so it is
    an upper estimate for low emissivity. If the given envelope is larger than the surface (e.g. a
    box around a few sparse pins, which is then not the convex hull), the exchange is capped at
    the unshaded value ``eps sigma A_w (T_s^4 - T_sur^4)``, the most a gray body can emit net.

    References
    ----------
    Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., Fundamentals of Heat and Mass
    Transfer, 6th ed., Wiley, 2007, Section 13.3.
    """
    e = _check_emissivity(emissivity)
    Ts = _check_temperature("surface_temperature", surface_temperature)
    Tsur = _check_temperature("surroundings_temperature", surroundings_temperature)
    Aw = np.asarray(surface_area, dtype=float)
    Ae = np.asarray(envelope_area, dtype=float)
    # An envelope larger than the surface is not the convex hull (sparse pins): cap the exchange
    # at the unshaded surface, eps sigma A_w (T_s^4 - T_sur^4), the upper limit for a gray body.
    Ao = np.minimum(Ae, Aw)
    eps_eff = channel_effective_emissivity(e, Ao, Aw) * Ao / Ae
    conductance = eps_eff * STEFAN_BOLTZMANN * Ae * _four_power_factor(Ts, Tsur)
    return EnvelopeRadiation(
        heat_rate=conductance * (Ts - Tsur),
        effective_emissivity=eps_eff,
        conductance=conductance,
        equivalent_heat_transfer_coefficient=conductance / Aw,
    )


class PlateFinRadiation(NamedTuple):
    """Radiation from a plate-fin heat sink (envelope method).

    Attributes
    ----------
    heat_rate : numpy.ndarray
        Net radiation to the surroundings [W].
    effective_emissivity : numpy.ndarray
        Apparent emissivity of one channel, referred to its openings [-].
    opening_area : numpy.ndarray
        Total opening area of all channels [m²].
    wall_area : numpy.ndarray
        Total wall area of all channels (fin faces that face a neighbour, base between fins) [m²].
    outer_area : numpy.ndarray
        Surfaces that see the room directly: fin tips, end-fin outer faces, base edges, base front
        outside the fins, fin end edges (open ends), and the back if included [m²].
    radiating_area : numpy.ndarray
        ``wall_area + outer_area``: the whole radiating (and wetted) surface [m²].
    conductance : numpy.ndarray
        ``heat_rate / (T_s - T_sur)``, finite also at zero difference [W K⁻¹].
    equivalent_heat_transfer_coefficient : numpy.ndarray
        ``conductance / radiating_area``: referred to the total radiating surface, so it can be
        added to the convective coefficient on the same surface [W m⁻² K⁻¹].
    """

    heat_rate: np.ndarray
    effective_emissivity: np.ndarray
    opening_area: np.ndarray
    wall_area: np.ndarray
    outer_area: np.ndarray
    radiating_area: np.ndarray
    conductance: np.ndarray
    equivalent_heat_transfer_coefficient: np.ndarray


def plate_fin_radiation(
    fin_spacing,
    fin_height,
    fin_length,
    fin_thickness,
    fin_count,
    base_width,
    base_length,
    base_thickness,
    emissivity,
    surface_temperature,
    surroundings_temperature,
    has_open_ends=True,
    include_back=False,
):
    r"""Radiation from an isothermal plate-fin heat sink to large surroundings (envelope method).

    Parameters
    ----------
    fin_spacing : float or array_like
        Clear gap between fins, S [m].
    fin_height : float or array_like
        Fin height from base to tip, H [m].
    fin_length : float or array_like
        Fin length along the channel, L [m].
    fin_thickness : float or array_like
        Fin thickness, t [m].
    fin_count : int or array_like
        Number of fins, N ≥ 2 [-].
    base_width : float or array_like
        Base width across the fins, W ≥ N t + (N-1) S [m].
    base_length : float or array_like
        Base length along the channels, ``L_b ≥ L`` [m].
    base_thickness : float or array_like
        Base thickness [m].
    emissivity : float or array_like
        Surface emissivity (one finish for the whole sink) [-].
    surface_temperature : float or array_like
        Mean surface temperature of the (isothermal) sink, absolute [K].
    surroundings_temperature : float or array_like
        Temperature of the large surroundings, absolute [K].
    has_open_ends : bool
        True when both channel ends are open to the room (the usual case; in natural convection
        with vertical fins both ends are open). Adds the two end openings ``2 S H`` per channel and
        the fin end edges ``2 N t H`` [-].
    include_back : bool
        True when the back of the base sees the room (not mounted on a board or wall) [-].

    Returns
    -------
    PlateFinRadiation
        Heat rate, apparent channel emissivity, the areas used, conductance and the equivalent
        coefficient referred to the radiating surface.

    Raises
    ------
    GeometryError
        Non-positive dimensions, fewer than two fins, fins wider than the base, or fins longer than
        the base.

    Notes
    -----
    Envelope method (docs/methods.md g3), per channel ``A_w = (2H + S) L`` and
    ``A_o = S L (+ 2 S H if the ends are open)``, ``eps_eff`` from
    :func:`channel_effective_emissivity`:

    .. math:: Q = \sigma (T_s^4 - T_{sur}^4) \left[\varepsilon_{eff} (N-1) A_o
              + \varepsilon A_{outer}\right]

    ``A_outer = N t L`` (tips) ``+ 2 H L`` (end-fin outer faces) ``+ 2 t_b (W + L_b)`` (base
    edges) ``+ W L_b - (N t + (N-1) S) L`` (base front outside the fins) ``+ 2 N t H`` (fin end
    edges, open ends) ``+ W L_b`` (back, if included). Fin-to-fin shading is inside ``eps_eff``;
    the sink is isothermal at the given mean temperature, so fin efficiency is not applied to
    radiation. The view between a channel's front opening and its end openings is neglected.
    Rea & West (1976) is the usual reference for radiation from fin arrays (cited as recalled in
    docs/methods.md g3, not checked here); their data are not reproduced. The channel formula
    itself was derived here and checked against a discretised radiosity solution (see
    :func:`channel_effective_emissivity`).

    References
    ----------
    Rea, S.N., West, S.E., "Thermal radiation from finned heat sinks", IEEE Transactions on Parts,
    Hybrids, and Packaging 12(2), 1976.

    Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., Fundamentals of Heat and Mass
    Transfer, 6th ed., Wiley, 2007, Sections 13.1-13.3.
    """
    S = np.asarray(fin_spacing, dtype=float)
    H = np.asarray(fin_height, dtype=float)
    L = np.asarray(fin_length, dtype=float)
    t = np.asarray(fin_thickness, dtype=float)
    N = np.asarray(fin_count, dtype=float)
    W = np.asarray(base_width, dtype=float)
    Lb = np.asarray(base_length, dtype=float)
    tb = np.asarray(base_thickness, dtype=float)
    for name, value in (
        ("fin_spacing", S),
        ("fin_height", H),
        ("fin_length", L),
        ("fin_thickness", t),
        ("base_width", W),
        ("base_length", Lb),
    ):
        if np.any(value <= 0.0):
            raise GeometryError(f"{name} = {np.min(value):.4g} m is not allowed; must be > 0")
    if np.any(tb < 0.0):
        raise GeometryError(f"base_thickness = {np.min(tb):.4g} m is not allowed; must be ≥ 0")
    if np.any(N < 2):
        raise GeometryError(f"fin_count = {np.min(N):.4g} is not allowed; must be ≥ 2")
    footprint_width = N * t + (N - 1.0) * S
    if np.any(footprint_width > W * (1.0 + 1e-9)):
        raise GeometryError(
            f"fins do not fit: fin_count*fin_thickness + (fin_count-1)*fin_spacing = "
            f"{np.max(footprint_width):.4g} m exceeds base_width; must be ≤ base_width"
        )
    if np.any(L > Lb * (1.0 + 1e-9)):
        raise GeometryError(
            f"fin_length = {np.max(L):.4g} m exceeds base_length; must be ≤ base_length"
        )
    e = _check_emissivity(emissivity)
    Ts = _check_temperature("surface_temperature", surface_temperature)
    Tsur = _check_temperature("surroundings_temperature", surroundings_temperature)

    open_ends = 1.0 if has_open_ends else 0.0
    back = 1.0 if include_back else 0.0
    channel_count = N - 1.0
    wall_one = (2.0 * H + S) * L
    opening_one = S * L + open_ends * 2.0 * S * H
    eps_eff = channel_effective_emissivity(e, opening_one, wall_one)
    outer = (
        N * t * L
        + 2.0 * H * L
        + 2.0 * tb * (W + Lb)
        + np.maximum(W * Lb - footprint_width * L, 0.0)
        + open_ends * 2.0 * N * t * H
        + back * W * Lb
    )
    wall = channel_count * wall_one
    opening = channel_count * opening_one
    conductance = STEFAN_BOLTZMANN * _four_power_factor(Ts, Tsur) * (eps_eff * opening + e * outer)
    radiating = wall + outer
    return PlateFinRadiation(
        heat_rate=conductance * (Ts - Tsur),
        effective_emissivity=eps_eff,
        opening_area=opening,
        wall_area=wall,
        outer_area=outer,
        radiating_area=radiating,
        conductance=conductance,
        equivalent_heat_transfer_coefficient=conductance / radiating,
    )


def pin_fin_radiation(
    surface_area,
    base_width,
    base_length,
    pin_height,
    base_thickness,
    emissivity,
    surface_temperature,
    surroundings_temperature,
    include_back=False,
):
    r"""Radiation from an isothermal pin-fin heat sink, by its box-shaped convex envelope.

    Parameters
    ----------
    surface_area : float or array_like
        Whole exposed sink surface: pin sides and tips, base front between pins, base edges (and
        the back if ``include_back``) [m²].
    base_width : float or array_like
        Base width [m].
    base_length : float or array_like
        Base length [m].
    pin_height : float or array_like
        Pin height from base to tip [m].
    base_thickness : float or array_like
        Base thickness [m].
    emissivity : float or array_like
        Surface emissivity [-].
    surface_temperature : float or array_like
        Mean surface temperature of the (isothermal) sink, absolute [K].
    surroundings_temperature : float or array_like
        Temperature of the large surroundings, absolute [K].
    include_back : bool
        True when the back of the base sees the room [-].

    Returns
    -------
    EnvelopeRadiation
        Heat rate, apparent emissivity (referred to the envelope), conductance and the equivalent
        coefficient referred to ``surface_area``.

    Notes
    -----
    The envelope is the box ``W x L_b x (t_b + H)``: top ``W L_b``, four sides
    ``2 (t_b + H)(W + L_b)``, and the back ``W L_b`` if included. Pins that stand back from the
    base edge leave the envelope slightly non-convex at the corners; that is neglected. See
    :func:`envelope_radiation` for the method, its assumptions and the cap for sparse pins.
    This is an estimate by the same two-surface reasoning as the plate-fin channels; no published
    pin-fin radiation data were used to check it.
    """
    W = np.asarray(base_width, dtype=float)
    Lb = np.asarray(base_length, dtype=float)
    H = np.asarray(pin_height, dtype=float)
    tb = np.asarray(base_thickness, dtype=float)
    back = 1.0 if include_back else 0.0
    envelope = (1.0 + back) * W * Lb + 2.0 * (tb + H) * (W + Lb)
    for name, value in (
        ("base_width", W),
        ("base_length", Lb),
        ("pin_height", H),
        ("surface_area", np.asarray(surface_area, dtype=float)),
    ):
        if np.any(value <= 0.0):
            raise GeometryError(f"{name} = {np.min(value):.4g} is not allowed; must be > 0")
    return envelope_radiation(
        emissivity, surface_area, envelope, surface_temperature, surroundings_temperature
    )
