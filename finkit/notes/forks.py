"""Work a note's parent process forks off while the kernel boots and runs the cells.

``finkit note`` runs on two cores in parallel with its own kernel: a child forked once the
case is checked solves the comparison with the previous revision (:class:`ComparisonPrefetch`)
while the parent solves the case, and a child forked after the solve draws the note's sections
from the end while the kernel draws them from the start (:class:`SectionHelper`,
:mod:`finkit.report.ahead`). Each hands its work over through files in the note's private
scratch folder; anything that goes wrong in a child leaves the work to the parent or the
kernel, as without it (issue 15). The parent forks only while it runs no other thread (the
note's kernel client is started without its heartbeat thread for that), and a child leaves by
``os._exit``, so nothing of the parent's (the kernel's sockets) is closed or flushed twice.
"""

from __future__ import annotations

import os
import signal
import threading
import time
from pathlib import Path
from typing import Any

from finkit.notes.files import atomic_write

__all__ = ["ComparisonPrefetch", "SectionHelper", "fork_is_safe"]


def fork_is_safe() -> bool:
    """A fork copies only the calling thread: safe only while this process runs no other."""
    return hasattr(os, "fork") and threading.active_count() == 1


def _end(pid: int | None) -> None:
    """Kill a child that may still run and reap it; None, the child's pid from now on."""
    if pid is not None:
        try:
            os.kill(pid, signal.SIGKILL)
            os.waitpid(pid, 0)
        except OSError:
            pass


class ComparisonPrefetch:
    """Solve the cases of the comparison with the previous revision in a forked process.

    Comparing a case with its previous revision solves that revision and the cases its
    attribution tries (:func:`finkit.report.compare.prefetch`), none of which needs the current
    case's results; a child forked once the case is checked solves them while the parent solves
    the case, on the second core, and hands the solutions back through a file in the scratch
    folder (issue 15). Nothing but the content-keyed solution caches comes back; anything that
    goes wrong leaves the parent to solve them itself, as before.
    """

    def __init__(self, validated: Any, scratch: Path):
        self.pid = None
        self.path = scratch / "prefetch.pickle"
        previous = getattr(validated, "previous_revision", None)
        if previous is None or not fork_is_safe():
            return
        entered = getattr(validated, "entered", None)
        pid = os.fork()
        if pid == 0:  # the child: solve, write, leave without running any exit handler
            status = 1
            try:
                import pickle

                from finkit.report import compare

                compare.prefetch(previous.source, entered)
                atomic_write(self.path, pickle.dumps(compare.cached_solutions()))
                status = 0
            except BaseException:  # noqa: BLE001 - the parent solves them itself
                pass
            finally:
                os._exit(status)
        self.pid = pid

    def collect(self, timeout: float) -> None:
        """Wait for the child (at most ``timeout``) and take its solutions into the caches.

        Parameters
        ----------
        timeout : float
            Longest wait for the child. [s]
        """
        if self.pid is None:
            return
        deadline = time.monotonic() + timeout
        while time.monotonic() < deadline:
            done, _ = os.waitpid(self.pid, os.WNOHANG)
            if done:
                self.pid = None
                break
            time.sleep(0.01)
        self.stop()
        try:
            import pickle

            from finkit.report import compare

            with open(self.path, "rb") as handle:
                compare.add_cached_solutions(pickle.load(handle))
        except Exception:  # noqa: BLE001 - missing or damaged: solved in the parent
            pass

    def stop(self) -> None:
        """End the child if it still runs (a failed note, or one past its time)."""
        self.pid = _end(self.pid)


class SectionHelper:
    """Draw the note's sections from the end in a forked child while the kernel runs the cells.

    Forked after the parent has solved the case and written the hand-over file, so the child
    holds the very solution the kernel reads; it draws the template's shareable sections
    (:func:`finkit.report.ahead.sections_to_share`) from the last one back, each under a lock
    the kernel respects, and stops where the kernel has been (:mod:`finkit.report.ahead`). On
    two cores the note's cells then take about half as long. Nothing is started when a fork is
    not safe; the kernel then draws every section, as it does when the child fails.

    Parameters
    ----------
    result : finkit.model.CaseResult
        The solved case. [-]
    folder : pathlib.Path
        Where the sections go (in the note's scratch folder; created here). [-]
    cells : list of str
        The template's code cells, in order. [-]
    """

    def __init__(self, result: Any, folder: Path, cells: list[str]):
        self.pid = None
        self.folder = folder
        if not fork_is_safe():
            return
        folder.mkdir(exist_ok=True)
        pid = os.fork()
        if pid == 0:  # the child: draw, leave without running any exit handler
            status = 1
            try:
                from finkit.report import ahead

                ahead.draw_ahead(result, folder, ahead.sections_to_share(cells))
                status = 0
            except BaseException:  # noqa: BLE001 - the kernel draws what is left
                pass
            finally:
                os._exit(status)
        self.pid = pid

    def stop(self, wait: float = 0.0) -> None:
        """Reap the child, ending it if it still runs after ``wait`` seconds.

        Parameters
        ----------
        wait : float, optional
            Longest wait for the child to finish by itself. [s]
        """
        if self.pid is None:
            return
        deadline = time.monotonic() + wait
        while time.monotonic() < deadline:
            if os.waitpid(self.pid, os.WNOHANG)[0]:
                self.pid = None
                return
            time.sleep(0.005)
        self.pid = _end(self.pid)

    def drawn(self) -> int:
        """How many sections the child drew (and the kernel took or will take)."""
        return len(list(self.folder.glob("*.html")))
