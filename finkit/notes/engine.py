"""The papermill engine of a note: papermill's own, writing the notebook once, at the end.

Papermill's engine writes the whole executed notebook at the start and at the end of every cell,
so that a long run can be watched. A note's notebook is a private file in its scratch folder
that nobody watches, and it grows to about 1 MB of embedded figures: the heat-sink note's 34
cells wrote it 70 times (about 0.3 s of the parent's time, while a note's kernel and section
helper want both cores; issue 15). Papermill writes the notebook once more when the run ends,
failed, timed out or complete ("a final sync", regardless of exceptions), so that write alone
keeps everything a failed note reports (:func:`finkit.notes.render._execution_failure` reads
the partial notebook). This engine makes only that one.
"""

from __future__ import annotations

from functools import lru_cache

__all__ = ["ENGINE_NAME", "register_engine"]

#: The name the engine is registered under with papermill.
ENGINE_NAME = "finkit-final-save"


@lru_cache(maxsize=1)
def register_engine() -> str:
    """Register the engine with papermill (once); its name, for ``engine_name=``.

    Returns
    -------
    str
        :data:`ENGINE_NAME`. [-]
    """
    from papermill.engines import NBClientEngine, NotebookExecutionManager, papermill_engines

    class _FinalSaveManager(NotebookExecutionManager):
        """Saves only from :meth:`notebook_complete`, which papermill always calls."""

        _final = False

        def save(self, **kwargs):
            if self._final:
                super().save(**kwargs)

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

    papermill_engines.register(ENGINE_NAME, _FinalSaveEngine)
    return ENGINE_NAME
