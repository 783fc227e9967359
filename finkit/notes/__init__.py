"""Calculation notes: execute a notebook template for one case, render a self-contained HTML note.

:func:`render_note` runs a notebook template with papermill, injecting the case and the note time
into the cell tagged ``parameters``, then renders the executed notebook to HTML with nbconvert and
the page frame in ``finkit/html_template`` (code hidden, images embedded, no script, no external
URL). It writes ``<out_dir>/<case_id>/results.json``, ``note.ipynb`` and, last, ``note.html``.

Contract for notebook templates (``templates/<kind>.ipynb`` at the top of the source tree):

* One code cell tagged ``parameters`` assigns ``case`` (a dict, the case as entered in its YAML
  file: unit strings such as ``"2.5 mm"`` stay strings) and ``note_time`` (a str, ISO 8601 with
  time zone). Papermill adds a cell tagged ``injected-parameters`` after it with the values of
  the run; the ``parameters`` cell itself is left out of the HTML.
* Text from the case is shown only through :mod:`finkit.report.present` (escaped); equations through
  :func:`finkit.report.present.equation` (no ``$...$`` in Markdown: there is no MathJax).
* The page frame (document control header, provenance, sign-off block, page numbers in print)
  comes from ``nb.metadata["finkit"]``, which :func:`render_note` fills; templates do not repeat
  it. Templates write no files (they run in a scratch folder that is deleted).
* Cells tagged ``remove-cell`` are left out of the HTML, ``remove-input`` show only their output,
  ``remove-output`` only their input (when code is shown).

Whatever a template displays, :func:`check_note_html` must find nothing: no ``<script>``, no
event-handler attribute, no external resource. Otherwise :func:`render_note` raises
:class:`NoteRenderError` and writes nothing.

Modules: :mod:`~finkit.notes.files`, :mod:`~finkit.notes.setup`, :mod:`~finkit.notes.metadata`,
:mod:`~finkit.notes.html`, :mod:`~finkit.notes.render`, and :mod:`~finkit.notes.kernels` (how a
note's kernel is made: a kernel process, or an in-process kernel in a batch child with the
process as the fallback). Their public names are re-exported here (not the kernels'); code
inside finkit imports a name from the module that defines it.
"""

from finkit.notes import files, html, kernels, metadata, render, setup  # noqa: F401
from finkit.notes.files import *  # noqa: F403
from finkit.notes.html import *  # noqa: F403
from finkit.notes.metadata import *  # noqa: F403
from finkit.notes.render import *  # noqa: F403
from finkit.notes.setup import *  # noqa: F403

__all__ = [
    name
    for module in (files, setup, metadata, html, render)
    for name in getattr(module, "__all__", ())
]
