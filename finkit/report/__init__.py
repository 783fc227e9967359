"""The report layer: tables, figures and text of the calculation notes (no physics).

The notebook templates stay thin: each code cell calls one function of this package and shows
what it returns, a :class:`finkit.report.present.Fragment` (escaped HTML: tables, text,
equations, or a figure embedded as a PNG); the ``plot_*`` functions return the
:class:`matplotlib.figure.Figure` itself, so tests can inspect axes, labels and lines, and the
matching ``figure_*`` functions embed it with a caption. Every number comes from
:mod:`finkit.model`; this package only converts units for display, picks plot ranges and formats.

- :mod:`finkit.report.present`: HTML fragments (headings, tables, badges, figures, equations);
- :mod:`finkit.report.formatting`: display units, number text, the figure style, figure numbers;
- :mod:`finkit.report.inputs`: :func:`run`, the title block, inputs, derived geometry, changes;
- :mod:`finkit.report.tables`: node, resistance, airflow and condition tables, review checks;
- :mod:`finkit.report.figures`: the heat-sink figures and the sweeps of the case;
- :mod:`finkit.report.method`: method, equations, assumptions, warnings, cautions;
- :mod:`finkit.report.studies`: uncertainty and model-form sections;
- :mod:`finkit.report.single_fin`: the single-fin note;
- :mod:`finkit.report.compare`: the comparison of two revisions of a case;
- :mod:`finkit.report.trade`: the trade-study note.

The public names of the note sections are re-exported here, so a template reads
``import finkit.report as report; report.plot_figures(result)``.
"""

from finkit.report import (
    figures,
    formatting,
    inputs,
    method,
    single_fin,
    sources,
    studies,
    tables,
    transient,
)
from finkit.report.figures import *  # noqa: F403
from finkit.report.formatting import *  # noqa: F403
from finkit.report.inputs import *  # noqa: F403
from finkit.report.method import *  # noqa: F403
from finkit.report.single_fin import *  # noqa: F403
from finkit.report.sources import *  # noqa: F403
from finkit.report.studies import *  # noqa: F403
from finkit.report.tables import *  # noqa: F403
from finkit.report.transient import *  # noqa: F403

__all__ = [
    name
    for module in (
        formatting,
        inputs,
        tables,
        figures,
        method,
        studies,
        single_fin,
        sources,
        transient,
    )
    for name in module.__all__
]
