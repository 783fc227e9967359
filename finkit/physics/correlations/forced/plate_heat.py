"""Plate-fin channels in forced flow: heat transfer (laminar developing and turbulent flow)."""

from __future__ import annotations

import numpy as np

from finkit.physics.correlations.forced.validity import (
    LAMINAR_LIMIT_REYNOLDS,
    TURBULENT_LIMIT_REYNOLDS,
    _as_float,
)

__all__ = [
    "nusselt_duct_turbulent_gnielinski",
    "nusselt_plate_channel_teertstra",
    "nusselt_plate_channel_vdi",
    "nusselt_plate_channel_vdi_laminar",
]


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
