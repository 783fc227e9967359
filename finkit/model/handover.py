"""The hand-over of a solved case from ``finkit note`` to its note kernel (one solve per note).

``finkit note`` (:func:`finkit.notes.render_note`) solves a case in the parent process, for
results.json and before any cell runs; the note template's first cell
(:func:`finkit.report.run`) takes that solution instead of solving again. The solution travels
as a pickle in the note's scratch folder, with the inputs' hash and the finkit version, so it
is used only for the very case and code that made it. Both sides import this small module, so
neither imports the other for it.
"""

from __future__ import annotations

import os
import pickle
from pathlib import Path
from typing import Any

__all__ = ["SOLVED_PICKLE", "read_solved", "write_solved"]

#: File in a note's scratch folder that carries the parent's solved case to the kernel.
SOLVED_PICKLE = "solved.pickle"
_SOLVED_FORMAT = 1


def write_solved(path: Path, validated: Any, result: Any, **extra: Any) -> Path:
    """Store the parent's solved case for the note kernel (:func:`read_solved`).

    ``finkit note`` solves the case before any cell runs (so a case the model rejects fails
    fast) and writes results.json from that solution; the template's first cell takes the same
    result from this file instead of solving the case a second time (issue 15). The file holds
    the case's input hash and the finkit version, and lives in the note's scratch folder, which
    is removed with the run. ``extra`` items (e.g. the comparison with the previous revision,
    which solves that revision) travel with it.

    Parameters
    ----------
    path : pathlib.Path
        File to write (in the note's scratch folder). [-]
    validated : finkit.case.Case
        The validated case; its input hash keys the file. [-]
    result : finkit.model.CaseResult
        The solution. [-]
    **extra
        Further items stored with it. [-]
    """
    from finkit import __version__
    from finkit.case.schema import case_inputs_sha256

    payload = {
        **extra,
        "format": _SOLVED_FORMAT,
        "finkit": __version__,
        "inputs_sha256": case_inputs_sha256(validated),
        "result": result,
    }
    # Whole or absent: written under a temporary name in the same (private scratch) folder.
    path = Path(path)
    partial = path.with_name(path.name + ".partial")
    partial.write_bytes(pickle.dumps(payload, protocol=pickle.HIGHEST_PROTOCOL))
    os.replace(partial, path)
    return path


def read_solved(path: str | os.PathLike | None, validated: Any) -> dict | None:
    """What :func:`write_solved` stored for this very case (``payload["result"]`` and the extra
    items), or None.

    None when no path is given, the file is missing (a note re-run by hand after its scratch
    folder is gone), unreadable, written by another finkit version or for other inputs: the
    caller then solves the case itself. Never a partly matching result.

    Parameters
    ----------
    path : str, path-like or None
        The file :func:`write_solved` wrote, if any. [-]
    validated : finkit.case.Case
        The case the kernel was given; the file must be for these very inputs. [-]
    """
    if not path:
        return None
    from finkit import __version__
    from finkit.case.schema import case_inputs_sha256

    try:
        with open(path, "rb") as handle:
            payload = pickle.load(handle)
    except Exception:  # noqa: BLE001 - missing, torn or foreign: the kernel solves the case
        return None
    if not (
        isinstance(payload, dict)
        and payload.get("format") == _SOLVED_FORMAT
        and payload.get("finkit") == __version__
        and payload.get("inputs_sha256") == case_inputs_sha256(validated)
        and payload.get("result") is not None
    ):
        return None
    return payload
