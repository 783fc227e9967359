"""Validity messages of the forced-convection correlations: what a case outside a range is told."""

from __future__ import annotations

import numpy as np

from finkit.errors import InputError
from finkit.physics.correlations.forced.pin_array import (
    PinBankFlow,
    _zukauskas_joined,
    _zukauskas_table,
    zukauskas_branch_steps,
)
from finkit.physics.correlations.forced.plate_friction import (
    PlateChannelFlow,
)
from finkit.physics.correlations.forced.validity import (
    FLAT_PLATE_LAMINAR_REYNOLDS,
    GADDIS_GNIELINSKI_DIAGONAL_RATIO,
    GADDIS_GNIELINSKI_INLINE_LONGITUDINAL_RATIO,
    GADDIS_GNIELINSKI_INLINE_TRANSVERSE_RATIO,
    GADDIS_GNIELINSKI_REYNOLDS,
    GADDIS_GNIELINSKI_ROW_COUNT,
    GADDIS_GNIELINSKI_STAGGERED_LONGITUDINAL_RATIO,
    GADDIS_GNIELINSKI_STAGGERED_TRANSVERSE_RATIO,
    GNIELINSKI_BANK_PRANDTL,
    GNIELINSKI_BANK_REYNOLDS,
    LAMINAR_LIMIT_REYNOLDS,
    PIN_ASPECT_RATIO,
    PLATE_CHANNEL_FRICTION_REYNOLDS,
    TEERTSTRA_MODIFIED_REYNOLDS,
    TURBULENT_LIMIT_REYNOLDS,
    VDI_CHANNEL_PRANDTL,
    VDI_CHANNEL_REYNOLDS,
    ZUKAUSKAS_BLEND_FACTOR,
    ZUKAUSKAS_LONGITUDINAL_RATIO,
    ZUKAUSKAS_PRANDTL,
    ZUKAUSKAS_REYNOLDS,
    ZUKAUSKAS_TRANSVERSE_RATIO,
    _as_float,
)
from finkit.validity import check_range

__all__ = [
    "BRANCH_BAND",
    "FLAT_PLATE_TRANSITION_REYNOLDS",
    "JOIN_WARNING_STEP",
    "NEAR_TRANSITION_SHARE",
    "ZUKAUSKAS_BRANCHES",
    "forced_validity_warnings",
    "pin_fin_flow_warnings",
    "plate_channel_transition_warnings",
    "plate_fin_flow_warnings",
    "zukauskas_join_warnings",
]


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
