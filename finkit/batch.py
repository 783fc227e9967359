"""Batches of variants: one base case, a table of overrides, a note per variant and an overview.

``run_batch(base, variants, out_dir)`` reads a base case and a variant table (CSV, or a YAML list),
builds and validates every variant before running any, renders the note of each valid variant as
:func:`finkit.notes.render_note` does, and writes an overview: ``index.html`` (sortable table of
results, margin chart, failures with their errors), ``summary.csv`` and ``summary.json``.

The variant table
-----------------
A CSV file whose first row holds the column names. The column ``variant`` names each variant
(it becomes the variant's ``case_id`` and the folder of its note: 1-64 characters from
``a-z 0-9 . _ -``). Every other column is a dotted path into the case, e.g. ``source.power``,
``air.inlet_temperature``, ``sink.fins.count`` or ``air.flow.fan.pressure[2]`` (a list item), and
may carry a unit in brackets or parentheses: ``source.power [W]``. A cell holds the value as a
case file would (``45 W``, ``50 degC``, ``14``); a bare number in a column with a unit gets that
unit, a cell with its own unit keeps it. An empty cell keeps the base value; ``null`` removes the
entry; a cell starting with ``[`` or ``{`` is read as YAML (``{volume_flow: 15 CFM}`` replaces a
whole block). Rows are counted as in a spreadsheet: the header is row 1. A YAML variant table is a
list of mappings, each with ``variant`` and dotted paths as keys (units in the values); its
entries are rows 1, 2, ...

A bad row (bad id, a cell that cannot be read, or a case that does not validate) becomes a
recorded failure naming the row and the column; the other rows still run.

Execution
---------
Every note runs isolated in its own process. Locally the parent process is warmed once (finkit,
numpy, scipy, pandas, matplotlib, nbconvert with its compiled page templates, papermill, ipykernel,
and every module the template imports) and then forks one child per variant; the child executes
the template with an in-process IPython kernel (the same papermill and nbclient code as
``render_note``, so the note is the same) and exits. Nothing a note does reaches another note: each
child starts from the untouched parent and is discarded. A child that raises, dies or runs past
the per-variant time limit is recorded as a failure with its partial notebook
(``<variant>/note.failed.ipynb``); the parent kills it (with any process it started) at the limit.
If the parent already runs other threads (e.g. inside a Jupyter kernel) forking is unsafe, and
each variant runs in a fresh interpreter instead (slower, as isolated).

With ``scheduler`` the variants run on an existing Dask distributed cluster through its
``concurrent.futures`` executor; each worker runs the variant in a fresh interpreter and returns
the note's files, which are written into ``out_dir`` as if computed locally.

Re-runs
-------
Each finished variant stores ``<variant>/batch-state.json`` with a key: the SHA-256 of the case's
SI inputs (:func:`finkit.case.case_inputs_sha256`), the case as entered, the template file, the
finkit version and the render options. A re-run reuses every note whose key is unchanged (unless
``force``), so an interrupted batch resumes where it stopped; variants that failed are run again.

Exit status (:attr:`BatchResult.exit_code`): 0 every variant computed and passing its limit; 1 all
computed, some fail their limit; 2 some variant could not be computed.
"""

from __future__ import annotations

import ast
import base64
import concurrent.futures
import copy
import csv
import dataclasses
import datetime as _dt
import hashlib
import html
import io
import json
import math
import os
import re
import shutil
import signal
import subprocess
import sys
import tempfile
import threading
import time
from collections.abc import Callable, Iterable, Mapping, Sequence
from functools import lru_cache
from pathlib import Path
from typing import Any
from urllib.parse import quote

from finkit import notes, present
from finkit.errors import FinkitError, InputError, NotSupportedError

__all__ = [
    "BatchResult",
    "EXIT_ALL_PASS",
    "EXIT_LIMIT_FAILED",
    "EXIT_NOT_COMPUTED",
    "Variant",
    "VariantOutcome",
    "VariantRow",
    "apply_overrides",
    "prepare_variants",
    "read_variant_table",
    "run_batch",
    "variant_key",
]

#: Exit status of a batch: all computed and passing; some fail their limit; some not computed.
EXIT_ALL_PASS, EXIT_LIMIT_FAILED, EXIT_NOT_COMPUTED = 0, 1, 2

VARIANT_COLUMN = "variant"
STATE_FILE = "batch-state.json"
INDEX_HTML = "index.html"
SUMMARY_CSV = "summary.csv"
SUMMARY_JSON = "summary.json"
_RUN_DIR = ".finkit-batch-run"
#: Scratch folders of ``notes.render_note`` (``.<case_id>.<8 random>.partial``).
_SCRATCH_NAME = re.compile(r"\.[A-Za-z0-9][A-Za-z0-9._-]*\.[a-z0-9_]{8}\.partial")
_LOCK_FILE = ".finkit-batch.lock"


_PATH = re.compile(r"[A-Za-z_][A-Za-z0-9_]*(\[\d+\])*(\.[A-Za-z_][A-Za-z0-9_]*(\[\d+\])*)*")
_HEADER = re.compile(r"\s*(?P<path>[^\s\[\]()]+(?:\[\d+\])*)\s*(?:[\[(](?P<unit>[^\])]*)[\])])?\s*")
_SEGMENT = re.compile(r"([A-Za-z_][A-Za-z0-9_]*)((?:\[\d+\])*)")
_VARIANT_ID = re.compile(r"[a-z0-9][a-z0-9._-]{0,63}")
_INT = re.compile(r"[+-]?\d+")
_NO_UNIT = {"", "-", "1"}
_FORBIDDEN_COLUMNS = {"case_id": "the variant column gives each variant its case_id", "kind": ""}


# --------------------------------------------------------------------------------------------
# Records


@dataclasses.dataclass(frozen=True)
class VariantRow:
    """One row of a variant table, as read.

    Attributes
    ----------
    variant : str
        The variant id as written (may be invalid; see ``errors``).
    row : int
        Row number (CSV: the line, header = 1; YAML: the entry, counted from 1).
    overrides : dict
        Dotted path -> value, units from the column header applied.
    errors : tuple of str
        Problems of the row itself, each naming the row and the column.
    """

    variant: str
    row: int
    overrides: dict[str, Any]
    errors: tuple[str, ...] = ()


@dataclasses.dataclass(frozen=True)
class Variant:
    """A variant after validation: the merged case, or the errors that keep it from running.

    Attributes
    ----------
    variant : str
        Variant id (the case id of its note).
    row : int
        Row number in the variant table.
    overrides : dict
        Dotted path -> value as applied.
    case : dict or None
        The merged case as entered (JSON-safe), ``None`` if the row is bad.
    validated : object or None
        What :func:`finkit.case.load_case` returned for it.
    errors : tuple of str
        Why the variant cannot run (row and column named); empty for a good variant.
    """

    variant: str
    row: int
    overrides: dict[str, Any]
    case: dict | None
    validated: Any = None
    errors: tuple[str, ...] = ()

    @property
    def is_valid(self) -> bool:
        """True when the variant can be computed."""
        return not self.errors and self.case is not None


@dataclasses.dataclass
class VariantOutcome:
    """What happened to one variant in a batch.

    Attributes
    ----------
    variant, row, overrides
        As in :class:`Variant`.
    status : {"pass", "fail", "error"}
        ``pass``/``fail`` against the limit for a computed variant; ``error`` when it could not
        be computed.
    state : {"computed", "reused", "failed", "not run"}
        ``reused`` when an unchanged note was kept from an earlier run.
    error_kind : str or None
        ``input`` (bad row), ``model``, ``template``, ``kernel`` (the note process died),
        ``timeout``, ``render``, ``exception`` or ``interrupted``.
    error : str or None
        One-line message.
    results : dict or None
        The variant's ``results.json`` content.
    seconds : float
        Wall time of the variant's note in this run (0 when reused or not run). [s]
    key : str or None
        The variant's re-run key (see :func:`variant_key`).
    """

    variant: str
    row: int
    overrides: dict[str, Any]
    status: str
    state: str
    error_kind: str | None = None
    error: str | None = None
    results: dict | None = None
    seconds: float = 0.0
    key: str | None = None

    def result_value(self, name: str) -> float | None:
        """A result's value from ``results.json`` (``None`` when absent)."""
        entry = ((self.results or {}).get("results") or {}).get(name)
        value = entry.get("value") if isinstance(entry, Mapping) else entry
        return float(value) if isinstance(value, int | float) and math.isfinite(value) else None

    def result_unit(self, name: str) -> str:
        """A result's unit from ``results.json`` (``""`` when absent)."""
        entry = ((self.results or {}).get("results") or {}).get(name)
        return str(entry.get("unit", "")) if isinstance(entry, Mapping) else ""

    def margin(self) -> tuple[float | None, str]:
        """Temperature margin below the limit [K] that decides the status, and where it is.

        The headline ``results`` of a results.json are those of its governing condition
        (``governing.condition``, results.json schema 2); a single-fin case has no conditions
        and is its own (``"nominal"``).
        """
        governing = (self.results or {}).get("governing")
        name = governing.get("condition") if isinstance(governing, Mapping) else None
        return self.result_value("temperature_margin"), str(name or "nominal")


@dataclasses.dataclass(frozen=True)
class BatchResult:
    """The outcome of :func:`run_batch`.

    Attributes
    ----------
    out_dir : pathlib.Path
        The batch folder.
    outcomes : tuple of VariantOutcome
        One per row of the variant table, in table order.
    index, summary_csv, summary_json : pathlib.Path
        The overview files.
    seconds : float
        Wall time of the batch. [s]
    """

    out_dir: Path
    outcomes: tuple[VariantOutcome, ...]
    index: Path
    summary_csv: Path
    summary_json: Path
    seconds: float

    @property
    def exit_code(self) -> int:
        """0 all computed and passing, 1 some variant fails its limit, 2 some not computed."""
        return _exit_code(self.outcomes)

    def counts(self) -> dict[str, int]:
        """Number of variants per status and per state."""
        return _counts(self.outcomes)


def _exit_code(outcomes: Iterable[VariantOutcome]) -> int:
    statuses = {o.status for o in outcomes}
    if "error" in statuses:
        return EXIT_NOT_COMPUTED
    if "fail" in statuses:
        return EXIT_LIMIT_FAILED
    return EXIT_ALL_PASS


def _counts(outcomes: Iterable[VariantOutcome]) -> dict[str, int]:
    counts = dict.fromkeys(("pass", "fail", "error", "computed", "reused", "failed", "not run"), 0)
    for o in outcomes:
        counts[o.status] += 1
        counts[o.state] += 1
    return counts


# --------------------------------------------------------------------------------------------
# Reading a variant table


def _parse_header(name: str, column: int) -> tuple[str, str]:
    match = _HEADER.fullmatch(name or "")
    if not match or not _PATH.fullmatch(match.group("path")):
        raise InputError(
            f"variant table: column {column} header {name!r} is not a dotted path such as "
            "'source.power' or 'source.power [W]'"
        )
    unit = (match.group("unit") or "").strip()
    return match.group("path"), unit


def _split_path(path: str) -> list[str | int]:
    parts: list[str | int] = []
    for segment in path.split("."):
        match = _SEGMENT.fullmatch(segment)
        if not match:
            raise InputError(f"{path!r} is not a dotted path")
        parts.append(match.group(1))
        parts.extend(int(i) for i in re.findall(r"\[(\d+)\]", match.group(2)))
    return parts


def _with_unit(value: Any, unit: str) -> Any:
    if unit in _NO_UNIT:
        return value
    if isinstance(value, bool):
        return value
    if isinstance(value, int | float):
        return f"{value:g} {unit}" if isinstance(value, float) else f"{value} {unit}"
    if isinstance(value, list):
        return [_with_unit(item, unit) for item in value]
    return value


def _parse_cell(text: str) -> tuple[bool, Any]:
    """``(given, value)`` of a CSV cell; raises ValueError for unreadable YAML."""
    text = text.strip()
    if not text:
        return False, None
    if text in ("null", "~"):
        return True, None
    if text[0] in "[{":
        import yaml

        try:
            return True, yaml.safe_load(text)
        except yaml.YAMLError as exc:
            first = str(exc).splitlines()[0] if str(exc) else type(exc).__name__
            raise ValueError(f"cannot read {text!r} as a YAML list or mapping ({first})") from None
    if _INT.fullmatch(text):
        return True, int(text)
    try:
        number = float(text)
    except ValueError:
        return True, text
    if not math.isfinite(number):
        return True, text
    return True, number


def _is_text_path(path: str) -> bool:
    """True when the last field of a dotted column path is a text field of the case."""
    from finkit.case import text_keys

    last = _split_path(path)
    last = [p for p in last if isinstance(p, str)][-1]
    return last in text_keys()


def _row_label(row: int, variant: str) -> str:
    return f"row {row} (variant {variant!r})" if variant else f"row {row}"


def _check_variant_id(variant: Any, row: int, seen: dict[str, int]) -> list[str]:
    label = f"row {row}, column {VARIANT_COLUMN}"
    if variant is None or (isinstance(variant, str) and not variant.strip()):
        return [f"{label}: missing; give each variant a name such as nb200-hot"]
    if not isinstance(variant, str) or not _VARIANT_ID.fullmatch(variant):
        return [
            f"{label}: {str(variant)!r} is not a variant id; use 1-64 characters from "
            "a-z 0-9 . _ - starting with a letter or digit"
        ]
    if variant in seen:
        return [f"{label}: {variant!r} is used already in row {seen[variant]}; ids must differ"]
    if variant.split(".")[0].upper() in notes._WINDOWS_RESERVED:
        return [f"{label}: {variant!r} is a reserved device name on Windows; choose another"]
    return []


def _read_csv(path: Path) -> list[VariantRow]:
    try:
        text = path.read_text(encoding="utf-8-sig")
    except OSError as exc:
        raise InputError(f"variant table {str(path)!r} cannot be read ({exc.strerror})") from None
    except UnicodeDecodeError:
        raise InputError(f"variant table {str(path)!r} is not UTF-8 text") from None
    # Standard CSV (RFC 4180: quoted cells, doubled quotes inside them, CRLF): only the
    # delimiter is taken from the header line (comma, semicolon or tab), the rest is csv.excel.
    try:
        delimiter = csv.Sniffer().sniff(text.split("\n", 1)[0], delimiters=",;\t").delimiter
    except csv.Error:
        delimiter = ","
    lines = list(csv.reader(io.StringIO(text, newline=""), csv.excel, delimiter=delimiter))
    if not lines or not any(c.strip() for c in lines[0]):
        raise InputError(f"variant table {str(path)!r} is empty; the first row names the columns")
    header = [c.strip() for c in lines[0]]
    if VARIANT_COLUMN not in header:
        raise InputError(
            f"variant table {str(path)!r}: no column named {VARIANT_COLUMN!r} "
            f"(got {', '.join(repr(h) for h in header)})"
        )
    columns: list[tuple[str, str] | None] = []
    seen_paths: dict[str, int] = {}
    for index, name in enumerate(header, start=1):
        if name == VARIANT_COLUMN:
            columns.append(None)
            continue
        path_, unit = _parse_header(name, index)
        root = path_.split(".")[0].split("[")[0]
        if root in _FORBIDDEN_COLUMNS and path_ == root:
            raise InputError(
                f"variant table: column {name!r} cannot be overridden"
                + (f" ({_FORBIDDEN_COLUMNS[root]})" if _FORBIDDEN_COLUMNS[root] else "")
            )
        if path_ in seen_paths:
            raise InputError(
                f"variant table: column {name!r} repeats column {seen_paths[path_]} ({path_})"
            )
        seen_paths[path_] = index
        columns.append((path_, unit))
    variant_at = header.index(VARIANT_COLUMN)

    rows = []
    seen_ids: dict[str, int] = {}
    for line_no, cells in enumerate(lines[1:], start=2):
        if not any(c.strip() for c in cells):
            continue  # blank line
        variant = cells[variant_at].strip() if variant_at < len(cells) else ""
        errors = _check_variant_id(variant, line_no, seen_ids)
        if not errors:
            seen_ids[variant] = line_no
        if len(cells) > len(header) and any(c.strip() for c in cells[len(header) :]):
            errors.append(
                f"{_row_label(line_no, variant)}: {len(cells)} cells but {len(header)} columns"
            )
        overrides: dict[str, Any] = {}
        for column, text in zip(columns, cells, strict=False):
            if column is None:
                continue
            path_, unit = column
            try:
                given, value = _parse_cell(text)
                if given and not isinstance(value, str) and _is_text_path(path_) and text.strip():
                    value = text.strip()  # revision 1.10 stays "1.10", not 1.1
            except ValueError as exc:
                errors.append(f"{_row_label(line_no, variant)}, column {path_}: {exc}")
                continue
            if given:
                overrides[path_] = _with_unit(value, unit)
        rows.append(VariantRow(variant, line_no, overrides, tuple(errors)))
    if not rows:
        raise InputError(f"variant table {str(path)!r} has no variant rows")
    return rows


def _read_yaml_list(path: Path) -> list[VariantRow]:
    import yaml

    try:
        data = yaml.safe_load(path.read_text(encoding="utf-8"))
    except OSError as exc:
        raise InputError(f"variant table {str(path)!r} cannot be read ({exc.strerror})") from None
    except yaml.YAMLError as exc:
        first = str(exc).splitlines()[0] if str(exc) else type(exc).__name__
        raise InputError(f"variant table {str(path)!r} is not valid YAML: {first}") from None
    return _rows_from_list(data, str(path))


def _rows_from_list(data: Any, where: str) -> list[VariantRow]:
    if not isinstance(data, list) or not data:
        raise InputError(f"variant table {where}: expected a non-empty list of mappings")
    rows = []
    seen_ids: dict[str, int] = {}
    for number, entry in enumerate(data, start=1):
        if not isinstance(entry, Mapping):
            rows.append(
                VariantRow("", number, {}, (f"row {number}: expected a mapping (got {entry!r})",))
            )
            continue
        variant = entry.get(VARIANT_COLUMN)
        errors = _check_variant_id(variant, number, seen_ids)
        variant = str(variant) if variant is not None else ""
        if not errors:
            seen_ids[variant] = number
        overrides = {}
        for key, value in entry.items():
            if key == VARIANT_COLUMN:
                continue
            if not isinstance(key, str) or not _PATH.fullmatch(key) or key in _FORBIDDEN_COLUMNS:
                errors.append(
                    f"{_row_label(number, variant)}, column {key!r}: not a dotted path of the case "
                    "that a variant may override"
                )
                continue
            overrides[key] = value
        rows.append(VariantRow(variant, number, overrides, tuple(errors)))
    return rows


def read_variant_table(
    table: str | os.PathLike | Sequence[Mapping[str, Any]],
) -> list[VariantRow]:
    """Read a variant table: a CSV file, a YAML file holding a list, or a list of mappings.

    Parameters
    ----------
    table : path-like or sequence of mappings
        ``.csv`` file (column ``variant`` plus dotted paths, units in the header or the cells),
        ``.yaml``/``.yml`` file holding a list of mappings, or such a list. [-]

    Returns
    -------
    list of VariantRow
        One per row, with the row's own problems in ``errors`` (bad id, unreadable cell). [-]

    Raises
    ------
    finkit.errors.InputError
        If the table as a whole cannot be used (missing file, no ``variant`` column, a header
        that is not a dotted path, a repeated column, no rows).
    """
    if isinstance(table, Sequence) and not isinstance(table, str | bytes):
        return _rows_from_list(list(table), "(list)")
    path = Path(table)
    if not path.is_file():
        raise InputError(f"variant table {str(path)!r} does not exist")
    if path.suffix.lower() in (".yaml", ".yml"):
        return _read_yaml_list(path)
    return _read_csv(path)


# --------------------------------------------------------------------------------------------
# Overrides and validation


def apply_overrides(base: Mapping[str, Any], overrides: Mapping[str, Any]) -> dict:
    """A deep copy of ``base`` with each dotted path set to its value.

    Parameters
    ----------
    base : mapping
        The case as entered. [-]
    overrides : mapping
        Dotted path (``source.power``, ``air.flow.fan.pressure[2]``) -> value; ``None`` removes
        the entry. Missing mappings on the way are created. [-]

    Returns
    -------
    dict
        The merged case. [-]

    Raises
    ------
    KeyError
        ``KeyError(path, message)`` for a path that cannot be set (it goes through a value that
        is not a mapping, or a list index out of range).
    """
    merged = copy.deepcopy(dict(base))
    for path_, value in overrides.items():
        parts = _split_path(path_)
        node: Any = merged
        for depth, part in enumerate(parts[:-1]):
            here = ".".join(str(p) for p in parts[: depth + 1])
            if isinstance(part, int):
                if not isinstance(node, list) or not -len(node) <= part < len(node):
                    raise KeyError(path_, f"{here} is not a list item of the base case")
                node = node[part]
                continue
            if not isinstance(node, dict):
                raise KeyError(path_, f"the base case has no mapping at {here}")
            if node.get(part) is None:
                node[part] = [] if isinstance(parts[depth + 1], int) else {}
            node = node[part]
        last = parts[-1]
        if isinstance(last, int):
            if not isinstance(node, list) or not -len(node) <= last < len(node):
                raise KeyError(path_, "list index out of range in the base case")
            node[last] = copy.deepcopy(value)
        elif not isinstance(node, dict):
            here = ".".join(str(p) for p in parts[:-1])
            raise KeyError(path_, f"the base case has no mapping at {here}")
        elif value is None:
            node.pop(last, None)
        else:
            node[last] = copy.deepcopy(value)
    return merged


def _columns_for(message: str, columns: Sequence[str]) -> list[str]:
    """The columns an error line of ``load_case`` is about: its field, or fields it names."""
    field_ = message.split(": ", 1)[0] if ": " in message else ""
    hits = [
        c
        for c in columns
        if field_
        and (
            field_ == c
            or field_.startswith((c + ".", c + "["))
            or c.startswith((field_ + ".", field_ + "["))
        )
    ]
    if hits:
        return hits
    return [c for c in columns if re.search(rf"(?<![\w.]){re.escape(c)}(?![\w\[])", message)]


def _load_base(base: str | os.PathLike | Mapping[str, Any]) -> tuple[dict, Any, str]:
    from finkit.case import CaseError, load_case

    try:
        validated = load_case(dict(base) if isinstance(base, Mapping) else Path(base))
    except CaseError as exc:
        raise CaseError([f"base case: {line}" for line in exc.errors]) from None
    entered = notes._json_safe(validated.entered, "case")
    label = str(base) if not isinstance(base, Mapping) else f"(mapping) {validated.case_id}"
    return entered, validated, label


def prepare_variants(
    base: str | os.PathLike | Mapping[str, Any],
    table: str | os.PathLike | Sequence[Mapping[str, Any]],
) -> list[Variant]:
    """Build and validate every variant of a table (nothing runs).

    Parameters
    ----------
    base : path-like or mapping
        The base case (YAML file or mapping, as entered); it must validate on its own. [-]
    table : path-like or sequence of mappings
        The variant table (see :func:`read_variant_table`). [-]

    Returns
    -------
    list of Variant
        In table order; a bad row has ``errors`` naming the row and the column. [-]

    Raises
    ------
    finkit.case.CaseError
        If the base case does not validate (its errors prefixed ``base case:``).
    finkit.errors.InputError
        If the table as a whole cannot be used.
    """
    from finkit.case import CaseError, load_case

    entered, _, _ = _load_base(base)
    out = []
    for row in read_variant_table(table):
        label = _row_label(row.row, row.variant)
        errors = list(row.errors)
        merged = None
        if not errors:
            try:
                merged = apply_overrides(entered, row.overrides)
            except KeyError as exc:
                path_, why = exc.args
                errors.append(f"{label}, column {path_}: {why}")
        validated = None
        if merged is not None:
            merged["case_id"] = row.variant
            if not any(str(k).startswith("previous_revision") for k in row.overrides):
                # The base's previous revision is the base's, not a variant's: a variant note
                # compares with a previous revision only when its row names one.
                merged.pop("previous_revision", None)
            try:
                validated = load_case(merged)
                merged = notes._json_safe(validated.entered, "case")
            except CaseError as exc:
                for line in exc.errors:
                    hit = _columns_for(line, list(row.overrides))
                    where = (
                        f", column {' and '.join(hit)}"
                        if hit
                        else " (base case with this row's overrides)"
                    )
                    if len(hit) == 1 and line.startswith(hit[0] + ": "):
                        line = line[len(hit[0]) + 2 :]
                    errors.append(f"{label}{where}: {line}")
            except InputError as exc:
                errors.append(f"{label}: {exc}")
        out.append(
            Variant(
                variant=row.variant,
                row=row.row,
                overrides=dict(row.overrides),
                case=merged if not errors else None,
                validated=validated if not errors else None,
                errors=tuple(errors),
            )
        )
    return out


def _sha256_json(value: Any) -> str:
    text = json.dumps(value, sort_keys=True, separators=(",", ":"), ensure_ascii=False)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def variant_key(
    validated: Any,
    template: str | os.PathLike,
    *,
    entered: Mapping[str, Any] | None = None,
    show_code: bool = False,
    paper: str = "A4",
) -> str:
    """The re-run key of a variant: unchanged key, unchanged note.

    SHA-256 of the canonical JSON of: the case's SI inputs hash
    (:func:`finkit.case.case_inputs_sha256`), the case as entered (the note echoes it), the
    SHA-256 of the template file's bytes, the finkit version and the render options.

    Parameters
    ----------
    validated : finkit.case.Case
        The validated variant case. [-]
    template : path-like
        The notebook template. [-]
    entered : mapping, optional
        The case as entered; default ``validated.entered``. [-]
    show_code : bool, optional
        Render option. [-]
    paper : str, optional
        Render option. [-]

    Returns
    -------
    str
        64 hexadecimal digits. [-]
    """
    from finkit import __version__
    from finkit.case import case_inputs_sha256

    return _sha256_json(
        {
            "inputs_sha256": case_inputs_sha256(validated),
            "entered_sha256": _sha256_json(
                notes._json_safe(entered if entered is not None else validated.entered, "case")
            ),
            "template_sha256": hashlib.sha256(Path(template).read_bytes()).hexdigest(),
            "finkit_version": __version__,
            "show_code": bool(show_code),
            "paper": paper,
        }
    )


# --------------------------------------------------------------------------------------------
# The child: one note in an isolated process, with an in-process kernel


@lru_cache(maxsize=1)
def _inprocess_classes() -> tuple[type, type, type]:
    """Kernel, client and manager classes that let papermill/nbclient drive an in-process kernel.

    ipykernel's in-process classes predate nbclient's asynchronous client: the adapters make
    ``execute`` and ``wait_for_ready`` awaitable (the cell runs in the main thread, in nbclient's
    event loop, as in a kernel process), make ``shutdown_kernel`` accept ``now``, and direct the
    kernel's stdout/stderr messages to the request being executed.
    """
    from ipykernel.inprocess.blocking import BlockingInProcessKernelClient
    from ipykernel.inprocess.ipkernel import InProcessKernel
    from ipykernel.inprocess.manager import InProcessKernelManager
    from ipykernel.ipkernel import IPythonKernel

    class _Kernel(InProcessKernel):
        async def execute_request(self, stream, ident, parent):
            with self._redirected_io():
                for out in (self.stdout, self.stderr):
                    out.set_parent(parent)
                await IPythonKernel.execute_request(self, stream, ident, parent)

    class _Client(BlockingInProcessKernelClient):
        async def _dispatch(self, msg):
            stream = self.kernel.shell_stream
            self.session.send(stream, msg)
            await self.kernel.dispatch_shell(stream.recv_multipart())
            _, reply = self.session.recv(stream, copy=False)
            self.shell_channel.call_handlers_later(reply)

        async def execute(  # noqa: PLR0913 - the jupyter_client signature
            self,
            code,
            silent=False,
            store_history=True,
            user_expressions=None,
            allow_stdin=None,
            stop_on_error=True,
        ):
            content = {
                "code": code,
                "silent": silent,
                "store_history": store_history,
                "user_expressions": user_expressions or {},
                "allow_stdin": False,
                "stop_on_error": stop_on_error,
            }
            msg = self.session.msg("execute_request", content)
            await self._dispatch(msg)
            return msg["header"]["msg_id"]

        async def wait_for_ready(self, timeout=None):
            await self._dispatch(self.session.msg("kernel_info_request"))
            while True:
                msg = self.shell_channel.get_msg(timeout=timeout or 60)
                if msg["msg_type"] == "kernel_info_reply":
                    self._handle_kernel_info_reply(msg)
                    return

        def is_alive(self):
            return self.kernel is not None

    class _Manager(InProcessKernelManager):
        def start_kernel(self, **kwargs):
            self.kernel = _Kernel(parent=self, session=self.session)
            _enable_inline_matplotlib(self.kernel.shell)

        def client(self, **kwargs):
            kwargs["kernel"] = self.kernel
            return _Client(parent=self, session=self.session, **kwargs)

        def shutdown_kernel(self, now=False, restart=False):
            super().shutdown_kernel()

    return _Kernel, _Client, _Manager


_INLINE_BACKEND = "module://matplotlib_inline.backend_inline"


def _enable_inline_matplotlib(shell: Any) -> None:
    """Matplotlib as a kernel process has it: the inline backend, figures shown after a cell.

    A kernel process sets ``MPLBACKEND`` to the inline backend, whose import (at the first
    figure) calls these two functions on the running shell.
    """
    os.environ["MPLBACKEND"] = _INLINE_BACKEND
    from IPython.core.pylabtools import activate_matplotlib
    from matplotlib_inline.backend_inline import configure_inline_support

    activate_matplotlib(_INLINE_BACKEND)
    configure_inline_support(shell, _INLINE_BACKEND)


def _inprocess_kernel_manager() -> Any:
    from IPython.core.interactiveshell import InteractiveShell
    from traitlets.config import Config

    _, _, manager = _inprocess_classes()
    # One shell per process: a fork of a process that runs IPython (e.g. a notebook calling
    # run_batch) must not reuse the parent's shell; its history stays in memory, as nbclient
    # asks of a kernel process.
    from ipykernel.inprocess.ipkernel import InProcessInteractiveShell

    InProcessInteractiveShell.clear_instance()
    InteractiveShell.clear_instance()
    config = Config()
    config.HistoryManager.hist_file = ":memory:"
    config.HistoryManager.enabled = False
    return manager(config=config)


def _render_child(task: Mapping[str, Any]) -> dict[str, Any]:
    """Render one variant's note in this (child) process; returns the outcome as a dict."""
    from finkit.notes import NoteExecutionError, NoteRenderError, render_note

    _reseed()
    stages: dict[str, float] = {}
    try:
        started = time.perf_counter()
        km = _inprocess_kernel_manager()
        stages["start kernel"] = time.perf_counter() - started
        render_note(
            task["case"],
            task["out_dir"],
            template=task["template"],
            show_code=task["show_code"],
            execution_time=task["note_time"],
            timeout=task["timeout"],
            paper=task["paper"],
            kernel_manager=km,
            stages=stages,
        )
    except NoteExecutionError as exc:
        return {"ok": False, "kind": "template", "error": str(exc)}
    except NoteRenderError as exc:
        return {"ok": False, "kind": "render", "error": str(exc)}
    except FinkitError as exc:
        return {"ok": False, "kind": "model", "error": _one_line(exc)}
    except BaseException as exc:  # noqa: BLE001 - reported, never raised out of a child
        return {
            "ok": False,
            "kind": "exception",
            "error": f"{type(exc).__name__}: {_one_line(exc)}",
        }
    return {"ok": True, "stages": stages}


def _reseed() -> None:
    """A forked child inherits the parent's random state; a kernel process would not."""
    import random

    random.seed()
    np = sys.modules.get("numpy")
    if np is not None:
        np.random.seed()


def _one_line(exc: Any, limit: int = 300) -> str:
    line = " ".join(str(exc).split()) or type(exc).__name__
    return line if len(line) <= limit else line[: limit - 1] + "…"


#: Seconds between two looks of a child at its parent (:func:`_die_with_parent`).
PARENT_WATCH_INTERVAL = 1.0


def _die_with_parent(parent_pid: int) -> None:
    """Kill this child's whole process group (the child and its notebook kernel) as soon as
    the batch that started it is gone.

    Each child runs in its own process group so that the parent can stop it and its kernel
    together at a time limit; the same separation means a killed parent would leave it
    running and writing into the output folder. A daemon thread looks at the parent's pid
    every :data:`PARENT_WATCH_INTERVAL` seconds; when the child has been re-parented (the
    batch died, however), it sends SIGKILL to its own group. Only its own group: the child
    is the leader of that group, so nothing of the user's is touched.
    """
    import threading

    def watch() -> None:
        while True:
            time.sleep(PARENT_WATCH_INTERVAL)
            if os.getppid() != parent_pid:
                try:
                    os.killpg(os.getpgid(0), signal.SIGKILL)
                finally:
                    os._exit(1)

    threading.Thread(target=watch, name="finkit-parent-watch", daemon=True).start()


def _child_main(task: dict, result_path: str, log_path: str) -> None:
    """Entry of a forked child: own process group, output to a log, outcome to a JSON file."""
    parent = os.getppid()
    try:
        os.setpgid(0, 0)
    except OSError:
        pass
    if os.getpgid(0) == os.getpid():
        _die_with_parent(parent)
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    fd = os.open(log_path, os.O_WRONLY | os.O_CREAT | os.O_APPEND, 0o644)
    os.dup2(fd, 1)
    os.dup2(fd, 2)
    os.close(fd)
    outcome = _render_child(task)
    notes.atomic_write(result_path, json.dumps(outcome))
    sys.stdout.flush()
    sys.stderr.flush()


# --------------------------------------------------------------------------------------------
# Warm parent


_WARM_MODULES = (
    "numpy",
    "scipy.optimize",
    "scipy.integrate",
    "scipy.interpolate",
    "pandas",
    "matplotlib",
    "matplotlib.figure",
    "matplotlib.pyplot",
    "matplotlib.backends.backend_agg",
    "matplotlib_inline.backend_inline",
    "IPython",
    "IPython.core.pylabtools",
    "IPython.core.application",
    "IPython.core.completerlib",
    "IPython.core.crashhandler",
    "IPython.core.logger",
    "IPython.core.oinspect",
    "bdb",
    "tornado.platform.asyncio",
    "pandas.io.formats.html",
    "pandas.io.formats.string",
    "ipykernel.ipkernel",
    "ipykernel.debugger",
    "ipykernel.inprocess.ipkernel",
    "ipykernel.inprocess.blocking",
    "ipykernel.inprocess.manager",
    "jupyter_client",
    "nbformat",
    "nbclient",
    "nbconvert",
    "papermill",
    "papermill.translators",
    "finkit.case",
    "finkit.model",
    "finkit.present",
    "finkit.notes",
)


def _template_imports(template: Path) -> list[str]:
    """Module names imported by the code cells of a notebook template."""
    import nbformat
    from IPython.core.inputtransformer2 import TransformerManager

    transformer = TransformerManager()
    names: list[str] = []
    for cell in nbformat.read(template, as_version=4).cells:
        if cell.cell_type != "code":
            continue
        try:
            tree = ast.parse(transformer.transform_cell(cell.source))
        except (SyntaxError, ValueError):
            continue
        for node in ast.walk(tree):
            if isinstance(node, ast.Import):
                names += [alias.name for alias in node.names]
            elif isinstance(node, ast.ImportFrom) and node.module and not node.level:
                names.append(node.module)
                names += [f"{node.module}.{alias.name}" for alias in node.names]
    return list(dict.fromkeys(names))


def _warm_up(templates: Iterable[Path], show_code: bool, paper: str, validated: Any = None) -> None:
    """Pay once, in the parent, what every note would pay: imports, templates, fonts.

    Also runs the model once on the base case (``validated``), so that the modules and the
    read-only tables it loads on first use (air properties, materials) are in memory before the
    children fork, and fills the content-keyed caches of the previous revision's solution and
    of the equations. The model is pure: this leaves no state a note could see.
    """
    import importlib

    os.environ.setdefault("PYDEVD_DISABLE_FILE_VALIDATION", "1")
    wanted = list(_WARM_MODULES)
    for template in templates:
        wanted += _template_imports(template)
    for name in dict.fromkeys(wanted):
        if name in sys.modules:
            continue
        try:
            importlib.import_module(name)
        except Exception:  # noqa: BLE001 - 'from x import function' names are not modules
            pass
    _inprocess_classes()
    notes._library_versions()
    if validated is not None:
        try:
            from finkit import report
            from finkit.model import run_case

            base = run_case(validated)
            base.to_json_dict()
            # Solved once here, reused by every child: the previous revision the variants are
            # compared with, and the method section's equations (content-keyed caches).
            report.changes_since(base)
            report.method_section(base)
        except Exception:  # noqa: BLE001 - the variants report their own model errors
            pass

    import nbformat
    from matplotlib.figure import Figure

    figure = Figure(figsize=(3, 2))
    axes = figure.add_subplot()
    axes.plot([0, 1], [0, 1], label="warm-up")
    axes.set_xlabel("x [mm]")
    axes.legend()
    figure.savefig(io.BytesIO(), format="png", dpi=100)
    from finkit import present

    present.equation(r"\eta = \dfrac{\tanh(m L)}{m L}")
    nb = nbformat.v4.new_notebook()
    nb.cells = [
        nbformat.v4.new_markdown_cell("# warm-up"),
        nbformat.v4.new_code_cell(
            "1",
            outputs=[
                nbformat.v4.new_output(
                    "execute_result", data={"text/plain": "1", "text/html": "<p>1</p>"}
                )
            ],
        ),
    ]
    nb.metadata["finkit"] = {"status": "complete", "provenance": {"case_id": "warm-up"}}
    notes.render_html(nb, show_code=show_code, paper=paper)


# --------------------------------------------------------------------------------------------
# Running children


def _fork_is_safe() -> bool:
    return (
        hasattr(os, "fork")
        and threading.active_count() == 1
        and "fork" in __import__("multiprocessing").get_all_start_methods()
    )


class _Job:
    """A running child: a forked process or a fresh interpreter."""

    def __init__(self, task: dict, run_dir: Path, use_fork: bool) -> None:
        self.task = task
        self.variant = task["variant"]
        self.result_path = run_dir / f"{self.variant}.outcome.json"
        self.log_path = run_dir / f"{self.variant}.log"
        self.result_path.unlink(missing_ok=True)
        self.log_path.unlink(missing_ok=True)
        self.returncode: int | None = None
        self.started = time.monotonic()
        self.deadline = self.started + float(task["timeout"])
        if use_fork:
            import multiprocessing

            ctx = multiprocessing.get_context("fork")
            self.process = ctx.Process(
                target=_child_main,
                args=(task, str(self.result_path), str(self.log_path)),
                name=f"finkit-batch-{self.variant}",
                daemon=True,
            )
            self.process.start()
            self.pid = self.process.pid
            self.popen = None
        else:
            task_path = run_dir / f"{self.variant}.task.json"
            notes.atomic_write(task_path, json.dumps(task))
            with open(self.log_path, "ab") as log:
                self.popen = subprocess.Popen(
                    [
                        sys.executable,
                        "-m",
                        "finkit.batch",
                        "--run-task",
                        str(task_path),
                        str(self.result_path),
                    ],
                    stdin=subprocess.DEVNULL,
                    stdout=log,
                    stderr=log,
                    start_new_session=True,
                )
            self.pid = self.popen.pid
            self.process = None

    @property
    def sentinel(self) -> int | None:
        return self.process.sentinel if self.process is not None else None

    def exitcode(self) -> int | None:
        if self.returncode is not None:
            return self.returncode
        if self.process is not None:
            return self.process.exitcode if not self.process.is_alive() else None
        return self.popen.poll()

    def kill(self) -> None:
        try:
            os.killpg(self.pid, signal.SIGKILL)
        except (ProcessLookupError, PermissionError, OSError):
            pass
        try:
            os.kill(self.pid, signal.SIGKILL)
        except (ProcessLookupError, OSError):
            pass
        self.join()

    def join(self) -> None:
        if self.process is not None:
            self.process.join()
            self.returncode = self.process.exitcode
            self.process.close()
            self.process = None
        elif self.popen is not None:
            self.returncode = self.popen.wait()

    def outcome(self, *, timed_out: bool = False, interrupted: bool = False) -> dict:
        """The child's outcome, or a failure built from how it ended."""
        seconds = time.monotonic() - self.started
        if not timed_out and not interrupted and self.result_path.is_file():
            try:
                data = json.loads(self.result_path.read_text(encoding="utf-8"))
                return {**data, "seconds": seconds}
            except ValueError:
                pass
        if interrupted:
            kind, what = "interrupted", "the batch was interrupted"
        elif timed_out:
            kind, what = "timeout", f"time limit of {self.task['timeout']:g} s per variant exceeded"
        else:
            code = self.exitcode()
            how = f"exit code {code}" if code is not None and code >= 0 else f"signal {-code}"
            what = f"the kernel died (the note process ended with {how}{self._log_tail()})"
            kind = "kernel"
        message = _rescue_partial(self.task, what)
        return {"ok": False, "kind": kind, "error": message, "seconds": seconds}

    def _log_tail(self) -> str:
        try:
            lines = [
                ln.strip()
                for ln in self.log_path.read_text(encoding="utf-8", errors="replace").splitlines()
            ]
        except OSError:
            return ""
        lines = [ln for ln in lines if ln and "Debugger warning" not in ln]
        return f": {_one_line(lines[-1], 160)}" if lines else ""


def _rescue_partial(task: Mapping[str, Any], what: str) -> str:
    """Keep a killed child's partial notebook as ``note.failed.ipynb``; return the message.

    ``render_note`` executes in a scratch folder ``.<case_id>.<8 random>.partial`` beside the
    note folder, and papermill saves the notebook there at each cell's start and end.
    """
    try:
        return _rescue_partial_notebook(task, what)
    except Exception as exc:  # noqa: BLE001 - the failure itself must still be recorded
        return (
            f"note for case {task['variant']!r} failed: {what} (its partial notebook could not "
            f"be kept: {type(exc).__name__}: {_one_line(exc, 120)})"
        )


def _rescue_partial_notebook(task: Mapping[str, Any], what: str) -> str:
    import nbformat

    out_dir = Path(task["out_dir"])
    variant = task["variant"]
    pattern = re.compile(rf"\.{re.escape(variant)}\.[a-z0-9_]{{8}}\.partial")
    scratches = sorted(
        (p for p in out_dir.iterdir() if p.is_dir() and pattern.fullmatch(p.name)),
        key=lambda p: p.stat().st_mtime,
    )
    nb = None
    for scratch in reversed(scratches):
        try:
            nb = nbformat.read(scratch / notes.NOTE_IPYNB, as_version=4)
            break
        except Exception:  # noqa: BLE001 - missing or torn: try an older one
            continue
    where = "kernel start"
    if nb is not None:
        cells = notes._executed_cells(nb)
        where = notes._describe_cell(cells, notes._failing_index(cells))
    message = f"note for case {variant!r} failed at {where}: {what}"
    if nb is not None:
        try:
            prepared = notes.prepare_case(task["case"])
            prov = notes.provenance(
                prepared.validated,
                template=Path(task["template"]).name,
                note_time=task["note_time"],
            )
        except FinkitError:
            prov = {}
        nb.metadata["finkit"] = {"status": "failed", "error": message, "provenance": prov}
        folder = notes.case_folder(out_dir, variant)
        folder.mkdir(parents=True, exist_ok=True)
        notes.atomic_write(folder / notes.FAILED_IPYNB, nbformat.writes(nb))
        notes.mark_stale(folder, message)
    for scratch in scratches:
        shutil.rmtree(scratch, ignore_errors=True)
    return message


def _mark_earlier_note_stale(out: Path, variant) -> None:
    """A variant whose row is now invalid keeps no note that looks current: an earlier note in
    its folder is renamed stale with the reason (``notes.mark_stale``)."""
    if not isinstance(variant.variant, str) or not variant.variant.strip():
        return
    try:
        folder = notes.case_folder(out, variant.variant)
    except InputError:
        return
    if folder.is_dir():
        notes.mark_stale(
            folder, "the variant's row is now invalid: " + "; ".join(variant.errors)[:500]
        )


def _run_jobs(
    tasks: Sequence[dict],
    *,
    jobs: int,
    run_dir: Path,
    use_fork: bool,
    on_done: Callable[[dict, dict], None],
) -> None:
    """Run every task in its own process, at most ``jobs`` at a time; report each outcome."""
    from multiprocessing.connection import wait

    pending = list(tasks)[::-1]
    running: list[_Job] = []
    try:
        while pending or running:
            while pending and len(running) < jobs:
                running.append(_Job(pending.pop(), run_dir, use_fork))
            now = time.monotonic()
            wait_for = max(0.0, min(job.deadline for job in running) - now)
            sentinels = [job.sentinel for job in running if job.sentinel is not None]
            if sentinels and len(sentinels) == len(running):
                wait(sentinels, timeout=wait_for)
            else:
                time.sleep(min(wait_for, 0.02))
            now = time.monotonic()
            for job in list(running):
                if job.exitcode() is not None:
                    job.join()
                    running.remove(job)
                    on_done(job.task, job.outcome())
                elif now >= job.deadline:
                    job.kill()
                    running.remove(job)
                    on_done(job.task, job.outcome(timed_out=True))
    except BaseException:
        for job in running:
            job.kill()
            on_done(job.task, job.outcome(interrupted=True))
        raise


# --------------------------------------------------------------------------------------------
# Dask


def _remote_variant(task: dict) -> dict:
    """Run on a Dask worker: render one variant in a fresh interpreter, return its files."""
    scratch = Path(tempfile.mkdtemp(prefix="finkit-batch-"))
    try:
        run_dir = scratch / _RUN_DIR
        run_dir.mkdir()
        local = {**task, "out_dir": str(scratch)}
        results: list[dict] = []
        _run_jobs(
            [local],
            jobs=1,
            run_dir=run_dir,
            use_fork=False,
            on_done=lambda _task, outcome: results.append(outcome),
        )
        folder = scratch / task["variant"]
        files = {}
        if folder.is_dir():
            files = {p.name: p.read_bytes() for p in folder.iterdir() if p.is_file()}
        return {**results[0], "files": files}
    finally:
        shutil.rmtree(scratch, ignore_errors=True)


def _install_files(folder: Path, files: Mapping[str, bytes], ok: bool) -> None:
    """Write a remote variant's files as render_note would have written them."""
    folder.mkdir(parents=True, exist_ok=True)
    if ok:
        (folder / notes.NOTE_HTML).unlink(missing_ok=True)
        for name in (notes.RESULTS_JSON, notes.NOTE_IPYNB):
            if name in files:
                notes.atomic_write(folder / name, files[name])
        (folder / notes.FAILED_IPYNB).unlink(missing_ok=True)
        notes.clear_stale(folder)
        if notes.NOTE_HTML in files:
            notes.atomic_write(folder / notes.NOTE_HTML, files[notes.NOTE_HTML])
    elif notes.FAILED_IPYNB in files:
        notes.atomic_write(folder / notes.FAILED_IPYNB, files[notes.FAILED_IPYNB])
        notes.mark_stale(folder, "the note of this variant failed (see note.failed.ipynb)")


def _run_on_cluster(
    tasks: Sequence[dict],
    scheduler: str,
    *,
    out_dir: Path,
    on_done: Callable[[dict, dict], None],
) -> None:
    try:
        from distributed import Client
    except ImportError:
        raise NotSupportedError(
            "--scheduler needs dask.distributed; install finkit with the 'distributed' extra"
        ) from None
    try:
        client = Client(scheduler, timeout="20s")
    except OSError as exc:
        raise InputError(f"scheduler={scheduler!r}: cannot connect ({_one_line(exc)})") from None
    try:
        executor = client.get_executor(pure=False)
        futures = {executor.submit(_remote_variant, task): task for task in tasks}
        try:
            for future in concurrent.futures.as_completed(futures):
                task = futures[future]
                try:
                    payload = future.result()
                except Exception as exc:  # noqa: BLE001 - a lost worker fails only its variant
                    payload = {
                        "ok": False,
                        "kind": "exception",
                        "error": f"note for case {task['variant']!r} failed on the cluster: "
                        f"{type(exc).__name__}: {_one_line(exc)}",
                        "files": {},
                    }
                files = payload.pop("files", {})
                _install_files(notes.case_folder(out_dir, task["variant"]), files, payload["ok"])
                on_done(task, payload)
        except BaseException:
            for future, task in futures.items():
                if not future.done():
                    future.cancel()
                    on_done(
                        task,
                        {"ok": False, "kind": "interrupted", "error": "the batch was interrupted"},
                    )
            raise
    finally:
        client.close()


# --------------------------------------------------------------------------------------------
# The batch


def _read_json(path: Path) -> dict | None:
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return None
    return data if isinstance(data, dict) else None


def _reusable(folder: Path, key: str, inputs_sha256: str | None = None) -> dict | None:
    """The results of an earlier note with the same key, if its files are all there.

    The note on disk must itself be of these inputs (its results.json's ``inputs_sha256``),
    not only the state file: two batches writing one folder, or a hand-copied note, must never
    be reused for another variant.
    """
    state = _read_json(folder / STATE_FILE)
    if not state or state.get("key") != key:
        return None
    if not all((folder / n).is_file() for n in (notes.NOTE_HTML, notes.NOTE_IPYNB)):
        return None
    results = _read_json(folder / notes.RESULTS_JSON)
    if inputs_sha256 is not None and (results or {}).get("inputs_sha256") != inputs_sha256:
        return None
    return results


def _inputs_hash(validated: Any) -> str | None:
    from finkit.case import case_inputs_sha256

    try:
        return case_inputs_sha256(validated)
    except (AttributeError, TypeError):  # a test stand-in without a validated case
        return None


def _status_from_results(results: Mapping[str, Any] | None) -> str:
    status = (results or {}).get("status")
    return status if status in ("pass", "fail") else "error"


def run_batch(
    base: str | os.PathLike | Mapping[str, Any],
    variants: str | os.PathLike | Sequence[Mapping[str, Any]],
    out_dir: str | os.PathLike,
    **options: Any,
) -> BatchResult:
    """Render the note of every variant of a base case, in parallel, and write the overview.

    The batch folder is locked while the batch runs: a second batch on the same folder is
    refused with one line (it would otherwise delete the first one's run folder and could have
    a later re-run reuse a note of the wrong variant). A run folder and note scratch folders
    left by a killed batch are removed first (the lock proves no batch is using them).
    ``options`` are those of :func:`_run_batch_locked`, documented there.
    """
    import fcntl

    out = Path(out_dir)
    try:
        out.mkdir(parents=True, exist_ok=True)
        handle = open(out / _LOCK_FILE, "a+")  # noqa: SIM115 - held until the batch ends
    except OSError as exc:
        raise OSError(f"--out: cannot use '{out}' as the batch folder ({exc.strerror})") from exc
    try:
        try:
            fcntl.flock(handle, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except BlockingIOError:
            raise InputError(
                f"--out: the batch folder '{out}' is in use by another finkit batch; wait for it "
                "to finish or give another folder"
            ) from None
        shutil.rmtree(out / _RUN_DIR, ignore_errors=True)  # left by a killed batch
        for scratch in out.glob(".*.partial"):  # notes a killed batch was rendering
            if _SCRATCH_NAME.fullmatch(scratch.name) and scratch.is_dir():
                shutil.rmtree(scratch, ignore_errors=True)
        return _run_batch_locked(base, variants, out_dir, **options)
    finally:
        handle.close()


def _run_batch_locked(
    base: str | os.PathLike | Mapping[str, Any],
    variants: str | os.PathLike | Sequence[Mapping[str, Any]],
    out_dir: str | os.PathLike,
    *,
    template: str | os.PathLike | None = None,
    jobs: int | None = None,
    timeout: float = 600.0,
    force: bool = False,
    scheduler: str | None = None,
    show_code: bool = False,
    paper: str = "A4",
    execution_time: _dt.datetime | str | None = None,
    progress: bool = False,
    compare_to: str | os.PathLike | None = None,
) -> BatchResult:
    """Render the note of every variant of a base case, in parallel, and write the overview.

    Parameters
    ----------
    base : path-like or mapping
        The base case (YAML file or mapping as entered); it must validate on its own. [-]
    variants : path-like or sequence of mappings
        The variant table (see :func:`read_variant_table`). [-]
    out_dir : path-like
        Batch folder: one sub-folder per variant, ``index.html``, ``summary.csv``,
        ``summary.json``. [-]
    template : path-like, optional
        Notebook template; default the template of the base case's kind. [-]
    jobs : int, optional
        Notes computed at the same time; default the number of usable CPU cores. [-]
    compare_to : path-like, optional
        An earlier batch folder: each variant whose status or governing margin changed
        against it is marked in the overview, with the change in kelvin. [-]
    timeout : float, optional
        Time limit of one variant's note; the process is killed when it is reached. [s]
    force : bool, optional
        Recompute every variant, even those whose key is unchanged. [-]
    scheduler : str, optional
        Address of a Dask distributed scheduler (``tcp://host:8786``) to run the variants on. [-]
    show_code : bool, optional
        Keep code cells in the notes. [-]
    paper : {"A4", "letter"}, optional
        Paper size of the notes. [-]
    execution_time : datetime or str, optional
        Date of the batch and of its notes, with time zone; default now. [-]
    progress : bool, optional
        Show a progress bar with the estimated time left (on stderr). [-]

    Returns
    -------
    BatchResult
        The outcomes, the overview files and :attr:`BatchResult.exit_code`. [-]

    Raises
    ------
    finkit.case.CaseError
        The base case does not validate (nothing runs).
    finkit.errors.InputError
        Unusable variant table, template, time or option (nothing runs).
    KeyboardInterrupt
        After killing the running notes and writing the overview of what was done.
    """
    started_wall = time.monotonic()
    note_time = notes._note_time(execution_time)
    notes._check_paper(paper)
    if not (isinstance(timeout, int | float) and math.isfinite(timeout) and timeout > 0):
        raise InputError(f"timeout={timeout!r} s is not allowed; use a positive number of seconds")
    if jobs is None:
        jobs = _usable_cores()
    if not isinstance(jobs, int) or isinstance(jobs, bool) or jobs < 1:
        raise InputError(f"jobs={jobs!r} is not allowed; use a whole number of at least 1")

    _, base_validated, base_label = _load_base(base)
    template_file = notes.template_path(base_validated.kind, template)
    notes._check_template(template_file)
    prepared = prepare_variants(base, variants)
    variants_label = str(variants) if isinstance(variants, str | os.PathLike) else "(list)"

    out = Path(out_dir)
    out.mkdir(parents=True, exist_ok=True)
    out = out.resolve()

    outcomes: dict[str, VariantOutcome] = {}
    order: list[tuple[int, str]] = []
    tasks: list[dict] = []
    for index, variant in enumerate(prepared):
        slot = f"{index}"
        order.append((index, slot))
        if not variant.is_valid:
            outcomes[slot] = VariantOutcome(
                variant=variant.variant,
                row=variant.row,
                overrides=variant.overrides,
                status="error",
                state="failed",
                error_kind="input",
                error="; ".join(variant.errors),
            )
            _mark_earlier_note_stale(out, variant)
            continue
        key = variant_key(
            variant.validated, template_file, entered=variant.case, show_code=show_code, paper=paper
        )
        try:
            folder = notes.case_folder(out, variant.variant)
        except InputError as exc:  # e.g. a symbolic link that leads out of the batch folder
            outcomes[slot] = VariantOutcome(
                variant=variant.variant,
                row=variant.row,
                overrides=variant.overrides,
                status="error",
                state="failed",
                error_kind="input",
                error=f"row {variant.row} (variant {variant.variant!r}): {exc}",
            )
            continue
        reused = None if force else _reusable(folder, key, _inputs_hash(variant.validated))
        if reused is not None:
            outcomes[slot] = VariantOutcome(
                variant=variant.variant,
                row=variant.row,
                overrides=variant.overrides,
                status=_status_from_results(reused),
                state="reused",
                results=reused,
                key=key,
            )
            continue
        (folder / STATE_FILE).unlink(missing_ok=True)
        tasks.append(
            {
                "slot": slot,
                "variant": variant.variant,
                "row": variant.row,
                "case": variant.case,
                "template": str(template_file.resolve()),
                "out_dir": str(out),
                "show_code": bool(show_code),
                "paper": paper,
                "note_time": note_time,
                "timeout": float(timeout),
            }
        )
        outcomes[slot] = VariantOutcome(
            variant=variant.variant,
            row=variant.row,
            overrides=variant.overrides,
            status="error",
            state="not run",
            error_kind="interrupted",
            error="not run: the batch stopped before this variant",
            key=key,
        )

    bar = _progress_bar(len(tasks), progress)

    def on_done(task: dict, payload: dict) -> None:
        slot = task["slot"]
        folder = out / task["variant"]
        previous = outcomes[slot]
        seconds = float(payload.get("seconds", 0.0))
        results = _read_json(folder / notes.RESULTS_JSON) if payload.get("ok") else None
        if payload.get("ok") and results is None:
            payload = {
                "ok": False,
                "kind": "exception",
                "error": f"note for case {task['variant']!r}: its results.json cannot be read",
            }
        if payload.get("ok"):
            outcomes[slot] = dataclasses.replace(
                previous,
                status=_status_from_results(results),
                state="computed",
                error_kind=None,
                error=None,
                results=results,
                seconds=seconds,
            )
            state = {
                "key": previous.key,
                "variant": task["variant"],
                "row": task["row"],
                "note_time": task["note_time"],
                "seconds": round(seconds, 3),
                "stages": {k: round(float(v), 4) for k, v in payload.get("stages", {}).items()},
            }
            notes.atomic_write(folder / STATE_FILE, json.dumps(state, indent=2))
        else:
            outcomes[slot] = dataclasses.replace(
                previous,
                status="error",
                state="failed" if payload.get("kind") != "interrupted" else "not run",
                error_kind=payload.get("kind", "exception"),
                error=payload.get("error") or "unknown failure",
                results=None,
                seconds=seconds,
            )
        if bar is not None:
            bar.update(1)
            failed = sum(1 for o in outcomes.values() if o.state == "failed" and o.key)
            if failed:
                bar.set_postfix_str(f"{failed} failed", refresh=False)

    run_dir = out / _RUN_DIR
    try:
        if tasks:
            if scheduler:
                _run_on_cluster(tasks, scheduler, out_dir=out, on_done=on_done)
            else:
                run_dir.mkdir(exist_ok=True)
                use_fork = _fork_is_safe()
                if use_fork:
                    _warm_up([template_file], show_code, paper, base_validated)
                _run_jobs(
                    tasks,
                    jobs=min(jobs, len(tasks)),
                    run_dir=run_dir,
                    use_fork=use_fork,
                    on_done=on_done,
                )
    finally:
        if bar is not None:
            bar.close()
        shutil.rmtree(run_dir, ignore_errors=True)
        ordered = tuple(outcomes[slot] for _, slot in order)
        info = {
            "date": note_time,
            "base_case": base_label,
            "base_case_id": base_validated.case_id,
            "variant_table": variants_label,
            "template": str(template_file),
            "jobs": jobs,
            "scheduler": scheduler,
            "timeout": float(timeout),
            "seconds": round(time.monotonic() - started_wall, 3),
        }
        if compare_to is not None:
            info["compare_to"] = str(compare_to)
        index, summary_csv, summary_json = _write_overview(out, info, ordered)
    return BatchResult(
        out_dir=out,
        outcomes=ordered,
        index=index,
        summary_csv=summary_csv,
        summary_json=summary_json,
        seconds=time.monotonic() - started_wall,
    )


def _usable_cores() -> int:
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:  # not on Linux
        return max(1, os.cpu_count() or 1)


def _progress_bar(total: int, enabled: bool) -> Any:
    if not enabled or total == 0:
        return None
    from tqdm import tqdm

    class _Bar(tqdm):
        # No monitor thread: the parent forks its children and must stay single-threaded.
        monitor_interval = 0

    return _Bar(total=total, unit="note", desc="finkit batch", file=sys.stderr, dynamic_ncols=True)


# --------------------------------------------------------------------------------------------
# Overview: summary.csv, summary.json, index.html


def _all_result_names(outcomes: Sequence[VariantOutcome]) -> list[tuple[str, str]]:
    names: dict[str, str] = {}
    for o in outcomes:
        for name, entry in ((o.results or {}).get("results") or {}).items():
            unit = entry.get("unit", "") if isinstance(entry, Mapping) else ""
            names.setdefault(name, unit)
    return list(names.items())


def _override_columns(outcomes: Sequence[VariantOutcome]) -> list[str]:
    return list(dict.fromkeys(c for o in outcomes for c in o.overrides))


def _shown_value(value: Any) -> str:
    if value is None:
        return ""
    if isinstance(value, str):
        return value
    return json.dumps(value, ensure_ascii=False)


_NUMBER_UNIT = re.compile(r"\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([^\d\s].*)?")


def _number_and_unit(value: Any) -> tuple[float, str] | None:
    """``"40 W"`` -> (40.0, "W"), ``14`` -> (14.0, ""); None for text."""
    if isinstance(value, bool):
        return None
    if isinstance(value, int | float):
        return (float(value), "") if math.isfinite(value) else None
    if isinstance(value, str):
        match = _NUMBER_UNIT.fullmatch(value)
        if match:
            number = float(match.group(1))
            return (number, (match.group(2) or "").strip()) if math.isfinite(number) else None
    return None


def _numeric_overrides(outcomes: Sequence[VariantOutcome]) -> dict[str, str]:
    """Override columns that hold a number with one unit in every row: column -> unit."""
    out = {}
    for column in _override_columns(outcomes):
        parsed = [
            _number_and_unit(o.overrides.get(column)) for o in outcomes if column in o.overrides
        ]
        units = {p[1] for p in parsed if p is not None}
        if parsed and None not in parsed and len(units) == 1:
            out[column] = units.pop()
    return out


def _spreadsheet_text(value: str) -> str:
    """User text for a CSV cell, kept from opening as a live formula in a spreadsheet."""
    return "'" + value if value[:1] in ("=", "+", "-", "@", "\t", "\r") else value


def _governing(o: VariantOutcome) -> Mapping[str, Any]:
    governing = (o.results or {}).get("governing")
    return governing if isinstance(governing, Mapping) else {}


def _since(o: VariantOutcome, earlier: Path | None) -> str:
    """What changed for a variant since an earlier batch folder (empty if nothing did)."""
    if earlier is None or not o.variant or not _VARIANT_ID.fullmatch(o.variant):
        return ""
    path = earlier / o.variant / notes.RESULTS_JSON
    try:
        before = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return "new since the earlier batch"
    entry = (before.get("results") or {}).get("temperature_margin")
    old_margin = entry.get("value") if isinstance(entry, Mapping) else None
    margin = o.margin()[0]
    parts = []
    if before.get("status") != o.status:
        parts.append(f"status {before.get('status')} -> {o.status}")
    if isinstance(old_margin, int | float) and margin is not None:
        if abs(margin - old_margin) >= 0.005:
            parts.append(f"governing margin {margin - old_margin:+.3g} K")
    return "; ".join(parts)


def _reason(o: VariantOutcome) -> str:
    """Why a variant has its status, in one line (the failing check, or the error)."""
    if o.status == "error":
        return f"not computed: {o.error or o.error_kind or 'unknown error'}"
    margin, condition = o.margin()
    required = o.result_value("required_margin")
    gov = _governing(o)
    count = gov.get("condition_count")
    failing = gov.get("failing_conditions") or []
    if margin is None or required is None:
        return ""
    if o.status == "pass":
        where = f"in all {count} conditions" if count else "at its condition"
        return f"meets the required {required:.3g} K margin {where}"
    if margin < 0:
        text = f"{condition}: {-margin:.3g} K above the limit"
    else:
        text = f"{condition}: {required - margin:.3g} K short of the required {required:.3g} K"
    if count and len(failing) > 1:
        text += f" (fails in {len(failing)} of {count} conditions)"
    return text


def _note_links(out: Path, o: VariantOutcome) -> dict[str, str | None]:
    folder = out / o.variant if o.variant and _VARIANT_ID.fullmatch(o.variant) else None
    links: dict[str, str | None] = {"note": None, "notebook": None, "failed_notebook": None}
    if folder is None:
        return links
    if o.state in ("computed", "reused"):
        links["note"] = f"{o.variant}/{notes.NOTE_HTML}"
        links["notebook"] = f"{o.variant}/{notes.NOTE_IPYNB}"
    elif (folder / notes.FAILED_IPYNB).is_file():
        links["failed_notebook"] = f"{o.variant}/{notes.FAILED_IPYNB}"
    return links


def _write_overview(
    out: Path, info: dict, outcomes: Sequence[VariantOutcome]
) -> tuple[Path, Path, Path]:
    from finkit import __version__

    overrides = _override_columns(outcomes)
    results = _all_result_names(outcomes)
    info = {
        **info,
        "finkit_version": __version__,
        "exit_code": _exit_code(outcomes),
        "counts": _counts(outcomes),
    }

    earlier = Path(info["compare_to"]) if info.get("compare_to") else None
    records = []
    for o in outcomes:
        records.append(
            {
                "variant": o.variant,
                "row": o.row,
                "status": o.status,
                "state": o.state,
                "error_kind": o.error_kind,
                "error": o.error,
                "seconds": round(o.seconds, 3),
                "key": o.key,
                "overrides": o.overrides,
                "margin": o.margin()[0],
                "governing": o.margin()[1] if o.margin()[0] is not None else None,
                "allowable_power": o.result_value("allowable_power"),
                "reason": _reason(o),
                "since": _since(o, earlier),
                "results": (o.results or {}).get("results"),
                "warnings": (o.results or {}).get("warnings"),
                "inputs_sha256": (o.results or {}).get("inputs_sha256"),
                "note_time": (o.results or {}).get("note_time"),
                **_note_links(out, o),
            }
        )
    summary_json = notes.atomic_write(
        out / SUMMARY_JSON,
        json.dumps({"batch": info, "variants": records}, indent=2, ensure_ascii=False),
    )

    # The variant's own columns first (numbers, the unit in the header), then the verdict on
    # the governing condition, then every result of results.json.
    numeric = _numeric_overrides(outcomes)
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(
        ["variant"]
        + [f"{c} [{numeric[c]}]" if numeric.get(c) else c for c in overrides]
        + ["status", "governing condition", "governing margin [K]"]
        + ["governing allowable power [W]", "reason", "since earlier batch", "row", "state"]
        + ["error"]
        + [f"{name} [{unit}]" if unit else name for name, unit in results]
        + ["note"]
    )
    for o, record in zip(outcomes, records, strict=True):
        shown = []
        for c in overrides:
            value = o.overrides.get(c)
            if c in numeric and value is not None:
                number = _number_and_unit(value)[0]
                shown.append(str(value) if isinstance(value, int) else repr(number))
            else:
                shown.append(_spreadsheet_text(_shown_value(value)))
        writer.writerow(
            [_spreadsheet_text(o.variant)]
            + shown
            + [o.status, record["governing"] or ""]
            + ["" if record["margin"] is None else repr(record["margin"])]
            + ["" if record["allowable_power"] is None else repr(record["allowable_power"])]
            + [_spreadsheet_text(record["reason"]), record["since"], o.row, o.state]
            + [_spreadsheet_text(o.error or "")]
            + [
                "" if o.result_value(name) is None else repr(o.result_value(name))
                for name, _ in results
            ]
            + [record["note"] or record["failed_notebook"] or ""]
        )
    summary_csv = notes.atomic_write(out / SUMMARY_CSV, buffer.getvalue())
    index = notes.atomic_write(out / INDEX_HTML, overview_html(info, outcomes, out))
    return index, summary_csv, summary_json


_SORT_SCRIPT = """\
document.querySelectorAll("table.fk-sortable").forEach(function (table) {
  var heads = table.tHead.rows[0].cells;
  Array.prototype.forEach.call(heads, function (th, col) {
    if (!th.hasAttribute("data-sortable")) { return; }
    function sort() {
      var ascending = th.getAttribute("aria-sort") !== "ascending";
      Array.prototype.forEach.call(heads, function (h) { h.removeAttribute("aria-sort"); });
      th.setAttribute("aria-sort", ascending ? "ascending" : "descending");
      var body = table.tBodies[0];
      var rows = Array.prototype.slice.call(body.rows);
      rows.sort(function (a, b) {
        var x = a.cells[col].getAttribute("data-sort"), y = b.cells[col].getAttribute("data-sort");
        if (x === "" || y === "") { return x === y ? 0 : (x === "" ? 1 : -1); }
        var nx = Number(x), ny = Number(y);
        var c = (!isNaN(nx) && !isNaN(ny)) ? nx - ny : x.localeCompare(y);
        return ascending ? c : -c;
      });
      rows.forEach(function (row) { body.appendChild(row); });
    }
    th.addEventListener("click", sort);
    th.addEventListener("keydown", function (e) {
      if (e.key === "Enter" || e.key === " ") { e.preventDefault(); sort(); }
    });
  });
});
"""

_OVERVIEW_CSS = """\
body { font-family: system-ui, -apple-system, "Segoe UI", sans-serif; margin: 2em auto;
       max-width: 96em; color: #111; line-height: 1.4; padding: 0 1em; }
h1 { font-size: 1.6em; margin-bottom: 0.2em; } h2 { font-size: 1.2em; margin-top: 1.6em; }
table { border-collapse: collapse; margin: 0.6em 0; font-size: 0.92em; }
th, td { border: 1px solid #bbb; padding: 0.25em 0.55em; vertical-align: top; }
th { background: #eee; text-align: left; }
th[data-sortable] { cursor: pointer; }
th[aria-sort="ascending"]::after { content: " \\25B2"; }
th[aria-sort="descending"]::after { content: " \\25BC"; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
td.id { white-space: nowrap; } td.text { min-width: 12em; max-width: 24em; }
td.variant { min-width: 9em; max-width: 15em; } td.variant .muted { font-size: 0.9em; }
div.scroll { overflow-x: auto; } th { vertical-align: bottom; }
.badge { display: inline-block; padding: 0 0.5em; border-radius: 0.3em; font-weight: bold; }
.pass { background: #d7f0d7; color: #124d12; } .fail { background: #f6d5d5; color: #7a1010; }
.error { background: #f7e7c4; color: #6b4500; } .muted { color: #666; }
.changed { color: #7a4b00; }
dl.info { display: grid; grid-template-columns: max-content auto; gap: 0.15em 1em; }
dl.info dt { font-weight: bold; } dl.info dd { margin: 0; }
ul.failures li { margin-bottom: 0.5em; } code { overflow-wrap: anywhere; }
@media print {
  @page { size: A4 landscape; margin: 10mm; }
  body { max-width: none; margin: 0; padding: 0; font-size: 8.5pt; }
  div.scroll { overflow: visible; }
  table { width: 100%; font-size: 1em; }
  thead { display: table-header-group; }
  tr, td, th { break-inside: avoid; page-break-inside: avoid; }
  h2 { break-after: avoid; }
  th::after { content: none !important; }
  td.text { max-width: none; }
  a { color: inherit; text-decoration: none; }
}
"""


def _label(column: str, unit: str) -> dict[str, str]:
    """``source.power`` -> ``{"text": "power [W]", "path": "source.power"}``: the field without
    its block, the full path on hover."""
    parts = column.split(".")
    text = " ".join(parts[1:] if len(parts) > 1 else parts).replace("_", " ")
    shown = f"{text} [{_UNIT_TEXT.get(unit, unit)}]" if unit else text
    return {"text": shown, "path": column}


def _plain(value: float) -> str:
    """A number as the variant table gives it (3000, 1.2), not rounded."""
    return format(value, "g") if abs(value) < 1e6 else format(value, ".6g")


_UNIT_TEXT = {"degC": "°C", "degF": "°F", "m^3/s": "m³/s", "m^2": "m²"}


def _sig3(value: float | None, unit: str = "") -> str:
    if value is None:
        return "—"
    text = f"{value:.3g}"
    return f"{text}\u00a0{_UNIT_TEXT.get(unit, unit)}" if unit else text


def _variant_rows(
    group: Sequence[VariantOutcome],
    varying: Sequence[str],
    texts: Sequence[str],
    out: Path,
    earlier: Path | None = None,
) -> list[dict[str, Any]]:
    """The rows of one variant table (plain values; the page template escapes them)."""
    status_order = {"fail": 0, "error": 1, "pass": 2}
    badge = {"pass": "PASS", "fail": "FAIL", "error": "NOT COMPUTED"}
    rows = []
    for o in group:
        numbers = []
        for c in varying:
            parsed = _number_and_unit(o.overrides.get(c))
            value = None if parsed is None else parsed[0]
            numbers.append(
                {
                    "sort": "" if value is None else repr(value),
                    "shown": "—" if value is None else _plain(value),
                }
            )
        margin, condition = o.margin()
        required = o.result_value("required_margin")
        allowed = o.result_value("allowable_power")
        stated = o.result_value("power")
        since = _since(o, earlier) if earlier is not None else None
        links = _note_links(out, o)
        rows.append(
            {
                "variant": o.variant,
                "texts": [
                    _shown_value(o.overrides.get(c))
                    for c in texts
                    if o.overrides.get(c) is not None
                ],
                "numbers": numbers,
                "status": o.status,
                "status_order": status_order[o.status],
                "badge": badge[o.status],
                "condition": condition if margin is not None else "",
                "margin": _sig3(margin),
                "margin_sort": "" if margin is None else repr(margin),
                "required": "" if required is None else f"{required:.3g}",
                "allowed": _sig3(allowed),
                "allowed_sort": "" if allowed is None else repr(allowed),
                "stated": "" if stated is None else f"{stated:.3g}",
                "reason": _reason(o),
                "since": since or "",
                "since_name": earlier.name if earlier is not None else "",
                "state": o.state,
                "note": quote(links["note"]) if links["note"] else "",
                "reused": o.state == "reused",
                "failed_notebook": (
                    quote(links["failed_notebook"]) if links["failed_notebook"] else ""
                ),
            }
        )
    return rows


def _esc(value: Any) -> str:
    return html.escape("" if value is None else str(value), quote=True)


def _number(value: float | None) -> str:
    return "—" if value is None else f"{value:.4g}"


def _margin_chart(outcomes: Sequence[VariantOutcome]) -> str:
    """An inline SVG bar chart of the temperature margin of each variant, limits marked."""
    rows = [(o, o.margin()[0], o.result_value("required_margin")) for o in outcomes]
    drawn = [(o, m, r) for o, m, r in rows if m is not None]
    if not drawn:
        return '<p class="muted">No variant has a temperature margin to show.</p>'
    values = [m for _, m, _ in drawn] + [r for _, _, r in drawn if r is not None] + [0.0]
    low, high = min(values), max(values)
    span = (high - low) or 1.0
    low, high = low - 0.05 * span, high + 0.08 * span
    label_w, plot_w, value_w, row_h, top = 190, 520, 80, 22, 28
    height = top + row_h * len(rows) + 42

    def x(v: float) -> float:
        return label_w + (v - low) / (high - low) * plot_w

    parts = [
        f'<svg xmlns="http://www.w3.org/2000/svg" role="img" width="{label_w + plot_w + value_w}"'
        f' height="{height}" viewBox="0 0 {label_w + plot_w + value_w} {height}"'
        ' font-family="sans-serif" font-size="12">',
        "<title>Temperature margin of each variant; the red marks are the required margins</title>",
        f'<line x1="{x(0):.1f}" y1="{top - 6}" x2="{x(0):.1f}" y2="{height - 36}" stroke="#333"/>',
    ]
    required = {r for _, _, r in drawn if r is not None}
    for i, (o, margin, need) in enumerate(rows):
        y = top + i * row_h
        parts.append(
            f'<text x="{label_w - 8}" y="{y + 15}" text-anchor="end">{_esc(o.variant)}</text>'
        )
        if margin is None:
            parts.append(f'<text x="{label_w + 4}" y="{y + 15}" fill="#8a5a00">not computed</text>')
            continue
        colour = "#3a8f3a" if o.status == "pass" else "#c0392b"
        x0, x1 = sorted((x(0), x(margin)))
        parts.append(
            f'<rect x="{x0:.1f}" y="{y + 4}" width="{max(x1 - x0, 1):.1f}" height="{row_h - 8}"'
            f' fill="{colour}"><title>{_esc(o.variant)}: {margin:.3g} K</title></rect>'
        )
        parts.append(f'<text x="{label_w + plot_w + 6}" y="{y + 15}">{margin:.3g} K</text>')
        if need is not None:
            parts.append(
                f'<line x1="{x(need):.1f}" y1="{y + 1}" x2="{x(need):.1f}" y2="{y + row_h - 1}"'
                ' stroke="#b00000" stroke-width="2.5"/>'
            )
    if len(required) == 1:
        need = required.pop()
        parts.append(
            f'<line x1="{x(need):.1f}" y1="{top - 6}" x2="{x(need):.1f}" y2="{height - 36}"'
            ' stroke="#b00000" stroke-dasharray="5,3"/>'
        )
        parts.append(
            f'<text x="{x(need):.1f}" y="{top - 10}" text-anchor="middle" fill="#b00000">'
            f"required margin {need:.3g} K</text>"
        )
    axis_y = height - 22
    for tick in _ticks(low, high):
        parts.append(
            f'<text x="{x(tick):.1f}" y="{axis_y}" text-anchor="middle" fill="#444">{tick:g}</text>'
        )
    parts.append(
        f'<text x="{label_w + plot_w / 2:.0f}" y="{height - 4}" text-anchor="middle">'
        "temperature margin below the limit, governing condition [K]</text>"
    )
    parts.append("</svg>")
    return "".join(parts)


def _ticks(low: float, high: float, count: int = 6) -> list[float]:
    raw = (high - low) / count
    magnitude = 10 ** math.floor(math.log10(raw)) if raw > 0 else 1.0
    step = next(m * magnitude for m in (1, 2, 2.5, 5, 10) if m * magnitude >= raw)
    first = math.ceil(low / step) * step
    return [round(first + i * step, 10) for i in range(int((high - first) / step) + 1)]


def overview_html(info: Mapping[str, Any], outcomes: Sequence[VariantOutcome], out: Path) -> str:
    """The batch overview page: header, sortable results table, margin chart, failures.

    Every text that comes from the base case, the variant table or an error is escaped. The
    page loads nothing; its one inline script (table sorting) is allowed by a content security
    policy that names its SHA-256, so no other script could run.

    Parameters
    ----------
    info : mapping
        Batch facts: ``date``, ``base_case``, ``variant_table``, ``template``,
        ``finkit_version``, ``counts``, ``exit_code``... [-]
    outcomes : sequence of VariantOutcome
        In table order. [-]
    out : pathlib.Path
        The batch folder (links are relative to it). [-]

    Returns
    -------
    str
        A complete HTML page. [-]
    """
    script_hash = base64.b64encode(hashlib.sha256(_SORT_SCRIPT.encode()).digest()).decode()
    csp = (
        "default-src 'none'; img-src data:; style-src 'unsafe-inline'; "
        f"script-src 'sha256-{script_hash}'; base-uri 'none'; form-action 'none'"
    )
    overrides = _override_columns(outcomes)
    counts = info.get("counts", {})
    exit_code = info.get("exit_code")
    verdict = {
        EXIT_ALL_PASS: "every variant computed and passing its limit",
        EXIT_LIMIT_FAILED: "every variant computed; some fail their limit",
        EXIT_NOT_COMPUTED: "some variants could not be computed",
    }.get(exit_code, "")

    facts = [
        ("Date", info.get("date")),
        ("Base case", info.get("base_case")),
        ("Variant table", info.get("variant_table")),
        ("Template", info.get("template")),
        ("finkit", info.get("finkit_version")),
        (
            "Variants",
            f"{len(outcomes)}: {counts.get('pass', 0)} pass, {counts.get('fail', 0)} fail, "
            f"{counts.get('error', 0)} not computed ({counts.get('computed', 0)} computed in "
            f"this run, {counts.get('reused', 0)} reused unchanged)",
        ),
        ("Exit status", f"{exit_code}: {verdict}"),
    ]
    earlier = Path(info["compare_to"]) if info.get("compare_to") else None
    numeric = _numeric_overrides(outcomes)
    varying = [
        c
        for c in numeric
        if len({_number_and_unit(o.overrides.get(c)) for o in outcomes if c in o.overrides}) > 1
    ]
    texts = [c for c in overrides if c not in numeric]
    headers = [{"text": "Variant", "path": ""}, *(_label(c, numeric[c]) for c in varying)]
    headers += [
        {"text": t, "path": ""}
        for t in ("Status", "Governing condition", "Margin [K]", "Allowable power [W]")
    ]
    headers += [{"text": "Reason", "path": ""}, {"text": "Note", "path": ""}]
    groups = [
        {
            "title": title,
            "rows": _variant_rows(
                [o for o in outcomes if o.status == status], varying, texts, out, earlier
            ),
        }
        for status, title in (("fail", "Fail"), ("error", "Not computed"), ("pass", "Pass"))
    ]
    from markupsafe import Markup

    return present.page_template("batch_overview.html.j2").render(
        csp=csp,
        css=Markup(_OVERVIEW_CSS),  # constants of this module, not user text
        script=Markup(_SORT_SCRIPT),  # the CSP names its hash: it must be verbatim
        base_case_id=info.get("base_case_id"),
        date=info.get("date"),
        facts=facts,
        headers=headers,
        groups=groups,
        margin_chart=Markup(_margin_chart(outcomes)),  # escapes its own texts
    )


# --------------------------------------------------------------------------------------------
# Fresh-interpreter entry (Dask workers, or a parent that cannot fork safely)


def main(argv: list[str] | None = None) -> int:
    """``python -m finkit.batch --run-task TASK.json RESULT.json``: render one variant."""
    import argparse

    parser = argparse.ArgumentParser(prog="python -m finkit.batch")
    parser.add_argument("--run-task", nargs=2, metavar=("TASK", "RESULT"), required=True)
    args = parser.parse_args(argv)
    task = json.loads(Path(args.run_task[0]).read_text(encoding="utf-8"))
    if os.getpgid(0) == os.getpid():  # started in its own session by the batch
        _die_with_parent(os.getppid())
    signal.signal(signal.SIGINT, signal.SIG_IGN)
    os.environ.setdefault("PYDEVD_DISABLE_FILE_VALIDATION", "1")
    outcome = _render_child(task)
    notes.atomic_write(args.run_task[1], json.dumps(outcome))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
