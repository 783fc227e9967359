"""The model layer: from a validated case to its result.

Modules (each imports only from the layers below, :mod:`finkit.physics` and :mod:`finkit.case`,
and from the modules above it in this list):

- :mod:`finkit.model.design`: one design at one condition (inputs from a case, solve, allowable
  power, sweeps, the model-form check);
- :mod:`finkit.model.results`: the result types (:class:`CaseResult`) and results.json units;
- :mod:`finkit.model.uncertainty`, :mod:`finkit.model.review`, :mod:`finkit.model.trade`: the
  studies (Monte Carlo and sensitivity; scenarios, calibration, touch and checks; the trade study);
- :mod:`finkit.model.run`: :func:`run_case`, the one place that chooses models and studies;
- :mod:`finkit.model.handover`: a solved case passed from a process to a note kernel;
- :mod:`finkit.model.json_schema`: the JSON Schemas of case files and results.json.

The names below are re-exported for users and notebooks (``from finkit.model import run_case``);
code inside finkit imports from the module that defines a name.
"""

from finkit.model.design import (  # noqa: F401
    MODEL_FORM_CELLS_ACROSS,
    MODEL_FORM_LEVELS,
    MODEL_FORM_MAX_CELLS,
    NOTE_SWEEPS,
    SWEEPABLE,
    ConditionState,
    ModelFormCheck,
    SinkInputs,
    airflow_of,
    allowable,
    fan_curve,
    fan_pressure,
    fin_temperature_profile,
    is_fin_tip_exposed,
    model_form_arguments,
    model_form_check,
    note_airflow_range,
    note_h_range,
    note_inlet_range,
    note_sweep,
    note_sweep_values,
    single_fin_profiles,
    sink_inputs,
    solve,
    solve_condition,
    sweep,
    sweep_notes,
    swept_inputs,
    system_curve,
    volume_flow_for_power,
)
from finkit.model.results import (  # noqa: F401
    RESULT_UNITS,
    RESULTS_SCHEMA_VERSION,
    CaseResult,
    ReviewResult,
    UncertaintyResult,
)
from finkit.model.run import (  # noqa: F401
    NO_SCENARIO_WARNING,
    NO_SCENARIO_WARNING_NATURAL,
    governing_results,
    run_case,
)
