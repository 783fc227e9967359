"""Tests of finkit.physics.geometry: derived areas and counts, validation messages, broadcasting.

The expected values are hand calculations from the definitions stated in docs/methods.md sections e
and f (fin spacing with flush edge fins, open-area ratio, hydraulic diameters, tube-bank
maximum-velocity rule); each comment gives the arithmetic so a reviewer can redo it.
"""

import numpy as np
import pytest

from finkit.errors import GeometryError, InputError
from finkit.physics.geometry import PinFinSink, PlateFinSink

# A plate-fin sink with round numbers: W = 100, L = 80, t_b = 5, N = 11, t = 1, H = 30 (mm)
PLATE = dict(
    base_width=0.100,
    base_length=0.080,
    base_thickness=0.005,
    fin_count=11,
    fin_thickness=0.001,
    fin_height=0.030,
)


@pytest.mark.identity
def test_plate_spacing_and_pitch_from_definition():
    g = PlateFinSink(**PLATE)
    # Common practice, no source: b = (W - N t)/(N - 1) = (100 - 11)/10 mm = 8.9 mm
    # (docs/methods.md e)
    assert g.fin_spacing == pytest.approx(0.0089, rel=1e-12)
    assert g.fin_pitch == pytest.approx(0.0099, rel=1e-12)
    # edge fins flush: N t + (N - 1) b must equal W exactly
    assert 11 * 0.001 + 10 * g.fin_spacing == pytest.approx(0.100, rel=1e-12)


@pytest.mark.identity
def test_plate_areas_from_definition():
    g = PlateFinSink(**PLATE)
    faces = 2 * 0.030 * 0.080  # 2 H L
    tip = 0.001 * 0.080  # t L
    base = 10 * 0.0089 * 0.080  # (N - 1) b L
    assert g.fin_face_area_each == pytest.approx(faces)
    assert g.fin_tip_area_each == pytest.approx(tip)
    assert g.fin_area_each == pytest.approx(faces + tip)
    assert g.base_exposed_area == pytest.approx(base)
    assert g.total_area == pytest.approx(11 * (faces + tip) + base)
    assert g.total_area_shrouded == pytest.approx(11 * faces + base)
    # The wetted area of an open sink equals the footprint W L minus the fin roots N t L,
    # plus the fin faces and tips.
    assert g.total_area == pytest.approx(0.1 * 0.08 - 11 * tip + 11 * (faces + tip))


@pytest.mark.identity
def test_plate_flow_areas_and_hydraulic_diameters():
    g = PlateFinSink(**PLATE)
    b, h = 0.0089, 0.030
    assert g.frontal_area == pytest.approx(0.1 * 0.03)
    assert g.overall_frontal_area == pytest.approx(0.1 * 0.035)
    assert g.open_frontal_area == pytest.approx(10 * b * h)
    # sigma = (N - 1) b / W (docs/methods.md e1) = open / frontal area of the fin region
    assert g.open_area_ratio == pytest.approx(10 * b / 0.1)
    assert g.open_area_ratio == pytest.approx(g.open_frontal_area / g.frontal_area)
    # D_h = 4 A / P: shrouded rectangle b x H, open-top with three wetted walls
    assert g.hydraulic_diameter_shrouded == pytest.approx(4 * b * h / (2 * b + 2 * h))
    assert g.hydraulic_diameter_open == pytest.approx(4 * b * h / (b + 2 * h))
    assert g.hydraulic_diameter(False) == pytest.approx(g.hydraulic_diameter_open)


@pytest.mark.identity
def test_plate_volume_and_mass():
    g = PlateFinSink(**PLATE)
    volume = 0.1 * 0.08 * 0.005 + 11 * 0.001 * 0.03 * 0.08
    assert g.volume == pytest.approx(volume)
    assert g.mass(2700.0) == pytest.approx(2700.0 * volume)


@pytest.mark.shape
def test_plate_fields_broadcast():
    counts = np.array([5, 11, 21])
    heights = np.array([[0.02], [0.04]])
    g = PlateFinSink(0.1, 0.08, 0.005, counts, 0.001, heights)
    assert g.total_area.shape == (2, 3)
    for i, n in enumerate(counts):
        for j, h in enumerate(heights[:, 0]):
            scalar = PlateFinSink(0.1, 0.08, 0.005, int(n), 0.001, float(h))
            assert g.total_area[j, i] == pytest.approx(scalar.total_area)
            assert g.hydraulic_diameter_open[j, i] == pytest.approx(scalar.hydraulic_diameter_open)


@pytest.mark.parametrize(
    "change, fields",
    [
        (dict(fin_count=50, fin_thickness=0.002), "fin_count * fin_thickness >= base_width"),
        (dict(fin_count=1), "fin_count"),
        (dict(fin_count=7.5), "fin_count"),
        (dict(fin_height=0.0), "fin_height"),
        (dict(base_width=-0.1), "base_width"),
        (dict(fin_thickness=np.array([0.001, -0.001])), "fin_thickness"),
    ],
)
def test_plate_impossible_geometry_names_fields(change, fields):
    with pytest.raises(GeometryError) as err:
        PlateFinSink(**{**PLATE, **change})
    message = str(err.value)
    assert fields in message
    assert "\n" not in message


def test_plate_error_for_one_bad_array_element():
    with pytest.raises(GeometryError, match="index"):
        PlateFinSink(**{**PLATE, "fin_count": np.array([11, 60, 11]), "fin_thickness": 0.002})


# Pin-fin sink: W = 50 mm, L = 50 mm, D = 4 mm, S_T = 8 mm, S_L = 7 mm
PIN = dict(
    base_width=0.050,
    base_length=0.050,
    base_thickness=0.004,
    pin_diameter=0.004,
    pin_height=0.020,
    transverse_pitch=0.008,
    longitudinal_pitch=0.007,
)


@pytest.mark.identity
def test_pin_counts_inline():
    g = PinFinSink(**PIN, arrangement="inline")
    # floor((50 - 4)/8) + 1 = 6 pins per row; floor((50 - 4)/7) + 1 = 7 rows
    assert g.pins_per_row == 6
    assert g.row_count == 7
    assert g.pin_count == 42


@pytest.mark.identity
def test_pin_counts_staggered_shifted_rows():
    g = PinFinSink(**PIN, arrangement="staggered")
    # a shifted row needs (6 - 0.5) * 8 + 4 = 48 mm <= 50 mm: it still holds 6 pins
    assert g.pins_per_shifted_row == 6
    assert g.pin_count == 42
    narrow = PinFinSink(**{**PIN, "base_width": 0.046}, arrangement="staggered")
    # W = 46 mm: 6 pins per full row (5 * 8 + 4 = 44), shifted rows 5 (5.5 * 8 + 4 = 48 > 46)
    assert narrow.pins_per_row == 6
    assert narrow.pins_per_shifted_row == 5
    # 7 rows: 4 full + 3 shifted
    assert narrow.pin_count == 4 * 6 + 3 * 5


@pytest.mark.identity
def test_pin_areas_and_pitches():
    g = PinFinSink(**PIN, arrangement="staggered")
    d, h = 0.004, 0.020
    assert g.pin_side_area_each == pytest.approx(np.pi * d * h)
    assert g.pin_tip_area_each == pytest.approx(np.pi * d**2 / 4)
    assert g.base_exposed_area == pytest.approx(0.05 * 0.05 - 42 * np.pi * d**2 / 4)
    assert g.total_area == pytest.approx(42 * np.pi * d * h + 0.05 * 0.05)
    assert g.total_area_shrouded == pytest.approx(g.total_area - 42 * np.pi * d**2 / 4)
    assert g.frontal_area == pytest.approx(0.05 * 0.02)
    assert g.diagonal_pitch == pytest.approx(np.hypot(0.007, 0.004))
    # S_D = 8.06 mm >= (S_T + D)/2 = 6 mm: the transverse gap is the narrowest, 4/8
    assert g.min_free_flow_ratio == pytest.approx(0.5)
    assert g.volume == pytest.approx(0.05 * 0.05 * 0.004 + 42 * np.pi * d**2 / 4 * h)


@pytest.mark.identity
def test_pin_min_free_flow_ratio_diagonal_case():
    # S_T = 10, S_L = 3, D = 4: S_D = sqrt(9 + 25) = 5.83 mm < (10 + 4)/2 = 7 mm, so the two
    # diagonal gaps 2 (S_D - D) = 3.66 mm are narrower than S_T - D = 6 mm.
    g = PinFinSink(0.05, 0.05, 0.004, 0.004, 0.02, 0.010, 0.003, arrangement="staggered")
    assert g.min_free_flow_ratio == pytest.approx(2 * (np.sqrt(34e-6) - 0.004) / 0.010)


@pytest.mark.parametrize(
    "change, arrangement, text",
    [
        (dict(transverse_pitch=0.004), "inline", "transverse_pitch <= pin_diameter"),
        (dict(longitudinal_pitch=0.0035), "inline", "longitudinal_pitch <= pin_diameter"),
        (dict(longitudinal_pitch=0.001, transverse_pitch=0.0045), "staggered", "diagonal pitch"),
        (dict(pin_diameter=-0.004), "inline", "pin_diameter"),
        (dict(base_width=0.003, pin_diameter=0.004), "inline", "pin_diameter > base_width"),
        (
            dict(base_width=0.007, transverse_pitch=0.008),
            "staggered",
            "shifted rows empty",
        ),
    ],
)
def test_pin_impossible_geometry_names_fields(change, arrangement, text):
    with pytest.raises(GeometryError) as err:
        PinFinSink(**{**PIN, **change}, arrangement=arrangement)
    assert text in str(err.value)
    assert "\n" not in str(err.value)


def test_pin_unknown_arrangement():
    with pytest.raises(InputError, match="arrangement"):
        PinFinSink(**PIN, arrangement="hexagonal")


@pytest.mark.shape
def test_pin_fields_broadcast():
    diameters = np.array([0.002, 0.003, 0.004])
    g = PinFinSink(**{**PIN, "pin_diameter": diameters}, arrangement="staggered")
    assert g.pin_count.shape == (3,)
    for i, d in enumerate(diameters):
        scalar = PinFinSink(**{**PIN, "pin_diameter": float(d)}, arrangement="staggered")
        assert g.pin_count[i] == scalar.pin_count
        assert g.total_area[i] == pytest.approx(scalar.total_area)
