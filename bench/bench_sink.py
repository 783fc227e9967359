"""Benchmark: 10^5 plate-fin designs against a fan curve, vectorised vs a Python loop.

Each design (random fin count, height and thickness on one base) is solved for its fan
operating point, sink resistance and allowable power. The vectorised path is one call of
``finkit.physics.sink.solve_allowable_power`` for all designs. The loop, as a user would write it,
takes one design at a time: ``scipy.optimize.brentq`` on fan pressure minus the sink's pressure
drop for the operating point, then the chain for that single design. Both run in this process
on the same designs, so the ratio is measured, not assumed; the loop covers a subset and is
extrapolated.

Targets (heat-sink issue): >= 1e5 designs/s for the sweep, >= 50x over the loop.

Run: .venv/bin/python bench/bench_sink.py
"""

from __future__ import annotations

import time

import numpy as np
from scipy.optimize import brentq

from finkit.constants import CUBIC_FOOT_PER_MINUTE as CFM
from finkit.constants import ZERO_CELSIUS
from finkit.physics.airflow import FanCurve
from finkit.physics.geometry import PlateFinSink
from finkit.physics.properties.air import air_properties
from finkit.physics.sink import (
    Air,
    FanDriven,
    GivenVolumeFlow,
    HeatSource,
    SinkMaterial,
    sink_pressure_drop,
    solve_allowable_power,
)

DESIGNS = 100_000
LOOP_DESIGNS = 300
REPEATS = 3
# an invented 60 mm-class fan: static pressure [Pa] against flow [m³/s]
FAN = FanCurve(
    np.array([0.0, 5.0, 10.0, 15.0, 20.0]) * CFM,
    np.array([0.30, 0.26, 0.19, 0.10, 0.0]) * 249.0889,
)
MATERIAL = SinkMaterial(thermal_conductivity=200.0, emissivity=0.85, density=2700.0)
SOURCE = HeatSource(45.0, 0.025, 0.025, 0.35, 0.05)
AIR = Air(inlet_temperature=ZERO_CELSIUS + 45.0, pressure=101325.0)
LIMIT = ZERO_CELSIUS + 105.0


def designs(n, rng):
    return PlateFinSink(
        base_width=0.08,
        base_length=0.06,
        base_thickness=0.005,
        fin_count=rng.integers(6, 26, n).astype(float),
        fin_thickness=rng.uniform(0.0008, 0.002, n),
        fin_height=rng.uniform(0.015, 0.045, n),
    )


def loop(geometry, count):
    inlet = air_properties(AIR.inlet_temperature, AIR.pressure)
    power = np.empty(count)
    for i in range(count):
        one = PlateFinSink(
            0.08,
            0.06,
            0.005,
            float(geometry.fin_count[i]),
            float(geometry.fin_thickness[i]),
            float(geometry.fin_height[i]),
        )

        def residual(q, one=one):
            dp = sink_pressure_drop(one, q, inlet.density, inlet.dynamic_viscosity)
            return float(FAN.pressure(q, inlet.density)) - float(dp)

        q = brentq(residual, 0.0, FAN.free_delivery * (1 - 1e-12), xtol=1e-12)
        sol = solve_allowable_power(
            one, MATERIAL, SOURCE, AIR, GivenVolumeFlow(q), "junction", LIMIT
        )
        power[i] = float(sol.power)
    return power


def main() -> int:
    rng = np.random.default_rng(7)
    geometry = designs(DESIGNS, rng)
    solve_allowable_power(geometry, MATERIAL, SOURCE, AIR, FanDriven(FAN), "junction", LIMIT)
    vector_time = np.inf
    for _ in range(REPEATS):
        start = time.perf_counter()
        sol = solve_allowable_power(
            geometry, MATERIAL, SOURCE, AIR, FanDriven(FAN), "junction", LIMIT
        )
        vector_time = min(vector_time, time.perf_counter() - start)
    loop_time = np.inf
    for _ in range(REPEATS):
        start = time.perf_counter()
        loop_power = loop(geometry, LOOP_DESIGNS)
        loop_time = min(loop_time, time.perf_counter() - start)
    vector_rate = DESIGNS / vector_time
    loop_rate = LOOP_DESIGNS / loop_time
    agree = np.max(np.abs(sol.power[:LOOP_DESIGNS] / loop_power - 1.0))
    print(f"plate-fin sweep against a fan curve, {DESIGNS} designs")
    print("  (operating point, sink resistance, allowable power at a junction limit)")
    print(f"  vectorised       : {vector_time:8.3f} s  {vector_rate:12.0f} designs/s")
    print(
        f"  loop with brentq : {loop_time:8.3f} s for {LOOP_DESIGNS} "
        f"(~{DESIGNS / loop_rate:.0f} s for all)  {loop_rate:12.0f} designs/s"
    )
    print(f"  ratio            : {vector_rate / loop_rate:8.1f} x")
    print(f"  max |vectorised/loop - 1| of allowable power: {agree:.1e}")
    met = vector_rate >= 1e5 and vector_rate / loop_rate >= 50
    print(f"targets (>= 1e5 designs/s, >= 50x loop): {'met' if met else 'NOT met'}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
