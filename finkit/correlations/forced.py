"""Forced convection in plate-fin channels and pin-fin arrays: Nusselt numbers and pressure drop.

One function per published source, all vectorised: every argument may be a float or a numpy
array, and all arguments broadcast together (a sweep over 10^5 designs x flows is one call).
Piecewise laws use ``np.where``/``np.select``. Friction factors are **Fanning** everywhere
(``f_Darcy = 4 f_Fanning``). Validity ranges are module constants (:class:`ValidityRange`); the
functions never warn; :func:`plate_fin_flow_warnings` and :func:`pin_fin_flow_warnings` turn a
result into the one-line messages of :func:`finkit.validity.check_range`.

Reference temperature of the heat transfer coefficients (docs/methods.md e2, f1, j):

* Teertstra et al. (plate channels, laminar): h is referred to the **inlet** air temperature;
  the air heating is already inside it. Do not add a caloric resistance.
* VDI parallel-plate channel (laminar / transition / Gnielinski turbulent) and Zukauskas (pin
  arrays): h is a mean coefficient referred to the **mean (logarithmic) air-to-wall temperature
  difference**, i.e. the local bulk air temperature; air heating must be handled with
  ε-NTU for an isothermal base, ``eps = 1 - exp(-NTU)``, ``NTU = eta_o h A / (m_dot c_p)``.

The high-level results carry a per-element flag ``is_inlet_referenced``.
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from finkit.errors import GeometryError, InputError
from finkit.validity import ValidityRange, check_range

__all__ = [
    "FLAT_PLATE_LAMINAR_REYNOLDS",
    "GADDIS_GNIELINSKI_DIAGONAL_RATIO",
    "GADDIS_GNIELINSKI_INLINE_LONGITUDINAL_RATIO",
    "GADDIS_GNIELINSKI_INLINE_TRANSVERSE_RATIO",
    "GADDIS_GNIELINSKI_REYNOLDS",
    "GADDIS_GNIELINSKI_ROW_COUNT",
    "GADDIS_GNIELINSKI_STAGGERED_LONGITUDINAL_RATIO",
    "GADDIS_GNIELINSKI_STAGGERED_TRANSVERSE_RATIO",
    "GNIELINSKI_BANK_PRANDTL",
    "GNIELINSKI_BANK_REYNOLDS",
    "LAMINAR_LIMIT_REYNOLDS",
    "LOSS_MODELS",
    "PIN_ASPECT_RATIO",
    "PIN_BANK_METHODS",
    "PIN_BANK_PRESSURE_DROP_METHODS",
    "PLATE_CHANNEL_FRICTION_REYNOLDS",
    "PLATE_CHANNEL_METHODS",
    "TEERTSTRA_MODIFIED_REYNOLDS",
    "TURBULENT_LIMIT_REYNOLDS",
    "VDI_CHANNEL_PRANDTL",
    "VDI_CHANNEL_REYNOLDS",
    "ZUKAUSKAS_BLEND_FACTOR",
    "ZUKAUSKAS_LONGITUDINAL_RATIO",
    "ZUKAUSKAS_PRANDTL",
    "ZUKAUSKAS_REYNOLDS",
    "ZUKAUSKAS_ROW_TABLE",
    "ZUKAUSKAS_TRANSVERSE_RATIO",
    "LossCoefficients",
    "PinBankFlow",
    "PinBankPressureDrop",
    "PlateChannelFlow",
    "contraction_ratio_rennels",
    "fanning_friction_apparent_rectangular",
    "fanning_friction_rectangular_channel",
    "fanning_friction_smooth_duct_konakov",
    "forced_validity_warnings",
    "friction_reynolds_rectangular_shah_london",
    "loss_coefficients",
    "loss_coefficients_culham_muzychka",
    "loss_coefficients_kays_london",
    "nusselt_duct_turbulent_gnielinski",
    "nusselt_flat_plate_laminar",
    "nusselt_pin_bank_gnielinski",
    "nusselt_pin_bank_zukauskas",
    "nusselt_plate_channel_teertstra",
    "nusselt_plate_channel_vdi",
    "nusselt_plate_channel_vdi_laminar",
    "pin_bank_max_velocity",
    "pin_bank_void_fraction",
    "pin_fin_bank_flow",
    "pin_fin_flow_warnings",
    "plate_channel_transition_warnings",
    "plate_fin_channel_flow",
    "plate_fin_flow_warnings",
    "pressure_drop_channel",
    "pressure_drop_pin_bank_gaddis_gnielinski",
    "row_correction_zukauskas",
    "zukauskas_branch_steps",
    "zukauskas_join_warnings",
]

#: Heat-transfer models for plate-fin channels accepted by :func:`plate_fin_channel_flow`.
PLATE_CHANNEL_METHODS = ("teertstra", "vdi")
#: Entrance/exit loss models accepted by :func:`loss_coefficients`.
LOSS_MODELS = ("kays_london", "culham_muzychka")
#: Pin-array pressure-drop methods accepted by :func:`pin_fin_bank_flow`.
PIN_BANK_PRESSURE_DROP_METHODS = ("gaddis_gnielinski",)
#: Pin-array heat-transfer models accepted by :func:`pin_fin_bank_flow`: ``"lower"`` (default)
#: takes, design by design, the lower h of the two published correlations (both refer h to the
#: bulk air, so their h compare directly); ``"zukauskas"`` and ``"gnielinski"`` use one of them.
PIN_BANK_METHODS = ("lower", "zukauskas", "gnielinski")

#: Factor on Re_D,max over which two neighbouring Zukauskas branches are joined
#: (:func:`nusselt_pin_bank_zukauskas`): the band runs from a boundary up (the table steps up
#: there) or down (it steps down) by this factor, on the side where the table is higher [-].
ZUKAUSKAS_BLEND_FACTOR = 1.4

#: Upper Reynolds number of laminar duct flow (on the hydraulic diameter) [-].
LAMINAR_LIMIT_REYNOLDS = 2300.0
#: Lower Reynolds number of fully turbulent duct flow in the VDI Heat Atlas (Gnielinski) [-].
TURBULENT_LIMIT_REYNOLDS = 1.0e4

# --------------------------------------------------------------------------------------------
# Validity ranges
# --------------------------------------------------------------------------------------------
TEERTSTRA_MODIFIED_REYNOLDS = ValidityRange(
    method="Teertstra et al. (1999) plate-fin channel",
    quantity="Re_b*",
    low=0.1,
    high=100.0,
    source="Teertstra, Yovanovich, Culham & Lemczyk 1999, abstract (docs/methods.md e2)",
)
VDI_CHANNEL_PRANDTL = ValidityRange(
    method="VDI Heat Atlas parallel-plate channel, laminar developing flow",
    quantity="Pr",
    low=0.1,
    high=1000.0,
    source="VDI-Wärmeatlas 9th ed. 2002, sec. Gb 7 (as stated in the FluidDissipation library)",
)
VDI_CHANNEL_REYNOLDS = ValidityRange(
    method="VDI Heat Atlas parallel-plate channel (Gnielinski turbulent branch)",
    quantity="Re_2b",
    low=0.0,
    high=1.0e6,
    source="VDI-Wärmeatlas 9th ed. 2002, sec. Gb 7 (Gnielinski equation)",
)
PLATE_CHANNEL_FRICTION_REYNOLDS = ValidityRange(
    method="plate-channel friction: laminar apparent (Shah & London) / turbulent (Konakov)",
    quantity="Re_Dh",
    low=0.0,
    high=LAMINAR_LIMIT_REYNOLDS,
    source="laminar duct flow; 2300 to 1e4 is transitional, where the larger of the laminar and "
    "turbulent friction factors is used (common practice, no source)",
)
ZUKAUSKAS_REYNOLDS = ValidityRange(
    method="Zukauskas tube-bank correlation (pin array)",
    quantity="Re_D,max",
    low=1.0,
    high=2.0e6,
    source="Zukauskas 1987 as tabulated by Bejan 2013 (docs/methods.md f1)",
)
ZUKAUSKAS_PRANDTL = ValidityRange(
    method="Zukauskas tube-bank correlation (pin array)",
    quantity="Pr",
    low=0.7,
    high=500.0,
    source="Zukauskas 1972; Incropera et al. 6th ed. Table 7.5 (docs/methods.md f1)",
)
ZUKAUSKAS_TRANSVERSE_RATIO = ValidityRange(
    method="pin-bank heat transfer (Zukauskas; Gnielinski)",
    quantity="S_T/D",
    low=1.25,
    high=3.0,
    source="pitch ratios of the tube banks behind both correlations, about 1.25 to 3 (from "
    "memory: Zukauskas 1972; VDI Heat Atlas ch. G7)",
)
ZUKAUSKAS_LONGITUDINAL_RATIO = ValidityRange(
    method="pin-bank heat transfer (Zukauskas; Gnielinski)",
    quantity="S_L/D",
    low=1.0,
    high=3.0,
    source="pitch ratios of the tube banks behind both correlations, about 1 to 3 along the "
    "flow (from memory: Zukauskas 1972; VDI Heat Atlas ch. G7)",
)
PIN_ASPECT_RATIO = ValidityRange(
    method="pin-bank heat transfer (tube-bank data on long tubes)",
    quantity="pin height / diameter H/D",
    low=4.0,
    high=np.inf,
    source="tube-bank correlations come from long tubes; on short pins the base (end-wall) "
    "flow dominates and h can differ by 20 % or more (common practice, no source)",
)
GNIELINSKI_BANK_REYNOLDS = ValidityRange(
    method="Gnielinski tube-bundle correlation (pin array)",
    quantity="Re_psi,l",
    low=10.0,
    high=1.0e6,
    source="VDI Heat Atlas, ch. G7 (Gnielinski), as stated in the FluidDissipation library",
)
GNIELINSKI_BANK_PRANDTL = ValidityRange(
    method="Gnielinski tube-bundle correlation (pin array)",
    quantity="Pr",
    low=0.6,
    high=1.0e3,
    source="VDI Heat Atlas, ch. G7 (Gnielinski), as stated in the FluidDissipation library",
)
GADDIS_GNIELINSKI_REYNOLDS = ValidityRange(
    method="Gaddis & Gnielinski (1985) tube-bank pressure drop",
    quantity="Re_D,max",
    low=1.0,
    high=3.0e5,
    source="VDI Heat Atlas 2010, ch. L1 (experimental range)",
)
GADDIS_GNIELINSKI_ROW_COUNT = ValidityRange(
    method="Gaddis & Gnielinski (1985) tube-bank pressure drop",
    quantity="row count N_L",
    low=5.0,
    high=np.inf,
    source="VDI Heat Atlas 2010, ch. L1 (experimental range)",
)
GADDIS_GNIELINSKI_INLINE_TRANSVERSE_RATIO = ValidityRange(
    method="Gaddis & Gnielinski (1985) in-line tube-bank pressure drop",
    quantity="S_T/D",
    low=1.25,
    high=3.0,
    source="VDI Heat Atlas 2010, ch. L1 (pitch ratios tested for Re >= 1e3)",
)
GADDIS_GNIELINSKI_INLINE_LONGITUDINAL_RATIO = ValidityRange(
    method="Gaddis & Gnielinski (1985) in-line tube-bank pressure drop",
    quantity="S_L/D",
    low=1.2,
    high=3.0,
    source="VDI Heat Atlas 2010, ch. L1 (pitch ratios tested for Re >= 1e3)",
)
GADDIS_GNIELINSKI_STAGGERED_TRANSVERSE_RATIO = ValidityRange(
    method="Gaddis & Gnielinski (1985) staggered tube-bank pressure drop",
    quantity="S_T/D",
    low=1.25,
    high=3.0,
    source="VDI Heat Atlas 2010, ch. L1 (pitch ratios tested for Re >= 1e3)",
)
GADDIS_GNIELINSKI_STAGGERED_LONGITUDINAL_RATIO = ValidityRange(
    method="Gaddis & Gnielinski (1985) staggered tube-bank pressure drop",
    quantity="S_L/D",
    low=0.6,
    high=3.0,
    source="VDI Heat Atlas 2010, ch. L1 (pitch ratios tested for Re >= 1e3)",
)
GADDIS_GNIELINSKI_DIAGONAL_RATIO = ValidityRange(
    method="Gaddis & Gnielinski (1985) staggered tube-bank pressure drop",
    quantity="S_D/D",
    low=1.25,
    high=np.inf,
    source="VDI Heat Atlas 2010, ch. L1 (pitch ratios tested for Re >= 1e3)",
)
FLAT_PLATE_LAMINAR_REYNOLDS = ValidityRange(
    method="laminar flat plate 0.664 Re^0.5 Pr^(1/3) (pin-array base)",
    quantity="Re_L",
    low=0.0,
    high=5.0e5,
    source="Incropera et al. 6th ed., Eq. 7.30 with transition at 5e5",
)

#: Zukauskas row correction C2(N_L): row counts and in-line / staggered factors
#: (Incropera et al. 6th ed. Table 7.6; C2 = 1 for N_L >= 20).
ZUKAUSKAS_ROW_TABLE = {
    "row_count": (1.0, 2.0, 3.0, 4.0, 5.0, 7.0, 10.0, 13.0, 16.0, 20.0),
    "inline": (0.70, 0.80, 0.86, 0.90, 0.92, 0.95, 0.97, 0.98, 0.99, 1.0),
    "staggered": (0.64, 0.76, 0.84, 0.89, 0.92, 0.95, 0.97, 0.98, 0.99, 1.0),
}


def _as_float(x):
    return np.asarray(x, dtype=float)


def _check_choice(name, value, allowed):
    if not isinstance(value, str) or value not in allowed:
        raise InputError(f"{name} = {value!r} is not allowed; use one of {allowed}")


# --------------------------------------------------------------------------------------------
# Plate-fin channels: heat transfer
# --------------------------------------------------------------------------------------------
def nusselt_plate_channel_teertstra(modified_reynolds, prandtl):
    r"""Channel-average Nusselt number of a plate-fin channel, Teertstra et al. composite.

    Parameters
    ----------
    modified_reynolds : float or array_like
        Modified channel Reynolds number ``Re_b* = Re_b b / L`` with ``Re_b = V_ch b / nu`` on the
        fin spacing b and the channel velocity V_ch [-].
    prandtl : float or array_like
        Prandtl number of the air [-].

    Returns
    -------
    numpy.ndarray
        ``Nu_b = h b / k`` on the fin spacing b, with h referred to the **inlet** air
        temperature [-]. Zero where ``Re_b* = 0``.

    Notes
    -----
    Composite (n = 3) of the fully developed and developing-flow limits for isothermal parallel
    plates (docs/methods.md e2):

    .. math::
        Nu_b = \left[\left(\frac{Re_b^* Pr}{2}\right)^{-3}
        + \left(0.664\sqrt{Re_b^*}\,Pr^{1/3}\sqrt{1 + \frac{3.65}{\sqrt{Re_b^*}}}\right)^{-3}
        \right]^{-1/3}

    The first term is exactly the energy balance of a channel whose air leaves at the wall
    temperature, ``h 2 H L = m_dot c_p`` (derived), which is why h is inlet-referenced and
    ``Nu_b < Re_b* Pr / 2`` always. Validity ``0.1 < Re_b* < 100``
    (:data:`TEERTSTRA_MODIFIED_REYNOLDS`); the authors report 2.1 % RMS difference to their data.

    References
    ----------
    .. [1] Teertstra, P., Yovanovich, M.M., Culham, J.R., Lemczyk, T., "Analytical forced
       convection modeling of plate fin heat sinks", Proc. 15th IEEE SEMI-THERM Symposium,
       1999, pp. 34-41.
    """
    re = _as_float(modified_reynolds)
    pr = _as_float(prandtl)
    positive = re > 0
    safe = np.where(positive, re, 1.0)
    fully_developed = safe * pr / 2.0
    developing = 0.664 * np.sqrt(safe) * np.cbrt(pr) * np.sqrt(1.0 + 3.65 / np.sqrt(safe))
    nu = (fully_developed**-3 + developing**-3) ** (-1.0 / 3.0)
    return np.where(positive, nu, 0.0)


def nusselt_plate_channel_vdi_laminar(reynolds_hydraulic, prandtl, hydraulic_diameter, length):
    r"""Mean Nusselt number, laminar simultaneously developing flow between isothermal plates (VDI).

    Parameters
    ----------
    reynolds_hydraulic : float or array_like
        Reynolds number on the gap hydraulic diameter ``d_h = 2 b``: ``V_ch 2 b / nu`` [-].
    prandtl : float or array_like
        Prandtl number [-].
    hydraulic_diameter : float or array_like
        Gap hydraulic diameter ``d_h = 2 b`` [m].
    length : float or array_like
        Channel (fin) length in the flow direction [m].

    Returns
    -------
    numpy.ndarray
        ``Nu = h d_h / k`` on ``d_h = 2 b``, h referred to the mean (logarithmic) temperature
        difference, i.e. bulk-referenced [-].

    Notes
    -----
    Both walls at the same constant temperature, hydrodynamically and thermally developing
    (VDI-Wärmeatlas 9th ed., sec. Gb 7, eqs. 36-43):

    .. math::
        Nu = \left[7.541^3 + \left(1.841\,X^{1/3}\right)^3
        + \left(\left(\frac{2}{1 + 22 Pr}\right)^{1/6} X^{1/2}\right)^3\right]^{1/3},
        \qquad X = Re\,Pr\,d_h / L

    7.541 is the fully developed value for isothermal parallel plates (Shah & London 1978).
    Laminar (``Re <= 2300``), ``0.1 <= Pr <= 1000``. Confirmed against the open implementation of
    the same VDI equations in the Modelica FluidDissipation library
    (``HeatTransfer.Channel.kc_evenGapLaminar``, target "undeveloped, both sides").

    References
    ----------
    .. [1] VDI-Wärmeatlas, 9th ed., Springer, 2002, sec. Gb 7 (flow in a plane gap).
    .. [2] Shah, R.K., London, A.L., Laminar Flow Forced Convection in Ducts, Academic Press,
       1978.
    """
    x = _as_float(reynolds_hydraulic) * prandtl * _as_float(hydraulic_diameter) / length
    pr = _as_float(prandtl)
    nu1 = 7.541
    nu2 = 1.841 * np.cbrt(x)
    nu3 = (2.0 / (1.0 + 22.0 * pr)) ** (1.0 / 6.0) * np.sqrt(x)
    return np.cbrt(nu1**3 + nu2**3 + nu3**3)


def nusselt_duct_turbulent_gnielinski(reynolds_hydraulic, prandtl, hydraulic_diameter, length):
    r"""Mean Nusselt number, turbulent duct flow, Gnielinski with the Konakov friction factor.

    Parameters
    ----------
    reynolds_hydraulic : float or array_like
        Reynolds number on the hydraulic diameter (> 1) [-].
    prandtl : float or array_like
        Prandtl number [-].
    hydraulic_diameter : float or array_like
        Hydraulic diameter (``2 b`` for a plane gap) [m].
    length : float or array_like
        Duct length [m].

    Returns
    -------
    numpy.ndarray
        ``Nu = h d_h / k``, bulk-referenced mean value including the entrance effect [-].

    Notes
    -----
    .. math::
        Nu = \frac{(\xi/8)\,Re\,Pr}{1 + 12.7\sqrt{\xi/8}\,(Pr^{2/3} - 1)}
        \left[1 + \left(\frac{d_h}{L}\right)^{2/3}\right],
        \qquad \xi = (1.8\log_{10} Re - 1.5)^{-2}

    ξ is the Darcy friction factor of Konakov. Valid for ``1e4 <= Re <= 1e6`` and
    ``d_h/L <= 1``; for a plane gap use ``d_h = 2 b`` (VDI Gb 7, sec. 2.4). Confirmed against the
    FluidDissipation implementation ``HeatTransfer.Channel.kc_evenGapTurbulent`` (VDI 2002) and,
    for long ducts, against ``ht.turbulent_Gnielinski`` which uses ``Re - 1000`` (tests).

    References
    ----------
    .. [1] Gnielinski, V., "New equations for heat and mass transfer in turbulent pipe and
       channel flow", Int. Chem. Eng. 16, 359-368, 1976.
    .. [2] VDI-Wärmeatlas, 9th ed., Springer, 2002, secs. Ga 5 (Konakov) and Gb 7.
    """
    re = _as_float(reynolds_hydraulic)
    pr = _as_float(prandtl)
    xi = (1.8 * np.log10(re) - 1.5) ** -2
    k = xi / 8.0
    fully = k * re * pr / (1.0 + 12.7 * np.sqrt(k) * (pr ** (2.0 / 3.0) - 1.0))
    return fully * (1.0 + (_as_float(hydraulic_diameter) / length) ** (2.0 / 3.0))


def nusselt_plate_channel_vdi(reynolds_hydraulic, prandtl, hydraulic_diameter, length):
    r"""Mean Nusselt number of a plane gap over laminar, transitional and turbulent flow (VDI).

    Parameters
    ----------
    reynolds_hydraulic : float or array_like
        Reynolds number on ``d_h = 2 b`` [-].
    prandtl : float or array_like
        Prandtl number [-].
    hydraulic_diameter : float or array_like
        Gap hydraulic diameter ``2 b`` [m].
    length : float or array_like
        Channel length [m].

    Returns
    -------
    numpy.ndarray
        ``Nu = h d_h / k`` on ``2 b``, bulk-referenced (mean temperature difference) [-].

    Notes
    -----
    ``Re <= 2300``: :func:`nusselt_plate_channel_vdi_laminar`. ``Re >= 1e4``:
    :func:`nusselt_duct_turbulent_gnielinski`. In between, linear interpolation of Gnielinski
    (VDI Heat Atlas 2010, ch. G1, sec. 4.2):

    .. math::
        Nu = (1 - \gamma)\,Nu_{lam}(2300) + \gamma\,Nu_{turb}(10^4),
        \qquad \gamma = \frac{Re - 2300}{10^4 - 2300}

    (the same interpolation is coded in several open implementations of VDI G1).

    References
    ----------
    .. [1] VDI Heat Atlas, 2nd ed., Springer, 2010, ch. G1 (Gnielinski, V.).
    .. [2] Gnielinski, V., "On heat transfer in tubes", Int. J. Heat Mass Transfer 63,
       134-140, 2013.
    """
    re = _as_float(reynolds_hydraulic)
    lam = nusselt_plate_channel_vdi_laminar(re, prandtl, hydraulic_diameter, length)
    lam_2300 = nusselt_plate_channel_vdi_laminar(
        LAMINAR_LIMIT_REYNOLDS, prandtl, hydraulic_diameter, length
    )
    turb_1e4 = nusselt_duct_turbulent_gnielinski(
        TURBULENT_LIMIT_REYNOLDS, prandtl, hydraulic_diameter, length
    )
    re_turb = np.maximum(re, TURBULENT_LIMIT_REYNOLDS)
    turb = nusselt_duct_turbulent_gnielinski(re_turb, prandtl, hydraulic_diameter, length)
    gamma = (re - LAMINAR_LIMIT_REYNOLDS) / (TURBULENT_LIMIT_REYNOLDS - LAMINAR_LIMIT_REYNOLDS)
    transition = (1.0 - gamma) * lam_2300 + gamma * turb_1e4
    return np.select(
        [re <= LAMINAR_LIMIT_REYNOLDS, re < TURBULENT_LIMIT_REYNOLDS], [lam, transition], turb
    )


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
        (``finkit.sink.ModelOptions``).
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
    _check_choice("method", method, PLATE_CHANNEL_METHODS)
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
    k_air = _as_float(thermal_conductivity)
    pr = _as_float(prandtl)
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
    re_star = re_b * b / length
    d_h = np.where(shrouded, 2.0 * b * h_fin / (b + h_fin), 4.0 * b * h_fin / (b + 2.0 * h_fin))
    aspect = np.where(shrouded, b / h_fin, b / (2.0 * h_fin))
    re_dh = v_ch * d_h / nu_kin

    # Heat transfer
    re_gap = 2.0 * re_b
    nu_vdi_2b = nusselt_plate_channel_vdi(re_gap, pr, 2.0 * b, length)
    h_vdi = nu_vdi_2b * k_air / (2.0 * b)
    if method == "teertstra":
        h = nusselt_plate_channel_teertstra(re_star, pr) * k_air / b
        inlet_ref = np.ones(np.shape(h), dtype=bool)
    else:
        h = h_vdi
        inlet_ref = np.zeros(np.shape(h), dtype=bool)

    # Pressure drop (friction written as 2 mu V L (f Re) / D_h^2: finite at zero flow)
    poiseuille = _channel_poiseuille(re_dh, aspect, length, d_h)
    with np.errstate(divide="ignore", invalid="ignore"):
        f_app = np.where(re_dh > 0, poiseuille / np.where(re_dh > 0, re_dh, 1.0), np.nan)
    dp_friction = 2.0 * mu * v_ch * length * poiseuille / d_h**2
    losses = loss_coefficients(sigma, loss_model, momentum_coefficient)
    dyn = 0.5 * rho * v_ch**2
    dp_c = losses.contraction * dyn
    dp_e = losses.expansion * dyn
    dp = dp_friction + dp_c + dp_e

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
        pressure_drop_friction=full(dp_friction),
        pressure_drop_contraction=full(dp_c),
        pressure_drop_expansion=full(dp_e),
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


# --------------------------------------------------------------------------------------------
# Pin-fin arrays
# --------------------------------------------------------------------------------------------
def _check_arrangement(arrangement):
    _check_choice("arrangement", arrangement, ("inline", "staggered"))


def pin_bank_max_velocity(
    approach_velocity, pin_diameter, transverse_pitch, longitudinal_pitch, arrangement
):
    r"""Maximum (minimum-gap) velocity in a pin or tube bank.

    Parameters
    ----------
    approach_velocity : float or array_like
        Velocity upstream of the bank, on the frontal area [m s⁻¹].
    pin_diameter : float or array_like
        Pin diameter D [m].
    transverse_pitch : float or array_like
        Transverse pitch S_T [m].
    longitudinal_pitch : float or array_like
        Longitudinal pitch S_L [m].
    arrangement : str
        ``"inline"`` or ``"staggered"`` [-].

    Returns
    -------
    numpy.ndarray
        ``V_max`` [m s⁻¹].

    Notes
    -----
    In-line: ``V_max = S_T/(S_T - D) V``. Staggered: the same if
    ``S_D >= (S_T + D)/2``, else ``V_max = S_T / (2 (S_D - D)) V`` with
    ``S_D = sqrt(S_L^2 + (S_T/2)^2)`` (Incropera et al. 6th ed., Eqs. 7.57-7.59; docs/methods.md f).
    """
    _check_arrangement(arrangement)
    v = _as_float(approach_velocity)
    d = _as_float(pin_diameter)
    st = _as_float(transverse_pitch)
    sl = _as_float(longitudinal_pitch)
    transverse = st / (st - d)
    if arrangement == "inline":
        return transverse * v
    sd = np.sqrt(sl**2 + (st / 2.0) ** 2)
    diagonal = st / (2.0 * (sd - d))
    return np.where(sd >= (st + d) / 2.0, transverse, diagonal) * v


def row_correction_zukauskas(row_count, arrangement):
    """Zukauskas row-count correction C2(N_L), linear interpolation in N_L, 1 for N_L >= 20.

    Parameters
    ----------
    row_count : float or array_like
        Number of rows N_L along the flow (>= 1) [-].
    arrangement : str
        ``"inline"`` or ``"staggered"`` [-].

    Returns
    -------
    numpy.ndarray
        C2 [-] (:data:`ZUKAUSKAS_ROW_TABLE`).

    Notes
    -----
    Table values of Incropera et al. 6th ed. Table 7.6 (for Re_D,max >~ 1000); confirmed
    within 0.03 against the digitised Zukauskas chart of ``ht.Zukauskas_tube_row_correction``
    (tests). Used at all Re here; at low Re the published row effect is weaker, so this is
    conservative there.

    References
    ----------
    .. [1] Zukauskas, A., "Heat transfer from tubes in crossflow", Advances in Heat Transfer 8,
       93-160, 1972.
    .. [2] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., Fundamentals of Heat and
       Mass Transfer, 6th ed., Wiley, 2007, Table 7.6.
    """
    _check_arrangement(arrangement)
    return np.interp(
        _as_float(row_count), ZUKAUSKAS_ROW_TABLE["row_count"], ZUKAUSKAS_ROW_TABLE[arrangement]
    )


def _zukauskas_constants(arrangement, transverse_pitch, longitudinal_pitch):
    """Branch boundaries and the (C, m) of each branch of Table F1 (docs/methods.md f1).

    Staggered banks with ``S_T/S_L > 2`` take ``C = 0.40`` from 1e3 to 2e5 (Zukauskas 1972 as
    tabulated by Incropera et al. 6th ed. Table 7.5); it is the value of ``0.35 (S_T/S_L)^0.2``
    at ``S_T/S_L = 2`` (0.402), so the two sub-branches join there. Above 2e5 the ratio is
    capped at 2 the same way.
    """
    if arrangement == "inline":
        return (100.0, 1000.0, 2.0e5), (0.9, 0.52, 0.27, 0.033), (0.4, 0.5, 0.63, 0.8)
    ratio = _as_float(transverse_pitch) / _as_float(longitudinal_pitch)
    mid = np.where(ratio > 2.0, 0.40, 0.35 * np.minimum(ratio, 2.0) ** 0.2)
    high = 0.031 * np.minimum(ratio, 2.0) ** 0.2
    return (500.0, 1000.0, 2.0e5), (1.04, 0.71, mid, high), (0.4, 0.5, 0.6, 0.8)


def _zukauskas_table(re, arrangement, transverse_pitch, longitudinal_pitch):
    """``C Re^m`` of Table F1 as published (piecewise, with its steps) [-]."""
    bounds, cs, ms = _zukauskas_constants(arrangement, transverse_pitch, longitudinal_pitch)
    conditions = [re < b for b in bounds]
    c = np.select(conditions, cs[:-1], cs[-1])
    m = np.select(conditions, ms[:-1], ms[-1])
    return c * re**m


def zukauskas_branch_steps(arrangement, transverse_pitch, longitudinal_pitch):
    """Relative step of the published Zukauskas table at each branch boundary, for a design.

    Parameters
    ----------
    arrangement : str
        ``"inline"`` or ``"staggered"`` [-].
    transverse_pitch, longitudinal_pitch : float or array_like
        S_T and S_L [m] (only their ratio matters, staggered).

    Returns
    -------
    list of (float, numpy.ndarray)
        ``(boundary Re_D,max, upper branch / lower branch - 1)`` at the boundary [-]; e.g.
        staggered at 500: +0.27.
    """
    _check_arrangement(arrangement)
    bounds, cs, ms = _zukauskas_constants(arrangement, transverse_pitch, longitudinal_pitch)
    return [
        (b, np.asarray(cs[i + 1] * b ** ms[i + 1] / (cs[i] * b ** ms[i]) - 1.0))
        for i, b in enumerate(bounds)
    ]


def _zukauskas_joined(re, arrangement, transverse_pitch, longitudinal_pitch):
    """Table F1 with its branches joined continuously on the lower side (see the caller)."""
    bounds, cs, ms = _zukauskas_constants(arrangement, transverse_pitch, longitudinal_pitch)
    table = _zukauskas_table(re, arrangement, transverse_pitch, longitudinal_pitch)
    joined = table
    log_f = np.log(ZUKAUSKAS_BLEND_FACTOR)
    for i, b in enumerate(bounds):
        lower = cs[i] * re ** ms[i]
        upper = cs[i + 1] * re ** ms[i + 1]
        steps_up = cs[i + 1] * b ** ms[i + 1] > cs[i] * b ** ms[i]
        start = np.where(steps_up, b, b / ZUKAUSKAS_BLEND_FACTOR)
        inside = (re >= start) & (re < start * ZUKAUSKAS_BLEND_FACTOR)
        with np.errstate(divide="ignore", invalid="ignore"):
            w = np.clip(np.log(re / start) / log_f, 0.0, 1.0)
            geometric = lower ** (1.0 - w) * upper**w
        joined = np.where(inside, np.minimum(joined, geometric), joined)
    return joined


def nusselt_pin_bank_zukauskas(
    reynolds_max,
    prandtl,
    row_count,
    arrangement,
    transverse_pitch,
    longitudinal_pitch,
    surface_prandtl=None,
    join_branches=True,
):
    r"""Mean Nusselt number of a pin (tube) bank in crossflow, Zukauskas.

    Parameters
    ----------
    reynolds_max : float or array_like
        ``Re_D,max = rho V_max D / mu`` [-].
    prandtl : float or array_like
        Prandtl number at the mean bulk air temperature [-].
    row_count : float or array_like
        Rows along the flow N_L [-].
    arrangement : str
        ``"inline"`` or ``"staggered"`` [-].
    transverse_pitch : float or array_like
        S_T [m] (only the ratio S_T/S_L is used, staggered Re >= 1000).
    longitudinal_pitch : float or array_like
        S_L [m].
    surface_prandtl : float or array_like, optional
        Prandtl number at the surface temperature; None (default) omits the factor
        ``(Pr/Pr_s)^(1/4)`` (it is within 1 % of 1 for air) [-].
    join_branches : bool, optional
        True (default): the published branches are joined continuously, on the lower side
        (see Notes). False: the table as published, with its steps.

    Returns
    -------
    numpy.ndarray
        ``Nu_D = h D / k`` [-], h referred to the bulk air temperature.

    Notes
    -----
    .. math::
        Nu_D = C\,C_2(N_L)\,Re_{D,max}^m\,Pr^{0.36}\,(Pr/Pr_s)^{1/4}

    C and m (docs/methods.md Table F1; Zukauskas 1987 as tabulated by Bejan 2013):

    ============  ================  ========================  =====
    arrangement   Re_D,max          C                         m
    ============  ================  ========================  =====
    in-line       < 100             0.9                       0.4
    in-line       100 - 1000        0.52                      0.5
    in-line       1000 - 2e5        0.27                      0.63
    in-line       >= 2e5            0.033                     0.8
    staggered     < 500             1.04                      0.4
    staggered     500 - 1000        0.71                      0.5
    staggered     1000 - 2e5        0.35 (S_T/S_L)^0.2        0.6
                                    (0.40 for S_T/S_L > 2)
    staggered     >= 2e5            0.031 (S_T/S_L)^0.2       0.8
    ============  ================  ========================  =====

    Confirmed against the code of ``ht.Nu_Zukauskas_Bejan`` (ht 1.2.0; whose in-line
    100-1000 branch has the exponent misprinted as 0.05 in code, 0.5 in its docstring) and, above
    1000, against Incropera et al. 6th ed. Table 7.5, which also gives the staggered
    ``S_T/S_L > 2`` constant 0.40 (equal to ``0.35 x 2^0.2 = 0.402`` at the ratio 2, so the
    two agree where they meet). Validity: 1 <= Re_D,max <= 2e6, 0.7 <= Pr <= 500. Row
    correction: :func:`row_correction_zukauskas`. Tube-bank data assume long tubes; short pins
    deviate (quote +-20-25 %, common practice, no source).

    **Joining the branches.** The published branches are not continuous: in-line the value
    drops 9 % at 100 and rises 27 % at 1000; staggered it rises 27 % at 500 (the other steps
    are a few per cent; :func:`zukauskas_branch_steps` gives them for a design). A design just
    above a rising step would get 27 % more h than one just below. finkit joins each pair of
    neighbouring branches by a geometric (log-linear in Re) blend over a band of a factor
    :data:`ZUKAUSKAS_BLEND_FACTOR` = 1.4 in Re_D,max **on the side where the table is higher**
    (above a rising step, below a falling one), and keeps the lower of the blend and the table
    there. The result is continuous, never above the published table (conservative) and equal
    to it outside the bands. Inside a band its local slope ``d ln Nu / d ln Re`` is at most
    ``m_upper + ln(ratio of the branches at the far end of the band)/ln 1.4``: 1.31 across the
    staggered step at 500 (+27 %), 1.48 across the in-line step at 1000 (+27 %), against
    0.4-0.63 outside; a sweep with Re_D,max points 2 % apart therefore changes h by at most
    about 3 % from one point to the next. This is finkit's choice (no published
    source prescribes a join); the size of the band is a judgement: wide enough that a sweep
    sees no jump, narrow enough (no band overlaps another) that the published values hold
    almost everywhere.

    References
    ----------
    .. [1] Zukauskas, A., "Convective heat transfer in cross flow", in Kakac, Shah & Aung (eds.),
       Handbook of Single-Phase Convective Heat Transfer, Wiley, 1987.
    .. [2] Bejan, A., Convection Heat Transfer, 4th ed., Wiley, 2013.
    .. [3] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., Fundamentals of Heat and
       Mass Transfer, 6th ed., Wiley, 2007, Table 7.5.
    """
    _check_arrangement(arrangement)
    re = _as_float(reynolds_max)
    pr = _as_float(prandtl)
    if join_branches:
        base = _zukauskas_joined(re, arrangement, transverse_pitch, longitudinal_pitch)
    else:
        base = _zukauskas_table(re, arrangement, transverse_pitch, longitudinal_pitch)
    nu = base * row_correction_zukauskas(row_count, arrangement) * pr**0.36
    if surface_prandtl is not None:
        nu = nu * (pr / _as_float(surface_prandtl)) ** 0.25
    return nu


def pin_bank_void_fraction(pin_diameter, transverse_pitch, longitudinal_pitch):
    """Void fraction psi of a pin (tube) bank as used by Gnielinski [-].

    ``psi = 1 - pi/(4a)`` for ``b >= 1``, ``1 - pi/(4ab)`` for ``b < 1``, with
    ``a = S_T/D``, ``b = S_L/D`` (VDI Heat Atlas ch. G7).
    """
    a = _as_float(transverse_pitch) / _as_float(pin_diameter)
    b = _as_float(longitudinal_pitch) / _as_float(pin_diameter)
    return np.where(b >= 1.0, 1.0 - np.pi / (4.0 * a), 1.0 - np.pi / (4.0 * a * b))


def nusselt_pin_bank_gnielinski(
    approach_velocity,
    pin_diameter,
    transverse_pitch,
    longitudinal_pitch,
    row_count,
    arrangement,
    density,
    dynamic_viscosity,
    prandtl,
):
    r"""Mean Nusselt number of a pin (tube) bank in crossflow, Gnielinski (VDI Heat Atlas).

    Parameters
    ----------
    approach_velocity : float or array_like
        Velocity upstream of the bank, on the frontal area (``w_0``) [m s⁻¹].
    pin_diameter : float or array_like
        Pin diameter D [m].
    transverse_pitch, longitudinal_pitch : float or array_like
        S_T and S_L [m].
    row_count : float or array_like
        Rows along the flow n [-].
    arrangement : str
        ``"inline"`` or ``"staggered"`` [-].
    density, dynamic_viscosity : float or array_like
        Air density [kg m⁻³] and dynamic viscosity [Pa s] at the mean bulk temperature.
    prandtl : float or array_like
        Prandtl number at the mean bulk temperature [-].

    Returns
    -------
    tuple of numpy.ndarray
        ``(Nu_D, Re_psi_l)``: the Nusselt number on the pin diameter ``h D / k`` (h referred to
        the bulk air, like Zukauskas) and Gnielinski's Reynolds number [-].

    Notes
    -----
    Gnielinski's method treats each pin as a body with the streamed length ``l = pi D / 2``
    and the velocity in the void ``w_0 / psi``::

        Re_psi,l = w_0 l / (psi nu),   psi = 1 - pi/(4a)  (b >= 1),  1 - pi/(4ab)  (b < 1)
        Nu_lam  = 0.664 Re^(1/2) Pr^(1/3)
        Nu_turb = 0.037 Re^0.8 Pr / (1 + 2.443 Re^(-0.1) (Pr^(2/3) - 1))
        Nu_l,0  = 0.3 + sqrt(Nu_lam^2 + Nu_turb^2)
        f_A     = 1 + 0.7/psi^1.5 (b/a - 0.3)/(b/a + 0.7)^2       (in-line)
                = 1 + 2/(3 b)                                      (staggered)
        Nu_l    = f_A Nu_l,0                  (n >= 10 rows)
                = (1 + (n - 1) f_A)/n Nu_l,0   (n < 10)

    with ``a = S_T/D``, ``b = S_L/D`` and ``Nu_D = Nu_l D / l``. Validity:
    ``10 < Re_psi,l < 1e6``, ``0.6 < Pr < 1e3``. The formula is continuous in Re (no branches),
    which is why it is the second pin-bank correlation: it shows the model-form spread
    against Zukauskas. Cross-checked in the tests against ``ht.Nu_HEDH_tube_bank`` (ht 1.2.0,
    the same method from the HEDH), which takes the Reynolds number on the streamed length
    when called with it, and against the Modelica FluidDissipation implementation's
    definitions (``L = pi/2 d``, ``Re = w_0 L/(psi nu)``).

    References
    ----------
    .. [1] Gnielinski, V., "Heat transfer in cross-flow around single rows of tubes and
       through tube bundles", VDI Heat Atlas, 2nd ed., Springer, 2010, ch. G7.
    .. [2] Schlünder, E.U. (ed.), Heat Exchanger Design Handbook, Hemisphere, 1983/1987
       (section 2.5.3, Gnielinski).
    """
    _check_arrangement(arrangement)
    d = _as_float(pin_diameter)
    a = _as_float(transverse_pitch) / d
    b = _as_float(longitudinal_pitch) / d
    psi = pin_bank_void_fraction(d, transverse_pitch, longitudinal_pitch)
    pr = _as_float(prandtl)
    streamed = 0.5 * np.pi * d
    re = (
        _as_float(approach_velocity)
        * streamed
        * _as_float(density)
        / (psi * _as_float(dynamic_viscosity))
    )
    nu_lam = 0.664 * np.sqrt(re) * np.cbrt(pr)
    with np.errstate(divide="ignore", invalid="ignore"):
        nu_turb = np.where(
            re > 0,
            0.037
            * re**0.8
            * pr
            / (1.0 + 2.443 * np.where(re > 0, re, 1.0) ** -0.1 * (pr ** (2 / 3) - 1.0)),
            0.0,
        )
    nu_0 = 0.3 + np.sqrt(nu_lam**2 + nu_turb**2)
    if arrangement == "inline":
        f_a = 1.0 + 0.7 / psi**1.5 * (b / a - 0.3) / (b / a + 0.7) ** 2
    else:
        f_a = 1.0 + 2.0 / (3.0 * b)
    n = _as_float(row_count)
    rows = np.where(n >= 10.0, f_a, (1.0 + (n - 1.0) * f_a) / n)
    return rows * nu_0 * d / streamed, re


class PinBankPressureDrop(NamedTuple):
    """Pressure drop of a pin (tube) bank by Gaddis & Gnielinski."""

    #: Static pressure drop [Pa].
    pressure_drop: np.ndarray
    #: Pressure-drop coefficient xi per main resistance, on the narrowest-gap velocity [-].
    drag_coefficient: np.ndarray
    #: Number of main resistances N_R (rows, or rows - 1 for a diagonal narrowest gap) [-].
    resistance_count: np.ndarray


def pressure_drop_pin_bank_gaddis_gnielinski(
    max_velocity,
    pin_diameter,
    transverse_pitch,
    longitudinal_pitch,
    row_count,
    arrangement,
    density,
    dynamic_viscosity,
):
    r"""Pressure drop across a pin (tube) bank in crossflow, Gaddis & Gnielinski.

    Parameters
    ----------
    max_velocity : float or array_like
        Mean velocity in the narrowest cross-section w_e (:func:`pin_bank_max_velocity`)
        [m s⁻¹].
    pin_diameter : float or array_like
        Pin diameter D [m].
    transverse_pitch : float or array_like
        S_T [m].
    longitudinal_pitch : float or array_like
        S_L [m].
    row_count : float or array_like
        Rows along the flow n [-].
    arrangement : str
        ``"inline"`` or ``"staggered"`` [-].
    density : float or array_like
        Air density [kg m⁻³].
    dynamic_viscosity : float or array_like
        Air dynamic viscosity [Pa s].

    Returns
    -------
    PinBankPressureDrop
        ``pressure_drop = xi N_R rho w_e^2 / 2`` [Pa], ``drag_coefficient`` xi [-] (inf at zero
        flow, where the pressure drop is 0), ``resistance_count`` N_R [-].

    Notes
    -----
    ``a = S_T/D``, ``b = S_L/D``, ``c = sqrt((a/2)^2 + b^2)``, ``Re = w_e D / nu``.
    The narrowest gap of a staggered bank is diagonal when ``b < sqrt(2a + 1)/2``.

    In-line (and staggered with a transverse narrowest gap, laminar term):

    .. math::
        \xi_{lam} = \frac{280\pi[(b^{0.5} - 0.6)^2 + 0.75]}{(4ab - \pi)\,a'^{1.6}\,Re}

    with ``a' = a``, or ``a' = c`` for a diagonal narrowest gap. Turbulent terms:

    .. math::
        \xi_{turb,inline} = \frac{[0.22 + 1.2(1 - 0.94/b)^{0.6}(a - 0.85)^{-1.3}]\,
        10^{0.47(b/a - 1.5)} + 0.03(a - 1)(b - 1)}{Re^{0.1 b/a}}

        \xi_{turb,stag} = \frac{2.5 + 1.2 (a - 0.85)^{-1.08} + 0.4 (b/a - 1)^3
        - 0.01 (a/b - 1)^3}{Re^{0.25}}

    Inlet/outlet effect for ``n <= 10``: ``f_n = (1/a^2)(1/n - 1/10)``, or for a diagonal
    narrowest gap ``f_n = [2(c - 1)/(a(a - 1))]^2 (1/n - 1/10)`` (continuous with the first at
    the switch ``2(c - 1) = a - 1``; derived). Combination:

    .. math::
        \xi = \xi_{lam} + (\xi_{turb} + f_n)\,[1 - e^{-(Re + 1000)/2000}]  \;\text{(in-line)},
        \qquad [1 - e^{-(Re + 200)/1000}] \;\text{(staggered)}

    ``N_R = n``, or ``n - 1`` (at least 1) for a staggered bank with a diagonal narrowest gap.
    Wall-viscosity corrections are omitted (air: ``(mu_w/mu)^0.14`` is within 1-2 % of 1).

    Verification: the equations were not read in the original; they are the consensus of three
    independent open implementations citing the VDI Heat Atlas (2nd ed. 2010, ch. L1, sec.
    "Lad"), which agree on every term above except misprints in one each (laminar-term
    brackets; the square on the diagonal f_n, settled by continuity; the staggered turbulent
    exponent and blending constant, settled by the two that agree). The tests compare the result
    with the Zukauskas chart fits of ``ht.dP_Zukauskas``. Validity (VDI): 1 <= Re <= 3e5,
    n >= 5; pitch ranges in the ``GADDIS_GNIELINSKI_*`` constants.

    References
    ----------
    .. [1] Gaddis, E.S., Gnielinski, V., "Pressure drop in cross flow across tube bundles",
       Int. Chem. Eng. 25(1), 1-15, 1985.
    .. [2] VDI Heat Atlas, 2nd ed., Springer, 2010, ch. L1 (pressure drop in crossflow over tube
       bundles).
    """
    _check_arrangement(arrangement)
    d = _as_float(pin_diameter)
    a = _as_float(transverse_pitch) / d
    b = _as_float(longitudinal_pitch) / d
    n = _as_float(row_count)
    w = _as_float(max_velocity)
    rho = _as_float(density)
    mu = _as_float(dynamic_viscosity)
    re = rho * w * d / mu
    c = np.sqrt((a / 2.0) ** 2 + b**2)
    row_term = np.where(n <= 10.0, 1.0 / n - 0.1, 0.0)
    if arrangement == "inline":
        diagonal = np.zeros(np.shape(a * b), dtype=bool)
        a_lam = a
        turb_coefficient = (0.22 + 1.2 * (1.0 - 0.94 / b) ** 0.6 / (a - 0.85) ** 1.3) * 10.0 ** (
            0.47 * (b / a - 1.5)
        ) + 0.03 * (a - 1.0) * (b - 1.0)
        turb_exponent = 0.1 * b / a
        f_n = row_term / a**2
        blend_shift, blend_scale = 1000.0, 2000.0
    else:
        diagonal = b < 0.5 * np.sqrt(2.0 * a + 1.0)
        a_lam = np.where(diagonal, c, a)
        turb_coefficient = (
            2.5 + 1.2 / (a - 0.85) ** 1.08 + 0.4 * (b / a - 1.0) ** 3 - 0.01 * (a / b - 1.0) ** 3
        )
        turb_exponent = 0.25
        f_n = np.where(diagonal, (2.0 * (c - 1.0) / (a * (a - 1.0))) ** 2, 1.0 / a**2) * row_term
        blend_shift, blend_scale = 200.0, 1000.0
    lam_coefficient = (
        280.0 * np.pi * ((np.sqrt(b) - 0.6) ** 2 + 0.75) / ((4.0 * a * b - np.pi) * a_lam**1.6)
    )
    resistances = np.where(diagonal, np.maximum(n - 1.0, 1.0), n)
    blend = -np.expm1(-(re + blend_shift) / blend_scale)
    positive = re > 0
    safe_re = np.where(positive, re, 1.0)
    turb = turb_coefficient / safe_re**turb_exponent
    # laminar part written with mu w / D so that it is finite (zero) at zero flow
    dp_lam = lam_coefficient * resistances * 0.5 * mu * w / d
    dp_rest = (turb + f_n) * blend * resistances * 0.5 * rho * w**2
    dp = dp_lam + np.where(positive, dp_rest, 0.0)
    with np.errstate(divide="ignore"):
        xi = lam_coefficient / np.where(positive, re, 0.0) + (turb + f_n) * blend
    return PinBankPressureDrop(pressure_drop=dp, drag_coefficient=xi, resistance_count=resistances)


def nusselt_flat_plate_laminar(reynolds_length, prandtl):
    r"""Mean Nusselt number of a laminar flat plate, ``0.664 Re_L^(1/2) Pr^(1/3)``.

    Parameters
    ----------
    reynolds_length : float or array_like
        Reynolds number on the plate length [-].
    prandtl : float or array_like
        Prandtl number (>= 0.6) [-].

    Returns
    -------
    numpy.ndarray
        ``Nu_L = h L / k`` [-].

    Notes
    -----
    Used for the exposed base of a pin-fin array (common practice, no source, docs/methods.md f1).

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., Fundamentals of Heat and
       Mass Transfer, 6th ed., Wiley, 2007, Eq. 7.30.
    """
    return 0.664 * np.sqrt(_as_float(reynolds_length)) * np.cbrt(_as_float(prandtl))


class PinBankFlow(NamedTuple):
    """Flow, heat transfer and pressure drop of a pin-fin array (all arrays)."""

    #: Approach velocity on the pin-region frontal area W H [m s⁻¹].
    approach_velocity: np.ndarray
    #: Velocity in the narrowest gap V_max [m s⁻¹].
    max_velocity: np.ndarray
    #: ``Re_D,max = rho V_max D / mu`` [-].
    reynolds_max: np.ndarray
    #: ``Nu_D`` of the model used (``method``) [-].
    nusselt: np.ndarray
    #: Pin heat transfer coefficient, bulk-referenced [W m⁻² K⁻¹].
    heat_transfer_coefficient: np.ndarray
    #: Exposed-base coefficient, laminar flat plate on the base length and approach velocity
    #: [W m⁻² K⁻¹].
    base_heat_transfer_coefficient: np.ndarray
    #: Static pressure drop across the array [Pa].
    pressure_drop: np.ndarray
    #: Always False: Zukauskas h is bulk-referenced; use ε-NTU [-].
    is_inlet_referenced: np.ndarray
    #: Zukauskas row correction C2 [-].
    row_correction: np.ndarray
    #: Gaddis & Gnielinski pressure-drop coefficient xi [-].
    pressure_drop_coefficient: np.ndarray
    #: Reynolds number of the base flat plate on base length and approach velocity [-].
    base_reynolds: np.ndarray
    #: ``S_T / D`` [-].
    transverse_pitch_ratio: np.ndarray
    #: ``S_L / D`` [-].
    longitudinal_pitch_ratio: np.ndarray
    #: ``S_D / D`` [-].
    diagonal_pitch_ratio: np.ndarray
    #: Rows along the flow N_L [-].
    row_count: np.ndarray
    #: Prandtl number (kept for the validity checks) [-].
    prandtl: np.ndarray
    #: ``"inline"`` or ``"staggered"``.
    arrangement: str
    #: Zukauskas ``Nu_D``, branches joined (:func:`nusselt_pin_bank_zukauskas`) [-].
    nusselt_zukauskas: np.ndarray
    #: Gnielinski ``Nu_D`` (:func:`nusselt_pin_bank_gnielinski`) [-].
    nusselt_gnielinski: np.ndarray
    #: Gnielinski's ``Re_psi,l`` [-].
    reynolds_void: np.ndarray
    #: ``H/D`` of the pins [-].
    aspect_ratio: np.ndarray
    #: Heat-transfer model, one of :data:`PIN_BANK_METHODS`.
    method: str


def pin_fin_bank_flow(
    volume_flow,
    base_width,
    pin_diameter,
    pin_height,
    transverse_pitch,
    longitudinal_pitch,
    row_count,
    arrangement,
    density,
    dynamic_viscosity,
    thermal_conductivity,
    prandtl,
    base_length=None,
    surface_prandtl=None,
    pressure_drop_method="gaddis_gnielinski",
    method="lower",
):
    r"""Velocities, h (pins and base) and pressure drop of a pin-fin heat sink.

    Parameters
    ----------
    volume_flow : float or array_like
        Volume flow THROUGH the pin region (after any bypass) [m³ s⁻¹]; >= 0.
    base_width : float or array_like
        Base width W across the flow [m].
    pin_diameter : float or array_like
        Pin diameter D [m].
    pin_height : float or array_like
        Pin height H [m].
    transverse_pitch : float or array_like
        S_T [m].
    longitudinal_pitch : float or array_like
        S_L [m].
    row_count : float or array_like
        Rows along the flow N_L [-].
    arrangement : str
        ``"inline"`` or ``"staggered"`` [-].
    density : float or array_like
        Air density [kg m⁻³].
    dynamic_viscosity : float or array_like
        Air dynamic viscosity [Pa s].
    thermal_conductivity : float or array_like
        Air thermal conductivity [W m⁻¹ K⁻¹].
    prandtl : float or array_like
        Air Prandtl number [-].
    base_length : float or array_like, optional
        Base length along the flow for the base coefficient; default ``row_count * S_L`` [m].
    surface_prandtl : float or array_like, optional
        Prandtl number at the surface for the Zukauskas factor; None = factor 1 [-].
    pressure_drop_method : str, optional
        One of :data:`PIN_BANK_PRESSURE_DROP_METHODS` [-].
    method : str, optional
        Heat-transfer model, one of :data:`PIN_BANK_METHODS` [-]: ``"lower"`` (default, the
        lower h of Zukauskas and Gnielinski for each design, conservative), ``"zukauskas"``
        or ``"gnielinski"``.

    Returns
    -------
    PinBankFlow
        See the field descriptions.

    Notes
    -----
    ``V_app = Q / (W H)`` on the pin-region frontal area; ``V_max`` from
    :func:`pin_bank_max_velocity`; ``h = Nu_D k / D`` with :func:`nusselt_pin_bank_zukauskas`,
    referred to the local bulk air temperature (docs/methods.md f1, j): use ε-NTU; or
    :func:`nusselt_pin_bank_gnielinski` (also bulk-referenced), or the lower of the two. The
    two are the accepted pin-bank correlations finkit has; neither was fitted to short pins on
    a heated base, so the lower one is the default (finkit's conservative choice). The exposed base
    gets ``h_b = 0.664 Re_L^(1/2) Pr^(1/3) k / L`` with ``Re_L = rho V_app L / mu``
    (common practice, no source). Pressure drop: :func:`pressure_drop_pin_bank_gaddis_gnielinski`.

    Raises
    ------
    InputError
        Unknown arrangement or method, negative volume flow.
    GeometryError
        Pins overlapping (``S_T <= D``, or in-line ``S_L <= D``, or staggered ``S_D <= D``).
    """
    _check_arrangement(arrangement)
    _check_choice("pressure_drop_method", pressure_drop_method, PIN_BANK_PRESSURE_DROP_METHODS)
    _check_choice("method", method, PIN_BANK_METHODS)
    q_vol = _as_float(volume_flow)
    if np.any(q_vol < 0):
        raise InputError(f"volume_flow = {q_vol.min():.6g} m³/s is not allowed; it must be >= 0")
    d = _as_float(pin_diameter)
    st = _as_float(transverse_pitch)
    sl = _as_float(longitudinal_pitch)
    sd = np.sqrt(sl**2 + (st / 2.0) ** 2)
    overlap = (st <= d) | ((sl <= d) if arrangement == "inline" else (sd <= d))
    if np.any(overlap):
        raise GeometryError(
            "pins overlap: transverse_pitch (and longitudinal_pitch in-line, diagonal pitch "
            "staggered) must exceed pin_diameter"
        )
    rho = _as_float(density)
    mu = _as_float(dynamic_viscosity)
    k_air = _as_float(thermal_conductivity)
    pr = _as_float(prandtl)
    n_rows = _as_float(row_count)
    approach = q_vol / (_as_float(base_width) * pin_height)
    v_max = pin_bank_max_velocity(approach, d, st, sl, arrangement)
    re_max = rho * v_max * d / mu
    nu_z = nusselt_pin_bank_zukauskas(re_max, pr, n_rows, arrangement, st, sl, surface_prandtl)
    nu_g, re_void = nusselt_pin_bank_gnielinski(
        approach, d, st, sl, n_rows, arrangement, rho, mu, pr
    )
    nu = {"zukauskas": nu_z, "gnielinski": nu_g}.get(method, np.minimum(nu_z, nu_g))
    h = nu * k_air / d
    length = n_rows * sl if base_length is None else _as_float(base_length)
    re_l = rho * approach * length / mu
    h_base = nusselt_flat_plate_laminar(re_l, pr) * k_air / length
    drop = pressure_drop_pin_bank_gaddis_gnielinski(v_max, d, st, sl, n_rows, arrangement, rho, mu)
    shape = np.broadcast_shapes(
        np.shape(h), np.shape(h_base), np.shape(drop.pressure_drop), np.shape(pr), np.shape(sd)
    )

    def full(x):
        return np.broadcast_to(x, shape).copy() if shape else np.asarray(x)

    return PinBankFlow(
        approach_velocity=full(approach),
        max_velocity=full(v_max),
        reynolds_max=full(re_max),
        nusselt=full(nu),
        heat_transfer_coefficient=full(h),
        base_heat_transfer_coefficient=full(h_base),
        pressure_drop=full(drop.pressure_drop),
        is_inlet_referenced=full(np.zeros(shape, dtype=bool)),
        row_correction=full(row_correction_zukauskas(n_rows, arrangement)),
        pressure_drop_coefficient=full(drop.drag_coefficient),
        base_reynolds=full(re_l),
        transverse_pitch_ratio=full(st / d),
        longitudinal_pitch_ratio=full(sl / d),
        diagonal_pitch_ratio=full(sd / d),
        row_count=full(n_rows),
        prandtl=full(pr),
        arrangement=arrangement,
        nusselt_zukauskas=full(nu_z),
        nusselt_gnielinski=full(nu_g),
        reynolds_void=full(re_void),
        aspect_ratio=full(_as_float(pin_height) / d),
        method=method,
    )


# --------------------------------------------------------------------------------------------
# Validity messages
# --------------------------------------------------------------------------------------------
def _masked(values, mask):
    return np.where(mask, _as_float(values), np.nan)


#: Reynolds numbers at which Zukauskas' table (Bejan 2013 / ht docs, Table F1 of docs/methods.md
#: f1) changes its constants, by arrangement.
ZUKAUSKAS_BRANCHES = {"inline": (100.0, 1000.0, 2.0e5), "staggered": (500.0, 1000.0, 2.0e5)}

#: Relative distance from a branch boundary within which a result is flagged.
BRANCH_BAND = 0.1


def plate_fin_flow_warnings(flow: PlateChannelFlow) -> list[str]:
    """Validity messages for a :class:`PlateChannelFlow` (each range checked where it applies).

    Parameters
    ----------
    flow : PlateChannelFlow
        Result of :func:`plate_fin_channel_flow` [-].

    Returns
    -------
    list of str
        One line per range left: Teertstra ``Re_b*`` (inlet-referenced elements), VDI ``Pr``
        and ``Re_2b`` (bulk-referenced elements), friction ``Re_Dh`` transitional (2300-1e4).
    """
    inlet = np.asarray(flow.is_inlet_referenced, dtype=bool)
    out = check_range(TEERTSTRA_MODIFIED_REYNOLDS, _masked(flow.modified_reynolds, inlet))
    out += check_range(VDI_CHANNEL_PRANDTL, _masked(flow.prandtl, ~inlet))
    out += check_range(VDI_CHANNEL_REYNOLDS, _masked(2.0 * flow.reynolds_spacing, ~inlet))
    re_dh = _as_float(flow.reynolds_hydraulic)
    out += check_range(
        PLATE_CHANNEL_FRICTION_REYNOLDS, _masked(re_dh, re_dh < TURBULENT_LIMIT_REYNOLDS)
    )
    out += plate_channel_transition_warnings(flow)
    return out


#: Share of ``Re_Dh = 2300`` from which a plate channel counts as near transition [-]
#: (common practice, no source).
NEAR_TRANSITION_SHARE = 0.8
#: Flat-plate Reynolds number on the channel length below which developing boundary layers
#: are taken as laminar (Incropera et al. 6th ed., Sec. 7.2: transition at 5e5 for a smooth
#: plate without disturbances).
FLAT_PLATE_TRANSITION_REYNOLDS = 5.0e5


def plate_channel_transition_warnings(flow: PlateChannelFlow) -> list[str]:
    """One message when a plate channel's flow is near or above transition (``Re_Dh``).

    The message says whether the channel is short enough for its boundary layers to stay
    laminar and developing (``L`` below the laminar entry length and ``Re_L`` below
    :data:`FLAT_PLATE_TRANSITION_REYNOLDS`), and that the laminar-developing and transitional
    models bracket h there.

    Parameters
    ----------
    flow : PlateChannelFlow
        Result of :func:`plate_fin_channel_flow` [-].

    Returns
    -------
    list of str
        Empty below ``NEAR_TRANSITION_SHARE * 2300``; else one line.
    """
    re_dh = _as_float(flow.reynolds_hydraulic)
    near = np.isfinite(re_dh) & (re_dh >= NEAR_TRANSITION_SHARE * LAMINAR_LIMIT_REYNOLDS)
    if not np.any(near):
        return []
    re_l = np.broadcast_to(_as_float(flow.reynolds_length), re_dh.shape)[near]
    entry = np.broadcast_to(_as_float(flow.entry_length), re_dh.shape)[near]
    length = np.broadcast_to(_as_float(flow.channel_length), re_dh.shape)[near]
    values = re_dh[near]
    shown = f"{values.min():.4g}" + (
        f" to {values.max():.4g}" if values.max() != values.min() else ""
    )
    short = np.all((length < entry) & (re_l < FLAT_PLATE_TRANSITION_REYNOLDS))
    where = (
        f"the channel (L = {1e3 * length.max():.4g} mm) is shorter than the laminar entry "
        f"length (0.05 Re_Dh D_h = {1e3 * entry.min():.4g} mm) and Re_L = {re_l.max():.3g} is "
        "below the flat-plate transition (about 5e5), so the boundary layers are still "
        "developing and laminar unless an upstream fan or grille trips them"
        if short
        else "the channel is long enough (or Re_L high enough) for the flow to be transitional"
    )
    return [
        f"plate channel: Re_Dh = {shown} is near or above 2300, where channel flow may become "
        f"transitional; {where}. The laminar-developing (Teertstra) and transitional (VDI) "
        "models bracket h here: finkit uses the lower by default and the correlation spread "
        "shows both"
    ]


#: Smallest published step of the Zukauskas table worth a warning [-]: smaller steps (the
#: staggered 1000 and both 2e5 boundaries, 2-3 %) change h less than the correlation's own
#: scatter (common practice, no source).
JOIN_WARNING_STEP = 0.05


def zukauskas_join_warnings(flow: PinBankFlow) -> list[str]:
    """Where a design sits at a step of the published Zukauskas table, say how big the step
    is for this design and how far finkit's joined value lies below the table.

    Parameters
    ----------
    flow : PinBankFlow
        Result of :func:`pin_fin_bank_flow` [-].

    Returns
    -------
    list of str
        One message per boundary whose step is at least :data:`JOIN_WARNING_STEP`, with a
        design inside its joining band or within :data:`BRANCH_BAND` of the boundary.
    """
    re = _as_float(flow.reynolds_max)
    st, sl = flow.transverse_pitch_ratio, flow.longitudinal_pitch_ratio
    arrangement = str(flow.arrangement)
    joined = _zukauskas_joined(re, arrangement, st, sl)
    table = _zukauskas_table(re, arrangement, st, sl)
    with np.errstate(divide="ignore", invalid="ignore"):
        below = np.where(table > 0, 1.0 - joined / table, 0.0)
    out = []
    f = ZUKAUSKAS_BLEND_FACTOR
    for b, step in zukauskas_branch_steps(arrangement, st, sl):
        step = np.broadcast_to(step, re.shape)
        if np.all(np.abs(step) < JOIN_WARNING_STEP):
            continue
        near = (
            np.isfinite(re) & (re >= b / f / (1 + BRANCH_BAND)) & (re <= b * f * (1 + BRANCH_BAND))
        )
        near &= (np.abs(re / b - 1.0) <= BRANCH_BAND) | (below > 1e-12)
        if not np.any(near):
            continue
        values, steps, gaps = re[near], step[near], below[near]
        shown = f"{values.min():.4g}" + (
            f" to {values.max():.4g}" if values.max() != values.min() else ""
        )
        step_text = f"{100 * steps.min():+.0f} %" + (
            f" to {100 * steps.max():+.0f} %" if steps.max() - steps.min() > 5e-3 else ""
        )
        rising = bool(np.all(steps > 0))
        band = f"{b:.4g} to {b * f:.4g}" if rising else f"{b / f:.4g} to {b:.4g}"
        out.append(
            f"Zukauskas pin bank: Re_D,max = {shown} is near {b:.4g}, where the published table "
            f"steps by {step_text} (its constants C and m change); finkit joins the two branches "
            f"over Re_D,max {band} on the lower side, so h here is "
            f"{100 * gaps.max():.0f} % below the table value at most (conservative; the table "
            "itself would give a design on the other side of the step that much more h)"
        )
    return out


def pin_fin_flow_warnings(flow: PinBankFlow) -> list[str]:
    """Validity messages for a :class:`PinBankFlow`.

    Parameters
    ----------
    flow : PinBankFlow
        Result of :func:`pin_fin_bank_flow` [-].

    Returns
    -------
    list of str
        Zukauskas ``Re_D,max`` and ``Pr``; Gaddis & Gnielinski ``Re``, row count and pitch
        ratios for the arrangement; flat-plate ``Re_L`` of the base.
    """
    out = []
    if flow.method != "gnielinski":
        out += check_range(ZUKAUSKAS_REYNOLDS, flow.reynolds_max)
        out += check_range(ZUKAUSKAS_PRANDTL, flow.prandtl)
        out += zukauskas_join_warnings(flow)
    if flow.method != "zukauskas":
        out += check_range(GNIELINSKI_BANK_REYNOLDS, flow.reynolds_void)
        out += check_range(GNIELINSKI_BANK_PRANDTL, flow.prandtl)
    out += check_range(PIN_ASPECT_RATIO, flow.aspect_ratio)
    out += check_range(ZUKAUSKAS_TRANSVERSE_RATIO, flow.transverse_pitch_ratio)
    out += check_range(ZUKAUSKAS_LONGITUDINAL_RATIO, flow.longitudinal_pitch_ratio)
    out += check_range(GADDIS_GNIELINSKI_REYNOLDS, flow.reynolds_max)
    out += check_range(GADDIS_GNIELINSKI_ROW_COUNT, flow.row_count)
    if flow.arrangement == "inline":
        out += check_range(GADDIS_GNIELINSKI_INLINE_TRANSVERSE_RATIO, flow.transverse_pitch_ratio)
        out += check_range(
            GADDIS_GNIELINSKI_INLINE_LONGITUDINAL_RATIO, flow.longitudinal_pitch_ratio
        )
    else:
        out += check_range(
            GADDIS_GNIELINSKI_STAGGERED_TRANSVERSE_RATIO, flow.transverse_pitch_ratio
        )
        out += check_range(
            GADDIS_GNIELINSKI_STAGGERED_LONGITUDINAL_RATIO, flow.longitudinal_pitch_ratio
        )
        out += check_range(GADDIS_GNIELINSKI_DIAGONAL_RATIO, flow.diagonal_pitch_ratio)
    out += check_range(FLAT_PLATE_LAMINAR_REYNOLDS, flow.base_reynolds)
    return out


def forced_validity_warnings(flow) -> list[str]:
    """Validity messages for either result type (dispatches on the type).

    Parameters
    ----------
    flow : PlateChannelFlow or PinBankFlow
        A result of :func:`plate_fin_channel_flow` or :func:`pin_fin_bank_flow` [-].

    Returns
    -------
    list of str
        The messages of :func:`plate_fin_flow_warnings` or :func:`pin_fin_flow_warnings`.
    """
    if isinstance(flow, PlateChannelFlow):
        return plate_fin_flow_warnings(flow)
    if isinstance(flow, PinBankFlow):
        return pin_fin_flow_warnings(flow)
    raise InputError(
        f"forced_validity_warnings: flow of type {type(flow).__name__} is not a "
        "PlateChannelFlow or PinBankFlow"
    )
