"""Tables, figures and text of the trade-study note (``templates/trade_study_note.ipynb``).

:func:`run` validates a case with a ``trade_study:`` block, solves the case's own design
(:func:`finkit.model.run_case`), evaluates every design of the block's grid or sample in one
vectorised call (:mod:`finkit.model.trade`), finds the Pareto front of the block's objectives and
the
chosen design per the block's ``objective``:

* ``coolest`` -- plate fins: :func:`finkit.model.trade.minimise_junction_temperature` on the limit
  node; pin fins: the coolest design of the grid or sample;
* ``lightest-meeting-limit`` -- plate fins: :func:`finkit.model.trade.minimise_mass_meeting_limit`;
  pin fins: the lightest design of the grid or sample that meets the limit with the margin;
* ``pareto`` -- the lightest design on the front that meets the limit with the margin.

The plate-fin optimisers search every fin count that fits, fin thickness from the minimum of
the manufacturing bounds up to the top of the block's thickness range, and fin height from the
bottom of the block's height range up to the envelope (and the aspect-ratio bound); their
result need not be a point of the grid.

The chosen design and the case's design are evaluated again as one-design studies by the same
function as the grid (:func:`finkit.model.trade.plate_fin_designs` or
:func:`finkit.model.trade.pin_fin_designs`), so the comparison table holds like-for-like numbers.

No physics lives here: every number comes from :mod:`finkit.model` or :mod:`finkit.model.trade`.
Figures use the style and colours of :mod:`finkit.report.formatting`; every function returns a
:class:`finkit.report.present.Fragment` (``plot_*`` return the matplotlib Figure).

Modules: :mod:`~finkit.report.trade.study`, :mod:`~finkit.report.trade.text`,
:mod:`~finkit.report.trade.figures`. Their public names are re-exported here; code inside finkit
imports a name from the module that defines it.
"""

from finkit.report.trade import figures, study, text
from finkit.report.trade.figures import *  # noqa: F403
from finkit.report.trade.study import *  # noqa: F403
from finkit.report.trade.text import *  # noqa: F403

__all__ = [name for module in (study, text, figures) for name in getattr(module, "__all__", ())]
