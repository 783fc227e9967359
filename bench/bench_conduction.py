"""Benchmark: finite-volume conduction solve time against mesh size (finkit.physics.conduction).

One plate-fin design (100 x 100 x 5 mm aluminium base, 15 fins 1.5 x 30 mm, h = 40 W/m²K,
30 x 30 mm source) is solved on nested meshes from about 6e2 solid cells upwards (one quarter
of the sink is solved, by symmetry). Each mesh is solved with the direct solver (SuperLU) up to
``--max-direct`` cells and with Jacobi-preconditioned CG from ``--min-cg`` cells, so the
crossover is visible; the table shows the level-1 cell size, level, cells, solver, wall time
(meshing, assembly and solve), the source-mean resistance and the energy-balance residual.
Times are those of this machine in this run.

By default the largest mesh is 3.2e5 cells (about 2 minutes in all); ``--max-cells 1e6`` adds
5.1e5 and 7.7e5 cells (CG only; 146 s for the largest on a shared 2-core machine; CG memory
grows in proportion to the cells, 7 matrix entries per row). The direct solver's fill grows
faster than the cell count: about 1 s at 4e4 cells, 6 s at 1e5 and 20 s at 1.9e5 were measured
here.

Run: .venv/bin/python bench/bench_conduction.py [--max-cells 1e6] [--max-direct 2.5e5]
[--min-cg 4e4]
"""

from __future__ import annotations

import argparse
import sys

import finkit.physics.conduction as conduction
from finkit.physics.conduction import mesh as conduction_mesh

DESIGN = dict(
    base_width=0.1,
    base_length=0.1,
    base_thickness=0.005,
    fin_count=15,
    fin_thickness=0.0015,
    fin_height=0.03,
    thermal_conductivity=200.0,
    heat_transfer_coefficient=40.0,
    source_length=0.03,
    source_width=0.03,
)
# (level-1 cell size [m], refinement level): about 6e2, 1.5e3, 1.2e4, 4e4, 9.6e4, 1.9e5,
# 3.2e5, 5.1e5, 7.7e5 and 1.5e6 solid cells in the quarter
MESHES = [(0.01, 1), (0.005, 1), (0.005, 2), (0.005, 3), (0.005, 4), (0.005, 5), (0.005, 6),
          (0.005, 7), (0.005, 8), (0.005, 10)]  # fmt: skip
WIDTHS = (7, 5, 9, 7, 9, 10, 9)


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--max-cells", type=float, default=3.5e5)
    parser.add_argument("--max-direct", type=float, default=2.5e5)
    parser.add_argument("--min-cg", type=float, default=1.5e5)
    args = parser.parse_args(argv)

    header = ("h0 [mm]", "level", "cells", "solver", "time [s]", "R [K/W]", "balance")
    print(" ".join(f"{h:>{w}}" for h, w in zip(header, WIDTHS, strict=True)))
    rows = []
    design = conduction_mesh._design(
        **DESIGN, base_heat_transfer_coefficient=None, base_thermal_conductivity=None
    )
    for cell_size, level in MESHES:
        mesh = conduction_mesh._mesh(design, cell_size, level)  # cell count before solving
        nz = mesh.ze.size - 1
        fin_cells = mesh.fin_x.sum() * (nz - mesh.nzb) + mesh.fin_x.size * mesh.nzb
        cells = int(fin_cells * (mesh.ye.size - 1))
        if cells > args.max_cells:
            break
        solvers = []
        if cells <= args.max_direct:
            solvers.append("direct")
        if cells >= args.min_cg:
            solvers.append("cg")
        for solver in solvers:
            s = conduction.solve_plate_fin_conduction(
                **DESIGN,
                power=1.0,
                air_temperature=300.0,
                mesh_cell_size=cell_size,
                mesh_refinement=level,
                solver=solver,
            )
            rows.append((s.cell_count, solver, s.solve_time))
            print(
                f"{1e3 * cell_size:>7.1f} {level:>5} {s.cell_count:>9d} {solver:>7} "
                f"{s.solve_time:>9.3f} {s.thermal_resistance_source_mean:>10.5f} "
                f"{s.heat_rate_balance:>9.1e}",
                flush=True,
            )
    if len(rows) >= 2:
        (c0, _, t0), (c1, _, t1) = rows[0], rows[-1]
        print(f"largest/smallest mesh: {c1 / c0:.0f}x the cells, {t1 / t0:.0f}x the time")
    return 0


if __name__ == "__main__":
    sys.exit(main())
