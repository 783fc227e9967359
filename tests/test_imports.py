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


def _python(code: str, env: dict | None = None) -> str:
    import os

    run = subprocess.run(
        [sys.executable, "-c", code],
        capture_output=True,
        text=True,
        check=True,
        env={**os.environ, **(env or {})},
    )
    return run.stdout.strip()


def test_unit_registry_from_pints_cache_converts_the_same(tmp_path):
    # pint keeps its parsed definitions in a cache folder (XDG_CACHE_HOME here); a registry
    # built from the cache, and one built after the cache file was damaged, convert as the
    # parsed one does.
    code = (
        "from finkit.units import to_si; "
        "print(*(repr(to_si(v, k, 'f')) for v, k in [('12 CFM', 'volume_flow'), "
        "('0.2 inH2O', 'pressure'), ('45 degC', 'temperature'), "
        "('0.2 K*cm^2/W', 'area_resistance')]))"
    )
    env = {"XDG_CACHE_HOME": str(tmp_path)}
    first = _python(code, env)
    cached = sorted((tmp_path / "pint").glob("*.pickle"))
    assert cached, "pint wrote no cache"
    assert _python(code, env) == first
    for path in cached:
        path.write_bytes(path.read_bytes()[:50])
    assert _python(code, env) == first
    # 12 ft³/min = 12 x 0.028316846592 / 60 m³/s (NIST SP 811, Appendix B.8).
    assert float(first.split()[0]) == pytest.approx(12 * 0.028316846592 / 60, rel=1e-12)


def test_commands_skip_the_unused_iri_grammar_and_notebooks_still_validate():
    code = (
        "import sys; from finkit import cli; cli.main(['--version']); "
        "import nbformat; nbformat.validate(nbformat.v4.new_notebook()); "
        "print(sys.modules['rfc3987_syntax'])"
    )
    assert _python(code).splitlines()[-1] == "None"
