"""Sweeps: one input of a design replaced by an array, and what else the notes plot.

Ranges of the note's sweeps, fin temperature profiles, system and fan curves, and the airflow a
power needs.
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

import numpy as np

from finkit.case.parts import SWEEP_NAMES
from finkit.errors import InputError, PropertyRangeError
from finkit.model.design import (
    SinkInputs,
    allowable,
    limit_node_temperature,
    solve,
)
from finkit.physics.geometry import PinFinSink, PlateFinSink
from finkit.physics.properties.atmosphere import standard_atmosphere
from finkit.physics.properties.materials import get_material
from finkit.physics.sink.inputs import (
    FanDriven,
    FreeStream,
    GivenVolumeFlow,
    NaturalConvection,
)
from finkit.physics.sink.results import SinkSolution

__all__ = [
    "NOTE_SWEEPS",
    "SWEEPABLE",
    "fan_pressure",
    "fin_temperature_profile",
    "is_fin_tip_exposed",
    "note_airflow_range",
    "note_h_range",
    "note_inlet_range",
    "note_sweep",
    "note_sweep_values",
    "single_fin_profiles",
    "sweep",
    "sweep_notes",
    "swept_inputs",
    "system_curve",
    "volume_flow_for_power",
]

# --------------------------------------------------------------------------------------
# Sweeps (mode c): one input replaced by an array
# --------------------------------------------------------------------------------------

SWEEPABLE = SWEEP_NAMES
"""Inputs a sweep (and a case's ``sweeps`` list) may vary: the case file's one registry,
:data:`finkit.case.SWEEP_NAMES`."""


def swept_inputs(inputs: SinkInputs, name: str, values) -> SinkInputs:
    """A copy of ``inputs`` with one quantity replaced by an array of values (SI).

    ``inlet_temperature``: the surroundings the sink radiates to keep their offset from the
    inlet air (walls warmed by the same air). ``heat_transfer_coefficient``: every air-side
    surface gets that h instead of the correlations (``ModelOptions.
    heat_transfer_coefficient_override``), a sensitivity to the correlation. ``fin_height`` of a
    pin-fin sink is the pin height; ``fin_count`` and ``fin_thickness`` apply to plate fins.

    Parameters
    ----------
    inputs : SinkInputs
        The design at one condition. [-]
    name : str
        The swept quantity, one of :data:`SWEEPABLE`. [-]
    values : array_like
        Values of the swept quantity in SI, as for :func:`sweep`. [SI]
    """
    values = np.asarray(values, float)
    g = inputs.geometry
    if name == "inlet_temperature":
        air = replace(inputs.air, inlet_temperature=values)
        if inputs.air.surroundings_temperature is not None:
            offset = np.asarray(inputs.air.surroundings_temperature, float) - np.asarray(
                inputs.air.inlet_temperature, float
            )
            air = replace(air, surroundings_temperature=values + offset)
        return replace(inputs, air=air)
    if name == "altitude":
        p = standard_atmosphere(values).pressure
        air = replace(inputs.air, pressure=np.asarray(p, float))
        return replace(inputs, air=air, altitude=values)
    if name == "airflow":
        if isinstance(inputs.flow, NaturalConvection):
            raise InputError("sweeps: 'airflow' does not apply to natural convection")
        return replace(inputs, flow=GivenVolumeFlow(values))
    if name == "heat_transfer_coefficient":
        options = replace(inputs.options, heat_transfer_coefficient_override=values)
        return replace(inputs, options=options)
    if name == "power":
        return replace(inputs, source=replace(inputs.source, power=values))
    if name == "fin_height" and isinstance(g, PinFinSink):
        return replace(inputs, geometry=replace(g, pin_height=values))
    if name in ("fin_count", "fin_height", "fin_thickness"):
        if not isinstance(g, PlateFinSink):
            raise InputError(f"sweeps: {name!r} applies to plate-fin sinks only")
        return replace(inputs, geometry=replace(g, **{name: values}))
    raise InputError(f"sweeps: got {name!r}; allowed: {', '.join(SWEEPABLE)}")


def sweep(inputs: SinkInputs, name: str, values) -> dict[str, np.ndarray]:
    """Temperatures at the stated power and allowable power over an array of one input.

    Parameters
    ----------
    inputs : SinkInputs
        The case's physics inputs. [-]
    name : str
        One of :data:`SWEEPABLE`. [-]
    values : array_like
        Values of the swept quantity in SI (K, m³ s⁻¹, W m⁻² K⁻¹, -, m, m, m, W). [SI]

    Returns
    -------
    dict
        Arrays: ``values`` (SI), ``junction_temperature``, ``base_temperature``,
        ``limit_node_temperature`` [K], ``allowable_power`` [W] (at the limit less the required
        margin, zero where the inlet air leaves no margin), ``sink_resistance`` [K W⁻¹],
        ``fin_efficiency`` [-], ``pressure_drop`` [Pa], ``heat_transfer_coefficient``
        [W m⁻² K⁻¹].
    """
    swept = swept_inputs(inputs, name, values)
    sol = solve(swept)
    usable = inputs.limit_temperature - inputs.required_margin
    shape = np.shape(sol.power)
    t_in = np.broadcast_to(np.asarray(swept.air.inlet_temperature, float), shape)
    ok = t_in < usable - 1e-6
    # Where the inlet air already reaches the usable limit the allowable power is zero; solve
    # the others at an inlet clipped just below it so that one array call serves all points.
    t_clip = np.minimum(t_in, usable - 1e-3)
    air = replace(swept.air, inlet_temperature=t_clip)
    if swept.air.surroundings_temperature is not None:
        # Clipped points keep their surroundings-to-inlet offset (their result is discarded).
        air = replace(
            air, surroundings_temperature=swept.air.surroundings_temperature + t_clip - t_in
        )
    power = np.where(ok, np.asarray(allowable(replace(swept, air=air)).power, float), 0.0)
    return {
        "values": np.asarray(values, float),
        "junction_temperature": sol.junction_temperature,
        "base_temperature": sol.base_temperature,
        "limit_node_temperature": limit_node_temperature(swept, sol),
        "allowable_power": power,
        "sink_resistance": sol.sink_resistance,
        "fin_efficiency": sol.fin_efficiency,
        "pressure_drop": sol.pressure_drop,
        "heat_transfer_coefficient": sol.heat_transfer_coefficient,
    }


# --- note support ---
# Quantities the calculation notes plot that the solution does not carry itself. Physics stays
# here (finkit.report only formats and draws); every function re-uses the model's own
# inputs.

#: Sweeps a note can draw (the same as :data:`SWEEPABLE`).
NOTE_SWEEPS = SWEEPABLE


def note_inlet_range(inputs: SinkInputs) -> np.ndarray:
    """Inlet air temperatures [K] a note plots the allowable power over: from 25 K below the
    inlet (or 30 K below the usable limit) up to the limit itself (beyond it no power is
    allowable and the curve says nothing).

    Parameters
    ----------
    inputs : SinkInputs
        The design at the plotted condition. [-]
    """
    t_in = float(np.max(inputs.air.inlet_temperature))
    usable = inputs.limit_temperature - inputs.required_margin
    low = min(t_in - 25.0, usable - 30.0)
    high = max(inputs.limit_temperature, t_in + 1.0)
    return np.linspace(low, high, 57)


def note_airflow_range(solution: SinkSolution) -> np.ndarray:
    """Total volume flows [m³ s⁻¹] a note plots: 1/4 to 2.5 times the operating flow.

    Parameters
    ----------
    solution : SinkSolution
        The solved state at the plotted condition. [-]
    """
    q0 = float(np.max(solution.volume_flow))
    return np.geomspace(q0 / 4.0, q0 * 2.5, 45)


def note_h_range(solution: SinkSolution) -> np.ndarray:
    """Heat transfer coefficients [W m⁻² K⁻¹] a note plots: 1/2 to 2 times the solved h.

    Parameters
    ----------
    solution : SinkSolution
        The solved state at the plotted condition. [-]
    """
    h0 = float(np.max(solution.heat_transfer_coefficient))
    return np.geomspace(h0 / 2.0, h0 * 2.0, 41)


def note_sweep_values(
    inputs: SinkInputs, solution: SinkSolution, altitude: float, name: str
) -> tuple[np.ndarray, float, str | None]:
    """The values a note's sweep figure plots, the case's own value, and a clipping note.

    Every range stays inside what the model accepts: the altitude range ends at the standard
    atmosphere's top (20 km), fin thicknesses and counts at what fits on the base. A range that
    had to be cut says so in the third item (``finkit check`` reports it as a warning, so the
    check and the note agree on what is drawn).

    Parameters
    ----------
    inputs : SinkInputs
        The case's physics inputs (at the condition drawn). [-]
    solution : SinkSolution
        Its solution (operating flow and h set the airflow and h ranges). [-]
    altitude : float
        The case's altitude [m].
    name : str
        One of :data:`NOTE_SWEEPS`. [-]

    Returns
    -------
    tuple
        ``(values in SI, case value in SI, note or None)``.
    """
    from finkit.physics.properties.atmosphere import ALTITUDE_RANGE

    g = inputs.geometry

    def scalar(x):
        return float(np.max(np.asarray(x, float)))

    if name == "inlet_temperature":
        return note_inlet_range(inputs), scalar(inputs.air.inlet_temperature), None
    if name == "airflow":
        return note_airflow_range(solution), scalar(solution.volume_flow), None
    if name == "heat_transfer_coefficient":
        return note_h_range(solution), scalar(solution.heat_transfer_coefficient), None
    if name == "power":
        p = scalar(inputs.source.power)
        return np.linspace(0.25 * p, 2.0 * p, 36), p, None
    if name == "altitude":
        z = float(altitude)
        wanted = max(4000.0, z + 1000.0)
        top = min(wanted, ALTITUDE_RANGE[1])
        note = (
            f"sweeps: the altitude figure ends at {top:.0f} m, the top of the standard "
            f"atmosphere, not at {wanted:.0f} m"
            if top < wanted
            else None
        )
        return np.linspace(0.0, top, 41), z, note
    if name == "fin_height":
        h = scalar(g.fin_height if isinstance(g, PlateFinSink) else g.pin_height)
        return np.linspace(0.4 * h, 2.0 * h, 33), h, None
    if not isinstance(g, PlateFinSink):
        raise InputError(f"sweeps: {name!r} applies to plate-fin sinks only")
    if name == "fin_thickness":
        t = scalar(g.fin_thickness)
        fits = (scalar(g.base_width) * 0.7) / scalar(g.fin_count)
        return np.linspace(0.4 * t, min(2.5 * t, fits), 33), t, None
    if name == "fin_count":
        n = int(scalar(g.fin_count))
        most = int((scalar(g.base_width) * 0.7) // scalar(g.fin_thickness))
        counts = np.arange(max(2, n // 3), max(n + 2, min(3 * n, most)) + 1)
        return counts.astype(float), float(n), None
    raise InputError(f"sweeps: got {name!r}; allowed: {', '.join(NOTE_SWEEPS)}")


def sweep_notes(case, inputs: SinkInputs, solution: SinkSolution) -> list[str]:
    """Clipping notes of the sweeps a case declares (see :func:`note_sweep_values`).

    Parameters
    ----------
    case : finkit.case.HeatSinkCase
        The validated case (its ``sweeps`` list). [-]
    inputs : SinkInputs
        The design at the plotted condition. [-]
    solution : SinkSolution
        Its solved state. [-]
    """
    notes = []
    for name in getattr(case, "sweeps", []) or []:
        note = note_sweep_values(inputs, solution, float(case.air.altitude), name)[2]
        if note:
            notes.append(note)
    return notes


def is_fin_tip_exposed(inputs: SinkInputs) -> bool:
    """True where the fin tips see the air: natural convection, a free stream (no duct), or a
    bypass gap above the tips.

    Same rule as :mod:`finkit.physics.sink`: a shroud on the tips (no top gap) makes the tip
    adiabatic on the real length; an exposed tip uses the corrected length ``L + A_c/P``.

    Parameters
    ----------
    inputs : SinkInputs
        The design at one condition. [-]
    """
    if isinstance(inputs.flow, NaturalConvection) or isinstance(inputs.bypass, FreeStream):
        return True
    return inputs.bypass is not None and bool(np.any(np.asarray(inputs.bypass.top_gap) > 0))


def fin_temperature_profile(
    inputs: SinkInputs, solution: SinkSolution, points: int = 101
) -> dict[str, Any]:
    """Temperature along one fin (or pin) inside the array, at the solved state.

    The fin is the model's own: uniform section, adiabatic tip on the corrected length
    ``L_c = L + A_c/P`` when the tip is exposed (``L`` when shrouded), the solved
    (area-mean, inlet-referenced) heat transfer coefficient, the mean base temperature at its
    root and the inlet air as the reference temperature, exactly as :mod:`finkit.physics.sink`
    obtains
    its fin efficiency and fin-tip temperature. Plate fins use the thin-fin section
    (``P = 2 L_base``, ``A_c = t L_base``), so that ``m = sqrt(2 h / (k t))``; pins ``P = π D``,
    ``A_c = π D²/4``.

    Parameters
    ----------
    inputs : SinkInputs
        The case's physics inputs (scalar fields). [-]
    solution : SinkSolution
        The solved state (scalar), e.g. ``CaseResult.solution``. [-]
    points : int, optional
        Number of points from the root to the real tip. [-]

    Returns
    -------
    dict
        ``x`` distance from the base [m] over ``0 … L`` (the real fin), ``temperature`` [K],
        ``fin_length`` L [m], ``model_length`` (L or L_c) [m], ``heat_transfer_coefficient``
        [W m⁻² K⁻¹], ``thermal_conductivity`` [W m⁻¹ K⁻¹], ``is_tip_exposed`` [-],
        ``reference_temperature`` (inlet air) [K], ``base_temperature`` [K] and
        ``tip_temperature`` (the solution's fin-tip temperature, at ``x = L_c``) [K].

    References
    ----------
    .. [1] Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., "Fundamentals of Heat and
       Mass Transfer", 6th ed., Wiley, 2007, Table 3.4 (case B, adiabatic tip) and eq. 3.89
       (corrected length).
    """
    from finkit.physics.fins import analytic as fa

    g = inputs.geometry
    if isinstance(g, PlateFinSink):
        section = fa.rectangular_fin_section(g.fin_thickness, g.base_length, include_edges=False)
        length = float(g.fin_height)
    else:
        section = fa.pin_fin_section(g.pin_diameter)
        length = float(g.pin_height)
    exposed = is_fin_tip_exposed(inputs)
    model_length = (
        float(fa.corrected_length(length, section.perimeter, section.cross_section_area))
        if exposed
        else length
    )
    h = float(np.asarray(solution.heat_transfer_coefficient))
    k = float(np.asarray(inputs.material.thermal_conductivity))
    t_ref = float(np.asarray(solution.inlet_air_temperature))
    t_base = float(np.asarray(solution.base_temperature))
    x = np.linspace(0.0, length, int(points))
    theta = fa.uniform_fin_temperature_difference(
        x,
        model_length,
        section.perimeter,
        section.cross_section_area,
        k,
        h,
        t_base - t_ref,
        tip="adiabatic",
    )
    return {
        "x": x,
        "temperature": t_ref + np.asarray(theta, float),
        "fin_length": length,
        "model_length": model_length,
        "heat_transfer_coefficient": h,
        "thermal_conductivity": k,
        "is_tip_exposed": exposed,
        "reference_temperature": t_ref,
        "base_temperature": t_base,
        "tip_temperature": float(np.asarray(solution.fin_tip_temperature)),
    }


def system_curve(inputs: SinkInputs, volume_flow) -> dict[str, np.ndarray]:
    """Pressure drop of the sink (with its bypass) over a range of total volume flows.

    The same system the model crosses with the fan curve: finned region and bypass gaps in
    parallel at the inlet air density and viscosity (:func:`finkit.physics.sink.solve_airflow` with
    a
    given volume flow), times ``options.pressure_drop_factor``.

    Parameters
    ----------
    inputs : SinkInputs
        A forced-convection case's inputs. [-]
    volume_flow : array_like
        Total volume flows approaching the sink, > 0. [m³ s⁻¹]

    Returns
    -------
    dict
        ``volume_flow`` [m³ s⁻¹], ``pressure_drop`` [Pa], ``sink_volume_flow`` (through the
        fins) [m³ s⁻¹].
    """
    from finkit.physics.sink.airflow import solve_airflow

    if isinstance(inputs.flow, NaturalConvection):
        raise InputError("air.flow: natural convection has no system curve")
    q = np.asarray(volume_flow, float)
    flows = solve_airflow(
        inputs.geometry, GivenVolumeFlow(q), inputs.air, inputs.bypass, inputs.options
    )
    return {
        "volume_flow": q,
        "pressure_drop": np.asarray(flows.pressure_drop, float),
        "sink_volume_flow": np.asarray(flows.sink_volume_flow, float),
    }


def fan_pressure(inputs: SinkInputs, volume_flow) -> dict[str, np.ndarray]:
    """Fan static pressure over a range of flows, as rated and at the inlet air density.

    Parameters
    ----------
    inputs : SinkInputs
        A fan-driven case's inputs. [-]
    volume_flow : array_like
        Volume flows through the fan(s), >= 0. [m³ s⁻¹]

    Returns
    -------
    dict
        ``volume_flow`` [m³ s⁻¹], ``rated`` pressure at the rating density [Pa], ``at_inlet``
        pressure at the inlet air density times ``options.fan_pressure_factor`` [Pa],
        ``rating_density`` and ``inlet_density`` [kg m⁻³], ``free_delivery`` [m³ s⁻¹].
    """
    from finkit.physics.properties.air import air_properties

    if not isinstance(inputs.flow, FanDriven):
        raise InputError("air.flow: only a fan-driven case has a fan curve")
    fan = inputs.flow.fan
    q = np.asarray(volume_flow, float)
    rho = float(
        np.asarray(air_properties(inputs.air.inlet_temperature, inputs.air.pressure).density)
    )
    return {
        "volume_flow": q,
        "rated": np.asarray(fan.pressure(q), float),
        "at_inlet": np.asarray(fan.pressure(q, density=rho), float)
        * np.asarray(inputs.options.fan_pressure_factor, float),
        "rating_density": float(fan.rating_density),
        "inlet_density": rho,
        "free_delivery": float(fan.free_delivery),
    }


def note_sweep(inputs: SinkInputs, name: str, values) -> dict[str, np.ndarray]:
    """:func:`sweep` for a plotted range: points the model cannot solve are left out (NaN).

    The ends of a plotted range can leave the air-property range at a hot condition (a very
    low flow at the stated power heats the air past 500 K). The whole range is solved in one
    call first; only if that fails is it split in halves, each solved in one call and split
    again where it fails, down to single points, so that the points that fail are NaN (a gap
    in the curve) instead of losing the figure, at the cost of a few calls rather than one per
    point. If every point fails, the error of the first is raised.

    Parameters
    ----------
    inputs : SinkInputs
        The design at the plotted condition. [-]
    name : str
        The swept quantity, one of :data:`SWEEPABLE`. [-]
    values : array_like
        Values of the swept quantity in SI, as for :func:`sweep`. [SI]
    """
    values = np.asarray(values, float)
    try:
        return sweep(inputs, name, values)
    except PropertyRangeError:
        flat = values.ravel()
        rows: list[dict[str, np.ndarray] | None] = [None] * flat.size
        errors: list[PropertyRangeError] = []

        def solve_part(lo: int, hi: int, known_bad: bool = False) -> None:
            if not known_bad:
                try:
                    part = sweep(inputs, name, flat[lo:hi])
                except PropertyRangeError as exc:
                    if hi - lo == 1:
                        errors.append(exc)
                        return
                else:
                    for i in range(lo, hi):
                        rows[i] = {k: np.ravel(v)[i - lo] for k, v in part.items()}
                    return
            mid = (lo + hi) // 2
            solve_part(lo, mid)
            solve_part(mid, hi)

        solve_part(0, flat.size, known_bad=True)
        solved = [r for r in rows if r is not None]
        if not solved:
            raise errors[0] from None
        out = {
            key: np.array([np.nan if r is None else float(r[key]) for r in rows]).reshape(
                values.shape
            )
            for key in solved[0]
        }
        out["values"] = values
        return out


def single_fin_profiles(case, points: int = 101) -> dict[str, Any]:
    """Temperature along a single fin for each study material and each study h.

    Uniform profiles only (rectangular, pin), with the case's tip condition: the excess
    temperature of Incropera et al. Table 3.4 (:func:`finkit.physics.fins.analytic.
    uniform_fin_temperature_difference`). One curve per material at the case's h, one per h
    with the case's material.

    Parameters
    ----------
    case : finkit.case.SingleFinCase
        A validated single-fin case. [-]
    points : int, optional
        Points from base to tip. [-]

    Returns
    -------
    dict
        ``x`` [m]; ``ambient_temperature`` and ``base_temperature`` [K]; ``by_material``: list
        of ``{"material", "thermal_conductivity", "temperature"}``; ``by_coefficient``: list of
        ``{"heat_transfer_coefficient", "temperature"}`` (temperatures [K] over ``x``). Empty
        lists for a non-uniform profile.
    """
    from finkit.physics.fins import analytic as fa
    from finkit.physics.single_fin import UNIFORM_PROFILES, _section

    fin, cond = case.fin, case.conditions
    t_inf = cond.ambient_temperature
    theta_b = cond.base_temperature - t_inf
    out: dict[str, Any] = {
        "x": np.array([]),
        "ambient_temperature": t_inf,
        "base_temperature": cond.base_temperature,
        "by_material": [],
        "by_coefficient": [],
    }
    if fin.profile not in UNIFORM_PROFILES:
        return out
    user = case.user_materials() or None
    section = _section(fin)
    x = np.linspace(0.0, fin.length, int(points))
    theta_l = fin.tip_temperature - t_inf if fin.tip_temperature is not None else 0.0

    def profile(k, h):
        theta = fa.uniform_fin_temperature_difference(
            x,
            fin.length,
            section.perimeter,
            section.cross_section_area,
            k,
            h,
            theta_b,
            tip=fin.tip,
            tip_temperature_difference=theta_l,
        )
        return t_inf + np.asarray(theta, float)

    study = case.study
    keys = list(dict.fromkeys([fin.material] + (list(study.materials) if study else [])))
    hs = list(
        dict.fromkeys(
            [cond.heat_transfer_coefficient]
            + (list(study.heat_transfer_coefficients) if study else [])
        )
    )
    k_case = get_material(fin.material, user).thermal_conductivity
    for key in keys:
        k = get_material(key, user).thermal_conductivity
        out["by_material"].append(
            {
                "material": key,
                "thermal_conductivity": k,
                "temperature": profile(k, cond.heat_transfer_coefficient),
            }
        )
    for h in sorted(hs):
        out["by_coefficient"].append(
            {"heat_transfer_coefficient": h, "temperature": profile(k_case, h)}
        )
    out["x"] = x
    return out


def volume_flow_for_power(inputs: SinkInputs, points: int = 33) -> float | None:
    """Smallest total volume flow at which the allowable power reaches the stated power.

    The allowable power (limit node at the limit less the required margin) is evaluated on a
    logarithmic grid of total volume flows from 1/20 to 20 times the case's operating flow, with
    the case's bypass (33 points: steps of about 21 %); in the first grid interval where it
    reaches the stated power, the crossing is solved to 0.1 % of the flow (Chandrupatla's
    bracketed method, :func:`finkit.physics.airflow.bracketed_root`, on the logarithm of the flow).
    A
    crossing narrower than one grid step could be missed; the flow returned is then larger than
    the least one, which errs on the safe side for a required flow.
    Forced convection only.

    Parameters
    ----------
    inputs : SinkInputs
        A forced-convection case's inputs. [-]
    points : int, optional
        Points of the coarse grid. [-]

    Returns
    -------
    float or None
        Volume flow [m³ s⁻¹]; None when no flow in that range carries the stated power.
    """
    if isinstance(inputs.flow, NaturalConvection):
        raise InputError("air.flow: natural convection has no volume flow to size")
    q0 = float(np.asarray(solve(inputs).volume_flow))
    grid = np.geomspace(q0 / 20.0, q0 * 20.0, int(points))
    power = np.asarray(note_sweep(inputs, "airflow", grid)["allowable_power"], float)
    target = float(np.asarray(inputs.source.power))
    above = np.nonzero(power >= target)[0]
    if above.size == 0:
        return None
    i = int(above[0])
    if i == 0:
        return float(grid[0])
    from finkit.physics.airflow.roots import bracketed_root

    def short(log_q: np.ndarray) -> np.ndarray:
        q = np.exp(np.atleast_1d(log_q))
        power = np.asarray(note_sweep(inputs, "airflow", q)["allowable_power"], float)
        return (power - target).reshape(np.shape(log_q))

    if not (np.isfinite(power[i - 1]) and power[i - 1] < target):
        return float(grid[i])
    found = bracketed_root(
        short,
        np.log(grid[i - 1]),
        np.log(grid[i]),
        lower_value=power[i - 1] - target,
        upper_value=power[i] - target,
        xatol=1e-3,
    )
    return float(np.exp(found.x))
