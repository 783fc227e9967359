"""A generated corpus of hostile and mistaken case files through ``finkit check`` (issue 13).

Every leaf of the pin-fin demo case is replaced in turn by hostile values (non-numbers,
infinities, huge and tiny numbers, wrong types, markup, unknown units, very long text), every
block loses a key or gains an unknown one, and ``case_id`` gets path tricks. Each mutant runs
through ``finkit check --json`` in-process (``finkit.cli.main``) and must end in one of the
documented exit codes 0, 1 or 2 (never 3, an internal error, never a traceback), with one
short line per problem naming the field when the input is refused, and strict JSON when it is
accepted. Software behaviour only; no physics is checked here.
"""

from __future__ import annotations

import contextlib
import copy
import errno
import io
import json
import random
from pathlib import Path

import pytest
import yaml

from finkit import cli

ROOT = Path(__file__).resolve().parent.parent
BASE = yaml.safe_load((ROOT / "demo_cases" / "nb300-pin-ducted.yaml").read_text(encoding="utf-8"))

HOSTILE_VALUES = [
    "nan",
    "inf W",
    "-1e309",
    1e308,
    -5,
    0,
    "",
    [],
    {},
    "abc",
    "1e-300 m",
    "x" * 300,
    "<script>alert(1)</script>",
    True,
    None,
    "5 parsecs",
    "1e999 degC",
    "=HYPERLINK(1)",
]
CASE_IDS = ["../evil", "/etc/passwd", "a/b", ".", "..", "x" * 300, "con\x00", "-rf"]
#: Mutants drawn per leaf (a fixed seed keeps the corpus the same on every run).
PER_LEAF = 4


def _leaves(data, path=()):
    if isinstance(data, dict):
        for key, value in data.items():
            yield from _leaves(value, (*path, key))
    elif isinstance(data, list) and data and all(isinstance(x, dict) for x in data):
        for i, value in enumerate(data):
            yield from _leaves(value, (*path, i))
    else:
        yield path


def _blocks(data, path=()):
    if isinstance(data, dict):
        yield path
        for key, value in data.items():
            yield from _blocks(value, (*path, key))


def _set(data, path, value):
    target = data
    for key in path[:-1]:
        target = target[key]
    target[path[-1]] = value


def _corpus():
    rng = random.Random(20261205)
    out = []
    for path in _leaves(BASE):
        if path == ("case_id",):
            for value in CASE_IDS:
                out.append((f"case_id={value[:12]!r}", path, value))
            continue
        for value in rng.sample(HOSTILE_VALUES, PER_LEAF):
            out.append((f"{'.'.join(map(str, path))}={str(value)[:12]!r}", path, value))
    for path in _blocks(BASE):
        if path and isinstance(_get(BASE, path), dict) and _get(BASE, path):
            key = sorted(_get(BASE, path))[0]
            out.append((f"{'.'.join(map(str, path))} without {key}", (*path, key), _DELETE))
        out.append((f"{'.'.join(map(str, path)) or 'top'} + unknown key", (*path, "colour"), "red"))
    return out


def _get(data, path):
    for key in path:
        data = data[key]
    return data


_DELETE = object()
CORPUS = _corpus()


def _mutant(path, value):
    data = copy.deepcopy(BASE)
    if value is _DELETE:
        del _get(data, path[:-1])[path[-1]]
    else:
        _set(data, path, value)
    return data


def _run(argv):
    out, err = io.StringIO(), io.StringIO()
    with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
        code = cli.main(argv)
    return code, out.getvalue(), err.getvalue()


def _strict(constant):
    raise ValueError(f"not strict JSON: {constant}")


def test_the_corpus_is_large_and_covers_every_leaf():
    assert len(CORPUS) > 100
    assert {p[0] for _, p, _ in CORPUS} >= set(BASE)


@pytest.mark.parametrize(("label", "path", "value"), CORPUS, ids=[c[0] for c in CORPUS])
def test_every_mutant_gets_a_documented_exit_and_no_traceback(tmp_path, label, path, value):
    case = tmp_path / "case.yaml"
    case.write_text(yaml.safe_dump(_mutant(path, value), allow_unicode=True), encoding="utf-8")
    code, stdout, stderr = _run(["check", str(case), "--json"])
    assert code in (0, 1, 2), f"{label}: exit {code}: {stderr}"
    assert "Traceback" not in stdout + stderr
    assert "RuntimeWarning" not in stderr
    if code == 2:
        lines = [line for line in stderr.splitlines() if line.strip()]
        assert lines and all(len(line) <= 400 for line in lines)
        named = {str(k) for k in path if isinstance(k, str)}
        # the message names the field (or, for a file-level problem, says "case file")
        assert any(any(n in line for n in named) or "case" in line for line in lines), stderr
    else:
        json.loads(stdout, parse_constant=_strict)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["case.yaml"]  # nothing written


def test_a_full_disk_while_writing_a_note_exits_3_and_leaves_nothing_half_written(
    tmp_path, monkeypatch
):
    # ENOSPC cannot be produced on a shared CI disk; it is injected where finkit writes.
    from finkit.notes import render

    def full(path, text, *args, **kwargs):
        raise OSError(errno.ENOSPC, "No space left on device", str(path))

    monkeypatch.setattr(render, "atomic_write", full)  # where render_note writes its files
    case = tmp_path / "case.yaml"
    case.write_text((ROOT / "demo_cases" / "nb300-pin-ducted.yaml").read_text(), encoding="utf-8")
    code, _, stderr = _run(["note", str(case), "--out", str(tmp_path / "out")])
    assert code == 3
    line = stderr.strip().splitlines()[-1]
    assert "environment problem" in line and "No space left" in line
    folder = tmp_path / "out" / "nb300-pin-ducted"
    assert not (folder / "note.html").exists() and not (folder / "results.json").exists()
    assert not list((tmp_path / "out").glob(".*.partial"))


@pytest.mark.skipif(
    not hasattr(__import__("os"), "geteuid") or __import__("os").geteuid() == 0,
    reason="a read-only folder does not stop root",
)
def test_a_read_only_output_folder_exits_3(tmp_path):
    out = tmp_path / "out"
    out.mkdir()
    out.chmod(0o500)
    case = tmp_path / "case.yaml"
    case.write_text((ROOT / "demo_cases" / "nb300-pin-ducted.yaml").read_text(), encoding="utf-8")
    try:
        code, _, stderr = _run(["note", str(case), "--out", str(out)])
    finally:
        out.chmod(0o700)
    assert code == 3 and "environment problem" in stderr
