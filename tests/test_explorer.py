"""The design explorer (finkit.explorer), run headless: no browser, no front end.

* Identity: for every heat-sink demo case, the numbers the explorer shows equal those of
  finkit.model.run_case on an equivalent case built here, independently of the explorer, from
  the case file with the one changed value written in its unit -- at start and after each
  control is moved. The explorer has no physics of its own, so agreement must be exact (to
  round-off).
* Save as case: the file validates, holds the same SI values as the equivalent case (same
  canonical-input SHA-256), keeps unchanged fields as written, and ``finkit check`` accepts it.
* Behaviour: units on every control, finish options follow the material, invalid settings are
  reported and recoverable, the template stays thin and runs, ``finkit lab`` copies without
  overwriting.

These tests check software behaviour (the physics of every number is tested where it is
computed); timing is measured in bench/bench_explorer.py, not asserted.
"""

from __future__ import annotations

import copy
import re
from pathlib import Path

import nbformat
import pytest
import yaml

from finkit import cli
from finkit.case import case_inputs_sha256, load_case
from finkit.errors import InputError
from finkit.explorer import Explorer, explore
from finkit.model import run_case

ROOT = Path(__file__).resolve().parent.parent
DEMO_CASES = ROOT / "demo_cases"
HEAT_SINK_DEMOS = [
    p
    for p in sorted(DEMO_CASES.glob("*.yaml"))
    if yaml.safe_load(p.read_text(encoding="utf-8"))["kind"] == "heat-sink"
]
IDS = [p.stem for p in HEAT_SINK_DEMOS]

# Where each control's value lives in a case file and the unit the test writes it in. Written
# out here on purpose (not taken from finkit.explorer) so the mapping itself is under test.
PATHS = {
    "fin_count": (("sink", "fins", "count"), None),
    "fin_height": (("sink", "fins", "height"), "mm"),
    "fin_thickness": (("sink", "fins", "thickness"), "mm"),
    "pin_diameter": (("sink", "pins", "diameter"), "mm"),
    "pin_height": (("sink", "pins", "height"), "mm"),
    "transverse_pitch": (("sink", "pins", "transverse_pitch"), "mm"),
    "longitudinal_pitch": (("sink", "pins", "longitudinal_pitch"), "mm"),
    "base_thickness": (("sink", "base", "thickness"), "mm"),
    "material": (("sink", "material"), None),
    "finish": (("sink", "finish"), None),
    "fan_pressure_factor": (("air", "flow", "fan", "pressure_factor"), None),
    "fan_count": (("air", "flow", "fan", "count"), None),
    "volume_flow": (("air", "flow", "volume_flow"), "CFM"),
    "approach_velocity": (("air", "flow", "approach_velocity"), "m/s"),
    "inlet_temperature": (("air", "inlet_temperature"), "degC"),
    "altitude": (("air", "altitude"), "m"),
    "power": (("source", "power"), "W"),
}

# A new value for each control (in the control's unit), inside its range for every demo.
NEW_VALUES = {
    "fin_count": 12,
    "fin_height": 22.5,
    "fin_thickness": 1.6,
    "pin_diameter": 3.5,
    "pin_height": 20.0,
    "transverse_pitch": 8.0,
    "longitudinal_pitch": 7.5,
    "base_thickness": 4.0,
    "fan_pressure_factor": 0.85,
    "fan_count": 3,
    "volume_flow": 10.0,
    "approach_velocity": 1.5,
    "inlet_temperature": 35.5,
    "altitude": 1500.0,
    "power": 30.5,
}

SHOWN = Explorer.SHOWN


def _raw(path: Path) -> dict:
    return yaml.safe_load(path.read_text(encoding="utf-8"))


def _put(data: dict, path: tuple[str, ...], value) -> None:
    node = data
    for key in path[:-1]:
        node = node.setdefault(key, {})
    node[path[-1]] = value


def _equivalent(path: Path, *, nominal: bool = False, **values) -> dict:
    """The demo case with the given control values written into it, as a user would.

    ``nominal`` leaves out the Monte Carlo blocks (tolerances, monte_carlo), which do not enter
    the nominal numbers (the start-up test compares with the full case) and take most of the
    time of run_case.
    """
    data = copy.deepcopy(_raw(path))
    if nominal:
        data.pop("tolerances", None)
        data.pop("monte_carlo", None)
    for name, value in values.items():
        where, unit = PATHS[name]
        _put(data, where, value if unit is None else f"{value} {unit}")
    if "inlet_temperature" in values and "surroundings_temperature" in data["air"]:
        # The explorer keeps the case's surroundings-to-inlet offset (documented behaviour).
        case = load_case(copy.deepcopy(_raw(path)))
        offset = case.air.surroundings_temperature - case.air.inlet_temperature
        _put(
            data,
            ("air", "surroundings_temperature"),
            f"{values['inlet_temperature'] + offset} degC",
        )
    return data


def _assert_same_numbers(explorer: Explorer, expected: dict) -> None:
    assert explorer.error == ""
    for name in SHOWN:
        shown, wanted = explorer.numbers[name], expected[name]
        if wanted is None:
            assert shown is None, name
        else:
            assert shown == pytest.approx(wanted, rel=1e-9, abs=1e-12), name


@pytest.fixture(scope="module", params=HEAT_SINK_DEMOS, ids=IDS)
def demo(request):
    return request.param, explore(request.param)


# ------------------------------------------------------------------------------------------
# Identity with finkit.model.run_case


@pytest.mark.identity
def test_numbers_at_start_are_those_of_run_case(demo):
    path, explorer = demo
    explorer.reset()
    _assert_same_numbers(explorer, run_case(load_case(path)).nominal.results)
    assert explorer.result.status in ("pass", "fail")


@pytest.mark.identity
@pytest.mark.slow
def test_each_control_moved_gives_the_numbers_of_the_equivalent_case(demo):
    path, explorer = demo
    numeric = [n for n in explorer.controls if n in NEW_VALUES]
    assert numeric, "no control to move"
    for name in numeric:
        explorer.reset()
        explorer.controls[name].value = NEW_VALUES[name]  # as a user would: the observer updates
        assert explorer.controls[name].value == NEW_VALUES[name], name
        explorer.update()
        equivalent = _equivalent(path, nominal=True, **{name: NEW_VALUES[name]})
        expected = run_case(load_case(equivalent)).nominal.results
        _assert_same_numbers(explorer, expected)
    explorer.reset()


@pytest.mark.identity
@pytest.mark.slow
def test_material_and_finish_controls_give_the_equivalent_case(demo):
    path, explorer = demo
    explorer.reset()
    explorer.set(material="copper-c11000", finish="oxidised")
    expected = run_case(
        load_case(_equivalent(path, nominal=True, material="copper-c11000", finish="oxidised"))
    ).nominal.results
    _assert_same_numbers(explorer, expected)
    explorer.reset()
    explorer.controls["finish"].value = "bare"
    expected = run_case(load_case(_equivalent(path, nominal=True, finish="bare"))).nominal.results
    _assert_same_numbers(explorer, expected)
    explorer.reset()


def test_every_control_shows_its_unit(demo):
    _, explorer = demo
    for name, control in explorer.controls.items():
        assert re.search(r"\[[^\]]+\]$", control.description), (name, control.description)
    labels = [label for label, _ in explorer.controls["material"].options]
    assert all(re.search(r"\(k \d+\)$", label) for label in labels)  # conductivity, W/(m·K)
    labels = [label for label, _ in explorer.controls["finish"].options]
    assert all(re.search(r"\(ε 0\.\d\d\)$", label) for label in labels)


def test_finish_options_follow_the_material(demo):
    from finkit.physics.properties.materials import get_material

    _, explorer = demo
    explorer.reset()
    explorer.controls["material"].value = "copper-c11000"  # has no anodised finish
    finishes = [key for _, key in explorer.controls["finish"].options]
    assert finishes == list(get_material("copper-c11000").emissivity)
    assert explorer.controls["finish"].value in finishes
    assert explorer.error == ""
    explorer.reset()
    assert explorer.controls["finish"].value == explorer.specs["finish"].value


def test_settings_that_make_no_valid_case_are_reported_then_recovered():
    explorer = explore(DEMO_CASES / "nb200-plate-fan.yaml")
    maximum = explorer.controls["fin_count"].max
    explorer.set(fin_count=maximum, fin_thickness=explorer.controls["fin_thickness"].max)
    assert explorer.result is None and explorer.numbers == {}
    assert "sink.fins" in explorer.error and "do not fit" in explorer.error
    assert "cannot be solved" in explorer._readout.value
    assert explorer.reset() is not None and explorer.error == ""


def test_set_rejects_an_unknown_control():
    explorer = explore(DEMO_CASES / "nb300-pin-ducted.yaml")
    with pytest.raises(InputError, match="fin_height"):
        explorer.set(fin_height=20)  # a pin-fin sink has a pin height, not a fin height


def test_single_fin_case_is_refused():
    from finkit.errors import NotSupportedError

    with pytest.raises(NotSupportedError, match="heat-sink"):
        explore(DEMO_CASES / "nb-fin-study.yaml")


def test_plots_and_widget_exist_headless(tmp_path):
    explorer = explore(DEMO_CASES / "nb200-plate-fan.yaml")
    png = explorer.save_figure(tmp_path / "explorer.png")
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    assert explorer._image.value[:8] == b"\x89PNG\r\n\x1a\n"
    titles = [ax.get_title(loc="left") for ax in explorer.figure.axes]
    assert any("Allowable power" in t for t in titles)
    assert any("Fan and system curves" in t for t in titles)
    assert any("Fin efficiency" in t for t in titles)
    bundle = explorer._repr_mimebundle_()
    assert "application/vnd.jupyter.widget-view+json" in bundle
    assert f"{explorer.numbers['junction_temperature']:.1f} °C" in explorer._readout.value
    assert explorer.seconds > 0


# ------------------------------------------------------------------------------------------
# Save as case


CHANGES = {
    "fin_height": 25.5,
    "fin_count": 16,
    "inlet_temperature": 42.5,
    "fan_pressure_factor": 0.9,
    "power": 45.5,
    "altitude": 1200.0,
}


def test_save_case_round_trips(tmp_path, capsys):
    path = DEMO_CASES / "nb200-plate-fan.yaml"
    explorer = explore(path)
    explorer.set(**CHANGES)
    saved = explorer.save_case(tmp_path / "explored.yaml", case_id="nb200-explored")
    case = load_case(saved)
    expected = _equivalent(path, **CHANGES)
    expected["case_id"] = "nb200-explored"
    assert case_inputs_sha256(case) == case_inputs_sha256(load_case(expected))
    assert case.sink.fins.height == pytest.approx(0.0255, rel=1e-12)
    assert case.air.inlet_temperature == pytest.approx(273.15 + 42.5, rel=1e-12)
    text = saved.read_text(encoding="utf-8")
    entered = yaml.safe_load(text)
    assert entered["sink"]["fins"]["height"] == "25.5 mm"  # changed: the control's unit
    assert entered["sink"]["base"]["width"] == "80 mm"  # unchanged: as written
    assert entered["scenarios"] == _raw(path)["scenarios"]  # other blocks kept
    assert "sink.fins.height: '30 mm' -> '25.5 mm'" in text  # the header lists the change
    # The saved case gives the numbers the explorer showed.
    _assert_same_numbers(explorer, run_case(case).nominal.results)
    # finkit check accepts it (0 pass, 1 fail; 2 would be an input error).
    assert cli.main(["check", str(saved)]) in (0, 1)
    assert "nb200-explored" in capsys.readouterr().out


def test_save_case_refuses_to_overwrite_or_to_write_an_invalid_case(tmp_path):
    explorer = explore(DEMO_CASES / "nb200-plate-fan.yaml")
    target = tmp_path / "case.yaml"
    target.write_text("mine", encoding="utf-8")
    with pytest.raises(InputError, match="exists"):
        explorer.save_case(target)
    assert target.read_text(encoding="utf-8") == "mine"
    explorer.set(fan_count=1)  # the demo's one-fan-failed scenario needs two fans
    with pytest.raises(InputError, match="failed_fans"):
        explorer.save_case(tmp_path / "other.yaml")
    assert not (tmp_path / "other.yaml").exists()
    explorer.reset()
    # The saved case is a case of its own: never the original's id (its notes would overwrite
    # the original's folder); by default it takes the file's name.
    with pytest.raises(InputError, match="is the original case's"):
        explorer.save_case(tmp_path / "nb200-plate-fan.yaml")
    with pytest.raises(InputError, match="is the original case's"):
        explorer.save_case(tmp_path / "x.yaml", case_id="nb200-plate-fan")
    explorer.save_case(target, overwrite=True)
    assert load_case(target).case_id == "case"


def test_set_accepts_unit_strings_and_shows_a_finish_it_had_to_change():
    explorer = explore(DEMO_CASES / "nb200-plate-fan.yaml")
    explorer.set(fin_height="1.5 in")  # Source: 1 in = 25.4 mm exactly (1959 agreement)
    assert explorer.controls["fin_height"].value == pytest.approx(38.1)
    with pytest.raises(InputError, match="explorer.fin_count"):
        explorer.set(fin_count="many")
    explorer.reset()
    assert explorer.notice == ""
    explorer.set(material="copper-c11000")
    finish = explorer.controls["finish"].value
    if finish != "anodised-black":  # copper has no anodised finish in the material table
        assert "Finish changed from anodised-black to" in explorer.notice
        assert explorer.notice in explorer._message.value


def test_save_button_reports_what_it_did(tmp_path):
    explorer = explore(DEMO_CASES / "nb100-natural.yaml")
    explorer._save_path.value = str(tmp_path / "saved.yaml")
    explorer._save_button.click()
    assert "Saved" in explorer._message.value and (tmp_path / "saved.yaml").is_file()
    explorer._save_button.click()  # exists, overwrite not ticked
    assert "Not saved" in explorer._message.value


# ------------------------------------------------------------------------------------------
# Template and finkit lab


def _explorer_template():
    return nbformat.read(ROOT / "templates" / "explorer.ipynb", as_version=4)


def test_explorer_template_is_thin_and_opens_the_demo_case():
    from test_templates import _thin_code_problems

    nb = _explorer_template()
    code = [c for c in nb.cells if c.cell_type == "code"]
    for index, cell in enumerate(code):
        assert not _thin_code_problems(cell.source), (index, _thin_code_problems(cell.source))
        assert not cell.get("outputs")
    tagged = [c for c in code if "parameters" in c.metadata.get("tags", [])]
    assert len(tagged) == 1
    namespace: dict = {}
    exec(compile(tagged[0].source, "parameters", "exec"), {}, namespace)  # literals only
    assert namespace["case"] == _raw(DEMO_CASES / "nb200-plate-fan.yaml")
    assert any("explore(case)" in c.source for c in code)


@pytest.mark.slow
def test_explorer_template_runs_and_shows_the_widget(tmp_path):
    import papermill

    from finkit import notes

    executed = tmp_path / "executed.ipynb"
    nb = papermill.execute_notebook(
        str(ROOT / "templates" / "explorer.ipynb"),
        str(executed),
        kernel_name=notes.ensure_kernel(),
        progress_bar=False,
        cwd=str(tmp_path),
    )
    outputs = [o for c in nb.cells if c.cell_type == "code" for o in c.get("outputs", [])]
    assert not [o for o in outputs if o.get("output_type") == "error"]
    assert any("application/vnd.jupyter.widget-view+json" in o.get("data", {}) for o in outputs)


def test_lab_copies_the_templates_without_overwriting_your_copies(tmp_path, capsys):
    folder = tmp_path / "lab"
    templates = sorted(p.name for p in (ROOT / "templates").glob("*.ipynb"))
    assert cli.main(["lab", "--copy-only", "--dir", str(folder)]) == 0
    assert sorted(p.name for p in folder.iterdir()) == templates
    mine = folder / "explorer.ipynb"
    mine.write_text("my edits", encoding="utf-8")
    assert cli.main(["lab", "--copy-only", "--dir", str(folder)]) == 0
    assert mine.read_text(encoding="utf-8") == "my edits"
    assert "kept your copy" in capsys.readouterr().out
    assert cli.main(["lab", "--copy-only", "--force", "--dir", str(folder)]) == 0
    assert mine.read_bytes() == (ROOT / "templates" / "explorer.ipynb").read_bytes()


def test_lab_without_jupyterlab_says_so_in_one_line(tmp_path, capsys, monkeypatch):
    import importlib.util

    real = importlib.util.find_spec
    monkeypatch.setattr(
        importlib.util, "find_spec", lambda name, *a: None if name == "jupyterlab" else real(name)
    )
    assert cli.main(["lab", "--dir", str(tmp_path / "lab")]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "JupyterLab is not installed" in err[0] and "pip install" in err[0]


def test_us_units_change_the_display_not_the_case(tmp_path):
    # Display toggle (issue 14): the case is the same in SI and US customary units; a control
    # left alone stays exactly at the case's value, set() takes US strings, and a saved case
    # writes the changed value in the unit shown. 1 in = 25.4 mm, T[°F] = 1.8 T[°C] + 32
    # (NIST SP 811, Appendix B; exact by definition).
    e = explore(DEMO_CASES / "nb200-plate-fan.yaml")
    before = dict(e.numbers)
    e.set_unit_system("US")
    assert e.controls["fin_height"].description == "Fin height [in]"
    assert e.controls["fin_height"].value == pytest.approx(30 / 25.4)
    assert e.controls["inlet_temperature"].value == pytest.approx(50 * 1.8 + 32)
    assert e.changes() == [] and e.numbers == before
    assert "°F" in e._readout.value and "°C" not in e._readout.value
    e.set(fin_height="1.5 in")
    assert e.changes() == [("sink.fins.height", "30 mm", "1.5 in")]
    saved = e.save_case(tmp_path / "us.yaml")
    assert "height: 1.5 in" in saved.read_text(encoding="utf-8")
    e.set_unit_system("SI")
    assert e.controls["fin_height"].value == pytest.approx(38.0)  # 38.1 mm on the 0.5 mm step
    e.reset()
    assert e.changes() == [] and e.numbers == before
    with pytest.raises(InputError, match="allowed: SI, US"):
        e.set_unit_system("imperial")
