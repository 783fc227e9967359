"""Benchmark: fan operating point for 10^5 designs, vectorised vs a Python loop with brentq.

Each design has its own system curve dp = a Q + b Q² (random a, b). The loop solves a subset
with scipy.optimize.brentq one design at a time and is extrapolated to the full batch; both
run in this process, so the ratio is measured, not assumed. Then the nested bypass case
(fins plus clearance gaps, per-design gap area) is timed vectorised.

Targets (the airflow task): >= 1e5 designs/s vectorised, >= 50x the loop.

Run: .venv/bin/python bench/bench_airflow.py
"""

from __future__ import annotations

import time

import numpy as np
from scipy.optimize import brentq

from finkit.physics.airflow import FanCurve, bypass_gap_pressure_drop, operating_point_with_bypass
from finkit.physics.airflow import operating_point as solve_operating_point

DESIGNS = 100_000
LOOP_DESIGNS = 2_000
NESTED_LOOP_DESIGNS = 200
REPEATS = 3
# an invented axial-fan table, 40 mm class: static pressure [Pa] against flow [m³/s]
FAN = FanCurve(
    [0.0, 0.0015, 0.003, 0.0045, 0.006, 0.0075, 0.009, 0.0105, 0.012],
    [95.0, 82.0, 66.0, 58.0, 54.0, 45.0, 31.0, 16.0, 0.0],
    name="bench fan",
)
DENSITY, VISCOSITY = 1.16, 1.86e-5  # air near 30 °C [kg/m³], [Pa s]


def main() -> int:
    rng = np.random.default_rng(2024)
    a = rng.uniform(500.0, 8000.0, DESIGNS)  # laminar-like part [Pa s/m³]
    b = rng.uniform(1.0e5, 3.0e6, DESIGNS)  # turbulent-like part [Pa s²/m⁶]

    def system(q):
        return a * q + b * q * q

    solve_operating_point(FAN, system)  # warm-up (imports, caches)
    # best of REPEATS for both ways, so that a busy machine hurts neither side more
    vector_time = np.inf
    for _ in range(REPEATS):
        start = time.perf_counter()
        point = solve_operating_point(FAN, system)
        vector_time = min(vector_time, time.perf_counter() - start)
    vector_rate = DESIGNS / vector_time

    loop_time = np.inf
    loop_flow = np.empty(LOOP_DESIGNS)
    for _ in range(REPEATS):
        start = time.perf_counter()
        for i in range(LOOP_DESIGNS):
            ai, bi = a[i], b[i]
            loop_flow[i] = brentq(
                lambda q, ai=ai, bi=bi: float(FAN.pressure(q)) - ai * q - bi * q * q,
                0.0,
                FAN.free_delivery,
                xtol=1e-15,
                rtol=1e-12,
            )
        loop_time = min(loop_time, time.perf_counter() - start)
    loop_rate = LOOP_DESIGNS / loop_time

    agree = np.max(np.abs(point.volume_flow[:LOOP_DESIGNS] / loop_flow - 1.0))
    print(f"operating point, {DESIGNS} designs")
    print(f"  vectorised       : {vector_time:8.3f} s  {vector_rate:12.0f} designs/s")
    print(
        f"  loop with brentq : {loop_time:8.3f} s for {LOOP_DESIGNS} "
        f"(~{DESIGNS / loop_rate:.1f} s for all)  {loop_rate:12.0f} designs/s"
    )
    print(f"  ratio            : {vector_rate / loop_rate:8.1f} x")
    print(f"  converged        : {int(np.sum(point.is_converged))} of {DESIGNS}")
    print(f"  max |vectorised/brentq - 1| over the loop subset: {agree:.2e}")

    gap_area = rng.uniform(2.0e-5, 6.0e-4, DESIGNS)  # [m²]

    def sink(q):
        return system(q)

    def gaps(q):
        return bypass_gap_pressure_drop(q, gap_area, 0.004, 0.05, DENSITY, VISCOSITY)

    start = time.perf_counter()
    nested = operating_point_with_bypass(FAN, sink, gaps, density=DENSITY)
    nested_time = time.perf_counter() - start
    share = nested.bypass_volume_flow / nested.volume_flow

    start = time.perf_counter()
    nested_loop = np.empty(NESTED_LOOP_DESIGNS)
    for i in range(NESTED_LOOP_DESIGNS):
        ai, bi, area_i = a[i], b[i], gap_area[i]

        def gap_i(q, area_i=area_i):
            return float(bypass_gap_pressure_drop(q, area_i, 0.004, 0.05, DENSITY, VISCOSITY))

        def branch_dp(q_total, ai=ai, bi=bi, gap_i=gap_i):
            if q_total == 0.0:
                return 0.0
            q_sink = brentq(
                lambda x: ai * x + bi * x * x - gap_i(q_total - x), 0.0, q_total, xtol=1e-16
            )
            return ai * q_sink + bi * q_sink * q_sink

        nested_loop[i] = brentq(
            lambda q, branch_dp=branch_dp: float(FAN.pressure(q, DENSITY)) - branch_dp(q),
            0.0,
            FAN.free_delivery,
            xtol=1e-15,
            rtol=1e-12,
        )
    nested_loop_rate = NESTED_LOOP_DESIGNS / (time.perf_counter() - start)
    nested_rate = DESIGNS / nested_time
    nested_agree = np.max(np.abs(nested.volume_flow[:NESTED_LOOP_DESIGNS] / nested_loop - 1.0))
    print(f"operating point with bypass (nested), {DESIGNS} designs")
    print(f"  vectorised       : {nested_time:8.3f} s  {nested_rate:12.0f} designs/s")
    print(
        f"  nested brentq loop over {NESTED_LOOP_DESIGNS} designs: "
        f"{nested_loop_rate:12.0f} designs/s; ratio {nested_rate / nested_loop_rate:.1f} x"
    )
    print(f"  max |vectorised/brentq - 1| over the loop subset: {nested_agree:.2e}")
    print(f"  converged        : {int(np.sum(nested.is_converged))} of {DESIGNS}")
    print(f"  bypass share     : {share.min():.2f} to {share.max():.2f} of the fan flow")

    targets = vector_rate >= 1e5 and vector_rate / loop_rate >= 50
    print(f"targets (>= 1e5 designs/s, >= 50x loop): {'met' if targets else 'NOT met'}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
