"""The trade-study note: finkit.report.trade, templates/trade_study_note.ipynb, the demo case.

* Agreement with finkit.model.trade (identity): the study, front and chosen design the note shows
  are those of finkit.model.trade called here directly with the demo block's values written out by
  hand (not through the case schema).
* Consistency of the choice: the chosen design is at least as good as every design of the grid
  for the block's objective (lightest meeting the limit, coolest, lightest on the front).
* Template: thin (same AST rule as tests/test_templates.py), the demo case in its parameters
  cell; rendering (slow) through ``finkit note --template trade-study``: safe self-contained
  HTML with the front plots and the chosen design, results.json agreeing with finkit.model.trade;
  headless Chromium shows it without console messages.

Software behaviour only: the physics of every number is tested in test_sink.py, test_trade.py
and the modules they cover.
"""

from __future__ import annotations

import copy
import json
import re
from pathlib import Path

import nbformat
import numpy as np
import pytest
import yaml

from finkit.case import load_case
from finkit.case.bounds import Envelope, ManufacturingBounds
from finkit.errors import InputError
from finkit.model import sink_inputs
from finkit.model.trade import (
    minimise_mass_meeting_limit,
    pareto_front,
    pin_fin_grid,
    plate_fin_grid,
)
from finkit.report import trade as report_trade

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_cases" / "nb200-trade-study.yaml"
TEMPLATE = ROOT / "templates" / "trade_study_note.ipynb"

# The demo block written out by hand in SI (demo_cases/nb200-trade-study.yaml, trade_study).
COUNTS = np.arange(8.0, 31.0)
HEIGHTS = np.linspace(0.010, 0.040, 13)
THICKNESSES = np.linspace(0.0008, 0.002, 7)
BOUNDS = ManufacturingBounds(min_fin_gap=1.5e-3, min_fin_thickness=0.8e-3, max_fin_aspect_ratio=10)
ENVELOPE = Envelope(base_width=0.08, base_length=0.06, base_thickness=0.005, max_height=0.045)


def _raw(path: Path) -> dict:
    return yaml.safe_load(path.read_text(encoding="utf-8"))


@pytest.fixture(scope="module")
def note():
    return report_trade.run(DEMO)


@pytest.fixture(scope="module")
def inputs():
    return sink_inputs(load_case(DEMO))


# ------------------------------------------------------------------------------------------
# Agreement with finkit.model.trade


@pytest.mark.identity
def test_study_is_finkit_trade_on_the_block(note, inputs):
    direct = plate_fin_grid(inputs, COUNTS, HEIGHTS, THICKNESSES, BOUNDS, ENVELOPE)
    assert len(note.study) == len(direct) == 23 * 13 * 7
    np.testing.assert_array_equal(note.study.violations, direct.violations)
    for name in ("sink_resistance", "pressure_drop", "mass", "limit_node_temperature"):
        np.testing.assert_allclose(note.study.column(name), direct.column(name), rtol=1e-12)
    values = np.column_stack(
        [np.where(direct.is_feasible, direct.column(n), np.nan) for n in note.objectives]
    )
    np.testing.assert_array_equal(np.sort(note.front), np.flatnonzero(pareto_front(values)))


@pytest.mark.identity
def test_chosen_design_is_the_optimiser_result(note, inputs):
    optimum = minimise_mass_meeting_limit(
        inputs, BOUNDS, ENVELOPE, min_fin_height=0.010, max_fin_thickness=0.002
    )
    chosen = note.chosen
    assert chosen is not None and note.chosen_error == ""
    assert chosen.design["fin_count"] == optimum.fin_count
    assert chosen.design["fin_thickness"] == pytest.approx(optimum.fin_thickness, rel=1e-12)
    assert chosen.design["fin_height"] == pytest.approx(optimum.fin_height, rel=1e-12)
    # Re-solved as a one-design study: the same numbers as the optimiser's own solve.
    for name in ("mass", "sink_resistance", "pressure_drop", "limit_node_temperature"):
        assert chosen.values[name] == pytest.approx(getattr(optimum, name), rel=1e-9), name
    assert chosen.values["allowable_power"] == pytest.approx(optimum.allowable_power, rel=1e-6)
    assert chosen.active_bounds == optimum.active_bounds
    assert chosen.meets_limit and chosen.violations == ""


def test_chosen_design_is_no_heavier_than_any_grid_design_meeting_the_limit(note):
    study = note.study
    lightest_on_grid = float(np.min(study.mass[study.meets_limit]))
    assert note.chosen.values["mass"] <= lightest_on_grid * (1 + 1e-9)
    # ... and it keeps the required margin (to the optimiser's 1e-6 K).
    assert note.chosen.values["temperature_margin"] >= study.required_margin - 1e-6


def test_case_design_is_the_case_file(note):
    d = note.case_design.design
    assert (d["fin_count"], d["fin_height"], d["fin_thickness"]) == (14.0, 0.03, 0.0012)
    assert note.case_design.values["limit_node_temperature"] == pytest.approx(
        note.result.nominal.results["limit_node_temperature"] + 273.15, rel=1e-9
    )
    assert note.case_design.values["mass"] == pytest.approx(note.result.results["mass"], rel=1e-12)


def _with_block(path: Path, block: dict) -> dict:
    data = copy.deepcopy(_raw(path))
    for name in ("tolerances", "monte_carlo", "scenarios", "measurements", "calibration",
                 "transient"):  # fmt: skip
        data.pop(name, None)
    data["trade_study"] = block
    return data


SMALL_PLATE = {
    "fin_count": {"low": 10, "high": 20},
    "fin_height": {"low": "15 mm", "high": "35 mm", "points": 5},
    "fin_thickness": {"values": ["0.8 mm", "1.2 mm"]},
    "max_height": "45 mm",
}


def test_pareto_objective_picks_the_lightest_front_design_meeting_the_limit():
    note = report_trade.run(
        _with_block(
            ROOT / "demo_cases" / "nb200-plate-fan.yaml", {**SMALL_PLATE, "objective": "pareto"}
        )
    )
    study, i = note.study, note.chosen.grid_index
    assert i in set(note.front.tolist()) and study.meets_limit[i]
    candidates = note.front[study.meets_limit[note.front]]
    assert study.mass[i] == np.min(study.mass[candidates])
    assert note.optimum is None


def test_coolest_objective_is_no_hotter_than_any_grid_design():
    note = report_trade.run(
        _with_block(
            ROOT / "demo_cases" / "nb200-plate-fan.yaml", {**SMALL_PLATE, "objective": "coolest"}
        )
    )
    study = note.study
    coolest_on_grid = float(np.nanmin(study.limit_node_temperature[study.is_feasible]))
    assert note.chosen.values["limit_node_temperature"] <= coolest_on_grid + 1e-9


@pytest.mark.identity
def test_pin_fin_study_agrees_with_finkit_trade():
    block = {
        "pin_diameter": {"values": ["2 mm", "3 mm", "4 mm"]},
        "pin_height": {"values": ["15 mm", "25 mm"]},
        "transverse_pitch": {"values": ["6 mm", "7 mm", "9 mm"]},
        "objective": "lightest-meeting-limit",
    }
    path = ROOT / "demo_cases" / "nb300-pin-ducted.yaml"
    note = report_trade.run(_with_block(path, block))
    direct = pin_fin_grid(
        sink_inputs(load_case(path)),
        [0.002, 0.003, 0.004],
        [0.015, 0.025],
        [0.006, 0.007, 0.009],
        None,
        ManufacturingBounds(),
        Envelope(0.07, 0.07, 0.006, 0.006 + 0.025),  # default envelope: the case's height
    )
    np.testing.assert_allclose(note.study.mass, direct.mass, rtol=1e-12)
    expected = direct.best("mass", require_limit=True)
    assert note.chosen.grid_index == expected
    assert note.chosen.values["mass"] == pytest.approx(direct.mass[expected], rel=1e-12)
    assert plot_has_chosen_star(report_trade.plot_front(note))


def test_natural_convection_study_leaves_out_the_pressure_drop():
    path = ROOT / "demo_cases" / "nb100-natural.yaml"
    note = report_trade.run(
        _with_block(
            path,
            {
                "fin_count": {"low": 6, "high": 16},
                "fin_height": {"values": ["20 mm", "25 mm", "30 mm"]},
                "fin_thickness": {"values": ["1.5 mm", "2 mm"]},
                "max_height": "40 mm",
                "objective": "pareto",
            },
        )
    )
    assert note.objectives == ("sink_resistance", "mass")
    html = str(report_trade.figure_front(note))
    assert html.count("data:image/png;base64,") == 1  # one projection for two objectives


def test_case_without_a_trade_study_block_is_refused():
    with pytest.raises(InputError, match="trade_study"):
        report_trade.run(ROOT / "demo_cases" / "nb200-plate-fan.yaml")


def plot_has_chosen_star(fig) -> bool:
    legend = fig.legends[0] if fig.legends else None
    return legend is not None and any(
        t.get_text().startswith("Chosen design") for t in legend.texts
    )


def test_front_plots_mark_the_chosen_and_the_case_design(note):
    fig = report_trade.plot_front(note, ("sink_resistance", "mass"))
    ax = fig.axes[0]
    assert ax.get_xlabel() == "R_sink [K/W]" and ax.get_ylabel() == "Mass [g]"
    assert plot_has_chosen_star(fig)
    labels = [t.get_text() for t in fig.legends[0].texts]
    assert "Case design" in labels and any(
        label.startswith("On the Pareto front") for label in labels
    )
    star = (note.chosen.values["sink_resistance"], note.chosen.values["mass"] * 1e3)
    offsets = [tuple(c.get_offsets()[0]) for c in ax.collections if len(c.get_offsets()) == 1]
    assert any(np.allclose(o, star) for o in offsets)


def test_tables_show_the_chosen_design(note):
    table = str(report_trade.comparison_table(note))
    assert "Chosen design" in table and "Case design" in table
    assert f"{note.chosen.values['mass'] * 1e3:.0f}\u00a0g" in table
    headline = str(report_trade.headline(note))
    assert "fk-badge-pass" in headline and f"{note.chosen.design['fin_count']:.0f} fins" in headline
    feasibility = str(report_trade.feasibility_table(note))
    assert f">{len(note.study)}<" in feasibility
    assert "bypass" in str(report_trade.cautions(note))  # the demo has bypass gaps


# ------------------------------------------------------------------------------------------
# Template


def test_template_is_thin_with_the_demo_case():
    from test_templates import _thin_code_problems

    nb = nbformat.read(TEMPLATE, as_version=4)
    code = [c for c in nb.cells if c.cell_type == "code"]
    for index, cell in enumerate(code):
        assert not _thin_code_problems(cell.source), (index, _thin_code_problems(cell.source))
        assert not cell.get("outputs")
    for cell in nb.cells:
        if cell.cell_type == "markdown":
            assert "$" not in cell.source and not re.search(r"<\s*[a-zA-Z]", cell.source)
    tagged = [c for c in code if "parameters" in c.metadata.get("tags", [])]
    assert len(tagged) == 1
    namespace: dict = {}
    exec(compile(tagged[0].source, "parameters", "exec"), {}, namespace)  # literals only
    assigned = {name for name in namespace if not name.startswith("__")}
    assert assigned == {"case", "note_time"} and namespace["note_time"] == ""
    assert namespace["case"] == _raw(DEMO)
    import ast

    from finkit import report

    for cell in code:
        for node in ast.walk(ast.parse(cell.source)):
            if isinstance(node, ast.Attribute) and isinstance(node.value, ast.Name):
                if node.value.id == "trade_report":
                    assert node.attr in report_trade.__all__, node.attr
                if node.value.id == "report":
                    assert node.attr in report.__all__, node.attr


# ------------------------------------------------------------------------------------------
# Rendering (slow)


@pytest.fixture(scope="module")
def rendered(tmp_path_factory):
    from finkit import cli

    out = tmp_path_factory.mktemp("trade-note")
    code = cli.main(["note", str(DEMO), "--template", "trade-study", "--out", str(out)])
    assert code == 0
    return out / "nb200-trade-study"


@pytest.mark.slow
def test_rendered_note_has_the_front_and_the_chosen_design(rendered, note):
    from finkit import notes

    html = (rendered / "note.html").read_text(encoding="utf-8")
    assert notes.check_note_html(html) == []
    assert "4. Pareto front" in html and "Chosen design" in html
    plots = re.findall(r'<img[^>]*src="data:image/png;base64,', html)
    assert len(plots) == 4  # three projections and the design space
    c = note.chosen
    assert (
        f"{c.design['fin_count']:.0f} fins, {c.design['fin_thickness'] * 1e3:.2f} mm thick" in html
    )
    assert "trade_study_note.ipynb" in html  # provenance names the template
    assert "Traceback" not in html


@pytest.mark.slow
@pytest.mark.identity
def test_results_json_agrees_with_finkit_trade(rendered, inputs):
    data = json.loads((rendered / "results.json").read_text(encoding="utf-8"))
    trade = data["trade_study"]
    optimum = minimise_mass_meeting_limit(
        inputs, BOUNDS, ENVELOPE, min_fin_height=0.010, max_fin_thickness=0.002
    )
    assert trade["objective"] == "lightest-meeting-limit" and trade["designs"] == 23 * 13 * 7
    chosen = trade["chosen"]
    assert chosen["design"]["fin_count"] == optimum.fin_count
    assert chosen["design"]["fin_height"] == pytest.approx(optimum.fin_height, rel=1e-12)
    assert chosen["results"]["mass"] == pytest.approx(optimum.mass, rel=1e-9)
    assert chosen["results"]["junction_temperature"] == pytest.approx(
        optimum.junction_temperature - 273.15, rel=1e-9
    )
    assert data["status"] in ("pass", "fail") and data["case"] == "nb200-trade-study"


@pytest.mark.slow
def test_browser_shows_the_note_without_console_messages(rendered, tmp_path):
    import browser

    if not browser.chromium_available():
        pytest.fail(f"{browser.CHROMIUM} is missing: run .ci/ensure_chromium.sh")
    png = tmp_path / "note.png"
    run = browser.screenshot(rendered / "note.html", png, width=1100, height=4000)
    assert run.returncode == 0, run.stderr[-2000:]
    assert run.console == []
    assert browser.non_white_fraction(png, threshold=128) > 0.005


@pytest.mark.slow
def test_template_opened_unchanged_runs(tmp_path):
    """Run all cells with the template's own parameters, as in JupyterLab."""
    import papermill

    from finkit import notes

    nb = papermill.execute_notebook(
        str(TEMPLATE),
        str(tmp_path / "executed.ipynb"),
        kernel_name=notes.ensure_kernel(),
        progress_bar=False,
        cwd=str(tmp_path),
    )
    outputs = [o for c in nb.cells if c.cell_type == "code" for o in c.get("outputs", [])]
    assert not [o for o in outputs if o.get("output_type") == "error"]
    html = [o["data"]["text/html"] for o in outputs if "text/html" in o.get("data", {})]
    assert any("DRAFT" in h for h in html)  # no note_time: marked as not issued
    assert sum(h.count("data:image/png;base64,") for h in html) == 4
    assert sorted(p.name for p in tmp_path.iterdir()) == ["executed.ipynb"]  # wrote no file
