"""Design exploration: trade studies, Pareto fronts and optimisers for a heat sink in an envelope.

A trade study keeps everything of a case (source, air, fan or flow, limit) and the base plate
(the envelope: width, length, base thickness) and varies the fins: count, height and thickness
for plate fins; diameter, pitches and height for pin fins. Every design of a grid or a sample
is solved in ONE vectorised call of :mod:`finkit.physics.sink` (the geometry fields are flat
arrays), so
10^4-10^5 designs take seconds, not hours.

Manufacturing bounds (:class:`ManufacturingBounds`) flag designs that cannot be made with the
chosen process; their defaults are editable examples of common practice for extruded or
bonded-fin aluminium sinks, **not** values from a standard.

The two usual design questions are answered by :func:`minimise_junction_temperature` (coolest
design for this fan and envelope) and :func:`minimise_mass_meeting_limit` (lightest design that
keeps the limit node the required margin below its limit). Both enumerate the fin count (an
integer) in a vectorised screening pass, then polish the continuous thickness and height of the
best counts with :func:`scipy.optimize.minimize`; see :func:`minimise_junction_temperature` for
why this was chosen over a stochastic global method.

For natural convection, :func:`optimum_fin_count_natural` finds the best whole number of fins
at a fixed base temperature (or at the case's power) and reports the Bar-Cohen & Rohsenow
optimum spacing beside it.

Modules: :mod:`~finkit.model.trade.pareto`, :mod:`~finkit.model.trade.designs`,
:mod:`~finkit.model.trade.evaluate`, :mod:`~finkit.model.trade.optimise`,
:mod:`~finkit.model.trade.natural`. Their public names are re-exported here; code inside finkit
imports a name from the module that defines it.
"""

from finkit.model.trade import designs, evaluate, natural, optimise, pareto
from finkit.model.trade.designs import *  # noqa: F403
from finkit.model.trade.evaluate import *  # noqa: F403
from finkit.model.trade.natural import *  # noqa: F403
from finkit.model.trade.optimise import *  # noqa: F403
from finkit.model.trade.pareto import *  # noqa: F403

__all__ = [
    name
    for module in (pareto, designs, evaluate, optimise, natural)
    for name in getattr(module, "__all__", ())
]
