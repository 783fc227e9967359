"""Benchmark: the everyday commands on the real demo cases, against the speed targets.

Whole processes, wall time, as a user runs them: ``import finkit.case``, ``finkit check`` of
each demo case, ``finkit note`` of the plate-fin demo (with its HTML size), ``finkit batch``
of the 14 demo variants with 2 jobs, the same 14 full notes by a plain papermill + nbconvert
loop with the same parallelism (2 worker processes, a fresh kernel per note), and the
unchanged re-run of the batch. Each row prints the measured figure, the baseline the speed
issue measured before this work, the target and whether it is met. Then two stage tables: where
the time of one ``finkit note`` goes, and where a batch child's time goes (median over the 14
notes, from their batch-state.json). The machines are shared: checks are the median of three
runs, the rest one run each (about three minutes in all).

Run: .venv/bin/python bench/bench_commands.py [--quick]   (--quick: imports and checks only)
"""

from __future__ import annotations

import json
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_cases"
FINKIT = [sys.executable, "-m", "finkit.cli"]
NOTE_TIME = "2025-06-02T08:00:00+02:00"

#: Baselines measured by the speed issue on a 2-core machine before this work.
BASELINE = {
    "import": "1.6 s",
    "check": "3.0-4.0 s",
    "note": "12 s, 1.1 MB",
    "batch": "6.4 s per note",
    "ratio": "1.9x",
    "rerun": "(not measured)",
}


def _wall(command: list[str], runs: int = 1) -> float:
    times = []
    for _ in range(runs):
        start = time.perf_counter()
        subprocess.run(command, cwd=ROOT, capture_output=True, check=False)
        times.append(time.perf_counter() - start)
    return statistics.median(times)


def _row(what: str, measured: str, baseline: str, target: str, met: bool) -> None:
    print(
        f"{what:46s} {measured:>16s} {baseline:>16s} {target:>14s}  {'met' if met else 'NOT MET'}"
    )


def _note_stages(out: Path) -> dict[str, float]:
    """Stage times of one note of the plate-fin demo, rendered as ``finkit note`` does."""
    code = (
        "import json, sys, time; start = time.perf_counter(); "
        "from finkit.notes import render_note, skip_unused_slow_imports; "
        "skip_unused_slow_imports(); stages = {'start Python and import': "
        "time.perf_counter() - start}; "
        f"render_note({str(DEMO / 'nb200-plate-fan.yaml')!r}, {str(out)!r}, stages=stages); "
        "print(json.dumps(stages))"
    )
    run = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, cwd=ROOT)
    if run.returncode != 0:
        return {"(failed)": float("nan")}
    return json.loads(run.stdout.strip().splitlines()[-1])


def _plain_one(task: tuple[str, dict, str]) -> None:
    """One note the way a user's own loop makes it: papermill, then nbconvert's exporter."""
    import papermill
    from nbconvert import HTMLExporter

    template, case, out = task
    nb = papermill.execute_notebook(
        template,
        str(Path(out) / f"{case['case_id']}.ipynb"),
        parameters={"case": case, "note_time": NOTE_TIME},
        kernel_name="finkit",
        progress_bar=False,
    )
    body, _ = HTMLExporter(exclude_input=True, embed_images=True).from_notebook_node(nb)
    (Path(out) / f"{case['case_id']}.html").write_text(body, encoding="utf-8")


def _plain_loop(out: Path, jobs: int) -> float:
    """Wall time of the 14 demo variants' full notes by a plain loop on ``jobs`` processes."""
    from concurrent.futures import ProcessPoolExecutor

    from finkit import batch, notes

    notes.ensure_kernel()
    variants = batch.prepare_variants(
        DEMO / "nb200-plate-fan.yaml", DEMO / "nb-series-variants.csv"
    )
    out.mkdir(parents=True)
    template = str(notes.template_path("heat-sink"))
    tasks = [(template, {**v.case, "case_id": v.variant}, str(out)) for v in variants]
    start = time.perf_counter()
    with ProcessPoolExecutor(max_workers=jobs) as pool:
        list(pool.map(_plain_one, tasks))
    return time.perf_counter() - start


def _batch_stages(folder: Path) -> dict[str, float]:
    """Median seconds of each stage over the batch's notes (their batch-state.json)."""
    per_stage: dict[str, list[float]] = {}
    totals = []
    for state_file in sorted(folder.glob("*/batch-state.json")):
        state = json.loads(state_file.read_text(encoding="utf-8"))
        totals.append(float(state.get("seconds", 0.0)))
        for name, seconds in state.get("stages", {}).items():
            per_stage.setdefault(name, []).append(float(seconds))
    table = {name: statistics.median(values) for name, values in per_stage.items()}
    if totals:
        table["(whole child, fork to outcome)"] = statistics.median(totals)
    return table


def _stage_table(title: str, stages: dict[str, float]) -> None:
    print(f"\n{title}:")
    for name, seconds in stages.items():
        if name == "(sections drawn ahead)":  # a count: the parts the forked helper drew
            print(f"  {'(sections the helper drew ahead, of the note)':46s} {seconds:7.0f}")
        else:
            print(f"  {name:46s} {seconds:7.2f} s")
    named = [v for k, v in stages.items() if not k.startswith("(")]
    print(f"  {'sum of the stages':46s} {sum(named):7.2f} s")


def main(argv: list[str]) -> int:
    quick = "--quick" in argv
    print(f"{'what':46s} {'measured':>16s} {'baseline':>16s} {'target':>14s}")
    code = (
        "import time; t = time.perf_counter(); import finkit.case; print(time.perf_counter() - t)"
    )
    runs = [
        float(subprocess.run([sys.executable, "-c", code], capture_output=True, text=True).stdout)
        for _ in range(3)
    ]
    seconds = statistics.median(runs)
    _row("import finkit.case", f"{seconds:.2f} s", BASELINE["import"], "<= 0.3 s", seconds <= 0.3)
    for case in sorted(DEMO.glob("*.yaml")):
        seconds = _wall([*FINKIT, "check", str(case)], runs=3)
        _row(
            f"finkit check {case.stem}",
            f"{seconds:.2f} s",
            BASELINE["check"],
            "<= 1.0 s",
            seconds <= 1.0,
        )
    if quick:
        return 0
    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp) / "notes"
        seconds = _wall(
            [*FINKIT, "note", str(DEMO / "nb200-plate-fan.yaml"), "--out", str(out)], runs=3
        )
        size = (out / "nb200-plate-fan" / "note.html").stat().st_size
        _row(
            "finkit note nb200-plate-fan",
            f"{seconds:.1f} s, {size / 1e6:.2f} MB",
            BASELINE["note"],
            "<= 4 s, 0.5 MB",
            seconds <= 4.0 and size <= 500_000,
        )
        note_stages = _note_stages(Path(tmp) / "staged")
        batch = Path(tmp) / "batch"
        command = [
            *FINKIT,
            "batch",
            str(DEMO / "nb200-plate-fan.yaml"),
            str(DEMO / "nb-series-variants.csv"),
            "--out",
            str(batch),
            "--jobs",
            "2",
        ]
        batch_seconds = _wall(command)
        per_note = batch_seconds / 14
        _row(
            "finkit batch, 14 variants, 2 jobs",
            f"{per_note:.1f} s per note",
            BASELINE["batch"],
            "<= 2 s/note",
            per_note <= 2.0,
        )
        plain_seconds = _plain_loop(Path(tmp) / "plain", jobs=2)
        ratio = plain_seconds / batch_seconds
        _row(
            "plain papermill+nbconvert loop / batch",
            f"{ratio:.1f}x ({plain_seconds:.0f} s)",
            BASELINE["ratio"],
            ">= 4x",
            ratio >= 4.0,
        )
        seconds = _wall(command)
        _row(
            "unchanged re-run of the 14",
            f"{seconds:.1f} s",
            BASELINE["rerun"],
            "<= 1 s",
            seconds <= 1.0,
        )
        _stage_table("one finkit note of nb200-plate-fan, by stage", note_stages)
        child = _batch_stages(batch)
        _stage_table("a batch child (median of the 14 notes), by stage", child)
    return 0


if __name__ == "__main__":
    raise SystemExit(main(sys.argv[1:]))
