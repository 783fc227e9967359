"""The model-form check: the 1-D chain against a 3-D finite-volume conduction solution."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np

from finkit.errors import InputError
from finkit.model.design import (
    SinkInputs,
)
from finkit.physics.geometry import PlateFinSink
from finkit.physics.sink.results import SinkSolution

__all__ = [
    "MODEL_FORM_CELLS_ACROSS",
    "MODEL_FORM_LEVELS",
    "MODEL_FORM_MAX_CELLS",
    "ModelFormCheck",
    "model_form_arguments",
    "model_form_check",
]

#: Model-form check of a note (:func:`model_form_check`): cells across the smaller base side on
#: the coarsest of three nested meshes, the refinement levels, and the most solid cells the
#: finest mesh may have (about 1 s of solving on a 2-core machine; measured, see the function).
MODEL_FORM_CELLS_ACROSS = 5
MODEL_FORM_LEVELS = (1, 2, 4)
MODEL_FORM_MAX_CELLS = 40_000


@dataclass(frozen=True)
class ModelFormCheck:
    """The 1-D resistance chain of a plate-fin case against 3-D conduction of its base and fins.

    Attributes
    ----------
    is_covered : bool
        False for a pin-fin sink (:mod:`finkit.physics.conduction` models plate fins only). [-]
    reason : str
        Why the check is not covered (empty when it is). [-]
    comparison : finkit.physics.conduction.ChainComparison or None
        The result of :func:`finkit.physics.conduction.compare_with_chain`. [-]
    arguments : dict
        The keyword arguments passed to ``compare_with_chain`` (SI), so that the check can be
        repeated outside the note. [-]
    power : float
        The stated power [W].
    mesh_cell_size : float
        Target cell size of the coarsest mesh [m].
    levels : tuple of int
        Refinement levels solved (three nested meshes, or one when the finest would be too
        large). [-]
    cell_counts : tuple of int
        Solid cells of each level (a quarter of the sink, by symmetry). [-]
    is_extrapolated : bool
        True when the conduction resistance is the Richardson extrapolation of three meshes. [-]
    finest_resistance : float
        Source-mean resistance on the finest mesh [K W⁻¹].
    grid_convergence_index : float
        Roache's grid convergence index of the finest mesh, ``1.25 |R_ext - R_fine| / R_fine``
        (NaN when not extrapolated or when the convergence is not monotonic) [-].
    temperature_difference_song_lee_au : float
        ``power (R_chain,SLA - R_conduction)``: how far the chain of the note (Song-Lee-Au
        spreading) puts the base under the source above (+) or below (-) the conduction
        solution at the stated power [K].
    temperature_difference_series : float
        The same with the exact spreading series [K].
    """

    is_covered: bool
    reason: str = ""
    comparison: Any = None
    arguments: dict = field(default_factory=dict)
    power: float = float("nan")
    mesh_cell_size: float = float("nan")
    levels: tuple[int, ...] = ()
    cell_counts: tuple[int, ...] = ()
    is_extrapolated: bool = False
    finest_resistance: float = float("nan")
    grid_convergence_index: float = float("nan")
    temperature_difference_song_lee_au: float = float("nan")
    temperature_difference_series: float = float("nan")


def model_form_arguments(inputs: SinkInputs, solution: SinkSolution) -> dict[str, float]:
    """Arguments of :func:`finkit.physics.conduction.compare_with_chain` for a solved plate-fin
    case.

    The case's geometry, the sink conductivity, the solved (area-mean) heat transfer
    coefficient on every fin and base surface, and the source footprint (length along the
    flow, width across it).

    Parameters
    ----------
    inputs : SinkInputs
        A plate-fin case's physics inputs (scalar fields). [-]
    solution : SinkSolution
        Its solved state, e.g. ``CaseResult.solution``. [-]

    Returns
    -------
    dict
        Keyword arguments in SI (m, W m⁻¹ K⁻¹, W m⁻² K⁻¹; ``fin_count`` an int). [-]
    """
    g = inputs.geometry
    if not isinstance(g, PlateFinSink):
        raise InputError("sink.type: the model-form check covers plate-fin sinks only")
    s = inputs.source
    return {
        "base_width": float(np.asarray(g.base_width)),
        "base_length": float(np.asarray(g.base_length)),
        "base_thickness": float(np.asarray(g.base_thickness)),
        "fin_count": int(round(float(np.asarray(g.fin_count)))),
        "fin_thickness": float(np.asarray(g.fin_thickness)),
        "fin_height": float(np.asarray(g.fin_height)),
        "thermal_conductivity": float(np.asarray(inputs.material.thermal_conductivity)),
        "heat_transfer_coefficient": float(np.asarray(solution.heat_transfer_coefficient)),
        "source_length": float(np.asarray(s.footprint_length)),
        "source_width": float(np.asarray(s.footprint_width)),
    }


def model_form_check(result, max_cells: int = MODEL_FORM_MAX_CELLS) -> ModelFormCheck:
    """Model-form check of a plate-fin case: its 1-D chain against 3-D conduction.

    Calls :func:`finkit.physics.conduction.compare_with_chain` with :func:`model_form_arguments` on
    three nested coarse meshes (:data:`MODEL_FORM_LEVELS`; level 1 has about
    :data:`MODEL_FORM_CELLS_ACROSS` cells across the smaller base side, and never more than a
    source edge per cell), and takes the Richardson-extrapolated conduction resistance. When
    the finest mesh would exceed ``max_cells`` solid cells, one mesh (the finest level that
    fits) is solved instead and no discretisation error is estimated.

    Both models see the same h on the same surfaces; radiation, the heating of the air along
    the sink and the junction-to-case and interface resistances are outside the check (they
    are the same in both). What differs is the model form of base and fins: a uniform h under
    the base in the spreading formula, and one-dimensional fins on an isothermal root.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]
    max_cells : int, optional
        Most solid cells the finest mesh may have (a quarter of the sink) [-].

    Returns
    -------
    ModelFormCheck
        ``is_covered`` False (with the reason) for a pin-fin sink.

    Notes
    -----
    Measured on the demo plate-fin cases (2-core machine): about 0.7 s for the three meshes
    (400, 3 200 and 25 600 cells), with the extrapolated resistance within 0.04 % of the one
    extrapolated from meshes 16 times finer. Roache's grid convergence index of the finest
    mesh follows from the extrapolation, ``GCI = 1.25 |R_ext - R_3| / R_3``, which equals
    ``1.25 |(R_3 - R_2)/R_3| / (r^p - 1)`` since ``R_ext = R_3 + (R_3 - R_2)/(r^p - 1)``.

    References
    ----------
    Roache, P.J., "Perspective: a method for uniform reporting of grid refinement studies",
    Journal of Fluids Engineering 116, 405-413, 1994.
    """
    from finkit.physics.conduction.solve import compare_with_chain, solve_plate_fin_conduction

    inputs, sol = result.inputs, result.solution
    if inputs.sources is not None:
        return ModelFormCheck(
            is_covered=False,
            reason=(
                "the 3-D conduction model of finkit takes one centred source; with several "
                "sources the base field is the exact superposition of the flux-channel series "
                "(checked against a finite-volume solution in finkit's tests), and the "
                "one-dimensional fins on a base of uniform coefficient remain the model's "
                "assumption"
            ),
        )
    if not isinstance(inputs.geometry, PlateFinSink):
        return ModelFormCheck(
            is_covered=False,
            reason="the 3-D conduction model of finkit covers plate-fin sinks only",
        )
    args = model_form_arguments(inputs, sol)
    cell = min(
        min(args["base_width"], args["base_length"]) / MODEL_FORM_CELLS_ACROSS,
        min(args["source_length"], args["source_width"]),
    )
    power = float(np.asarray(sol.power))
    probe = solve_plate_fin_conduction(
        **args,
        power=power,
        air_temperature=float(np.asarray(sol.inlet_air_temperature)),
        mesh_cell_size=cell,
    )
    first = int(probe.cell_count)
    finest = MODEL_FORM_LEVELS[-1]
    if first * finest**3 <= max_cells:
        levels = tuple(MODEL_FORM_LEVELS)
        comparison = compare_with_chain(**args, mesh_cell_size=cell, refinement_levels=levels)
    else:
        fits = [lv for lv in range(1, finest + 1) if first * lv**3 <= max_cells]
        levels = (fits[-1] if fits else 1,)
        comparison = compare_with_chain(**args, mesh_cell_size=cell, mesh_refinement=levels[0])
    fine = float(comparison.solution.thermal_resistance_source_mean)
    extrapolated = len(levels) > 1
    gci = float("nan")
    if extrapolated and comparison.conduction_resistance != fine:
        gci = 1.25 * abs(comparison.conduction_resistance - fine) / fine
    r_fv = comparison.conduction_resistance
    return ModelFormCheck(
        is_covered=True,
        comparison=comparison,
        arguments=args,
        power=power,
        mesh_cell_size=float(cell),
        levels=levels,
        cell_counts=tuple(first * lv**3 for lv in levels),
        is_extrapolated=extrapolated,
        finest_resistance=fine,
        grid_convergence_index=gci,
        temperature_difference_song_lee_au=power * (comparison.chain_resistance_song_lee_au - r_fv),
        temperature_difference_series=power * (comparison.chain_resistance_series - r_fv),
    )
