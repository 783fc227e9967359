"""The papermill engines of a note: papermill's own, writing the notebook less often.

Papermill's engine writes the whole executed notebook at the start and at the end of every cell,
so that a long run can be watched. A note's notebook is a private file in its scratch folder
that nobody watches, and it grows to about 1 MB of embedded figures: the heat-sink note's 34
cells wrote it 70 times (about 0.3 s of the parent's time, while a note's kernel and section
helper want both cores; issue 15). Papermill writes the notebook once more when the run ends,
failed, timed out or complete ("a final sync", regardless of exceptions), so that write alone
keeps everything a failed note reports (:func:`finkit.notes.render._execution_failure` reads
the partial notebook): :data:`FINAL_SAVE` makes only that one. A batch child can be killed
from outside (its variant's time limit), and then no final sync runs: the batch names the cell
that was running from the notebook written at that cell's start
(:func:`finkit.batch.runner._rescue_partial`), so :data:`START_SAVE` writes at each cell's start
and at the end, not at each cell's end (half the writes).
"""

from __future__ import annotations

from functools import lru_cache

__all__ = ["FINAL_SAVE", "START_SAVE", "register_engine"]

#: The engine that writes the notebook only at the end of the run (failed or not).
FINAL_SAVE = "finkit-final-save"
#: The engine that writes it at the start of every cell and at the end of the run.
START_SAVE = "finkit-start-save"


@lru_cache(maxsize=2)
def register_engine(name: str = FINAL_SAVE) -> str:
    """Register an engine with papermill (once); its name, for ``engine_name=``.

    Parameters
    ----------
    name : {FINAL_SAVE, START_SAVE}, optional
        Which engine. [-]

    Returns
    -------
    str
        ``name``. [-]
    """
    at_start = name == START_SAVE
    from papermill.engines import NBClientEngine, NotebookExecutionManager, papermill_engines

    class _FinalSaveManager(NotebookExecutionManager):
        """Saves from :meth:`notebook_complete`, which papermill always calls (and from
        :meth:`cell_start` for :data:`START_SAVE`)."""

        _final = False
        _starting = False

        def save(self, **kwargs):
            if self._final or self._starting:
                super().save(**kwargs)

        def cell_start(self, cell, cell_index=None, **kwargs):
            self._starting = at_start
            try:
                super().cell_start(cell, cell_index, **kwargs)
            finally:
                self._starting = False

        def notebook_complete(self, **kwargs):
            self._final = True
            super().notebook_complete(**kwargs)

    class _FinalSaveEngine(NBClientEngine):
        @classmethod
        def execute_notebook(
            cls,
            nb,
            kernel_name,
            output_path=None,
            progress_bar=True,
            log_output=False,
            autosave_cell_every=30,
            **kwargs,
        ):
            # papermill's Engine.execute_notebook with the manager above
            nb_man = _FinalSaveManager(
                nb,
                output_path=output_path,
                progress_bar=progress_bar,
                log_output=log_output,
                autosave_cell_every=autosave_cell_every,
            )
            nb_man.notebook_start()
            try:
                cls.execute_managed_notebook(nb_man, kernel_name, log_output=log_output, **kwargs)
            finally:
                nb_man.cleanup_pbar()
                nb_man.notebook_complete()
            return nb_man.nb

    papermill_engines.register(name, _FinalSaveEngine)
    return name
