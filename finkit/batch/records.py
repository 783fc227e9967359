"""What a batch records: the outcome of each variant, the batch state file and the timing table."""

from __future__ import annotations

import dataclasses
import math
import re
from collections.abc import Iterable, Mapping
from pathlib import Path
from typing import Any

__all__ = [
    "BatchResult",
    "EXIT_ALL_PASS",
    "EXIT_LIMIT_FAILED",
    "EXIT_NOT_COMPUTED",
    "INDEX_HTML",
    "STATE_FILE",
    "SUMMARY_CSV",
    "SUMMARY_JSON",
    "VARIANT_COLUMN",
    "Variant",
    "VariantOutcome",
    "VariantRow",
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
        """A result's value from ``results.json`` (``None`` when absent).

        Parameters
        ----------
        name : str
            Result name, e.g. ``"junction_temperature"``; the value is in the unit that
            :meth:`result_unit` gives for it. [-]
        """
        entry = ((self.results or {}).get("results") or {}).get(name)
        value = entry.get("value") if isinstance(entry, Mapping) else entry
        return float(value) if isinstance(value, int | float) and math.isfinite(value) else None

    def result_unit(self, name: str) -> str:
        """A result's unit from ``results.json`` (``""`` when absent).

        Parameters
        ----------
        name : str
            Result name, e.g. ``"junction_temperature"``. [-]
        """
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
