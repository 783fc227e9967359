"""Calibration to test data: one empirical multiplier fitted to measured temperatures."""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from finkit.case.review_blocks import MEASUREMENT_NODES
from finkit.errors import InputError
from finkit.model.design import SinkInputs, airflow_of, solve
from finkit.model.review.scenarios import (
    EMPIRICAL_STATEMENT,
    _shifted_air,
)
from finkit.physics.properties.atmosphere import standard_atmosphere
from finkit.physics.sink.inputs import FanDriven, GivenVelocity, GivenVolumeFlow, NaturalConvection
from finkit.physics.sink.results import SinkSolution

__all__ = [
    "CALIBRATION_TARGETS",
    "Calibration",
    "Measurement",
    "apply_calibration",
    "calibrate",
    "measurements_from_blocks",
    "uncalibrated",
]


# --------------------------------------------------------------------------------------
# Calibration to test data
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class Measurement:
    """One measured steady-state point (SI).

    Attributes
    ----------
    name : str
        Point id [-].
    node : {"junction", "case", "base", "fin_tip"}
        Where the temperature was measured [-].
    measured_temperature : float
        Measured temperature [K].
    power : float
        Power during the test [W].
    inlet_temperature : float
        Air entering the sink during the test [K].
    altitude : float or None
        Test altitude [m]; None = the case's pressure.
    volume_flow : float or None
        Measured total flow to the sink [m³ s⁻¹]; None = the case's flow.
    approach_velocity : float or None
        Measured approach velocity [m s⁻¹].
    fan_speed_ratio : float or None
        Fan speed over rated speed during the test [-].
    """

    name: str
    node: str
    measured_temperature: float
    power: float
    inlet_temperature: float
    altitude: float | None = None
    volume_flow: float | None = None
    approach_velocity: float | None = None
    fan_speed_ratio: float | None = None


def measurements_from_blocks(blocks) -> tuple[Measurement, ...]:
    """:class:`Measurement` objects from validated ``measurements:`` blocks.

    Parameters
    ----------
    blocks : sequence
        The case's validated ``measurements`` blocks (SI). [-]
    """
    return tuple(
        Measurement(
            name=b.name,
            node=b.node,
            measured_temperature=b.measured_temperature,
            power=b.power,
            inlet_temperature=b.inlet_temperature,
            altitude=b.altitude,
            volume_flow=b.volume_flow,
            approach_velocity=b.approach_velocity,
            fan_speed_ratio=b.fan_speed_ratio,
        )
        for b in blocks
    )


@dataclass(frozen=True)
class Calibration:
    """An empirical multiplier fitted to measured points by least squares.

    Attributes
    ----------
    target : str
        ``heat_transfer`` (multiplier on the air-side h) or ``sink_resistance`` [-].
    multiplier : float
        Fitted multiplier, relative to the case as stated [-].
    standard_error : float
        Its standard error from the residuals and the Jacobian [-] (NaN with one point).
    names, nodes : tuple of str
        Measured points [-].
    measured : numpy.ndarray
        Measured temperatures [K].
    inlet_temperatures : numpy.ndarray
        Inlet air of each point [K].
    predicted_uncalibrated : numpy.ndarray
        Model at multiplier 1 [K].
    predicted : numpy.ndarray
        Model at the fitted multiplier [K].
    residuals : numpy.ndarray
        ``predicted - measured`` [K].
    relative_residuals : numpy.ndarray
        Residual over the measured rise above the inlet air [-].
    rms_residual : float
        Root mean square residual [K].
    degrees_of_freedom : int
        Points less one [-].
    statement : str
        What the multiplier is and is not, for the note [-].
    is_applied : bool
        True when the case's results use the multiplier (``calibration.apply``) [-].
    """

    target: str
    multiplier: float
    standard_error: float
    names: tuple[str, ...]
    nodes: tuple[str, ...]
    measured: np.ndarray
    inlet_temperatures: np.ndarray
    predicted_uncalibrated: np.ndarray
    predicted: np.ndarray
    residuals: np.ndarray
    relative_residuals: np.ndarray
    rms_residual: float
    degrees_of_freedom: int
    statement: str
    is_applied: bool = False
    measurement_uncertainty: float = 1.0

    @property
    def mean_underprediction(self) -> float:
        """Mean of measured less predicted (uncalibrated) temperature [K]; > 0 reads low."""
        return float(np.mean(self.measured - self.predicted_uncalibrated))

    @property
    def reads_low(self) -> bool:
        """The uncalibrated model reads lower than the test by more than the measurement noise."""
        return self.mean_underprediction > self.measurement_uncertainty

    @property
    def warning(self) -> str:
        """One line for the warnings list when the model reads low (non-conservative)."""
        low = self.measured - self.predicted_uncalibrated
        return (
            f"calibration: the model reads {np.min(low):.2g} to {np.max(low):.2g} K lower than "
            f"the {len(low)} measured point(s) (mean {self.mean_underprediction:.2g} K, above the "
            f"{self.measurement_uncertainty:.2g} K measurement uncertainty): non-conservative; "
            f"fitted multiplier {self.multiplier:.3g} on the "
            f"{'air-side h' if self.target == 'heat_transfer' else 'sink resistance'}"
            + ("" if self.is_applied else " (not applied; the headline shows both)")
        )


CALIBRATION_TARGETS = ("heat_transfer", "sink_resistance")


def _with_multiplier(inputs: SinkInputs, target: str, multiplier) -> SinkInputs:
    o = inputs.options
    if target == "heat_transfer":
        options = replace(o, heat_transfer_factor=o.heat_transfer_factor * multiplier)
    else:
        options = replace(o, sink_resistance_factor=o.sink_resistance_factor * multiplier)
    return replace(inputs, options=options)


def _node_values(sol: SinkSolution, nodes) -> np.ndarray:
    table = {
        "junction": sol.junction_temperature,
        "case": sol.case_temperature,
        "base": sol.source_base_centre_temperature,  # as the base limit node: the centre
        "fin_tip": sol.fin_tip_temperature,
    }
    return np.array(
        [np.broadcast_to(table[n], np.shape(sol.power))[k] for k, n in enumerate(nodes)]
    )


def _measurement_groups(inputs: SinkInputs, measurements):
    """Batches of measurements solved in one vectorised call: (indices, inputs, nodes)."""

    def key(m: Measurement):
        if m.volume_flow is not None:
            return ("volume_flow", None)
        if m.approach_velocity is not None:
            return ("approach_velocity", None)
        return ("case", m.fan_speed_ratio)

    groups: dict[tuple, list[int]] = {}
    for k, m in enumerate(measurements):
        groups.setdefault(key(m), []).append(k)
    out = []
    for (kind, speed), idx in groups.items():
        ms = [measurements[k] for k in idx]
        inlet = np.array([m.inlet_temperature for m in ms])
        pressure = np.array(
            [
                float(inputs.air.pressure)
                if m.altitude is None
                else float(standard_atmosphere(m.altitude).pressure)
                for m in ms
            ]
        )
        air = replace(_shifted_air(inputs.air, inlet), pressure=pressure)
        source = replace(inputs.source, power=np.array([m.power for m in ms]))
        flow = inputs.flow
        if kind == "volume_flow":
            flow = GivenVolumeFlow(np.array([m.volume_flow for m in ms]))
        elif kind == "approach_velocity":
            flow = GivenVelocity(np.array([m.approach_velocity for m in ms]))
        elif speed is not None:
            if not isinstance(flow, FanDriven):
                raise InputError(
                    f"measurements[{ms[0].name}].fan_speed_ratio: applies to a fan-driven case"
                )
            flow = FanDriven(flow.fan.at_speed(speed))
        if kind != "case" and isinstance(inputs.flow, NaturalConvection):
            raise InputError(f"measurements[{ms[0].name}].{kind}: natural convection has no flow")
        out.append((idx, replace(inputs, air=air, source=source, flow=flow), [m.node for m in ms]))
    return out


def _predict(groups, target, multiplier, count, airflows=None) -> np.ndarray:
    """Predicted temperatures at the measured points with ``multiplier`` applied [K].

    ``airflows``: each group's airflow, solved once; the multiplier (on h or on the sink
    resistance) does not change the flow, so the fit's many evaluations share it.
    """
    out = np.empty(count)
    airflows = airflows or [None] * len(groups)
    for (idx, group_inputs, nodes), airflow in zip(groups, airflows, strict=True):
        sol = solve(_with_multiplier(group_inputs, target, multiplier), airflow=airflow)
        out[idx] = _node_values(sol, nodes)
    return out


def _one_parameter_fit(residual, start: float, bounds: tuple[float, float], tol: float = 1e-10):
    """Least squares in one bounded parameter: Gauss-Newton with step halving.

    ``residual([c]) -> array`` of the n residuals. Each step takes the Gauss-Newton step
    ``-Σ J r / Σ J²`` with ``J`` from central differences (step ``1e-6 (1 + |c|)``), clipped to
    the bounds and halved until the sum of squares falls (Bates, D.M., Watts, D.G., Nonlinear
    Regression Analysis and Its Applications, Wiley, 1988, section 2.2.1); it stops when a step
    is below ``tol (1 + |c|)``. The fit is the same as scipy's ``least_squares`` (trust-region
    reflective) to about 1e-9 (tested); written here because importing ``scipy.optimize``
    costs about 0.3 s of each ``finkit check`` of a case with measurements.

    Returns
    -------
    tuple
        ``(c, residuals at c, J at c)`` with ``J`` an ``(n, 1)`` array. [-], [K], [K]
    """
    low, high = bounds
    c = float(np.clip(start, low, high))

    def jacobian(c: float) -> np.ndarray:
        step = 1e-6 * (1.0 + abs(c))
        a, b = max(c - step, low), min(c + step, high)
        return (residual([b]) - residual([a])) / (b - a)

    r = residual([c])
    cost = float(r @ r)
    for _ in range(100):
        jac = jacobian(c)
        jtj = float(jac @ jac)
        if not jtj > 0:
            break
        trial = float(np.clip(c - float(jac @ r) / jtj, low, high))
        while True:
            r_trial = residual([trial])
            cost_trial = float(r_trial @ r_trial)
            if cost_trial <= cost or abs(trial - c) <= tol * (1.0 + abs(c)):
                break
            trial = c + 0.5 * (trial - c)
        moved = abs(trial - c)
        if cost_trial <= cost:
            c, r, cost = trial, r_trial, cost_trial
        if moved <= tol * (1.0 + abs(c)):
            break
    return c, r, jacobian(c).reshape(-1, 1)


def calibrate(
    inputs: SinkInputs,
    measurements,
    target: str = "heat_transfer",
    measurement_uncertainty: float = 1.0,
) -> Calibration:
    """Fit one empirical multiplier (on h or on the sink resistance) to measured temperatures.

    Parameters
    ----------
    inputs : SinkInputs
        The case (its model options are the starting point; the multiplier multiplies them). [-]
    measurements : sequence of Measurement
        Measured points; each is predicted with its own inlet air, power, pressure and flow. [-]
    target : {"heat_transfer", "sink_resistance"}
        What the multiplier scales [-]. ``heat_transfer``: the air-side h
        (``ModelOptions.heat_transfer_factor``), so fin efficiency, air heating and the
        spreading resistance respond as they would to a better or worse correlation.
        ``sink_resistance``: the whole fins-and-base-to-air resistance, convection and
        radiation together (``ModelOptions.sink_resistance_factor``); use it when the test
        cannot separate the air side from the rest of the sink.

    measurement_uncertainty : float, optional
        Uncertainty of one measured temperature [K]; the model "reads low" when it
        under-predicts by more than this on average.

    Returns
    -------
    Calibration
        Multiplier, its standard error, residuals and predictions.

    Notes
    -----
    Ordinary least squares on the temperature residuals ``r_i(c) = T_model,i(c) - T_meas,i``,
    solved by :func:`_one_parameter_fit` (bounded to 0.05 ≤ c ≤ 20). The standard
    error is the usual one of a one-parameter non-linear fit,
    ``se = sqrt(s² / (JᵀJ))`` with ``s² = Σ r_i² / (n - 1)`` and ``J = dT_model/dc`` at the fit
    (e.g. Bates & Watts, Nonlinear Regression Analysis and Its Applications, Wiley, 1988,
    section 2.1). It assumes independent, equal-variance errors in the measured temperatures.

    The multiplier is empirical: it absorbs every difference between the model and the test
    (correlation scatter, contact resistance, bypass, thermocouple placement) and holds only
    near the tested conditions. Prediction error is also given relative to the measured rise
    above the inlet air, which is how it should be judged.
    """
    if target not in CALIBRATION_TARGETS:
        raise InputError(
            f"calibration.target: got {target!r}; allowed: {', '.join(CALIBRATION_TARGETS)}"
        )
    measurements = tuple(measurements)
    if not measurements:
        raise InputError("measurements: at least one measured point is needed (got none)")
    for m in measurements:
        if m.node not in MEASUREMENT_NODES:
            raise InputError(
                f"measurements[{m.name}].node: got {m.node!r}; allowed: "
                f"{', '.join(MEASUREMENT_NODES)}"
            )
    n = len(measurements)
    measured = np.array([m.measured_temperature for m in measurements])
    inlet = np.array([m.inlet_temperature for m in measurements])
    groups = _measurement_groups(inputs, measurements)
    airflows = [airflow_of(group_inputs) for _, group_inputs, _ in groups]

    def residual(x):
        return _predict(groups, target, x[0], n, airflows) - measured

    c, r, jac = _one_parameter_fit(residual, 1.0, (0.05, 20.0))
    dof = n - 1
    jtj = float(np.sum(jac**2))
    if dof > 0 and jtj > 0:
        se = float(np.sqrt(np.sum(r**2) / dof / jtj))
    else:
        se = float("nan")
    predicted = measured + r
    what = "air-side heat transfer coefficient" if target == "heat_transfer" else "sink resistance"
    statement = (
        f"Calibration: a multiplier of {c:.3f} (standard error {se:.3f}) on the {what}, fitted by "
        f"least squares to {n} measured point(s); rms residual {np.sqrt(np.mean(r**2)):.2f} K. "
        + EMPIRICAL_STATEMENT
    )
    return Calibration(
        target=target,
        multiplier=c,
        standard_error=se,
        names=tuple(m.name for m in measurements),
        nodes=tuple(m.node for m in measurements),
        measured=measured,
        inlet_temperatures=inlet,
        predicted_uncalibrated=_predict(groups, target, 1.0, n, airflows),
        predicted=predicted,
        residuals=r,
        relative_residuals=r / (measured - inlet),
        rms_residual=float(np.sqrt(np.mean(r**2))),
        degrees_of_freedom=dof,
        statement=statement,
        measurement_uncertainty=float(measurement_uncertainty),
    )


def apply_calibration(inputs: SinkInputs, calibration: Calibration) -> SinkInputs:
    """The inputs with a fitted multiplier applied (empirical; say so wherever it is used).

    ``heat_transfer`` multiplies ``ModelOptions.heat_transfer_factor``; ``sink_resistance``
    multiplies ``ModelOptions.sink_resistance_factor`` (convection and radiation conductance of
    the sink divided by the multiplier, spreading and base conduction recomputed from it).

    Parameters
    ----------
    inputs : SinkInputs
        The case's inputs. [-]
    calibration : Calibration
        The fit (:func:`calibrate`). [-]
    """
    return _with_multiplier(inputs, calibration.target, calibration.multiplier)


def uncalibrated(inputs: SinkInputs, calibration: Calibration) -> SinkInputs:
    """The inputs with an applied multiplier taken out again (inverse of apply_calibration).

    Parameters
    ----------
    inputs : SinkInputs
        Inputs with the multiplier applied. [-]
    calibration : Calibration
        The fit that was applied. [-]
    """
    return _with_multiplier(inputs, calibration.target, 1.0 / calibration.multiplier)
