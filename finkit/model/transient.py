"""A case's ``transient:`` block solved: time to the limit after an event, thermal impedance.

:func:`run_transient` takes the validated case and its solved conditions
(:class:`finkit.model.review.scenarios.ScenarioTable`), builds the lumped network of
:mod:`finkit.physics.transient` from the steady solution of each condition involved,
integrates the history from the steady state of the start condition, and fits an RC ladder
to the junction's step response at the governing condition. :class:`TransientResult` holds
it all; ``to_json_dict`` is the ``transient`` entry of ``results.json`` (a unit on every
number).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from finkit.constants import ZERO_CELSIUS
from finkit.errors import InputError
from finkit.physics.properties.materials import get_material
from finkit.physics.transient import (
    CauerLadder,
    FosterLadder,
    PowerProfile,
    StepResponse,
    TransientSolution,
    cauer_from_foster,
    chain_network,
    fit_foster,
    lumping_numbers,
    pulse_train,
    simulate_transient,
    steady_temperatures,
    step_response,
)

__all__ = ["ASSUMPTIONS", "HISTORY_POINTS", "TransientResult", "run_transient"]

#: Evenly spaced times of the reported history (plus every change of power or condition).
HISTORY_POINTS = 1201

#: What the lumped transient assumes, in the words the note prints.
ASSUMPTIONS = (
    "Lumped nodes: junction, case, base under the source, base plate and fins; each node has "
    "one temperature.",
    "Start: the steady state of the start condition at its own power; the power history "
    "(if any) applies from t = 0.",
    "Conductances from the steady solution of the condition in force (heat transfer "
    "coefficient, fin efficiency, spreading), switched at once when the condition changes.",
    "Air temperature rise through the sink quasi-steady (the air holds no heat).",
    "Sink heat capacities from the metal volume, density and specific heat; device and "
    "spreader heat capacities only where the case gives them, otherwise none (the junction "
    "then rises sooner: conservative).",
    "The base plate's heat capacity sits at the fin roots, so after a power step the "
    "junction rises at once by the power times the device, interface, spreading and base "
    "resistances (faster than the real, distributed base: conservative).",
    "Radiation and natural-convection coefficients, where present, are those of the steady "
    "state of the condition (not re-evaluated as the temperatures move).",
)


@dataclass(frozen=True)
class TransientResult:
    """The transient of one case: history after the event and the thermal impedance.

    Attributes
    ----------
    start_condition : str
        Condition whose steady state is the start. [-]
    event_condition : str or None
        Condition that takes over at ``event_time`` (None: no change of condition). [-]
    event_time : float or None
        Time of the change [s].
    duration : float
        Length of the run [s].
    required_response_time : float or None
        Time the product needs after the event [s].
    limit_node : str
        Node of the limit. [-]
    limit_temperature : float
        The limit [K].
    solution : TransientSolution
        History of every node (one design).
    time_to_limit : float
        Time from the event (or from the start without one) until the limit node reaches the
        limit; NaN if it does not within the run [s].
    status : str or None
        ``pass`` when the limit is not reached within the required response time, ``fail``
        when it is; None without a required response time. [-]
    impedance : StepResponse
        Junction step response (thermal impedance) at ``impedance_condition``.
    impedance_condition : str
        Condition of the impedance (the governing one). [-]
    foster : FosterLadder
        Foster ladder fitted to the impedance.
    cauer : CauerLadder or None
        Its Cauer equivalent, None where the conversion was not numerically safe.
    fin_nodes : int
        Nodes along each fin. [-]
    heat_capacities : dict
        Node name -> heat capacity [J K⁻¹].
    lumping : dict
        ``fin_biot_number``, ``fin_fourier_number``, ``base_fourier_number`` [-] and the time
        of interest they use, ``time`` [s] (worst of the conditions involved).
    warnings : tuple of str
        Lumping warnings, a failed response time.
    """

    start_condition: str
    event_condition: str | None
    event_time: float | None
    duration: float
    required_response_time: float | None
    limit_node: str
    limit_temperature: float
    solution: TransientSolution
    time_to_limit: float
    status: str | None
    impedance: StepResponse
    impedance_condition: str
    foster: FosterLadder
    cauer: CauerLadder | None
    fin_nodes: int
    heat_capacities: dict[str, float]
    lumping: dict[str, float]
    warnings: tuple[str, ...] = ()

    @property
    def event_label(self) -> str:
        """``'hot-day-one-fan at 60 s'``, or ``'the start'`` without an event. [-]"""
        if self.event_condition is None:
            return "the start"
        return f"{self.event_condition} at {self.event_time:g} s"

    @property
    def is_limit_reached(self) -> bool:
        """Whether the limit node reaches the limit within the run. [-]"""
        return bool(np.isfinite(self.time_to_limit))

    @property
    def node_count(self) -> int:
        """Nodes of the network. [-]"""
        return len(self.solution.node_names)

    def check_line(self) -> str:
        """The line ``finkit check`` prints: time to limit against the required response."""
        reached = (
            f"{self.time_to_limit:.0f} s" if self.is_limit_reached
            else f"not reached in {self.duration - (self.event_time or 0.0):.0f} s"
        )  # fmt: skip
        line = f"time to limit after {self.event_label}: {reached}"
        if self.required_response_time is not None:
            line += f" (required response {self.required_response_time:.0f} s): {self.status}"
        return line

    def to_json_dict(self) -> dict[str, Any]:
        """The ``transient`` entry of ``results.json``: a unit beside every number."""
        sol = self.solution

        def q(value, unit):
            value = None if value is None or not np.isfinite(value) else float(value)
            return {"value": value, "unit": unit}

        def series(values, unit):
            return {"values": [float(v) for v in np.asarray(values).ravel()], "unit": unit}

        def celsius(kelvin):
            return q(float(kelvin) - ZERO_CELSIUS, "degC")

        names = sol.node_names
        foster = self.foster
        return {
            "start_condition": self.start_condition,
            "event": None
            if self.event_condition is None
            else {"condition": self.event_condition, "time": q(self.event_time, "s")},
            "duration": q(self.duration, "s"),
            "required_response_time": q(self.required_response_time, "s"),
            "limit_node": self.limit_node,
            "limit_temperature": celsius(self.limit_temperature),
            "time_to_limit": q(self.time_to_limit, "s"),
            "time_to_limit_counted_from": "event" if self.event_condition else "start",
            "is_limit_reached": self.is_limit_reached,
            "status": self.status,
            "nodes": list(names),
            "fin_nodes": self.fin_nodes,
            "heat_capacities": {n: q(c, "J/K") for n, c in self.heat_capacities.items()},
            "peak_temperature": {
                n: celsius(t) for n, t in zip(names, sol.peak_temperature[0], strict=True)
            },
            "final_temperature": {
                n: celsius(t) for n, t in zip(names, sol.final_temperature[0], strict=True)
            },
            "energy": {
                "supplied": q(sol.supplied_energy[0], "J"),
                "convected": q(sol.convected_energy[0], "J"),
                "stored": q(sol.stored_energy[0], "J"),
            },
            "history": {
                "time": series(sol.time, "s"),
                "power": series(sol.power, "W"),
                "temperature": {
                    n: series(sol.temperature[0, i] - ZERO_CELSIUS, "degC")
                    for i, n in enumerate(names)
                },
            },
            "impedance": {
                "condition": self.impedance_condition,
                "node": self.impedance.node,
                "time": series(self.impedance.time, "s"),
                "impedance": series(self.impedance.impedance[0], "K/W"),
                "steady_resistance": q(self.impedance.steady_resistance[0], "K/W"),
                "foster": {
                    "series_resistance": q(foster.series_resistance, "K/W"),
                    "pairs": [
                        {
                            "resistance": q(r, "K/W"),
                            "time_constant": q(t, "s"),
                            "capacitance": q(c, "J/K"),
                        }
                        for r, t, c in zip(
                            foster.resistance,
                            foster.time_constant,
                            foster.capacitance,
                            strict=True,
                        )
                    ],  # fmt: skip
                    "max_error": q(foster.max_error, "1"),
                    "method": foster.method,
                },
                "cauer": None
                if self.cauer is None
                else {
                    "series_resistance": q(self.cauer.series_resistance, "K/W"),
                    "stages": [
                        {"capacitance": q(c, "J/K"), "resistance": q(r, "K/W")}
                        for c, r in zip(self.cauer.capacitance, self.cauer.resistance, strict=True)
                    ],
                },
            },
            "lumping": {
                "fin_biot_number": q(self.lumping["fin_biot_number"], "1"),
                "fin_fourier_number": q(self.lumping["fin_fourier_number"], "1"),
                "base_fourier_number": q(self.lumping["base_fourier_number"], "1"),
                "time": q(self.lumping["time"], "s"),
            },
            "assumptions": list(ASSUMPTIONS),
            "warnings": list(self.warnings),
        }


def _power_profile(block, duration, start_power, event_power, event_time) -> PowerProfile:
    """The power history: the block's, or the conditions' own powers (a step at the event)."""
    if block is None:
        if event_time is None or event_power == start_power:
            return PowerProfile.constant(start_power)
        return PowerProfile(np.array([0.0, event_time]), np.array([start_power, event_power]))
    if block.steps is not None:
        return PowerProfile(
            np.array([s.at for s in block.steps]), np.array([s.power for s in block.steps])
        )
    if block.pulses is not None:
        p = block.pulses
        return pulse_train(p.high, p.low, p.period, p.duty_cycle, duration, p.start, p.count)
    return PowerProfile(
        np.array(block.table.time), np.array(block.table.power), block.table.interpolation
    )


def _time_of_interest(block, profile: PowerProfile) -> float:
    """Shortest time the answer depends on: the response time, a pulse or step length [s]."""
    times = [block.required_response_time or block.duration]
    intervals = np.diff(np.append(profile.time, block.duration))
    times += [float(t) for t in intervals if t > 0]
    return float(min(times))


def run_transient(case, table) -> TransientResult | None:
    """Solve a case's ``transient:`` block on its solved conditions.

    Parameters
    ----------
    case : finkit.case.HeatSinkCase
        The validated case (None returned without a ``transient`` block). [-]
    table : finkit.model.review.scenarios.ScenarioTable
        Every condition of the case, solved (nominal first, the governing one marked). [-]

    Returns
    -------
    TransientResult or None
        The transient, or None when the case has no ``transient`` block.

    Raises
    ------
    InputError
        If the sink material has no specific heat (give one under ``materials:``).
    """
    block = getattr(case, "transient", None)
    if block is None:
        return None
    rows = {row.name: row for row in table.rows}
    material = get_material(case.sink.material, case.user_materials() or None)
    if material.specific_heat is None or material.density is None:
        raise InputError(
            f"sink.material: '{material.key}' has no "
            f"{'specific_heat' if material.specific_heat is None else 'density'}, which the "
            f"transient block needs; give it under materials: {{{material.key}: ...}}"
        )
    caps = block.heat_capacities

    def network(row):
        i = row.inputs
        return chain_network(
            row.solution, i.geometry, i.material.thermal_conductivity, material.density,
            material.specific_heat, junction_heat_capacity=caps.junction,
            case_heat_capacity=caps.case, spreader_heat_capacity=caps.spreader,
            fin_node_count=block.fin_nodes,
        )  # fmt: skip

    start = rows[block.start_condition]
    involved = [start]
    event_time = None
    if block.event is not None:
        involved.append(rows[block.event.condition])
        event_time = block.event.at
    nets = [network(row) for row in involved]
    profile = _power_profile(
        block.power, block.duration, float(start.solution.power),
        float(involved[-1].solution.power), event_time,
    )  # fmt: skip
    limit_node = start.inputs.limit_node
    limit = float(start.inputs.limit_temperature)
    # Start: steady state of the start condition at its own power; the profile runs from t = 0.
    initial = steady_temperatures(nets[0], float(start.solution.power))
    knots = [t for t in (*profile.time, event_time or 0.0) if 0.0 < t < block.duration]
    samples = np.unique(np.concatenate([np.linspace(0.0, block.duration, HISTORY_POINTS), knots]))
    sol = simulate_transient(
        nets, profile, block.duration, switch_times=[event_time] if event_time else [],
        initial_temperature=initial, limit_node=limit_node, limit_temperature=limit,
        sample_times=samples,
    )  # fmt: skip
    time_to_limit = float(sol.time_to_limit[0]) - (event_time or 0.0)
    is_before_event = bool(time_to_limit < 0.0)
    time_to_limit = max(time_to_limit, 0.0) if np.isfinite(time_to_limit) else time_to_limit
    status = None
    if block.required_response_time is not None:
        ok = not np.isfinite(time_to_limit) or time_to_limit >= block.required_response_time
        status = "pass" if ok else "fail"

    governing = table.governing_row
    gov_net = network(governing)
    response = step_response(gov_net, "junction")
    dynamic = int(np.count_nonzero(gov_net.heat_capacity[0] > 0))
    foster = fit_foster(response, min(block.impedance_terms, dynamic))
    cauer = cauer_from_foster(foster)

    t_interest = _time_of_interest(block, profile)
    numbers = [
        lumping_numbers(
            row.solution,
            row.inputs.geometry,
            row.inputs.material.thermal_conductivity,
            material.density,
            material.specific_heat,
            t_interest,
        )  # fmt: skip
        for row in involved
    ]
    fin_biot = max(float(n.fin_biot_number) for n in numbers)
    fin_fourier = min(float(n.fin_fourier_number) for n in numbers)
    base_fourier = min(float(n.base_fourier_number) for n in numbers)
    warnings = []
    if block.fin_nodes == 1 and any(bool(n.is_fin_lumping_poor) for n in numbers):
        warnings.append(
            f"transient: one node per fin is coarse here (fin Biot number (mH)^2 = "
            f"{fin_biot:.2g}, Fourier number = {fin_fourier:.2g} at t = {t_interest:.3g} s: "
            "the fin has not conducted through in that time); set transient.fin_nodes (for "
            "example 5) to resolve the fin"
        )
    if base_fourier < 1.0:
        warnings.append(
            f"transient: the base plate is one node, but heat spreads across it over a time "
            f"comparable to {t_interest:.3g} s (base Fourier number {base_fourier:.2g}); the "
            "response in that first time is approximate"
        )
    if is_before_event:
        warnings.append(
            f"transient: the {limit_node} reaches its limit at {sol.time_to_limit[0]:.0f} s, "
            f"before the event at {event_time:g} s (time to limit counted as 0 s)"
        )
    if status == "fail" and not is_before_event:
        warnings.append(
            f"transient: the {limit_node} reaches its limit {time_to_limit:.0f} s after "
            f"{block.event.condition if block.event else 'the start'}, before the required "
            f"response time of {block.required_response_time:.0f} s"
        )
    capacities = dict(zip(nets[0].node_names, map(float, nets[0].heat_capacity[0]), strict=True))
    return TransientResult(
        start_condition=start.name,
        event_condition=block.event.condition if block.event else None,
        event_time=event_time,
        duration=block.duration,
        required_response_time=block.required_response_time,
        limit_node=limit_node,
        limit_temperature=limit,
        solution=sol,
        time_to_limit=time_to_limit,
        status=status,
        impedance=response,
        impedance_condition=governing.name,
        foster=foster,
        cauer=cauer,
        fin_nodes=block.fin_nodes,
        heat_capacities=capacities,
        lumping={
            "fin_biot_number": fin_biot,
            "fin_fourier_number": fin_fourier,
            "base_fourier_number": base_fourier,
            "time": t_interest,
        },
        warnings=tuple(warnings),
    )
