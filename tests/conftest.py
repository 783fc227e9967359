"""Shared fixtures and markers of the test suite.

Markers (declared in pyproject.toml): ``published`` (a value from a named published source),
``crosscheck`` (a general-purpose reference library: ht, fluids, CoolProp, scipy), ``identity``
(a limit, balance or closed form), ``regression`` (frozen own output), ``shape`` and ``slow``.
A test whose code calls ht, fluids or CoolProp is marked ``crosscheck`` here, from its source, so
the mark cannot be forgotten (``pytest -m crosscheck`` lists them).

Fixtures: the demo case files, and the standard plate-fin and pin-fin designs (the demo cases
nb200-plate-fan and nb300-pin-ducted, validated and solved once per session).
"""

from __future__ import annotations

import inspect
import os
import re
import tempfile
from pathlib import Path

import pytest

# Rendered equations are kept between runs in the user's cache folder; the tests (and the notes
# they render in subprocesses) use a fresh folder of their own, so each run renders them anew.
os.environ["FINKIT_CACHE_DIR"] = tempfile.mkdtemp(prefix="finkit-test-cache-")

ROOT = Path(__file__).resolve().parents[1]
DEMO_CASES = ROOT / "demo_cases"
_REFERENCE_LIBRARY = re.compile(r"\b(ht|fluids)\.[A-Za-z_]|\bPropsSI\b|\bCoolProp\b")


def pytest_collection_modifyitems(config, items):
    for item in items:
        function = getattr(item, "function", None)
        if function is None or item.get_closest_marker("crosscheck"):
            continue
        try:
            source = inspect.getsource(function)
        except (OSError, TypeError):
            continue
        if _REFERENCE_LIBRARY.search(source):
            item.add_marker(pytest.mark.crosscheck)


@pytest.fixture(scope="session")
def demo_case_file():
    """``demo_case_file("nb200-plate-fan")`` -> the path of that demo case file."""

    def path(stem: str) -> Path:
        found = DEMO_CASES / f"{stem}.yaml"
        assert found.is_file(), f"no demo case {stem!r}"
        return found

    return path


@pytest.fixture(scope="session")
def plate_fin_demo(demo_case_file):
    """The standard plate-fin design: (validated case, CaseResult) of nb200-plate-fan."""
    from finkit.case import load_case
    from finkit.model import run_case

    case = load_case(demo_case_file("nb200-plate-fan"))
    return case, run_case(case)


@pytest.fixture(scope="session")
def pin_fin_demo(demo_case_file):
    """The standard pin-fin design: (validated case, CaseResult) of nb300-pin-ducted."""
    from finkit.case import load_case
    from finkit.model import run_case

    case = load_case(demo_case_file("nb300-pin-ducted"))
    return case, run_case(case)
