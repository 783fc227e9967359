"""The batch: :func:`run_batch` runs every variant of a table.

It skips variants whose note is current, records each outcome and writes the overview."""

from __future__ import annotations

import dataclasses
import datetime as _dt
import json
import math
import os
import shutil
import sys
import time
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import Any

from finkit import notes
from finkit.batch.child import (
    _warm_up,
)
from finkit.batch.overview import (
    _write_overview,
)
from finkit.batch.records import (
    _LOCK_FILE,
    _RUN_DIR,
    _SCRATCH_NAME,
    STATE_FILE,
    BatchResult,
    VariantOutcome,
)
from finkit.batch.runner import (
    _fork_is_safe,
    _mark_earlier_note_stale,
    _run_jobs,
    _run_on_cluster,
)
from finkit.batch.variants import (
    _load_base,
    prepare_variants,
    variant_key,
)
from finkit.errors import InputError

__all__ = [
    "run_batch",
]


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
    from finkit.case.schema import case_inputs_sha256

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

    Parameters
    ----------
    base : path-like or mapping
        Base case: a YAML file or the case mapping as entered. [-]
    variants : path-like or sequence of mappings
        Variant table: a CSV or YAML file, or the rows as mappings. [-]
    out_dir : path-like
        Batch folder: one sub-folder per variant and the overview. [-]
    **options
        Those of :func:`_run_batch_locked`, documented there (template, jobs, timeout,
        scheduler, ...). [-]
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
    # Long by design: the batch's steps in order (validate every variant, skip current ones, run,
    # record, write the overview), each a few lines with its own error handling.
    started_wall = time.monotonic()
    note_time = notes.parse_note_time(execution_time)
    notes.check_paper(paper)
    if not (isinstance(timeout, int | float) and math.isfinite(timeout) and timeout > 0):
        raise InputError(f"timeout={timeout!r} s is not allowed; use a positive number of seconds")
    if jobs is None:
        jobs = _usable_cores()
    if not isinstance(jobs, int) or isinstance(jobs, bool) or jobs < 1:
        raise InputError(f"jobs={jobs!r} is not allowed; use a whole number of at least 1")

    _, base_validated, base_label = _load_base(base)
    template_file = notes.template_path(base_validated.kind, template)
    notes.check_template(template_file)
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
