"""Note sections drawn ahead by a forked helper (issue 15): the same note, in less time.

``finkit note`` forks a helper that draws the note's sections from the end while the kernel
draws them from the start (:mod:`finkit.report.ahead`). These are tests of software behaviour:
whichever process draws a section, the note must be the very same, and a helper that is slow,
dies or fails must never cost the note a section.
"""

from __future__ import annotations

import json
import os
import re
import signal
import time
from pathlib import Path

import pytest

from finkit.report import ahead, present

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "demo_cases"
NOTE_TIME = "2026-03-02T09:30:00+01:00"

pytestmark = pytest.mark.skipif(not hasattr(os, "fork"), reason="the helper needs fork")


class _Result:
    """Stands in for a solved case: the section functions below only read ``tag``."""

    def __init__(self, tag: str):
        self.tag = tag


@ahead.shareable
def _first_test_section(result):
    return present.text(f"first {result.tag} by {os.getpid()}")


@ahead.shareable
def _second_test_section(result):
    return present.text(f"second {result.tag} by {os.getpid()}")


@ahead.shareable
def _failing_test_section(result):
    raise ValueError("bad section")


_SECTIONS = ["_first_test_section", "_second_test_section"]


@ahead.group(lambda result: _SECTIONS)
def _test_group(result):
    return [_first_test_section(result), _second_test_section(result)]


def _said(fragment) -> str:
    """The text of a fragment without its tags."""
    return re.sub(r"<[^>]+>", "", str(fragment))


def _fork(work) -> int:
    pid = os.fork()
    if pid == 0:
        try:
            work()
        finally:
            os._exit(0)
    return pid


def test_sections_to_share_are_the_templates_section_calls_in_cell_order():
    cells = [
        c["source"] if isinstance(c["source"], str) else "".join(c["source"])
        for c in json.loads((ROOT / "templates" / "heat_sink_note.ipynb").read_text())["cells"]
        if c["cell_type"] == "code"
    ]
    names = ahead.sections_to_share(cells)
    assert names[-3:] == ["model_form_section", "plot_figures", "method_section"]
    assert names.index("figure_calibration") < names.index("transient_section")
    assert all(name in ahead.SHAREABLE or name in ahead.GROUPS for name in names)
    # only a last-line call report.NAME(result) of a shareable section counts
    assert (
        ahead.sections_to_share(
            [
                "report.plot_figures(result, 2)",
                "x = report.method_section(result)",
                "report.run(case)",
            ]
        )
        == []
    )


def test_without_a_handed_folder_a_section_is_drawn_where_it_is_called():
    result = _Result("alone")
    assert _said(_first_test_section(result)) == f"first alone by {os.getpid()}"


def test_the_kernel_takes_what_the_helper_drew_and_draws_the_rest(tmp_path):
    result = _Result("shared")
    ahead.remember_folder(result, tmp_path)
    helper = _fork(lambda: ahead.draw_ahead(result, tmp_path, _SECTIONS[1:]))
    os.waitpid(helper, 0)
    assert _said(_first_test_section(result)) == f"first shared by {os.getpid()}"
    assert _said(_second_test_section(result)) == f"second shared by {helper}"


def test_a_group_is_shared_part_by_part(tmp_path):
    result = _Result("grouped")
    ahead.remember_folder(result, tmp_path)
    (tmp_path / "_first_test_section.passed").touch()  # the kernel is at the first part
    helper = _fork(lambda: ahead.draw_ahead(result, tmp_path, ["_test_group"]))
    os.waitpid(helper, 0)
    first, second = _test_group(result)
    assert _said(first) == f"first grouped by {os.getpid()}"
    assert _said(second) == f"second grouped by {helper}"


def test_the_helper_stops_at_a_section_the_kernel_has_passed(tmp_path):
    result = _Result("late")
    ahead.remember_folder(result, tmp_path)
    _second_test_section(result)  # the kernel got there first
    helper = _fork(lambda: ahead.draw_ahead(result, tmp_path, _SECTIONS))
    os.waitpid(helper, 0)
    assert not list(tmp_path.glob("*.html"))  # nothing drawn: the first is the kernel's too
    assert _said(_first_test_section(result)) == f"first late by {os.getpid()}"


def _helper_holding(folder: Path, name: str, seconds: float, html: str | None) -> int:
    """A forked helper that holds a section's lock for ``seconds`` (writing ``html`` then);
    returned once it holds the lock."""

    def hold():
        import fcntl

        with open(folder / f"{name}.lock", "a+b") as handle:
            fcntl.flock(handle, fcntl.LOCK_EX)
            (folder / "started").touch()
            time.sleep(seconds)
            if html is not None:
                (folder / f"{name}.html").write_text(html)

    helper = _fork(hold)
    while not (folder / "started").exists():
        time.sleep(0.01)
    return helper


def test_the_kernel_waits_for_a_section_being_drawn(tmp_path):
    result = _Result("slow")
    ahead.remember_folder(result, tmp_path)
    helper = _helper_holding(tmp_path, "_second_test_section", 0.5, "drawn by the helper")
    assert _said(_second_test_section(result)) == "drawn by the helper"
    os.waitpid(helper, 0)


def test_a_helper_that_dies_holding_a_section_leaves_it_to_the_kernel(tmp_path):
    result = _Result("dead")
    ahead.remember_folder(result, tmp_path)
    helper = _helper_holding(tmp_path, "_first_test_section", 60.0, None)
    os.kill(helper, signal.SIGKILL)
    os.waitpid(helper, 0)
    assert _said(_first_test_section(result)) == f"first dead by {os.getpid()}"


def test_a_section_that_fails_in_the_helper_fails_in_the_kernel(tmp_path):
    result = _Result("failing")
    ahead.remember_folder(result, tmp_path)
    helper = _fork(lambda: ahead.draw_ahead(result, tmp_path, ["_failing_test_section"]))
    os.waitpid(helper, 0)
    with pytest.raises(ValueError, match="bad section"):
        _failing_test_section(result)


def _body(html: str) -> str:
    """The note without its time stamps and cell ids (which differ from run to run)."""
    html = html.replace(NOTE_TIME, "")
    return re.sub(r'id="cell-id=[0-9a-f]+"', "", html)


@pytest.mark.slow
def test_the_plate_fin_note_is_the_same_with_and_without_the_helper(tmp_path):
    import subprocess
    import sys

    from finkit.notes import render_note

    # In a process of its own: a pytest-xdist worker runs threads, and a process with threads
    # does not fork (finkit.notes.forks.fork_is_safe).
    code = (
        "import json, sys; from finkit.notes import render_note; stages = {}; "
        "render_note(sys.argv[1], sys.argv[2], execution_time=sys.argv[3], stages=stages); "
        "print(json.dumps(stages))"
    )
    run = subprocess.run(
        [sys.executable, "-c", code, str(DEMO / "nb200-plate-fan.yaml"), str(tmp_path / "a"),
         NOTE_TIME],
        capture_output=True, text=True, cwd=ROOT, check=True,
    )  # fmt: skip
    stages = json.loads(run.stdout.strip().splitlines()[-1])
    alone = render_note(
        DEMO / "nb200-plate-fan.yaml", tmp_path / "b", execution_time=NOTE_TIME, draw_ahead=False
    )
    first = (tmp_path / "a" / "nb200-plate-fan" / "note.html").read_text(encoding="utf-8")
    second = alone.html.read_text(encoding="utf-8")
    assert stages["(sections drawn ahead)"] >= 1  # the helper did draw some of it
    assert "Figure 1." in first and "References" in first
    assert _body(first) == _body(second)
