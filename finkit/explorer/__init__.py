"""Interactive design explorer for a heat-sink case (ipywidgets, in JupyterLab or headless).

``explore(case)`` builds controls from a case -- fin geometry (or pin geometry), base
thickness, material and finish, airflow (fan pressure factor and fan count, or the given volume
flow or approach velocity), inlet air temperature, altitude and power -- and shows, for the
current settings, the headline numbers and four plots: node temperatures against the limit,
allowable power against the inlet air temperature, the fan and system curves with the
operating point (natural convection: the heat carried by convection and by radiation), and
fin efficiency against fin (or pin) height. Every control's description names its
unit; every change recomputes at once (a few vectorised calls, well under a second).

No physics lives here. Each update turns the controls into a case mapping *as entered*
(``"27.5 mm"``, ``"45 degC"``), validates it with :func:`finkit.case.load_case` and solves it
with :func:`finkit.model.run_case`; the curves come from :func:`finkit.model.note_sweep`,
:func:`finkit.model.system_curve` and :func:`finkit.model.fan_pressure`. The numbers shown are
therefore exactly those of ``finkit check`` and ``finkit note`` on the saved case, which
:meth:`Explorer.save_case` writes (units as entered; unchanged fields kept as written).

The nominal design only: operating scenarios, the touch check, tolerances (Monte Carlo), the
trade study and the note's sweeps are left out of the live solve (they are kept in the saved
case). Measurements and calibration are kept when the case applies the calibration.

Example (in a notebook)::

    from finkit.explorer import explore

    explorer = explore("demo_cases/nb200-plate-fan.yaml")
    explorer                       # shows the controls and plots
    explorer.save_case("nb200-taller-fins.yaml")

Modules: :mod:`~finkit.explorer.controls` (what each control sets), :mod:`~finkit.explorer.drawing`
(plots and read-out), :mod:`~finkit.explorer.session` (:class:`Explorer`, :func:`explore`).
"""

from finkit.explorer.controls import CONTROL_NAMES, ControlSpec, control_specs
from finkit.explorer.session import Explorer, explore

__all__ = ["CONTROL_NAMES", "ControlSpec", "Explorer", "control_specs", "explore"]
