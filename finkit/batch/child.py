"""One note in an isolated process with an in-process kernel, and the warm parent that forks it."""

from __future__ import annotations

import ast
import io
import json
import os
import signal
import sys
import threading
import time
from collections.abc import Iterable, Mapping
from pathlib import Path
from typing import Any

from finkit import notes
from finkit.errors import FinkitError
from finkit.notes.kernels import in_process_kernel_manager, warm_in_process_kernel
from finkit.report import present

__all__ = [
    "PARENT_WATCH_INTERVAL",
]

# --------------------------------------------------------------------------------------------
# The child: one note in an isolated process, with an in-process kernel


def _render_child(task: Mapping[str, Any]) -> dict[str, Any]:
    """Render one variant's note in this (child) process; returns the outcome as a dict."""
    from finkit.notes.files import NoteExecutionError, NoteRenderError
    from finkit.notes.render import render_note

    _reseed()
    stages: dict[str, float] = {}
    try:
        started = time.perf_counter()
        km = in_process_kernel_manager()  # None: a kernel process (the fallback)
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
    "finkit.case.schema",
    "finkit.model",
    "finkit.report.present",
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
    warm_in_process_kernel()
    notes.library_versions()
    if validated is not None:
        try:
            from finkit.model.run import run_case
            from finkit.report.inputs import changes_since
            from finkit.report.method import method_section

            base = run_case(validated)
            base.to_json_dict()
            # Solved once here, reused by every child: the previous revision the variants are
            # compared with, and the method section's equations (content-keyed caches).
            changes_since(base)
            method_section(base)
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
