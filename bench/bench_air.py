"""Benchmark: tabulated air properties versus direct CoolProp calls.

Evaluates ``air_properties`` at 10^6 random (T, p) states in the table range and the same kind
of states by direct CoolProp calls on a subset, extrapolated to 10^6 states. Prints states per
second and the speed ratios (measured in this run).

    .venv/bin/python bench/bench_air.py
"""

from __future__ import annotations

import time

import numpy as np
from CoolProp.CoolProp import PropsSI

from finkit.physics.properties.air import (
    AIR_TABLE_PRESSURE_RANGE,
    AIR_TABLE_TEMPERATURE_RANGE,
    air_properties,
    air_properties_coolprop,
)

N_POINTS = 10**6
N_VECTOR_SUBSET = 20_000  # direct CoolProp with array inputs (C++ loop)
N_SCALAR_SUBSET = 500  # direct CoolProp, one PropsSI call per state and property


def _best_of(repeats, func):
    best = np.inf
    for _ in range(repeats):
        start = time.perf_counter()
        func()
        best = min(best, time.perf_counter() - start)
    return best


def main() -> None:
    rng = np.random.default_rng(1)
    temperature = rng.uniform(*AIR_TABLE_TEMPERATURE_RANGE, N_POINTS)
    pressure = rng.uniform(*AIR_TABLE_PRESSURE_RANGE, N_POINTS)

    start = time.perf_counter()
    air_properties(300.0)  # first call: reads the shipped table and fits the interpolant
    setup = time.perf_counter() - start

    table = _best_of(3, lambda: air_properties(temperature, pressure))

    t_sub, p_sub = temperature[:N_VECTOR_SUBSET], pressure[:N_VECTOR_SUBSET]
    vector = _best_of(2, lambda: air_properties_coolprop(t_sub, p_sub))
    vector_full = vector * N_POINTS / N_VECTOR_SUBSET

    def scalar_loop():
        for t, p in zip(temperature[:N_SCALAR_SUBSET], pressure[:N_SCALAR_SUBSET], strict=True):
            for key in ("D", "V", "L", "C"):
                PropsSI(key, "T", float(t), "P", float(p), "Air")

    scalar = _best_of(1, scalar_loop)
    scalar_full = scalar * N_POINTS / N_SCALAR_SUBSET

    print(f"air_properties: first-call setup {setup * 1e3:.0f} ms")
    print(
        f"air_properties (table):         {N_POINTS:.0e} states in {table:.3f} s "
        f"-> {N_POINTS / table:.3g} states/s"
    )
    print(
        f"CoolProp PropsSI, array inputs: {N_VECTOR_SUBSET} states in {vector:.3f} s "
        f"-> {N_POINTS / vector_full:.3g} states/s (extrapolated {vector_full:.1f} s for 1e6)"
    )
    print(
        f"CoolProp PropsSI, scalar calls: {N_SCALAR_SUBSET} states in {scalar:.3f} s "
        f"-> {N_POINTS / scalar_full:.3g} states/s (extrapolated {scalar_full:.0f} s for 1e6)"
    )
    print(f"ratio table / CoolProp arrays:  {vector_full / table:.0f}x faster")
    print(f"ratio table / CoolProp scalars: {scalar_full / table:.0f}x faster")


if __name__ == "__main__":
    main()
