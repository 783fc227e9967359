"""Input sanity flags: implausible inputs and fin gaps outside the manufacturing bounds."""

from __future__ import annotations

import numpy as np

from finkit.constants import ZERO_CELSIUS
from finkit.model.design import SinkInputs, solve
from finkit.physics.correlations import natural
from finkit.physics.properties.air import air_properties

__all__ = [
    "JUNCTION_TO_CASE_BUDGET_SHARE",
    "JUNCTION_TO_CASE_FLAG",
    "PLAUSIBLE",
    "ROOM_AMBIENT_BAND",
    "TIGHT_GAP_FLOOR",
    "TIGHT_GAP_RATIO",
    "sanity_flags",
]


# --------------------------------------------------------------------------------------
# Input sanity flags
# --------------------------------------------------------------------------------------

JUNCTION_TO_CASE_FLAG = 5.0
"""RθJC [K W⁻¹] at or above which a stated junction-to-case figure looks like a still-air
junction-to-ambient one. Common practice, no source: packages that need a heat sink have a
top-side RθJC well below 1-2 K/W, while JESD51-2A still-air θJA values of the same packages
are tens of K/W."""

JUNCTION_TO_CASE_BUDGET_SHARE = 0.5
"""Share of the available rise (limit - inlet) above which the junction-to-case drop alone is
suspicious [-] (common practice, no source)."""

ROOM_AMBIENT_BAND = (20.0 + ZERO_CELSIUS - 1.0, 25.0 + ZERO_CELSIUS + 1.0)
"""Inlet temperatures [K] that look like room ambient (20-25 degC, ±1 K)."""

TIGHT_GAP_RATIO = 0.5
"""Natural-convection fin gap below this fraction of the Bar-Cohen & Rohsenow optimum is
flagged [-]. Derived from the composite correlation: at half the optimum spacing the heat per
unit volume is about 43 % of its optimum value (``Nu_S/S²`` with El ∝ S⁴)."""

TIGHT_GAP_FLOOR = 3.0e-3
"""Natural-convection fin gap [m] below which a gap is flagged whatever the optimum (dust
bridging and the fully developed regime; common practice, no source)."""


def _attr(obj, *names):
    for name in names:
        obj = getattr(obj, name, None)
        if obj is None:
            return None
    return obj


def sanity_flags(case, inputs: SinkInputs | None = None) -> list[str]:
    """One-line warnings for inputs practitioners commonly get wrong.

    Parameters
    ----------
    case : finkit.case.HeatSinkCase
        The validated case (single-fin cases give no flags: their h is given by design).
        Optional fields read if present: ``source.junction_to_case_basis``,
        ``air.preheat_allowance``, ``sink.heat_transfer_coefficient_override``. [-]
    inputs : SinkInputs, optional
        Its physics inputs (built from the case if not given). [-]

    Returns
    -------
    list of str
        One line per flag (empty when nothing looks wrong):

        * ``source.junction_to_case`` -- stated as ``theta-ja``, or at or above
          :data:`JUNCTION_TO_CASE_FLAG` K/W, or its drop ``P R_jc`` takes more than
          :data:`JUNCTION_TO_CASE_BUDGET_SHARE` of the rise from inlet air to a junction limit,
          unless the basis is stated as a JESD51-14 RθJC. θJA (JESD51-2A still-air box)
          describes a test setup, not a heat-sink path.
        * ``air.inlet_temperature`` -- within :data:`ROOM_AMBIENT_BAND` with no
          ``air.preheat_allowance`` stated: using room ambient for the sink's inlet air
          under-predicts when upstream parts preheat it.
        * ``sink.heat_transfer_coefficient_override`` -- h typed in by hand instead of computed.
        * ``air.flow.approach_velocity`` or ``air.flow.volume_flow`` with no ``air.bypass``
          block: the sink is taken as fully ducted, optimistic for a sink in an open stream.
        * ``air.bypass.free_stream`` -- a sink in an open stream: names the bypass model and
          its uncertainty, and that the result rests on the stated approach flow.
        * ``sink.fins`` -- natural convection, vertical fins, with a fin gap below
          :data:`TIGHT_GAP_RATIO` of the Bar-Cohen & Rohsenow optimum spacing (at the solved
          base temperature) or below :data:`TIGHT_GAP_FLOOR`.
    """
    if getattr(case, "kind", "heat-sink") != "heat-sink":
        return []
    flags: list[str] = []
    air, sink = case.air, case.sink

    # 1. junction-to-case given as a still-air junction-to-ambient figure
    for path, src, limit in _sources_of(case):
        flags += _junction_to_case_flags(path, src, limit, air.inlet_temperature)

    # 2. inlet air at room ambient with no preheat allowance stated
    t_in = air.inlet_temperature
    preheat = _attr(air, "preheat_allowance")
    if ROOM_AMBIENT_BAND[0] <= t_in <= ROOM_AMBIENT_BAND[1] and preheat is None:
        flags.append(
            f"air.inlet_temperature: {t_in - ZERO_CELSIUS:.1f} degC is room ambient and no "
            "air.preheat_allowance is stated; the air reaching the sink is usually preheated "
            "by parts upstream (state the allowance, 0 K if none)"
        )

    # 3. h typed in by hand
    h_given = _attr(sink, "heat_transfer_coefficient_override")
    if h_given is not None:
        flags.append(
            f"sink.heat_transfer_coefficient_override: h = {h_given:.3g} W/m^2/K typed in by "
            "hand instead of computed from a correlation; tables of h suit only early estimates"
        )

    # 4. tight fin gaps in natural convection
    # (the optimum is Bar-Cohen & Rohsenow's, for vertical fins only)
    natural_flow = _attr(air, "flow", "natural")
    if (
        natural_flow is not None
        and sink.type == "plate-fin"
        and (_attr(natural_flow, "orientation") == "vertical-fins")
    ):
        if inputs is None:
            from finkit.model.design import sink_inputs

            inputs = sink_inputs(case)
        g = inputs.geometry
        gap = float(g.fin_spacing)
        sol = solve(inputs)
        t_in_k = float(sol.inlet_air_temperature)
        excess = max(float(sol.base_temperature) - t_in_k, 1e-3)
        film = air_properties(t_in_k + 0.5 * excess, inputs.air.pressure)
        nu = film.dynamic_viscosity / film.density
        alpha = nu / film.prandtl
        s_opt = float(
            natural.optimum_fin_spacing_bar_cohen_rohsenow(
                g.base_length, excess, t_in_k + 0.5 * excess, nu, alpha
            )
        )
        if gap < TIGHT_GAP_RATIO * s_opt or gap < TIGHT_GAP_FLOOR:
            flags.append(
                f"sink.fins: fin gap {gap * 1e3:.2f} mm in natural convection is tight "
                f"(Bar-Cohen & Rohsenow optimum about {s_opt * 1e3:.1f} mm at a "
                f"{excess:.0f} K base rise); the channels choke the buoyant flow and collect dust"
            )
    # 5. a given approach velocity or volume flow with nothing said about bypass
    flow = _attr(air, "flow")
    given = [name for name in ("approach_velocity", "volume_flow") if _attr(flow, name) is not None]
    if given and _attr(air, "bypass") is None:
        flags.append(
            f"air.flow.{given[0]}: no air.bypass is stated, so the sink is taken as fully "
            "ducted (all the air goes through the fins); a sink in an open stream or with "
            "clearance to the walls sees much less. State air.bypass (side_gap and top_gap, "
            "0 mm when the duct really touches the fins; free_stream: true for a sink "
            "standing in an open stream)"
        )
    elif given and _attr(air, "bypass", "free_stream"):
        flags.append(
            "air.bypass.free_stream: the sink stands unshrouded in the stream, so only part of "
            "the air aimed at it passes through the fins (Lee 1995 bypass balance with an "
            "unbounded bypass region, as Simons & Schmidt 1997; about ±10-20 % on the fin "
            f"flow); the result rests on air.flow.{given[0]}: measure the approach velocity at "
            "the sink over the fin height, with the sink removed"
        )
    # 6. fin gaps and fins that cannot be made (forced and natural convection)
    flags += _manufacturing_flags(case)
    # 7. magnitudes outside air cooling of electronics: typed with a unit, but likely a slip
    flags += _implausible_flags(case)
    return flags


def _sources_of(case):
    """(field path, source block, its limit) of each source of a heat-sink case."""
    if getattr(case, "sources", None):
        return [(f"sources[{i}]", s, s.limit or case.limit) for i, s in enumerate(case.sources)]
    return [("source", case.source, case.limit)]


def _junction_to_case_flags(path, src, limit, inlet_temperature) -> list[str]:
    """A junction-to-case figure that is really a still-air θJA."""
    r_jc = float(src.junction_to_case or 0.0)
    basis = _attr(src, "junction_to_case_basis")
    budget = limit.temperature - inlet_temperature
    share = src.power * r_jc / budget if budget > 0 else 0.0
    if basis == "theta-ja":
        return [
            f"{path}.junction_to_case: {r_jc:.3g} K/W is stated as θJA (JESD51-2A still air), "
            "which describes a test box, not the path through a heat sink; use RθJC "
            "(JESD51-14) for the cooled side"
        ]
    if basis not in ("jesd51-14-top", "jesd51-14-bottom") and (
        r_jc >= JUNCTION_TO_CASE_FLAG
        or (limit.node == "junction" and share > JUNCTION_TO_CASE_BUDGET_SHARE)
    ):
        return [
            f"{path}.junction_to_case: {r_jc:.3g} K/W (drop {src.power * r_jc:.1f} K at "
            f"{src.power:.3g} W, {100 * share:.0f} % of the rise to the limit) looks like a "
            "still-air θJA rather than RθJC; θJA (JESD51-2A) is not a heat-sink path metric. "
            f"State {path}.junction_to_case_basis"
        ]
    return []


#: Ranges of air-cooled electronics heat sinks (low, high, SI unit, field); a value outside is
#: flagged, not refused: typed with a unit it may be right, but it is more likely a slip of
#: unit or of digits (common practice, no source).
PLAUSIBLE = {
    "approach_velocity": (0.0, 20.0, "m/s", "air.flow.approach_velocity"),
    "fin_height": (1e-3, 0.3, "m", "sink.fins.height"),
    "fin_thickness": (5e-5, 0.02, "m", "sink.fins.thickness"),
    "pin_diameter": (2e-4, 0.03, "m", "sink.pins.diameter"),
    "pin_height": (1e-3, 0.3, "m", "sink.pins.height"),
    "base_length": (5e-3, 1.0, "m", "sink.base.length"),
    "base_width": (5e-3, 1.0, "m", "sink.base.width"),
    "base_thickness": (3e-4, 0.1, "m", "sink.base.thickness"),
    "footprint_length": (5e-4, 0.5, "m", "source.footprint_length"),
    "footprint_width": (5e-4, 0.5, "m", "source.footprint_width"),
    "power": (1e-3, 1e4, "W", "source.power"),
    "limit_temperature": (0.0, 250.0 + ZERO_CELSIUS, "K", "limit.temperature"),
    "thermal_conductivity": (0.0, 2000.0, "W/(m K)", "the sink material's conductivity"),
}


def _implausible_flags(case) -> list[str]:
    """Typed values far outside air cooling of electronics (a slip of unit or of digits)."""
    from finkit.model.design import sink_inputs

    inputs = sink_inputs(case)
    fins = getattr(case.sink, "fins", None)
    pins = getattr(case.sink, "pins", None)
    values = {
        "approach_velocity": getattr(case.air.flow, "approach_velocity", None),
        "fin_height": getattr(fins, "height", None),
        "fin_thickness": getattr(fins, "thickness", None),
        "pin_diameter": getattr(pins, "diameter", None),
        "pin_height": getattr(pins, "height", None),
        "base_length": case.sink.base.length,
        "base_width": case.sink.base.width,
        "base_thickness": case.sink.base.thickness,
        "limit_temperature": case.limit.temperature,
        "thermal_conductivity": float(np.max(inputs.material.thermal_conductivity)),
    }
    checked = [(name, value, PLAUSIBLE[name][3]) for name, value in values.items()]
    for path, src, _ in _sources_of(case):
        for name in ("footprint_length", "footprint_width", "power"):
            checked.append((name, getattr(src, name), f"{path}.{name}"))
    out = []
    for name, value, field_name in checked:
        low, high, unit, _ = PLAUSIBLE[name]
        if value is None or low < value <= high:
            continue
        if unit == "K":
            shown, shown_unit, span = (
                value - ZERO_CELSIUS,
                "degC",
                f"up to about {high - ZERO_CELSIUS:g} degC",
            )
        elif unit == "m":
            shown, shown_unit, span = value * 1e3, "mm", f"about {low * 1e3:g} to {high * 1e3:g} mm"
        else:
            shown, shown_unit = value, unit
            span = (
                f"up to about {high:g} {unit}" if low <= 0 else f"about {low:g} to {high:g} {unit}"
            )
        out.append(
            f"{field_name}: {shown:.4g} {shown_unit} is outside what air-cooled electronics "
            f"use ({span}); check the value and its unit"
        )
    return out


def _manufacturing_flags(case) -> list[str]:
    """Fin gaps thinner than the fins, or outside the trade study's manufacturing bounds.

    The bounds are :class:`finkit.case.bounds.ManufacturingBounds` (the case's ``trade_study``
    bounds
    when it gives them): common practice for extruded sinks, no source.
    """
    from finkit.case.bounds import ManufacturingBounds
    from finkit.case.explore_blocks import to_bounds

    sink = case.sink
    if sink.type != "plate-fin" or sink.fins is None:
        return []
    study = getattr(case, "trade_study", None)
    bounds = to_bounds(study) if study is not None else ManufacturingBounds()
    n, t, h = sink.fins.count, sink.fins.thickness, sink.fins.height
    gap = (sink.base.width - n * t) / (n - 1) if n > 1 else float("inf")
    out = []
    if gap < t:
        out.append(
            f"sink.fins: fin gap {gap * 1e3:.2f} mm is narrower than the {t * 1e3:.2f} mm fins "
            f"({n} fins on {sink.base.width * 1e3:.0f} mm); hard to extrude and quick to foul"
        )
    elif gap < bounds.min_fin_gap:
        out.append(
            f"sink.fins: fin gap {gap * 1e3:.2f} mm is below the {bounds.min_fin_gap * 1e3:.2f} "
            "mm manufacturing minimum of the trade study (common practice, no source)"
        )
    if gap > 0 and h / gap > bounds.max_fin_aspect_ratio:
        out.append(
            f"sink.fins: fin height over gap {h / gap:.1f} exceeds the "
            f"{bounds.max_fin_aspect_ratio:g} the trade study allows (common practice, no source)"
        )
    return out
