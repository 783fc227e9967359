"""Transient response of the heat-sink chain: lumped heat capacities on the steady network.

- :mod:`~finkit.physics.transient.network`: the RC network built from a steady solution, and
  the lumping checks of the fins;
- :mod:`~finkit.physics.transient.profiles`: power as a function of time;
- :mod:`~finkit.physics.transient.simulate`: the history (exact, or by a stiff ODE solver), and
  the steady state of the network;
- :mod:`~finkit.physics.transient.modal`: the network reduced to its nodes with capacity and
  the exact solution of each piece of the history through its modes;
- :mod:`~finkit.physics.transient.impedance`: the step response (thermal impedance) and the
  Foster and Cauer ladders fitted to it.

See :mod:`finkit.physics.transient.network` for the model and its assumptions.
"""

from finkit.physics.transient import impedance, network, profiles, simulate
from finkit.physics.transient.impedance import *  # noqa: F403
from finkit.physics.transient.network import *  # noqa: F403
from finkit.physics.transient.profiles import *  # noqa: F403
from finkit.physics.transient.simulate import *  # noqa: F403

__all__ = [name for module in (network, profiles, simulate, impedance) for name in module.__all__]
