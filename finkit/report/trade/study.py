"""The trade-study note's entry and the display of the study's columns.

The study itself is run in the model layer (:func:`finkit.model.trade.case_study.run_trade_study`,
re-exported here as :func:`run` for the note template, with :func:`results_json`); this module
only says how each column is shown.
"""

from __future__ import annotations

from pathlib import Path

from finkit.model.trade.case_study import (
    OBJECTIVE_TEXT,
    ChosenDesign,
    TradeNote,
)
from finkit.model.trade.case_study import run_trade_study as run
from finkit.model.trade.case_study import trade_results_json as results_json

__all__ = [
    "ChosenDesign",
    "OBJECTIVE_TEXT",
    "TEMPLATE",
    "TradeNote",
    "results_json",
    "run",
    "template_path",
]

#: File name of the trade-study note template in the top-level ``templates/`` folder.
TEMPLATE = "trade_study_note.ipynb"


# Display of each study column: label, kind, unit, axis label.
_COLUMNS = {
    "sink_resistance": ("Sink resistance", "thermal_resistance", "K/W", "R_sink [K/W]"),
    "total_resistance": ("Total resistance", "thermal_resistance", "K/W", "R_total [K/W]"),
    "junction_temperature": ("Junction temperature", "temperature", "degC", "T_j [°C]"),
    "limit_node_temperature": ("Limit-node temperature", "temperature", "degC", "T_node [°C]"),
    "pressure_drop": ("Pressure drop", "pressure", "Pa", "Pressure drop [Pa]"),
    "mass": ("Mass", "mass", "g", "Mass [g]"),
}
_DESIGN = {
    "fin_count": ("Fin count", None, "-"),
    "fin_thickness": ("Fin thickness", "length", "mm"),
    "fin_height": ("Fin height", "length", "mm"),
    "fin_spacing": ("Fin gap", "length", "mm"),
    "pin_diameter": ("Pin diameter", "length", "mm"),
    "pin_height": ("Pin height", "length", "mm"),
    "transverse_pitch": ("Pitch across the flow", "length", "mm"),
    "longitudinal_pitch": ("Pitch along the flow", "length", "mm"),
    "pin_count": ("Pin count", None, "-"),
}
_NBSP = "\u00a0"


def template_path() -> Path:
    """The trade-study note template, ``finkit/templates/trade_study_note.ipynb`` (package data)."""
    return Path(__file__).resolve().parents[2] / "templates" / TEMPLATE


# --------------------------------------------------------------------------------------------
# The study
