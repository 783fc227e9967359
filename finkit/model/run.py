"""From a validated case to its result: the one place that chooses models and studies.

``run_case(case)`` solves the case at every operating condition (the nominal one and each
scenario), names the governing condition, applies a calibration, runs the review and the
uncertainty studies the case asks for, and returns a :class:`finkit.model.results.CaseResult`
whose :meth:`~finkit.model.results.CaseResult.to_json_dict` is the content of ``results.json``.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

from finkit.constants import ZERO_CELSIUS
from finkit.errors import PropertyRangeError
from finkit.model.design import SinkInputs, sink_inputs, solve_condition
from finkit.model.results import RESULT_UNITS, CaseResult, ReviewResult, UncertaintyResult
from finkit.model.sweeps import sweep_notes
from finkit.physics.sink.inputs import NaturalConvection

__all__ = [
    "NO_SCENARIO_WARNING",
    "NO_SCENARIO_WARNING_NATURAL",
    "governing_results",
    "run_case",
]

#: Warning of a heat-sink case that checks only the condition as stated.
NO_SCENARIO_WARNING = (
    "scenarios: none given, so only the case as stated was checked; a sign-off usually needs "
    "the worst case too (hottest inlet air, highest site, a stopped fan, a loaded filter)"
)
#: The same for a sink in still air (no fan, no inlet).
NO_SCENARIO_WARNING_NATURAL = (
    "scenarios: none given, so only the case as stated was checked; a sign-off usually needs "
    "the worst case too (hottest ambient air, highest site, dust on the fins)"
)


def _merged_warnings(table, flags) -> list[str]:
    """Warnings of every condition, governing first, one per quantity; others labelled."""
    gov = table.governing_row
    ordered = [gov] + [r for r in table.rows if r is not gov]
    out: list[str] = []
    seen: set[str] = set()
    for row in ordered:
        for w in row.warnings:
            key = w.split(" = ")[0]
            if key in seen:
                continue
            seen.add(key)
            out.append(w if row is gov or row.name == "nominal" else f"[{row.name}] {w}")
    out += list(table.notices)
    out += [w for w in flags if w not in out]
    return out


def _named_geometry(case, exc: PropertyRangeError) -> PropertyRangeError:
    """A property-range failure that comes from fin gaps too narrow for air, said so."""
    sink = case.sink
    if sink.type == "plate-fin" and sink.fins is not None and sink.fins.count > 1:
        n, t, w = sink.fins.count, sink.fins.thickness, sink.base.width
        gap = (w - n * t) / (n - 1)
        if gap < 0.5e-3 or gap < 0.5 * t:
            return PropertyRangeError(
                f"sink.fins: fin gap {gap * 1e3:.2f} mm is too small for {n} fins of "
                f"{t * 1e3:.2g} mm on {w * 1e3:.0f} mm (the air cannot carry the heat: {exc})"
            )
    from finkit.model.review.flags import _implausible_flags

    try:
        implausible = _implausible_flags(case)
    except Exception:  # noqa: BLE001 - the original error is the one to show then
        implausible = []
    if implausible:
        # the likely cause first (a slip of unit or digits), then what failed
        return PropertyRangeError(f"{implausible[0]}; the solve then failed: {exc}")
    return exc


def run_case(case) -> CaseResult:
    """Solve a validated case at every operating condition and check it against its limit.

    Parameters
    ----------
    case : finkit.case.Case
        The validated case (heat sink or single fin). [-]
    """
    if getattr(case, "kind", "heat-sink") == "single-fin":
        return _run_single_fin(case)
    inputs, scenarios, calibration, table = _scenario_table(case)
    governing, nominal = table.governing_row, table.rows[0]
    review = _review(case, inputs, governing.inputs, table, calibration)
    warnings = _merged_warnings(table, review.flags)
    if not scenarios:
        is_natural = isinstance(inputs.flow, NaturalConvection)
        warnings.append(NO_SCENARIO_WARNING_NATURAL if is_natural else NO_SCENARIO_WARNING)
    if calibration is not None and calibration.reads_low:
        warnings.insert(0, calibration.warning)
    warnings += sweep_notes(case, governing.inputs, governing.solution)
    transient = None
    if getattr(case, "transient", None) is not None:
        # imported only when asked: the ODE and fitting modules of scipy cost 0.3 s to load
        from finkit.model.transient import run_transient

        transient = run_transient(case, table)
        warnings += list(transient.warnings)
    return CaseResult(
        case=case,
        status=governing.status,
        results=dict(governing.results),
        warnings=tuple(warnings),
        uncertainty=_uncertainty(case, governing),
        solution=nominal.solution,
        allowable=nominal.allowable,
        # the nominal row's inputs: with several sources, its governing source leads
        inputs=nominal.inputs,
        review=review,
        transient=transient,
    )


def _scenario_table(case, *, fit_unapplied: bool = True):
    """(inputs, scenarios, calibration, table): every operating condition of a heat-sink case
    solved, calibrated as the case asks. ``fit_unapplied=False`` skips a calibration fit that
    the case does not apply (it changes no result; ``calibration`` is then None)."""
    from finkit.model.review.scenario_defs import scenarios_from_blocks
    from finkit.model.review.scenarios import run_scenarios

    inputs = sink_inputs(case)
    scenarios = scenarios_from_blocks(case.scenarios) if case.scenarios else ()
    applied = case.calibration is not None and case.calibration.apply
    try:
        if fit_unapplied or applied:
            inputs, calibration = _calibrated(case, inputs)
        else:
            calibration = None
        table = run_scenarios(inputs, scenarios, case.air.flow.fan)
    except PropertyRangeError as exc:
        raise _named_geometry(case, exc) from None
    return inputs, scenarios, calibration, table


def governing_results(case) -> dict[str, Any]:
    """The results at the governing condition, as ``run_case(case).results``, without the
    review, uncertainty and model-form work a note shows, nor a calibration fit the case does
    not apply: what a revision comparison needs for each trial case it solves.

    Parameters
    ----------
    case : finkit.case.HeatSinkCase
        The validated case. [-]
    """
    if getattr(case, "kind", "heat-sink") == "single-fin":
        return dict(run_case(case).results)
    return dict(_scenario_table(case, fit_unapplied=False)[3].governing_row.results)


def _calibrated(case, inputs: SinkInputs):
    """Fit the case's measurements (if any); apply the multiplier if the case asks to."""
    if not case.measurements:
        return inputs, None
    from finkit.model.review.calibration import (
        apply_calibration,
        calibrate,
        measurements_from_blocks,
    )

    target = case.calibration.target if case.calibration is not None else "heat_transfer"
    noise = case.calibration.measurement_uncertainty if case.calibration is not None else 1.0
    fit = calibrate(inputs, measurements_from_blocks(case.measurements), target, noise)
    if case.calibration is not None and case.calibration.apply:
        return apply_calibration(inputs, fit), replace(fit, is_applied=True)
    return inputs, fit


def _uncertainty(case, governing) -> UncertaintyResult | None:
    """Monte Carlo and tornado over the case's ``tolerances`` block, at the governing condition.

    The tolerances are spread about the governing condition's inputs (a scenario's inlet air,
    flow and power), so the probability of exceeding the limit is the one that matters for
    sign-off. None without a tolerances block.
    """
    if case.tolerances is None:
        return None
    from finkit.case.explore_blocks import MonteCarloBlock, to_tolerances
    from finkit.model.uncertainty import monte_carlo, sensitivity

    settings = case.monte_carlo or MonteCarloBlock()
    tolerances = to_tolerances(case.tolerances)
    inputs = governing.inputs
    # The governing row's state at the stated power is solve(inputs): not solved again.
    nominal = governing.solution
    return UncertaintyResult(
        monte_carlo=monte_carlo(
            inputs, tolerances, settings.samples, settings.seed, settings.sampling, nominal=nominal
        ),
        tornado=sensitivity(inputs, tolerances, settings.tornado_coverage, nominal=nominal),
        condition=governing.name,
    )


def _review(case, inputs: SinkInputs, governing_inputs, table, calibration) -> ReviewResult:
    """Touch check, correlation spread, calibration cross-solve and flags of a heat-sink case."""
    from finkit.model.review.calibration import apply_calibration, uncalibrated
    from finkit.model.review.flags import sanity_flags
    from finkit.model.review.spread import correlation_spread
    from finkit.model.review.touch import touch_temperature_check

    touch = None
    if case.touch is not None:
        t = case.touch
        preheat = t.inlet_preheat
        if preheat is None:
            preheat = case.air.preheat_allowance or 0.0
        touch = touch_temperature_check(
            inputs,
            t.limit_temperature,
            t.reference_ambient,
            t.basis,
            surfaces=tuple(t.surfaces),
            inlet_preheat=preheat,
            power=t.power,
        )
    other = None
    if calibration is not None:
        # The governing condition the other way round: calibrated when the case does not apply
        # the multiplier, uncalibrated when it does, so the headline can show both.
        flipped = (
            uncalibrated(governing_inputs, calibration)
            if calibration.is_applied
            else apply_calibration(governing_inputs, calibration)
        )
        other = solve_condition(flipped).results
    return ReviewResult(
        scenarios=table,
        touch=touch,
        calibration=calibration,
        # The governing row has solved the chosen correlations already: not solved again.
        spread=correlation_spread(
            governing_inputs,
            stated=table.governing_row.solution,
            at_margin=table.governing_row.allowable,
        ),
        flags=tuple(sanity_flags(case, inputs)),
        calibrated_governing=other,
    )


# --------------------------------------------------------------------------------------
# Single fins
# --------------------------------------------------------------------------------------


def _run_single_fin(case) -> CaseResult:
    from finkit.physics.single_fin import solve_single_fin

    study = solve_single_fin(case)
    results = {name: None for name in RESULT_UNITS}
    results.update(study.results)
    status = "pass"
    if case.limit is not None:
        # The base is the hottest point of a fin; its limit is checked against the stated base
        # temperature (e.g. a part's allowed mounting temperature).
        base = case.conditions.base_temperature
        margin = case.limit.temperature - base
        results.update(
            limit_node_temperature=base - ZERO_CELSIUS,
            limit_temperature=case.limit.temperature - ZERO_CELSIUS,
            temperature_margin=margin,
            required_margin=case.limit.required_margin,
        )
        status = "pass" if margin >= case.limit.required_margin else "fail"
    return CaseResult(case=case, status=status, results=results, warnings=study.warnings)
