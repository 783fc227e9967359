"""Tests of finkit.case: the case-file schema, its messages, and the SI content it produces.

Expected SI values are exact unit definitions (1 in = 25.4 mm and 1 ft = 0.3048 m exactly,
international yard and pound agreement, 1959; T/K = t/°C + 273.15, SI Brochure 2019;
conventional inH2O = 249.08891 Pa, docs/methods.md section 0). Bad cases are built by editing a
starter case, and each test states the one-line message the user must see.
"""

import copy
import re
from pathlib import Path

import pytest
import yaml

from finkit.case import (
    CaseError,
    HeatSinkCase,
    SingleFinCase,
    case_inputs_sha256,
    load_case,
)
from finkit.errors import InputError

ROOT = Path(__file__).resolve().parents[1]
DEMOS = sorted((ROOT / "demo_cases").glob("*.yaml"))
STARTERS = sorted((ROOT / "finkit" / "data" / "starters").glob("*.yaml"))
FOOT = 0.3048  # Source: international yard and pound agreement (1959), exact
IN_H2O = 0.0254 * 1000.0 * 9.80665  # Source: docs/methods.md section 0 (conventional), exact


def starter(name: str) -> dict:
    return yaml.safe_load((ROOT / "finkit" / "data" / "starters" / f"{name}.yaml").read_text())


def errors_of(data) -> list[str]:
    with pytest.raises(CaseError) as info:
        load_case(data)
    return info.value.errors


# --------------------------------------------------------------------------------------------
# Files that must load


def test_there_are_demo_cases_and_starters():
    assert {p.stem for p in DEMOS} >= {"nb200-plate-fan", "nb300-pin-ducted", "nb100-natural",
                                       "nb-fin-study", "nb400-board-sources",
                                       "nb210-board-stream"}  # fmt: skip
    assert {p.stem for p in STARTERS} == {
        "plate-fin",
        "pin-fin",
        "natural",
        "sources",
        "single-fin",
    }


@pytest.mark.parametrize("path", DEMOS + STARTERS, ids=lambda p: p.stem)
def test_demo_cases_and_starters_load(path):
    case = load_case(path)
    assert isinstance(case, HeatSinkCase | SingleFinCase)
    assert case.source_path == path
    assert re.fullmatch(r"[0-9a-f]{64}", case_inputs_sha256(case))


@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_demo_cases_say_the_data_are_invented(path):
    head = path.read_text(encoding="utf-8")[:400]
    assert "invented" in head and "Norrbeck Instruments" in head


@pytest.mark.identity
def test_validated_values_are_si_floats():
    case = load_case(ROOT / "demo_cases" / "nb200-plate-fan.yaml")
    # Source: SI prefixes; T/K = t/°C + 273.15 (SI Brochure 2019)
    assert case.sink.fins.thickness == pytest.approx(1.2e-3, rel=1e-12)
    assert case.sink.base.width == pytest.approx(0.080, rel=1e-12)
    assert case.source.power == 40.0
    assert case.source.interface.area_resistance == pytest.approx(0.2e-4, rel=1e-12)
    assert case.air.inlet_temperature == pytest.approx(323.15, rel=1e-12)
    assert case.air.surroundings_temperature == case.air.inlet_temperature  # the default
    assert case.limit.temperature == pytest.approx(378.15, rel=1e-12)
    assert case.limit.required_margin == pytest.approx(5.0, rel=1e-12)
    fan = case.air.flow.fan
    assert case.air.flow.mode == "fan"
    # Source: CFM = ft³/min exact; inH2O conventional (docs/methods.md section 0)
    assert fan.volume_flow[-1] == pytest.approx(14 * FOOT**3 / 60, rel=1e-12)
    assert fan.pressure[0] == pytest.approx(0.18 * IN_H2O, rel=1e-12)
    assert all(isinstance(v, float) for v in fan.volume_flow + fan.pressure)
    assert case.air.bypass.side_gap == pytest.approx(4e-3, rel=1e-12)
    assert case.entered["sink"]["fins"]["thickness"] == "1.2 mm"  # as written, for the note


def test_defaults_are_filled_in():
    data = starter("plate-fin")
    del data["source"]["junction_to_case"]
    del data["air"]["altitude"]
    del data["limit"]["required_margin"]
    del data["sweeps"]
    case = load_case(data)
    assert case.source.junction_to_case == 0.0
    assert case.air.altitude == 0.0
    assert case.limit.required_margin == 0.0
    assert case.sweeps == []
    assert case.air.bypass is None
    assert case.sink.emissivity is None
    fin = load_case({**starter("single-fin"), "fin": {
        "profile": "rectangular", "length": "30 mm", "thickness": "2 mm", "material":
        "aluminium-6063-t5"}})  # fmt: skip
    assert fin.fin.width == 1.0  # per metre of width
    assert fin.fin.tip == "convective"
    assert fin.fin.finish == "bare"


def test_case_is_frozen_and_entered_is_a_copy():
    case = load_case(starter("plate-fin"))
    with pytest.raises(Exception):  # noqa: B017 - pydantic's frozen-instance error
        case.source.power = 1.0
    entered = case.entered
    entered["source"]["power"] = "1 W"
    assert case.entered["source"]["power"] == "30 W"


def test_load_case_accepts_path_string_yaml_text_and_dict(tmp_path):
    text = (ROOT / "finkit" / "data" / "starters" / "pin-fin.yaml").read_text()
    file = tmp_path / "case.yaml"
    file.write_text(text)
    other = tmp_path / "case.txt"  # any existing file name
    other.write_text(text)
    cases = [load_case(file), load_case(str(file)), load_case(str(other)), load_case(text),
             load_case(yaml.safe_load(text))]  # fmt: skip
    assert len({case_inputs_sha256(c) for c in cases}) == 1


def test_inputs_sha256_depends_on_values_not_on_units_or_order():
    base = starter("plate-fin")
    same = copy.deepcopy(base)
    same["sink"]["fins"]["thickness"] = "0.0012 m"
    same["sink"]["base"] = dict(reversed(list(same["sink"]["base"].items())))
    same["limit"]["temperature"] = "221 degF"  # Source: 105 °C = 221 °F (1.8 t + 32)
    changed = copy.deepcopy(base)
    changed["source"]["power"] = "31 W"
    h = case_inputs_sha256(load_case(base))
    assert case_inputs_sha256(load_case(same)) == h
    assert case_inputs_sha256(load_case(changed)) != h


# --------------------------------------------------------------------------------------------
# Messages: one line each, path first


def test_wrong_unit_names_the_path():
    data = starter("plate-fin")
    data["sink"]["fins"]["thickness"] = "3 W"
    assert errors_of(data) == ["sink.fins.thickness: expected a length, got '3 W'"]


def test_missing_field():
    data = starter("plate-fin")
    del data["source"]["power"]
    assert errors_of(data) == ["source.power: missing (required)"]


def test_negative_size():
    data = starter("plate-fin")
    data["sink"]["base"]["width"] = "-80 mm"
    assert errors_of(data) == ["sink.base.width: must be greater than 0 (got '-80 mm')"]


def test_unknown_key_lists_the_valid_keys():
    data = starter("plate-fin")
    data["sink"]["fins"]["thicknes"] = "1 mm"
    assert errors_of(data) == [
        "sink.fins.thicknes: unknown key; did you mean 'thickness'? "
        "(allowed: count, thickness, height)"
    ]
    data = starter("plate-fin")
    data["colour"] = "red"
    (message,) = errors_of(data)
    assert message.startswith("colour: unknown key (allowed: case_id, kind, title_block,")


@pytest.mark.parametrize(
    ("edit", "expected"),
    [
        (lambda d: d["sink"]["fins"].update(count="many"),
         "sink.fins.count: must be a whole number of at least 2 (got 'many')"),
        (lambda d: d["sink"]["fins"].update(count=2.5),
         "sink.fins.count: must be a whole number of at least 2 (got 2.5)"),
        (lambda d: d["sink"].update(fins=14),
         "sink.fins: expected a mapping (got 14; keys: count, thickness, height)"),
        (lambda d: d["sink"].update(type="wavy"),
         "sink.type: not allowed (got 'wavy'; allowed: plate-fin, pin-fin)"),
        (lambda d: d.update(sweeps="airflow"), "sweeps: expected a list (got 'airflow')"),
        (lambda d: d["title_block"].update(project=["a"]),
         "title_block.project: expected non-empty text (got ['a'])"),
        (lambda d: d["sink"].update(emissivity=1.2),
         "sink.emissivity: must be at most 1 (got 1.2)"),
        (lambda d: d["air"].update(altitude="25 km"),
         "air.altitude: must be at most 20000 m (got '25 km')"),
        (lambda d: d.update(case_id="NB 200"),
         "case_id: must be 1-64 characters from a-z 0-9 . _ -, starting with a letter or digit "
         "(got 'NB 200')"),
    ],
)  # fmt: skip
def test_wrong_types_and_values(edit, expected):
    data = starter("plate-fin")
    edit(data)
    assert errors_of(data) == [expected]


def test_three_mistakes_give_three_messages():
    data = starter("plate-fin")
    data["sink"]["fins"]["thickness"] = "3 W"
    del data["source"]["power"]
    data["air"]["inlet_temperature"] = "hot"
    errors = errors_of(data)
    assert len(errors) == 3
    assert {e.split(":")[0] for e in errors} == {
        "sink.fins.thickness",
        "source.power",
        "air.inlet_temperature",
    }


def test_case_error_is_an_input_error_with_one_line_per_problem():
    data = starter("plate-fin")
    data["sink"]["fins"]["thickness"] = "3 W"
    del data["source"]["power"]
    with pytest.raises(InputError) as info:
        load_case(data)
    assert isinstance(info.value, CaseError)
    assert str(info.value).splitlines() == info.value.errors


def test_margin_in_celsius_is_refused_with_the_fix():
    data = starter("plate-fin")
    data["limit"]["required_margin"] = "10 degC"
    (message,) = errors_of(data)
    assert message.startswith("limit.required_margin: expected a temperature difference")
    assert "'10 K'" in message


# --------------------------------------------------------------------------------------------
# Cross-field rules


def test_interface_needs_exactly_one_form():
    data = starter("plate-fin")
    data["source"]["interface"] = {"resistance": "0.05 K/W", "area_resistance": "0.2 K*cm^2/W"}
    assert errors_of(data) == [
        "source.interface: give exactly one of: resistance | area_resistance | thickness and "
        "thermal_conductivity (got resistance, area_resistance)"
    ]
    data["source"]["interface"] = {"thickness": "0.1 mm"}
    assert errors_of(data) == [
        "source.interface: thickness needs thermal_conductivity as well (got only thickness)"
    ]


def test_interface_resistance_over_the_footprint():
    # Identity: R = R''/A and R = t/(k A) (docs/methods.md section i3)
    data = starter("plate-fin")
    case = load_case(data)
    area = case.source.footprint_length * case.source.footprint_width
    assert case.source.interface.resistance_over(area) == pytest.approx(0.2e-4 / area)
    data["source"]["interface"] = {"thickness": "0.1 mm", "thermal_conductivity": "2 W/m/K"}
    case = load_case(data)
    assert case.source.interface.resistance_over(area) == pytest.approx(1e-4 / (2 * area))


def test_flow_needs_exactly_one_form_even_with_other_errors():
    data = starter("plate-fin")
    data["air"]["flow"]["volume_flow"] = "12 CFM"
    data["sink"]["fins"]["height"] = "x"
    errors = errors_of(data)
    assert "air.flow: give exactly one of: approach_velocity | volume_flow | fan | natural " \
           "(got approach_velocity, volume_flow)" in errors  # fmt: skip
    assert len(errors) == 2
    data = starter("plate-fin")
    data["air"]["flow"] = {}
    assert errors_of(data) == [
        "air.flow: give exactly one of: approach_velocity | volume_flow | fan | natural (got none)"
    ]


def test_plate_fin_needs_fins_and_no_pins():
    data = starter("plate-fin")
    data["sink"]["pins"] = {"diameter": "3 mm"}
    del data["sink"]["fins"]
    assert errors_of(data) == [
        "sink.fins: missing (required for sink.type 'plate-fin')",
        "sink.pins: not used by sink.type 'plate-fin'; remove it",
    ]


def test_natural_flow_with_pin_fins_is_not_supported():
    data = starter("pin-fin")
    data["air"]["flow"] = {"natural": {"orientation": "vertical-fins"}}
    data["sweeps"] = ["fin_height"]
    (message,) = errors_of(data)
    assert message.startswith("air.flow.natural: natural convection is not supported for "
                              "sink.type 'pin-fin'")  # fmt: skip


def test_natural_flow_rules():
    data = starter("natural")
    data["air"]["bypass"] = {"side_gap": "2 mm"}
    data["sweeps"] = ["airflow"]
    assert errors_of(data) == [
        "air.bypass: applies to forced flow only (air.flow is natural); remove it",
        "sweeps[0]: 'airflow' needs forced flow (air.flow is natural)",
    ]
    data = starter("natural")
    data["air"]["flow"]["natural"]["orientation"] = "horizontal"
    assert errors_of(data) == [
        "air.flow.natural.orientation: not allowed (got 'horizontal'; allowed: vertical-fins, "
        "horizontal-base-fins-up)"
    ]


def test_fan_curve_rules():
    fan = {"volume_flow": ["0 CFM", "10 CFM", "10 CFM", "20 CFM"],
           "pressure": ["0.3 inH2O", "0.2 inH2O", "0 inH2O"]}  # fmt: skip
    data = starter("plate-fin")
    data["air"]["flow"] = {"fan": fan}
    assert errors_of(data) == [
        "air.flow.fan.pressure: must have as many points as volume_flow "
        "(got 3 pressures and 4 flows)",
        "air.flow.fan.volume_flow: must increase from point to point "
        "(point 2 is not larger than the one before)",
    ]
    data["air"]["flow"] = {"fan": {"volume_flow": ["0 CFM", "10 CFM"],
                                   "pressure": ["0.3 inH2O", "0 inH2O"]}}  # fmt: skip
    assert errors_of(data) == ["air.flow.fan: needs at least 3 points (got 2)"]
    data["air"]["flow"] = {"fan": {**fan, "pressure": ["0.3 inH2O", "x", "0", "0"]}}
    data["air"]["flow"]["fan"]["volume_flow"] = ["0 CFM", "5 CFM", "10 CFM", "20 CFM"]
    assert errors_of(data) == [
        "air.flow.fan.pressure[1]: cannot read 'x' as a pressure "
        "(write a number and a unit, e.g. '0.2 inH2O')"
    ]


def test_fan_table_is_checked_by_the_fan_curves_own_rules():
    # One source for the fan-table rules (finkit.physics.airflow.fan_table_problems): a table that
    # starts above zero flow, drops to zero pressure before its end, or ends above zero
    # pressure is refused by the case file's checks, on the case's own fields; before, such a
    # table passed validation and failed later inside the model.
    data = starter("plate-fin")
    data["air"]["flow"] = {"fan": {"volume_flow": ["1 CFM", "10 CFM", "20 CFM"],
                                   "pressure": ["0.3 inH2O", "0 inH2O", "0.1 inH2O"]}}  # fmt: skip
    assert errors_of(data) == [
        "air.flow.fan.volume_flow[0]: must be 0: the table starts at shut-off (got 1 CFM)",
        "air.flow.fan.pressure[1]: must be above 0 before free delivery, the last point (got 0 Pa)",
        "air.flow.fan.pressure[2]: must be 0: the table ends at free delivery (got 24.91 Pa)",
    ]


def test_every_fan_table_a_case_accepts_makes_a_fan_curve():
    import numpy as np

    from finkit.errors import InputError
    from finkit.physics.airflow import FanCurve

    rng = np.random.default_rng(3)
    accepted = 0
    for _ in range(300):
        n = int(rng.integers(2, 6))
        # tables that start at 0 or not, repeat a flow or not, reach 0 Pa early, late or never
        flows = np.cumsum(np.concatenate([rng.choice([0.0, 1.0], 1), rng.choice([0, 2, 5], n - 1)]))
        pressures = np.sort(rng.choice([0.0, 5.0, 20.0, 60.0], n))[::-1]
        data = starter("plate-fin")
        data["air"]["flow"] = {"fan": {"volume_flow": [f"{q} CFM" for q in flows],
                                       "pressure": [f"{p} Pa" for p in pressures]}}  # fmt: skip
        try:
            case = load_case(data)
        except CaseError:
            continue
        accepted += 1
        fan = case.air.flow.fan
        try:
            FanCurve(fan.volume_flow, fan.pressure)
        except InputError as exc:  # pragma: no cover - the failure this test guards against
            pytest.fail(f"the case accepted a table the fan curve refuses: {exc}")
    assert 0 < accepted < 300  # some tables of each kind


def test_limit_must_be_above_the_inlet_air():
    data = starter("plate-fin")
    data["limit"]["temperature"] = "40 degC"
    assert errors_of(data) == [
        "limit.temperature: must be above air.inlet_temperature "
        "(got 40.0 °C; air.inlet_temperature is 45.0 °C)"
    ]


def test_footprint_must_fit_on_the_base():
    data = starter("plate-fin")
    data["source"]["footprint_length"] = "100 mm"
    assert errors_of(data) == [
        "source.footprint_length: larger than sink.base.length (got 100 mm; "
        "sink.base.length is 60 mm)"
    ]


def test_fins_must_fit_and_pins_must_not_touch():
    data = starter("plate-fin")
    data["sink"]["fins"]["count"] = 70
    (message,) = errors_of(data)
    assert message.startswith("sink.fins: 70 fins of 1.2 mm do not fit on sink.base.width 80 mm")
    # One rule (finkit.physics.geometry.fins_fit): fins that leave a gap thinner than the
    # geometry's fit
    # tolerance are refused by the case check too, not first by the model.
    data["sink"]["fins"]["count"] = 40
    data["sink"]["fins"]["thickness"] = f"{80 / 40 * (1 - 1e-12)} mm"
    (message,) = errors_of(data)
    assert message.startswith("sink.fins: 40 fins of")
    data = starter("pin-fin")
    data["sink"]["pins"]["transverse_pitch"] = "3 mm"
    assert errors_of(data) == [
        "sink.pins.transverse_pitch: must be larger than diameter 3 mm (got 3 mm): "
        "the pins would touch"
    ]


def test_pin_fin_sweeps():
    data = starter("pin-fin")
    data["sweeps"] = ["fin_height", "fin_count", "fin_height"]
    errors = errors_of(data)
    assert "sweeps[1]: 'fin_count' applies to plate-fin sinks only" in errors
    data["sweeps"] = ["altitude", "altitude"]
    assert errors_of(data) == ["sweeps: each sweep may appear once (got altitude more than once)"]


@pytest.mark.parametrize(
    ("fin", "expected"),
    [
        ({"profile": "annular", "length": "10 mm", "thickness": "1 mm", "inner_radius": "10 mm",
          "outer_radius": "20 mm"},
         ["fin.length: not used by a annular fin (use inner_radius and outer_radius); remove it"]),
        ({"profile": "annular", "thickness": "1 mm", "inner_radius": "10 mm",
          "outer_radius": "8 mm"},
         ["fin.outer_radius: must be larger than inner_radius 10 mm (got 8 mm)"]),
        ({"profile": "pin", "length": "20 mm", "thickness": "1 mm"},
         ["fin.thickness: not used by a pin fin; remove it",
          "fin.diameter: missing (required for a pin fin)"]),
        ({"profile": "rectangular", "length": "20 mm", "thickness": "1 mm", "tip": "prescribed"},
         ["fin.tip_temperature: missing (required with tip 'prescribed')"]),
        ({"profile": "triangular", "length": "20 mm", "thickness": "1 mm", "tip": "adiabatic"},
         ["fin.tip: a triangular fin ends in a point; remove tip"]),
        ({"profile": "annular", "thickness": "1 mm", "inner_radius": "10 mm",
          "outer_radius": "20 mm", "tip": "infinite"},
         ["fin.tip: not available for a annular fin (got 'infinite'; allowed: convective, "
          "adiabatic)"]),
    ],
)  # fmt: skip
def test_single_fin_profile_rules(fin, expected):
    data = starter("single-fin")
    data["fin"] = {**fin, "material": "aluminium-6063-t5"}
    assert errors_of(data) == expected


def test_single_fin_limit_above_ambient():
    data = starter("single-fin")
    data["limit"] = {"temperature": "30 degC"}
    assert errors_of(data) == [
        "limit.temperature: must be above conditions.ambient_temperature "
        "(got 30.0 °C; conditions.ambient_temperature is 40.0 °C)"
    ]


# --------------------------------------------------------------------------------------------
# Reading files


def test_yaml_problems_are_one_line(tmp_path):
    assert errors_of("case_id: a\nkind: [heat-sink\n")[0].startswith(
        "case file: YAML syntax error at line"
    )
    assert errors_of("- 1\n- 2\n") == ["case file: expected a mapping of keys at the top "
                                       "(got list [1, 2])"]  # fmt: skip
    assert errors_of(str(tmp_path / "none.yaml")) == [
        f"case file: not found (got '{tmp_path / 'none.yaml'}')"
    ]


def test_a_key_given_twice_is_an_error():
    # PyYAML keeps the last of two equal keys silently; finkit refuses the file.
    text = (ROOT / "finkit" / "data" / "starters" / "plate-fin.yaml").read_text()
    text = text.replace("  power: 30 W", "  power: 30 W\n  power: 40 W")
    (message,) = errors_of(text)
    assert re.fullmatch(r"power: given twice in the same block \(lines \d+ and \d+\); keep one",
                        message)  # fmt: skip


def test_kind_is_checked_first():
    data = starter("plate-fin")
    data["kind"] = "heatsink"
    del data["title_block"]["project"]
    assert errors_of(data) == [
        "kind: not allowed (got 'heatsink'; allowed: heat-sink, single-fin)",
        "title_block.project: missing (required)",
    ]


# --------------------------------------------------------------------------------------------
# Materials (checked against finkit.physics.properties.materials once it exists)


def test_material_keys_and_finishes():
    pytest.importorskip("finkit.physics.properties.materials")
    data = starter("plate-fin")
    data["sink"]["material"] = "unobtainium"
    (message,) = errors_of(data)
    assert message.startswith("sink.material: unknown material (got 'unobtainium'; allowed: ")
    assert "aluminium-6063-t5" in message
    data = starter("plate-fin")
    data["sink"]["finish"] = "chrome"
    (message,) = errors_of(data)
    assert message.startswith("sink.finish: not available for material 'aluminium-6063-t5' "
                              "(got 'chrome'; allowed: ")  # fmt: skip
    data = starter("single-fin")
    data["study"]["materials"][1] = "copper"
    (message,) = errors_of(data)
    assert message.startswith("study.materials[1]: unknown material (got 'copper'")


def test_user_materials():
    materials = pytest.importorskip("finkit.physics.properties.materials")
    data = starter("plate-fin")
    data["sink"]["material"] = "nb-alloy"
    data["materials"] = {
        "nb-alloy": {"name": "NB alloy", "thermal_conductivity": "190 W/m/K",
                     "density": "2.7 g/cm^3", "emissivity": {"anodised-black": 0.8},
                     "source": "supplier datasheet"},
    }  # fmt: skip
    case = load_case(data)
    material = materials.get_material("nb-alloy", case.user_materials())
    assert material.thermal_conductivity == 190.0
    assert material.density == pytest.approx(2700.0)  # Source: 1 g/cm³ = 1000 kg/m³ (SI)
    data["materials"]["nb-alloy"].pop("thermal_conductivity")
    assert errors_of(data) == ["materials.nb-alloy: thermal_conductivity is required"]
    data["materials"]["nb-alloy"]["conductivity"] = "190 W/m/K"
    (message,) = errors_of(data)
    assert message.startswith("materials.nb-alloy.conductivity: unknown key")


@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_every_quantity_of_a_case_knows_its_unit_from_the_schema(path):
    # Common practice, no source: a reader of a validated case (the note's input table, the
    # explorer) takes each number's unit from the field's type, never from its name. Every
    # value the demo cases enter with a unit has a kind in the schema, and converting the
    # entered text with that kind gives the SI value the case holds. Tolerance bounds and the
    # trade study's ranges are the exceptions: their kind is that of the toleranced input or
    # of the varied dimension, not of the field.
    from finkit.case.fields import unit_kind_at
    from finkit.case.units import to_si

    case = load_case(path)
    data = case.model_dump(mode="json")

    def leaves(value, trail=()):
        if isinstance(value, dict):
            for key, item in value.items():
                yield from leaves(item, (*trail, key))
        elif isinstance(value, list) and any(isinstance(v, dict) for v in value):
            for i, item in enumerate(value):
                yield from leaves(item, (*trail, i))
        else:
            yield trail, value

    checked = 0
    for trail, entered in leaves(case.entered):
        texts = entered if isinstance(entered, list) else [entered]
        if not texts or not all(isinstance(t, str) and t[:1].isdigit() for t in texts):
            continue
        if trail[0] in ("tolerances", "trade_study") or trail[-1] in {
            "revision",
            "name",
            "description",
            "basis",
        }:
            continue
        kind = unit_kind_at(case, trail)
        assert kind is not None, trail
        held = data
        for key in trail:
            held = held[key]
        for text, si in zip(texts, held if isinstance(held, list) else [held], strict=True):
            assert to_si(text, kind, "") == pytest.approx(si, rel=1e-12, abs=1e-15), trail
        checked += 1
    assert checked >= 5
    assert unit_kind_at(case, ("case_id",)) is None  # not a quantity
