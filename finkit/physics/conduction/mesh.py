"""Inputs, their checks and the mesh of the finite-volume conduction model."""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from finkit.errors import GeometryError, InputError

__all__ = [
    "CHAIN_FIN_TIPS",
    "CONDUCTION_SOLVERS",
    "ChainComparison",
    "ConductionSolution",
    "DIRECT_SOLVER_MAX_CELLS",
    "RefinementStudy",
]

#: Linear solvers accepted by :func:`solve_plate_fin_conduction`.
CONDUCTION_SOLVERS = ("auto", "direct", "cg")

#: Largest number of unknowns (quarter-sink solid cells) that ``solver="auto"`` solves directly.
DIRECT_SOLVER_MAX_CELLS = 200_000

#: Fin models of the chain in :func:`compare_with_chain`: "corrected" is the adiabatic tip at
#: the corrected height ``H + t/2``; "convective" is the exact convective tip (Incropera case A).
CHAIN_FIN_TIPS = ("corrected", "convective")

# Default mesh: cells of about min(W, L)/40 and at most a quarter of the half source edge.
_DEFAULT_CELLS_ACROSS = 40.0
_DEFAULT_CELLS_PER_SOURCE_EDGE = 8.0
_MERGE_TOLERANCE = 1e-9  # relative: breakpoints closer than this are one mesh line
_CG_TOLERANCE = 1e-10


class ConductionSolution(NamedTuple):
    """Finite-volume conduction solution of a plate-fin heat sink.

    Attributes
    ----------
    source_mean_temperature : float
        Area-mean temperature of the source face [K].
    source_max_temperature : float
        Highest source-face temperature of the mesh (the face of the cell next to the source
        centre; it approaches the centre value as the mesh is refined) [K].
    base_mean_temperature : float
        Area-mean temperature of the fin roots (base/fin interface); for a bare plate the mean of
        the cooled top face [K].
    fin_tip_mean_temperature : float
        Area-mean temperature of the fin tips; NaN for a bare plate [K].
    heat_rate_balance : float
        Energy-balance residual ``(sum of convective losses - power) / power`` [-].
    convective_heat_rate : float
        Sum of the convective losses of the whole sink [W].
    thermal_resistance_source_mean : float
        ``(source_mean_temperature - air_temperature) / power`` [K W⁻¹].
    cell_count : int
        Solid cells solved (one quarter of the sink, by symmetry) [-].
    solve_time : float
        Wall time of meshing, assembly and linear solve [s].
    temperature : numpy.ndarray
        Cell temperatures of the whole sink, shape ``(len(x), len(y), len(z))``; NaN in the void
        between fins [K].
    x : numpy.ndarray
        Cell-centre coordinates across the flow, 0 to ``base_width`` [m].
    y : numpy.ndarray
        Cell-centre coordinates along the flow, 0 to ``base_length`` [m].
    z : numpy.ndarray
        Cell-centre coordinates from the back face of the base (z = 0) to the fin tips [m].
    """

    source_mean_temperature: float
    source_max_temperature: float
    base_mean_temperature: float
    fin_tip_mean_temperature: float
    heat_rate_balance: float
    convective_heat_rate: float
    thermal_resistance_source_mean: float
    cell_count: int
    solve_time: float
    temperature: np.ndarray
    x: np.ndarray
    y: np.ndarray
    z: np.ndarray


class ChainComparison(NamedTuple):
    """The 1-D resistance chain against the finite-volume conduction solution.

    All resistances are from the mean source temperature to the air. Relative differences are
    ``(R_chain - R_conduction) / R_conduction``: positive when the chain is conservative.

    Attributes
    ----------
    conduction_resistance : float
        Finite-volume result (Richardson-extrapolated when refinement levels were given)
        [K W⁻¹].
    chain_resistance_series : float
        ``R_sp,avg (exact series) + t_b/(k_b W L) + R_0`` [K W⁻¹].
    chain_resistance_song_lee_au : float
        ``R_sp,avg (Song-Lee-Au) + t_b/(k_b W L) + R_0`` [K W⁻¹].
    relative_difference_series : float
        Chain with the exact series against the conduction solution [-].
    relative_difference_song_lee_au : float
        Chain with Song-Lee-Au against the conduction solution [-].
    spreading_resistance_series : float
        Average spreading resistance, exact series with ``h_eff = 1/(R_0 W L)`` [K W⁻¹].
    spreading_resistance_song_lee_au : float
        Average spreading resistance, Song-Lee-Au with ``R_0`` [K W⁻¹].
    base_resistance : float
        One-dimensional base conduction ``t_b/(k_b W L)`` [K W⁻¹].
    array_resistance : float
        Fin array and exposed base ``R_0 = 1/(N η_f h A_f + h_b A_b)`` [K W⁻¹].
    fin_efficiency : float
        η_f of one fin (tip model as chosen); NaN for a bare plate [-].
    surface_efficiency : float
        Overall surface efficiency ``η_o = 1/(R_0 h A_t)`` with the fin ``h`` [-].
    verdict : str
        One sentence for the note, e.g. "the 1-D chain is within 3.1 % of the conduction
        solution (...)".
    solution : ConductionSolution
        The finest conduction solution computed.
    """

    conduction_resistance: float
    chain_resistance_series: float
    chain_resistance_song_lee_au: float
    relative_difference_series: float
    relative_difference_song_lee_au: float
    spreading_resistance_series: float
    spreading_resistance_song_lee_au: float
    base_resistance: float
    array_resistance: float
    fin_efficiency: float
    surface_efficiency: float
    verdict: str
    solution: ConductionSolution


class RefinementStudy(NamedTuple):
    """Mesh-refinement study of the source-mean thermal resistance.

    Attributes
    ----------
    levels : numpy.ndarray
        Refinement levels (cells per mesh segment are multiplied by the level) [-].
    cell_counts : numpy.ndarray
        Solid cells solved at each level (quarter sink) [-].
    resistances : numpy.ndarray
        ``thermal_resistance_source_mean`` at each level [K W⁻¹].
    solve_times : numpy.ndarray
        Wall time of each solve [s].
    refinement_ratio : float
        Constant ratio of successive levels, r [-].
    observed_order : float
        ``p = ln((R_1 - R_2)/(R_2 - R_3)) / ln r`` from the last three levels; NaN when the
        differences change sign (oscillatory convergence) [-].
    extrapolated_resistance : float
        Richardson extrapolation ``R_3 + (R_3 - R_2)/(r^p - 1)``; the finest value when ``p`` is
        NaN [K W⁻¹].
    grid_convergence_index : float
        Roache's GCI of the finest mesh, ``1.25 |(R_3 - R_2)/R_3| / (r^p - 1)``; NaN when ``p``
        is NaN [-].
    """

    levels: np.ndarray
    cell_counts: np.ndarray
    resistances: np.ndarray
    solve_times: np.ndarray
    refinement_ratio: float
    observed_order: float
    extrapolated_resistance: float
    grid_convergence_index: float


# ----------------------------------------------------------------------------- input checks


def _scalar(name, value, unit, low=0.0, allow_equal=False):
    try:
        v = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise InputError(f"{name} = {value!r} is not a number") from None
    if v.size != 1:
        raise InputError(
            f"{name} has {v.size} values; the conduction solver takes one design (a scalar)"
        )
    v = float(v.reshape(()))
    ok = np.isfinite(v) and (v >= low if allow_equal else v > low)
    if not ok:
        rel = "≥" if allow_equal else ">"
        raise InputError(f"{name} = {v:.6g} {unit} is not allowed; must be finite and {rel} {low}")
    return v


class _Design(NamedTuple):
    W: float
    L: float
    tb: float
    N: int
    t: float
    H: float
    k: float
    kb: float
    h: float
    hb: float
    ls: float
    ws: float


def _design(
    base_width,
    base_length,
    base_thickness,
    fin_count,
    fin_thickness,
    fin_height,
    thermal_conductivity,
    heat_transfer_coefficient,
    source_length,
    source_width,
    base_heat_transfer_coefficient,
    base_thermal_conductivity,
) -> _Design:
    W = _scalar("base_width", base_width, "m")
    L = _scalar("base_length", base_length, "m")
    tb = _scalar("base_thickness", base_thickness, "m")
    n = _scalar("fin_count", fin_count, "", allow_equal=True)
    if abs(n - round(n)) > 1e-9 or round(n) == 1:
        raise GeometryError(f"fin_count = {n:.6g} is not allowed; must be 0 (bare plate) or ≥ 2")
    N = int(round(n))
    k = _scalar("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    kb = k
    if base_thermal_conductivity is not None:
        kb = _scalar("base_thermal_conductivity", base_thermal_conductivity, "W m⁻¹ K⁻¹")
    h = _scalar("heat_transfer_coefficient", heat_transfer_coefficient, "W m⁻² K⁻¹")
    hb = h
    if base_heat_transfer_coefficient is not None:
        hb = _scalar(
            "base_heat_transfer_coefficient",
            base_heat_transfer_coefficient,
            "W m⁻² K⁻¹",
            allow_equal=True,
        )
    if N >= 2:
        t = _scalar("fin_thickness", fin_thickness, "m")
        H = _scalar("fin_height", fin_height, "m")
        if not W - N * t > 1e-9 * W:
            raise GeometryError(
                f"fin_count * fin_thickness = {N * t:.6g} m ≥ base_width = {W:.6g} m; "
                "the fins must leave a gap (W - N t)/(N - 1) > 0"
            )
    else:
        t, H = 0.0, 0.0
    ls = _scalar("source_length", source_length, "m")
    ws = _scalar("source_width", source_width, "m")
    if ls > L * (1 + 1e-12) or ws > W * (1 + 1e-12):
        raise GeometryError(
            f"source {ls:.6g} m x {ws:.6g} m does not fit on the base {L:.6g} m x {W:.6g} m "
            "(source_length along base_length, source_width along base_width)"
        )
    return _Design(W, L, tb, N, t, H, k, kb, h, hb, min(ls, L), min(ws, W))


# ----------------------------------------------------------------------------- mesh


def _merge(points, span):
    p = np.unique(np.clip(points, 0.0, span))
    keep = np.concatenate(([True], np.diff(p) > _MERGE_TOLERANCE * span))
    p = p[keep]
    p[-1] = span
    return p


def _edges(breaks, counts):
    """Cell edges from segment breakpoints and cells per segment (vectorised)."""
    counts = np.asarray(counts, dtype=int)
    seg = np.repeat(np.arange(counts.size), counts)
    first = np.repeat(np.cumsum(counts) - counts, counts)
    frac = (np.arange(seg.size) - first) / np.repeat(counts, counts)
    lengths = np.diff(breaks)
    return np.append(breaks[seg] + frac * lengths[seg], breaks[-1])


def _segment_counts(breaks, target, minimum, level):
    lengths = np.diff(breaks)
    n = np.maximum(np.ceil(lengths / target - 1e-9), minimum).astype(int)
    return n * int(level)


class _Mesh(NamedTuple):
    xe: np.ndarray
    ye: np.ndarray
    ze: np.ndarray
    fin_x: np.ndarray  # (nx,) bool: cell column is in a fin
    nzb: int  # cells through the base


def _mesh(d: _Design, cell_size, level) -> _Mesh:
    half_w, half_l = 0.5 * d.W, 0.5 * d.L
    h0 = cell_size
    # x: fin edges, source edge, mid-plane
    xb = [0.0, half_w, half_w - 0.5 * d.ws]
    if d.N >= 2:
        pitch = (d.W - d.N * d.t) / (d.N - 1) + d.t
        left = np.arange(d.N) * pitch
        xb = np.concatenate((xb, left, left + d.t))
    xb = _merge(np.asarray(xb, dtype=float), half_w)
    mid = 0.5 * (xb[:-1] + xb[1:])
    if d.N >= 2:
        in_fin = np.mod(mid, pitch) < d.t
    else:
        in_fin = np.zeros(mid.size, dtype=bool)
    target = np.where(in_fin, min(h0, 0.5 * d.t) if d.N >= 2 else h0, h0)
    nx = _segment_counts(xb, target, 1, level)
    xe = _edges(xb, nx)
    fin_x = np.repeat(in_fin, nx)
    # y: source edge, mid-plane
    yb = _merge(np.array([0.0, half_l - 0.5 * d.ls, half_l]), half_l)
    ye = _edges(yb, _segment_counts(yb, h0, 1, level))
    # z: base (at least 2 cells), fins (at least 4 cells)
    nzb = int(max(2, np.ceil(d.tb / h0 - 1e-9))) * int(level)
    zb = np.linspace(0.0, d.tb, nzb + 1)
    if d.N >= 2:
        nzf = int(max(4, np.ceil(d.H / h0 - 1e-9))) * int(level)
        ze = np.concatenate((zb, d.tb + d.H * np.arange(1, nzf + 1) / nzf))
    else:
        ze = zb
    return _Mesh(xe, ye, ze, fin_x, nzb)
