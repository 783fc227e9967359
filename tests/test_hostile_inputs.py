"""Hostile, mistaken or unlucky input gets one line and a documented exit code, never a
traceback (software behaviour; no physics).

Exit codes (README): 0 pass, 1 fails its limit, 2 input error, 3 internal error or
environment problem. Each case here runs ``finkit`` in a subprocess as a user would.
"""

from __future__ import annotations

import json
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
PIN = (ROOT / "demo_cases" / "nb300-pin-ducted.yaml").read_text(encoding="utf-8")


def finkit(*args: str, cwd: Path) -> subprocess.CompletedProcess:
    return subprocess.run(
        [sys.executable, "-m", "finkit.cli", *args],
        capture_output=True,
        text=True,
        check=False,
        cwd=cwd,
        timeout=120,
    )


def _bomb() -> str:
    text = 'a: &a ["lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol", "lol"]\n'
    for i in range(1, 9):
        text += f"{chr(97 + i)}: &{chr(97 + i)} [" + ",".join([f"*{chr(96 + i)}"] * 9) + "]\n"
    return text


HOSTILE = {
    "latin-1": (
        "case_id: x\nkind: heat-sink\ntitle_block: {project: caf\xe9}\n".encode("latin-1"),
        "not UTF-8 text",
    ),
    "utf-16": (PIN.encode("utf-16"), "not UTF-8 text"),
    "binary": (bytes(range(256)) * 4, "not UTF-8 text"),
    "alias bomb": (_bomb().encode(), "anchors and aliases"),
    "deep nesting": (
        ("case_id: x\nkind: heat-sink\nsource: " + "[" * 1000 + "]" * 1000).encode(),
        "nested more than",
    ),
    "list as a key": (b"case_id: x\nkind: heat-sink\n? [a, b]\n: 1\n", "a key must be plain text"),
    "infinite temperature": (PIN.replace("40 degC", "1e999 degC").encode(), "finite number"),
    "infinite power": (PIN.replace("60 W", "1e309 W").encode(), "finite number"),
    "bare metres": (PIN.replace("height: 25 mm", "height: 25").encode(), "did you mean '25 mm'"),
}


@pytest.mark.parametrize("name", sorted(HOSTILE))
def test_hostile_case_files_get_one_line_and_exit_2(tmp_path, name):
    content, message = HOSTILE[name]
    (tmp_path / "case.yaml").write_bytes(content)
    run = finkit("check", "case.yaml", cwd=tmp_path)
    assert run.returncode == 2, run.stderr
    assert "Traceback" not in run.stderr + run.stdout
    assert message in run.stderr


def test_an_environment_problem_exits_3_with_one_line_and_a_log(tmp_path):
    (tmp_path / "case.yaml").write_text(PIN, encoding="utf-8")
    (tmp_path / "out").write_text("a file where a folder should be", encoding="utf-8")
    run = finkit("note", "case.yaml", "--out", "out/notes", cwd=tmp_path)
    assert run.returncode == 3
    assert "Traceback" not in run.stderr
    line = run.stderr.strip().splitlines()[-1]
    assert "environment problem" in line and "details in" in line
    log = Path(line.split("details in ")[1].split(" (run with")[0])
    assert "Traceback" in log.read_text(encoding="utf-8")
    assert (tmp_path / "out").read_text(encoding="utf-8").startswith("a file")  # untouched


def test_check_json_is_strict_json(tmp_path):
    (tmp_path / "case.yaml").write_text(PIN, encoding="utf-8")
    run = finkit("check", "case.yaml", "--json", cwd=tmp_path)
    assert run.returncode in (0, 1)
    json.loads(run.stdout, parse_constant=lambda c: pytest.fail(f"{c} in strict JSON"))


def test_variant_tables_are_read_as_standard_csv(tmp_path):
    # Source: RFC 4180, Common Format and MIME Type for CSV Files (2005), section 2: a field
    # with commas or quotes is quoted, a quote inside it is doubled; CRLF ends a record.
    from finkit.batch import read_variant_table

    table = tmp_path / "variants.csv"
    table.write_bytes(
        "\ufeffvariant,source.power [W],title_block.description\r\n"
        'a,40,"plain, with a comma"\r\n'
        'b,44,"the ""value"" build"\r\n'.encode("utf-8")
    )
    rows = read_variant_table(table)
    assert [r.variant for r in rows] == ["a", "b"]
    assert rows[0].overrides["title_block.description"] == "plain, with a comma"
    assert rows[1].overrides["title_block.description"] == 'the "value" build'
    demo = read_variant_table(ROOT / "demo_cases" / "nb-series-variants.csv")
    assert demo[-1].overrides["title_block.description"].endswith('(12 fins, "value" build)')


def test_summary_csv_neutralises_formula_text():
    from finkit.batch.overview import _spreadsheet_text

    for text in ("=HYPERLINK(1)", "+1", "-cmd", "@SUM(A1)"):
        assert _spreadsheet_text(text).startswith("'")
    assert _spreadsheet_text("plain") == "plain"


def test_a_second_batch_on_a_locked_folder_is_refused_and_a_killed_run_is_cleaned(tmp_path):
    import fcntl

    from finkit.batch import run_batch
    from finkit.errors import InputError

    out = tmp_path / "out"
    out.mkdir()
    (out / ".finkit-batch-run").mkdir()  # as left by a batch killed with kill -9
    with open(out / ".finkit-batch.lock", "a+") as held:  # another batch holds the folder
        fcntl.flock(held, fcntl.LOCK_EX | fcntl.LOCK_NB)
        with pytest.raises(InputError, match="is in use by another finkit batch"):
            run_batch(ROOT / "demo_cases" / "nb300-pin-ducted.yaml", [{"variant": "a"}], out)
    assert (out / ".finkit-batch-run").is_dir()  # the other batch's run folder is kept
    with pytest.raises(InputError, match="does not exist"):  # found after taking the lock
        run_batch(ROOT / "demo_cases" / "nb300-pin-ducted.yaml", tmp_path / "missing.csv", out)
    assert not (out / ".finkit-batch-run").exists()


@pytest.mark.parametrize(
    ("old", "new", "message"),
    [
        ("samples: 20000", "samples: 1000000000", "monte_carlo.samples: must be at most 1000000"),
        ("power: 40 W ", "power: 40" + " " * 70000 + "W ", "at most 200 are read"),
    ],
)
def test_size_caps_are_named_in_the_error(tmp_path, old, new, message):
    text = (ROOT / "demo_cases" / "nb200-plate-fan.yaml").read_text(encoding="utf-8")
    assert old in text
    (tmp_path / "case.yaml").write_text(text.replace(old, new, 1), encoding="utf-8")
    run = finkit("check", "case.yaml", cwd=tmp_path)
    assert run.returncode == 2 and message in run.stderr and "Traceback" not in run.stderr


@pytest.mark.slow
def test_a_note_on_disk_of_other_inputs_is_never_reused(tmp_path):
    from finkit.batch import run_batch

    base = ROOT / "demo_cases" / "nb300-pin-ducted.yaml"
    table = [{"variant": "a", "source.power": "50 W"}]
    out = tmp_path / "out"
    assert [o.state for o in run_batch(base, table, out, jobs=1).outcomes] == ["computed"]
    assert [o.state for o in run_batch(base, table, out, jobs=1).outcomes] == ["reused"]
    # Another run's note lands in the folder (two batches, a hand copy): its inputs differ.
    results = json.loads((out / "a" / "results.json").read_text(encoding="utf-8"))
    results["inputs_sha256"] = "0" * 64
    (out / "a" / "results.json").write_text(json.dumps(results), encoding="utf-8")
    assert [o.state for o in run_batch(base, table, out, jobs=1).outcomes] == ["computed"]


@pytest.mark.slow
def test_a_failed_rerun_marks_the_earlier_note_stale(tmp_path):
    from finkit.notes import render_note

    case = (ROOT / "demo_cases" / "nb300-pin-ducted.yaml").read_text(encoding="utf-8")
    path = tmp_path / "case.yaml"
    path.write_text(case, encoding="utf-8")
    out = tmp_path / "out"
    first = render_note(path, out)
    before = first.html.read_bytes()
    # The case is edited so that its note fails (an unknown parameter reaches the template).
    template = ROOT / "templates" / "heat_sink_note.ipynb"
    broken = tmp_path / "broken.ipynb"
    broken.write_text(
        template.read_text(encoding="utf-8").replace(
            '"report.verdict_page(result, note_time)"', '"report.no_such_section(result)"'
        ),
        encoding="utf-8",
    )
    with pytest.raises(Exception, match="failed at"):
        render_note(path, out, template=broken)
    folder = first.folder
    assert not (folder / "note.html").exists()
    assert (folder / "note.stale.html").read_bytes() == before
    assert "do not sign it" in (folder / "STALE.txt").read_text(encoding="utf-8")
    render_note(path, out)
    assert (folder / "note.html").exists() and not (folder / "STALE.txt").exists()


# --------------------------------------------------------------------------------------------
# Text stays text; check says what the note will clip


@pytest.mark.parametrize(
    ("typed", "kept"),
    [("1.10", "1.10"), ("010", "010"), ("NO", "NO"), ("2024-05-01", "2024-05-01"), ("1e3", "1e3")],
)
def test_text_fields_keep_what_was_typed(typed, kept):
    # YAML 1.1 would read 1.10 as 1.1, 010 as 8, NO as false and 2024-05-01 as a date; a
    # revision or a name is text, so finkit keeps the characters typed.
    from finkit.case import load_case

    text = PIN.replace('revision: "1"', f"revision: {typed}").replace(
        "prepared_by: A. Lindqvist", f"prepared_by: {typed}"
    )
    case = load_case(text)
    assert case.title_block.revision == kept and case.title_block.prepared_by == kept


def test_a_variant_table_keeps_a_revision_as_text(tmp_path):
    from finkit.batch import read_variant_table

    table = tmp_path / "v.csv"
    table.write_text("variant,title_block.revision,source.power [W]\na,1.10,50\n", encoding="utf-8")
    (row,) = read_variant_table(table)
    assert row.overrides == {"title_block.revision": "1.10", "source.power": "50 W"}


def test_check_says_when_a_note_figure_is_clipped(tmp_path):
    # The altitude figure of a note spans 0 to 1000 m above the site; at 19.9 km that leaves the
    # standard atmosphere (U.S. Standard Atmosphere 1976, up to 20 km in finkit): check says so,
    # and the note draws the same clipped range instead of failing.
    text = PIN.replace("altitude: 2500 m", "altitude: 19.9 km")
    assert text != PIN
    (tmp_path / "case.yaml").write_text(text, encoding="utf-8")
    run = finkit("check", "case.yaml", cwd=tmp_path)
    assert run.returncode in (0, 1), run.stderr
    assert "the altitude figure ends at 20000 m" in run.stdout


def test_an_invalid_variant_row_marks_its_earlier_note_stale(tmp_path):
    from finkit.batch import run_batch

    out = tmp_path / "out"
    folder = out / "a"
    folder.mkdir(parents=True)
    (folder / "note.html").write_text("<html>an earlier, signed-looking note</html>")
    (folder / "results.json").write_text("{}")
    result = run_batch(
        ROOT / "demo_cases" / "nb300-pin-ducted.yaml",
        [{"variant": "a", "source.power": "fifty watts"}],
        out,
        jobs=1,
    )
    assert [o.state for o in result.outcomes] == ["failed"]
    assert not (folder / "note.html").exists()
    assert (folder / "note.stale.html").read_text().startswith("<html>an earlier")
    marker = (folder / "STALE.txt").read_text(encoding="utf-8")
    assert "do not sign it" in marker and "row is now invalid" in marker


def _processes_mentioning(text: str) -> list[int]:
    found = []
    for entry in Path("/proc").iterdir():
        if not entry.name.isdigit():
            continue
        try:
            cmdline = (entry / "cmdline").read_bytes().replace(b"\0", b" ").decode(errors="replace")
        except OSError:
            continue
        if text in cmdline:
            found.append(int(entry.name))
    return found


@pytest.mark.slow
@pytest.mark.skipif(not Path("/proc").is_dir(), reason="needs /proc (Linux)")
def test_a_killed_batch_leaves_no_children_and_resumes_cleanly(tmp_path):
    import os
    import signal
    import time

    # The plate-fin demo (about 10 s a note: Monte Carlo, model-form check) so that a child
    # is still working when its parent is killed.
    plate = (ROOT / "demo_cases" / "nb200-plate-fan.yaml").read_text(encoding="utf-8")
    plate = "\n".join(x for x in plate.splitlines() if not x.startswith("previous_revision"))
    base = tmp_path / "base.yaml"
    base.write_text(plate, encoding="utf-8")
    table = tmp_path / "v.csv"
    table.write_text("variant,source.power [W]\na,40\nb,44\n", encoding="utf-8")
    out = tmp_path / "killed-batch-out"
    args = [sys.executable, "-m", "finkit.cli", "batch", str(base), str(table), "--out", str(out)]
    parent = subprocess.Popen(
        [*args, "--jobs", "1"], stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL
    )
    run_dir = out / ".finkit-batch-run"
    deadline = time.monotonic() + 90
    while time.monotonic() < deadline and not any(run_dir.glob("*.log")):
        time.sleep(0.2)
    assert any(run_dir.glob("*.log")), "the batch never started a variant"
    time.sleep(0.5)
    os.kill(parent.pid, signal.SIGKILL)
    parent.wait()
    # The child sees its parent gone within a second or two and takes its group with it, long
    # before its note could have finished on its own.
    assert not (out / "a" / "note.html").exists()
    deadline = time.monotonic() + 4
    while time.monotonic() < deadline and _processes_mentioning(str(out)):
        time.sleep(0.2)
    assert _processes_mentioning(str(out)) == []
    assert not (out / "a" / "note.html").exists()
    # A new run takes the folder over, computes both variants and leaves nothing partial.
    rerun = subprocess.run([*args, "--jobs", "1"], capture_output=True, text=True, timeout=300)
    assert rerun.returncode in (0, 1), rerun.stderr
    assert not run_dir.exists()
    assert not list(out.rglob("*.partial*"))
    for variant, power in (("a", "40 W"), ("b", "44 W")):
        results = json.loads((out / variant / "results.json").read_text(encoding="utf-8"))
        assert results["inputs"]["source"]["power"] == power
        assert (out / variant / "note.html").is_file()
