"""Batches of variants: one base case, a table of overrides, a note per variant and an overview.

``run_batch(base, variants, out_dir)`` reads a base case and a variant table (CSV, or a YAML list),
builds and validates every variant before running any, renders the note of each valid variant as
:func:`finkit.notes.render_note` does, and writes an overview: ``index.html`` (sortable table of
results, margin chart, failures with their errors), ``summary.csv`` and ``summary.json``.

The variant table
-----------------
A CSV file whose first row holds the column names. The column ``variant`` names each variant
(it becomes the variant's ``case_id`` and the folder of its note: 1-64 characters from
``a-z 0-9 . _ -``). Every other column is a dotted path into the case, e.g. ``source.power``,
``air.inlet_temperature``, ``sink.fins.count`` or ``air.flow.fan.pressure[2]`` (a list item), and
may carry a unit in brackets or parentheses: ``source.power [W]``. A cell holds the value as a
case file would (``45 W``, ``50 degC``, ``14``); a bare number in a column with a unit gets that
unit, a cell with its own unit keeps it. An empty cell keeps the base value; ``null`` removes the
entry; a cell starting with ``[`` or ``{`` is read as YAML (``{volume_flow: 15 CFM}`` replaces a
whole block). Rows are counted as in a spreadsheet: the header is row 1. A YAML variant table is a
list of mappings, each with ``variant`` and dotted paths as keys (units in the values); its
entries are rows 1, 2, ...

A bad row (bad id, a cell that cannot be read, or a case that does not validate) becomes a
recorded failure naming the row and the column; the other rows still run.

Execution
---------
Every note runs isolated in its own process. Locally the parent process is warmed once (finkit,
numpy, scipy, pandas, matplotlib, nbconvert with its compiled page templates, papermill, ipykernel,
and every module the template imports) and then forks one child per variant; the child executes
the template with an in-process IPython kernel (the same papermill and nbclient code as
``render_note``, so the note is the same) and exits. Nothing a note does reaches another note: each
child starts from the untouched parent and is discarded. A child that raises, dies or runs past
the per-variant time limit is recorded as a failure with its partial notebook
(``<variant>/note.failed.ipynb``); the parent kills it (with any process it started) at the limit.
If the parent already runs other threads (e.g. inside a Jupyter kernel) forking is unsafe, and
each variant runs in a fresh interpreter instead (slower, as isolated).

With ``scheduler`` the variants run on an existing Dask distributed cluster through its
``concurrent.futures`` executor; each worker runs the variant in a fresh interpreter and returns
the note's files, which are written into ``out_dir`` as if computed locally.

Re-runs
-------
Each finished variant stores ``<variant>/batch-state.json`` with a key: the SHA-256 of the case's
SI inputs (:func:`finkit.case.case_inputs_sha256`), the case as entered, the template file, the
finkit version and the render options. A re-run reuses every note whose key is unchanged (unless
``force``), so an interrupted batch resumes where it stopped; variants that failed are run again.

Exit status (:attr:`BatchResult.exit_code`): 0 every variant computed and passing its limit; 1 all
computed, some fail their limit; 2 some variant could not be computed.


Modules: :mod:`~finkit.batch.records` (outcomes, state, timing), :mod:`~finkit.batch.variants`
(the variant table and its validation), :mod:`~finkit.batch.child` (one note in a forked child;
the warm parent), :mod:`~finkit.batch.runner` (children, time limits, Dask, the fresh-interpreter
entry), :mod:`~finkit.batch.overview` (summary.csv, summary.json, index.html) and
:mod:`~finkit.batch.run` (:func:`run_batch`). Their public names are re-exported here.
"""

from finkit.batch import child, overview, records, run, runner, variants
from finkit.batch.child import *  # noqa: F403
from finkit.batch.overview import *  # noqa: F403
from finkit.batch.records import *  # noqa: F403
from finkit.batch.run import *  # noqa: F403
from finkit.batch.runner import *  # noqa: F403
from finkit.batch.variants import *  # noqa: F403

__all__ = [
    name
    for module in (records, variants, child, runner, overview, run)
    for name in getattr(module, "__all__", ())
]
