"""Speed of the transient of the plate-fin demo (run: ``python bench/bench_transient.py``).

Measures, in one run:
* the import of ``finkit.model.transient`` in a fresh interpreter (the exact solution needs
  neither ``scipy.integrate`` nor ``scipy.optimize``);
* ``run_transient`` of the demo case nb200-plate-fan on its solved conditions (history, step
  response, Foster and Cauer ladders), best of 5;
* its history alone by the exact solution and by BDF (the previous integrator), and the Foster
  fit alone;
* ``finkit check`` of the case, median wall time of 5 runs.
Target: ``finkit check`` of the demo case in at most 1.0 s on a 2-core machine.
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import time
from pathlib import Path

import numpy as np
from bench_fins import best_time  # the bench folder is on the path of a script run from it

ROOT = Path(__file__).resolve().parents[1]
CASE = ROOT / "demo_cases" / "nb200-plate-fan.yaml"


def fresh(code: str) -> float:
    """Wall time of ``python -c code`` [s]."""
    t0 = time.perf_counter()
    subprocess.run([sys.executable, "-c", code], check=True, capture_output=True)
    return time.perf_counter() - t0


def main() -> int:
    from finkit.case import load_case
    from finkit.model.run import _scenario_table
    from finkit.model.transient import run_transient
    from finkit.physics import transient as tr

    case = load_case(CASE)
    table = _scenario_table(case)[3]
    result = run_transient(case, table)
    sol = result.solution
    baseline = fresh("import numpy, finkit.model")
    with_transient = fresh("import numpy, finkit.model, finkit.model.transient")
    print(f"import finkit.model.transient: {with_transient - baseline:+.3f} s over finkit.model")
    print(f"run_transient (demo): {best_time(lambda: run_transient(case, table)) * 1e3:.1f} ms")

    nets = _networks(case, table)  # the history alone, by each method
    initial = tr.steady_temperatures(nets[0], float(sol.power[0]))
    kwargs = {
        "switch_times": [case.transient.event.at],
        "initial_temperature": initial,
        "limit_node": result.limit_node,
        "limit_temperature": result.limit_temperature,
        "sample_times": sol.time[np.append(np.diff(sol.time) > 0, True)],
    }
    for method in ("exact", "BDF"):
        seconds = best_time(
            lambda m=method: tr.simulate_transient(
                nets, float(sol.power[-1]), case.transient.duration, method=m, **kwargs
            )
        )
        print(f"history, {method}: {seconds * 1e3:.1f} ms")
    seconds = best_time(lambda: tr.fit_foster(result.impedance, len(result.foster.resistance)))
    print(f"Foster fit ({len(result.foster.resistance)} pairs): {seconds * 1e3:.1f} ms")

    walls = []
    for _ in range(5):
        t0 = time.perf_counter()
        subprocess.run([Path(sys.executable).with_name("finkit"), "check", str(CASE)],
                       check=True, capture_output=True)  # fmt: skip
        walls.append(time.perf_counter() - t0)
    median = statistics.median(walls)
    print(f"finkit check {CASE.name}: median {median:.2f} s (target <= 1.0 s)")
    return 0


def _networks(case, table):
    """The demo's start and event networks, as run_transient builds them."""
    from finkit.physics.properties.materials import get_material
    from finkit.physics.transient import chain_network

    material = get_material(case.sink.material)
    caps = case.transient.heat_capacities
    rows = {row.name: row for row in table.rows}
    nets = []
    for name in (case.transient.start_condition, case.transient.event.condition):
        row = rows[name]
        nets.append(
            chain_network(
                row.solution,
                row.inputs.geometry,
                row.inputs.material.thermal_conductivity,
                material.density,
                material.specific_heat,
                junction_heat_capacity=caps.junction,
                case_heat_capacity=caps.case,
                spreader_heat_capacity=caps.spreader,
                fin_node_count=case.transient.fin_nodes,
            )  # fmt: skip
        )
    return nets


if __name__ == "__main__":
    raise SystemExit(main())
