"""Provenance of a note: inputs hash, library versions, the note time."""

from __future__ import annotations

import datetime as _dt
import hashlib
import json
import platform
from collections.abc import Mapping
from functools import lru_cache
from typing import Any

from finkit.errors import InputError
from finkit.notes.files import (
    _LIBRARIES,
)

__all__ = [
    "inputs_sha256",
    "library_versions",
    "parse_note_time",
    "provenance",
]


# --------------------------------------------------------------------------------------------
# Provenance


def inputs_sha256(case: Any) -> str:
    """SHA-256 of a case's inputs, hexadecimal.

    For a validated case (what ``finkit.case.load_case`` returns) this is
    ``finkit.case.case_inputs_sha256(case)``: the hash of its SI content, the same whatever units
    or key order the file used. For a plain mapping (a case not validated, as in the tests of the
    note machinery) it is the SHA-256 of the canonical JSON of the mapping (keys sorted, no
    spaces, UTF-8).

    Parameters
    ----------
    case : finkit.case.Case or mapping
        Validated case, or the case as entered (JSON-safe). [-]

    Returns
    -------
    str
        64 hexadecimal digits. [-]
    """
    if hasattr(case, "model_dump"):
        from finkit.case.schema import case_inputs_sha256

        return case_inputs_sha256(case)
    canonical = json.dumps(
        case, sort_keys=True, separators=(",", ":"), ensure_ascii=False, allow_nan=False
    )
    return hashlib.sha256(canonical.encode("utf-8")).hexdigest()


@lru_cache(maxsize=1)
def library_versions() -> dict[str, str]:
    from importlib.metadata import PackageNotFoundError, version

    versions = {"python": platform.python_version()}
    for name in _LIBRARIES:
        try:
            versions[name] = version(name)
        except PackageNotFoundError:
            versions[name] = "not installed"
    return versions


def provenance(
    case: Any, *, template: str | None = None, note_time: str | None = None
) -> dict[str, Any]:
    """What a reviewer needs to reproduce a note: versions, template, inputs hash, time.

    Parameters
    ----------
    case : finkit.case.Case or mapping
        Validated case, or the case as entered (JSON-safe); see :func:`inputs_sha256`. [-]
    template : str, optional
        File name of the notebook template. [-]
    note_time : str, optional
        Execution time, ISO 8601 with time zone; default now. [-]

    Returns
    -------
    dict
        ``finkit_version``, ``template``, ``case_id``, ``kind``, ``inputs_sha256``,
        ``note_time``, ``libraries`` (python, numpy, scipy, CoolProp, pint, matplotlib,
        papermill, nbconvert versions) and ``signoff`` (the names of the title block's
        prepared by, checked by and approved by, for the sign-off table; empty when not
        given). [-]
    """
    from finkit import __version__

    block = _field(case, "title_block") or {}
    signoff = {role: _field(block, role) or "" for role in _SIGNOFF_ROLES}
    return {
        "finkit_version": __version__,
        "template": template,
        "case_id": _field(case, "case_id"),
        "kind": _field(case, "kind"),
        "inputs_sha256": inputs_sha256(case),
        "note_time": note_time if note_time is not None else parse_note_time(None),
        "libraries": dict(library_versions()),
        "signoff": {role: str(name) for role, name in signoff.items()},
    }


_SIGNOFF_ROLES = ("prepared_by", "checked_by", "approved_by")


def _field(case: Any, name: str) -> Any:
    if isinstance(case, Mapping):
        return case.get(name)
    return getattr(case, name, None)


def parse_note_time(value: _dt.datetime | str | None) -> str:
    """The note time as ISO 8601 text with its time zone; ``None`` means now, local time.

    Parameters
    ----------
    value : datetime, str or None
        The time; text in ISO 8601; a time without time zone is refused. [-]
    """
    if value is None:
        return _dt.datetime.now().astimezone().isoformat(timespec="seconds")
    if isinstance(value, str):
        try:
            value = _dt.datetime.fromisoformat(value)
        except ValueError:
            raise InputError(
                f"execution_time={value!r} is not ISO 8601; e.g. 2025-03-14T09:30:00+01:00"
            ) from None
    if not isinstance(value, _dt.datetime):
        raise InputError(f"execution_time={value!r} must be a datetime or an ISO 8601 string")
    if value.tzinfo is None or value.utcoffset() is None:
        raise InputError(f"execution_time={value.isoformat()!r} has no time zone; add one")
    return value.isoformat(timespec="seconds")
