"""Benchmark: the notes of 20 variants, by a plain papermill + nbconvert loop and by finkit batch.

Both ways run in this one process run, on the same variants and the same template:

1. the plain loop a user would write by hand: for each variant, ``papermill.execute_notebook``
   (a fresh kernel process each time) then nbconvert's ``HTMLExporter`` to an HTML file;
2. ``finkit.batch.run_batch`` (warm parent, one forked child per note with an in-process kernel,
   ``--jobs`` = the machine's cores), which also writes results.json, the overview and summaries;
3. ``run_batch`` again with nothing changed (every note reused).

It prints seconds per note for both ways and their ratio, the time of the unchanged re-run, and a
breakdown of the plain loop's cost per note taken from papermill's cell timings (kernel start,
shutdown and per-cell round trips are the part of the papermill wall time outside the cells).

The default template is a representative note template written by this script: it imports
numpy, scipy.optimize, pandas, matplotlib and finkit, runs the case (well under 0.1 s for the
core blocks of the demo case nb200-plate-fan, its optional study blocks left out), shows two
tables and draws four sweep figures (inline backend). ``--template PATH`` benchmarks another one,
e.g. ``templates/heat_sink_note.ipynb`` (use ``--variants 4``: that note costs far more to draw).

Run: ``.venv/bin/python bench/bench_batch.py [--variants 20] [--jobs N] [--template PATH]``.
Figures depend on the machine and its load; compare the ratios, measured in one run.
"""

from __future__ import annotations

import argparse
import os
import statistics
import sys
import tempfile
import time
from pathlib import Path

import nbformat
import yaml

ROOT = Path(__file__).resolve().parent.parent
DEMO_BASE = ROOT / "demo_cases" / "nb200-plate-fan.yaml"
CORE_BLOCKS = ("case_id", "kind", "title_block", "source", "sink", "air", "limit", "sweeps")
NOTE_TIME = "2025-06-02T08:00:00+02:00"

IMPORT_CELL = """\
import numpy as np
import pandas as pd
import scipy.optimize
import matplotlib.pyplot as plt

import finkit
from finkit.report import present
from finkit.case import load_case
from finkit.model import run_case, sweep"""

COMPUTE_CELL = """\
validated = load_case(case)
result = run_case(validated)
present.heading(f"{validated.case_id}: {result.status.upper()}", 2)"""

TABLE_CELLS = [
    """\
pd.DataFrame(
    [(name, value, finkit.model.RESULT_UNITS.get(name)) for name, value in result.results.items()],
    columns=["result", "value", "unit"],
)""",
    """present.key_value_table(validated.entered["source"], header=["source", "as entered"])""",
]

FIGURE_CELL = """\
data = sweep(result.inputs, {name!r}, {values})
fig, ax = plt.subplots(figsize=(6, 3.5))
ax.plot(data["values"] {shift}, data["junction_temperature"] - 273.15, color="black", marker=".")
ax.axhline(validated.limit.temperature - 273.15, color="red", linestyle="--", label="limit")
ax.set_xlabel({xlabel!r})
ax.set_ylabel("Junction temperature [°C]")
ax.grid(True, alpha=0.4)
ax.legend()"""

FIGURES = [
    ("inlet_temperature", "np.linspace(293.15, 338.15, 46)", "- 273.15", "Inlet air [°C]"),
    ("power", "np.linspace(10, 80, 36)", "", "Power [W]"),
    ("fin_count", "np.arange(6, 25)", "", "Fin count [-]"),
    ("altitude", "np.linspace(0, 4000, 41)", "", "Altitude [m]"),
]


def representative_template(path: Path, case: dict) -> Path:
    """Write the benchmark's representative note template."""
    nb = nbformat.v4.new_notebook()
    nb.metadata["kernelspec"] = {
        "name": "finkit",
        "display_name": "Python (finkit)",
        "language": "python",
    }
    nb.metadata["language_info"] = {"name": "python"}
    nb.cells.append(nbformat.v4.new_markdown_cell("# Benchmark note\n\nA representative note."))
    params = nbformat.v4.new_code_cell(
        f"case = {case!r}  # case as entered\nnote_time: str = ''  # ISO 8601 with time zone"
    )
    params.metadata["tags"] = ["parameters"]
    nb.cells.append(params)
    nb.cells.append(nbformat.v4.new_code_cell(IMPORT_CELL, metadata={"bench": "imports"}))
    nb.cells.append(nbformat.v4.new_code_cell(COMPUTE_CELL, metadata={"bench": "compute"}))
    for source in TABLE_CELLS:
        nb.cells.append(nbformat.v4.new_code_cell(source, metadata={"bench": "tables"}))
    for name, values, shift, xlabel in FIGURES:
        nb.cells.append(nbformat.v4.new_markdown_cell(f"## Sweep of {name.replace('_', ' ')}"))
        source = FIGURE_CELL.format(name=name, values=values, shift=shift, xlabel=xlabel)
        nb.cells.append(nbformat.v4.new_code_cell(source, metadata={"bench": "figures"}))
    nbformat.write(nb, path)
    return path


def variant_rows(count: int) -> list[dict]:
    """``count`` variants: power and inlet air varied, some failing their limit."""
    rows = []
    for i in range(count):
        rows.append(
            {
                "variant": f"bench-{i + 1:02d}",
                "source.power": f"{30 + 2 * i} W",
                "air.inlet_temperature": f"{45 + (i % 4) * 5} degC",
            }
        )
    return rows


def plain_loop(template: Path, cases: list[dict], out: Path, kernel: str) -> dict:
    """The loop a user writes by hand: papermill, then nbconvert, a fresh kernel per note."""
    import papermill
    from nbconvert import HTMLExporter

    out.mkdir(parents=True, exist_ok=True)
    totals, papermill_times, exports, cells = [], [], [], {}
    for case in cases:
        started = time.perf_counter()
        nb = papermill.execute_notebook(
            str(template),
            str(out / f"{case['case_id']}.ipynb"),
            parameters={"case": case, "note_time": NOTE_TIME},
            kernel_name=kernel,
            progress_bar=False,
        )
        executed = time.perf_counter()
        exporter = HTMLExporter(exclude_input=True, embed_images=True)
        body, _ = exporter.from_notebook_node(nb)
        (out / f"{case['case_id']}.html").write_text(body, encoding="utf-8")
        done = time.perf_counter()
        totals.append(done - started)
        papermill_times.append(executed - started)
        exports.append(done - executed)
        for cell in nb.cells:
            if cell.cell_type != "code":
                continue
            tags = cell.metadata.get("tags", [])
            is_parameters = "parameters" in tags or "injected-parameters" in tags
            group = cell.metadata.get("bench") or ("parameters" if is_parameters else "other")
            duration = cell.metadata.get("papermill", {}).get("duration") or 0.0
            cells.setdefault(group, []).append(duration)
    count = len(cases)
    per_group = {group: sum(values) / count for group, values in cells.items()}
    reused = HTMLExporter(exclude_input=True, embed_images=True)
    reused.from_notebook_node(nb)
    started = time.perf_counter()
    for _ in range(5):
        reused.from_notebook_node(nb)
    return {
        "per_note": sum(totals) / count,
        "papermill": sum(papermill_times) / count,
        "export": statistics.mean(exports),
        "export_reused": (time.perf_counter() - started) / 5,
        "cells": per_group,
        "outside_cells": sum(papermill_times) / count - sum(per_group.values()),
    }


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="bench_batch.py", description=__doc__.splitlines()[0])
    parser.add_argument("--variants", type=int, default=20, help="number of variants (20)")
    parser.add_argument("--jobs", type=int, default=None, help="finkit batch jobs (cores)")
    parser.add_argument("--template", help="template to benchmark (default: representative)")
    args = parser.parse_args(argv)

    from finkit import batch, notes

    kernel = notes.ensure_kernel()
    raw = yaml.safe_load(DEMO_BASE.read_text(encoding="utf-8"))
    base = {key: raw[key] for key in CORE_BLOCKS if key in raw}
    rows = variant_rows(args.variants)
    jobs = args.jobs or batch.run._usable_cores()

    with tempfile.TemporaryDirectory(prefix="finkit-bench-batch-") as scratch:
        scratch = Path(scratch)
        template = (
            Path(args.template)
            if args.template
            else representative_template(scratch / "representative.ipynb", base)
        )
        cases = [
            {
                **batch.apply_overrides(base, {k: v for k, v in row.items() if k != "variant"}),
                "case_id": row["variant"],
            }
            for row in rows
        ]
        print(f"{len(cases)} variants of {DEMO_BASE.name} (core blocks), template {template.name}")
        print(f"machine: {os.cpu_count()} CPU(s); finkit batch with --jobs {jobs}\n")

        print("plain loop (papermill + nbconvert, fresh kernel per note) ...", flush=True)
        started = time.perf_counter()
        plain = plain_loop(template, cases, scratch / "plain", kernel)
        plain_wall = time.perf_counter() - started

        print("finkit batch ...", flush=True)
        started = time.perf_counter()
        result = batch.run_batch(
            base, rows, scratch / "batch", template=template, jobs=jobs, execution_time=NOTE_TIME
        )
        batch_wall = time.perf_counter() - started
        not_computed = [o for o in result.outcomes if o.status == "error"]

        started = time.perf_counter()
        again = batch.run_batch(base, rows, scratch / "batch", template=template, jobs=jobs)
        rerun_wall = time.perf_counter() - started
        reused = sum(1 for o in again.outcomes if o.state == "reused")

    n = len(cases)
    batch_per_note = batch_wall / n
    child = statistics.mean(o.seconds for o in result.outcomes if o.state == "computed")
    print("\nPlain loop, per note (mean of the run):")
    for label, value in (
        ("kernel start, shutdown and per-cell round trips", plain["outside_cells"]),
        ("imports inside the kernel (import cell)", plain["cells"].get("imports", 0.0)),
        ("computation (load_case + run_case cell)", plain["cells"].get("compute", 0.0)),
        ("tables", plain["cells"].get("tables", 0.0)),
        ("four figures", plain["cells"].get("figures", 0.0)),
        ("parameters cells", plain["cells"].get("parameters", 0.0)),
        ("other template cells (a template of your own)", plain["cells"].get("other", 0.0)),
        ("export, new HTMLExporter each note", plain["export"]),
    ):
        print(f"  {label:50s} {value:6.2f} s")
    print(
        f"  {'export with a reused exporter (for comparison)':50s} {plain['export_reused']:6.2f} s"
    )
    print(f"  {'total':50s} {plain['per_note']:6.2f} s")
    print("\nResults:")
    print(
        f"  plain loop:        {plain_wall:7.1f} s for {n} notes = {plain_wall / n:5.2f} s per note"
    )
    print(
        f"  finkit batch:      {batch_wall:7.1f} s for {n} notes = {batch_per_note:5.2f} s per note"
        f" (jobs {jobs}; one note takes {child:.2f} s in its child; warm-up included)"
    )
    print(f"  ratio plain / batch: {plain_wall / batch_wall:5.1f}x")
    print(f"  unchanged re-run:  {rerun_wall:7.2f} s ({reused} of {n} notes reused)")
    if not_computed:
        print(f"  {len(not_computed)} variant(s) not computed: {not_computed[0].error}")
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
