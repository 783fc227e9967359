"""The model layer: from a validated case to its result.

Modules (each imports only from the layers below, :mod:`finkit.physics` and :mod:`finkit.case`,
and from the modules above it in this list):

- :mod:`finkit.model.design`: one design at one condition (inputs from a case, solve, allowable
  power, a condition's state);
- :mod:`finkit.model.sweeps`: sweeps and the other quantities the notes plot;
- :mod:`finkit.model.model_form`: the model-form check against 3-D conduction;
- :mod:`finkit.model.results`: the result types (:class:`CaseResult`) and results.json units;
- :mod:`finkit.model.uncertainty`, :mod:`finkit.model.review`, :mod:`finkit.model.trade`: the
  studies (Monte Carlo and sensitivity; scenarios, calibration, touch and checks; the trade study);
- :mod:`finkit.model.run`: :func:`run_case`, the one place that chooses models and studies;
- :mod:`finkit.model.handover`: a solved case passed from a process to a note kernel;
- :mod:`finkit.model.json_schema`: the JSON Schemas of case files and results.json.

The names below are re-exported for users and notebooks (``from finkit.model import run_case``);
code inside finkit imports from the module that defines a name.
"""

from finkit.model import design, model_form, results, run, sweeps
from finkit.model.design import *  # noqa: F403
from finkit.model.model_form import *  # noqa: F403
from finkit.model.results import *  # noqa: F403
from finkit.model.run import *  # noqa: F403
from finkit.model.sweeps import *  # noqa: F403

__all__ = [name for module in (design, sweeps, model_form, results, run) for name in module.__all__]
