"""The case boundary and the command line import nothing heavy (issue 15, item 1).

``python -X importtime`` lists every module an import loads; the check is on the list, not on
seconds (the machines are shared and noisy; times are measured in bench/). Software behaviour
only; no physics is checked here.
"""

from __future__ import annotations

import subprocess
import sys
from pathlib import Path

import pytest

PIN = Path(__file__).resolve().parents[1] / "demo_cases" / "nb300-pin-ducted.yaml"

#: Modules that the case boundary and the CLI must not load on import: plotting, optimisation,
#: statistics, interpolation, tables, notebooks, the unit registry (made on first use) and the
#: solver itself.
HEAVY = (
    "matplotlib",
    "pandas",
    "nbconvert",
    "papermill",
    "pint",
    "scipy.optimize",
    "scipy.stats",
    "scipy.interpolate",
    "scipy.integrate",
    "finkit.model",
    "finkit.sink",
    "finkit.trade",
    "finkit.uncertainty",
    "finkit.report",
)


def _imported(statement: str) -> set[str]:
    run = subprocess.run(
        [sys.executable, "-X", "importtime", "-c", statement],
        capture_output=True,
        text=True,
        check=True,
    )
    names = set()
    for line in run.stderr.splitlines():
        if line.startswith("import time:") and "|" in line:
            names.add(line.rsplit("|", 1)[1].strip())
    return names


@pytest.mark.parametrize("statement", ["import finkit.case", "import finkit.cli"])
def test_the_boundary_imports_nothing_heavy(statement):
    loaded = _imported(statement)
    assert "finkit" in loaded  # the listing works
    assert sorted(m for m in HEAVY if m in loaded) == []


def test_a_pin_fin_check_does_not_load_statistics_or_plotting():
    # A case without a fan, tolerances or a trade study needs neither the fan-curve
    # interpolation nor scipy.stats nor matplotlib.
    loaded = _imported(
        "from finkit.case import load_case; from finkit.model import run_case; "
        f"run_case(load_case({str(PIN)!r}))"
    )
    assert "finkit.sink" in loaded
    assert sorted(m for m in ("matplotlib", "scipy.stats", "pandas") if m in loaded) == []
