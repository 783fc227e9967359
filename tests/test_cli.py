"""Tests of the ``finkit`` command line: starters, input errors, exit codes.

The ``check``/``note`` happy paths need finkit.model and finkit.notes; they are skipped only
when those modules cannot be imported.
"""

import json
import re
import subprocess
import sys
from pathlib import Path

import pytest

from finkit.case import load_case
from finkit.cli import STARTERS, main, starter_text

ROOT = Path(__file__).resolve().parents[1]


@pytest.mark.parametrize("kind", STARTERS)
def test_new_writes_a_starter_that_loads(kind, tmp_path, capsys):
    out = tmp_path / "cases" / f"{kind}.yaml"
    assert main(["new", kind, "--out", str(out)]) == 0
    assert f"wrote {out}" in capsys.readouterr().out
    assert out.read_text(encoding="utf-8") == starter_text(kind)
    assert out.read_text(encoding="utf-8").lstrip().startswith("#")  # commented
    load_case(out)


def test_new_refuses_to_overwrite_unless_forced(tmp_path, capsys):
    out = tmp_path / "case.yaml"
    out.write_text("keep me")
    assert main(["new", "plate-fin", "--out", str(out)]) == 2
    err = capsys.readouterr().err
    assert err == f"--out: '{out}' already exists (use --force to overwrite it)\n"
    assert out.read_text() == "keep me"
    assert main(["new", "plate-fin", "--out", str(out), "--force"]) == 0
    load_case(out)


def test_new_default_file_name(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    assert main(["new", "single-fin"]) == 0
    load_case(tmp_path / "single-fin.yaml")


def test_usage_errors_exit_2(capsys):
    assert main(["new", "wavy-fin"]) == 2
    assert "invalid choice" in capsys.readouterr().err
    assert main([]) == 2


def _bad_case(tmp_path) -> Path:
    text = starter_text("plate-fin").replace("thickness: 1.2 mm", "thickness: 3 W")
    text = re.sub(r"(?m)^  power: .*\n", "", text)
    path = tmp_path / "bad.yaml"
    path.write_text(text, encoding="utf-8")
    return path


def test_check_bad_case_prints_one_line_per_error_and_exits_2(tmp_path, capsys):
    code = main(["check", str(_bad_case(tmp_path))])
    captured = capsys.readouterr()
    assert code == 2
    assert captured.out == ""
    assert captured.err.splitlines() == [
        "source.power: missing (required)",
        "sink.fins.thickness: expected a length, got '3 W'",
    ]


def test_check_bad_case_in_a_subprocess_has_no_traceback(tmp_path):
    bad = _bad_case(tmp_path)
    run = subprocess.run(
        [sys.executable, "-m", "finkit.cli", "check", str(bad)],
        capture_output=True,
        text=True,
        cwd=tmp_path,
        timeout=120,
    )
    assert run.returncode == 2
    assert "Traceback" not in run.stderr
    assert "sink.fins.thickness: expected a length, got '3 W'" in run.stderr.splitlines()


def test_check_missing_file(tmp_path, capsys):
    missing = tmp_path / "nope.yaml"
    assert main(["check", str(missing)]) == 2
    assert capsys.readouterr().err == f"case file: not found (got '{missing}')\n"


def test_check_happy_path_and_json(capsys):
    pytest.importorskip("finkit.model")
    case = ROOT / "finkit" / "data" / "starters" / "plate-fin.yaml"
    code = main(["check", str(case)])
    out = capsys.readouterr().out
    assert code in (0, 1)
    status = "pass" if code == 0 else "fail"
    assert f"status: {status}" in out
    assert "junction_temperature" in out
    code_json = main(["check", str(case), "--json"])
    payload = json.loads(capsys.readouterr().out)
    assert code_json == code
    assert payload["status"] == status
    assert "junction_temperature" in payload["results"]


@pytest.mark.slow
def test_note_happy_path(tmp_path, capsys):
    pytest.importorskip("finkit.notes")
    pytest.importorskip("finkit.model")
    case = ROOT / "finkit" / "data" / "starters" / "plate-fin.yaml"
    code = main(["note", str(case), "--out", str(tmp_path)])
    out = capsys.readouterr().out
    assert code in (0, 1), out
    html = tmp_path / "my-plate-fin-sink" / "note.html"
    assert html.is_file()
    assert f"note written: {html}" in out


def test_note_bad_case_exits_2(tmp_path, capsys):
    pytest.importorskip("finkit.notes")
    code = main(["note", str(_bad_case(tmp_path)), "--out", str(tmp_path / "out")])
    assert code == 2
    assert "sink.fins.thickness: expected a length, got '3 W'" in capsys.readouterr().err
    assert not (tmp_path / "out" / "my-plate-fin-sink" / "note.html").exists()
