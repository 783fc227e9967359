"""Forced convection in plate-fin channels and pin-fin arrays: Nusselt numbers and pressure drop.

One function per published source, all vectorised: every argument may be a float or a numpy
array, and all arguments broadcast together (a sweep over 10^5 designs x flows is one call).
Piecewise laws use ``np.where``/``np.select``. Friction factors are **Fanning** everywhere
(``f_Darcy = 4 f_Fanning``). Validity ranges are module constants (:class:`ValidityRange`); the
functions never warn; :func:`plate_fin_flow_warnings` and :func:`pin_fin_flow_warnings` turn a
result into the one-line messages of :func:`finkit.validity.check_range`.

Reference temperature of the heat transfer coefficients (docs/methods.md e2, f1, j):

* Teertstra et al. (plate channels, laminar): h is referred to the **inlet** air temperature;
  the air heating is already inside it. Do not add a caloric resistance.
* VDI parallel-plate channel (laminar / transition / Gnielinski turbulent) and Zukauskas (pin
  arrays): h is a mean coefficient referred to the **mean (logarithmic) air-to-wall temperature
  difference**, i.e. the local bulk air temperature; air heating must be handled with
  ε-NTU for an isothermal base, ``eps = 1 - exp(-NTU)``, ``NTU = eta_o h A / (m_dot c_p)``.

The high-level results carry a per-element flag ``is_inlet_referenced``.

Modules: :mod:`~finkit.physics.correlations.forced.validity`,
:mod:`~finkit.physics.correlations.forced.plate_heat`,
:mod:`~finkit.physics.correlations.forced.plate_friction`,
:mod:`~finkit.physics.correlations.forced.pin_array`,
:mod:`~finkit.physics.correlations.forced.messages`. Their public names are re-exported here;
code inside finkit imports a name from the module that defines it.
"""

from finkit.physics.correlations.forced import (
    messages,
    pin_array,
    plate_friction,
    plate_heat,
    validity,
)
from finkit.physics.correlations.forced.messages import *  # noqa: F403
from finkit.physics.correlations.forced.pin_array import *  # noqa: F403
from finkit.physics.correlations.forced.plate_friction import *  # noqa: F403
from finkit.physics.correlations.forced.plate_heat import *  # noqa: F403
from finkit.physics.correlations.forced.validity import *  # noqa: F403

__all__ = [
    name
    for module in (validity, plate_heat, plate_friction, pin_array, messages)
    for name in getattr(module, "__all__", ())
]
