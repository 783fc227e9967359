"""Checks across sections, run on the raw data so they appear with the field errors."""

from __future__ import annotations

from collections.abc import Mapping

from pydantic import (
    TypeAdapter,
    ValidationError,
)

from finkit.case.messages import (
    _join,
    _path,
)
from finkit.case.parts import (
    CaseError,
    Key,
    UserMaterial,
    _flow_problem,
    _fmt,
    _interface_problem,
    _sink_block_problems,
)
from finkit.case.units import to_si
from finkit.errors import InputError

# --------------------------------------------------------------------------------------------
# Checks across sections (run on the raw data, so they appear together with field errors)


def _get(data, *keys):
    for key in keys:
        if isinstance(key, int) and isinstance(data, list) and -len(data) <= key < len(data):
            data = data[key]
        elif isinstance(key, str) and isinstance(data, dict) and key in data:
            data = data[key]
        else:
            return None
    return data


def _si(data, kind, *keys):
    value = _get(data, *keys)
    try:
        return None if value is None else to_si(value, kind, "")
    except InputError:
        return None


def _materials_module():
    try:
        from finkit.physics.properties import materials
    except ImportError:  # the materials table is not there: the model will report it
        return None
    return materials


def _validated_user_materials(entries: Mapping[str, UserMaterial]) -> dict[str, dict]:
    """Check ``materials:`` entries against the material table; return them as SI mappings.

    The mappings are the case-file form that ``get_material(key, user_materials)`` accepts.
    Raises :class:`CaseError` naming ``materials.<key>`` for each entry the table refuses (e.g. a
    new key without thermal_conductivity, or an unknown finish).
    """
    user = {key: entry.model_dump() for key, entry in entries.items()}
    module = _materials_module()
    if not user or module is None:
        return user
    errors = []
    for key, entry in user.items():
        try:
            module.get_material(key, {key: entry})
        except InputError as exc:
            text = str(exc)
            for prefix in (f"user_materials[{key!r}]: ", f"{key}: "):
                if text.startswith(prefix):
                    text = text[len(prefix) :]
            errors.append(f"materials.{key}: {text}")
    if errors:
        raise CaseError(errors)
    return user


def _raw_user_materials(raw, out: list[str]):
    """User materials built from the raw data, or ``None`` if they cannot be built."""
    entries = raw.get("materials")
    if not entries:
        return {}
    try:
        valid = TypeAdapter(dict[Key, UserMaterial]).validate_python(entries)
    except ValidationError:
        return None  # reported by the main pass
    try:
        return _validated_user_materials(valid)
    except CaseError as exc:
        out.extend(exc.errors)
        return None


def _check_material(raw, user, path: tuple, finish_path=None, *, has_emissivity=False, out):
    """Check a material key (and a finish for it) against the material table."""
    module = _materials_module()
    key = _get(raw, *path)
    if module is None or not isinstance(key, str) or not key.strip():
        return
    key = key.strip()
    if user is None:
        if key in (raw.get("materials") or {}):
            return  # the user's own entry is invalid and reported already
        user = {}
    table = module.list_materials(user)
    if key not in table:
        out.append(f"{_path(path)}: unknown material (got '{key}'; allowed: {', '.join(table)})")
        return
    if finish_path is None:
        return
    finish = _get(raw, *finish_path)
    if finish is None and raw.get("kind") == "single-fin":
        finish = "bare"
    if not isinstance(finish, str):
        return
    finish = finish.strip()
    material = module.get_material(key, user)
    if finish in material.emissivity:
        return
    if has_emissivity and finish in module.FINISHES:
        return  # the emissivity is given explicitly, the finish is only a label
    allowed = ", ".join(material.emissivity) or "none"
    out.append(
        f"{_path(finish_path)}: not available for material '{key}' (got '{finish}'; "
        f"allowed: {allowed}; or give the emissivity)"
        if _path(finish_path) == "sink.finish"
        else f"{_path(finish_path)}: not available for material '{key}' (got '{finish}'; "
        f"allowed: {allowed})"
    )


def _present(block) -> set[str]:
    return {k for k, v in block.items() if v is not None} if isinstance(block, dict) else set()


def _structure_heat_sink(raw) -> tuple[list[str], dict]:
    """Block-level rules checked on the raw data; returns messages and the data for pydantic.

    A block that the sink type does not use is reported here and left out of the data given to
    pydantic, so that its contents do not produce a second round of messages.
    """
    out: list[str] = []
    interface = _get(raw, "source", "interface")
    if isinstance(interface, dict):
        problem = _interface_problem(_present(interface))
        if problem:
            out.append(_join("source.interface", problem))
    flow = _get(raw, "air", "flow")
    if isinstance(flow, dict):
        problem = _flow_problem(_present(flow))
        if problem:
            out.append(_join("air.flow", problem))
    sink = raw.get("sink")
    if isinstance(sink, dict) and sink.get("type") in ("plate-fin", "pin-fin"):
        problems = _sink_block_problems(
            sink["type"], sink.get("fins") is not None, sink.get("pins") is not None
        )
        out += [_join(f"sink.{sub}", message) for sub, message in problems]
        unused = "pins" if sink["type"] == "plate-fin" else "fins"
        if unused in sink:
            raw = {**raw, "sink": {k: v for k, v in sink.items() if k != unused}}
    return out, raw


def _positive(value):
    return value if value is not None and value > 0 else None


def _cross_checks_heat_sink(raw) -> list[str]:
    out: list[str] = []
    flow = _get(raw, "air", "flow")
    sink_type = _get(raw, "sink", "type")
    is_natural = isinstance(flow, dict) and "natural" in flow
    if is_natural and sink_type == "pin-fin":
        out.append(
            "air.flow.natural: natural convection is not supported for sink.type 'pin-fin' "
            "(no published pin-fin array correlation for still air could be confirmed; got "
            "pin-fin; allowed: plate-fin)"
        )
    if is_natural and _get(raw, "air", "bypass") is not None:
        out.append("air.bypass: applies to forced flow only (air.flow is natural); remove it")
    credits_free = isinstance(flow, dict) and flow.get("free_convection") is not None
    if credits_free and sink_type == "pin-fin":
        out.append(
            "air.flow.free_convection: needs a natural-convection model of the sink, and finkit "
            "has none for sink.type 'pin-fin' (no published pin-fin array correlation for still "
            "air could be confirmed); remove it (no credit is then taken)"
        )
    if credits_free and _get(raw, "sink", "heat_transfer_coefficient_override") is not None:
        out.append(
            "air.flow.free_convection: cannot be combined with "
            "sink.heat_transfer_coefficient_override (a hand-given h already stands for all the "
            "convection); remove one"
        )

    inlet = _si(raw, "temperature", "air", "inlet_temperature")
    limit = _si(raw, "temperature", "limit", "temperature")
    if inlet is not None and limit is not None and limit <= inlet:
        out.append(
            f"limit.temperature: must be above air.inlet_temperature (got "
            f"{_fmt(limit, 'temperature')}; air.inlet_temperature is {_fmt(inlet, 'temperature')})"
        )

    for side, base_side in (("footprint_length", "length"), ("footprint_width", "width")):
        fp = _positive(_si(raw, "length", "source", side))
        base = _positive(_si(raw, "length", "sink", "base", base_side))
        if fp is not None and base is not None and fp > base:
            out.append(
                f"source.{side}: larger than sink.base.{base_side} (got {_fmt(fp, 'length')}; "
                f"sink.base.{base_side} is {_fmt(base, 'length')})"
            )

    sweeps = raw.get("sweeps")
    if isinstance(sweeps, list):
        for i, name in enumerate(sweeps):
            if name == "airflow" and is_natural:
                out.append(f"sweeps[{i}]: 'airflow' needs forced flow (air.flow is natural)")
            if name in ("fin_count", "fin_thickness") and sink_type == "pin-fin":
                out.append(f"sweeps[{i}]: '{name}' applies to plate-fin sinks only")

    user = _raw_user_materials(raw, out)
    has_emissivity = _get(raw, "sink", "emissivity") is not None
    _check_material(
        raw, user, ("sink", "material"), ("sink", "finish"), has_emissivity=has_emissivity, out=out
    )
    return out


def _cross_checks_single_fin(raw) -> list[str]:
    out: list[str] = []
    ambient = _si(raw, "temperature", "conditions", "ambient_temperature")
    limit = _si(raw, "temperature", "limit", "temperature")
    if ambient is not None and limit is not None and limit <= ambient:
        out.append(
            f"limit.temperature: must be above conditions.ambient_temperature (got "
            f"{_fmt(limit, 'temperature')}; conditions.ambient_temperature is "
            f"{_fmt(ambient, 'temperature')})"
        )
    user = _raw_user_materials(raw, out)
    _check_material(raw, user, ("fin", "material"), ("fin", "finish"), out=out)
    keys = _get(raw, "study", "materials")
    if isinstance(keys, list):
        for i in range(len(keys)):
            _check_material(raw, user, ("study", "materials", i), out=out)
    return out
