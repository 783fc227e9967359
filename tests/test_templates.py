"""Tests of the calculation-note templates in templates/ (STYLE.md 2.5: templates stay thin).

* Static checks (fast): every code cell parses, imports only finkit, defines no function,
  class or lambda, does no arithmetic and writes no file; Markdown cells hold prose (no TeX);
  exactly one cell is tagged ``parameters`` and its default case is the demo scenario of that
  kind, which validates.
* Rendering (slow): each template runs end to end on each demo case of its kind through
  finkit.notes.render_note; the HTML holds the title block, the results and embedded plots, no
  code; results.json equals finkit.model.run_case on the same case; the headline numbers in
  the HTML are those of results.json.
* Opening unchanged (slow): the template executed with its own default parameters, as a user
  who opens it in JupyterLab and runs all cells would, completes.

These tests check software behaviour (structure, agreement between the note and the model),
not physics; the physics of every number is tested where it is computed.
"""

from __future__ import annotations

import ast
import json
import re
from pathlib import Path

import nbformat
import pytest
import yaml

from finkit import notes

ROOT = Path(__file__).resolve().parent.parent
TEMPLATES = ROOT / "templates"
DEMO_CASES = ROOT / "demo_cases"
NOTE_TIME = "2025-03-14T09:30:00+01:00"

#: The demo scenario each template opens with (templates/<kind> parameters cell).
DEFAULT_DEMO = {"heat-sink": "nb200-plate-fan.yaml", "single-fin": "nb-fin-study.yaml"}
#: Least number of embedded plots in a note of each kind.
MIN_PLOTS = {"heat-sink": 5, "single-fin": 3}

FORBIDDEN_CALLS = {"open", "eval", "exec", "compile", "__import__", "input", "globals", "setattr"}


def _demo_cases_by_kind() -> dict[str, list[Path]]:
    found: dict[str, list[Path]] = {}
    for path in sorted(DEMO_CASES.glob("*.yaml")):
        kind = yaml.safe_load(path.read_text(encoding="utf-8"))["kind"]
        found.setdefault(kind, []).append(path)
    return found


DEMOS = _demo_cases_by_kind()
RENDER_CASES = [(kind, path) for kind, paths in DEMOS.items() for path in paths]


def _template(kind: str) -> Path:
    return TEMPLATES / notes.TEMPLATES_BY_KIND[kind]


def _cells(kind: str):
    return nbformat.read(_template(kind), as_version=4).cells


def _code_cells(kind: str):
    return [c for c in _cells(kind) if c.cell_type == "code"]


def _is_parameters(cell) -> bool:
    return "parameters" in cell.get("metadata", {}).get("tags", [])


def _thin_code_problems(source: str) -> list[str]:
    """Why a code cell is not a thin template cell (empty list if it is)."""
    problems = []
    tree = ast.parse(source)
    for node in ast.walk(tree):
        if isinstance(node, ast.FunctionDef | ast.AsyncFunctionDef | ast.ClassDef | ast.Lambda):
            problems.append(f"defines a function or class (line {node.lineno})")
        elif isinstance(node, ast.Import):
            for alias in node.names:
                if alias.name.split(".")[0] != "finkit":
                    problems.append(f"imports {alias.name}")
        elif isinstance(node, ast.ImportFrom):
            if node.level or (node.module or "").split(".")[0] != "finkit":
                problems.append(f"imports from {node.module}")
        elif isinstance(node, ast.BinOp | ast.AugAssign):
            problems.append(f"does arithmetic (line {node.lineno})")
        elif isinstance(node, ast.UnaryOp) and not isinstance(node.operand, ast.Constant):
            problems.append(f"does arithmetic (line {node.lineno})")
        elif isinstance(node, ast.Compare) and any(
            isinstance(op, ast.Lt | ast.LtE | ast.Gt | ast.GtE) for op in node.ops
        ):
            problems.append(f"compares numbers (line {node.lineno})")
        elif isinstance(node, ast.ListComp | ast.SetComp | ast.DictComp | ast.GeneratorExp):
            problems.append(f"loops in a comprehension (line {node.lineno})")
        elif isinstance(node, ast.For | ast.While | ast.If | ast.With | ast.Try):
            problems.append(f"has control flow (line {node.lineno})")
        elif (
            isinstance(node, ast.Call)
            and isinstance(node.func, ast.Name)
            and node.func.id in FORBIDDEN_CALLS
        ):
            problems.append(f"calls {node.func.id}()")
    return problems


# ------------------------------------------------------------------------------------------
# The checker itself (so that a template passing it means something)


@pytest.mark.parametrize(
    "source",
    [
        "import numpy as np",
        "from math import pi",
        "from . import x",
        "def f():\n    return 1",
        "class A:\n    pass",
        "g = lambda x: x",
        "x = result.results['mass'] * 2",
        "x = 1 + 1",
        "x = -y",
        "x += 1",
        "flag = a > 3",
        "[r for r in rows]",
        "for r in rows:\n    r",
        "if ok:\n    x",
        "open('out.csv', 'w')",
    ],
)
def test_thin_code_check_catches_what_a_template_must_not_do(source):
    assert _thin_code_problems(source)


def test_thin_code_check_accepts_template_style_cells():
    assert not _thin_code_problems(
        "import finkit.report as report\nfrom finkit.report import present\n\n"
        "result = report.run(case)\nreport.title_block(result, note_time)"
    )
    assert not _thin_code_problems("case = {'a': [-1.5, '2 mm'], 'b': None}\nnote_time = ''")


# ------------------------------------------------------------------------------------------
# Static checks of the templates


@pytest.mark.parametrize("kind", sorted(notes.TEMPLATES_BY_KIND))
def test_template_code_cells_are_thin(kind):
    for index, cell in enumerate(_code_cells(kind)):
        problems = _thin_code_problems(cell.source)
        assert not problems, f"{kind} template, code cell {index}: {problems}"


@pytest.mark.parametrize("kind", sorted(notes.TEMPLATES_BY_KIND))
def test_markdown_cells_hold_prose_only(kind):
    for cell in _cells(kind):
        if cell.cell_type == "markdown":
            assert "$" not in cell.source, "TeX in Markdown: use finkit.report.present.equation"
            assert not re.search(r"<\s*[a-zA-Z]", cell.source), "raw HTML in Markdown"
            assert not cell.get("attachments"), "attachments in a template"


def _assigned(source: str) -> set[str]:
    tree = ast.parse(source)
    return {
        target.id
        for node in tree.body
        if isinstance(node, ast.Assign | ast.AnnAssign)
        for target in (node.targets if isinstance(node, ast.Assign) else [node.target])
    }


@pytest.mark.parametrize("kind", sorted(notes.TEMPLATES_BY_KIND))
def test_parameters_cell_declares_the_case_its_keys_and_the_overrides(kind):
    from finkit.case.parameters import CASE_KEYS, OVERRIDES

    cells = _cells(kind)
    tagged = [c for c in cells if _is_parameters(c)]
    assert len(tagged) == 1
    # "solved": where finkit note leaves the solution it computed (empty: the note solves).
    expected = {"case", "note_time", "solved", *CASE_KEYS}
    if kind == "heat-sink":
        expected |= set(OVERRIDES)
    assert _assigned(tagged[0].source) == expected
    namespace: dict = {}
    exec(compile(tagged[0].source, "parameters", "exec"), {}, namespace)  # literals only
    assert namespace["note_time"] == "" and namespace["solved"] == ""
    assert all(namespace[name] is None for name in expected - {"note_time", "solved"})


@pytest.mark.parametrize("kind", sorted(notes.TEMPLATES_BY_KIND))
def test_demo_cell_holds_the_demo_case_as_entered(kind):
    cells = _cells(kind)
    demo_cells = [c for c in cells if "demo-case" in c.get("metadata", {}).get("tags", [])]
    assert len(demo_cells) == 1
    assert cells.index(demo_cells[0]) < cells.index(next(c for c in cells if _is_parameters(c)))
    assert _assigned(demo_cells[0].source) == {"demo_case"}
    namespace: dict = {}
    exec(compile(demo_cells[0].source, "demo", "exec"), {}, namespace)  # literals only
    case = namespace["demo_case"]
    demo = yaml.safe_load((DEMO_CASES / DEFAULT_DEMO[kind]).read_text(encoding="utf-8"))
    assert (case["case_id"], case["kind"]) == (demo["case_id"], kind)
    assert isinstance(case["title_block"], dict)

    from finkit.case import load_case

    load_case(case)  # the default validates
    # No outputs are stored in the template: a note shows only what it computed.
    assert all(not c.get("outputs") for c in cells if c.cell_type == "code")


@pytest.mark.parametrize("kind", sorted(notes.TEMPLATES_BY_KIND))
def test_every_report_call_names_a_public_function(kind):
    from finkit import report

    for cell in _code_cells(kind):
        for node in ast.walk(ast.parse(cell.source)):
            if (
                isinstance(node, ast.Attribute)
                and isinstance(node.value, ast.Name)
                and node.value.id == "report"
            ):
                assert node.attr in report.__all__, node.attr


# ------------------------------------------------------------------------------------------
# Rendering every demo case (slow: a Jupyter kernel per note)


@pytest.fixture(scope="module")
def rendered(tmp_path_factory):
    out = tmp_path_factory.mktemp("notes")
    done = {}
    for _, path in RENDER_CASES:
        done[path.stem] = notes.render_note(path, out, execution_time=NOTE_TIME)
    return done


def _results_by_model(path: Path) -> dict:
    from finkit.case import load_case
    from finkit.model import run_case

    return run_case(load_case(path)).to_json_dict()


@pytest.mark.slow
@pytest.mark.parametrize("kind, path", RENDER_CASES, ids=[p.stem for _, p in RENDER_CASES])
def test_note_holds_title_results_and_plots_without_code(rendered, kind, path):
    output = rendered[path.stem]
    html = output.html.read_text(encoding="utf-8")
    case = yaml.safe_load(path.read_text(encoding="utf-8"))
    assert notes.check_note_html(html) == []
    assert case["title_block"]["part"] in html  # title block
    assert "Results" in html and "Cautions" in html and "Method" in html
    assert re.search(r"fk-badge-(pass|fail|info)", html)
    plots = re.findall(r'<img[^>]*src="data:image/png;base64,', html)
    assert len(plots) >= MIN_PLOTS[kind]
    assert "data:image/svg+xml," in html  # equations
    assert not re.search(r'class="[^"]*\b(highlight|jp-Editor)\b', html)  # no code shown
    assert "Traceback" not in html and "Error" not in html.split("Provenance")[0][-2000:]


@pytest.mark.slow
@pytest.mark.parametrize("kind, path", RENDER_CASES, ids=[p.stem for _, p in RENDER_CASES])
def test_results_json_agrees_with_the_model(rendered, kind, path):
    output = rendered[path.stem]
    written = json.loads(output.results_json.read_text(encoding="utf-8"))
    expected = _results_by_model(path)
    assert written["status"] == expected["status"]
    assert written["inputs_sha256"] == expected["inputs_sha256"]
    assert written["results"] == expected["results"]  # values equal, not close
    assert written["warnings"] == expected["warnings"]


@pytest.mark.slow
@pytest.mark.parametrize(
    "path", DEMOS.get("heat-sink", []), ids=[p.stem for p in DEMOS.get("heat-sink", [])]
)
def test_heat_sink_note_shows_the_numbers_of_results_json(rendered, path):
    output = rendered[path.stem]
    html = output.html.read_text(encoding="utf-8")
    results = json.loads(output.results_json.read_text(encoding="utf-8"))["results"]
    for name in ("junction_temperature", "limit_temperature", "source_base_temperature"):
        shown = f"{results[name]['value']:.1f}\u00a0°C"
        assert shown in html, (name, shown)
    assert f"{results['allowable_power']['value']:.1f}\u00a0W" in html
    assert f"{results['temperature_margin']['value']:.1f}\u00a0K" in html
    status = json.loads(output.results_json.read_text(encoding="utf-8"))["status"]
    assert f'fk-badge-{status}">{status.upper()}<' in html


@pytest.mark.slow
@pytest.mark.parametrize("kind", sorted(notes.TEMPLATES_BY_KIND))
def test_template_opened_unchanged_runs(kind, tmp_path):
    """Run all cells with the template's own parameters, as in JupyterLab."""
    import papermill

    executed = tmp_path / "executed.ipynb"
    nb = papermill.execute_notebook(
        str(_template(kind)),
        str(executed),
        kernel_name=notes.ensure_kernel(),
        progress_bar=False,
        cwd=str(tmp_path),
    )
    outputs = [o for c in nb.cells if c.cell_type == "code" for o in c.get("outputs", [])]
    assert not [o for o in outputs if o.get("output_type") == "error"]
    html = [o["data"]["text/html"] for o in outputs if "text/html" in o.get("data", {})]
    assert any("DRAFT" in h for h in html)  # no note_time: marked as not issued
    assert sum(h.count("data:image/png;base64,") for h in html) >= MIN_PLOTS[kind]
    assert sorted(p.name for p in tmp_path.iterdir()) == ["executed.ipynb"]  # wrote no file


@pytest.mark.slow
def test_show_code_keeps_the_code_so_the_hidden_code_check_can_fail(tmp_path):
    path = DEMOS["single-fin"][0]
    output = notes.render_note(path, tmp_path, execution_time=NOTE_TIME, show_code=True)
    html = output.html.read_text(encoding="utf-8")
    assert re.search(r'class="[^"]*\b(highlight|jp-Editor)\b', html)
    assert "title_block" in re.sub(r"<[^>]+>", "", html)  # the code text, highlighted


@pytest.mark.parametrize("template", sorted(notes.TEMPLATE_DEFAULTS))
def test_template_default_case_is_its_demo_case(template):
    # Opening a template in JupyterLab and running it unchanged shows the demo scenario; when a
    # demo file changes, run `python -m finkit.notes --sync-defaults`.
    demo = ROOT / notes.TEMPLATE_DEFAULTS[template]
    expected = yaml.safe_load(demo.read_text(encoding="utf-8"))
    assert notes.template_default_case(ROOT / "templates" / template) == expected


@pytest.mark.crosscheck
def test_parameter_names_are_what_papermill_reads_from_every_template():
    # finkit reads a template's parameters cell with ast (no papermill import when checking a
    # template); papermill's own inspect_notebook is the reference.
    import glob

    import nbformat
    import papermill

    from finkit.notes.setup import parameter_names

    root = Path(__file__).resolve().parents[1]
    paths = sorted(glob.glob(str(root / "finkit" / "templates" / "*.ipynb")))
    paths += sorted(glob.glob(str(root / "tests" / "notebooks" / "*.ipynb")))
    checked = 0
    for path in paths:
        nb = nbformat.read(path, as_version=4)
        cells = [c for c in nb.cells if "parameters" in c.get("metadata", {}).get("tags", [])]
        if len(cells) != 1:
            continue
        assert parameter_names(cells[0].source) == set(papermill.inspect_notebook(path)), path
        checked += 1
    assert checked >= 4
    assert parameter_names("a, (b) = 1, 2\nc: int = 3\nd += 1\nif x:\n    e = 4") == {"a", "b", "c"}
