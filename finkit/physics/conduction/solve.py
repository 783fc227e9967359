"""Solving the conduction model, grid convergence, and the comparison with the 1-D chain."""

from __future__ import annotations

import numpy as np

from finkit.errors import InputError
from finkit.physics.conduction.assembly import (
    _level,
    _solve,
)
from finkit.physics.conduction.mesh import (
    CHAIN_FIN_TIPS,
    ChainComparison,
    ConductionSolution,
    RefinementStudy,
    _Design,
    _design,
    _scalar,
)
from finkit.physics.fins.analytic.uniform import (
    uniform_fin,
    uniform_fin_efficiency_corrected_length,
)
from finkit.physics.spreading import (
    spreading_resistance_rectangular_series,
    spreading_resistance_song_lee_au,
)

__all__ = [
    "compare_with_chain",
    "refine_study",
    "solve_plate_fin_conduction",
]


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
