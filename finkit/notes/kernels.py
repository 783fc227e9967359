"""Kernels for notes: the one place that knows how a note's kernel is made.

A note runs in a kernel **process** by default (:func:`finkit.notes.render_note` starts it, as
papermill would, only before the case is solved). A batch's forked child runs its note in an
**in-process** kernel instead (:func:`in_process_kernel_manager`): the child is already an
isolated process, warmed by the parent, so a second process would only add its start-up.

The in-process kernel adapts ipykernel's in-process classes to nbclient's asynchronous client
(:func:`_in_process_classes`); those classes are not a stable public API. When this ipykernel
does not offer what the adapters need (its classes, and the attributes the adapters use,
checked when the manager is built), :func:`in_process_kernel_manager` returns None and the
note runs in a kernel process as usual (slower, the same note); :data:`FALLBACK_REASONS` keeps
why, and the fallback is tested. A change that shows only while a cell runs is not caught
here: that note fails with its error, and the batch records it.
"""

from __future__ import annotations

import os
from functools import lru_cache
from typing import Any

__all__ = ["FALLBACK_REASONS", "in_process_kernel_manager", "warm_in_process_kernel"]

#: Why an in-process kernel could not be made in this process (one line each), newest last.
FALLBACK_REASONS: list[str] = []


def in_process_kernel_manager() -> Any:
    """A kernel manager for an in-process kernel, or None to run the note in a kernel process.

    Returns
    -------
    object or None
        An in-process kernel manager that papermill/nbclient can drive (``km=`` of
        ``papermill.execute_notebook``, ``kernel_manager=`` of
        :func:`finkit.notes.render_note`); None when ipykernel's in-process classes cannot be
        adapted here (the reason is appended to :data:`FALLBACK_REASONS`), and the note then
        starts a kernel process. [-]
    """
    try:
        return _build_in_process_manager()
    except (ImportError, AttributeError, TypeError) as exc:
        FALLBACK_REASONS.append(f"in-process kernel unavailable: {type(exc).__name__}: {exc}")
        return None


def warm_in_process_kernel() -> None:
    """Import and build the in-process kernel classes now (a batch's warm parent, before it
    forks), so every child pays nothing for them; a failure is left for the child's fallback."""
    try:
        _in_process_classes()
    except (ImportError, AttributeError, TypeError):
        pass


#: The attributes of ipykernel's classes that the adapters of :func:`_in_process_classes` use.
_ADAPTED_ATTRIBUTES = {
    "InProcessKernel": ("shell_stream", "dispatch_shell", "_redirected_io", "stdout", "stderr"),
    "BlockingInProcessKernelClient": ("shell_channel", "_handle_kernel_info_reply"),
    "IPythonKernel": ("execute_request",),
}


@lru_cache(maxsize=1)
def _in_process_classes() -> tuple[type, type, type]:
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

    # What the adapters below rely on, checked here so that a changed ipykernel falls back to
    # a kernel process (AttributeError) instead of failing in the middle of a note.
    owners = {
        "InProcessKernel": InProcessKernel,
        "BlockingInProcessKernelClient": BlockingInProcessKernelClient,
        "IPythonKernel": IPythonKernel,
    }
    for owner, names in _ADAPTED_ATTRIBUTES.items():
        for name in names:
            if not hasattr(owners[owner], name):
                raise AttributeError(f"{owner} has no {name!r}")

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


def _build_in_process_manager() -> Any:
    from IPython.core.interactiveshell import InteractiveShell
    from traitlets.config import Config

    _, _, manager = _in_process_classes()
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
