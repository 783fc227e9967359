"""Case-file block ``transient:``: a time history after an event, and the thermal impedance.

The block is optional (heat-sink cases). Every physical value is read with
:func:`finkit.units.to_si` and stored as an SI float (s, W, J/K; every model forbids unknown
keys); a problem is one line naming the field, the value and what is allowed. The condition
names (``start_condition``, ``event.condition``) are checked against the case's scenarios by
:mod:`finkit.case`.

Example (YAML)::

    transient:
      start_condition: hot-day           # steady state before the event (default nominal)
      event: {at: 60 s, condition: hot-day-one-fan}   # a scenario of the case takes over
      duration: 1 h
      required_response_time: 120 s      # detection + shutdown time the product needs
      heat_capacities: {junction: 0.5 J/K, case: 4 J/K, basis: "package data sheet"}
      fin_nodes: 1                       # more: a ladder of nodes along each fin
      impedance_terms: 4                 # RC pairs of the fitted Foster ladder
      power:                             # optional; default the condition's own power
        pulses: {high: 80 W, low: 20 W, period: 60 s, duty_cycle: 0.25}
        # or steps: [{at: 0 s, power: 40 W}, {at: 600 s, power: 60 W}]
        # or table: {time: [0 s, 30 s, 90 s], power: [40 W, 80 W, 40 W]}   (linear)
"""

from __future__ import annotations

from typing import Literal

from pydantic import model_validator

from finkit.case.fields import StrictModel, Text, fail_at, fail_many, quantity, whole

__all__ = [
    "EventBlock",
    "HeatCapacitiesBlock",
    "PowerBlock",
    "PowerStepBlock",
    "PowerTableBlock",
    "PulsesBlock",
    "TransientBlock",
]

#: Most fin nodes of the ladder option, and most RC pairs of the fitted Foster ladder.
MAX_FIN_NODES = 20
MAX_IMPEDANCE_TERMS = 8

Time = quantity("time", ge=0.0, show="s")
Duration = quantity("time", gt=0.0, show="s")
PowerOrZero = quantity("power", ge=0.0, show="W")
PulsePower = quantity("power", gt=0.0, show="W")
HeatCapacity = quantity("heat_capacity", ge=0.0, show="J/K")
DutyCycle = quantity("dimensionless", gt=0.0, le=1.0)


class EventBlock(StrictModel):
    """A step change of operating condition.

    Attributes
    ----------
    at : float
        Time of the change, after the start [s]; greater than 0.
    condition : str
        The condition that takes over: a scenario of the case (``scenarios[i].name``) or
        ``nominal``. [-]
    """

    at: Duration
    condition: Text


class PowerStepBlock(StrictModel):
    """From time ``at`` [s] on, the power is ``power`` [W] (until the next step)."""

    at: Time
    power: PowerOrZero


class PulsesBlock(StrictModel):
    """A rectangular pulse train.

    ``high`` [W] for ``duty_cycle * period`` [s] in every ``period``, ``low`` [W] otherwise
    (default 0 W) and before ``start`` [s] (default 0 s); ``count`` pulses (default: until the
    end of the run).
    """

    high: PulsePower
    low: PowerOrZero = 0.0
    period: Duration
    duty_cycle: DutyCycle
    start: Time = 0.0
    count: whole(1) | None = None

    @model_validator(mode="after")
    def _levels(self):
        if self.low > self.high:
            raise fail_at("low", f"must not exceed high (got {self.low:g} W > {self.high:g} W)")
        return self


class PowerTableBlock(StrictModel):
    """Power at listed times: ``time`` [s] from 0 s, increasing; ``power`` [W], same length.

    ``interpolation``: ``linear`` (default) joins the points, ``step`` holds each value until
    the next time. After the last time the last power holds.
    """

    time: list[Time]
    power: list[PowerOrZero]
    interpolation: Literal["linear", "step"] = "linear"

    @model_validator(mode="after")
    def _shape(self):
        problems = []
        if len(self.time) != len(self.power):
            problems.append(
                (
                    "power",
                    f"needs one value per time (got {len(self.power)} powers for "
                    f"{len(self.time)} times)",
                )  # fmt: skip
            )
        if len(self.time) < 2:
            problems.append(("time", f"give at least 2 points (got {len(self.time)})"))
        elif self.time[0] != 0.0:
            problems.append(("time", f"must start at 0 s (got {self.time[0]:g} s)"))
        if any(b <= a for a, b in zip(self.time, self.time[1:], strict=False)):
            problems.append(("time", "must increase from point to point"))
        if problems:
            raise fail_many(problems)
        return self


class PowerBlock(StrictModel):
    """Power against time: exactly one of ``steps``, ``pulses`` or ``table``.

    The profile replaces the power of the conditions (the conductances still come from each
    condition's steady state at its own power).
    """

    steps: list[PowerStepBlock] | None = None
    pulses: PulsesBlock | None = None
    table: PowerTableBlock | None = None

    @model_validator(mode="after")
    def _one(self):
        given = [n for n in ("steps", "pulses", "table") if getattr(self, n) is not None]
        if len(given) != 1:
            got = ", ".join(given) or "none"
            raise fail_many([("", f"give exactly one of steps, pulses, table (got {got})")])
        if self.steps is not None:
            times = [s.at for s in self.steps]
            if not times or times[0] != 0.0:
                got = f"{times[0]:g} s" if times else "no steps"
                raise fail_at("steps", f"the first step must be at 0 s (got {got})")
            if any(b <= a for a, b in zip(times, times[1:], strict=False)):
                raise fail_at("steps", "times (at) must increase from step to step")
        return self


class HeatCapacitiesBlock(StrictModel):
    """Heat capacities of the device and a spreader, where known [J K⁻¹].

    ``junction`` (the die), ``case`` (package and lid) and ``spreader`` (a plate between the
    case and the sink base, lumped at the base under the source). Left out, a node holds no
    heat and follows at once: the junction then rises sooner, the conservative choice.
    ``basis`` says where the values come from.
    """

    junction: HeatCapacity = 0.0
    case: HeatCapacity = 0.0
    spreader: HeatCapacity = 0.0
    basis: Text | None = None


class TransientBlock(StrictModel):
    """A time history from a steady start, an optional change of condition and a power history.

    Attributes
    ----------
    start_condition : str
        Condition whose steady state is the start (``nominal`` or a scenario name). [-]
    event : EventBlock, optional
        Change to another condition at a time (a fan fails, the filter clogs, the inlet
        rises). [-]
    power : PowerBlock, optional
        Power against time; default the power of the condition in force. [-]
    duration : float
        Length of the run [s].
    required_response_time : float, optional
        The time the product needs after the event (detect the fault, shut down or throttle)
        during which the limit must not be reached [s]; counted from the event, or from the
        start without one.
    heat_capacities : HeatCapacitiesBlock, optional
        Device and spreader heat capacities [J K⁻¹].
    fin_nodes : int
        Nodes along each fin (1 = one node at the mean fin temperature; up to 20). [-]
    impedance_terms : int
        RC pairs of the Foster ladder fitted to the step response (1-8; at most the number of
        nodes with a heat capacity is used). [-]
    """

    start_condition: Text = "nominal"
    event: EventBlock | None = None
    power: PowerBlock | None = None
    duration: Duration
    required_response_time: Duration | None = None
    heat_capacities: HeatCapacitiesBlock = HeatCapacitiesBlock()
    fin_nodes: whole(1) = 1
    impedance_terms: whole(1) = 4

    @model_validator(mode="after")
    def _times(self):
        problems = []
        if self.fin_nodes > MAX_FIN_NODES:
            problems.append(
                ("fin_nodes", f"must be at most {MAX_FIN_NODES} (got {self.fin_nodes})")
            )
        if self.impedance_terms > MAX_IMPEDANCE_TERMS:
            problems.append(
                ("impedance_terms",
                 f"must be at most {MAX_IMPEDANCE_TERMS} (got {self.impedance_terms})")
            )  # fmt: skip
        start = 0.0
        if self.event is not None:
            start = self.event.at
            if self.event.at >= self.duration:
                problems.append(
                    (
                        "event.at",
                        f"must be before the end of the run, duration {self.duration:g} s "
                        f"(got {self.event.at:g} s)",
                    )  # fmt: skip
                )
            if self.event.condition == self.start_condition:
                problems.append(
                    ("event.condition",
                     f"must differ from start_condition (both '{self.start_condition}')")
                )  # fmt: skip
        if self.required_response_time is not None:
            if start + self.required_response_time > self.duration:
                problems.append(
                    ("duration",
                     f"must cover the required response time after the event: at least "
                     f"{start + self.required_response_time:g} s (got {self.duration:g} s)")
                )  # fmt: skip
        if problems:
            raise fail_many(problems)
        return self

    def condition_names(self) -> list[tuple[str, str]]:
        """(field, condition name) pairs the case must define."""
        out = [("start_condition", self.start_condition)]
        if self.event is not None:
            out.append(("event.condition", self.event.condition))
        return out
