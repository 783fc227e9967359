"""The case file: schema, validation and conversion to SI.

A case is a YAML file (or a YAML string, or a dict) that holds every input of one calculation.
:func:`load_case` validates it against the schema below and returns a frozen :class:`Case`
(:class:`HeatSinkCase` or :class:`SingleFinCase`) in which every physical value is an SI float
(m, K, W, Pa, ...; temperatures absolute in K). All problems are reported together, one line
each, as ``path.to.field: what is wrong (got X; allowed Y)``, in a :class:`CaseError`.

Two kinds of case exist (key ``kind``):

* ``heat-sink`` -- a plate-fin or pin-fin heat sink on a heat source, in forced flow (given
  approach velocity, given volume flow, or a fan curve) or natural convection;
* ``single-fin`` -- one fin with a prescribed base temperature, with an optional study over
  materials and heat transfer coefficients.

Units are read by :func:`finkit.case.units.to_si`; bare numbers mean SI. Material keys are checked
against ``finkit.physics.properties.materials`` (imported lazily, so the case modules import
without it).

The parts live in :mod:`~finkit.case.parts`, :mod:`~finkit.case.heat_sink`,
:mod:`~finkit.case.single_fin`, :mod:`~finkit.case.messages` and
:mod:`~finkit.case.cross_checks`; this module holds :func:`load_case` and the case types.
"""

from __future__ import annotations

import copy
import hashlib
import json
from pathlib import Path

from pydantic import (
    ValidationError,
)

from finkit.case.cross_checks import (
    _cross_checks_heat_sink,
    _cross_checks_single_fin,
    _structure_heat_sink,
)
from finkit.case.heat_sink import (
    Case,
    HeatSinkCase,
)
from finkit.case.messages import (
    _errors_of,
    _read,
)
from finkit.case.parts import (
    CaseError,
    _shown,
)
from finkit.case.single_fin import (
    _ROOTS,
    SingleFinCase,
    _Common,
)

__all__ = [
    "case_inputs_sha256",
    "load_case",
    "read_case",
]


_CROSS_CHECKS = {"heat-sink": _cross_checks_heat_sink, "single-fin": _cross_checks_single_fin}


# --------------------------------------------------------------------------------------------
# Public functions


def load_case(source) -> HeatSinkCase | SingleFinCase:
    """Read and validate a case; every physical value of the result is an SI float.

    Parameters
    ----------
    source : str, pathlib.Path or dict
        Path to a YAML file (``.yaml``/``.yml``), YAML text, or the case as a dict
        (e.g. the dictionary injected into a notebook). [-]

    Returns
    -------
    HeatSinkCase or SingleFinCase
        The validated, frozen case. ``case.entered`` holds the case as written.

    Raises
    ------
    CaseError
        With ``.errors``, one line per problem (all problems at once), e.g.
        ``sink.fins.thickness: expected a length, got '3 W'``.
    """
    raw, path = _read(source)
    kind = raw.get("kind")
    if kind not in _ROOTS:
        got = "missing" if kind is None else f"not allowed (got {_shown(kind)}"
        message = (
            "kind: missing (required; allowed: heat-sink, single-fin)"
            if kind is None
            else f"kind: {got}; allowed: heat-sink, single-fin)"
        )
        errors = [message]
        try:
            _Common.model_validate(raw)
        except ValidationError as exc:
            errors += _errors_of(exc, _Common)
        raise CaseError(errors)

    root = _ROOTS[kind]
    errors: list[str] = []
    previous = raw.get("previous_revision")
    if path is not None and isinstance(previous, dict) and isinstance(previous.get("source"), str):
        if not Path(previous["source"]).is_absolute():
            # Relative to the case file, kept absolute so that a note (which receives the case
            # as a mapping) finds it too.
            where = str((path.parent / previous["source"]).resolve())
            raw = {**raw, "previous_revision": {**previous, "source": where}}
    data = raw
    if kind == "heat-sink":
        errors, data = _structure_heat_sink(raw)
    case = None
    try:
        case = root.model_validate(data)
    except ValidationError as exc:
        errors += _errors_of(exc, root)
    errors += _CROSS_CHECKS[kind](raw)
    if errors:
        raise CaseError(list(dict.fromkeys(errors)))
    case._entered = copy.deepcopy(raw)
    case._source_path = path
    return case


def case_inputs_sha256(case: Case) -> str:
    """SHA-256 (hex) of the canonical JSON of the validated SI content of a case.

    Canonical: every float rounded to 12 significant figures, then ``json.dumps`` with sorted
    keys, no spaces, UTF-8. Two case files that differ only in units, comments, key order or
    defaults written out give the same digest. ``case.entered`` is not part of it. Fields added
    to the schema later are left out while absent, so older cases keep their digest.

    Parameters
    ----------
    case : Case
        A validated case from :func:`load_case`. [-]

    Returns
    -------
    str
        64 hexadecimal characters.
    """
    content = _rounded(case.model_dump(mode="json", exclude={"previous_revision"}))
    _drop_absent_later_fields(content)
    text = json.dumps(
        content, sort_keys=True, separators=(",", ":"), ensure_ascii=False, allow_nan=False
    )
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


#: Fields added after digests were first issued, (path, absent value): left out of the digest
#: when absent, so that a case written before them keeps its digest.
_LATER_FIELDS = (
    (("source",), None),
    (("sources",), []),
    (("sink", "base", "spreader"), None),
    (("transient",), None),
    (("air", "flow", "free_convection"), None),
    (("air", "bypass", "free_stream"), False),
)
#: The same for the fields of each entry under ``materials``.
_LATER_MATERIAL_FIELDS = (("specific_heat", None),)


def _drop_absent_later_fields(content: dict) -> None:
    for path, absent in _LATER_FIELDS:
        node = content
        for key in path[:-1]:
            node = node.get(key) if isinstance(node, dict) else None
        if isinstance(node, dict) and path[-1] in node and node[path[-1]] == absent:
            del node[path[-1]]
    for entry in (content.get("materials") or {}).values():
        for name, absent in _LATER_MATERIAL_FIELDS:
            if isinstance(entry, dict) and name in entry and entry[name] == absent:
                del entry[name]


def _rounded(value):
    """Floats to 12 significant figures, so that unit round-off (221 degF -> 378.15000000000003 K)
    does not change the digest."""
    if isinstance(value, float):
        return float(f"{value:.12g}")
    if isinstance(value, dict):
        return {k: _rounded(v) for k, v in value.items()}
    if isinstance(value, list):
        return [_rounded(v) for v in value]
    return value


def read_case(source) -> dict:
    """A case as entered (a mapping, unit strings kept) from a path, YAML text or a mapping.

    Reads and parses only; :func:`load_case` validates.

    Parameters
    ----------
    source : str, os.PathLike or Mapping
        A case file path, YAML text or a mapping. [-]
    """
    return _read(source)[0]
