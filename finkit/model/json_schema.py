"""JSON Schemas (draft 2020-12) of the case file and of ``results.json``, for other tools.

``finkit schema case`` prints the case-file schema, generated from the pydantic models that
validate a case (:mod:`finkit.case.schema`): a quantity is a number (SI) or a string with a unit,
unknown keys are refused. ``finkit schema results`` prints the schema of ``results.json``
(layout :data:`finkit.model.RESULTS_SCHEMA_VERSION`); every number there carries its unit as
``{"value": ..., "unit": ...}``. The schemas describe structure; finkit's own validation
(units, ranges, cross-field rules) stays the authority on a case.
"""

from __future__ import annotations

from typing import Any

__all__ = ["SCHEMA_DIALECT", "case_schema", "results_schema"]

SCHEMA_DIALECT = "https://json-schema.org/draft/2020-12/schema"

_VALUE = {
    "type": "object",
    "required": ["value", "unit"],
    "properties": {"value": {"type": ["number", "null"]}, "unit": {"type": "string"}},
    "additionalProperties": False,
}
_RESULTS = {"type": "object", "additionalProperties": {"$ref": "#/$defs/value"}}
_TEXTS = {"type": "array", "items": {"type": "string"}}
_STATUS = {"enum": ["pass", "fail"]}


def case_schema() -> dict[str, Any]:
    """The JSON Schema of a case file (heat-sink or single-fin, chosen by ``kind``)."""
    from typing import Annotated

    from pydantic import Field, TypeAdapter

    from finkit.case.heat_sink import HeatSinkCase
    from finkit.case.single_fin import SingleFinCase

    adapter = TypeAdapter(Annotated[HeatSinkCase | SingleFinCase, Field(discriminator="kind")])
    schema = adapter.json_schema(mode="validation")
    return {
        "$schema": SCHEMA_DIALECT,
        "title": "finkit case file",
        "description": (
            "A finkit case (YAML or JSON). Quantities are numbers in SI or strings with a unit "
            "('1.5 mm', '40 degC', '12 CFM'); finkit's own validation also checks units, ranges "
            "and the rules between fields."
        ),
        **schema,
    }


def results_schema() -> dict[str, Any]:
    """The JSON Schema of ``results.json`` (``schema_version`` 2)."""
    # Long by design: the JSON Schema of results.json written out as literal structures (condition,
    # governing, the whole), the way a reader of the schema sees it.
    from finkit.model.results import RESULTS_SCHEMA_VERSION

    source = {
        "type": "object",
        "required": ["name", "status", "limit_node", "node_temperature", "margin"],
        "properties": {
            "name": {"type": "string"},
            "status": _STATUS,
            "limit_node": {"enum": ["junction", "case", "base"]},
            **{
                key: {"$ref": "#/$defs/value"}
                for key in (
                    "power",
                    "base_mean",
                    "base_peak",
                    "case",
                    "junction",
                    "node_temperature",
                    "limit_temperature",
                    "margin",
                    "required_margin",
                    "air_offset",
                    "allowable_power_alone",
                    "centre_along",
                    "centre_across",
                    "peak_along",
                    "peak_across",
                )
            },
        },
        "additionalProperties": False,
    }
    sources = {"type": "array", "minItems": 1, "items": source}
    condition = {
        "type": "object",
        "required": ["name", "status", "is_governing", "results", "warnings"],
        "properties": {
            "name": {"type": "string"},
            "description": {"type": "string"},
            "status": _STATUS,
            "is_governing": {"type": "boolean"},
            "requirement_id": {"type": ["string", "null"]},
            "changes": _TEXTS,
            "combines": _TEXTS,
            "altitude": {"$ref": "#/$defs/value"},
            "results": {"$ref": "#/$defs/results"},
            "governing_source": {"type": "string"},
            "sources": sources,
            "warnings": _TEXTS,
        },
    }
    governing = {
        "type": "object",
        "required": ["condition", "reason", "status", "temperature_margin", "allowable_power"],
        "properties": {
            "condition": {"type": "string"},
            "description": {"type": "string"},
            "requirement_id": {"type": ["string", "null"]},
            "reason": {"type": "string"},
            "status": _STATUS,
            "temperature_margin": {"$ref": "#/$defs/value"},
            "required_margin": {"$ref": "#/$defs/value"},
            "allowable_power": {"$ref": "#/$defs/value"},
            "power": {"$ref": "#/$defs/value"},
            "least_allowable_power_condition": {"type": "string"},
            "least_allowable_power": {"$ref": "#/$defs/value"},
            "condition_count": {"type": "integer", "minimum": 1},
            "failing_conditions": _TEXTS,
        },
    }
    return {
        "$schema": SCHEMA_DIALECT,
        "title": "finkit results.json",
        "description": (
            "Results of one finkit case. 'results' holds the governing condition's values (the "
            "one with the least margin), 'nominal' the case as stated, 'conditions' every "
            "condition; every number is {value, unit}. Temperatures in degC, differences in K. "
            "With several sources, 'sources' holds each one against its own limit at the "
            "governing condition (the governing source, 'governing_source', first)."
        ),
        "type": "object",
        "required": [
            "schema_version",
            "case",
            "status",
            "created",
            "inputs_sha256",
            "finkit_version",
            "warnings",
            "results",
        ],
        "properties": {
            "schema_version": {"const": RESULTS_SCHEMA_VERSION},
            "case": {"type": "string"},
            "status": _STATUS,
            "created": {"type": "string"},
            "inputs_sha256": {"type": "string", "pattern": "^[0-9a-f]{64}$"},
            "finkit_version": {"type": "string"},
            "limit": {
                "type": "object",
                "properties": {
                    "node": {"type": "string"},
                    "temperature": {"$ref": "#/$defs/value"},
                    "required_margin": {"$ref": "#/$defs/value"},
                    "requirement_id": {"type": ["string", "null"]},
                },
            },
            "governing": governing,
            "warnings": _TEXTS,
            "results": {"$ref": "#/$defs/results"},
            "governing_source": {"type": "string"},
            "sources": sources,
            "nominal": {"$ref": "#/$defs/results"},
            "conditions": {"type": "array", "minItems": 1, "items": condition},
            "review": {"type": "object"},
            "uncertainty": {"type": "object"},
        },
        "$defs": {"value": _VALUE, "results": _RESULTS},
    }
