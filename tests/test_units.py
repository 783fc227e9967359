"""Tests of finkit.case.units: case-file strings -> SI floats, messages, display.

Every expected value is a conversion factor fixed by definition, cited beside the check:
- 1 in = 25.4 mm and 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959);
  1 lb = 0.45359237 kg exactly (same agreement).
- T/K = t/°C + 273.15 and t/°F = 1.8 t/°C + 32 (SI Brochure, 9th ed., 2019, section 2.3.1 and
  the definition of the Fahrenheit scale); a kelvin and a Celsius degree are the same size.
- Conventional water column: rho = 1000 kg/m³, g_n = 9.80665 m/s² (exact, CGPM 1901):
  1 inH2O = 249.08891 Pa, 1 mmH2O = 9.80665 Pa (finkit methods reference, section 0).
"""

import math

import numpy as np
import pint
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from finkit.case.units import KINDS, format_quantity, from_si, to_si, to_si_array, ureg
from finkit.errors import InputError

INCH = 0.0254  # Source: international yard and pound agreement (1959), exact
FOOT = 0.3048  # Source: international yard and pound agreement (1959), exact
POUND = 0.45359237  # Source: international yard and pound agreement (1959), exact
CFM = FOOT**3 / 60.0  # exact by the definitions above
IN_H2O = INCH * 1000.0 * 9.80665  # conventional, exact; docs/methods.md 0 prints 249.0889 Pa


@pytest.mark.identity
@pytest.mark.parametrize(
    ("text", "kind", "expected"),
    [
        # Source: SI prefixes (SI Brochure, 9th ed., 2019, Table 7)
        ("1.5 mm", "length", 1.5e-3),
        ("1.5mm", "length", 1.5e-3),
        ("6.25 cm^2", "area", 6.25e-4),
        ("2 m/s", "velocity", 2.0),
        ("45 W", "power", 45.0),
        ("0.05 K/W", "thermal_resistance", 0.05),
        ("0.2 K*cm^2/W", "area_resistance", 0.2e-4),
        ("200 W/m/K", "thermal_conductivity", 200.0),
        ("25 W/m^2/K", "heat_transfer_coefficient", 25.0),
        ("1.2 kg/m^3", "density", 1.2),
        ("50 Pa", "pressure", 50.0),
        # Source: 1 in = 25.4 mm exactly (international yard and pound agreement, 1959)
        ("0.06 in", "length", 0.06 * INCH),
        # Source: 1 ft = 0.3048 m exactly (same agreement)
        ("200 ft/min", "velocity", 200 * FOOT / 60),
        ("200 LFM", "velocity", 200 * FOOT / 60),
        ("400 fpm", "velocity", 400 * FOOT / 60),  # the trade's spelling of ft/min
        # Source: CFM = ft³/min, exact by the foot's definition
        ("12 ft^3/min", "volume_flow", 12 * CFM),
        ("12 CFM", "volume_flow", 12 * CFM),
        ("12 cfm", "volume_flow", 12 * CFM),  # not centi-fermi
        # Source: conventional inch/millimetre of water (docs/methods.md section 0)
        ("0.2 inH2O", "pressure", 0.2 * IN_H2O),
        ("3 mmH2O", "pressure", 3 * 9.80665),
        # Source: 1 lb = 0.45359237 kg, 1 ft = 0.3048 m (same agreement)
        ("0.075 lb/ft^3", "density", 0.075 * POUND / FOOT**3),
        # Source: SI Brochure 2019, T/K = t/°C + 273.15
        ("40 degC", "temperature", 313.15),
        ("40 °C", "temperature", 313.15),
        ("-20 degC", "temperature", 253.15),
        ("313.15 K", "temperature", 313.15),
        # Source: t/°F = 1.8 t/°C + 32 (definition of the Fahrenheit scale)
        ("104 degF", "temperature", 313.15),
        # A kelvin and a Celsius degree are the same size; a Fahrenheit degree is 5/9 K.
        ("10 K", "temperature_difference", 10.0),
        ("10 delta_degC", "temperature_difference", 10.0),
        ("18 delta_degF", "temperature_difference", 10.0),
        ("200 W/m/degC", "thermal_conductivity", 200.0),  # a degree inside a compound unit
        ("0.2 degC*cm^2/W", "area_resistance", 0.2e-4),
        ("85 %", "dimensionless", 0.85),
    ],
)
def test_unit_strings_convert_to_si(text, kind, expected):
    assert to_si(text, kind, "field") == pytest.approx(expected, rel=1e-12)


@pytest.mark.identity
@pytest.mark.parametrize(
    ("value", "kind"),
    [(0.0015, "length"), (313.15, "temperature"), (10, "temperature_difference"), (0.85,
     "dimensionless"), (0.005, "volume_flow"), ("0.0015", "length"), ("1e-3", "length")],
)  # fmt: skip
def test_bare_numbers_mean_si(value, kind):
    # Common practice, no source: a bare number in a case file is SI (documented in
    # finkit.case.units)
    assert to_si(value, kind, "field") == pytest.approx(float(value), rel=1e-15)


@pytest.mark.identity
def test_water_column_units_are_conventional():
    # Source: docs/methods.md section 0, 1 inH2O (conventional, 1000 kg/m³, g_n) = 249.0889 Pa
    # (printed to 7 significant figures -> rel 5e-7); 1 mmH2O = 9.80665 Pa.
    assert to_si("1 inH2O", "pressure", "p") == pytest.approx(249.0889, rel=5e-7)
    assert to_si("1 mmH2O", "pressure", "p") == pytest.approx(9.80665, rel=1e-12)
    # Source: docs/methods.md section 0, 1 CFM = 4.719474e-4 m³/s, 1 ft/min = 0.00508 m/s
    assert to_si("1 CFM", "volume_flow", "q") == pytest.approx(4.719474e-4, rel=5e-7)
    assert to_si("1 ft/min", "velocity", "v") == pytest.approx(0.00508, rel=1e-12)


@pytest.mark.parametrize(
    ("value", "kind", "field", "message"),
    [
        ("3 W", "length", "fin thickness", "fin thickness: expected a length, got '3 W'"),
        ("12 CFM", "pressure", "fan pressure", "fan pressure: expected a pressure, got '12 CFM'"),
        ("45 W", "temperature", "inlet", "inlet: expected an absolute temperature, got '45 W'"),
        ("2 m/s", "volume_flow", "flow", "flow: expected a volume flow, got '2 m/s'"),
        (True, "length", "fin thickness", "fin thickness: expected a length, got True"),
        ([1, 2], "length", "fin thickness", "fin thickness: expected a length, got [1, 2]"),
    ],
)
def test_wrong_dimension_is_one_line_naming_the_field(value, kind, field, message):
    with pytest.raises(InputError) as info:
        to_si(value, kind, field)
    assert str(info.value) == message


@pytest.mark.parametrize(
    ("value", "kind", "fragments"),
    [
        ("abc", "length", ["cannot read 'abc' as a length", "1.5 mm"]),
        ("1.5 furlongz", "length", ["cannot read the unit in '1.5 furlongz'"]),
        ("5 ℃x", "temperature", ["cannot read the unit"]),
        (float("nan"), "length", ["expected a finite number"]),
        (None, "length", ["got an empty value"]),
        ("200 W/mK", "thermal_conductivity", ["'mK' is millikelvin"]),
        ("-300 degC", "temperature", ["below absolute zero"]),
    ],
)
def test_unreadable_values_give_one_line(value, kind, fragments):
    with pytest.raises(InputError) as info:
        to_si(value, kind, "x.y")
    text = str(info.value)
    assert text.startswith("x.y: ")
    assert "\n" not in text
    for fragment in fragments:
        assert fragment in text


def test_celsius_is_not_a_temperature_difference():
    # Decision (documented in finkit.case.units): "10 degC" is a temperature (283.15 K), so a
    # margin written that way is refused with the two unambiguous ways to write it.
    with pytest.raises(InputError) as info:
        to_si("10 degC", "temperature_difference", "limit.required_margin")
    text = str(info.value)
    assert text.startswith(
        "limit.required_margin: expected a temperature difference, got '10 degC'"
    )
    assert "'10 K'" in text and "'10 delta_degC'" in text
    with pytest.raises(InputError, match="'18 delta_degF'"):
        to_si("18 degF", "temperature_difference", "margin")


def test_a_difference_is_not_an_absolute_temperature():
    with pytest.raises(
        InputError, match=r"^inlet: expected an absolute temperature, got '40 delta_degC'"
    ):
        to_si("40 delta_degC", "temperature", "inlet")


def test_bare_temperature_below_150_needs_a_unit():
    with pytest.raises(InputError) as info:
        to_si(45, "temperature", "air.inlet_temperature")
    text = str(info.value)
    assert text.startswith("air.inlet_temperature: a bare number is read as kelvin")
    assert "'45 degC'" in text
    assert to_si(150, "temperature", "t") == 150.0  # the threshold itself is accepted


def test_empty_field_gives_the_bare_reason():
    with pytest.raises(InputError) as info:
        to_si("3 W", "length", "")
    assert str(info.value) == "expected a length, got '3 W'"


def test_unknown_kind_is_a_programming_error():
    with pytest.raises(ValueError, match="unknown kind"):
        to_si("1 m", "speed", "v")


def test_to_si_array_converts_each_element_and_names_the_bad_one():
    # Source: CFM and inH2O exact by definition (see module docstring)
    flows = to_si_array(["0 CFM", "10 CFM", 0.01], "volume_flow", "fan.volume_flow")
    assert isinstance(flows, np.ndarray)
    np.testing.assert_allclose(flows, [0.0, 10 * CFM, 0.01], rtol=1e-12)
    with pytest.raises(InputError) as info:
        to_si_array(["0 inH2O", "0.1 inH2O", "3 W"], "pressure", "fan.pressure")
    assert str(info.value) == "fan.pressure[2]: expected a pressure, got '3 W'"
    with pytest.raises(InputError, match=r"^fan.pressure: expected a list"):
        to_si_array("0.1 inH2O", "pressure", "fan.pressure")


def test_format_and_from_si():
    # Source: T/K = t/°C + 273.15 (SI Brochure 2019)
    assert format_quantity(318.15, "temperature", "degC") == "45.0 °C"
    assert format_quantity(10.0, "temperature_difference", "K") == "10.0 K"
    assert format_quantity(10.0, "temperature_difference", "degC") == "10.0 K"
    assert format_quantity(0.0015, "length", "mm") == "1.5 mm"
    assert format_quantity(11000.0, "length", "m") == "11000 m"
    assert format_quantity(0.85, "dimensionless", "") == "0.85"
    # Source: CFM exact (1 ft = 0.3048 m)
    assert format_quantity(10 * CFM, "volume_flow", "CFM") == "10 CFM"
    assert from_si(10 * CFM, "volume_flow", "CFM") == pytest.approx(10.0, rel=1e-12)
    np.testing.assert_allclose(from_si([273.15, 373.15], "temperature", "degC"), [0.0, 100.0])
    with pytest.raises(InputError, match="not a unit of a length"):
        from_si(1.0, "length", "W")


def test_registry_is_finkits_own():
    # Common practice, no source (pint docs, "pint in your projects"): one registry per
    # package, pint's application registry left alone.
    assert ureg is not pint.get_application_registry()
    assert "CFM" not in pint.UnitRegistry()
    assert not ureg.autoconvert_offset_to_baseunit
    assert set(KINDS) >= {"length", "temperature", "temperature_difference", "volume_flow"}


@pytest.mark.identity
@settings(max_examples=60, deadline=None)
@given(st.floats(min_value=1e-6, max_value=1e6, allow_nan=False, allow_infinity=False))
def test_round_trip_through_display_units(x):
    # Identity: converting to a display unit and back returns the SI value.
    for kind, unit in [("length", "mm"), ("volume_flow", "CFM"), ("pressure", "inH2O"),
                       ("temperature", "degF")]:  # fmt: skip
        shown = from_si(x, kind, unit)
        # abs_tol: an offset scale (degF) loses ~1e-11 K of a value near absolute zero
        assert math.isclose(to_si(f"{shown!r} {unit}", kind, "f"), x, rel_tol=1e-12, abs_tol=1e-9)
