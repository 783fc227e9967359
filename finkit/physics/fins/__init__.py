"""Single fins: closed forms (:mod:`.analytic`) and the 1-D fin BVP (:mod:`.numeric`)."""

from finkit.physics.fins.analytic.annular import (
    annular_fin,
    annular_fin_efficiency,
    annular_fin_efficiency_schmidt,
)
from finkit.physics.fins.analytic.groups import (
    ANNULAR_TIP_CONDITIONS,
    ONE_DIMENSIONAL_FIN_RANGE,
    SCHMIDT_ANNULAR_RANGE,
    TIP_CONDITIONS,
    AnnularFinResult,
    FinSection,
    ProfileFinResult,
    UniformFinResult,
    corrected_length,
    fin_parameter,
    one_dimensional_fin_warnings,
    pin_fin_section,
    rectangular_fin_section,
    transverse_biot_number,
)
from finkit.physics.fins.analytic.tapered import (
    pin_fin_concave_parabolic,
    pin_fin_conical,
    straight_fin_concave_parabolic,
    straight_fin_triangular,
)
from finkit.physics.fins.analytic.uniform import (
    infinite_fin_length,
    uniform_fin,
    uniform_fin_efficiency_corrected_length,
    uniform_fin_temperature_difference,
)

__all__ = [
    "ANNULAR_TIP_CONDITIONS",
    "NUMERIC_TIP_CONDITIONS",
    "ONE_DIMENSIONAL_FIN_RANGE",
    "SCHMIDT_ANNULAR_RANGE",
    "TIP_CONDITIONS",
    "AnnularFinResult",
    "FinSection",
    "NumericFinResult",
    "ProfileFinResult",
    "UniformFinResult",
    "annular_fin",
    "annular_fin_efficiency",
    "annular_fin_efficiency_schmidt",
    "corrected_length",
    "fin_parameter",
    "infinite_fin_length",
    "one_dimensional_fin_warnings",
    "pin_fin_concave_parabolic",
    "pin_fin_conical",
    "pin_fin_section",
    "rectangular_fin_section",
    "solve_fin",
    "straight_fin_concave_parabolic",
    "straight_fin_triangular",
    "transverse_biot_number",
    "uniform_fin",
    "uniform_fin_efficiency_corrected_length",
    "uniform_fin_temperature_difference",
]


_NUMERIC = ("NUMERIC_TIP_CONDITIONS", "NumericFinResult", "solve_fin")


def __getattr__(name: str):
    # The BVP solver (scipy.integrate, about 0.17 s to import) loads when first asked for.
    if name in _NUMERIC:
        from finkit.physics.fins import numeric

        return getattr(numeric, name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
