"""One solve per note, and the shortcuts that keep a note's numbers unchanged (issue 15).

``finkit note`` solves a case once in the parent (for results.json) and hands that solution to
the kernel; a revision comparison solves its trial cases without the review work; a previous
revision and the equations are solved once per content; a plotted range that fails at one end
is split in halves rather than solved point by point. These are tests of software behaviour:
each shortcut must give exactly what the long way gives (the long way is the reference, and the
physics of the long way is checked against published sources in the other test files).
"""

from __future__ import annotations

import pickle
import shutil
from pathlib import Path

import numpy as np
import pytest

import finkit.model
import finkit.model.run
import finkit.model.sweeps
from finkit import report
from finkit.case import load_case
from finkit.errors import PropertyRangeError
from finkit.model import governing_results, handover, run_case
from finkit.report import compare, present

DEMO = Path(__file__).resolve().parent.parent / "demo_cases"


def test_solved_result_round_trips_for_the_same_inputs(tmp_path, plate_fin_demo):
    case, result = plate_fin_demo
    path = handover.write_solved(tmp_path / handover.SOLVED_PICKLE, case, result, comparison="x")
    payload = handover.read_solved(str(path), load_case(DEMO / "nb200-plate-fan.yaml"))
    assert payload is not None and payload["comparison"] == "x"
    assert payload["result"].results == result.results
    assert payload["result"].warnings == result.warnings


def test_solved_result_is_refused_for_anything_else(tmp_path, plate_fin_demo, monkeypatch):
    case, result = plate_fin_demo
    path = handover.write_solved(tmp_path / handover.SOLVED_PICKLE, case, result)
    other = load_case(DEMO / "nb200-plate-fan-rev-a.yaml")
    assert handover.read_solved(str(path), other) is None  # other inputs
    assert handover.read_solved(str(tmp_path / "missing.pickle"), case) is None  # scratch gone
    assert handover.read_solved("", case) is None and handover.read_solved(None, case) is None
    torn = tmp_path / "torn.pickle"
    torn.write_bytes(path.read_bytes()[:100])
    assert handover.read_solved(str(torn), case) is None  # half-written file
    foreign = tmp_path / "foreign.pickle"
    foreign.write_bytes(pickle.dumps({"result": result}))
    assert handover.read_solved(str(foreign), case) is None  # no format, version or hash
    monkeypatch.setattr(finkit, "__version__", "0.0.0-other")
    assert handover.read_solved(str(path), case) is None  # written by another finkit version


def test_report_run_takes_the_handed_result_without_solving(tmp_path, plate_fin_demo, monkeypatch):
    case, result = plate_fin_demo
    path = handover.write_solved(tmp_path / handover.SOLVED_PICKLE, case, result)

    def no_solve(*args, **kwargs):
        raise AssertionError("the kernel solved the case again")

    monkeypatch.setattr(finkit.model.run, "run_case", no_solve)
    handed = report.run(dict(case.entered), solved=str(path))
    assert handed.results == result.results


def test_report_run_solves_when_the_handed_result_is_for_other_inputs(tmp_path, plate_fin_demo):
    case, result = plate_fin_demo
    other = load_case(DEMO / "nb200-plate-fan-rev-a.yaml")
    path = handover.write_solved(tmp_path / handover.SOLVED_PICKLE, other, run_case(other))
    solved = report.run(dict(case.entered), solved=str(path))
    assert solved.results == result.results


@pytest.mark.parametrize("name", sorted(p.stem for p in DEMO.glob("*.yaml")))
def test_governing_results_are_run_case_results(name):
    case = load_case(DEMO / f"{name}.yaml")
    assert governing_results(case) == run_case(case).results


@pytest.mark.parametrize(
    "name",
    sorted(
        p.stem for p in DEMO.glob("*.yaml") if "kind: heat-sink" in p.read_text(encoding="utf-8")
    ),
)
def test_a_full_solution_gives_the_attributions_governing_margin(name):
    """The attribution takes a case's margin from its full solution (compare.remember_margin)
    instead of solving the case again without its Monte Carlo, tolerances and transient."""
    case = load_case(DEMO / f"{name}.yaml")
    compare._MARGINS.clear()
    compare.remember_margin(case.entered, run_case(case).results)
    kept = dict(compare._MARGINS)
    compare._MARGINS.clear()
    compare._governing_margin(case.entered)  # the long way
    assert compare._MARGINS == kept and len(kept) == 1


def test_previous_revision_is_solved_again_when_its_file_changes(tmp_path):
    source = tmp_path / "rev.yaml"
    shutil.copy(DEMO / "nb200-plate-fan-rev-a.yaml", source)
    first = compare.load_revision(source)
    again = compare.load_revision(source)
    assert again.results == first.results and again is not first
    text = source.read_text(encoding="utf-8").replace("power: 38 W", "power: 30 W", 1)
    assert text != source.read_text(encoding="utf-8")
    source.write_text(text, encoding="utf-8")
    edited = compare.load_revision(source)
    assert edited.results["results"] != first.results["results"]
    assert edited.entered["source"]["power"] == "30 W"


def test_equation_images_are_the_same_each_time():
    present._equation_uri.cache_clear()
    first = str(present.equation(r"\eta = \dfrac{\tanh(m L)}{m L}", label="(1)"))
    second = str(present.equation(r"\eta = \dfrac{\tanh(m L)}{m L}", label="(1)"))
    assert first == second and present._equation_uri.cache_info().hits == 1


def test_an_equation_is_rendered_once_and_then_read_from_the_cache(tmp_path, monkeypatch):
    import matplotlib.mathtext

    monkeypatch.setenv("FINKIT_CACHE_DIR", str(tmp_path))
    latex = r"q = h\,A\,(T_s - T_\infty)"
    present._equation_uri.cache_clear()
    fresh = str(present.equation(latex))
    assert len(list((tmp_path / "equations").glob("*.txt"))) == 1

    def no_rendering(*args, **kwargs):
        raise AssertionError("rendered again")

    monkeypatch.setattr(matplotlib.mathtext, "math_to_image", no_rendering)
    present._equation_uri.cache_clear()
    assert str(present.equation(latex)) == fresh  # the same image, from the file
    # another renderer (this module changed, or another matplotlib) never reads that file
    monkeypatch.setattr(present, "_renderer_digest", lambda: "another renderer")
    present._equation_uri.cache_clear()
    with pytest.raises(AssertionError, match="rendered again"):
        present.equation(latex)


def test_an_unwritable_equation_cache_only_costs_the_rendering(tmp_path, monkeypatch):
    blocked = tmp_path / "a-file"
    blocked.write_text("not a folder")
    monkeypatch.setenv("FINKIT_CACHE_DIR", str(blocked))
    present._equation_uri.cache_clear()
    assert "data:image/svg+xml," in str(present.equation(r"x^2"))


def test_note_sweep_splits_a_failing_range_in_halves(monkeypatch):
    calls = []

    def fake_sweep(inputs, name, values):
        values = np.asarray(values, float)
        calls.append(values.size)
        if np.any(values < 10.0):
            raise PropertyRangeError("air hotter than the table")
        return {"values": values, "allowable_power": 2.0 * values}

    monkeypatch.setattr(finkit.model.sweeps, "sweep", fake_sweep)
    values = np.arange(64.0)
    out = finkit.model.note_sweep(None, "airflow", values)
    assert np.all(np.isnan(out["allowable_power"][:10]))
    np.testing.assert_array_equal(out["allowable_power"][10:], 2.0 * values[10:])
    assert len(calls) < 30  # point by point would take 65 calls
    monkeypatch.setattr(
        finkit.model.sweeps,
        "sweep",
        lambda *a: (_ for _ in ()).throw(PropertyRangeError("every point fails")),
    )
    with pytest.raises(PropertyRangeError, match="every point fails"):
        finkit.model.note_sweep(None, "airflow", values)


def test_unique_rows_groups_as_numpy_unique():
    from finkit.physics.spreading import _unique_rows

    rng = np.random.default_rng(7)
    for count in (1, 7, 5000):
        rows = rng.integers(0, 3, (count, 5)).astype(float) * 1e-3
        unique, inverse = _unique_rows(rows)
        reference, reference_inverse = np.unique(rows, axis=0, return_inverse=True)
        np.testing.assert_array_equal(unique, reference)
        np.testing.assert_array_equal(inverse, reference_inverse.ravel())
