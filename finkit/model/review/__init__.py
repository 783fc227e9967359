"""What a reviewer asks: scenarios, touch temperature, calibration, model spread, input flags.

Everything here works on the physics inputs of a case (:class:`finkit.model.SinkInputs`, SI)
and re-solves the full heat-sink model (airflow, bypass, air heating, property feedback,
temperatures) for every variant; no result is scaled by a fixed multiplier.

* :func:`apply_scenario`, :func:`run_scenarios` -- named operating scenarios (hot day, altitude,
  a failed fan, a clogged filter, dust, power corners), each re-solved, with the governing
  (least-margin) scenario marked;
* :func:`touch_temperature_check` -- hottest accessible surface at the user's reference ambient
  against the user's limit (finkit ships no table of limits);
* :func:`calibrate`, :func:`apply_calibration` -- one empirical multiplier (on h or on the sink
  resistance) fitted by least squares to measured points;
* :func:`correlation_spread` -- the headline results with every accepted alternative
  correlation finkit has for the same physics, and their spread;
* :func:`sanity_flags` -- one-line warnings for inputs practitioners commonly get wrong.

The functions return frozen dataclasses; temperatures are absolute [K] throughout.

Modules: :mod:`~finkit.model.review.scenario_defs`, :mod:`~finkit.model.review.scenarios`,
:mod:`~finkit.model.review.touch`,
:mod:`~finkit.model.review.calibration`, :mod:`~finkit.model.review.spread`,
:mod:`~finkit.model.review.flags`. Their public names are re-exported here; code inside finkit
imports a name from the module that defines it.
"""

from finkit.model.review import calibration, flags, scenario_defs, scenarios, spread, touch
from finkit.model.review.calibration import *  # noqa: F403
from finkit.model.review.flags import *  # noqa: F403
from finkit.model.review.scenario_defs import *  # noqa: F403
from finkit.model.review.scenarios import *  # noqa: F403
from finkit.model.review.spread import *  # noqa: F403
from finkit.model.review.touch import *  # noqa: F403

__all__ = [
    name
    for module in (scenario_defs, scenarios, touch, calibration, spread, flags)
    for name in getattr(module, "__all__", ())
]
