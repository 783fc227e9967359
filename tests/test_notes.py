"""Tests of the calculation-note machinery (finkit.notes, finkit.report.present).

These are tests of software behaviour, not of physics: the expected values are the documented
contract of finkit.notes (files written, escaping, self-containment, failure handling), checked
on the tiny notebooks in tests/notebooks/. Tests that start a Jupyter kernel or a browser are
marked ``slow``; the browser tests need /usr/bin/chromium (.ci/ensure_chromium.sh installs it).
"""

from __future__ import annotations

import datetime as dt
import hashlib
import json
import os
import re
from importlib.metadata import version
from pathlib import Path
from urllib.parse import unquote
from xml.etree import ElementTree

import nbformat
import pytest

from finkit import notes
from finkit.errors import FinkitError, InputError, NotSupportedError
from finkit.report import present

HERE = Path(__file__).resolve().parent
NOTEBOOKS = HERE / "notebooks"
DEMO_CASES = HERE.parent / "demo_cases"
NOTE_TIME = "2025-03-14T09:30:00+01:00"
XSS_TITLE = "<script>alert(1)</script> & <b>co</b>"
RESULTS = {"status": "pass", "results": {"thermal_resistance": {"value": 0.42, "unit": "K/W"}}}


def fixture_case(case_id="fixture-1", **extra):
    return {"case_id": case_id, "kind": "heat-sink", "title": XSS_TITLE, **extra}


def render(case, out_dir, template="simple.ipynb", **kwargs):
    kwargs.setdefault("execution_time", NOTE_TIME)
    kwargs.setdefault("validate", False)
    kwargs.setdefault("results", lambda validated: RESULTS)
    return notes.render_note(case, out_dir, template=NOTEBOOKS / template, **kwargs)


def external_loads(html: str) -> list[str]:
    """src/href values of <script>, <link> and <img> elements that point at the network."""
    found = []
    for tag in re.finditer(r"<(script|link|img)\b[^>]*>", html, flags=re.IGNORECASE):
        for attr in re.finditer(r"\b(src|href)\s*=\s*[\"']?([^\"'\s>]+)", tag.group(0), re.I):
            if re.match(r"(https?:)?//", attr.group(2), re.IGNORECASE):
                found.append(attr.group(0))
    return found


def folder_listing(folder: Path) -> set[str]:
    return {p.name for p in folder.iterdir()}


# ------------------------------------------------------------------------------------------
# present: escaping and building blocks (no kernel)


def test_escape_turns_markup_into_text():
    assert present.escape(XSS_TITLE) == (
        "&lt;script&gt;alert(1)&lt;/script&gt; &amp; &lt;b&gt;co&lt;/b&gt;"
    )
    assert present.escape("a \"quoted\" 'value'") == "a &quot;quoted&quot; &#x27;value&#x27;"
    badge = present.badge(True)
    assert present.escape(badge) == str(badge)  # fragments pass through unchanged


def test_text_heading_and_tables_escape_case_text():
    for fragment in (
        present.text(XSS_TITLE),
        present.heading(XSS_TITLE, 1),
        present.html_table([[XSS_TITLE, 1]], header=[XSS_TITLE], caption=XSS_TITLE),
        present.key_value_table({XSS_TITLE: XSS_TITLE}),
        present.badge("fail", label=XSS_TITLE),
    ):
        markup = fragment._repr_html_()
        assert "<script" not in markup
        assert "<b>co" not in markup
        assert "&lt;script&gt;alert(1)&lt;/script&gt;" in markup


def test_html_table_formats_cells():
    markup = str(
        present.html_table(
            [["fins", 12, 0.912345, None, True, present.badge(False)]],
            header=["name", "count", "efficiency", "missing", "flag", "status"],
        )
    )
    assert '<td class="fk-num">12</td>' in markup
    assert '<td class="fk-num">0.9123</td>' in markup  # 4 significant figures
    assert "<td>—</td>" in markup and "<td>yes</td>" in markup
    assert '<span class="fk-badge fk-badge-fail">FAIL</span>' in markup
    assert markup.count("<th>") == 6


def test_badge_statuses():
    assert "fk-badge-pass" in str(present.badge(True))
    assert "fk-badge-fail" in str(present.badge(False))
    assert "fk-badge-warn" in str(present.badge(None))
    assert ">INFO<" in str(present.badge("info"))
    with pytest.raises(ValueError, match="badge status"):
        present.badge("maybe")


def test_equation_is_an_inline_svg_image_without_network():
    fragment = str(present.equation(r"\eta_f = \dfrac{\tanh(m L_c)}{m L_c}", label="(3.89)"))
    match = re.search(r'src="data:image/svg\+xml,([^"]+)"', fragment)
    assert match, fragment[:200]
    svg = unquote(match.group(1))  # percent-encoded, not base64 (a third smaller)
    root = ElementTree.fromstring(svg)  # well-formed SVG
    assert root.tag.endswith("svg")
    assert "<path" in svg  # glyphs as paths: no font needed on the reader's machine
    assert "(3.89)" in fragment
    assert 'alt="\\eta_f' in fragment
    assert notes.check_note_html(fragment) == []


def test_figure_embeds_png_and_closes_the_figure():
    import matplotlib

    matplotlib.use("Agg")
    import matplotlib.pyplot as plt

    fig, ax = plt.subplots(figsize=(3, 2))
    ax.plot([0, 1], [1, 0])
    number = fig.number
    markup = str(present.figure(fig, caption=XSS_TITLE))
    assert 'src="data:image/png;base64,' in markup
    assert "&lt;script&gt;" in markup and "<script" not in markup
    assert not plt.fignum_exists(number)


# ------------------------------------------------------------------------------------------
# Files and names (no kernel)


@pytest.mark.parametrize(
    "case_id",
    [
        "../evil",
        "..",
        "a/b",
        "a\\b",
        "/etc",
        "",
        ".hidden",
        "a..b",
        "CON",
        "nul.txt",
        "x" * 101,
        "a b",
        "é",
        5,
        None,
    ],
)
def test_case_folder_rejects_unsafe_names(tmp_path, case_id):
    with pytest.raises(InputError, match="case_id"):
        notes.case_folder(tmp_path, case_id)


def test_case_folder_accepts_plain_names(tmp_path):
    assert notes.case_folder(tmp_path, "nb200-plate-fan.rev_B") == tmp_path.resolve() / (
        "nb200-plate-fan.rev_B"
    )


def test_case_folder_rejects_a_symlink_out_of_the_output_folder(tmp_path):
    out, elsewhere = tmp_path / "out", tmp_path / "elsewhere"
    out.mkdir()
    elsewhere.mkdir()
    (out / "trap").symlink_to(elsewhere, target_is_directory=True)
    with pytest.raises(InputError, match="outside the output folder"):
        notes.case_folder(out, "trap")


@pytest.mark.parametrize("case_id", ["../evil", "/tmp/evil", "a/../../b"])
def test_render_note_rejects_traversal_and_writes_nothing(tmp_path, case_id):
    calls = []
    out = tmp_path / "out"
    with pytest.raises(InputError, match="case_id"):
        render(fixture_case(case_id), out, results=lambda c: calls.append(c) or RESULTS)
    assert calls == []  # rejected before the model runs
    assert not out.exists()
    assert folder_listing(tmp_path) == set()


def test_atomic_write_writes_whole_content_with_umask_permissions(tmp_path):
    target = tmp_path / "results.json"
    notes.atomic_write(target, "première version")
    notes.atomic_write(target, b"\x00second")
    assert target.read_bytes() == b"\x00second"
    assert folder_listing(tmp_path) == {"results.json"}
    umask = os.umask(0)
    os.umask(umask)
    assert target.stat().st_mode & 0o777 == 0o666 & ~umask


@pytest.mark.parametrize("failing", ["fsync", "replace"])
def test_atomic_write_failure_keeps_old_file_and_no_temporary(tmp_path, monkeypatch, failing):
    target = tmp_path / "note.html"
    target.write_text("good note")

    def boom(*args, **kwargs):
        raise OSError("disk full")

    monkeypatch.setattr(os, failing, boom)
    with pytest.raises(OSError, match="disk full"):
        notes.atomic_write(target, "half a note")
    monkeypatch.undo()
    assert target.read_text() == "good note"
    assert folder_listing(tmp_path) == {"note.html"}


# ------------------------------------------------------------------------------------------
# Self-containment check (no kernel)


@pytest.mark.parametrize(
    "snippet",
    [
        "<script>alert(1)</script>",
        '<script src="https://cdn.example.org/x.js"></script>',
        '<link rel="stylesheet" href="https://fonts.example.org/css">',
        '<img src="http://example.org/a.png">',
        '<img src="//example.org/a.png">',
        '<img src="data:image/png;base64,AAAA" onerror="alert(1)">',
        '<a href="javascript:alert(1)">x</a>',
        "<iframe></iframe>",
        "<style>@import 'https://example.org/a.css';</style>",
        "<style>body { background: url(https://example.org/bg.png) }</style>",
        "<div style=\"background: url('https://example.org/bg.png')\">x</div>",
        '<img srcset="https://example.org/a.png 2x">',
    ],
)
def test_check_note_html_finds_unsafe_or_external_content(snippet):
    assert notes.check_note_html(f"<html><body>{snippet}</body></html>")


def test_check_note_html_accepts_embedded_content_and_hyperlinks():
    page = (
        "<html><head><style>.a { background: url(data:image/png;base64,AAAA) }</style></head>"
        '<body style="background: url(data:image/png;base64,AAAA)">'
        '<img src="data:image/png;base64,AAAA"><a href="https://doi.org/10.1000/1">ref</a>'
        "<p>&lt;script&gt;</p></body></html>"
    )
    assert notes.check_note_html(page) == []


# ------------------------------------------------------------------------------------------
# Case, time, template, provenance (no kernel)


def test_prepare_case_from_yaml_makes_it_json_safe(tmp_path):
    path = tmp_path / "case.yaml"
    path.write_text("case_id: c-1\nkind: single-fin\ndate: 2025-01-31\nitems: [1, 2.5, '3 mm']\n")
    prepared = notes.prepare_case(path, validate=False)
    assert prepared.case == {
        "case_id": "c-1",
        "kind": "single-fin",
        "date": "2025-01-31",
        "items": [1, 2.5, "3 mm"],
    }
    assert (prepared.case_id, prepared.kind) == ("c-1", "single-fin")


@pytest.mark.parametrize(
    "case, match",
    [
        ({"case_id": "c", "kind": "heat-sink", "x": float("nan")}, "finite"),
        ({"case_id": "c", "kind": "heat-sink", 3: "three"}, "not a string"),
        ({"case_id": "c", "kind": "heat-sink", "x": {1, 2}}, "type set"),
        ({"kind": "heat-sink"}, "case_id"),
        ({"case_id": "c"}, "kind"),
    ],
)
def test_prepare_case_rejects_bad_mappings(case, match):
    with pytest.raises(InputError, match=match):
        notes.prepare_case(case, validate=False)


def test_note_time_needs_a_time_zone():
    assert notes.parse_note_time(NOTE_TIME) == NOTE_TIME
    aware = dt.datetime(2025, 3, 14, 9, 30, tzinfo=dt.UTC)
    assert notes.parse_note_time(aware) == "2025-03-14T09:30:00+00:00"
    assert dt.datetime.fromisoformat(notes.parse_note_time(None)).tzinfo is not None
    for bad in (dt.datetime(2025, 3, 14, 9, 30), "2025-03-14T09:30:00", "yesterday"):
        with pytest.raises(InputError, match="execution_time"):
            notes.parse_note_time(bad)


def test_template_without_parameters_cell_is_rejected(tmp_path):
    nb = nbformat.read(NOTEBOOKS / "simple.ipynb", as_version=4)
    for cell in nb.cells:
        cell.metadata.pop("tags", None)
    bad = tmp_path / "bad.ipynb"
    nbformat.write(nb, bad)
    with pytest.raises(InputError, match="tagged 'parameters'"):
        render(fixture_case(), tmp_path / "out", template=bad)
    assert not (tmp_path / "out").exists()


def test_template_path_by_kind():
    with pytest.raises(InputError, match="kind='boiler'"):
        notes.template_path("boiler")
    with pytest.raises(InputError, match="not an existing .ipynb"):
        notes.template_path("heat-sink", NOTEBOOKS / "missing.ipynb")
    assert notes.template_path("heat-sink", NOTEBOOKS / "simple.ipynb").name == "simple.ipynb"


def test_provenance_records_versions_and_an_order_independent_hash():
    case = {"case_id": "c-1", "kind": "heat-sink", "power": "45 W", "nested": {"b": 1, "a": 2}}
    reordered = {"nested": {"a": 2, "b": 1}, "power": "45 W", "kind": "heat-sink", "case_id": "c-1"}
    prov = notes.provenance(case, template="simple.ipynb", note_time=NOTE_TIME)
    canonical = '{"case_id":"c-1","kind":"heat-sink","nested":{"a":2,"b":1},"power":"45 W"}'
    assert prov["inputs_sha256"] == hashlib.sha256(canonical.encode()).hexdigest()
    assert notes.inputs_sha256(reordered) == prov["inputs_sha256"]
    assert notes.inputs_sha256({**case, "power": "46 W"}) != prov["inputs_sha256"]
    assert prov["template"] == "simple.ipynb" and prov["note_time"] == NOTE_TIME
    assert (prov["case_id"], prov["kind"]) == ("c-1", "heat-sink")
    for name in ("numpy", "scipy", "CoolProp", "pint", "matplotlib", "papermill", "nbconvert"):
        assert prov["libraries"][name] == version(name)
    assert re.fullmatch(r"3\.\d+\.\d+.*", prov["libraries"]["python"])
    json.dumps(prov, allow_nan=False)  # JSON-safe


def test_ensure_kernel_points_at_this_interpreter():
    import sys

    from jupyter_client.kernelspec import KernelSpecManager

    name = notes.ensure_kernel()
    spec = KernelSpecManager().get_kernel_spec(name)
    assert name == "finkit"
    assert spec.argv[0] in {sys.executable, "python", "python3"}


def test_ensure_kernel_refuses_a_kernel_of_another_interpreter(tmp_path, monkeypatch):
    spec_dir = tmp_path / "kernels" / "finkit-other"
    spec_dir.mkdir(parents=True)
    argv = ["/opt/other-venv/bin/python", "-m", "ipykernel_launcher", "-f", "{connection_file}"]
    (spec_dir / "kernel.json").write_text(
        json.dumps({"argv": argv, "display_name": "other", "language": "python"})
    )
    monkeypatch.setenv("JUPYTER_PATH", str(tmp_path))
    with pytest.raises(NotSupportedError, match="runs /opt/other-venv/bin/python"):
        notes.ensure_kernel("finkit-other")


def test_prepare_case_validates_with_the_case_module():
    case_module = pytest.importorskip("finkit.case")
    path = DEMO_CASES / "nb-fin-study.yaml"
    prepared = notes.prepare_case(path)
    validated = case_module.load_case(path)
    assert prepared.case == json.loads(json.dumps(validated.entered))  # as entered, JSON-safe
    assert (prepared.case_id, prepared.kind) == (validated.case_id, validated.kind)
    assert notes.inputs_sha256(prepared.validated) == case_module.case_inputs_sha256(validated)


# ------------------------------------------------------------------------------------------
# Rendering (kernel: slow)


@pytest.fixture(scope="module")
def simple_note(tmp_path_factory):
    out = tmp_path_factory.mktemp("notes")
    output = render(fixture_case(), out)
    return out, output, output.html.read_text(encoding="utf-8")


@pytest.mark.slow
def test_simple_note_writes_exactly_the_complete_set(simple_note):
    out, output, _ = simple_note
    assert output.folder == out.resolve() / "fixture-1"
    assert folder_listing(out) == {"fixture-1"}  # no scratch folder left
    assert folder_listing(output.folder) == {"note.html", "note.ipynb", "results.json"}
    assert (output.html.name, output.notebook.name, output.results_json.name) == (
        "note.html",
        "note.ipynb",
        "results.json",
    )


@pytest.mark.slow
def test_simple_note_hides_code_and_keeps_outputs(simple_note):
    _, _, html = simple_note
    assert "CODE-MARKER" not in html  # the input of the last cell
    assert "present.key_value_table" not in html
    assert "stream output 42" in html  # its output
    assert "SIMPLE-PROSE-MARKER" in html  # Markdown prose
    assert "In&nbsp;[" not in html  # no prompts


@pytest.mark.slow
def test_simple_note_escapes_case_text(simple_note):
    _, _, html = simple_note
    assert "&lt;script&gt;alert(1)&lt;/script&gt; &amp; &lt;b&gt;co&lt;/b&gt;" in html
    assert "<script" not in html.lower()
    assert "<b>co</b>" not in html


@pytest.mark.slow
def test_simple_note_is_self_contained(simple_note):
    _, _, html = simple_note
    assert external_loads(html) == []
    assert notes.check_note_html(html) == []
    assert "mathjax" not in html.lower() and "require.js" not in html.lower()
    assert "data:image/svg+xml," in html  # the equation
    assert "@page { size: A4;" in html


@pytest.mark.slow
def test_simple_note_records_provenance_everywhere(simple_note):
    _, output, html = simple_note
    results = json.loads(output.results_json.read_text(encoding="utf-8"))
    nb = nbformat.read(output.notebook, as_version=4)
    prov = results["provenance"]
    assert results["status"] == RESULTS["status"] and results["results"] == RESULTS["results"]
    assert results["note_time"] == NOTE_TIME == prov["note_time"]
    assert prov["template"] == "simple.ipynb"
    assert prov["inputs_sha256"] == notes.inputs_sha256(fixture_case())
    assert nb.metadata["finkit"] == {"status": "complete", "provenance": prov}
    meta = re.search(r'<meta[^>]*name="finkit-inputs-sha256"[^>]*>', html)
    assert meta and f'content="{prov["inputs_sha256"]}"' in meta.group(0)
    injected = [c for c in nb.cells if "injected-parameters" in c.metadata.get("tags", [])]
    assert len(injected) == 1 and NOTE_TIME in injected[0].source
    assert "alert(1)" in injected[0].source  # the case as entered reached the kernel


@pytest.mark.slow
def test_plot_note_embeds_images(tmp_path):
    output = render(fixture_case("plot"), tmp_path, template="with_plot.ipynb")
    html = output.html.read_text(encoding="utf-8")
    assert html.count("data:image/png;base64,") >= 2  # the figure and the Markdown attachment
    assert "attachment:" not in html
    assert external_loads(html) == [] and notes.check_note_html(html) == []


@pytest.mark.slow
def test_show_code_then_failure_keeps_the_good_note_then_success_clears_it(tmp_path):
    good = render(fixture_case(), tmp_path, show_code=True)
    html = good.html.read_text(encoding="utf-8")
    assert "CODE-MARKER" in html  # input shown
    assert "SIMPLE-PROSE-MARKER" in html
    assert "# Parameters: papermill injects" not in html  # the template's defaults are left out
    assert "note_time" in html  # the injected parameters are shown
    before = {name: (good.folder / name).read_bytes() for name in folder_listing(good.folder)}

    with pytest.raises(notes.NoteExecutionError) as info:
        render(fixture_case(failure="raise"), tmp_path, template="raising.ipynb")
    message = str(info.value)
    assert "\n" not in message
    assert "'fixture-1' failed at template cell 4 (In [4], 'import os')" in message
    assert "ValueError: fixture failure: fin_height must be positive" in message
    assert isinstance(info.value, FinkitError)

    # The previous good note is kept byte for byte but renamed, with a marker saying why: it
    # does not describe the case as it now stands, so nobody may sign it by mistake.
    stale = {"note.html": "note.stale.html", "note.ipynb": "note.stale.ipynb"}
    stale["results.json"] = "results.stale.json"
    after = {name: (good.folder / stale[name]).read_bytes() for name in before}
    assert after == before
    assert folder_listing(good.folder) == set(stale.values()) | {"note.failed.ipynb", "STALE.txt"}
    assert "do not sign it" in (good.folder / "STALE.txt").read_text(encoding="utf-8")
    assert folder_listing(tmp_path) == {"fixture-1"}
    failed = nbformat.read(good.folder / "note.failed.ipynb", as_version=4)
    assert failed.metadata["finkit"]["status"] == "failed"
    assert failed.metadata["finkit"]["error"] == message
    assert any(
        o.get("ename") == "ValueError"
        for c in failed.cells
        if c.cell_type == "code"
        for o in c.get("outputs", [])
    )

    again = render(fixture_case(), tmp_path)
    assert folder_listing(again.folder) == {"note.html", "note.ipynb", "results.json"}
    assert "CODE-MARKER" not in again.html.read_text(encoding="utf-8")


@pytest.mark.slow
def test_timeout_is_reported_with_the_cell(tmp_path):
    with pytest.raises(
        notes.NoteExecutionError,
        match=r"template cell 4 \((In \[4\], )?'import os'\): time limit of 2 s",
    ):
        render(fixture_case(failure="sleep"), tmp_path, template="raising.ipynb", timeout=2)
    assert folder_listing(tmp_path / "fixture-1") == {"note.failed.ipynb"}


@pytest.mark.slow
def test_the_executed_notebook_is_written_once_at_the_end_not_per_cell(tmp_path, monkeypatch):
    """papermill writes the notebook at the start and end of every cell; finkit's engine only
    in papermill's final sync (failures keep their partial notebook, see the timeout test)."""
    import papermill.engines
    import papermill.execute

    writes = []
    for module in (papermill.engines, papermill.execute):
        real = module.write_ipynb
        monkeypatch.setattr(
            module, "write_ipynb", lambda nb, path, real=real: (writes.append(path), real(nb, path))
        )
    render(fixture_case(), tmp_path)
    assert 1 <= len(writes) <= 2  # the engine's final sync, papermill's own last write


@pytest.mark.slow
def test_a_batch_note_writes_its_notebook_at_each_cell_start(tmp_path, monkeypatch):
    """A batch child can be killed from outside; the notebook written at the start of the
    running cell names it (see test_batch's timeout test). Not also at each cell's end."""
    import nbformat
    import papermill
    import papermill.engines

    from finkit.notes.engine import START_SAVE, register_engine

    writes = []
    real = papermill.engines.write_ipynb
    monkeypatch.setattr(
        papermill.engines, "write_ipynb", lambda nb, path: (writes.append(path), real(nb, path))
    )
    template = NOTEBOOKS / "simple.ipynb"
    code_cells = sum(c.cell_type == "code" for c in nbformat.read(template, as_version=4).cells)
    papermill.execute_notebook(
        str(template),
        str(tmp_path / "out.ipynb"),
        parameters={"case": fixture_case(), "note_time": NOTE_TIME},
        kernel_name=notes.ensure_kernel(),
        progress_bar=False,
        engine_name=register_engine(START_SAVE),
        cwd=str(tmp_path),
    )
    # each cell's start (the template's and papermill's injected parameters cell), the start
    # of the run and the final sync; papermill alone writes at each cell's end too
    assert len(writes) <= code_cells + 3


@pytest.mark.slow
def test_dead_kernel_is_reported(tmp_path):
    with pytest.raises(
        notes.NoteExecutionError,
        match=r"'fixture-1' failed at template cell 4 .*'import os'\): the kernel died",
    ):
        render(fixture_case(failure="exit"), tmp_path, template="raising.ipynb")
    assert not (tmp_path / "fixture-1" / "note.html").exists()


@pytest.mark.slow
def test_raw_case_html_is_refused_and_nothing_written(tmp_path):
    with pytest.raises(notes.NoteRenderError, match="<script> element"):
        render(fixture_case(), tmp_path, template="unsafe.ipynb")
    assert folder_listing(tmp_path) == set()


@pytest.mark.slow
def test_validated_demo_case_with_the_model(tmp_path):
    """Integration: finkit.case.load_case and finkit.model.run_case feed the note."""
    case_module = pytest.importorskip("finkit.case")
    output = notes.render_note(
        DEMO_CASES / "nb-fin-study.yaml",
        tmp_path,
        template=NOTEBOOKS / "simple.ipynb",
        execution_time=NOTE_TIME,
    )
    results = json.loads(output.results_json.read_text(encoding="utf-8"))
    case = case_module.load_case(DEMO_CASES / "nb-fin-study.yaml")
    assert results["provenance"]["inputs_sha256"] == case_module.case_inputs_sha256(case)
    assert results["inputs_sha256"] == results["provenance"]["inputs_sha256"]
    assert results["status"] in {"pass", "fail"}


# ------------------------------------------------------------------------------------------
# Browser (headless Chromium: slow)


@pytest.fixture(scope="module")
def chromium():
    import browser

    if not browser.chromium_available():
        pytest.fail(f"{browser.CHROMIUM} is missing: run .ci/ensure_chromium.sh")
    return browser


@pytest.mark.slow
def test_browser_shows_the_note_without_console_messages(simple_note, chromium, tmp_path):
    _, output, _ = simple_note
    png = tmp_path / "note.png"
    run = chromium.screenshot(output.html, png)
    assert run.returncode == 0, run.stderr[-2000:]
    assert run.console == []
    # Text and rules are dark pixels; a blank page has none (control below).
    assert chromium.non_white_fraction(png, threshold=128) > 0.005

    blank = tmp_path / "blank.html"
    blank.write_text("<!DOCTYPE html><html><body></body></html>")
    assert chromium.screenshot(blank, tmp_path / "blank.png").returncode == 0
    assert chromium.non_white_fraction(tmp_path / "blank.png", threshold=128) == 0


@pytest.mark.slow
def test_browser_console_check_can_fail(chromium, tmp_path):
    page = tmp_path / "probe.html"
    page.write_text('<!DOCTYPE html><html><body><script>console.error("finkit-probe")</script>')
    run = chromium.screenshot(page, tmp_path / "probe.png", width=400, height=300)
    assert any("finkit-probe" in line for line in run.console)


@pytest.mark.slow
@pytest.mark.parametrize("paper, size", [("A4", (595.3, 841.9)), ("letter", (612.0, 792.0))])
def test_printed_note_uses_the_paper_size(simple_note, chromium, tmp_path, paper, size):
    # ISO 216 A4 is 210 mm x 297 mm = 595.3 pt x 841.9 pt; US Letter is 8.5 in x 11 in.
    _, output, _ = simple_note
    nb = nbformat.read(output.notebook, as_version=4)
    html = tmp_path / "note.html"
    html.write_text(notes.render_html(nb, paper=paper), encoding="utf-8")
    pdf = tmp_path / "note.pdf"
    run = chromium.print_to_pdf(html, pdf)
    assert run.returncode == 0, run.stderr[-2000:]
    sizes = chromium.pdf_page_sizes(pdf)
    assert sizes, "no page in the PDF"
    for width, height in sizes:
        assert width == pytest.approx(size[0], abs=1.5) and height == pytest.approx(
            size[1], abs=1.5
        )


def test_sign_off_table_carries_the_title_block_names_escaped():
    import nbformat

    from finkit import notes

    case = {
        "case_id": "sig",
        "kind": "heat-sink",
        "title_block": {"prepared_by": "A. <b>Bold</b>", "checked_by": "C. Checker"},
    }
    nb = nbformat.v4.new_notebook()
    nb.cells.append(nbformat.v4.new_markdown_cell("Body."))
    nb.metadata["finkit"] = {"status": "complete", "provenance": notes.provenance(case)}
    html = notes.render_html(nb)
    assert "<td>A. &lt;b&gt;Bold&lt;/b&gt;</td>" in html
    assert "<td>C. Checker</td>" in html
    assert "<b>Bold</b>" not in html


# ------------------------------------------------------------------------------------------
# The kernel provider (finkit.notes.kernels): in-process kernel, with a kernel process as the
# fallback when ipykernel's in-process classes cannot be adapted. Software behaviour only.


def test_the_in_process_kernel_is_available_here():
    # Without it every batch child would silently start a kernel process (slower): CI must
    # notice when an ipykernel release breaks the adapters.
    from finkit.notes import kernels

    assert kernels.in_process_kernel_manager() is not None, kernels.FALLBACK_REASONS


@pytest.mark.slow
def test_a_note_falls_back_to_a_kernel_process_when_the_in_process_kernel_is_unavailable(
    tmp_path, monkeypatch
):
    from finkit.notes import kernels

    def broken():
        raise AttributeError("'InProcessKernel' object has no attribute 'shell_stream'")

    monkeypatch.setattr(kernels, "_build_in_process_manager", broken)
    manager = kernels.in_process_kernel_manager()
    assert manager is None
    assert "shell_stream" in kernels.FALLBACK_REASONS[-1]
    out = render(fixture_case("fallback-1"), tmp_path, kernel_manager=manager)
    assert out.html.is_file() and "SIMPLE-PROSE-MARKER" in out.html.read_text(encoding="utf-8")


@pytest.mark.slow
def test_a_note_renders_in_the_in_process_kernel(tmp_path):
    from finkit.notes import kernels

    manager = kernels.in_process_kernel_manager()
    out = render(fixture_case("in-process-1"), tmp_path, kernel_manager=manager)
    assert out.html.is_file() and "SIMPLE-PROSE-MARKER" in out.html.read_text(encoding="utf-8")


def test_a_changed_in_process_kernel_class_falls_back_before_any_note_runs(monkeypatch):
    # The adapters' attributes are checked when the manager is built: an ipykernel without
    # one of them gives the fallback (a kernel process), not a note that fails half-way.
    from finkit.notes import kernels

    wanted = dict(kernels._ADAPTED_ATTRIBUTES)
    wanted["InProcessKernel"] = (*wanted["InProcessKernel"], "attribute_of_another_release")
    kernels._in_process_classes.cache_clear()
    monkeypatch.setattr(kernels, "_ADAPTED_ATTRIBUTES", wanted)
    try:
        assert kernels.in_process_kernel_manager() is None
        assert "attribute_of_another_release" in kernels.FALLBACK_REASONS[-1]
    finally:
        monkeypatch.undo()
        kernels._in_process_classes.cache_clear()
    assert kernels.in_process_kernel_manager() is not None
