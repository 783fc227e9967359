"""Throughput of the single-fin functions (run: ``python bench/bench_fins.py``).

Measures, in one run:
* the vectorised uniform fin (``uniform_fin``: heat rate, efficiency and the other outputs) and
  the exact annular-fin efficiency over 10^6 points;
* the same functions called one point at a time in a Python loop over 2x10^4 points
  (extrapolated to a rate) and the ratio;
* the numerical fin solver (``solve_fin``), mean time per fin over 20 fins.
Targets: >= 1e7 uniform fins/s, >= 2e6 annular fins/s, >= 25x over the loop.
"""

from __future__ import annotations

import time

import numpy as np

from finkit.physics.fins import annular_fin_efficiency, solve_fin, uniform_fin

N_VECTOR = 1_000_000
N_LOOP = 20_000
REPEAT = 5


def best_time(fn, repeat=REPEAT):
    best = np.inf
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def main() -> int:
    rng = np.random.default_rng(2024)
    length = rng.uniform(0.005, 0.05, N_VECTOR)
    thickness = rng.uniform(5e-4, 3e-3, N_VECTOR)
    width = 0.05
    perimeter = 2.0 * (width + thickness)
    area = width * thickness
    k = rng.uniform(15.0, 400.0, N_VECTOR)
    h = rng.uniform(5.0, 150.0, N_VECTOR)
    r1 = rng.uniform(0.003, 0.02, N_VECTOR)
    r2 = r1 + length

    def uniform_vec():
        return uniform_fin(length, perimeter, area, k, h, 40.0)

    def annular_vec():
        return annular_fin_efficiency(r1, r2, thickness, k, h)

    def uniform_loop():
        for i in range(N_LOOP):
            uniform_fin(length[i], perimeter[i], area[i], k[i], h[i], 40.0)

    def annular_loop():
        for i in range(N_LOOP):
            annular_fin_efficiency(r1[i], r2[i], thickness[i], k[i], h[i])

    # the loop results must equal the vectorised ones (same formulas)
    sub = slice(0, 50)
    vec = uniform_fin(length[sub], perimeter[sub], area[sub], k[sub], h[sub], 40.0)
    one = [
        float(uniform_fin(length[i], perimeter[i], area[i], k[i], h[i], 40.0).heat_rate)
        for i in range(50)
    ]
    assert np.allclose(vec.heat_rate, one, rtol=1e-14)

    rows = []
    for name, vec_fn, loop_fn in (
        ("uniform fin (all outputs)", uniform_vec, uniform_loop),
        ("annular fin efficiency", annular_vec, annular_loop),
    ):
        t_vec = best_time(vec_fn)
        t_loop = best_time(loop_fn, repeat=1)
        rate_vec = N_VECTOR / t_vec
        rate_loop = N_LOOP / t_loop
        rows.append((name, rate_vec, rate_loop, rate_vec / rate_loop))

    # numerical solver: 20 different fins (convective tip, natural-convection h and radiation)
    fins = [
        (rng.uniform(0.01, 0.06), rng.uniform(1e-3, 6e-3), rng.uniform(20.0, 400.0))
        for _ in range(20)
    ]
    t0 = time.perf_counter()
    for fin_length, diameter, cond in fins:
        solve_fin(
            fin_length,
            np.pi * diameter,
            np.pi * diameter**2 / 4,
            cond,
            360.0,
            298.15,
            lambda th: 1.4 * np.abs(th) ** 0.25 + 1.0,
            emissivity=0.85,
            tip="convective",
        )
    t_solver = (time.perf_counter() - t0) / len(fins)

    targets = {"uniform fin (all outputs)": 1e7, "annular fin efficiency": 2e6}
    print(f"{'function':<28}{'vector [1/s]':>14}{'loop [1/s]':>13}{'ratio':>9}  target")
    for name, rate_vec, rate_loop, ratio in rows:
        ok = rate_vec >= targets[name] and ratio >= 25.0
        print(
            f"{name:<28}{rate_vec:>14.3e}{rate_loop:>13.3e}{ratio:>8.0f}x  "
            f">= {targets[name]:.0e}/s, >= 25x: {'met' if ok else 'MISSED'}"
        )
    print(f"{'solve_fin (mean of 20)':<28}{t_solver * 1e3:>11.2f} ms per fin")
    print(f"vector: {N_VECTOR} points, best of {REPEAT}; loop: {N_LOOP} points, extrapolated")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
