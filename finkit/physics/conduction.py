"""Finite-volume conduction in a plate-fin heat sink: the model-form check of the 1-D chain.

The heat-sink chain (:mod:`finkit.physics.sink`) treats the base and fins with one-dimensional
pieces:
spreading resistance of the base (:mod:`finkit.physics.spreading`), 1-D conduction through it, and
the
fin array as an overall surface efficiency (docs/methods.md a, c, i). Each piece assumes
something the real part does not do: the spreading models put a *uniform* ``h`` on the cooled
face of the base, where the real base is cooled through discrete fin roots; the fin model
assumes a uniform root temperature along and across each fin. This module solves the steady
heat-conduction equation in the solid itself, base and fins together, with the same ``h`` on
the same surfaces, so that the reviewer can see how far the chain is from the conduction
solution for one design.

Model
-----
* Solid: base plate ``W x L x t_b`` (x across the flow, y along it, z up through the base) with
  ``N`` plate fins of thickness ``t`` and height ``H`` running the full length; the edge fins are
  flush with the base edges, so the clear gap is ``b = (W - N t)/(N - 1)`` (as in
  :class:`finkit.physics.geometry.PlateFinSink`). ``fin_count = 0`` gives a bare plate.
* Source: uniform heat flux ``power / (l_s w_s)`` over a rectangle centred on the back face
  (z = 0), ``source_length`` along y, ``source_width`` along x.
* Convection to ``air_temperature``: ``heat_transfer_coefficient`` on both fin faces and the fin
  tips (including the outer faces of the two edge fins), ``base_heat_transfer_coefficient`` on
  the exposed base between fins (the whole top face of a bare plate).
* Adiabatic: the back face outside the source, the four side faces of the base, and the inlet
  and outlet end faces of the fins. These are the surfaces that ``PlateFinSink.total_area``
  leaves out, so the chain and the conduction solution see the same wetted area.
* Constant conductivities; the base may have its own (``base_thermal_conductivity``).

Discretisation
--------------
Cell-centred finite volumes on a structured, non-uniform 3-D mesh. Every fin face, gap edge,
source edge and the base/fin interface is a mesh line, so fin cells are solid columns of the
mesh and gap cells above the base are void (not solved). The conductance between neighbouring
solid cells is the series (harmonic) combination of the two half cells, ``A / (d_1/(2k_1) +
d_2/(2k_2))``; a convective face has ``A / (1/h + d/(2k))`` (film in series with the half cell).
This two-point flux scheme is second-order for smooth solutions. The observed order of the
source-mean resistance (:func:`refine_study`, checked in the tests) is about 1.9 for a bare plate
(the flux jumps at the source edge) and about 1.6 with fins: the fin roots are re-entrant (270°)
corners where the temperature gradient is singular, which lowers the rate of any mesh of this
kind. Richardson extrapolation with the observed order accounts for it.

Because the source is centred and the fin layout is symmetric about both mid-planes, only one
quarter (``0 ≤ x ≤ W/2``, ``0 ≤ y ≤ L/2``) is solved, with adiabatic symmetry planes; the returned
field is mirrored to the whole sink. The matrix (symmetric positive definite) is assembled in
COO form with numpy (no loop over cells) and converted to CSR. ``solver="direct"`` uses
``scipy.sparse.linalg.spsolve`` (SuperLU, minimum-degree ordering on ``A + A^T``);
``solver="cg"`` uses conjugate gradients with a diagonal (Jacobi) preconditioner to a relative
residual of 1e-10; ``solver="auto"`` (default) takes the direct solver up to
``DIRECT_SOLVER_MAX_CELLS`` unknowns and CG above. On a 2-core machine the direct solver takes
about 1 s at 4e4 cells and 10 s at 1.4e5, and its fill grows faster than the cell count, so CG
(whose memory is proportional to the cell count) is used for larger meshes. scipy has no
algebraic multigrid or incomplete Cholesky; ILU-preconditioned GMRES and block (plane) Jacobi
preconditioners were tried here and were no faster. ``bench/bench_conduction.py`` prints times.

The functions take scalars (one design per call), not broadcast arrays: each call builds and
solves one mesh.
"""

from __future__ import annotations

import time
from typing import NamedTuple

import numpy as np
from scipy import sparse
from scipy.sparse import linalg as splinalg

from finkit.errors import GeometryError, InputError, SolverError
from finkit.physics.fins.analytic import (
    uniform_fin,
    uniform_fin_efficiency_corrected_length,
)
from finkit.physics.spreading import (
    spreading_resistance_rectangular_series,
    spreading_resistance_song_lee_au,
)

__all__ = [
    "CONDUCTION_SOLVERS",
    "DIRECT_SOLVER_MAX_CELLS",
    "CHAIN_FIN_TIPS",
    "ConductionSolution",
    "ChainComparison",
    "RefinementStudy",
    "solve_plate_fin_conduction",
    "compare_with_chain",
    "refine_study",
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


# ----------------------------------------------------------------------------- assembly


def _solve_quarter(d: _Design, m: _Mesh, solver: str):
    """Assemble and solve the quarter model for the excess temperature per watt of source."""
    dx, dy, dz = np.diff(m.xe), np.diff(m.ye), np.diff(m.ze)
    nx, ny, nz = dx.size, dy.size, dz.size
    in_base = np.arange(nz) < m.nzb
    solid = np.broadcast_to(m.fin_x[:, None, None] | in_base[None, None, :], (nx, ny, nz))
    index = np.full((nx, ny, nz), -1, dtype=np.int64)
    n_unknown = int(solid.sum())
    index[solid] = np.arange(n_unknown)
    kz = np.where(in_base, d.kb, d.k)  # conductivity by layer
    kc = np.broadcast_to(kz[None, None, :], (nx, ny, nz))

    rows, cols, vals = [], [], []
    diag = np.zeros(n_unknown)
    # boundary conductances (to air), collected for the heat balance
    b_idx, b_g = [], []

    def couple(axis, width):
        """Interior faces between solid neighbours along one axis."""
        sl_a = [slice(None)] * 3
        sl_b = [slice(None)] * 3
        sl_a[axis] = slice(0, -1)
        sl_b[axis] = slice(1, None)
        sa, sb = tuple(sl_a), tuple(sl_b)
        both = solid[sa] & solid[sb]
        shape = [1, 1, 1]
        shape[axis] = -1
        w = width.reshape(shape)
        half = 0.5 * (w[sa] / kc[sa] + w[sb] / kc[sb])
        area = _face_area(axis, dx, dy, dz)  # size 1 along the axis: broadcasts
        g = np.broadcast_to(area / half, both.shape)[both]
        i, j = index[sa][both], index[sb][both]
        rows.extend((i, j))
        cols.extend((j, i))
        vals.extend((-g, -g))
        diag[:] += np.bincount(i, weights=g, minlength=n_unknown)
        diag[:] += np.bincount(j, weights=g, minlength=n_unknown)

    couple(0, dx)
    couple(1, dy)
    couple(2, dz)

    # convective faces ------------------------------------------------------------------------
    area_x = dy[:, None] * dz[None, :]  # (ny, nz)
    area_z = dx[:, None] * dy[None, :]  # (nx, ny)

    def film(area, h, half_width, k):
        return area * h / (1.0 + h * half_width / k)

    if d.N >= 2:
        # fin side faces: a solid fin cell whose x-neighbour is void or the outer edge x = 0
        fin_layers = ~in_base
        fx = m.fin_x
        # left face of cell i exposed: i == 0 (outer edge) or cell i-1 not a fin
        left_open = fx & np.concatenate(([True], ~fx[:-1]))
        # right face exposed: neighbour i+1 not a fin; the last cell touches the symmetry plane
        right_open = fx & np.concatenate((~fx[1:], [False]))
        for open_mask in (left_open, right_open):
            ii = np.nonzero(open_mask)[0]
            if ii.size == 0:
                continue
            g = film(
                area_x[None, :, fin_layers],
                d.h,
                0.5 * dx[ii][:, None, None],
                d.k,
            )
            g = np.broadcast_to(g, (ii.size, ny, int(fin_layers.sum())))
            cells = index[ii][:, :, fin_layers]
            b_idx.append(cells.ravel())
            b_g.append(g.ravel())
        # fin tips
        ii = np.nonzero(fx)[0]
        g = film(area_z[ii], d.h, 0.5 * dz[-1], d.k)
        b_idx.append(index[ii, :, -1].ravel())
        b_g.append(g.ravel())
        gap = ~fx
    else:
        gap = np.ones(nx, dtype=bool)
    # exposed base top (between fins, or the whole top of a bare plate)
    ii = np.nonzero(gap)[0]
    if ii.size and d.hb > 0.0:
        g = film(area_z[ii], d.hb, 0.5 * dz[m.nzb - 1], d.kb)
        b_idx.append(index[ii, :, m.nzb - 1].ravel())
        b_g.append(g.ravel())

    b_idx = np.concatenate(b_idx) if b_idx else np.zeros(0, dtype=np.int64)
    b_g = np.concatenate(b_g) if b_g else np.zeros(0)
    diag += np.bincount(b_idx, weights=b_g, minlength=n_unknown)
    if not np.any(b_g > 0.0):
        raise InputError(
            "heat_transfer_coefficient: no cooled surface; the sink has no path to air"
        )

    # source on the back face: flux for 1 W on the whole sink (1/4 W on the quarter) ----------
    xc = 0.5 * (m.xe[:-1] + m.xe[1:])
    yc = 0.5 * (m.ye[:-1] + m.ye[1:])
    sx = xc > 0.5 * (d.W - d.ws)
    sy = yc > 0.5 * (d.L - d.ls)
    src_area = area_z * (sx[:, None] & sy[None, :])  # (nx, ny)
    flux = 0.25 / src_area.sum()
    rhs = np.zeros(n_unknown)
    rhs[index[:, :, 0].ravel()] = (flux * src_area).ravel()

    rows.append(np.arange(n_unknown))
    cols.append(np.arange(n_unknown))
    vals.append(diag)
    a = sparse.coo_matrix(
        (np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))),
        shape=(n_unknown, n_unknown),
    ).tocsr()

    if solver == "direct" or (solver == "auto" and n_unknown <= DIRECT_SOLVER_MAX_CELLS):
        theta = splinalg.spsolve(a, rhs, permc_spec="MMD_AT_PLUS_A")
    else:
        inv_d = 1.0 / diag
        precond = splinalg.LinearOperator(a.shape, matvec=lambda v: inv_d * v, dtype=float)
        theta, info = splinalg.cg(
            a, rhs, rtol=_CG_TOLERANCE, atol=0.0, M=precond, maxiter=20 * n_unknown
        )
        if info != 0:
            raise SolverError(
                f"solver = 'cg' did not converge in {info} iterations; use solver='direct'"
            )
    if not np.all(np.isfinite(theta)):
        raise SolverError("solver: the conduction solution is not finite; check the inputs")

    field = np.full((nx, ny, nz), np.nan)
    field[solid] = theta
    return field, src_area, flux, b_idx, b_g, theta, n_unknown


def _face_area(axis, dx, dy, dz):
    if axis == 0:
        return dy[None, :, None] * dz[None, None, :]
    if axis == 1:
        return dx[:, None, None] * dz[None, None, :]
    return dx[:, None, None] * dy[None, :, None]


def _mirror(field, xe, ye, W, L):
    xc = 0.5 * (xe[:-1] + xe[1:])
    yc = 0.5 * (ye[:-1] + ye[1:])
    full = np.concatenate((field, field[::-1]), axis=0)
    full = np.concatenate((full, full[:, ::-1]), axis=1)
    x = np.concatenate((xc, W - xc[::-1]))
    y = np.concatenate((yc, L - yc[::-1]))
    return full, x, y


def _default_cell_size(d: _Design):
    return min(
        min(d.W, d.L) / _DEFAULT_CELLS_ACROSS,
        min(d.ws, d.ls) / _DEFAULT_CELLS_PER_SOURCE_EDGE,
    )


def _level(name, value):
    try:
        lv = int(value)
    except (TypeError, ValueError):
        raise InputError(f"{name} = {value!r} is not allowed; must be a whole number ≥ 1") from None
    if lv != value or lv < 1:
        raise InputError(f"{name} = {value!r} is not allowed; must be a whole number ≥ 1")
    return lv


def _solve(d: _Design, power, air_temperature, cell_size, refinement, solver):
    if solver not in CONDUCTION_SOLVERS:
        raise InputError(f"solver = {solver!r} is not allowed; must be one of {CONDUCTION_SOLVERS}")
    level = _level("mesh_refinement", refinement)
    h0 = _default_cell_size(d) if cell_size is None else _scalar("mesh_cell_size", cell_size, "m")
    start = time.perf_counter()
    m = _mesh(d, h0, level)
    field, src_area, flux, b_idx, b_g, theta, n = _solve_quarter(d, m, solver)
    elapsed = time.perf_counter() - start

    dz = np.diff(m.ze)
    dx = np.diff(m.xe)
    dy = np.diff(m.ye)
    # source face temperatures (per watt): cell value plus the half-cell drop under the flux
    face = field[:, :, 0] + flux * 0.5 * dz[0] / d.kb
    on_src = src_area > 0
    src_mean = float(np.sum(face * src_area) / src_area.sum())
    src_max = float(np.max(face[on_src]))
    # convective losses of the quarter per watt of the whole sink
    lost = 4.0 * float(np.sum(b_g * theta[b_idx]))
    balance = lost - 1.0
    # fin roots / cooled top and fin tips
    area_z = dx[:, None] * dy[None, :]
    if d.N >= 2:
        fins = m.fin_x
        g1 = 2.0 * d.kb / dz[m.nzb - 1]
        g2 = 2.0 * d.k / dz[m.nzb]
        t1 = field[fins, :, m.nzb - 1]
        t2 = field[fins, :, m.nzb]
        root = (g1 * t1 + g2 * t2) / (g1 + g2)
        w = area_z[fins]
        base_mean = float(np.sum(root * w) / w.sum())
        tip_cells = field[fins, :, -1]
        hz = d.h * 0.5 * dz[-1] / d.k
        tip = tip_cells / (1.0 + hz)
        tip_mean = float(np.sum(tip * w) / w.sum())
    else:
        hz = d.hb * 0.5 * dz[-1] / d.kb
        top = field[:, :, -1] / (1.0 + hz)
        base_mean = float(np.sum(top * area_z) / area_z.sum())
        tip_mean = float("nan")

    full, x, y = _mirror(field, m.xe, m.ye, d.W, d.L)
    z = 0.5 * (m.ze[:-1] + m.ze[1:])
    q = float(power)
    ta = float(air_temperature)
    return ConductionSolution(
        source_mean_temperature=ta + q * src_mean,
        source_max_temperature=ta + q * src_max,
        base_mean_temperature=ta + q * base_mean,
        fin_tip_mean_temperature=ta + q * tip_mean,
        heat_rate_balance=float(balance),
        convective_heat_rate=q * lost,
        thermal_resistance_source_mean=src_mean,
        cell_count=n,
        solve_time=elapsed,
        temperature=ta + q * full,
        x=x,
        y=y,
        z=z,
    )


# ----------------------------------------------------------------------------- public API


def solve_plate_fin_conduction(
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
    power,
    air_temperature,
    base_heat_transfer_coefficient=None,
    base_thermal_conductivity=None,
    mesh_cell_size=None,
    mesh_refinement=1,
    solver="auto",
) -> ConductionSolution:
    r"""Steady 3-D conduction in the base and fins of a plate-fin heat sink (finite volumes).

    Parameters
    ----------
    base_width : float
        Base width W across the flow [m].
    base_length : float
        Base length L along the flow; the fins run the full length [m].
    base_thickness : float
        Base thickness t_b [m].
    fin_count : int
        Number of fins N, ``≥ 2`` (edge fins flush with the base edges), or 0 for a bare plate
        [-].
    fin_thickness : float
        Fin thickness t (ignored for a bare plate) [m].
    fin_height : float
        Fin height H, base top to tip (ignored for a bare plate) [m].
    thermal_conductivity : float
        Conductivity of the fins, and of the base unless ``base_thermal_conductivity`` is given
        [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : float
        Uniform coefficient on the fin faces and tips [W m⁻² K⁻¹].
    source_length : float
        Source edge along the flow (along ``base_length``), centred [m].
    source_width : float
        Source edge across the flow (along ``base_width``), centred [m].
    power : float
        Heat input, spread uniformly over the source [W].
    air_temperature : float
        Air temperature that ``h`` refers to [K].
    base_heat_transfer_coefficient : float, optional
        Coefficient on the exposed base between fins (``0`` makes it adiabatic); default the fin
        ``heat_transfer_coefficient`` [W m⁻² K⁻¹].
    base_thermal_conductivity : float, optional
        Conductivity of the base, when it differs from the fins' (bonded fins, copper base);
        default ``thermal_conductivity`` [W m⁻¹ K⁻¹].
    mesh_cell_size : float, optional
        Target cell size of refinement level 1; default ``min(min(W, L)/40, min(l_s, w_s)/8)``.
        At least 2 cells go through the base and 4 along the fin height, and fin cells are no
        thicker than ``t/2`` [m].
    mesh_refinement : int, default 1
        Every mesh segment gets this many times the level-1 cells (nested meshes; cell count
        grows as its cube) [-].
    solver : {"auto", "direct", "cg"}, default "auto"
        ``"direct"``: SuperLU (``scipy.sparse.linalg.spsolve``); ``"cg"``: Jacobi-preconditioned
        conjugate gradients to a relative residual of 1e-10; ``"auto"``: direct up to
        ``DIRECT_SOLVER_MAX_CELLS`` unknowns, CG above [-].

    Returns
    -------
    ConductionSolution
        Source mean and maximum, fin-root mean and fin-tip mean temperatures, energy balance,
        source-mean resistance, cell count, solve time, and the temperature field with its
        cell-centre coordinates (mirrored to the whole sink).

    Raises
    ------
    InputError
        A non-positive or non-scalar input, an unknown solver.
    GeometryError
        Fins that do not fit, ``fin_count = 1``, a source larger than the base.
    SolverError
        The iterative solver did not converge.

    Notes
    -----
    Solves :math:`\nabla\cdot(k\nabla T) = 0` in the solid with

    .. math::
        -k\,\partial T/\partial n = h\,(T - T_\infty)\ \text{on fin faces and tips},\quad
        h_b\,(T - T_\infty)\ \text{on the exposed base},\quad
        k\,\partial T/\partial z = -q''\ \text{on the source},

    and adiabatic elsewhere (back face outside the source, base sides, fin ends); see the module
    docstring for the mesh, the scheme and the quarter symmetry. The energy balance closes to
    the linear solver's precision (``heat_rate_balance`` ~1e-12 with the direct solver).

    Examples
    --------
    >>> s = solve_plate_fin_conduction(0.05, 0.05, 0.004, 6, 0.0015, 0.02, 200.0, 40.0,
    ...                                0.02, 0.02, 10.0, 300.0)
    >>> abs(s.heat_rate_balance) < 1e-9
    True
    """
    d = _design(
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
    )
    q = _scalar("power", power, "W")
    ta = _scalar("air_temperature", air_temperature, "K")
    return _solve(d, q, ta, mesh_cell_size, mesh_refinement, solver)


def _richardson(levels, values):
    levels = np.asarray(levels, dtype=float)
    r = levels[-1] / levels[-2]
    r_prev = levels[-2] / levels[-3]
    if not np.isclose(r, r_prev, rtol=1e-9):
        raise InputError(
            f"levels = {tuple(levels.tolist())} is not allowed; the last three must have a "
            "constant ratio (e.g. 1, 2, 4)"
        )
    f1, f2, f3 = values[-3], values[-2], values[-1]
    e12, e23 = f1 - f2, f2 - f3
    if e23 == 0.0:
        return r, float("nan"), f3, 0.0
    ratio = e12 / e23
    if not ratio > 0.0 or ratio == 1.0:
        return r, float("nan"), f3, float("nan")
    p = float(np.log(ratio) / np.log(r))
    ext = f3 + (f3 - f2) / (r**p - 1.0)
    gci = 1.25 * abs((f3 - f2) / f3) / (r**p - 1.0)
    return r, p, float(ext), float(gci)


def refine_study(
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
    base_heat_transfer_coefficient=None,
    base_thermal_conductivity=None,
    mesh_cell_size=None,
    levels=(1, 2, 4),
    solver="auto",
) -> RefinementStudy:
    r"""Source-mean resistance on nested meshes, with Richardson extrapolation and observed order.

    Parameters
    ----------
    base_width, base_length, base_thickness : float
        Base plate W (across the flow), L (along it), t_b [m].
    fin_count : int
        Number of fins N (``≥ 2``, or 0 for a bare plate) [-].
    fin_thickness, fin_height : float
        Fin thickness t and height H [m].
    thermal_conductivity : float
        Fin (and base) conductivity [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : float
        Coefficient on fin faces and tips [W m⁻² K⁻¹].
    source_length, source_width : float
        Centred source, along and across the flow [m].
    base_heat_transfer_coefficient : float, optional
        Coefficient on the exposed base; default the fin coefficient [W m⁻² K⁻¹].
    base_thermal_conductivity : float, optional
        Base conductivity; default ``thermal_conductivity`` [W m⁻¹ K⁻¹].
    mesh_cell_size : float, optional
        Level-1 target cell size (see :func:`solve_plate_fin_conduction`) [m].
    levels : sequence of int, default (1, 2, 4)
        At least three refinement levels; the last three must have a constant ratio r [-].
    solver : {"auto", "direct", "cg"}, default "auto"
        Linear solver (see :func:`solve_plate_fin_conduction`) [-].

    Returns
    -------
    RefinementStudy
        Resistances, cell counts and times per level, observed order, extrapolated value and
        grid convergence index.

    Notes
    -----
    With the three finest values :math:`f_1, f_2, f_3` (coarse to fine) and ratio :math:`r`:

    .. math::
        p = \frac{\ln[(f_1 - f_2)/(f_2 - f_3)]}{\ln r},\quad
        f_{ext} = f_3 + \frac{f_3 - f_2}{r^p - 1},\quad
        GCI = \frac{1.25\,|(f_3 - f_2)/f_3|}{r^p - 1}

    (generalised Richardson extrapolation; the factor of safety 1.25 is Roache's for a
    three-mesh study). Resistances do not depend on power or air temperature (linear problem).

    References
    ----------
    Richardson, L.F., "The approximate arithmetical solution by finite differences of physical
    problems involving differential equations, with an application to the stresses in a
    masonry dam", Phil. Trans. R. Soc. A 210, 307-357, 1911.

    Roache, P.J., "Perspective: a method for uniform reporting of grid refinement studies",
    Journal of Fluids Engineering 116, 405-413, 1994.
    """
    d = _design(
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
    )
    return _refine(d, mesh_cell_size, levels, solver)[0]


def _refine(d: _Design, mesh_cell_size, levels, solver):
    lv = [_level("levels", v) for v in np.atleast_1d(levels).tolist()]
    if len(lv) < 3 or any(b <= a for a, b in zip(lv[:-1], lv[1:], strict=False)):
        raise InputError(f"levels = {tuple(lv)} is not allowed; give ≥ 3 increasing levels")
    if not np.isclose(lv[-1] * lv[-3], lv[-2] ** 2, rtol=1e-9):
        raise InputError(
            f"levels = {tuple(lv)} is not allowed; the last three must have a constant ratio "
            "(e.g. 1, 2, 4)"
        )
    sols = [_solve(d, 1.0, 0.0, mesh_cell_size, v, solver) for v in lv]
    res = np.array([s.thermal_resistance_source_mean for s in sols])
    r, p, ext, gci = _richardson(lv, res)
    study = RefinementStudy(
        levels=np.array(lv),
        cell_counts=np.array([s.cell_count for s in sols]),
        resistances=res,
        solve_times=np.array([s.solve_time for s in sols]),
        refinement_ratio=float(r),
        observed_order=p,
        extrapolated_resistance=ext,
        grid_convergence_index=gci,
    )
    return study, sols[-1]


def compare_with_chain(
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
    base_heat_transfer_coefficient=None,
    base_thermal_conductivity=None,
    tip="corrected",
    mesh_cell_size=None,
    mesh_refinement=1,
    refinement_levels=None,
    solver="auto",
    series_terms=200,
) -> ChainComparison:
    r"""Compare the 1-D resistance chain with the finite-volume conduction solution.

    Parameters
    ----------
    base_width, base_length, base_thickness : float
        Base plate W (across the flow), L (along it), t_b [m].
    fin_count : int
        Number of fins N (``≥ 2``, or 0 for a bare plate) [-].
    fin_thickness, fin_height : float
        Fin thickness t and height H [m].
    thermal_conductivity : float
        Fin (and base) conductivity [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : float
        Coefficient on fin faces and tips [W m⁻² K⁻¹].
    source_length, source_width : float
        Centred source, along and across the flow [m].
    base_heat_transfer_coefficient : float, optional
        Coefficient on the exposed base; default the fin coefficient [W m⁻² K⁻¹].
    base_thermal_conductivity : float, optional
        Base conductivity; default ``thermal_conductivity`` [W m⁻¹ K⁻¹].
    tip : {"corrected", "convective"}, default "corrected"
        Fin model of the chain: adiabatic tip at ``H + t/2`` (Incropera eq. 3.89/3.94) or the
        exact convective tip (Incropera Table 3.4 case A) [-].
    mesh_cell_size : float, optional
        Level-1 target cell size [m].
    mesh_refinement : int, default 1
        Refinement level of the single solve when ``refinement_levels`` is None [-].
    refinement_levels : sequence of int, optional
        When given, the conduction resistance is the Richardson-extrapolated value of
        :func:`refine_study` over these levels [-].
    solver : {"auto", "direct", "cg"}, default "auto"
        Linear solver (see :func:`solve_plate_fin_conduction`) [-].
    series_terms : int, default 200
        Terms per index of the exact spreading series [-].

    Returns
    -------
    ChainComparison
        Both chain resistances, the conduction resistance, the relative differences, the chain's
        pieces and a one-sentence verdict.

    Notes
    -----
    The chain (docs/methods.md a, c, i1, i2), from the mean source temperature to the air:

    .. math::
        R_{chain} = R_{sp,avg} + \frac{t_b}{k_b W L} + R_0,\quad
        R_0 = \frac{1}{N\eta_f h A_f + h_b A_b},

    with ``A_f = 2 L (H + t/2)`` per fin (faces plus tip, fin ends excluded, as in the conduction
    model) and ``A_b = (N - 1) b L``. ``η_f = tanh(m L_c)/(m L_c)`` with ``m = sqrt(2h/(k t))``
    and ``L_c = H + t/2`` (``tip="corrected"``), or the exact convective tip. The spreading
    resistance sees ``h_eff = 1/(R_0 W L)`` on the top of the base, either in the exact
    rectangular series (Yovanovich, Muzychka & Culham 1999) or in the closed form of Song, Lee &
    Au (1994). The difference from the conduction solution is the model-form error of the chain:
    mainly the uniform ``h_eff`` under a base that is really cooled through discrete fin roots,
    which matters for thin bases and small sources, and (with Song-Lee-Au) its own
    approximation.

    References
    ----------
    Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and Mass
    Transfer", 6th ed., Wiley, 2007, sections 3.6.4-3.6.5.

    Yovanovich, M.M., Muzychka, Y.S., Culham, J.R., "Spreading resistance of isoflux rectangles
    and strips on compound flux channels", Journal of Thermophysics and Heat Transfer 13,
    495-500, 1999.

    Song, S., Lee, S., Au, V., "Closed-form equation for thermal constriction/spreading
    resistances with variable resistance boundary condition", Proc. IEPS Conference, 1994,
    pp. 111-121.
    """
    if tip not in CHAIN_FIN_TIPS:
        raise InputError(f"tip = {tip!r} is not allowed; must be one of {CHAIN_FIN_TIPS}")
    d = _design(
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
    )
    plate = d.W * d.L
    if d.N >= 2:
        perimeter, section = 2.0 * d.L, d.t * d.L  # fin ends adiabatic: P = 2 L
        if tip == "corrected":
            eta = float(uniform_fin_efficiency_corrected_length(d.H, perimeter, section, d.k, d.h))
        else:
            eta = float(uniform_fin(d.H, perimeter, section, d.k, d.h, tip="convective").efficiency)
        fin_area = perimeter * d.H + section
        gap = (d.W - d.N * d.t) / (d.N - 1)
        base_area = (d.N - 1) * gap * d.L
        conductance = d.N * eta * d.h * fin_area + d.hb * base_area
        total_area = d.N * fin_area + base_area
    else:
        eta = float("nan")
        conductance = d.hb * plate
        total_area = plate
    if not conductance > 0.0:
        raise InputError(
            "heat_transfer_coefficient: no cooled surface; the sink has no path to air"
        )
    r0 = 1.0 / conductance
    surface_eff = conductance / (d.h * total_area) if d.N >= 2 else 1.0
    r1d = d.tb / (d.kb * plate)
    sla = float(spreading_resistance_song_lee_au(d.ls * d.ws, plate, d.tb, d.kb, r0).average)
    series = float(
        spreading_resistance_rectangular_series(
            d.ls, d.ws, d.L, d.W, d.tb, d.kb, 1.0 / (r0 * plate), series_terms
        ).average
    )
    chain_series = series + r1d + r0
    chain_sla = sla + r1d + r0

    if refinement_levels is None:
        sol = _solve(d, 1.0, 0.0, mesh_cell_size, mesh_refinement, solver)
        r_fv = sol.thermal_resistance_source_mean
        how = f"mesh level {int(mesh_refinement)}, {sol.cell_count} cells"
    else:
        study, sol = _refine(d, mesh_cell_size, refinement_levels, solver)
        r_fv = study.extrapolated_resistance
        how = f"extrapolated from levels {tuple(int(v) for v in study.levels)}"
    rel_series = (chain_series - r_fv) / r_fv
    rel_sla = (chain_sla - r_fv) / r_fv
    side = "above" if rel_series >= 0 else "below"
    verdict = (
        f"the 1-D chain is within {100 * abs(rel_series):.1f} % of the conduction solution "
        f"({side} it; exact spreading series; conduction {how}); with the Song-Lee-Au "
        f"spreading resistance the chain differs by {100 * rel_sla:+.1f} %"
    )
    return ChainComparison(
        conduction_resistance=float(r_fv),
        chain_resistance_series=float(chain_series),
        chain_resistance_song_lee_au=float(chain_sla),
        relative_difference_series=float(rel_series),
        relative_difference_song_lee_au=float(rel_sla),
        spreading_resistance_series=series,
        spreading_resistance_song_lee_au=sla,
        base_resistance=float(r1d),
        array_resistance=float(r0),
        fin_efficiency=eta,
        surface_efficiency=float(surface_eff),
        verdict=verdict,
        solution=sol,
    )
