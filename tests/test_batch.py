"""Tests of finkit.batch: variant tables, validation, isolation, failures, re-runs, overview, Dask.

These are tests of software behaviour, not of physics: the expected values are the documented
contract of finkit.batch and of the issue (row and column named in errors, exit status, files
written, re-run skipping, escaping, same results on a Dask cluster). The base case below is an
invented set of inputs used only to drive the machinery; no physical value is checked here.
Tests that execute notebooks are marked ``slow``.
"""

from __future__ import annotations

import base64
import csv
import hashlib
import html
import json
import re
import time
from pathlib import Path

import nbformat
import pytest

import finkit
from finkit import batch, notes
from finkit.case import CaseError
from finkit.cli import main as cli_main
from finkit.errors import InputError

NOTE_TIME = "2025-03-14T09:30:00+01:00"
XSS = "<script>alert(1)</script> & <b>co</b>"

# Invented inputs for the machinery (software test, no physics checked): 20 W passes its
# junction limit with margin, 60 W does not (checked with `finkit check`).
BASE_YAML = """\
case_id: test-base
kind: heat-sink
title_block: {project: Batch tests, part: Test sink, revision: "1", prepared_by: Tester,
              description: plain}
source:
  power: 20 W
  footprint_length: 20 mm
  footprint_width: 20 mm
  junction_to_case: 0.5 K/W
  interface: {resistance: 0.1 K/W}
sink:
  type: plate-fin
  material: aluminium-6063-t5
  finish: anodised-black
  base: {width: 60 mm, length: 50 mm, thickness: 4 mm}
  fins: {count: 10, thickness: 1 mm, height: 25 mm}
air:
  inlet_temperature: 35 degC
  flow: {approach_velocity: 2 m/s}
limit: {node: junction, temperature: 100 degC, required_margin: 5 K}
"""

# Fixture template: follows the notes contract (parameters cell with case and note_time); the
# case's description chooses a failure; two cells record state a previous note could leak.
TEMPLATE_CELLS = [
    ("markdown", "# Batch fixture note\n\nBATCH-PROSE-MARKER"),
    (
        "parameters",
        '# Parameters\ncase = {"case_id": "fixture", "kind": "heat-sink"}  # case as entered\n'
        'note_time: str = ""  # ISO 8601 with time zone',
    ),
    (
        "code",
        "from finkit.report import present\n\npresent.heading(case['title_block']['description'])",
    ),
    (
        "code",
        "import os\nimport time\n\nmode = case['title_block']['description']\n"
        "if mode == 'raise':\n    raise ValueError('fixture failure: the template raised')\n"
        "if mode == 'sleep':\n    time.sleep(300)\n"
        "if mode == 'exit':\n    os._exit(3)",
    ),
    (
        "code",
        "import finkit\n\nprint('leaked global:', globals().get('LEAK'))\n"
        "print('leaked module state:', getattr(finkit, '_batch_test_leak', None))\n"
        "LEAK = case['case_id']\nfinkit._batch_test_leak = case['case_id']",
    ),
    (
        "code",
        "import matplotlib.pyplot as plt\n\nfig, ax = plt.subplots(figsize=(3, 2))\n"
        "ax.plot([0, 1, 2], [0, 1, 4])\nax.set_xlabel('x [mm]')",
    ),
    ("code", "print('power', case['source']['power'])"),
]


def write_template(path: Path) -> Path:
    nb = nbformat.v4.new_notebook()
    for kind, source in TEMPLATE_CELLS:
        if kind == "markdown":
            nb.cells.append(nbformat.v4.new_markdown_cell(source))
        else:
            cell = nbformat.v4.new_code_cell(source)
            if kind == "parameters":
                cell.metadata["tags"] = ["parameters"]
            nb.cells.append(cell)
    nb.metadata["kernelspec"] = {
        "name": "python3",
        "display_name": "Python 3",
        "language": "python",
    }
    nbformat.write(nb, path)
    return path


def write_csv(path: Path, rows: list[list[str]]) -> Path:
    with open(path, "w", newline="", encoding="utf-8") as handle:
        csv.writer(handle).writerows(rows)
    return path


@pytest.fixture(scope="module")
def files(tmp_path_factory):
    folder = tmp_path_factory.mktemp("batch_inputs")
    base = folder / "base.yaml"
    base.write_text(BASE_YAML, encoding="utf-8")
    return {"dir": folder, "base": base, "template": write_template(folder / "fixture.ipynb")}


HEADER = ["variant", "source.power [W]", "title_block.description"]


# ------------------------------------------------------------------------------------------
# Reading tables and building variants (no kernel)


def test_csv_units_from_header_or_cell_and_empty_cells(tmp_path):
    table = write_csv(
        tmp_path / "v.csv",
        [
            ["variant", "source.power [W]", "air.inlet_temperature (degC)", "sink.fins.count"],
            ["a", "45", "", "12"],
            ["b", "0.05 kW", "40.5", ""],
            ["c", "[1, 2]", "null", ""],
        ],
    )
    rows = batch.read_variant_table(table)
    assert [(r.variant, r.row) for r in rows] == [("a", 2), ("b", 3), ("c", 4)]
    assert rows[0].overrides == {"source.power": "45 W", "sink.fins.count": 12}
    assert rows[1].overrides == {"source.power": "0.05 kW", "air.inlet_temperature": "40.5 degC"}
    assert rows[2].overrides == {"source.power": ["1 W", "2 W"], "air.inlet_temperature": None}
    assert all(r.errors == () for r in rows)


def test_csv_row_problems_name_row_and_column(tmp_path):
    table = write_csv(
        tmp_path / "v.csv",
        [HEADER, ["good", "10", "x"], ["Bad Id", "10", "x"], ["good", "10", "x"], ["", "1", "x"]],
    )
    table.write_text(table.read_text() + 'yaml,"[1, 2,x",x\n')
    errors = [r.errors for r in batch.read_variant_table(table)]
    assert errors[0] == ()
    assert errors[1] == (
        "row 3, column variant: 'Bad Id' is not a variant id; use 1-64 characters from "
        "a-z 0-9 . _ - starting with a letter or digit",
    )
    assert errors[2] == ("row 4, column variant: 'good' is used already in row 2; ids must differ",)
    assert errors[3][0].startswith("row 5, column variant: missing")
    assert errors[4][0].startswith("row 6 (variant 'yaml'), column source.power: cannot read")


@pytest.mark.parametrize(
    "header, match",
    [
        (["name", "source.power"], "no column named 'variant'"),
        (["variant", "source power"], "not a dotted path"),
        (["variant", "source.power", "source.power [W]"], "repeats column 2"),
        (["variant", "case_id"], "cannot be overridden"),
    ],
)
def test_unusable_table_is_an_input_error(tmp_path, header, match):
    table = write_csv(tmp_path / "v.csv", [header, ["a"] + ["1"] * (len(header) - 1)])
    with pytest.raises(InputError, match=match):
        batch.read_variant_table(table)


def test_yaml_list_table(tmp_path):
    table = tmp_path / "v.yaml"
    table.write_text(
        "- {variant: a, source.power: 30 W}\n- {variant: b, 'air.flow': {volume_flow: 5 CFM}}\n"
        "- just text\n"
    )
    rows = batch.read_variant_table(table)
    assert rows[0].overrides == {"source.power": "30 W"}
    assert rows[1].overrides == {"air.flow": {"volume_flow": "5 CFM"}}
    assert rows[2].errors and rows[2].errors[0].startswith("row 3: expected a mapping")


def test_apply_overrides_by_dotted_path():
    base = {"a": {"b": 1, "list": [1, 2, 3]}, "keep": {"x": 1}, "text": "t"}
    merged = batch.apply_overrides(
        base, {"a.b": 2, "a.list[1]": 20, "new.deep.value": "5 mm", "keep.x": None}
    )
    assert merged == {
        "a": {"b": 2, "list": [1, 20, 3]},
        "keep": {},
        "text": "t",
        "new": {"deep": {"value": "5 mm"}},
    }
    assert base["a"]["b"] == 1 and base["keep"] == {"x": 1}  # the base is not altered
    with pytest.raises(KeyError, match="no mapping at text"):
        batch.apply_overrides(base, {"text.sub": 1})
    with pytest.raises(KeyError, match="out of range"):
        batch.apply_overrides(base, {"a.list[7]": 1})


def test_prepare_variants_names_row_and_column_of_bad_values(files, tmp_path):
    table = write_csv(
        tmp_path / "v.csv",
        [
            ["variant", "source.power [W]", "sink.fins.count", "air.inlet_temperature"],
            ["ok", "25", "12", "30 degC"],
            ["neg", "-5", "12", "30 degC"],
            ["two-bad", "25", "1.5", "hot"],
            ["hot-air", "25", "12", "120 degC"],
        ],
    )
    variants = batch.prepare_variants(files["base"], table)
    assert [v.is_valid for v in variants] == [True, False, False, False]
    assert variants[0].case["case_id"] == "ok"
    assert variants[0].case["source"]["power"] == "25 W"
    assert variants[0].validated.source.power == pytest.approx(25.0)
    (neg,) = variants[1].errors
    assert neg.startswith("row 3 (variant 'neg'), column source.power: must be greater than 0")
    assert any(
        e.startswith("row 4 (variant 'two-bad'), column sink.fins.count:")
        for e in variants[2].errors
    )
    assert any(
        e.startswith("row 4 (variant 'two-bad'), column air.inlet_temperature:")
        for e in variants[2].errors
    )
    # A rule across fields names the column that the message mentions.
    assert any(
        e.startswith("row 5 (variant 'hot-air'), column air.inlet_temperature: limit.temperature")
        for e in variants[3].errors
    ), variants[3].errors


def test_base_case_must_validate(tmp_path):
    bad = tmp_path / "base.yaml"
    bad.write_text(BASE_YAML.replace("power: 20 W", "power: -1 W"))
    table = write_csv(tmp_path / "v.csv", [HEADER, ["a", "10", "x"]])
    with pytest.raises(CaseError) as info:
        batch.prepare_variants(bad, table)
    assert info.value.errors[0].startswith("base case: source.power")


def test_variant_key_follows_inputs_template_and_version(files, tmp_path, monkeypatch):
    table = write_csv(
        tmp_path / "v.csv",
        [HEADER, ["a", "20", "plain"], ["a-mw", "20000 mW", "plain"], ["b", "21", "plain"]],
    )
    a, a_mw, b = batch.prepare_variants(files["base"], table)
    template = files["template"]
    key = batch.variant_key(a.validated, template)
    assert re.fullmatch(r"[0-9a-f]{64}", key)
    assert key == batch.variant_key(a.validated, template)
    assert key != batch.variant_key(b.validated, template)  # other inputs
    assert key != batch.variant_key(a_mw.validated, template)  # same SI value, other text
    assert key != batch.variant_key(a.validated, template, show_code=True)
    other = tmp_path / "other.ipynb"
    other.write_bytes(template.read_bytes() + b"\n")
    assert key != batch.variant_key(a.validated, other)  # template bytes
    monkeypatch.setattr(finkit, "__version__", "99.0")
    assert key != batch.variant_key(a.validated, template)  # finkit version


def outcome(variant, status, state, **kw):
    return batch.VariantOutcome(
        variant=variant,
        row=kw.pop("row", 2),
        overrides=kw.pop("overrides", {}),
        status=status,
        state=state,
        **kw,
    )


def results_of(margin, required=5.0, status="pass"):
    return {
        "status": status,
        "results": {
            "temperature_margin": {"value": margin, "unit": "K"},
            "required_margin": {"value": required, "unit": "K"},
            "junction_temperature": {"value": 80.0, "unit": "degC"},
        },
    }


def test_overview_escapes_variant_text_and_runs_only_its_own_script(tmp_path):
    outcomes = [
        outcome(
            "ok-1",
            "pass",
            "computed",
            overrides={"title_block.description": XSS},
            results=results_of(12.0),
        ),
        outcome(
            "low",
            "fail",
            "computed",
            overrides={"source.power": XSS},
            results=results_of(-3.0, status="fail"),
        ),
        outcome(
            XSS,
            "error",
            "failed",
            error_kind="input",
            error=f"row 4, column variant: {XSS!r} is not a variant id",
        ),
    ]
    info = {
        "date": NOTE_TIME,
        "base_case": XSS,
        "base_case_id": "test-base",
        "variant_table": XSS,
        "exit_code": 2,
        "counts": batch.records._counts(outcomes),
    }
    page = batch.overview_html(info, outcomes, tmp_path)
    assert "<b>co</b>" not in page
    assert page.count("<script>") == 1 and "alert(1)" in page  # escaped text only
    assert "&lt;script&gt;alert(1)&lt;/script&gt; &amp; &lt;b&gt;co&lt;/b&gt;" in page
    # The one inline script is allowed by its SHA-256 in the content security policy.
    script = re.search(r"<script>(.*?)</script>", page, re.S).group(1)
    digest = base64.b64encode(hashlib.sha256(script.encode()).digest()).decode()
    csp = re.search(r'http-equiv="Content-Security-Policy" content="([^"]*)"', page).group(1)
    assert f"script-src 'sha256-{digest}'" in html.unescape(csp)
    assert "default-src 'none'" in html.unescape(csp)
    # Nothing is loaded: without its own script, the notes' check finds only the policy itself.
    assert page.count("http-equiv") == 1
    stripped = page.replace(f"<script>{script}</script>", "")
    assert notes.check_note_html(stripped) == ["<meta http-equiv> element"]
    assert '<a href="ok-1/note.html">note</a>' in page
    assert "Not computed (1)" in page and "<svg" in page and "required margin 5 K" in page


# ------------------------------------------------------------------------------------------
# Running a batch (notebooks: slow)


@pytest.fixture(scope="module")
def first_run(files, tmp_path_factory):
    out = tmp_path_factory.mktemp("batch_out")
    table = write_csv(
        files["dir"] / "variants.csv",
        [
            HEADER,
            ["low-power", "20", "plain"],
            ["high-power", "60", XSS],
            ["bad-power", "-5", "plain"],
            ["raises", "20", "raise"],
            ["sleeper", "20", "sleep"],
            ["dies", "20", "exit"],
            ["mid-power", "25", "plain"],
        ],
    )
    started = time.monotonic()
    result = batch.run_batch(
        files["base"],
        table,
        out,
        template=files["template"],
        jobs=2,
        timeout=20,
        execution_time=NOTE_TIME,
    )
    return out, table, result, time.monotonic() - started


def by_id(result):
    return {o.variant: o for o in result.outcomes}


@pytest.mark.slow
def test_failures_are_isolated_and_recorded(first_run):
    out, _, result, _ = first_run
    o = by_id(result)
    assert result.exit_code == batch.EXIT_NOT_COMPUTED == 2
    assert [x.variant for x in result.outcomes][:3] == ["low-power", "high-power", "bad-power"]
    assert (o["low-power"].status, o["low-power"].state) == ("pass", "computed")
    assert (o["mid-power"].status, o["mid-power"].state) == ("pass", "computed")
    assert (o["high-power"].status, o["high-power"].state) == ("fail", "computed")
    for good in ("low-power", "high-power", "mid-power"):
        assert {p.name for p in (out / good).iterdir()} == {
            "note.html",
            "note.ipynb",
            "results.json",
            "batch-state.json",
        }
    kinds = {v: (o[v].status, o[v].error_kind) for v in ("bad-power", "raises", "sleeper", "dies")}
    assert kinds == {
        "bad-power": ("error", "input"),
        "raises": ("error", "template"),
        "sleeper": ("error", "timeout"),
        "dies": ("error", "kernel"),
    }
    assert o["bad-power"].error.startswith("row 4 (variant 'bad-power'), column source.power:")
    assert (
        "template cell 4" in o["raises"].error
        and "ValueError: fixture failure" in o["raises"].error
    )
    assert "time limit of 20 s per variant exceeded" in o["sleeper"].error
    assert "template cell 4" in o["sleeper"].error  # the cell that was running
    assert "the kernel died (the note process ended with exit code 3)" in o["dies"].error
    for failed in ("raises", "sleeper", "dies"):
        partial = nbformat.read(out / failed / "note.failed.ipynb", as_version=4)
        assert partial.metadata["finkit"]["status"] == "failed"
        assert partial.metadata["finkit"]["error"] == o[failed].error
        assert not (out / failed / "note.html").exists()
    assert not (out / "bad-power").exists()
    hidden = sorted(p.name for p in out.iterdir() if p.name.startswith("."))
    assert hidden == [".finkit-batch.lock"]  # the folder lock only; no scratch left


@pytest.mark.slow
def test_timeout_does_not_delay_the_others(first_run):
    out, _, result, _ = first_run
    o = by_id(result)
    assert o["sleeper"].seconds == pytest.approx(20, abs=3)  # killed at its limit
    # Two slots: while the sleeper holds one until its limit, the rows after it (dies,
    # mid-power) are computed in the other slot, before the sleeper is killed.
    killed = (out / "sleeper" / "note.failed.ipynb").stat().st_mtime
    assert (out / "mid-power" / "note.html").stat().st_mtime < killed
    assert (out / "dies" / "note.failed.ipynb").stat().st_mtime < killed


@pytest.mark.slow
def test_notes_do_not_see_each_other(first_run):
    out, _, _, _ = first_run
    for variant in ("low-power", "high-power", "mid-power"):
        nb = nbformat.read(out / variant / "note.ipynb", as_version=4)
        text = "".join(o.get("text", "") for c in nb.cells for o in c.get("outputs", []))
        assert "leaked global: None" in text
        assert "leaked module state: None" in text
        assert f"power {POWERS[variant]}" in text


POWERS = {"low-power": "20 W", "high-power": "60 W", "mid-power": "25 W"}


@pytest.mark.slow
def test_overview_and_summaries(first_run):
    out, _, result, _ = first_run
    page = (out / "index.html").read_text(encoding="utf-8")
    assert "&lt;script&gt;alert(1)&lt;/script&gt;" in page and "<b>co</b>" not in page
    assert "Not computed (4)" in page and "Fail (" in page and "Pass (" in page
    for o in result.outcomes:
        if o.status == "error":
            assert html_escape(o.error) in page
    assert '<a href="raises/note.failed.ipynb">partial notebook</a>' in page
    assert '<a href="low-power/note.html">note</a>' in page
    assert NOTE_TIME in page

    summary = json.loads((out / "summary.json").read_text(encoding="utf-8"))
    assert summary["batch"]["exit_code"] == 2
    assert summary["batch"]["counts"]["error"] == 4
    rows = {r["variant"]: r for r in summary["variants"]}
    results = json.loads((out / "low-power" / "results.json").read_text(encoding="utf-8"))
    assert rows["low-power"]["results"] == results["results"]
    assert rows["low-power"]["note"] == "low-power/note.html"
    assert rows["dies"]["failed_notebook"] == "dies/note.failed.ipynb"

    with open(out / "summary.csv", newline="", encoding="utf-8") as handle:
        table = list(csv.DictReader(handle))
    assert [r["variant"] for r in table] == [o.variant for o in result.outcomes]
    low = next(r for r in table if r["variant"] == "low-power")
    assert float(low["temperature_margin [K]"]) == results["results"]["temperature_margin"]["value"]
    assert low["source.power [W]"] == "20.0" and low["status"] == "pass"
    # The variant's own columns come right after the variant, numeric, unit in the header.
    assert list(table[0])[:2] == ["variant", "source.power [W]"]


def html_escape(text):
    # The overview is a Jinja2 template with autoescaping (markupsafe: ' -> &#39;).
    from markupsafe import escape

    return str(escape(text))


@pytest.mark.slow
def test_note_matches_render_note(first_run, files, tmp_path):
    """The in-process child produces the note render_note makes with a kernel process."""
    out, _, _, _ = first_run
    variants = batch.prepare_variants(files["base"], files["dir"] / "variants.csv")
    low = next(v for v in variants if v.variant == "low-power")
    reference = notes.render_note(
        low.case, tmp_path, template=files["template"], execution_time=NOTE_TIME
    )
    mine = nbformat.read(out / "low-power" / "note.ipynb", as_version=4)
    theirs = nbformat.read(reference.notebook, as_version=4)

    def outputs(nb):
        return [
            [
                (
                    o["output_type"],
                    o.get("name"),
                    o.get("text"),
                    sorted(o.get("data", {})),
                    o.get("data", {}).get("text/html"),
                )
                for o in c.get("outputs", [])
            ]
            for c in nb.cells
        ]

    assert [c.source for c in mine.cells] == [c.source for c in theirs.cells]
    assert outputs(mine) == outputs(theirs)
    assert any("image/png" in o.get("data", {}) for c in mine.cells for o in c.get("outputs", []))
    assert mine.metadata["finkit"] == theirs.metadata["finkit"]
    html_mine = (out / "low-power" / "note.html").read_text(encoding="utf-8")
    assert notes.check_note_html(html_mine) == []
    assert "BATCH-PROSE-MARKER" in html_mine


@pytest.mark.slow
def test_rerun_skips_unchanged_and_force_redoes(first_run, files, tmp_path):
    out, _, first, _ = first_run
    table = write_csv(
        tmp_path / "again.csv",
        [
            HEADER,
            ["low-power", "20", "plain"],
            ["high-power", "60", XSS],
            ["mid-power", "26", "plain"],
        ],
    )
    before = {v: (out / v / "note.html").stat().st_mtime_ns for v in ("low-power", "high-power")}
    started = time.monotonic()
    again = batch.run_batch(
        files["base"],
        table,
        out,
        template=files["template"],
        jobs=2,
        timeout=20,
        execution_time="2026-01-01T00:00:00+00:00",
    )
    o = by_id(again)
    assert (o["low-power"].state, o["high-power"].state, o["mid-power"].state) == (
        "reused",
        "reused",
        "computed",
    )
    assert {v: (out / v / "note.html").stat().st_mtime_ns for v in before} == before
    assert o["low-power"].results == by_id(first)["low-power"].results
    assert again.exit_code == batch.EXIT_LIMIT_FAILED == 1  # high-power fails its limit
    assert time.monotonic() - started < 60

    unchanged = batch.run_batch(
        files["base"], table, out, template=files["template"], jobs=2, timeout=20
    )
    assert {x.state for x in unchanged.outcomes} == {"reused"}
    assert unchanged.seconds < 5

    forced = batch.run_batch(
        files["base"],
        table,
        out,
        template=files["template"],
        jobs=2,
        timeout=20,
        force=True,
        execution_time="2026-01-02T00:00:00+00:00",
    )
    assert {x.state for x in forced.outcomes} == {"computed"}
    assert all((out / v / "note.html").stat().st_mtime_ns > t for v, t in before.items())
    note_time = json.loads((out / "low-power" / "results.json").read_text())["note_time"]
    assert note_time == "2026-01-02T00:00:00+00:00"


@pytest.mark.slow
def test_interrupted_batch_resumes(files, tmp_path):
    """A variant whose note was written but whose state was not (a stop in between) is redone;
    the ones finished before the stop are reused."""
    table = write_csv(tmp_path / "v.csv", [HEADER, ["a", "20", "plain"], ["b", "22", "plain"]])
    out = tmp_path / "out"
    batch.run_batch(files["base"], table, out, template=files["template"], jobs=2)
    (out / "b" / "batch-state.json").unlink()
    again = batch.run_batch(files["base"], table, out, template=files["template"], jobs=2)
    assert [x.state for x in again.outcomes] == ["reused", "computed"]


@pytest.mark.slow
def test_cli_batch_exit_status(files, tmp_path, capsys):
    table = write_csv(tmp_path / "v.csv", [HEADER, ["only-bad", "-1", "plain"]])
    code = cli_main(
        [
            "batch",
            str(files["base"]),
            str(table),
            "--out",
            str(tmp_path / "o"),
            "--template",
            str(files["template"]),
        ]
    )
    captured = capsys.readouterr()
    assert code == 2
    assert "row 2 (variant 'only-bad'), column source.power" in captured.err
    assert (tmp_path / "o" / "index.html").is_file()

    good = write_csv(tmp_path / "g.csv", [HEADER, ["g1", "20", "plain"]])
    code = cli_main(
        [
            "batch",
            str(files["base"]),
            str(good),
            "--out",
            str(tmp_path / "o"),
            "--template",
            str(files["template"]),
            "--jobs",
            "1",
        ]
    )
    assert code == 0
    assert (
        cli_main(
            ["batch", str(files["base"]), str(good), "--out", str(tmp_path / "o"), "--jobs", "0"]
        )
        == 2
    )


@pytest.mark.slow
def test_dask_local_cluster_gives_the_same_results(first_run, files, tmp_path):
    distributed = pytest.importorskip("distributed")
    out, _, local, _ = first_run
    table = write_csv(
        tmp_path / "v.csv",
        [
            HEADER,
            ["low-power", "20", "plain"],
            ["high-power", "60", XSS],
            ["raises", "20", "raise"],
        ],
    )
    with distributed.LocalCluster(
        n_workers=2, threads_per_worker=1, processes=True, dashboard_address=None
    ) as cluster:
        remote = batch.run_batch(
            files["base"],
            table,
            tmp_path / "dask",
            template=files["template"],
            scheduler=cluster.scheduler_address,
            timeout=60,
            execution_time=NOTE_TIME,
        )
    o = by_id(remote)
    assert remote.exit_code == 2
    assert o["raises"].error_kind == "template"
    assert (tmp_path / "dask" / "raises" / "note.failed.ipynb").is_file()
    for variant in ("low-power", "high-power"):
        assert o[variant].state == "computed"
        mine = json.loads((tmp_path / "dask" / variant / "results.json").read_text())
        theirs = json.loads((out / variant / "results.json").read_text())
        assert mine["results"] == theirs["results"]
        assert mine["status"] == theirs["status"]
        assert (tmp_path / "dask" / variant / "note.html").is_file()


@pytest.mark.slow
def test_overview_opens_in_a_browser_without_console_messages(first_run, tmp_path):
    """Headless Chromium: the page renders, and its sorting script is neither blocked by the
    content security policy nor failing (either would print to the console)."""
    import browser

    if not browser.chromium_available():
        pytest.fail(f"{browser.CHROMIUM} is missing: run .ci/ensure_chromium.sh")
    out, _, _, _ = first_run
    png = tmp_path / "index.png"
    run = browser.screenshot(out / "index.html", png)
    assert run.returncode == 0, run.stderr[-2000:]
    assert run.console == []
    assert browser.non_white_fraction(png, threshold=128) > 0.005

    # Control: a script the policy does not name is refused, and the refusal is seen.
    tampered = tmp_path / "tampered.html"
    page = (out / "index.html").read_text(encoding="utf-8")
    tampered.write_text(page.replace("</script>", "console.log('injected');</script>"))
    refused = browser.screenshot(tampered, tmp_path / "tampered.png")
    assert any("Content Security Policy" in line for line in refused.console), refused.console
