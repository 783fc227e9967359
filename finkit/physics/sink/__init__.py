"""Heat-sink models: the thermal chain from junction to air, and the two design questions.

A heat sink on a device is a chain of resistances in series between the junction and the
incoming air (docs/methods.md, section 0)::

    T_j = T_in + Q (R_jc + R_int + R_sp + R_base + R_sink)

* ``R_jc``: junction to case, from the device's data (the JEDEC metric RθJC);
* ``R_int``: the interface material between case and base;
* ``R_sp``: spreading from the source footprint into the base (Song, Lee & Au);
* ``R_base``: one-dimensional conduction through the base thickness;
* ``R_sink``: fins and exposed base to the *inlet* air, including the heating of the air
  along the sink (inlet-referenced correlation, or effectiveness-NTU for bulk-referenced ones).

Two questions are answered for every design, vectorised over any number of designs:

* :func:`solve_temperatures` -- at this power, how hot does each node get?
* :func:`solve_allowable_power` -- at this temperature limit on a node, how much power can the
  sink carry?

Forced convection (plate fins, pin fins): the airflow is fixed first (given velocity, given
volume flow, or the fan curve crossed with the system curve, with bypass; or a free stream
round an unshrouded sink), with pressure drop
and fan evaluated at the inlet air density and viscosity. Heat transfer uses air properties at
the film temperature between the inlet air and the mean base temperature; because that
temperature depends on the answer, a short fixed-point iteration couples them (the "property
feedback"). Natural convection (vertical plate fins plus radiation) is solved by a vectorised
bracketed root search on the base excess temperature, since h depends strongly on it.

Every function here takes SI floats or numpy arrays that broadcast together and returns a
:class:`SinkSolution` holding arrays; validity messages are collected in ``warnings``.

Modules: :mod:`~finkit.physics.sink.inputs`, :mod:`~finkit.physics.sink.airflow`,
:mod:`~finkit.physics.sink.results`, :mod:`~finkit.physics.sink.forced`,
:mod:`~finkit.physics.sink.natural`, :mod:`~finkit.physics.sink.solve`. Their public names are
re-exported here; code inside finkit imports a name from the module that defines it.
"""

from finkit.physics.sink import airflow, forced, inputs, natural, results, solve
from finkit.physics.sink.airflow import *  # noqa: F403
from finkit.physics.sink.forced import *  # noqa: F403
from finkit.physics.sink.inputs import *  # noqa: F403
from finkit.physics.sink.natural import *  # noqa: F403
from finkit.physics.sink.results import *  # noqa: F403
from finkit.physics.sink.solve import *  # noqa: F403

__all__ = [
    name
    for module in (inputs, airflow, results, forced, natural, solve)
    for name in getattr(module, "__all__", ())
]
