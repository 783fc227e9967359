"""Running children: forked processes with time limits, and Dask workers.

Also the fresh-interpreter entry ``python -m finkit.batch --run-task`` (:func:`main`)."""

from __future__ import annotations

import concurrent.futures
import json
import os
import re
import shutil
import signal
import subprocess
import sys
import tempfile
import threading
import time
from collections.abc import Callable, Mapping, Sequence
from pathlib import Path
from typing import Any

from finkit import notes
from finkit.batch.child import (
    _child_main,
    _die_with_parent,
    _one_line,
    _render_child,
)
from finkit.batch.records import (
    _RUN_DIR,
)
from finkit.errors import FinkitError, InputError, NotSupportedError

__all__ = [
    "main",
]

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
        cells = notes.executed_cells(nb)
        where = notes.describe_cell(cells, notes.failing_index(cells))
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
# Fresh-interpreter entry (Dask workers, or a parent that cannot fork safely)


def main(argv: list[str] | None = None) -> int:
    """``python -m finkit.batch --run-task TASK.json RESULT.json``: render one variant.

    Parameters
    ----------
    argv : list of str, optional
        Command-line arguments; default ``sys.argv[1:]``. [-]
    """
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
