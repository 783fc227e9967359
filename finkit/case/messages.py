"""Reading a case file and turning validation errors into one line per field."""

from __future__ import annotations

import copy
import difflib
import json
import types
from collections.abc import Mapping
from pathlib import Path
from typing import Annotated, Literal, Union, get_args, get_origin

import yaml
from pydantic import (
    BaseModel,
    ValidationError,
)

from finkit.case.fields import (
    Text,
)
from finkit.case.heat_sink import (
    HeatSinkCase,
)
from finkit.case.parts import (
    CaseError,
    _shown,
)
from finkit.case.single_fin import (
    SingleFinCase,
)

__all__ = [
    "MAX_CASE_BYTES",
    "MAX_DEPTH",
    "text_keys",
]


# --------------------------------------------------------------------------------------------
# Reading and error messages


#: Deepest nesting a case file may have (a real case nests four or five levels).
MAX_DEPTH = 40
#: Largest case file read [bytes].
MAX_CASE_BYTES = 2_000_000


class _UniqueKeyLoader(yaml.SafeLoader):
    """SafeLoader that refuses a key given twice in one mapping (PyYAML keeps the last), YAML
    aliases (``*name``: an alias bomb would expand without bound) and deep nesting."""

    def compose_node(self, parent, index):
        if self.check_event(yaml.AliasEvent):
            mark = self.peek_event().start_mark
            raise CaseError(
                [
                    f"case file: YAML anchors and aliases (&name, *name) are not accepted "
                    f"(line {mark.line + 1}); write the values out"
                ]
            )
        self._depth = getattr(self, "_depth", 0) + 1
        try:
            if self._depth > MAX_DEPTH:
                mark = self.peek_event().start_mark
                raise CaseError(
                    [f"case file: nested more than {MAX_DEPTH} levels deep (line {mark.line + 1})"]
                )
            return super().compose_node(parent, index)
        finally:
            self._depth -= 1


def text_keys() -> frozenset[str]:
    """Keys whose values are text in the case models (``Text`` fields, and ``case_id``).

    The case loader and the variant-table reader keep a plain value under one of these keys as
    the text the user typed, so that a revision ``1.10`` is not read as the number 1.1.
    """
    global _TEXT_KEYS
    if _TEXT_KEYS is None:
        text_validator = get_args(Text)[1].func
        found, seen = {"case_id"}, set()

        def walk(model):
            if model in seen:
                return
            seen.add(model)
            for name, info in model.model_fields.items():
                marks = list(info.metadata)
                stack = [info.annotation]
                while stack:
                    annotation = stack.pop()
                    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
                        walk(annotation)
                    if get_origin(annotation) is Annotated:
                        marks += get_args(annotation)[1:]
                    stack.extend(get_args(annotation))
                if any(getattr(m, "func", None) is text_validator for m in marks):
                    found.add(info.alias or name)

        for model in (HeatSinkCase, SingleFinCase):
            walk(model)
        _TEXT_KEYS = frozenset(found)
    return _TEXT_KEYS


_TEXT_KEYS: frozenset[str] | None = None

#: YAML's implicit tags that would turn a text field's value into something else: revision
#: ``1.10`` into 1.1, ``010`` into 8, ``NO`` into false, ``2024-05-01`` into a date. (``null``
#: and ``~`` keep their meaning: no value.)
_RETYPED_TAGS = frozenset(f"tag:yaml.org,2002:{t}" for t in ("int", "float", "bool", "timestamp"))


def _construct_mapping(loader, node, deep=False):
    seen = {}
    for key_node, value_node in node.value:
        # A plain scalar under a text key stays the text the user typed.
        if (
            isinstance(value_node, yaml.ScalarNode)
            and value_node.style is None
            and value_node.tag in _RETYPED_TAGS
            and value_node.value != ""
            and isinstance(key_node, yaml.ScalarNode)
            and key_node.value in text_keys()
        ):
            value_node.tag = "tag:yaml.org,2002:str"
    for key_node, _ in node.value:
        key = loader.construct_object(key_node, deep=deep)
        if not isinstance(key, str | int | float | bool) and key is not None:
            raise CaseError(
                [
                    f"case file: a key must be plain text (line {key_node.start_mark.line + 1}, "
                    f"got a {type(key).__name__})"
                ]
            )
        if key in seen:
            raise CaseError(
                [
                    f"{key}: given twice in the same block (lines {seen[key] + 1} and "
                    f"{key_node.start_mark.line + 1}); keep one"
                ]
            )
        seen[key] = key_node.start_mark.line
    return loader.construct_mapping(node, deep=deep)


_UniqueKeyLoader.add_constructor(yaml.resolver.BaseResolver.DEFAULT_MAPPING_TAG, _construct_mapping)


def _looks_like_path(text: str) -> bool:
    if "\n" in text:
        return False
    if text.strip().endswith((".yaml", ".yml")):
        return True
    try:
        return len(text) < 4096 and Path(text).is_file()
    except OSError:
        return False


def _read(source) -> tuple[dict, Path | None]:
    path = None
    if isinstance(source, Mapping):
        return copy.deepcopy(dict(source)), None
    if isinstance(source, Path) or (isinstance(source, str) and _looks_like_path(source)):
        path = Path(source)
        try:
            data_bytes = path.read_bytes()
        except FileNotFoundError:
            raise CaseError([f"case file: not found (got '{path}')"]) from None
        except OSError as exc:
            raise CaseError([f"case file: cannot be read (got '{path}': {exc.strerror})"]) from None
        if len(data_bytes) > MAX_CASE_BYTES:
            raise CaseError(
                [f"case file: {len(data_bytes)} bytes; at most {MAX_CASE_BYTES} are read"]
            )
        try:
            text = data_bytes.decode("utf-8-sig")
        except UnicodeDecodeError as exc:
            raise CaseError(
                [
                    f"case file: not UTF-8 text (byte 0x{data_bytes[exc.start]:02x} at offset "
                    f"{exc.start}); save it as UTF-8"
                ]
            ) from None
    elif isinstance(source, str):
        text = source
    else:
        raise CaseError(
            [f"case: expected a YAML file path, YAML text or a dict (got {type(source).__name__})"]
        )
    if len(text) > MAX_CASE_BYTES:
        raise CaseError([f"case: {len(text)} characters; at most {MAX_CASE_BYTES} are read"])
    try:
        data = yaml.load(text, Loader=_UniqueKeyLoader)  # noqa: S506 - SafeLoader subclass
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark
        where = f" at line {mark.line + 1}, column {mark.column + 1}" if mark else ""
        raise CaseError([f"case file: YAML syntax error{where}: {exc.problem}"]) from None
    except yaml.YAMLError as exc:
        raise CaseError([f"case file: YAML syntax error: {exc}"]) from None
    if not isinstance(data, dict):
        got = "an empty file" if data is None else f"{type(data).__name__} {_shown(data)}"
        raise CaseError([f"case file: expected a mapping of keys at the top (got {got})"])
    return data, path


def _unwrap(annotation):
    while True:
        origin = get_origin(annotation)
        if origin is Annotated:
            annotation = get_args(annotation)[0]
        elif origin in (Union, types.UnionType):
            args = [a for a in get_args(annotation) if a is not type(None)]
            if len(args) != 1:
                return annotation
            annotation = args[0]
        else:
            return annotation


def _annotation_at(root, loc):
    annotation = root
    for part in loc:
        annotation = _unwrap(annotation)
        origin = get_origin(annotation)
        if isinstance(annotation, type) and issubclass(annotation, BaseModel):
            field = annotation.model_fields.get(part) if isinstance(part, str) else None
            if field is None:
                return None
            annotation = field.annotation
        elif origin is list and isinstance(part, int):
            annotation = get_args(annotation)[0]
        elif origin is dict:
            annotation = get_args(annotation)[1]
        else:
            return None
    return _unwrap(annotation)


def _path(loc) -> str:
    out = ""
    for part in loc:
        if isinstance(part, int):
            out += f"[{part}]"
        else:
            out += f".{part}" if out else str(part)
    return out


def _join(path: str, message: str) -> str:
    return f"{path}: {message}" if path else message


def _describe(error: dict, root) -> list[str]:
    loc, kind, value = tuple(error["loc"]), error["type"], error.get("input")
    path = _path(loc)
    if kind == "finkit":
        return [_join(path, error["ctx"]["message"])]
    if kind == "finkit_many":
        return [
            _join(f"{path}.{sub}" if path and sub else (sub or path), message)
            for sub, message in json.loads(error["ctx"]["problems"])
        ]
    if kind == "missing":
        return [_join(path, "missing (required)")]
    if kind == "extra_forbidden":
        parent = _annotation_at(root, loc[:-1])
        allowed = list(parent.model_fields) if isinstance(parent, type) else []
        close = difflib.get_close_matches(str(loc[-1]), allowed, n=1)
        hint = f"; did you mean '{close[0]}'?" if close else ""
        return [_join(path, f"unknown key{hint} (allowed: {', '.join(allowed)})")]
    if kind in ("model_type", "model_attributes_type", "dict_type"):
        target = _annotation_at(root, loc)
        keys = ""
        if isinstance(target, type) and issubclass(target, BaseModel):
            keys = f"; keys: {', '.join(target.model_fields)}"
        return [_join(path, f"expected a mapping (got {_shown(value)}{keys})")]
    if kind == "literal_error":
        target = _annotation_at(root, loc)
        allowed = get_args(target) if get_origin(target) is Literal else ()
        shown = ", ".join(allowed) if allowed else error["ctx"].get("expected", "")
        return [_join(path, f"not allowed (got {_shown(value)}; allowed: {shown})")]
    if kind == "list_type":
        return [_join(path, f"expected a list (got {_shown(value)})")]
    if kind in ("string_type", "str_type"):
        return [_join(path, f"expected text (got {_shown(value)})")]
    return [_join(path, f"{error['msg']} (got {_shown(value)})")]


def _errors_of(exc: ValidationError, root) -> list[str]:
    lines: list[str] = []
    for error in exc.errors(include_url=False):
        lines.extend(_describe(error, root))
    return lines
