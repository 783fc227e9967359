"""finkit: finned surfaces and heat sinks for air cooling, from physics to a signed note.

The top level re-exports the four entry points of the case workflow, imported lazily so that
``import finkit`` stays cheap:

- :func:`load_case` (``finkit.case``): YAML file, string or dict -> validated case in SI;
- :func:`run_case` (``finkit.model``): case -> :class:`~finkit.model.CaseResult`;
- :func:`render_note` (``finkit.notes``): case -> executed, dated HTML calculation note;
- :func:`run_batch` (``finkit.batch``): base case + variant table -> notes and an overview.

The package is layered, each layer importing only from those below it (DEVELOPERS.md):
``finkit.physics`` (fins, properties, correlations, geometry, airflow, radiation, spreading,
conduction, the sink), ``finkit.case`` (the case-file boundary), ``finkit.model`` (a case solved,
its studies), ``finkit.report`` (note sections), and ``finkit.notes``, ``finkit.batch``,
``finkit.explorer`` and ``finkit.cli`` on top.
"""

from importlib import import_module
from importlib.metadata import PackageNotFoundError, version

try:
    __version__ = version("finkit")
except PackageNotFoundError:  # running from a source tree that is not installed
    __version__ = "0+unknown"

_LAZY = {
    "load_case": "finkit.case",
    "run_case": "finkit.model",
    "render_note": "finkit.notes",
    "run_batch": "finkit.batch",
}

__all__ = ["__version__", *_LAZY]


def __getattr__(name):
    if name in _LAZY:
        return getattr(import_module(_LAZY[name]), name)
    raise AttributeError(f"module 'finkit' has no attribute {name!r}")
