"""Plate-fin channels in forced flow: friction (Fanning) and the entrance and exit losses."""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from finkit.errors import GeometryError, InputError
from finkit.physics.correlations.forced.plate_heat import (
    nusselt_plate_channel_teertstra,
    nusselt_plate_channel_vdi,
)
from finkit.physics.correlations.forced.validity import (
    LAMINAR_LIMIT_REYNOLDS,
    LOSS_MODELS,
    PLATE_CHANNEL_METHODS,
    _as_float,
    _check_choice,
)

__all__ = [
    "LossCoefficients",
    "PlateChannelFlow",
    "contraction_ratio_rennels",
    "fanning_friction_apparent_rectangular",
    "fanning_friction_rectangular_channel",
    "fanning_friction_smooth_duct_konakov",
    "friction_reynolds_rectangular_shah_london",
    "loss_coefficients",
    "loss_coefficients_culham_muzychka",
    "loss_coefficients_kays_london",
    "plate_fin_channel_flow",
    "plate_fin_channel_pressure_drop",
    "pressure_drop_channel",
]


# --------------------------------------------------------------------------------------------
# Plate-fin channels: friction and losses (Fanning)
# --------------------------------------------------------------------------------------------
def friction_reynolds_rectangular_shah_london(aspect_ratio):
    r"""Fully developed laminar ``f Re_Dh`` (Fanning) of a rectangular duct, Shah & London fit.

    Parameters
    ----------
    aspect_ratio : float or array_like
        Side ratio of the duct; values > 1 are inverted, so short/long or long/short both work
        [-]. 0 means parallel plates.

    Returns
    -------
    numpy.ndarray
        Poiseuille number ``f Re_Dh`` with the Fanning friction factor [-]: 24 for parallel
        plates, 14.23 for a square duct.

    Notes
    -----
    .. math::
        f Re = 24\,(1 - 1.3553\alpha + 1.9467\alpha^2 - 1.7012\alpha^3 + 0.9564\alpha^4
        - 0.2537\alpha^5)

    within 0.06 % of the exact series for ``alpha = 0.01 ... 1`` (docs/methods.md e3, checked there
    numerically; the tests check it against the series again).

    References
    ----------
    .. [1] Shah, R.K., London, A.L., Laminar Flow Forced Convection in Ducts, Academic Press,
       1978.
    """
    a = _as_float(aspect_ratio)
    a = np.where(a > 1.0, 1.0 / np.where(a > 1.0, a, 1.0), a)
    return 24.0 * (1.0 - 1.3553 * a + 1.9467 * a**2 - 1.7012 * a**3 + 0.9564 * a**4 - 0.2537 * a**5)


def fanning_friction_apparent_rectangular(
    reynolds_hydraulic, aspect_ratio, length, hydraulic_diameter
):
    r"""Apparent (developing-flow) Fanning friction factor of a laminar rectangular duct.

    Parameters
    ----------
    reynolds_hydraulic : float or array_like
        Reynolds number on the hydraulic diameter (> 0) [-].
    aspect_ratio : float or array_like
        Duct side ratio (see :func:`friction_reynolds_rectangular_shah_london`) [-].
    length : float or array_like
        Duct length [m].
    hydraulic_diameter : float or array_like
        Hydraulic diameter [m].

    Returns
    -------
    numpy.ndarray
        Apparent Fanning friction factor ``f_app`` (``f_Darcy = 4 f``) [-]; it includes the
        incremental pressure drop of the developing velocity profile.

    Notes
    -----
    Composite of the short-duct asymptote and the fully developed value (docs/methods.md e3):

    .. math::
        f_{app} Re = \sqrt{\left(\frac{3.44}{\sqrt{L^*}}\right)^2 + (f Re)^2},
        \qquad L^* = \frac{L}{D_h Re}

    The 3.44 coefficient is that of Shah's (1978) developing-flow correlation; the composite
    form is the one of Muzychka & Yovanovich. Confirmed in open implementations of plate-fin
    heat-sink models (the coefficient and form agree); not checked against the originals.

    References
    ----------
    .. [1] Shah, R.K., "A correlation for laminar hydrodynamic entry length solutions for
       circular and noncircular ducts", J. Fluids Eng. 100, 177-179, 1978.
    .. [2] Muzychka, Y.S., Yovanovich, M.M., "Pressure drop in laminar developing flow in
       noncircular ducts: a scaling and modeling approach", J. Fluids Eng. 131(11), 111105, 2009.
    """
    re = _as_float(reynolds_hydraulic)
    return _apparent_poiseuille(re, aspect_ratio, length, hydraulic_diameter) / re


def _apparent_poiseuille(reynolds, aspect_ratio, length, hydraulic_diameter):
    """``f_app Re`` (finite at Re = 0, where it equals the fully developed value)."""
    inverse_lstar = _as_float(hydraulic_diameter) * reynolds / length  # 1/L*
    return np.sqrt(
        3.44**2 * inverse_lstar + friction_reynolds_rectangular_shah_london(aspect_ratio) ** 2
    )


def fanning_friction_smooth_duct_konakov(reynolds_hydraulic):
    r"""Fully developed turbulent Fanning friction factor of a smooth duct (Konakov).

    Parameters
    ----------
    reynolds_hydraulic : float or array_like
        Reynolds number on the hydraulic diameter [-].

    Returns
    -------
    numpy.ndarray
        Fanning friction factor ``f = xi / 4`` with ``xi = (1.8 log10 Re - 1.5)^-2`` (Darcy) [-].

    Notes
    -----
    Valid for ``1e4 <= Re <= 1e6`` as a smooth-tube law (VDI Ga 5, eq. 27); the tests compare it
    with ``fluids.friction.friction_factor`` (Clamond, smooth; Darcy) within 3 %.

    References
    ----------
    .. [1] Konakov, P.K., "A new correlation for the friction coefficient in smooth tubes",
       Berichte der Akademie der Wissenschaften der UdSSR 51, 503-506, 1946 (as in
       VDI-Wärmeatlas, 9th ed., 2002, sec. Ga 5).
    """
    re = _as_float(reynolds_hydraulic)
    return 0.25 * (1.8 * np.log10(re) - 1.5) ** -2


def fanning_friction_rectangular_channel(
    reynolds_hydraulic, aspect_ratio, length, hydraulic_diameter
):
    r"""Fanning friction factor of a fin channel over laminar and turbulent flow.

    Parameters
    ----------
    reynolds_hydraulic : float or array_like
        Reynolds number on the hydraulic diameter (> 0) [-].
    aspect_ratio : float or array_like
        Channel side ratio [-].
    length : float or array_like
        Channel length [m].
    hydraulic_diameter : float or array_like
        Hydraulic diameter [m].

    Returns
    -------
    numpy.ndarray
        Fanning friction factor [-]: the laminar apparent value for ``Re <= 2300``; above, the
        larger of the laminar apparent and the turbulent (Konakov) values.

    Notes
    -----
    Taking the larger value above 2300 keeps the pressure drop continuous and rising with flow
    through the transition, where a short developing channel still behaves laminar-like; it is
    a choice of finkit (common practice, no source), flagged by
    :data:`PLATE_CHANNEL_FRICTION_REYNOLDS` for ``2300 < Re_Dh < 1e4``.
    """
    re = _as_float(reynolds_hydraulic)
    return _channel_poiseuille(re, aspect_ratio, length, hydraulic_diameter) / re


def _channel_poiseuille(reynolds, aspect_ratio, length, hydraulic_diameter):
    laminar = _apparent_poiseuille(reynolds, aspect_ratio, length, hydraulic_diameter)
    re_t = np.maximum(reynolds, LAMINAR_LIMIT_REYNOLDS)
    turbulent = fanning_friction_smooth_duct_konakov(re_t) * re_t
    return np.where(reynolds > LAMINAR_LIMIT_REYNOLDS, np.maximum(laminar, turbulent), laminar)


class LossCoefficients(NamedTuple):
    """Entrance and exit loss coefficients, both on the channel dynamic pressure."""

    #: Contraction (entrance) loss coefficient K_c [-].
    contraction: np.ndarray
    #: Expansion (exit) loss coefficient K_e [-].
    expansion: np.ndarray


def contraction_ratio_rennels(open_area_ratio):
    r"""Jet contraction ratio C_c of a sharp-edged contraction (Rennels & Hudson fit).

    Parameters
    ----------
    open_area_ratio : float or array_like
        Small over large flow area sigma (0 < sigma <= 1) [-].

    Returns
    -------
    numpy.ndarray
        ``C_c = 1 / lambda`` with ``lambda = 1 + 0.622 (1 - 0.215 sigma - 0.785 sigma^2.5)`` [-].

    Notes
    -----
    Rennels' sharp contraction loss is ``K = 0.0696 (1 - beta^5) lambda^2 + (lambda - 1)^2``
    with ``beta^2 = sigma``; its second term is the Borda-Carnot loss of the vena contracta,
    ``(1/C_c - 1)^2``. The tests confirm lambda against ``fluids.fittings.contraction_sharp``.
    Used as a numeric substitute for the C_c chart of Kays & London (docs/methods.md e4).

    References
    ----------
    .. [1] Rennels, D.C., Hudson, H.M., Pipe Flow: A Practical and Comprehensive Guide, Wiley,
       2012.
    """
    s = _as_float(open_area_ratio)
    lam = 1.0 + 0.622 * (1.0 - 0.215 * s - 0.785 * s**2.5)
    return 1.0 / lam


def loss_coefficients_kays_london(open_area_ratio, momentum_coefficient=1.0):
    r"""Entrance and exit loss coefficients from the Kays & London momentum balances.

    Parameters
    ----------
    open_area_ratio : float or array_like
        Open over frontal area sigma of the fin region [-].
    momentum_coefficient : float or array_like, optional
        Momentum-flux coefficient K_d of the channel velocity profile, mean of (u/u_mean)^2 [-]:
        1 for a uniform profile (default; with the apparent friction factor, which already
        carries the profile development, this avoids counting it twice), 1.2 for fully developed
        laminar flow between parallel plates.

    Returns
    -------
    LossCoefficients
        ``contraction`` K_c and ``expansion`` K_e on the channel dynamic pressure [-].

    Notes
    -----
    .. math::
        K_c = \frac{1 - 2C_c + C_c^2 (2K_d - 1)}{C_c^2}, \qquad K_e = 1 - 2K_d\sigma + \sigma^2

    with C_c from :func:`contraction_ratio_rennels`. With ``K_d = 1`` the exit loss is the
    Borda-Carnot loss ``(1 - sigma)^2`` (tests: equal to ``fluids.fittings.diffuser_sharp``).
    Derived from Bernoulli and momentum balances (docs/methods.md e4).

    References
    ----------
    .. [1] Kays, W.M., London, A.L., Compact Heat Exchangers, 3rd ed., McGraw-Hill, 1984, ch. 5.
    """
    s = _as_float(open_area_ratio)
    kd = _as_float(momentum_coefficient)
    cc = contraction_ratio_rennels(s)
    kc = (1.0 - 2.0 * cc + cc**2 * (2.0 * kd - 1.0)) / cc**2
    ke = 1.0 - 2.0 * kd * s + s**2
    return LossCoefficients(contraction=kc, expansion=ke)


def loss_coefficients_culham_muzychka(open_area_ratio):
    r"""Entrance and exit loss coefficients, the simple fits of plate-fin heat-sink models.

    Parameters
    ----------
    open_area_ratio : float or array_like
        Open over frontal area sigma of the fin region [-].

    Returns
    -------
    LossCoefficients
        ``K_c = 0.42 (1 - sigma^2)`` and ``K_e = (1 - sigma^2)^2`` [-].

    Notes
    -----
    More conservative than Borda-Carnot. The form is recalled from the paper below (docs/methods.md
    e4, tagged [R]) and agrees with several open plate-fin heat-sink models; not checked against
    the original.

    References
    ----------
    .. [1] Culham, J.R., Muzychka, Y.S., "Optimization of plate fin heat sinks using entropy
       generation minimization", IEEE Trans. Comp. Pack. Technol. 24(2), 159-165, 2001.
    """
    s2 = _as_float(open_area_ratio) ** 2
    return LossCoefficients(contraction=0.42 * (1.0 - s2), expansion=(1.0 - s2) ** 2)


def loss_coefficients(open_area_ratio, model="kays_london", momentum_coefficient=1.0):
    """Entrance and exit loss coefficients by named model (one of :data:`LOSS_MODELS`).

    Parameters
    ----------
    open_area_ratio : float or array_like
        Open over frontal area sigma [-].
    model : str, optional
        ``"kays_london"`` (default) or ``"culham_muzychka"`` [-].
    momentum_coefficient : float or array_like, optional
        K_d for ``"kays_london"`` (ignored otherwise) [-].

    Returns
    -------
    LossCoefficients
        K_c and K_e [-].
    """
    _check_choice("loss_model", model, LOSS_MODELS)
    if model == "kays_london":
        return loss_coefficients_kays_london(open_area_ratio, momentum_coefficient)
    return loss_coefficients_culham_muzychka(open_area_ratio)


def pressure_drop_channel(
    fanning_friction_apparent,
    length,
    hydraulic_diameter,
    contraction_coefficient,
    expansion_coefficient,
    density,
    channel_velocity,
):
    r"""Static pressure drop across a fin channel (docs/methods.md e5).

    Parameters
    ----------
    fanning_friction_apparent : float or array_like
        Apparent Fanning friction factor [-].
    length : float or array_like
        Channel length [m].
    hydraulic_diameter : float or array_like
        Hydraulic diameter [m].
    contraction_coefficient : float or array_like
        Entrance loss K_c [-].
    expansion_coefficient : float or array_like
        Exit loss K_e [-].
    density : float or array_like
        Air density [kg m⁻³].
    channel_velocity : float or array_like
        Mean velocity in the channel [m s⁻¹].

    Returns
    -------
    numpy.ndarray
        ``dp = [K_c + 4 f_app L / D_h + K_e] rho V_ch^2 / 2`` [Pa].
    """
    q = 0.5 * _as_float(density) * _as_float(channel_velocity) ** 2
    return (
        _as_float(contraction_coefficient)
        + 4.0 * _as_float(fanning_friction_apparent) * _as_float(length) / hydraulic_diameter
        + expansion_coefficient
    ) * q


class PlateChannelFlow(NamedTuple):
    """Flow, heat transfer and pressure drop of a plate-fin channel array (all arrays)."""

    #: Approach velocity on the fin-region frontal area W H [m s⁻¹].
    approach_velocity: np.ndarray
    #: Mean velocity between fins, approach velocity / sigma [m s⁻¹].
    channel_velocity: np.ndarray
    #: Channel Reynolds number on the fin spacing, ``Re_b = V_ch b / nu`` [-].
    reynolds_spacing: np.ndarray
    #: Modified channel Reynolds number ``Re_b* = Re_b b / L`` [-].
    modified_reynolds: np.ndarray
    #: Reynolds number on the channel hydraulic diameter (shrouded or open-top) [-].
    reynolds_hydraulic: np.ndarray
    #: Nusselt number on the fin spacing ``h b / k`` [-].
    nusselt: np.ndarray
    #: Channel-average heat transfer coefficient [W m⁻² K⁻¹] (reference: is_inlet_referenced).
    heat_transfer_coefficient: np.ndarray
    #: Apparent Fanning friction factor (NaN at zero flow) [-].
    fanning_friction_apparent: np.ndarray
    #: Friction part of the pressure drop [Pa].
    pressure_drop_friction: np.ndarray
    #: Entrance (contraction) loss [Pa].
    pressure_drop_contraction: np.ndarray
    #: Exit (expansion) loss [Pa] (negative if K_e < 0: pressure recovery).
    pressure_drop_expansion: np.ndarray
    #: Total static pressure drop [Pa].
    pressure_drop: np.ndarray
    #: Re_Dh > 2300 (friction regime) [-].
    is_turbulent: np.ndarray
    #: True where h is referred to the inlet air temperature (Teertstra), False where it is
    #: bulk-referenced (VDI) and needs ε-NTU [-].
    is_inlet_referenced: np.ndarray
    #: Open-area ratio sigma = (N - 1) b / W [-].
    open_area_ratio: np.ndarray
    #: Channel hydraulic diameter used for friction [m].
    hydraulic_diameter: np.ndarray
    #: Prandtl number (kept for the validity checks) [-].
    prandtl: np.ndarray
    #: Heat-transfer method used ("teertstra" or "vdi").
    method: str
    #: Entrance/exit loss model used.
    loss_model: str
    #: Reynolds number on the channel length ``V_ch L / nu`` (boundary-layer development) [-].
    reynolds_length: np.ndarray
    #: Laminar hydrodynamic entry length ``0.05 Re_Dh D_h`` [m].
    entry_length: np.ndarray
    #: Channel length L along the flow [m].
    channel_length: np.ndarray


def plate_fin_channel_flow(
    volume_flow,
    base_width,
    fin_count,
    fin_thickness,
    fin_height,
    fin_length,
    density,
    dynamic_viscosity,
    thermal_conductivity,
    prandtl,
    is_shrouded=True,
    method="teertstra",
    loss_model="kays_london",
    momentum_coefficient=1.0,
):
    r"""Velocities, Reynolds numbers, h and pressure drop of a plate-fin heat sink's channels.

    Parameters
    ----------
    volume_flow : float or array_like
        Volume flow THROUGH the fin channels (after any bypass) [m³ s⁻¹]; >= 0.
    base_width : float or array_like
        Base width W across the flow [m].
    fin_count : float or array_like
        Number of fins N (>= 2) [-].
    fin_thickness : float or array_like
        Fin thickness t [m].
    fin_height : float or array_like
        Fin height H [m].
    fin_length : float or array_like
        Fin (channel) length L along the flow [m].
    density : float or array_like
        Air density [kg m⁻³].
    dynamic_viscosity : float or array_like
        Air dynamic viscosity [Pa s].
    thermal_conductivity : float or array_like
        Air thermal conductivity [W m⁻¹ K⁻¹].
    prandtl : float or array_like
        Air Prandtl number [-].
    is_shrouded : bool or array_like, optional
        True: a duct wall touches the fin tips (four wetted walls); False: open top (three) [-].
    method : str, optional
        Heat-transfer model, one of :data:`PLATE_CHANNEL_METHODS` [-]:
        ``"teertstra"`` (default; laminar developing flow, inlet-referenced, at every Reynolds
        number) or ``"vdi"`` (VDI plane gap over all regimes: laminar developing, the
        transition interpolation and Gnielinski turbulent, bulk-referenced). The heat-sink
        solver's default takes the lower of the two at the sink level
        (``finkit.physics.sink.ModelOptions``).
    loss_model : str, optional
        Entrance/exit loss model, one of :data:`LOSS_MODELS` [-].
    momentum_coefficient : float or array_like, optional
        K_d of the Kays & London loss model (1 = uniform profile, Borda-Carnot exit) [-].

    Returns
    -------
    PlateChannelFlow
        See the field descriptions; ``heat_transfer_coefficient`` is a channel average for the
        fin faces and the exposed base.

    Notes
    -----
    Definitions (docs/methods.md e1): ``b = (W - N t)/(N - 1)``; ``sigma = (N - 1) b / W``;
    approach velocity ``V_app = Q / (W H)`` (fin-region frontal area; base plate outside the
    flow); ``V_ch = V_app / sigma`` (mass conservation, exact); ``Re_b = V_ch b / nu``;
    ``Re_b* = Re_b b / L``; ``D_h = 2 b H / (b + H)`` shrouded, ``4 b H / (b + 2 H)`` open-top
    (the open top is treated as a symmetry plane of a ``b x 2H`` duct, so the friction aspect ratio
    is ``b / 2H``); ``Re_Dh = V_ch D_h / nu``.

    Reference temperature (docs/methods.md e2, j): with ``method="teertstra"`` h is referred to the
    **inlet** air temperature where ``is_inlet_referenced`` is True: use ``R = 1/(eta_o h A)``
    with no caloric term. Where it is False (VDI: laminar gap, transition, Gnielinski turbulent)
    h is referred to the mean (logarithmic) temperature difference: use the isothermal-base
    ε-NTU form ``Q = (1 - exp(-NTU)) m_dot c_p (T_b - T_in)``, ``NTU = eta_o h A/(m_dot c_p)``.
    Neither model switches to the other: each is continuous in the flow.

    Transition (one criterion, ``Re_Dh``, for friction and for the warnings of
    :func:`plate_fin_flow_warnings`): above ``Re_Dh = 2300`` flow in a long channel may become
    transitional, but a heat-sink channel is usually far shorter than the laminar entry length
    ``0.05 Re_Dh D_h`` (Incropera et al. 6th ed., Eq. 8.3), with boundary layers still laminar
    (``Re_L = V_ch L / nu`` of order 1e4, below the flat-plate transition of about 5e5,
    Incropera Eq. 7.29 ff.); an upstream fan may still trip them. The laminar-developing model
    (Teertstra) and the transitional model (VDI) therefore bracket h there; the heat-sink
    solver takes the lower. Inside the VDI correlation its own published Reynolds number
    ``Re_2b`` (on the plane-gap hydraulic diameter 2b) is kept.

    Pressure drop (docs/methods.md e3-e5): ``dp = [K_c + 4 f_app L / D_h + K_e] rho V_ch^2 / 2``
    with :func:`fanning_friction_rectangular_channel` and :func:`loss_coefficients`. At zero flow
    every pressure drop and h (Teertstra) is 0.

    Raises
    ------
    InputError
        Unknown ``method``/``loss_model``, or negative ``volume_flow``.
    GeometryError
        Fins that do not fit (``b <= 0``).
    """
    # The channels' hydraulics (velocities, Reynolds numbers, pressure drop) are those of
    # plate_fin_channel_pressure_drop; the heat transfer shares their Reynolds numbers.
    _check_choice("method", method, PLATE_CHANNEL_METHODS)
    sink = (base_width, fin_count, fin_thickness, fin_height, fin_length)
    air = (density, dynamic_viscosity)
    flow = _channel_hydraulics(
        volume_flow, *sink, *air, is_shrouded, loss_model, momentum_coefficient
    )
    b, length, re_b, re_dh, nu_kin = flow.b, flow.length, flow.re_b, flow.re_dh, flow.nu_kin
    v_ch, approach, dp, poiseuille = flow.v_ch, flow.approach, flow.dp, flow.poiseuille
    k_air = _as_float(thermal_conductivity)
    pr = _as_float(prandtl)
    re_star = re_b * b / length

    # Heat transfer
    if method == "teertstra":
        h = nusselt_plate_channel_teertstra(re_star, pr) * k_air / b
        inlet_ref = np.ones(np.shape(h), dtype=bool)
    else:
        re_gap = 2.0 * re_b
        nu_vdi_2b = nusselt_plate_channel_vdi(re_gap, pr, 2.0 * b, length)
        h = nu_vdi_2b * k_air / (2.0 * b)
        inlet_ref = np.zeros(np.shape(h), dtype=bool)

    with np.errstate(divide="ignore", invalid="ignore"):
        f_app = np.where(re_dh > 0, poiseuille / np.where(re_dh > 0, re_dh, 1.0), np.nan)
    d_h, sigma = flow.d_h, flow.sigma

    shape = np.broadcast_shapes(
        np.shape(h), np.shape(dp), np.shape(approach), np.shape(pr), np.shape(inlet_ref)
    )

    def full(x):
        return np.broadcast_to(x, shape).copy() if shape else np.asarray(x)

    return PlateChannelFlow(
        approach_velocity=full(approach),
        channel_velocity=full(v_ch),
        reynolds_spacing=full(re_b),
        modified_reynolds=full(re_star),
        reynolds_hydraulic=full(re_dh),
        nusselt=full(h * b / k_air),
        heat_transfer_coefficient=full(h),
        fanning_friction_apparent=full(f_app),
        pressure_drop_friction=full(flow.dp_friction),
        pressure_drop_contraction=full(flow.dp_c),
        pressure_drop_expansion=full(flow.dp_e),
        pressure_drop=full(dp),
        is_turbulent=full(re_dh > LAMINAR_LIMIT_REYNOLDS),
        is_inlet_referenced=full(inlet_ref),
        open_area_ratio=full(sigma),
        hydraulic_diameter=full(d_h),
        prandtl=full(pr),
        method=method,
        loss_model=loss_model,
        reynolds_length=full(v_ch * length / nu_kin),
        entry_length=full(0.05 * re_dh * d_h),
        channel_length=full(length),
    )


def plate_fin_channel_pressure_drop(
    volume_flow,
    base_width,
    fin_count,
    fin_thickness,
    fin_height,
    fin_length,
    density,
    dynamic_viscosity,
    is_shrouded=True,
    loss_model="kays_london",
    momentum_coefficient=1.0,
):
    """Static pressure drop of a plate-fin heat sink's channels alone [Pa].

    ``plate_fin_channel_flow(...).pressure_drop`` with the same arithmetic (the same numbers to
    the last digit, tested), without the heat transfer: what a fan or bypass solver asks for
    many times per operating point.

    Parameters
    ----------
    volume_flow : float or array_like
        Flow through the channels, bypass excluded, >= 0 [m³ s⁻¹].
    base_width, fin_count, fin_thickness, fin_height, fin_length : float or array_like
        Base width across the flow [m], number of fins [-], fin thickness, height (base to
        tip) and length along the flow [m].
    density, dynamic_viscosity : float or array_like
        Air density [kg m⁻³] and dynamic viscosity [Pa s].
    is_shrouded : bool or array_like, optional
        Duct wall on the fin tips (True) or open top [-].
    loss_model : str, optional
        One of :data:`LOSS_MODELS` [-].
    momentum_coefficient : float or array_like, optional
        K_d of the Kays & London losses [-].

    Returns
    -------
    numpy.ndarray
        ``dp = [K_c + 4 f_app L / D_h + K_e] rho V_ch^2 / 2`` (docs/methods.md e3-e5) [Pa].
    """
    sink = (base_width, fin_count, fin_thickness, fin_height, fin_length)
    air = (density, dynamic_viscosity)
    flow = _channel_hydraulics(
        volume_flow, *sink, *air, is_shrouded, loss_model, momentum_coefficient
    )
    return np.asarray(flow.dp)


class _Hydraulics(NamedTuple):
    b: np.ndarray
    length: np.ndarray
    sigma: np.ndarray
    approach: np.ndarray
    v_ch: np.ndarray
    nu_kin: np.ndarray
    re_b: np.ndarray
    d_h: np.ndarray
    re_dh: np.ndarray
    poiseuille: np.ndarray
    dp_friction: np.ndarray
    dp_c: np.ndarray
    dp_e: np.ndarray
    dp: np.ndarray


def _channel_hydraulics(
    volume_flow,
    base_width,
    fin_count,
    fin_thickness,
    fin_height,
    fin_length,
    density,
    dynamic_viscosity,
    is_shrouded,
    loss_model,
    momentum_coefficient,
) -> _Hydraulics:
    """Geometry, velocities, Reynolds numbers and pressure drop of the channels (the part of
    :func:`plate_fin_channel_flow` that the heat transfer does not enter)."""
    _check_choice("loss_model", loss_model, LOSS_MODELS)
    q_vol = _as_float(volume_flow)
    if np.any(q_vol < 0):
        raise InputError(f"volume_flow = {q_vol.min():.6g} m³/s is not allowed; it must be >= 0")
    w = _as_float(base_width)
    n = _as_float(fin_count)
    t = _as_float(fin_thickness)
    h_fin = _as_float(fin_height)
    length = _as_float(fin_length)
    rho = _as_float(density)
    mu = _as_float(dynamic_viscosity)
    b = (w - n * t) / (n - 1.0)
    if np.any(~(b > 0)):
        raise GeometryError(
            "fin_count * fin_thickness >= base_width: fins do not fit; the fin spacing "
            "(W - N t)/(N - 1) must be > 0"
        )
    shrouded = np.asarray(is_shrouded, dtype=bool)
    sigma = (n - 1.0) * b / w
    approach = q_vol / (w * h_fin)
    v_ch = approach / sigma
    nu_kin = mu / rho
    re_b = v_ch * b / nu_kin
    d_h = np.where(shrouded, 2.0 * b * h_fin / (b + h_fin), 4.0 * b * h_fin / (b + 2.0 * h_fin))
    aspect = np.where(shrouded, b / h_fin, b / (2.0 * h_fin))
    re_dh = v_ch * d_h / nu_kin
    # Pressure drop (friction written as 2 mu V L (f Re) / D_h^2: finite at zero flow)
    poiseuille = _channel_poiseuille(re_dh, aspect, length, d_h)
    dp_friction = 2.0 * mu * v_ch * length * poiseuille / d_h**2
    losses = loss_coefficients(sigma, loss_model, momentum_coefficient)
    dyn = 0.5 * rho * v_ch**2
    dp_c = losses.contraction * dyn
    dp_e = losses.expansion * dyn
    return _Hydraulics(
        b=b,
        length=length,
        sigma=sigma,
        approach=approach,
        v_ch=v_ch,
        nu_kin=nu_kin,
        re_b=re_b,
        d_h=d_h,
        re_dh=re_dh,
        poiseuille=poiseuille,
        dp_friction=dp_friction,
        dp_c=dp_c,
        dp_e=dp_e,
        dp=dp_friction + dp_c + dp_e,
    )
