"""Closed-form single fins: uniform section (four tip conditions), annular and tapered profiles.

Every function is pure and vectorised: arguments are SI floats or numpy arrays that broadcast
together, the results are arrays of the broadcast shape (or NamedTuples of them). Nothing warns;
impossible input raises :class:`finkit.errors.InputError` with a one-line message.

Conventions
-----------
* ``x`` runs from the fin base (``x = 0``) to the tip (``x = fin_length``).
* ``fin_length`` is the base-to-tip distance of a single fin: the ``fin_height`` of a plate fin
  in a heat sink, the ``pin_height`` of a pin (see the glossary in DEVELOPERS.md).
* Excess temperature ``θ = T - T∞`` [K]; ``base_temperature_difference`` is ``θ_b``.
* Fin efficiency is always *heat leaving the fin surface* divided by ``h A_f θ_b``, with ``A_f``
  the surface that exchanges heat with the air (the tip face included for the convective tip).

Modules: :mod:`~finkit.physics.fins.analytic.groups`,
:mod:`~finkit.physics.fins.analytic.uniform`, :mod:`~finkit.physics.fins.analytic.annular`,
:mod:`~finkit.physics.fins.analytic.tapered`. Their public names are re-exported here; code
inside finkit imports a name from the module that defines it.
"""

from finkit.physics.fins.analytic import annular, groups, tapered, uniform
from finkit.physics.fins.analytic.annular import *  # noqa: F403
from finkit.physics.fins.analytic.groups import *  # noqa: F403
from finkit.physics.fins.analytic.tapered import *  # noqa: F403
from finkit.physics.fins.analytic.uniform import *  # noqa: F403

__all__ = [
    name
    for module in (groups, uniform, annular, tapered)
    for name in getattr(module, "__all__", ())
]
