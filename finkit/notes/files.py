"""The files of a note: the case folder, atomic writes, and stale notes."""

from __future__ import annotations

import os
import re
import secrets
import sys
from pathlib import Path
from typing import Any, NamedTuple

from finkit.errors import FinkitError, InputError

__all__ = [
    "FAILED_IPYNB",
    "KERNEL_NAME",
    "NOTE_HTML",
    "NOTE_IPYNB",
    "NoteExecutionError",
    "NoteOutput",
    "NoteRenderError",
    "PAPER_SIZES",
    "PreparedCase",
    "RESULTS_JSON",
    "TEMPLATES_BY_KIND",
    "WINDOWS_RESERVED",
    "atomic_write",
    "case_folder",
    "skip_unused_slow_imports",
]

NOTE_HTML = "note.html"
NOTE_IPYNB = "note.ipynb"
RESULTS_JSON = "results.json"
FAILED_IPYNB = "note.failed.ipynb"

#: Notebook template of each case kind, in the top-level ``templates/`` folder.
TEMPLATES_BY_KIND = {
    "heat-sink": "heat_sink_note.ipynb",
    "single-fin": "single_fin_note.ipynb",
}

#: Name of the Jupyter kernel that runs this interpreter (see :func:`ensure_kernel`).
KERNEL_NAME = "finkit"

PAPER_SIZES = ("A4", "letter")

_PACKAGE_DIR = Path(__file__).resolve().parents[1]  # finkit/
# The note templates are package data (``finkit/templates``; ``<repo>/templates`` links to them so
# they can be opened in JupyterLab from a source checkout), so an installed wheel finds them too.
_TEMPLATE_DIR = _PACKAGE_DIR / "templates"
_HTML_TEMPLATE_NAME = "html_template"

_CASE_ID = re.compile(r"[A-Za-z0-9][A-Za-z0-9._-]{0,99}")
WINDOWS_RESERVED = {"CON", "PRN", "AUX", "NUL"} | {
    f"{p}{i}" for p in ("COM", "LPT") for i in "123456789"
}

_LIBRARIES = ("numpy", "scipy", "CoolProp", "pint", "matplotlib", "papermill", "nbconvert")


def skip_unused_slow_imports() -> None:
    """Keep a finkit command from importing an optional package it never uses (process-wide).

    nbformat validates notebooks with jsonschema, and jsonschema imports ``rfc3987_syntax``
    whenever it is installed (JupyterLab's event system pulls it in), only to check the "iri"
    string format. Importing it compiles about 40 grammars: 0.8-0.9 s of every ``finkit note``
    and ``finkit batch`` process on a 2-core machine (measured, issue 15). Notebook schemas use
    no IRI format, so a command blocks that import; jsonschema treats the package as absent, as
    on an installation without JupyterLab. Called by the command-line entry points only, so a
    program that imports finkit as a library keeps its own choice. A no-op when the package was
    already imported.
    """
    sys.modules.setdefault("rfc3987_syntax", None)


class NoteExecutionError(FinkitError):
    """A notebook template failed to run for a case (cell exception, dead kernel, timeout)."""


class NoteRenderError(FinkitError):
    """An executed note would not be a safe, self-contained HTML page."""


class NoteOutput(NamedTuple):
    """Paths written by :func:`render_note`."""

    folder: Path
    html: Path
    notebook: Path
    results_json: Path


class PreparedCase(NamedTuple):
    """A case ready to be injected into a template (see :func:`prepare_case`)."""

    case: dict
    case_id: str
    kind: str
    validated: Any


# --------------------------------------------------------------------------------------------
# Files


def atomic_write(path: str | os.PathLike, data: str | bytes) -> Path:
    """Write a file so that readers see the old content or the complete new one, never a part.

    The data goes to a temporary file in the same folder, is flushed and fsynced, then renamed
    over ``path`` with :func:`os.replace` (atomic on POSIX and Windows); the folder is fsynced
    where the platform allows. On any error the temporary file is removed and ``path`` is
    unchanged.

    Parameters
    ----------
    path : path-like
        Destination; its folder must exist. [-]
    data : str or bytes
        Content; ``str`` is written as UTF-8. [-]

    Returns
    -------
    pathlib.Path
        ``path``. [-]
    """
    path = Path(path)
    payload = data.encode("utf-8") if isinstance(data, str) else bytes(data)
    tmp_name = path.parent / f".{path.name}.{secrets.token_hex(6)}.tmp"
    # os.open with mode 0o666 lets the umask decide the permissions, as for a plain open().
    fd = os.open(tmp_name, os.O_WRONLY | os.O_CREAT | os.O_EXCL | getattr(os, "O_BINARY", 0), 0o666)
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(payload)
            handle.flush()
            os.fsync(handle.fileno())
        os.replace(tmp_name, path)
    except BaseException:
        Path(tmp_name).unlink(missing_ok=True)
        raise
    _fsync_dir(path.parent)
    return path


def _fsync_dir(folder: Path) -> None:
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:  # e.g. Windows cannot open a directory
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


def case_folder(out_dir: str | os.PathLike, case_id: str) -> Path:
    """The folder ``out_dir/case_id`` of a note, after checking ``case_id`` is a safe name.

    Parameters
    ----------
    out_dir : path-like
        Output folder (need not exist yet). [-]
    case_id : str
        1 to 100 characters from ``A-Z a-z 0-9 . _ -``, starting with a letter or digit, without
        ``..``, not a reserved device name. [-]

    Returns
    -------
    pathlib.Path
        The resolved folder, guaranteed to be a direct child of the resolved ``out_dir``. [-]

    Raises
    ------
    finkit.errors.InputError
        If ``case_id`` is not such a name, or the folder would resolve outside ``out_dir``
        (e.g. through a symbolic link).
    """
    allowed = (
        "1-100 characters A-Z a-z 0-9 . _ - starting with a letter or digit, no '..', "
        "no path separator"
    )
    if not isinstance(case_id, str) or not _CASE_ID.fullmatch(case_id) or ".." in case_id:
        raise InputError(f"case_id={case_id!r} is not a safe folder name; allowed: {allowed}")
    if case_id.split(".")[0].upper() in WINDOWS_RESERVED:
        raise InputError(f"case_id={case_id!r} is a reserved device name; allowed: {allowed}")
    base = Path(out_dir).resolve()
    folder = (base / case_id).resolve()
    if folder.parent != base:
        raise InputError(
            f"case_id={case_id!r} resolves to {folder}, outside the output folder {base}"
        )
    return folder
