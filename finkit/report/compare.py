"""What changed between two revisions of a case, and what it did to the verdict.

``compare(old, new)`` takes each revision as a case file, a note folder or its results.json
and reports: the inputs that changed (as entered and in SI, by field path); the results that
changed (governing condition, its margin and allowable power, every result of the governing
condition); the conditions whose status changed; warnings added or removed; whether the finkit
version or the note template changed (a change of result without a change of input is then
explained); and, when both revisions carry their inputs, an **attribution**: the change of the
governing margin caused by each changed input alone (the old case with that one change,
re-solved), and the remainder from their interactions, so that the terms sum to the total.

A results.json whose inputs do not give its own ``inputs_sha256`` (edited by hand) is flagged.
Used by ``finkit compare`` and by a note whose case names its ``previous_revision``.
"""

from __future__ import annotations

import copy
import hashlib
import json
import os
from collections.abc import Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

from finkit.errors import FinkitError, InputError

__all__ = [
    "Comparison",
    "InputChange",
    "MAX_ATTRIBUTED",
    "Revision",
    "add_cached_solutions",
    "attribution_table",
    "cached_solutions",
    "changes_table",
    "compare",
    "load_revision",
    "path_text",
    "prefetch",
    "remember_margin",
]

#: Top-level keys whose changes are documentary, not inputs of the answer.
_DOCUMENTARY = ("case_id", "title_block", "previous_revision")
#: Blocks left out of the re-solves of the attribution (sampling, not the deterministic answer;
#: the transient, which does not change the steady governing margin).
_NOT_SOLVED = ("tolerances", "monte_carlo", "transient")
#: At most this many changed inputs are attributed one by one.
MAX_ATTRIBUTED = 30


@dataclass(frozen=True)
class Revision:
    """One side of a comparison.

    Attributes
    ----------
    label : str
        What was given (path) [-].
    source : str
        ``case file``, ``results.json`` or ``note folder`` [-].
    entered : dict or None
        The case as entered (None for a results.json that does not carry it) [-].
    results : dict
        The results.json content (solved now for a case file) [-].
    is_hash_ok : bool or None
        The inputs give the recorded ``inputs_sha256`` (None when it cannot be checked) [-].
    template : str or None
        The note template that made it (note folders) [-].
    """

    label: str
    source: str
    entered: dict | None
    results: dict
    is_hash_ok: bool | None
    template: str | None = None

    @property
    def revision(self) -> str:
        """The title block's revision as entered (or an empty string)."""
        return str(((self.entered or {}).get("title_block") or {}).get("revision", ""))


def _read_json(path: Path) -> dict:
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, UnicodeDecodeError) as exc:
        raise InputError(f"compare: cannot read {str(path)!r} ({exc})") from None
    except json.JSONDecodeError as exc:
        raise InputError(
            f"compare: {str(path)!r} is not JSON ({exc.msg}, line {exc.lineno})"
        ) from None
    if not isinstance(data, dict) or "results" not in data:
        raise InputError(f"compare: {str(path)!r} is not a finkit results.json")
    return data


#: Solved case files and governing margins, by content: a batch solves the base case's previous
#: revision once in its parent and every variant's note reuses it (the model is pure, so the
#: same text gives the same numbers; the key holds the whole text, so an edited file is solved
#: again).
_CASE_FILES: dict[tuple[str, str], tuple[dict, dict]] = {}
_MARGINS: dict[str, float] = {}
_CACHE_SIZE = 64


def _solved_case_file(path: Path) -> tuple[dict, dict]:
    """(entered, results payload) of a case file, solved once per content."""
    from finkit.case.schema import load_case
    from finkit.model.run import run_case

    try:
        digest = hashlib.sha256(path.read_bytes()).hexdigest()
    except OSError as exc:
        raise InputError(f"compare: case file {str(path)!r} cannot be read: {exc}") from None
    key = (str(path.resolve()), digest)
    if key not in _CASE_FILES:
        case = load_case(path)
        if len(_CASE_FILES) >= _CACHE_SIZE:
            _CASE_FILES.clear()
        solved = run_case(case)
        _CASE_FILES[key] = (case.entered, solved.to_json_dict())
        remember_margin(case.entered, solved.results)
    entered, payload = _CASE_FILES[key]
    return copy.deepcopy(entered), copy.deepcopy(payload)


def prefetch(previous_source: str | os.PathLike, entered: dict) -> None:
    """Solve, into the caches, what comparing a case with its previous revision will solve.

    That is the previous revision (a case file is solved) and the governing margin of every
    case the attribution tries but the current one (whose full solution gives it,
    :func:`remember_margin`); none of it depends on the current case's own results, so
    ``finkit note`` runs it in a second process while it solves the case
    (:func:`cached_solutions`, :func:`add_cached_solutions`).

    Parameters
    ----------
    previous_source : str or os.PathLike
        The previous revision: a case file, a note folder or a results.json. [-]
    entered : dict
        The current case as entered (unit strings kept). [-]
    """
    old = load_revision(previous_source)  # a case file is solved in full, its margin kept
    if old.entered is None:
        return
    physical = _physical(_input_changes(old.entered, entered))
    if physical and len(physical) <= MAX_ATTRIBUTED:
        try:  # the current case's own margin is not solved here: its parent solves it in full
            _attribute(old.entered, physical, None)
        except FinkitError:
            pass  # reported when the note compares the revisions


def cached_solutions() -> tuple[dict, dict]:
    """The content-keyed caches (solved case files, governing margins), to hand to a process."""
    return dict(_CASE_FILES), dict(_MARGINS)


def add_cached_solutions(solutions: tuple[dict, dict]) -> None:
    """Add what :func:`cached_solutions` returned in another process (same finkit).

    Parameters
    ----------
    solutions : (dict, dict)
        What :func:`cached_solutions` returned: solved case files, governing margins. [-]
    """
    case_files, margins = solutions
    _CASE_FILES.update(case_files)
    _MARGINS.update(margins)


def load_revision(source: str | os.PathLike) -> Revision:
    """A revision from a case file, a note folder or a results.json.

    Parameters
    ----------
    source : str or os.PathLike
        A case file (.yaml), a note folder or a results.json. [-]

    Raises
    ------
    InputError
        Not found, or none of the three; one line naming the path.
    """
    from finkit.case.schema import case_inputs_sha256, load_case

    path = Path(source)
    template = None
    if path.is_dir():
        results_path = path / "results.json"
        if not results_path.is_file():
            raise InputError(f"compare: {str(path)!r} is a folder without a results.json")
        kind = "note folder"
        notebook = path / "note.ipynb"
        if notebook.is_file():
            try:
                meta = json.loads(notebook.read_text(encoding="utf-8")).get("metadata", {})
                template = meta.get("finkit", {}).get("provenance", {}).get("template")
            except (OSError, json.JSONDecodeError):
                template = None
        path = results_path
    elif path.suffix == ".json":
        kind = "results.json"
    elif path.suffix in (".yaml", ".yml"):
        if not path.is_file():
            raise InputError(f"compare: case file {str(path)!r} not found")
        entered, payload = _solved_case_file(path)
        return Revision(str(source), "case file", entered, payload, True)
    else:
        raise InputError(
            f"compare: got {str(source)!r}; give a case file (.yaml), a note folder or a "
            "results.json"
        )
    if not path.is_file():
        raise InputError(f"compare: {str(path)!r} not found")
    payload = _read_json(path)
    entered = payload.get("inputs")
    is_ok = None
    if isinstance(entered, dict):
        try:
            is_ok = case_inputs_sha256(load_case(copy.deepcopy(entered))) == payload.get(
                "inputs_sha256"
            )
        except FinkitError:
            is_ok = False
    else:
        entered = None
    return Revision(str(source), kind, entered, payload, is_ok, template)


# --------------------------------------------------------------------------------------------
# Differences


def _leaves(data: Any, path: tuple = ()) -> dict[tuple, Any]:
    if isinstance(data, Mapping):
        out: dict[tuple, Any] = {}
        for key, value in data.items():
            out.update(_leaves(value, (*path, key)))
        return out or {path: {}}
    if isinstance(data, list) and any(isinstance(v, Mapping) for v in data):
        out = {}
        for i, value in enumerate(data):
            out.update(_leaves(value, (*path, i)))
        return out
    return {path: data}


def path_text(path: tuple) -> str:
    """``scenarios[0].inlet_temperature_rise`` from its parts.

    Parameters
    ----------
    path : tuple
        The parts of a field path: names (str) and list indices (int). [-]
    """
    text = ""
    for part in path:
        text += f"[{part}]" if isinstance(part, int) else (f".{part}" if text else str(part))
    return text


def _si_leaves(entered: dict | None) -> dict[tuple, Any]:
    from finkit.case.schema import load_case

    if entered is None:
        return {}
    try:
        return _leaves(load_case(copy.deepcopy(entered)).model_dump(mode="json"))
    except FinkitError:
        return {}


@dataclass(frozen=True)
class InputChange:
    """One input that differs: its path, old and new as entered, and in SI (None if absent)."""

    path: tuple
    old: Any
    new: Any
    old_si: Any = None
    new_si: Any = None

    @property
    def name(self) -> str:
        return path_text(self.path)

    @property
    def is_documentary(self) -> bool:
        return bool(self.path) and self.path[0] in _DOCUMENTARY


@dataclass(frozen=True)
class Comparison:
    """Everything :func:`compare` found; :meth:`to_json_dict`, :meth:`text`, :meth:`html`."""

    old: Revision
    new: Revision
    inputs: tuple[InputChange, ...]
    results: tuple[tuple[str, str, float | None, float | None], ...]
    governing: dict[str, Any]
    status_changes: tuple[tuple[str, str | None, str | None], ...]
    warnings_added: tuple[str, ...]
    warnings_removed: tuple[str, ...]
    software: dict[str, Any]
    attribution: tuple[tuple[str, float], ...] | None = None
    remainder: float | None = None
    notes: tuple[str, ...] = field(default_factory=tuple)
    attribution_total: float | None = None

    @property
    def margin_change(self) -> float | None:
        old, new = self.governing.get("old_margin"), self.governing.get("new_margin")
        return None if old is None or new is None else new - old

    @property
    def is_unchanged(self) -> bool:
        return not self.inputs and not self.results and not self.status_changes

    def summary_line(self) -> str:
        """One line for page 1 of a note: what changed and what it did to the margin."""
        physical = [c for c in self.inputs if not c.is_documentary]
        if not physical and self.margin_change in (None, 0.0):
            return "no input that changes the result; the governing margin is the same"
        shown = ", ".join(f"{c.name} {_short(c.old)} -> {_short(c.new)}" for c in physical[:4]) + (
            f" and {len(physical) - 4} more" if len(physical) > 4 else ""
        )
        g = self.governing
        text = shown or "no input changed"
        if self.margin_change is not None:
            text += (
                f"; governing margin {g['old_margin']:.3g} K ({g['old_condition']}) -> "
                f"{g['new_margin']:.3g} K ({g['new_condition']}), {self.margin_change:+.3g} K"
            )
        if self.attribution:
            top = sorted(self.attribution, key=lambda t: -abs(t[1]))[:3]
            text += " (" + ", ".join(f"{name} {delta:+.2g} K" for name, delta in top) + ")"
        return text

    def to_json_dict(self) -> dict[str, Any]:
        return {
            "old": _side(self.old),
            "new": _side(self.new),
            "inputs": [
                {
                    "path": c.name,
                    "old": c.old,
                    "new": c.new,
                    "old_si": c.old_si,
                    "new_si": c.new_si,
                    "documentary": c.is_documentary,
                }
                for c in self.inputs
            ],
            "governing": self.governing,
            "results": [
                {"name": n, "unit": u, "old": o, "new": v, "change": _delta(o, v)}
                for n, u, o, v in self.results
            ],
            "status_changes": [
                {"condition": n, "old": o, "new": v} for n, o, v in self.status_changes
            ],
            "warnings_added": list(self.warnings_added),
            "warnings_removed": list(self.warnings_removed),
            "software": self.software,
            "attribution": None
            if self.attribution is None
            else {
                "unit": "K",
                "terms": [{"input": n, "margin_change": d} for n, d in self.attribution],
                "interaction_remainder": self.remainder,
                "total": self.attribution_total,
            },
            "notes": list(self.notes),
        }

    def text(self) -> str:
        """The comparison as plain text (``finkit compare``)."""
        lines = [f"old: {self.old.label} ({self.old.source}{_rev(self.old)})"]
        lines.append(f"new: {self.new.label} ({self.new.source}{_rev(self.new)})")
        lines += [f"! {n}" for n in self.notes]
        g = self.governing
        lines.append(
            f"status: {g.get('old_status')} -> {g.get('new_status')}; governing condition: "
            f"{g.get('old_condition')} -> {g.get('new_condition')}"
        )
        if self.margin_change is not None:
            lines.append(
                f"governing margin: {g['old_margin']:.3g} K -> {g['new_margin']:.3g} K "
                f"({self.margin_change:+.3g} K); allowable power {g['old_allowable']:.3g} W -> "
                f"{g['new_allowable']:.3g} W"
            )
        lines.append(f"inputs changed ({len(self.inputs)}):")
        lines += [
            f"  {c.name}: {_short(c.old)} -> {_short(c.new)}"
            + (
                ""
                if c.old_si == c.old and c.new_si == c.new
                else f"   [SI {_short(c.old_si)} -> {_short(c.new_si)}]"
            )
            for c in self.inputs
        ] or ["  none"]
        if self.attribution is not None:
            lines.append("governing margin change by input (one change at a time) [K]:")
            lines += [f"  {n}: {d:+.3g}" for n, d in self.attribution]
            lines.append(f"  interactions (remainder): {self.remainder:+.3g}")
            lines.append(f"  total: {self.attribution_total:+.3g}")
        lines.append(f"results changed at the governing condition ({len(self.results)}):")
        lines += [f"  {n}: {_num(o)} -> {_num(v)} {u}".rstrip() for n, u, o, v in self.results] or [
            "  none"
        ]
        if self.status_changes:
            lines.append("conditions that changed status:")
            lines += [f"  {n}: {o} -> {v}" for n, o, v in self.status_changes]
        lines += [f"warning added: {w}" for w in self.warnings_added]
        lines += [f"warning removed: {w}" for w in self.warnings_removed]
        s = self.software
        for key in ("finkit_version", "template"):
            if s.get(f"old_{key}") != s.get(f"new_{key}"):
                lines.append(f"{key} changed: {s.get(f'old_{key}')} -> {s.get(f'new_{key}')}")
        return "\n".join(lines)

    def html(self) -> str:
        """A self-contained page in the style of the notes (no script, nothing loaded)."""
        from finkit.report import present

        g = self.governing
        parts = [present.heading("Comparison of two revisions", 1)]
        parts.append(
            present.key_value_table(
                [
                    ("Old", f"{self.old.label} ({self.old.source}{_rev(self.old)})"),
                    ("New", f"{self.new.label} ({self.new.source}{_rev(self.new)})"),
                    ("Status", f"{g.get('old_status')} -> {g.get('new_status')}"),
                    (
                        "Governing condition",
                        f"{g.get('old_condition')} -> {g.get('new_condition')}",
                    ),
                    ("In one line", self.summary_line()),
                ]
            )
        )
        if self.notes:
            parts.append(present.bullets(self.notes))
        parts += [present.heading("Inputs that changed", 2), changes_table(self)]
        if self.attribution is not None:
            parts += [present.heading("What each change did to the governing margin", 2)]
            parts.append(attribution_table(self))
        parts.append(present.heading("Results at the governing condition", 2))
        parts.append(
            present.html_table(
                [(n, _num(o), _num(v), _num(_delta(o, v)), u) for n, u, o, v in self.results]
                or [("none", "", "", "", "")],
                header=("Result", "Old", "New", "Change", "Unit"),
            )
        )
        if self.status_changes:
            parts.append(present.heading("Conditions that changed status", 2))
            parts.append(
                present.html_table(self.status_changes, header=("Condition", "Old", "New"))
            )
        if self.warnings_added or self.warnings_removed:
            parts.append(present.heading("Warnings", 2))
            parts.append(
                present.bullets(
                    [f"added: {w}" for w in self.warnings_added]
                    + [f"removed: {w}" for w in self.warnings_removed]
                )
            )
        body = "".join(present.escape(p) for p in parts)
        css = (Path(__file__).parents[1] / "html_template" / "static" / "finkit.css").read_text(
            encoding="utf-8"
        )
        return (
            '<!DOCTYPE html>\n<html lang="en"><head><meta charset="utf-8">'
            "<title>finkit comparison</title>"
            f'<style>{css}</style></head><body class="fk-note"><main>{body}</main></body></html>'
        )


def _rev(r: Revision) -> str:
    return f", revision {r.revision}" if r.revision else ""


def _short(value: Any, limit: int = 60) -> str:
    text = value if isinstance(value, str) else json.dumps(value, ensure_ascii=False, default=str)
    return text if len(text) <= limit else text[: limit - 1] + "…"


def _num(value: Any) -> str:
    return "—" if value is None else (f"{value:.4g}" if isinstance(value, float) else str(value))


def _delta(old: Any, new: Any) -> float | None:
    if isinstance(old, int | float) and isinstance(new, int | float):
        return float(new) - float(old)
    return None


def _side(r: Revision) -> dict[str, Any]:
    return {
        "label": r.label,
        "source": r.source,
        "revision": r.revision,
        "inputs_sha256": r.results.get("inputs_sha256"),
        "hash_matches_inputs": r.is_hash_ok,
        "finkit_version": r.results.get("finkit_version"),
        "template": r.template,
    }


def changes_table(comparison: Comparison):
    """The changed inputs (as entered and in SI) with each one's share of the margin change.

    Parameters
    ----------
    comparison : Comparison
        From :func:`compare`. [-]
    """
    from finkit.report import present

    alone = dict(comparison.attribution or ())
    rows = []
    for c in comparison.inputs:
        if c.path and c.path[0] == "previous_revision":
            continue  # the link to the previous revision itself, not a change
        same = (c.old_si, c.new_si) == (c.old, c.new)
        si = "" if same else f"{_num(c.old_si)} -> {_num(c.new_si)}"
        share = alone.get(c.name)
        rows.append(
            (c.name, _short(c.old), _short(c.new), si, "" if share is None else f"{share:+.3g}")
        )
    caption = None
    if comparison.attribution is not None:
        caption = (
            "Margin change alone: the old case re-solved with that one change, governing "
            f"margin [K]. The changes together add {comparison.remainder:+.3g} K more "
            f"(interactions); total {comparison.attribution_total:+.3g} K."
        )
    if comparison.status_changes:
        changed = "; ".join(f"{n} {o} -> {v}" for n, o, v in comparison.status_changes)
        caption = (caption or "") + f" Conditions that changed status: {changed}."
    return present.html_table(
        rows or [("none", "", "", "", "")],
        header=("Input (field path)", "Old", "New", "In SI", "Margin change alone [K]"),
        caption=caption,
    )


def attribution_table(comparison: Comparison):
    """Each changed input's share of the change of the governing margin.

    Parameters
    ----------
    comparison : Comparison
        From :func:`compare`, with an attribution. [-]
    """
    from finkit.report import present

    rows = [(name, f"{delta:+.3g}") for name, delta in comparison.attribution or ()]
    rows.append(("interactions between the changes (remainder)", f"{comparison.remainder:+.3g}"))
    rows.append(("total", f"{comparison.attribution_total:+.3g}"))
    return present.html_table(
        rows,
        header=("Change (alone, on the old case)", "Governing margin change [K]"),
        caption="The old case re-solved with one change at a time; the remainder is what the "
        "changes do together beyond their sum.",
    )


def _value(block: Mapping | None, name: str) -> Any:
    entry = (block or {}).get(name)
    return entry.get("value") if isinstance(entry, Mapping) else entry


def _margin_key(entered: dict) -> tuple[str, dict]:
    data = {k: v for k, v in copy.deepcopy(entered).items() if k not in _NOT_SOLVED}
    return json.dumps(data, sort_keys=True, default=str), data


def _keep_margin(key: str, margin: float) -> None:
    if len(_MARGINS) >= _CACHE_SIZE:
        _MARGINS.clear()
    _MARGINS[key] = margin


def remember_margin(entered: dict, results: Mapping) -> None:
    """Keep the governing margin of a case already solved in full, for the attribution.

    ``run_case(case).results`` are the results at the governing condition, the very numbers
    :func:`finkit.model.governing_results` gives (tested on every demo case), and the blocks the
    attribution leaves out (:data:`_NOT_SOLVED`) do not change them (tested too), so the case's
    governing margin need not be solved again.

    Parameters
    ----------
    entered : dict
        The case as entered. [-]
    results : mapping
        Its ``run_case(case).results``. [-]
    """
    margin = results.get("temperature_margin")
    if margin is not None:
        _keep_margin(_margin_key(entered)[0], float(margin))


def _governing_margin(entered: dict) -> float:
    from finkit.case.schema import load_case
    from finkit.model.run import governing_results

    key, data = _margin_key(entered)
    if key not in _MARGINS:
        _keep_margin(key, float(governing_results(load_case(data))["temperature_margin"]))
    return _MARGINS[key]


def _apply(data: dict, path: tuple, value: Any, is_removed: bool) -> None:
    node: Any = data
    for key in path[:-1]:
        if isinstance(node, list):
            node = node[key]
        else:
            node = node.setdefault(key, {})
    if is_removed and isinstance(node, dict):
        node.pop(path[-1], None)
    elif not is_removed:
        node[path[-1]] = value


def _input_changes(old: dict, new: dict) -> list[InputChange]:
    la, lb = _leaves(old), _leaves(new)
    sa, sb = _si_leaves(old), _si_leaves(new)
    return [
        InputChange(path, la.get(path), lb.get(path), sa.get(path), sb.get(path))
        for path in dict.fromkeys([*la, *lb])
        if la.get(path) != lb.get(path) or (path in la) != (path in lb)
    ]


def _physical(inputs: list[InputChange]) -> list[InputChange]:
    return [c for c in inputs if not c.is_documentary and c.path[:1] != ("transient",)]


def _attribute(old: dict, changes: list[InputChange], new_entered: dict | None):
    """(terms, remainder, total): each change alone on the old case, what is left of the total
    and the total; only the terms when ``new_entered`` is None (a prefetch)."""
    base = _governing_margin(old)
    terms = []
    for change in changes:
        trial = copy.deepcopy(old)
        try:
            _apply(trial, change.path, copy.deepcopy(change.new), change.new is None)
            delta = _governing_margin(trial) - base
        except (FinkitError, KeyError, IndexError, TypeError):
            continue  # a change that makes no case on its own is left to the remainder
        terms.append((change.name, delta))
    if new_entered is None:
        return tuple(terms), None, None
    total = _governing_margin(new_entered) - base
    return tuple(terms), total - sum(d for _, d in terms), total


def compare(
    old: str | os.PathLike | Revision, new: str | os.PathLike | Revision, *, attribute: bool = True
) -> Comparison:
    """Compare two revisions of a case (case files, note folders or results.json files).

    Parameters
    ----------
    old : str, os.PathLike or Revision
        The earlier revision, or the path of a case file, note folder or results.json. [-]
    new : str, os.PathLike or Revision
        The later revision, or the path of a case file, note folder or results.json. [-]
    attribute : bool, optional
        Attribute the change of the governing margin to the changed inputs (re-solves
        the old case with one change at a time). [-]
    """
    # Long by design: the comparison's steps in order (both revisions solved, inputs diffed, changes
    # attributed).
    a = old if isinstance(old, Revision) else load_revision(old)
    b = new if isinstance(new, Revision) else load_revision(new)
    notes = []
    for side, r in (("old", a), ("new", b)):
        if r.is_hash_ok is False:
            notes.append(
                f"{side} revision {r.label}: its inputs do not give its recorded inputs SHA-256 "
                "(edited by hand?); its results may not belong to its inputs"
            )
        if r.entered is None:
            notes.append(f"{side} revision {r.label}: carries no inputs; inputs not compared")
    inputs: list[InputChange] = []
    if a.entered is not None and b.entered is not None:
        inputs = _input_changes(a.entered, b.entered)
    ra, rb = a.results, b.results
    results = []
    for name in dict.fromkeys([*(ra.get("results") or {}), *(rb.get("results") or {})]):
        va, vb = _value(ra.get("results"), name), _value(rb.get("results"), name)
        unit = (rb.get("results") or {}).get(name) or (ra.get("results") or {}).get(name) or {}
        if va != vb:
            results.append(
                (name, unit.get("unit", "") if isinstance(unit, Mapping) else "", va, vb)
            )
    ga, gb = ra.get("governing") or {}, rb.get("governing") or {}
    governing = {
        "old_status": ra.get("status"),
        "new_status": rb.get("status"),
        "old_condition": ga.get("condition", "nominal"),
        "new_condition": gb.get("condition", "nominal"),
        "old_margin": _value(ra.get("results"), "temperature_margin"),
        "new_margin": _value(rb.get("results"), "temperature_margin"),
        "old_allowable": _value(ra.get("results"), "allowable_power"),
        "new_allowable": _value(rb.get("results"), "allowable_power"),
    }
    ca = {c["name"]: c.get("status") for c in ra.get("conditions") or []}
    cb = {c["name"]: c.get("status") for c in rb.get("conditions") or []}
    status_changes = tuple(
        (n, ca.get(n), cb.get(n)) for n in dict.fromkeys([*ca, *cb]) if ca.get(n) != cb.get(n)
    )
    wa, wb = ra.get("warnings") or [], rb.get("warnings") or []
    software = {
        "old_finkit_version": ra.get("finkit_version"),
        "new_finkit_version": rb.get("finkit_version"),
        "old_template": a.template,
        "new_template": b.template,
    }
    physical = _physical(inputs)
    if not physical and results:
        notes.append(
            "results changed although no input did: "
            + (
                "the finkit version changed"
                if software["old_finkit_version"] != software["new_finkit_version"]
                else "the model or its data changed (same finkit version)"
            )
        )
    attribution, remainder, total = None, None, None
    if attribute and physical and a.entered is not None and b.entered is not None:
        if len(physical) <= MAX_ATTRIBUTED:
            try:
                attribution, remainder, total = _attribute(a.entered, physical, b.entered)
            except FinkitError as exc:
                notes.append(f"attribution not computed: {exc}")
        else:
            notes.append(f"attribution not computed: more than {MAX_ATTRIBUTED} inputs changed")
    return Comparison(
        a,
        b,
        tuple(inputs),
        tuple(results),
        governing,
        status_changes,
        tuple(w for w in wb if w not in wa),
        tuple(w for w in wa if w not in wb),
        software,
        attribution,
        remainder,
        tuple(notes),
        total,
    )
