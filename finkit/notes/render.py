"""Rendering a note: the case solved, the template executed with papermill, HTML written."""

from __future__ import annotations

import datetime as _dt
import importlib
import json
import os
import shutil
import sys
import tempfile
import threading
import time
from collections.abc import Callable, Mapping
from pathlib import Path
from typing import Any

from finkit.errors import InputError
from finkit.notes.engine import FINAL_SAVE, START_SAVE, register_engine
from finkit.notes.files import (
    _PACKAGE_DIR,
    _TEMPLATE_DIR,
    FAILED_IPYNB,
    KERNEL_NAME,
    NOTE_HTML,
    NOTE_IPYNB,
    RESULTS_JSON,
    NoteExecutionError,
    NoteOutput,
    NoteRenderError,
    PreparedCase,
    atomic_write,
    case_folder,
)
from finkit.notes.forks import ComparisonPrefetch, SectionHelper
from finkit.notes.html import (
    check_note_html,
    check_paper,
    render_html,
)
from finkit.notes.metadata import (
    parse_note_time,
    provenance,
)
from finkit.notes.setup import (
    check_template,
    ensure_kernel,
    prepare_case,
    template_path,
)

__all__ = [
    "NOTE_STAGES",
    "STALE_MARKER",
    "TEMPLATE_DEFAULTS",
    "clear_stale",
    "describe_cell",
    "executed_cells",
    "failing_index",
    "main",
    "mark_stale",
    "render_note",
    "sync_template_defaults",
    "template_default_case",
]


# --------------------------------------------------------------------------------------------
# The note


#: Modules a note kernel imports while the parent solves the case: those the template's first
#: cells import anyway (the report module, the classes of the solved result it unpickles, the
#: fan curve's interpolator, matplotlib's figure), then the unit registry the first cell makes.
#: Imported by name, so that no name is bound in the notebook's namespace.
_WARM_MODULES = (
    "finkit.report",
    "finkit.model",
    "finkit.model.review",
    "finkit.model.uncertainty",
    "finkit.report.compare",
    "matplotlib.figure",
    "matplotlib.backends.backend_agg",
)
_WARM_IMPORTS = (
    f"for __finkit_module in {_WARM_MODULES!r}:\n"
    "    __import__(__finkit_module)\n"
    "del __finkit_module\n"
    "__import__('finkit.case.units', fromlist=['_ureg'])._ureg()\n"
)


def _code_cells(template: Path) -> list[str]:
    """The source of each code cell of a notebook template, in order."""
    cells = json.loads(template.read_text(encoding="utf-8")).get("cells", [])
    return [
        "".join(c["source"]) if isinstance(c["source"], list) else str(c["source"])
        for c in cells
        if c.get("cell_type") == "code"
    ]


def _warm_html_exporter(show_code: bool) -> threading.Thread:
    """Build and exercise the note's HTML exporter in a thread while the kernel runs the cells
    (imports and template compilation, about 0.4 s that the parent would otherwise pay after
    the cells); :func:`render_html` then finds it built."""

    def warm() -> None:
        try:
            import nbformat

            nb = nbformat.v4.new_notebook()
            nb.cells = [nbformat.v4.new_markdown_cell("warm-up")]
            nb.metadata["finkit"] = {"status": "complete", "provenance": {"case_id": "warm-up"}}
            render_html(nb, show_code=show_code)
        except Exception:  # noqa: BLE001 - the real render reports any problem
            pass

    thread = threading.Thread(target=warm, name="finkit-html-warm-up", daemon=True)
    thread.start()
    return thread


class _EarlyKernel:
    """A note's own kernel, started before the case is checked and solved.

    A fresh kernel process per note, as papermill would start it, only earlier: it boots and
    imports the modules the note's first cells need (:data:`_WARM_IMPORTS`, a silent request
    that leaves nothing in the notebook's namespace or history) while the parent checks and
    solves the case; on two cores that hides the kernel's start-up (issue 15). No state reaches
    the note that the template's cells did not make: the imports are the ones the cells do.
    It runs in an empty folder of its own (the note's scratch folder is made only once the
    case is known to be good), removed when it stops; the cells use absolute paths only.
    """

    def __init__(self, kernel: str, case_id: str):
        # The asynchronous manager papermill's client makes for itself: with a blocking one,
        # nbclient's per-cell time limit is never applied.
        from jupyter_client.manager import AsyncKernelManager
        from jupyter_core.utils import run_sync

        self._run_sync = run_sync
        self.manager = AsyncKernelManager(kernel_name=kernel)
        self._client = None
        self._warm_id = None
        self.cwd = tempfile.mkdtemp(prefix="finkit-kernel-")
        try:
            run_sync(self.manager.start_kernel)(cwd=self.cwd)
            self._client = self.manager.client()
            # No heartbeat thread: the parent stays single-threaded, so it may fork a helper.
            self._client.start_channels(hb=False)
            self._warm_id = self._client.execute(_WARM_IMPORTS, silent=True, store_history=False)
        except Exception as exc:  # noqa: BLE001 - reported as the note's failure, one line
            self.stop()
            raise NoteExecutionError(
                f"note for case {case_id!r}: the kernel {kernel!r} could not start: "
                f"{_one_line(exc)}"
            ) from exc

    def ready(self, timeout: float = 60.0) -> Any:
        """Wait for the warm-up to finish (never more than ``timeout``); the kernel manager."""
        import queue

        client, self._client = self._client, None
        if client is not None:
            deadline = time.monotonic() + timeout
            try:
                get = self._run_sync(client.get_shell_msg)
                while time.monotonic() < deadline:
                    reply = get(timeout=max(deadline - time.monotonic(), 0.01))
                    if reply.get("parent_header", {}).get("msg_id") == self._warm_id:
                        break
            except queue.Empty:  # a slow kernel: papermill waits for it as usual
                pass
            finally:
                client.stop_channels()
        return self.manager

    def stop(self) -> None:
        """Stop the kernel at once: the note is complete or has failed."""
        if self._client is not None:
            self._client.stop_channels()
            self._client = None
        try:
            if self.manager.has_kernel:
                self._run_sync(self.manager.shutdown_kernel)(now=True)
        except Exception:  # noqa: BLE001 - an already dead kernel is what we wanted
            pass
        shutil.rmtree(self.cwd, ignore_errors=True)


def _case_label(case: Any) -> str:
    """What a note's case is called before it is checked: its case id or file name."""
    if isinstance(case, Mapping):
        return str(case.get("case_id", "?"))
    return Path(case).stem if isinstance(case, str | os.PathLike) else "?"


def _one_line(text: str, limit: int = 160) -> str:
    line = " ".join(str(text).split())
    return line if len(line) <= limit else line[: limit - 1] + "…"


def executed_cells(nb: Any) -> list:
    """The cells as executed: without the error-marker cells papermill adds to a failed run.

    Parameters
    ----------
    nb : nbformat.NotebookNode
        The executed (or partly executed) notebook. [-]
    """
    from papermill.execute import ERROR_MARKER_TAG

    return [c for c in nb.cells if ERROR_MARKER_TAG not in c.get("metadata", {}).get("tags", [])]


def failing_index(cells: list) -> int | None:
    """Index of the last code cell that papermill started (the one that failed).

    Parameters
    ----------
    cells : list
        The cells as executed (:func:`executed_cells`). [-]
    """
    found = None
    for index, cell in enumerate(cells):
        if cell.cell_type == "code" and cell.get("metadata", {}).get("papermill", {}).get(
            "start_time"
        ):
            found = index
    return found


def describe_cell(cells: list, index: int | None) -> str:
    """``template cell 4 (In [4], 'first line')``, the template cell counted from 1.

    Parameters
    ----------
    cells : list
        The cells as executed (:func:`executed_cells`). [-]
    index : int or None
        Index of the cell in ``cells``; None: the kernel did not start. [-]
    """
    if index is None or not 0 <= index < len(cells):
        return "kernel start"
    cell = cells[index]
    injected_before = any(
        "injected-parameters" in c.get("metadata", {}).get("tags", []) for c in cells[:index]
    )
    if "injected-parameters" in cell.get("metadata", {}).get("tags", []):
        place = "the injected parameters cell"
    else:
        place = f"template cell {index + 1 - injected_before}"
    first = next((line.strip() for line in cell.source.splitlines() if line.strip()), "")
    count = cell.get("execution_count")
    prompt = f"In [{count}], " if count is not None else ""
    return f"{place} ({prompt}{_one_line(first, 60)!r})"


def render_note(
    case: str | os.PathLike | Mapping[str, Any],
    out_dir: str | os.PathLike,
    *,
    template: str | os.PathLike | None = None,
    show_code: bool = False,
    kernel_name: str | None = None,
    execution_time: _dt.datetime | str | None = None,
    timeout: float = 600,
    paper: str = "A4",
    validate: bool = True,
    results: Callable[[Any], Mapping[str, Any]] | None = None,
    kernel_manager: Any = None,
    stages: dict[str, float] | None = None,
    draw_ahead: bool = True,
) -> NoteOutput:
    """Execute the note template for a case and write a dated, self-contained HTML note.

    Steps: check the case (``prepare_case``) and its folder name, compute the results (before
    any cell runs, so a case the model rejects fails fast), execute the template with
    papermill in a scratch folder injecting ``case`` and ``note_time``, record the provenance in
    the notebook metadata, render the HTML, check it (:func:`check_note_html`), then write
    ``results.json``, ``note.ipynb`` and last ``note.html`` into ``out_dir/<case_id>/``, each
    atomically. An existing ``note.html`` is removed just before the new set is written, so
    ``note.html`` present means the three files come from the same run.

    Parameters
    ----------
    case : path-like or mapping
        YAML case file or case mapping (as entered). [-]
    out_dir : path-like
        Output folder; the note goes into its sub-folder named after the case id. [-]
    template : path-like, optional
        Notebook template; default ``templates/<kind>`` (:data:`TEMPLATES_BY_KIND`). [-]
    show_code : bool, optional
        Keep code cells' input in the HTML. [-]
    kernel_name : str, optional
        Jupyter kernel; default the ``finkit`` kernel of this interpreter
        (:func:`ensure_kernel`). [-]
    execution_time : datetime or str, optional
        Note time with time zone (tests pass a fixed one); default now. [-]
    timeout : float, optional
        Time limit per cell. [s]
    paper : {"A4", "letter"}, optional
        Paper size of the printed note. [-]
    validate : bool, optional
        Validate with ``finkit.case.load_case`` (see :func:`prepare_case`). [-]
    results : callable, optional
        ``results(validated_case) -> mapping`` written to ``results.json``; default
        ``finkit.model.run_case(case).to_json_dict()``, whose solution is also handed to the
        kernel when the template takes a ``solved`` parameter
        (:func:`finkit.model.handover.write_solved`), so the note never solves its case twice. [-]
    kernel_manager : jupyter_client.KernelManager, optional
        Execute with this kernel manager (passed to papermill as ``km``) instead of starting
        the kernel ``kernel_name``; :mod:`finkit.batch` passes an in-process kernel here.
        Default: a new kernel process, started before the case is solved so that it boots
        meanwhile, and stopped when the notebook has run. [-]
    stages : dict, optional
        Filled with the seconds each stage took (:data:`NOTE_STAGES`), for benchmarks and the
        batch's timing table. [s]
    draw_ahead : bool, optional
        With its own kernel and the solved case handed over, fork a helper that draws the
        note's sections from the end while the kernel draws them from the start
        (:class:`finkit.notes.forks.SectionHelper`); the note is the same either way. [-]

    Returns
    -------
    NoteOutput
        ``folder``, ``html``, ``notebook`` and ``results_json`` paths. [-]

    Raises
    ------
    finkit.errors.InputError
        Bad case, case id, template or time; nothing is written.
    NoteExecutionError
        The template failed; the partial notebook is kept as ``note.failed.ipynb`` (metadata
        ``finkit.status = "failed"``) and any previous note is left as it was.
    NoteRenderError
        The HTML would contain a script or an external resource; nothing is written.

    Notes
    -----
    ``results.json`` is the results mapping (``CaseResult.to_json_dict()``) with two keys added:
    ``note_time`` and ``provenance`` (the dict of :func:`provenance`, also stored in the notebook
    metadata as ``nb.metadata["finkit"]["provenance"]`` and shown in the note's footer).
    """
    # Long by design: the note's stages in order, each timed by the stage clock and guarded so that
    # nothing half-written is left.
    clock = _StageClock(stages)
    own_kernel = None
    if kernel_manager is None:
        # Started first, so that it boots while the case is checked and solved.
        own_kernel = _EarlyKernel(kernel_name or ensure_kernel(), _case_label(case))
    try:
        prepared = prepare_case(case, validate=validate)
        folder = case_folder(out_dir, prepared.case_id)
        template_file = template_path(prepared.kind, template)
        template_parameters = check_template(template_file)
        note_time = parse_note_time(execution_time)
        check_paper(paper)
        if not (isinstance(timeout, int | float) and timeout > 0):
            raise InputError(
                f"timeout={timeout!r} s is not allowed; use a positive number of seconds"
            )
        kernel = kernel_name or KERNEL_NAME
        folder.parent.mkdir(parents=True, exist_ok=True)
        scratch = Path(
            tempfile.mkdtemp(dir=folder.parent, prefix=f".{prepared.case_id}.", suffix=".partial")
        )
    except BaseException:
        if own_kernel is not None:
            own_kernel.stop()
        raise
    prefetch = None
    helper = None
    clock.mark("check case and template")
    try:
        if kernel_manager is None:
            if results is None and "solved" in template_parameters:
                if getattr(prepared.validated, "previous_revision", None) is not None:
                    # Imported once, before the fork, rather than in both processes.
                    for name in ("finkit.model", "finkit.model.review", "finkit.report.compare"):
                        importlib.import_module(name)
                prefetch = ComparisonPrefetch(prepared.validated, scratch)
        clock.mark("start kernel")
        parameters: dict[str, Any] = {"case": prepared.case, "note_time": note_time}
        if results is None:
            from finkit.model.run import run_case

            solved = run_case(prepared.validated)
            result_dict = dict(solved.to_json_dict())
            clock.mark("solve")
            if "solved" in template_parameters:
                extra = {}
                if getattr(prepared.validated, "previous_revision", None) is not None:
                    from finkit.report.inputs import changes_since

                    if prefetch is not None:
                        prefetch.collect(timeout)

                    extra["comparison"] = changes_since(solved)
                share = own_kernel is not None and draw_ahead  # a core is free meanwhile
                if share:
                    extra["sections_folder"] = str(scratch / "sections")
                from finkit.model import handover  # here: the kernel starts before it loads

                handover.write_solved(
                    scratch / handover.SOLVED_PICKLE, prepared.validated, solved, **extra
                )
                parameters["solved"] = str(scratch / handover.SOLVED_PICKLE)
                if share:
                    helper = SectionHelper(solved, scratch / "sections", _code_cells(template_file))
                clock.mark("compare with the previous revision")
        else:
            result_dict = dict(results(prepared.validated))
            clock.mark("solve")
        prov = provenance(prepared.validated, template=template_file.name, note_time=note_time)
        clash = {"note_time", "provenance"} & set(result_dict)
        if clash:
            raise NoteRenderError(
                f"results already hold the keys {sorted(clash)} that the note adds"
            )
        try:
            results_text = json.dumps(
                {**result_dict, "note_time": note_time, "provenance": prov},
                indent=2,
                ensure_ascii=False,
                allow_nan=False,
            )
        except (TypeError, ValueError) as exc:
            raise NoteRenderError(
                f"results of case {prepared.case_id!r} are not strict JSON: {_one_line(exc)}"
            ) from None

        import nbformat
        import papermill

        if own_kernel is not None:
            kernel_manager = own_kernel.ready(timeout)
        clock.mark("wait for the kernel")
        html_warm_up = _warm_html_exporter(show_code) if own_kernel is not None else None
        executed_path = scratch / NOTE_IPYNB
        try:
            nb = papermill.execute_notebook(
                str(template_file),
                str(executed_path),
                parameters=parameters,
                kernel_name=kernel,
                execution_timeout=timeout,
                progress_bar=False,
                log_output=False,
                cwd=str(scratch),
                km=kernel_manager,
                # a note run for a batch can be killed from outside: written at each cell's start
                engine_name=register_engine(FINAL_SAVE if own_kernel is not None else START_SAVE),
            )
        except Exception as exc:  # noqa: BLE001 - every failure is reported the same way
            message = _execution_failure(exc, executed_path, prepared, prov, folder, timeout)
            raise NoteExecutionError(message) from exc
        clock.mark("run the cells")
        if helper is not None:
            helper.stop(wait=1.0)
            if stages is not None:
                stages["(sections drawn ahead)"] = float(helper.drawn())
        if own_kernel is not None:
            own_kernel.stop()
            own_kernel = None
        clock.mark("stop the kernel")

        nb.metadata["finkit"] = {"status": "complete", "provenance": prov}
        nb.metadata.setdefault("papermill", {})["output_path"] = str(folder / NOTE_IPYNB)
        notebook_text = nbformat.writes(nb)
        if html_warm_up is not None:
            html_warm_up.join()
        html = render_html(nb, show_code=show_code, paper=paper)
        problems = check_note_html(html)
        if problems:
            raise NoteRenderError(
                f"note for case {prepared.case_id!r} is not self-contained and safe: "
                f"{'; '.join(sorted(set(problems)))[:300]}"
            )
        clock.mark("notebook and HTML")

        folder.mkdir(exist_ok=True)
        (folder / NOTE_HTML).unlink(missing_ok=True)
        atomic_write(folder / RESULTS_JSON, results_text)
        atomic_write(folder / NOTE_IPYNB, notebook_text)
        (folder / FAILED_IPYNB).unlink(missing_ok=True)
        clear_stale(folder)
        atomic_write(folder / NOTE_HTML, html)
        clock.mark("write the files")
    finally:
        if prefetch is not None:
            prefetch.stop()
        if helper is not None:
            helper.stop()
        if own_kernel is not None:
            own_kernel.stop()
        shutil.rmtree(scratch, ignore_errors=True)
    return NoteOutput(folder, folder / NOTE_HTML, folder / NOTE_IPYNB, folder / RESULTS_JSON)


#: The stages :func:`render_note` times (its ``stages`` argument), in order.
NOTE_STAGES = (
    "check case and template",
    "start kernel",
    "solve",
    "compare with the previous revision",
    "wait for the kernel",
    "run the cells",
    "stop the kernel",
    "notebook and HTML",
    "write the files",
)


class _StageClock:
    """Seconds between marks, added into a dict (nothing when no dict is given)."""

    def __init__(self, stages: dict[str, float] | None):
        self.stages = stages
        self.last = time.perf_counter()

    def mark(self, name: str) -> None:
        now = time.perf_counter()
        if self.stages is not None:
            self.stages[name] = self.stages.get(name, 0.0) + now - self.last
        self.last = now


STALE_MARKER = "STALE.txt"
#: A note's outputs and the names they take when a later run of its case fails.
_STALE_NAMES = {
    "note.html": "note.stale.html",
    "note.ipynb": "note.stale.ipynb",
    "results.json": "results.stale.json",
}


def mark_stale(folder: Path, reason: str) -> list[str]:
    """Rename a case folder's earlier note so that nobody signs it for the edited case.

    The earlier note, notebook and results.json keep their content (nothing produced is lost)
    under ``*.stale.*`` names, and ``STALE.txt`` says why. Returns the names renamed.

    Parameters
    ----------
    folder : pathlib.Path
        The case's note folder. [-]
    reason : str
        Why the note is stale (the failure of the new run), written into ``STALE.txt``. [-]
    """
    renamed = []
    for name, stale in _STALE_NAMES.items():
        if (folder / name).is_file():
            os.replace(folder / name, folder / stale)
            renamed.append(stale)
    if renamed or (folder / STALE_MARKER).exists():
        atomic_write(
            folder / STALE_MARKER,
            "The note in this folder (" + ", ".join(renamed or ["note.stale.html"]) + ") is from "
            "an earlier run. The latest run of this case did not complete, so the note does not "
            f"describe the current case file; do not sign it.\nLatest run: {reason}\n",
        )
    return renamed


def clear_stale(folder: Path) -> None:
    """Remove the stale copies once a new note of the case is complete.

    Parameters
    ----------
    folder : pathlib.Path
        The case's note folder. [-]
    """
    for stale in (*_STALE_NAMES.values(), STALE_MARKER):
        (folder / stale).unlink(missing_ok=True)


def _execution_failure(
    exc: Exception,
    executed_path: Path,
    prepared: PreparedCase,
    prov: dict,
    folder: Path,
    timeout: float,
) -> str:
    """One-line message for a failed run; keeps the partial notebook as note.failed.ipynb."""
    import nbformat
    from papermill.exceptions import PapermillExecutionError

    nb = None
    if executed_path.is_file():
        try:
            nb = nbformat.read(executed_path, as_version=4)
        except Exception:  # noqa: BLE001 - a torn partial file is not worth a second error
            nb = None

    cells = executed_cells(nb) if nb is not None else []
    if isinstance(exc, PapermillExecutionError):
        where = describe_cell(cells, exc.cell_index) if cells else f"In [{exc.exec_count}]"
        what = f"{exc.ename}: {_one_line(exc.evalue)}"
    else:
        where = describe_cell(cells, failing_index(cells))
        name = type(exc).__name__
        if isinstance(exc, TimeoutError) or name == "CellTimeoutError":
            what = f"time limit of {timeout:g} s per cell exceeded"
        elif name == "DeadKernelError":
            what = f"the kernel died ({_one_line(exc)})"
        else:
            what = f"{name}: {_one_line(exc)}"
    message = f"note for case {prepared.case_id!r} failed at {where}: {what}"

    if nb is not None:
        nb.metadata["finkit"] = {"status": "failed", "error": message, "provenance": prov}
        folder.mkdir(exist_ok=True)
        atomic_write(folder / FAILED_IPYNB, nbformat.writes(nb))
    if folder.is_dir():
        mark_stale(folder, message)
    return message


#: The demo case each template opens with (its ``parameters`` cell), relative to the repository.
TEMPLATE_DEFAULTS = {
    "heat_sink_note.ipynb": "demo_cases/nb200-plate-fan.yaml",
    "single_fin_note.ipynb": "demo_cases/nb-fin-study.yaml",
    "trade_study_note.ipynb": "demo_cases/nb200-trade-study.yaml",
    "explorer.ipynb": "demo_cases/nb200-plate-fan.yaml",
}


def template_default_case(template: str | os.PathLike) -> dict:
    """The ``case`` dict a template's ``parameters`` cell defines (its default scenario).

    Parameters
    ----------
    template : path-like
        Notebook template. [-]
    """
    import nbformat

    nb = nbformat.read(Path(template), as_version=4)
    cell, name = _default_case_cell(nb)
    namespace: dict = {}
    exec(compile(cell.source, str(template), "exec"), namespace)  # our own template file
    return namespace[name]


def _default_case_cell(nb):
    """(cell, variable) holding a template's default case: the cell tagged ``demo-case``
    (``demo_case = {...}``, note templates) or else the ``parameters`` cell (``case = {...}``)."""
    for tag, name in (("demo-case", "demo_case"), ("parameters", "case")):
        for cell in nb.cells:
            if tag in cell.metadata.get("tags", []):
                return cell, name
    raise ValueError("template has neither a demo-case nor a parameters cell")


def sync_template_defaults() -> list[Path]:
    """Rewrite each template's default ``case`` from its demo file; returns those changed."""
    import pprint

    import nbformat
    import yaml

    changed = []
    for name, demo in TEMPLATE_DEFAULTS.items():
        path = _TEMPLATE_DIR / name
        case = yaml.safe_load((_PACKAGE_DIR.parent / demo).read_text(encoding="utf-8"))
        if template_default_case(path) == case:
            continue
        nb = nbformat.read(path, as_version=4)
        cell, name = _default_case_cell(nb)
        head, _, rest = cell.source.partition(f"{name} = ")
        tail = rest[rest.index("\nnote_time") :] if "\nnote_time" in rest else ""
        cell.source = head + f"{name} = " + pprint.pformat(case, sort_dicts=False, width=96) + tail
        atomic_write(path, nbformat.writes(nb))
        changed.append(path)
    return changed


def main(argv: list[str] | None = None) -> int:
    """``python -m finkit.notes``: register the kernel (make), or sync template defaults.

    Parameters
    ----------
    argv : list of str, optional
        Command-line arguments; default ``sys.argv[1:]``. [-]
    """
    import argparse

    parser = argparse.ArgumentParser(prog="python -m finkit.notes")
    parser.add_argument("--ensure-kernel", action="store_true", help="install the finkit kernel")
    parser.add_argument(
        "--sync-defaults",
        action="store_true",
        help="rewrite each template's default case from its demo case file",
    )
    args = parser.parse_args(argv)
    if args.ensure_kernel:
        print(f"Jupyter kernel {ensure_kernel()!r} ready for {sys.executable}")
    if args.sync_defaults:
        for path in sync_template_defaults():
            print(f"updated {path}")
    return 0
