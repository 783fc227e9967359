"""The case boundary and the command line import nothing heavy (issue 15, item 1).

``python -X importtime`` lists every module an import loads; the check is on the list, not on
seconds (the machines are shared and noisy; times are measured in bench/). Software behaviour
only; no physics is checked here.
"""

from __future__ import annotations

import shutil
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
    "finkit.physics.sink",
    "finkit.model.trade",
    "finkit.model.uncertainty",
    "finkit.report",
)


#: Printed at exit: every module loaded into ``sys.modules`` (``-X importtime`` alone misses a
#: package that SciPy loads through its lazy ``__getattr__``, such as ``scipy.optimize``; a
#: name blocked with None, as the CLI blocks dask, is not loaded).
_AT_EXIT = (
    "import atexit, sys; atexit.register(lambda: print(*('module: ' + m for m in "
    "[k for k, v in sys.modules.items() if v is not None]), sep='\\n', file=sys.stderr)); "
)


def _imported(statement: str) -> set[str]:
    run = subprocess.run(
        [sys.executable, "-X", "importtime", "-c", _AT_EXIT + statement],
        capture_output=True,
        text=True,
        check=True,
    )
    names = set()
    for line in run.stderr.splitlines():
        if line.startswith("import time:") and "|" in line:
            names.add(line.rsplit("|", 1)[1].strip())
        elif line.startswith("module: "):
            names.add(line.removeprefix("module: "))
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
    assert "finkit.physics.sink" in loaded
    assert sorted(m for m in ("matplotlib", "scipy.stats", "pandas") if m in loaded) == []


FAN = PIN.with_name("nb200-plate-fan.yaml")


def test_a_fan_cooled_check_with_measurements_loads_no_optimiser_or_interpolation():
    # The fan curve, the calibration fit, a stopped fan's net curve and the Monte Carlo
    # spreading interpolation use finkit.interpolation and finkit.physics.airflow.bracketed_root,
    # not
    # scipy.interpolate / scipy.optimize (0.5 s of imports in each check).
    loaded = _imported(
        "from finkit.case import load_case; from finkit.model import run_case; "
        f"run_case(load_case({str(FAN)!r}))"
    )
    assert "finkit.model.review" in loaded  # the calibration ran
    heavy = ("matplotlib", "scipy.optimize", "scipy.interpolate", "scipy.stats", "pandas")
    assert sorted(m for m in heavy if m in loaded) == []


@pytest.mark.parametrize("case_file", [FAN, FAN.with_name("nb200-plate-fan-rev-a.yaml")],
                         ids=["with-transient", "rev-a"])  # fmt: skip
def test_the_check_command_loads_no_ode_solver_optimiser_scipy_special_or_dask(case_file):
    # A check with tolerances and Monte Carlo samples the normal distribution and bounds the
    # exceedance with finkit.probability, not scipy.special (0.15-0.3 s with NumPy's f2py);
    # pint's optional dask support is kept out of every command but batch (0.08 s). The
    # transient block's history is the exact modal solution and its Foster fit a numpy
    # variable projection: no scipy.integrate, scipy.sparse or scipy.optimize (0.45 s).
    check = f"main(['check', {str(case_file)!r}])"
    loaded = _imported(f"import sys; from finkit.cli import main; sys.exit({check} * 0)")
    assert "finkit.model.uncertainty" in loaded  # the Monte Carlo ran
    if case_file == FAN:
        assert "finkit.physics.transient.modal" in loaded  # the transient ran
    heavy = ("scipy.special", "dask", "numpy.f2py", "scipy.integrate", "scipy.optimize",
             "scipy.sparse", "scipy.linalg")  # fmt: skip
    assert sorted(m for m in heavy if m in loaded) == []


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
        "from finkit.case.units import to_si; "
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


def test_check_imports_no_note_machinery(demo_case_file):
    # finkit check renders no note: the notes package (and nbformat) stay unimported.
    case = demo_case_file("nb400-board-sources")
    code = (
        "import sys; from finkit import cli; cli.main(['check', sys.argv[1]]); "
        "print(sorted(m for m in sys.modules if m.startswith(('finkit.notes', 'nbformat'))))"
    )
    run = subprocess.run(
        [sys.executable, "-c", code, str(case)], capture_output=True, text=True, check=True
    )
    assert run.stdout.strip().splitlines()[-1] == "[]"


def _import_graph() -> dict[str, set[str]]:
    """finkit module -> the finkit modules it imports anywhere in its text (ast)."""
    import ast

    package = Path(__file__).resolve().parents[1] / "finkit"
    modules = {}
    for path in package.rglob("*.py"):
        name = ".".join(path.relative_to(package.parent).with_suffix("").parts)
        modules[name.removesuffix(".__init__")] = path

    def known(name: str) -> str | None:
        parts = name.split(".")
        while parts:
            if ".".join(parts) in modules:
                return ".".join(parts)
            parts.pop()
        return None

    graph = {name: set() for name in modules}
    for name, path in modules.items():
        for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
            targets = []
            if isinstance(node, ast.Import):
                targets = [alias.name for alias in node.names]
            elif isinstance(node, ast.ImportFrom) and node.module and not node.level:
                targets = [f"{node.module}.{alias.name}" for alias in node.names]
            for target in targets:
                module = known(target)
                if module and module not in (name, "finkit"):
                    graph[name].add(module)
    return graph


def _cycles(graph: dict[str, set[str]]) -> list[set[str]]:
    """Strongly connected components of more than one module (Tarjan)."""
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    stack: list[str] = []
    found: list[set[str]] = []

    def visit(node: str) -> None:
        index[node] = low[node] = len(index)
        stack.append(node)
        for other in graph[node]:
            if other not in index:
                visit(other)
                low[node] = min(low[node], low[other])
            elif other in stack:
                low[node] = min(low[node], index[other])
        if low[node] == index[node]:
            component = set()
            while True:
                member = stack.pop()
                component.add(member)
                if member == node:
                    break
            if len(component) > 1:
                found.append(component)

    for node in graph:
        if node not in index:
            visit(node)
    return found


def test_no_import_cycle():
    # Counting imports made inside functions. The layers themselves (each layer imports only
    # from the layers below) are checked by import-linter in ``make lint`` (pyproject.toml,
    # [tool.importlinter]); within a layer this test keeps the modules free of cycles.
    assert _cycles(_import_graph()) == []


def test_the_cycle_check_finds_a_cycle():
    graph = {"a": {"b"}, "b": {"c"}, "c": {"a"}, "d": {"a"}}
    assert _cycles(graph) == [{"a", "b", "c"}]


def _lint_imports(root: Path) -> subprocess.CompletedProcess:
    import os

    lint = Path(sys.executable).with_name("lint-imports")
    if not lint.exists():
        lint = shutil.which("lint-imports")
    return subprocess.run(
        [str(lint), "--config", str(root / "pyproject.toml")],
        capture_output=True,
        text=True,
        cwd=root,
        env={**os.environ, "PYTHONPATH": str(root)},
    )


def test_the_layer_contract_holds():
    run = _lint_imports(Path(__file__).resolve().parents[1])
    assert run.returncode == 0, run.stdout[-2000:]
    assert "1 kept, 0 broken" in run.stdout


def test_the_layer_contract_fails_on_a_physics_module_that_imports_the_report(tmp_path):
    # A copy of the package in which the sink model reaches up into the report layer, inside a
    # function (the kind of import the old code hid): the contract must catch it.
    root = Path(__file__).resolve().parents[1]
    shutil.copytree(root / "finkit", tmp_path / "finkit", ignore=shutil.ignore_patterns("*.pyc"))
    shutil.copy(root / "pyproject.toml", tmp_path / "pyproject.toml")
    sink = tmp_path / "finkit" / "physics" / "sink" / "solve.py"
    sink.write_text(
        sink.read_text(encoding="utf-8")
        + "\n\ndef _leak():\n    from finkit.report import present\n",
        encoding="utf-8",
    )
    run = _lint_imports(tmp_path)
    assert run.returncode != 0
    assert "finkit.physics is not allowed to import finkit.report" in run.stdout
