"""Note sections drawn ahead by a second process while the kernel runs the first cells.

A heat-sink note's cells are mostly independent drawings of one solved case: figures, the
model-form check, the method's equations. ``finkit note`` solves the case in its own process
and then only waits while the kernel runs the cells; on two cores that leaves one idle for
about four seconds. So the parent forks a helper (:func:`draw_ahead`) that takes the note's
sections from the end, while the kernel takes them from the start, and each section is drawn
once, by whichever process reaches it first (issue 15).

Which process draws a section never changes what it shows: every section here is a pure
function of the solved case (figure and reference numbers included), and both processes hold
the very same solution (the helper is forked from the parent after it wrote the hand-over file
the kernel reads; :mod:`finkit.model.handover`). The sections travel as HTML files in the note's
private scratch folder, removed with the run.

The claim on a section is an advisory lock (``fcntl.flock``) on a file named after it, held
while the section is drawn, and released by the system if the helper dies, so the kernel
never waits on a dead helper: it then draws the section itself. A section the kernel has
passed is marked, and the helper stops at the first such mark (everything before it is the
kernel's). Without a hand-over (a template run by hand in JupyterLab, a batch child, a
platform without ``fork``), every function simply draws its section.
"""

from __future__ import annotations

import functools
import os
import time
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any

from finkit.report import present

__all__ = ["GROUPS", "SHAREABLE", "draw_ahead", "group", "sections_to_share", "shareable"]

#: The section functions that may be drawn by the helper: name -> function (``f(result)``).
SHAREABLE: dict[str, Callable[[Any], Any]] = {}

#: Sections made of shareable parts: name -> ``parts(result)``, the names of the shareable
#: functions the section calls, in order (so that a long section is shared part by part).
GROUPS: dict[str, Callable[[Any], list[str]]] = {}

# result id -> (result, scratch folder): what :func:`finkit.report.run` was handed.
_FOLDERS: dict[int, tuple[Any, Path]] = {}

#: Longest wait for a section the helper is drawing before the kernel draws it itself (a helper
#: that hangs rather than dies). [s]
WAIT_LIMIT = 120.0


def shareable(function: Callable[[Any], Any]) -> Callable[[Any], Any]:
    """Mark a section function ``f(result) -> Fragment`` as one the helper may draw ahead.

    Parameters
    ----------
    function : callable
        ``f(result) -> present.Fragment``, a pure function of the solved case. [-]
    """
    name = function.__name__

    @functools.wraps(function)
    def section(result):
        folder = _folder_of(result)
        if folder is None:
            return function(result)
        return _take(folder, name, lambda: function(result))

    SHAREABLE[name] = function
    return section


def group(parts: Callable[[Any], list[str]]) -> Callable[[Callable], Callable]:
    """Mark a section ``f(result)`` as made of shareable parts, listed by ``parts(result)``.

    The helper draws the parts (from the last back); the section itself runs where it is
    called and takes each part from the helper or draws it. A part listed but not called is
    drawn for nothing; a part called but not listed is drawn by the kernel: the note is the same
    either way.

    Parameters
    ----------
    parts : callable
        ``parts(result) -> list of str``, names of :func:`shareable` functions. [-]
    """

    def mark(function: Callable) -> Callable:
        GROUPS[function.__name__] = parts
        return function

    return mark


def remember_folder(result: Any, folder: str | os.PathLike | None) -> None:
    """Note where the helper of this result's note leaves its sections (from the hand-over).

    Parameters
    ----------
    result : finkit.model.CaseResult
        The solved case the kernel was handed. [-]
    folder : path-like or None
        The note's sections folder; None or empty: nothing to share. [-]
    """
    if not folder or not _can_lock():
        return
    if len(_FOLDERS) > 8:
        _FOLDERS.clear()
    _FOLDERS[id(result)] = (result, Path(folder))


def _folder_of(result: Any) -> Path | None:
    held = _FOLDERS.get(id(result))
    return held[1] if held is not None and held[0] is result else None


def _can_lock() -> bool:
    try:
        import fcntl  # noqa: F401 - POSIX only
    except ImportError:  # pragma: no cover - no helper on such platforms anyway
        return False
    return True


def _paths(folder: Path, name: str) -> tuple[Path, Path, Path]:
    return folder / f"{name}.lock", folder / f"{name}.html", folder / f"{name}.passed"


def _take(folder: Path, name: str, draw: Callable[[], Any]) -> Any:
    """The kernel's side: the helper's section if it drew it, else the kernel's own drawing."""
    import fcntl

    lock, done, passed = _paths(folder, name)
    try:
        handle = open(lock, "a+b")  # noqa: SIM115 - held across the wait below
    except OSError:  # the scratch folder is gone: nothing to share
        return draw()
    with handle:
        deadline = time.monotonic() + WAIT_LIMIT
        while True:
            try:
                fcntl.flock(handle, fcntl.LOCK_EX | fcntl.LOCK_NB)
                break
            except BlockingIOError:  # the helper is drawing this section
                if time.monotonic() > deadline:
                    return draw()
                time.sleep(0.005)
        try:
            if done.is_file():
                return present.Fragment(done.read_text(encoding="utf-8"))
            passed.touch()
        finally:
            fcntl.flock(handle, fcntl.LOCK_UN)
    return draw()


def _give(folder: Path, name: str, result: Any) -> bool:
    """The helper's side: draw one section unless the kernel has it; False to stop."""
    import fcntl

    lock, done, passed = _paths(folder, name)
    with open(lock, "a+b") as handle:
        try:
            fcntl.flock(handle, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except BlockingIOError:  # the kernel is at this section: the rest are its
            return False
        if passed.exists():
            return False
        html = str(SHAREABLE[name](result).__html__())
        partial = done.with_name(done.name + ".partial")
        partial.write_text(html, encoding="utf-8")
        os.replace(partial, done)
        return True


def sections_to_share(cells: Sequence[str]) -> list[str]:
    """The shareable sections a template's code cells draw, in cell order.

    A cell counts when its last line is a call ``report.NAME(result)`` with ``NAME`` shareable:
    the thin-template form of :mod:`finkit.report` (whose import, as ``finkit.report.ahead``'s
    package, registers every shareable section).

    Parameters
    ----------
    cells : sequence of str
        The source of each code cell, in order. [-]
    """
    import ast

    names = []
    for source in cells:
        try:
            body = ast.parse(source).body
        except SyntaxError:
            continue
        last = body[-1] if body else None
        call = getattr(last, "value", None)
        if not (isinstance(last, ast.Expr) and isinstance(call, ast.Call)):
            continue
        func = call.func
        if (
            isinstance(func, ast.Attribute)
            and isinstance(func.value, ast.Name)
            and func.value.id == "report"
            and (func.attr in SHAREABLE or func.attr in GROUPS)
            and [getattr(a, "id", None) for a in call.args] == ["result"]
            and not call.keywords
            and func.attr not in names
        ):
            names.append(func.attr)
    return names


def draw_ahead(result: Any, folder: str | os.PathLike, sections: Sequence[str]) -> None:
    """Draw the sections from the last one back until reaching one the kernel has taken.

    Run in the forked helper of :func:`finkit.notes.render_note`. A section that fails is left
    to the kernel, which draws it and reports the error itself.

    Parameters
    ----------
    result : finkit.model.CaseResult
        The solved case, the same the kernel is handed. [-]
    folder : path-like
        The note's scratch folder for the sections. [-]
    sections : sequence of str
        The shareable sections in the order the note's cells draw them. [-]
    """
    folder = Path(folder)
    names: list[str] = []
    for section in sections:
        names += list(GROUPS[section](result)) if section in GROUPS else [section]
    for name in reversed(names):
        try:
            if not _give(folder, name, result):
                return
        except Exception:  # noqa: BLE001 - the kernel draws it and reports any error
            continue
