"""Inputs a practitioner would catch are caught (software behaviour; no published value).

* a bare number that is implausible in SI for a sink part, a flow or a velocity is refused with
  a hint (common practice, no source: sink parts measure millimetres to decimetres);
* fin gaps narrower than the fins, or outside the trade study's manufacturing bounds, are
  flagged in forced and natural convection, and not on the demo cases;
* a property-range failure caused by fin gaps too narrow for air names the geometry.
"""

from __future__ import annotations

from pathlib import Path

import pytest
import yaml

from finkit.case import CaseError, load_case
from finkit.errors import PropertyRangeError
from finkit.model import run_case

DEMO = Path(__file__).resolve().parent.parent / "demo_cases"


def lean(name: str) -> dict:
    data = yaml.safe_load((DEMO / f"{name}.yaml").read_text(encoding="utf-8"))
    for key in ("tolerances", "monte_carlo", "previous_revision"):
        data.pop(key, None)
    return data


@pytest.mark.parametrize(
    ("path", "value", "message"),
    [
        (("sink", "fins", "height"), 30, "sink.fins.height: 30 metres is implausible here"),
        (("source", "footprint_length"), 25, "did you mean '25 mm'"),
        (("air", "bypass", "side_gap"), 4, "did you mean '4 mm'"),
    ],
)
def test_a_bare_number_implausible_in_metres_is_refused_with_a_hint(path, value, message):
    data = lean("nb200-plate-fan")
    node = data
    for key in path[:-1]:
        node = node[key]
    node[path[-1]] = value
    with pytest.raises(CaseError, match=message):
        load_case(data)


def test_bare_si_numbers_that_are_plausible_still_pass():
    data = lean("nb200-plate-fan")
    data["sink"]["fins"]["height"] = 0.03
    data["air"]["altitude"] = 2500  # an altitude in metres is plausible
    assert load_case(data).sink.fins.height == pytest.approx(0.03)


def test_a_bare_flow_is_read_as_si_and_a_large_one_gets_the_cfm_hint():
    data = lean("nb300-pin-ducted")
    flow = data["air"]["flow"]
    key = next(k for k in ("volume_flow", "approach_velocity") if k in flow)
    flow[key] = 400
    hint = "'400 CFM'" if key == "volume_flow" else "'400 ft/min'"
    with pytest.raises(CaseError, match=hint):
        load_case(data)


def test_fin_gaps_that_cannot_be_made_are_flagged_in_forced_and_natural_convection():
    for name in ("nb200-plate-fan", "nb100-natural"):
        data = lean(name)
        width = load_case(data).sink.base.width
        count = int((width + 0.0015) / 0.0045)  # gap about half the 3 mm fin
        data["sink"]["fins"].update({"count": count, "thickness": "3 mm"})
        warnings = run_case(load_case(data)).warnings
        assert any("is narrower than the 3.00 mm fins" in w for w in warnings), name


@pytest.mark.parametrize("path", sorted(DEMO.glob("*.yaml")), ids=lambda p: p.stem)
def test_the_demo_cases_raise_no_manufacturing_flag(path):
    data = yaml.safe_load(path.read_text(encoding="utf-8"))
    if data["kind"] != "heat-sink":
        return
    for key in ("tolerances", "monte_carlo"):
        data.pop(key, None)
    warnings = run_case(load_case(data)).warnings
    assert not [w for w in warnings if "manufacturing minimum" in w or "narrower than" in w]
    assert not [w for w in warnings if "outside what air-cooled electronics use" in w]


def test_a_property_failure_from_too_many_fins_names_the_fin_gap():
    data = lean("nb200-plate-fan")
    data["sink"]["fins"]["count"] = 60
    with pytest.raises(PropertyRangeError, match=r"^sink.fins: fin gap 0.14 mm is too small"):
        run_case(load_case(data))


@pytest.mark.parametrize(
    ("path", "value", "message"),
    [
        (("sink", "fins", "height"), "2 m", "sink.fins.height: 2000 mm is outside"),
        (("limit", "temperature"), "3000 degC", "limit.temperature: 3000 degC is outside"),
    ],
)
def test_absurd_magnitudes_typed_with_a_unit_are_flagged(path, value, message):
    data = lean("nb100-natural")
    data.pop("scenarios", None)
    node = data
    for key in path[:-1]:
        node = node[key]
    node[path[-1]] = value
    from finkit.model.review import sanity_flags

    case = load_case(data)
    assert any(f.startswith(message) for f in sanity_flags(case))


def test_an_approach_velocity_of_300_m_s_is_flagged():
    from finkit.model.review import sanity_flags

    data = lean("nb300-pin-ducted")
    data["air"]["flow"] = {"approach_velocity": "300 m/s"}
    flags = sanity_flags(load_case(data))
    assert any(f.startswith("air.flow.approach_velocity: 300 m/s is outside") for f in flags)


@pytest.mark.parametrize(
    ("field", "value", "shown"),
    [
        (("sink", "base", "thickness"), "1e-300 m", "sink.base.thickness: 1e-297 mm"),
        (("sink", "pins", "diameter"), "0.01 mm", "sink.pins.diameter: 0.01 mm"),
        (("source", "footprint_length"), "2 m", "source.footprint_length: 2000 mm"),
        (("source", "power"), "50 kW", "source.power: 5e+04 W"),
    ],
)
def test_absurd_typed_magnitudes_are_flagged(field, value, shown):
    # Typed with a unit, so not refused, but far outside air cooling of electronics (the
    # ranges of review.PLAUSIBLE, common practice, no source): a slip of unit or digits.
    data = lean("nb300-pin-ducted")
    target = data
    for key in field[:-1]:
        target = target[key]
    target[field[-1]] = value
    try:
        warnings = run_case(load_case(data)).warnings
    except Exception as exc:  # noqa: BLE001 - a refusal that names the field is fine too
        assert str(exc).startswith(".".join(field) + ":"), exc
        return
    assert any(w.startswith(shown) and "outside what air-cooled" in w for w in warnings), warnings
