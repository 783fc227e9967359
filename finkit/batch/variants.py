"""Reading a variant table (CSV or YAML) and turning each row into a validated case.

Overrides by dotted path, variant keys and validation."""

from __future__ import annotations

import copy
import csv
import hashlib
import io
import json
import math
import os
import re
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import Any

from finkit import notes
from finkit.batch.records import (
    _FORBIDDEN_COLUMNS,
    _HEADER,
    _INT,
    _NO_UNIT,
    _PATH,
    _SEGMENT,
    _VARIANT_ID,
    VARIANT_COLUMN,
    Variant,
    VariantRow,
)
from finkit.errors import InputError

__all__ = [
    "apply_overrides",
    "prepare_variants",
    "read_variant_table",
    "variant_key",
]


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
    from finkit.case.messages import text_keys

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
    if variant.split(".")[0].upper() in notes.WINDOWS_RESERVED:
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
        Dotted path (``source.power``, ``air.flow.fan.pressure[2]``, ``sources.regulator.power``
        for the item of a list named ``regulator``) -> value; ``None`` removes the entry.
        Missing mappings on the way are created. [-]

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
            if isinstance(node, list):
                # a list of named items (sources): ``sources.regulator.power``
                named = [x for x in node if isinstance(x, dict) and x.get("name") == part]
                if not named:
                    names = ", ".join(str(x.get("name")) for x in node if isinstance(x, dict))
                    raise KeyError(
                        path_, f"{here}: the base case has no item named {part!r} ({names})"
                    )
                node = named[0]
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
    from finkit.case.parts import CaseError
    from finkit.case.schema import load_case

    try:
        validated = load_case(dict(base) if isinstance(base, Mapping) else Path(base))
    except CaseError as exc:
        raise CaseError([f"base case: {line}" for line in exc.errors]) from None
    entered = notes.json_safe(validated.entered, "case")
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
    from finkit.case.parts import CaseError
    from finkit.case.schema import load_case

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
                merged = notes.json_safe(validated.entered, "case")
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
    from finkit.case.schema import case_inputs_sha256

    return _sha256_json(
        {
            "inputs_sha256": case_inputs_sha256(validated),
            "entered_sha256": _sha256_json(
                notes.json_safe(entered if entered is not None else validated.entered, "case")
            ),
            "template_sha256": hashlib.sha256(Path(template).read_bytes()).hexdigest(),
            "finkit_version": __version__,
            "show_code": bool(show_code),
            "paper": paper,
        }
    )
