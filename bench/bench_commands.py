"""Benchmark: the everyday commands on the real demo cases, against the speed targets.

Whole processes, wall time, as a user runs them: ``import finkit.case``, ``finkit check`` of
each demo case, ``finkit note`` of the plate-fin demo (with its HTML size), ``finkit batch``
of the 14 demo variants with 2 jobs, and the unchanged re-run of that batch. Each row prints
the measured figure, the baseline the speed issue measured before this work, the target and
whether it is met. The machines are shared: checks are the median of three runs, the note and
the batch one run each (about a minute in all).

Run: .venv/bin/python bench/bench_commands.py [--quick]   (--quick: imports and checks only)
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_cases"
FINKIT = [sys.executable, "-m", "finkit.cli"]

#: Baselines measured by the speed issue on a 2-core machine before this work.
BASELINE = {
    "import": "1.6 s",
    "check": "3.0-4.0 s",
    "note": "12 s, 1.1 MB",
    "batch": "6.4 s per note",
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
        seconds = _wall([*FINKIT, "note", str(DEMO / "nb200-plate-fan.yaml"), "--out", str(out)])
        size = (out / "nb200-plate-fan" / "note.html").stat().st_size
        _row(
            "finkit note nb200-plate-fan",
            f"{seconds:.1f} s, {size / 1e6:.2f} MB",
            BASELINE["note"],
            "<= 4 s, 0.5 MB",
            seconds <= 4.0 and size <= 500_000,
        )
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
        seconds = _wall(command)
        per_note = seconds / 14
        _row(
            "finkit batch, 14 variants, 2 jobs",
            f"{per_note:.1f} s per note",
            BASELINE["batch"],
            "<= 2 s/note",
            per_note <= 2.0,
        )
        seconds = _wall(command)
        _row(
            "unchanged re-run of the 14",
            f"{seconds:.1f} s",
            BASELINE["rerun"],
            "<= 1 s",
            seconds <= 1.0,
        )
    return 0


if __name__ == "__main__":
    raise SystemExit(main(sys.argv[1:]))
