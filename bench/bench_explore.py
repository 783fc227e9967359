"""Benchmark: design exploration -- trade-study designs per second, Monte Carlo samples per
second, and the optimisers' wall time.

Cases are invented for the benchmark (a 70 x 60 mm plate-fin base on a 40 W source):

* trade study: 10^5 plate-fin designs (fin count x height x thickness) in one vectorised call,
  with a given volume flow, with a fan, and with a fan plus bypass clearance (the nested
  fan/bypass root is the most expensive airflow); temperatures only, then with the allowable
  power as well;
* Monte Carlo: 10^5 samples of six input tolerances (the inlet temperature among them, so with
  a fan every sample has its own operating point), with a given flow, a fan, and a fan with
  bypass;
* optimisers: coolest design and lightest design meeting the limit, fan case.

Targets (the design-exploration issue): >= 10^5 designs in one call; 10^5 Monte Carlo samples
in about a second.

Run: .venv/bin/python bench/bench_explore.py
"""

from __future__ import annotations

import time
from dataclasses import replace

import numpy as np

from finkit.case.bounds import Envelope, ManufacturingBounds
from finkit.constants import ZERO_CELSIUS
from finkit.model import SinkInputs
from finkit.model.trade import (
    minimise_junction_temperature,
    minimise_mass_meeting_limit,
    plate_fin_grid,
)
from finkit.model.uncertainty import Tolerance, monte_carlo, sensitivity
from finkit.physics.airflow import FanCurve
from finkit.physics.geometry import PlateFinSink
from finkit.physics.sink import Air, Bypass, FanDriven, GivenVolumeFlow, HeatSource, SinkMaterial

REPEATS = 2
FAN = FanCurve(
    volume_flow=np.array([0.0, 2.5, 5.0, 7.5, 10.0]) * 1e-3,
    static_pressure=np.array([90.0, 78.0, 60.0, 34.0, 0.0]),
    rating_density=1.2,
)
FAN_CASE = SinkInputs(
    geometry=PlateFinSink(0.07, 0.06, 0.004, 12, 0.0012, 0.025),
    material=SinkMaterial(thermal_conductivity=200.0, emissivity=0.0, density=2700.0),
    source=HeatSource(40.0, 0.025, 0.025, 0.3, 0.04),
    air=Air(ZERO_CELSIUS + 40.0, 101325.0),
    flow=FanDriven(FAN),
    bypass=None,
    limit_node="junction",
    limit_temperature=ZERO_CELSIUS + 100.0,
    required_margin=5.0,
)
CASES = {
    "given flow": replace(FAN_CASE, flow=GivenVolumeFlow(5e-3)),
    "fan": FAN_CASE,
    "fan + bypass": replace(FAN_CASE, bypass=Bypass(side_gap=0.003, top_gap=0.002)),
}
TOLERANCES = {
    "heat_transfer": Tolerance("normal", relative=0.2, sigmas=2),
    "power": Tolerance("normal", relative=0.05),
    "interface_resistance": Tolerance("uniform", low=0.02, high=0.06),
    "junction_to_case": Tolerance("triangular", relative=0.2),
    "inlet_temperature": Tolerance("normal", absolute=2.0),
    "thermal_conductivity": Tolerance("uniform", relative=0.05),
}


def best_time(fun, repeats=REPEATS):
    best, out = np.inf, None
    for _ in range(repeats):
        start = time.perf_counter()
        out = fun()
        best = min(best, time.perf_counter() - start)
    return best, out


def main() -> int:
    envelope = Envelope(0.07, 0.06, 0.004, 0.045)
    bounds = ManufacturingBounds(min_fin_gap=1e-3, min_fin_thickness=0.5e-3)
    counts = np.arange(4, 29)  # 25
    heights = np.linspace(0.008, 0.040, 80)
    thicknesses = np.linspace(0.5e-3, 3e-3, 50)
    designs = counts.size * heights.size * thicknesses.size  # 100 000

    print(f"trade study: {designs} plate-fin designs in one vectorised call")
    print(
        f"  {'airflow':<14}{'solved':>9}{'T only [s]':>12}{'designs/s':>12}"
        f"{'+ allowable [s]':>17}{'designs/s':>12}"
    )
    for name, case in CASES.items():
        plate_fin_grid(case, [10], [0.02], [1e-3], bounds, envelope)  # warm-up
        t1, study = best_time(
            lambda case=case: plate_fin_grid(
                case, counts, heights, thicknesses, bounds, envelope, with_allowable=False
            ),
            repeats=1,
        )
        t2, _ = best_time(
            lambda case=case: plate_fin_grid(case, counts, heights, thicknesses, bounds, envelope),
            repeats=1,
        )
        solved = int(study.is_feasible.sum())
        print(
            f"  {name:<14}{solved:>9}{t1:>12.2f}{designs / t1:>12.0f}"
            f"{t2:>17.2f}{designs / t2:>12.0f}"
        )
    start = time.perf_counter()
    front = study.pareto()
    print(
        f"  Pareto front (R_sink, dp, mass) of {solved} designs: {front.size} designs "
        f"in {time.perf_counter() - start:.3f} s"
    )

    samples = 100_000
    print(f"\nMonte Carlo: {samples} samples, {len(TOLERANCES)} toleranced inputs")
    print(f"  {'case':<32}{'time [s]':>10}{'samples/s':>12}{'P95 T_j [degC]':>16}")
    runs = {
        "given flow": (CASES["given flow"], TOLERANCES),
        "fan": (CASES["fan"], TOLERANCES),
        "fan, fan pressure +/-10 %": (
            CASES["fan"],
            TOLERANCES | {"fan_pressure": Tolerance("uniform", relative=0.1)},
        ),
        "fan + bypass, fan pressure +/-10 %": (
            CASES["fan + bypass"],
            TOLERANCES | {"fan_pressure": Tolerance("uniform", relative=0.1)},
        ),
    }
    for name, (case, tol) in runs.items():
        monte_carlo(case, tol, samples=100)  # warm-up
        t, result = best_time(lambda case=case, tol=tol: monte_carlo(case, tol, samples, seed=1))
        p95 = result.percentiles()[95.0] - ZERO_CELSIUS
        print(f"  {name:<32}{t:>10.2f}{samples / t:>12.0f}{p95:>16.2f}")
    t, tornado = best_time(lambda: sensitivity(CASES["fan"], TOLERANCES))
    print(f"  tornado ({len(tornado.bars)} inputs, one call): {t:.3f} s")

    print("\noptimisers (fan case; fan + bypass case)")
    for name in ("fan", "fan + bypass"):
        case = CASES[name]
        t1, cool = best_time(
            lambda case=case: minimise_junction_temperature(case, bounds, envelope), repeats=1
        )
        t2, light = best_time(
            lambda case=case: minimise_mass_meeting_limit(case, bounds, envelope), repeats=1
        )
        print(
            f"  {name:<14} coolest : {t1:6.2f} s, {cool.evaluations:6d} designs, "
            f"N={cool.fin_count}, t={cool.fin_thickness * 1e3:.2f} mm, "
            f"H={cool.fin_height * 1e3:.1f} mm, "
            f"T_j={cool.junction_temperature - ZERO_CELSIUS:.2f} degC"
        )
        print(
            f"  {name:<14} lightest: {t2:6.2f} s, {light.evaluations:6d} designs, "
            f"N={light.fin_count}, t={light.fin_thickness * 1e3:.2f} mm, "
            f"H={light.fin_height * 1e3:.1f} mm, mass={light.mass * 1e3:.1f} g"
        )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
