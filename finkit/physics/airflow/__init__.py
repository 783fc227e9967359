"""Airflow: fan curves, system curves, the vectorised fan operating point, and flow bypass.

A forced-air heat sink sees the flow that its fan delivers against the pressure drop of
everything in the air path. This module holds the pieces of that balance (docs/methods.md, h):

* :class:`FanCurve` -- a fan's static pressure against volume flow, from a catalogue table,
  with density scaling (fan laws), series/parallel combination, speed scaling and failed fans;
* :func:`operating_point` -- the flow at which the fan pressure equals the system pressure
  drop, solved for any number of designs at once (one bracketed root per design);
* flow bypass -- a sink in a duct with clearance gaps: the flow splits between fins and gaps so
  that both branches see the same pressure difference (:func:`split_bypass`,
  :func:`operating_point_with_bypass`), with :func:`bypass_gap_pressure_drop` for the gaps;
* a sink standing unshrouded in an approach stream -- the share of the stream through the
  fins from Lee's bypass balance (:func:`sink_flow_free_stream_lee`);
* :func:`bracketed_root` -- the vectorised bracketed root finder used by all of the above.

System pressure drops are passed as callables ``dp(volume_flow) -> pressure_drop`` [Pa] that
accept an array of volume flows [m³ s⁻¹] broadcast against the design arrays they close over;
the shape of their result defines the batch of designs. They must return ``dp >= 0``, rising
with flow, and use the same air density as the fan (the fan is scaled with ``density``).

Design choices, stated once:

* No operating point for a design (the system needs more pressure at zero flow than the fan's
  shut-off pressure, or the callable returns NaN) gives ``volume_flow = NaN`` and
  ``is_converged = False`` for that design; the batch never raises because of one bad design.
  Pass ``raise_on_failure=True`` for a :class:`~finkit.errors.SolverError` instead (the scalar
  convenience).
* A fan curve with a positive-slope (stall) part can cross a system curve up to three times.
  The solver returns the crossing at the highest flow (the stable one on the falling part of
  the curve) and flags ``is_in_stall_region`` when that point lies on a rising part.

Modules: :mod:`~finkit.physics.airflow.roots`, :mod:`~finkit.physics.airflow.fans`,
:mod:`~finkit.physics.airflow.operating_point`, :mod:`~finkit.physics.airflow.bypass`,
:mod:`~finkit.physics.airflow.free_stream`. Their
public names are re-exported here; code inside finkit imports a name from the module that
defines it.
"""

from finkit.physics.airflow import bypass, fans, free_stream, operating_point, roots
from finkit.physics.airflow.bypass import *  # noqa: F403
from finkit.physics.airflow.fans import *  # noqa: F403
from finkit.physics.airflow.free_stream import *  # noqa: F403
from finkit.physics.airflow.operating_point import *  # noqa: F403
from finkit.physics.airflow.roots import *  # noqa: F403

__all__ = [
    name
    for module in (roots, fans, operating_point, bypass, free_stream)
    for name in getattr(module, "__all__", ())
]
