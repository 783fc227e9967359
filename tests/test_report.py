"""Tests of finkit.report (tables, figures and text of the notes) and of the note support in
finkit.model (fin profile, system and fan curves, sweeps for the plots).

These are mostly tests of presentation: every figure labels its axes with units and marks the
temperature limit, every table holds the rows a reviewer expects, case text is escaped. Where a
plotted curve is a physical quantity the checks are identities against the model's own
headline (the curve passes through the case's point, the operating point lies on both the fan
and the system curves, the profile is the closed form of Incropera et al. Table 3.4), so a
drawing that silently disagreed with the results table would fail.

The cases below are small invented fixtures (not the demo cases), written out here so the
tests do not depend on files that other work may change.
"""

from __future__ import annotations

import copy
import subprocess
import sys
from dataclasses import replace

import numpy as np
import pytest

from finkit import report
from finkit.constants import ZERO_CELSIUS

TITLE = {
    "project": "Fixture project",
    "part": "Fixture sink <script>alert(1)</script>",
    "revision": "T",
    "prepared_by": "Test & Co",
}

FAN_PLATE = {
    "case_id": "fixture-fan-plate",
    "kind": "heat-sink",
    "title_block": TITLE,
    "source": {
        "power": "30 W",
        "footprint_length": "20 mm",
        "footprint_width": "20 mm",
        "junction_to_case": "0.4 K/W",
        "interface": {"area_resistance": "0.3 K*cm^2/W"},
    },
    "sink": {
        "type": "plate-fin",
        "material": "aluminium-6063-t5",
        "finish": "anodised-black",
        "base": {"width": "60 mm", "length": "50 mm", "thickness": "4 mm"},
        "fins": {"count": 12, "thickness": "1 mm", "height": "25 mm"},
    },
    "air": {
        "inlet_temperature": "40 degC",
        "flow": {
            "fan": {
                "volume_flow": ["0 CFM", "4 CFM", "8 CFM", "12 CFM", "16 CFM"],
                "pressure": ["0.25 inH2O", "0.2 inH2O", "0.13 inH2O", "0.06 inH2O", "0 inH2O"],
            }
        },
        "bypass": {"side_gap": "2 mm", "top_gap": "2 mm"},
    },
    "limit": {"node": "junction", "temperature": "100 degC", "required_margin": "5 K"},
    "sweeps": ["inlet_temperature", "fin_count", "fin_thickness"],
    "scenarios": [
        {"name": "hot-air", "description": "inlet 5 K hotter", "inlet_temperature": "45 degC"}
    ],
}

NATURAL = {
    "case_id": "fixture-natural",
    "kind": "heat-sink",
    "title_block": TITLE,
    "source": {
        "power": "10 W",
        "footprint_length": "20 mm",
        "footprint_width": "20 mm",
        "junction_to_case": "1 K/W",
        "interface": {"resistance": "0.2 K/W"},
    },
    "sink": {
        "type": "plate-fin",
        "material": "aluminium-6063-t5",
        "finish": "anodised-black",
        "base": {"width": "90 mm", "length": "120 mm", "thickness": "5 mm"},
        "fins": {"count": 9, "thickness": "2 mm", "height": "20 mm"},
    },
    "air": {"inlet_temperature": "35 degC", "flow": {"natural": {"orientation": "vertical-fins"}}},
    "limit": {"node": "case", "temperature": "95 degC", "required_margin": "5 K"},
    "sweeps": ["heat_transfer_coefficient", "fin_height"],
}

PIN_FLOW = {
    "case_id": "fixture-pin-flow",
    "kind": "heat-sink",
    "title_block": TITLE,
    "source": {
        "power": "40 W",
        "footprint_length": "25 mm",
        "footprint_width": "25 mm",
        "junction_to_case": "0.3 K/W",
        "interface": {"thickness": "0.1 mm", "thermal_conductivity": "3 W/m/K"},
    },
    "sink": {
        "type": "pin-fin",
        "material": "aluminium-6063-t5",
        "finish": "anodised-black",
        "base": {"width": "60 mm", "length": "60 mm", "thickness": "5 mm"},
        "pins": {
            "diameter": "3 mm",
            "height": "20 mm",
            "transverse_pitch": "7 mm",
            "longitudinal_pitch": "7 mm",
            "arrangement": "inline",
        },
    },
    "air": {
        "inlet_temperature": "35 degC",
        "altitude": "1000 m",
        "flow": {"volume_flow": "12 CFM"},
    },
    "limit": {"node": "base", "temperature": "90 degC", "required_margin": "5 K"},
    "sweeps": ["fin_height", "altitude"],
}

FIN = {
    "case_id": "fixture-fin",
    "kind": "single-fin",
    "title_block": TITLE,
    "fin": {
        "profile": "pin",
        "length": "40 mm",
        "diameter": "4 mm",
        "material": "aluminium-6063-t5",
        "tip": "convective",
    },
    "conditions": {
        "base_temperature": "90 degC",
        "ambient_temperature": "25 degC",
        "heat_transfer_coefficient": "30 W/m^2/K",
    },
    "study": {
        "materials": ["copper-c11000", "steel-aisi-1010"],
        "heat_transfer_coefficients": ["10 W/m^2/K", "100 W/m^2/K"],
    },
}

SINK_CASES = {"fan-plate": FAN_PLATE, "natural": NATURAL, "pin-flow": PIN_FLOW}


@pytest.fixture(scope="module")
def results():
    # Seen at the governing condition: the tables and figures of a note describe that one.
    return {
        name: report.at_governing(report.run(copy.deepcopy(case)))
        for name, case in SINK_CASES.items()
    }


@pytest.fixture(scope="module")
def fin_result():
    return report.run(copy.deepcopy(FIN))


def _celsius(kelvin):
    return float(kelvin) - ZERO_CELSIUS


def _visible_axes(fig):
    """Main axes of a figure (secondary CFM axes are children, not in fig.axes)."""
    return [ax for ax in fig.axes if ax.get_visible() and ax.lines + ax.patches]


def _labelled_with_unit(text: str) -> bool:
    return "[" in text and text.rstrip().endswith("]") and len(text.split("[")[0].strip()) > 0


def _limit_lines(fig):
    return [
        line for ax in fig.axes for line in ax.lines if str(line.get_label()).startswith("Limit ")
    ]


def _sink_figures(result):
    figures = [
        report.plot_fin_profile(result),
        report.plot_allowable_vs_inlet(result),
        report.plot_vs_airflow(result),
        report.plot_resistance_breakdown(result),
    ]
    if result.results["volume_flow"] is not None:
        figures.append(report.plot_fan_system(result))
    figures += [report.plot_sweep(result, name) for name in report.sweep_names(result)]
    return figures


# ------------------------------------------------------------------------------------------
# Figures


@pytest.mark.parametrize("name", sorted(SINK_CASES))
def test_every_sink_figure_labels_both_axes_with_units(results, name):
    for fig in _sink_figures(results[name]):
        axes = _visible_axes(fig)
        assert axes, "figure without data"
        for ax in axes:
            categories = [t.get_text() for t in ax.get_yticklabels()]
            if not any(c[:1].isalpha() for c in categories):  # a bar chart names its bars
                assert _labelled_with_unit(ax.get_ylabel()), ax.get_ylabel()
            shares_x = ax.get_shared_x_axes().get_siblings(ax)
            xlabels = [a.get_xlabel() for a in shares_x if a.get_xlabel()]
            assert xlabels and all(_labelled_with_unit(t) for t in xlabels), xlabels


@pytest.mark.parametrize("name", sorted(SINK_CASES))
def test_temperature_figures_mark_the_limit_at_its_value(results, name):
    result = results[name]
    limit_c = _celsius(result.inputs.limit_temperature)
    t_in = _celsius(result.solution.inlet_air_temperature)
    # The fin profile shows metal temperatures: a junction or case limit is not drawn on it
    # (common practice, no source: a limit line there would be read as a fin limit).
    if result.inputs.limit_node != "base":
        assert not _limit_lines(report.plot_fin_profile(result))
    figures = {
        "allowable_vs_inlet": (report.plot_allowable_vs_inlet(result), 0.0),
        "budget": (report.plot_resistance_breakdown(result), t_in),  # axis: rise above inlet
    }
    figures.update(
        {f"sweep:{n}": (report.plot_sweep(result, n), 0.0) for n in report.sweep_names(result)}
    )
    for key, (fig, offset) in figures.items():
        lines = _limit_lines(fig)
        assert lines, f"{key}: no limit line"
        positions = {
            round(
                float(
                    np.ravel(
                        line.get_ydata()
                        if line.get_ydata()[0] == line.get_ydata()[-1]
                        else line.get_xdata()
                    )[0]
                ),
                6,
            )
            for line in lines
        }
        assert any(abs(p - (limit_c - offset)) < 1e-6 for p in positions), (key, positions)
        margin_lines = [
            line
            for ax in fig.axes
            for line in ax.lines
            if str(line.get_label()).startswith("Limit less required margin")
        ]
        assert margin_lines, f"{key}: no limit-less-margin line"
        usable = round(limit_c - result.inputs.required_margin - offset, 6)
        assert any(
            usable in {round(float(v), 6) for v in np.ravel([line.get_xdata(), line.get_ydata()])}
            for line in margin_lines
        ), key


def test_allowable_power_curve_passes_through_the_case(results):
    # Identity: the plotted allowable power at the case's inlet temperature is the headline.
    result = results["fan-plate"]
    fig = report.plot_allowable_vs_inlet(result)
    curve = next(
        line
        for line in fig.axes[0].lines
        if line.get_label() == "Allowable power, limit less required margin"
    )
    x, y = np.asarray(curve.get_xdata()), np.asarray(curve.get_ydata())
    at_case = np.interp(_celsius(result.inputs.air.inlet_temperature), x, y)
    assert at_case == pytest.approx(result.results["allowable_power"], rel=0.01)
    assert np.all(np.diff(y[y > 0]) < 0)  # hotter air, less power


def test_fan_plot_operating_point_lies_on_fan_and_system_curves(results):
    result = results["fan-plate"]
    ax = report.plot_fan_system(result).axes[0]
    lines = {
        str(line.get_label()).split(" ")[0] + " " + str(line.get_label()).split(" ")[1]: line
        for line in ax.lines
    }
    point = next(line for line in ax.lines if str(line.get_label()).startswith("Operating point"))
    q, dp = float(point.get_xdata()[0]), float(point.get_ydata()[0])
    system = lines["System: sink"]
    fan = lines["Fan at"]
    assert np.interp(q, system.get_xdata(), system.get_ydata()) == pytest.approx(dp, rel=0.02)
    assert np.interp(q, fan.get_xdata(), fan.get_ydata()) == pytest.approx(dp, rel=0.02)
    assert q == pytest.approx(result.results["volume_flow"], rel=1e-9)
    # The secondary axis shows CFM: 1 CFM = 4.719474e-4 m^3/s (exact; docs/methods.md section 0).
    assert any("CFM" in child.get_xlabel() for child in ax.child_axes)


def test_given_flow_plot_shows_system_curve_and_the_flow(results):
    result = results["pin-flow"]
    ax = report.plot_fan_system(result).axes[0]
    labels = [str(line.get_label()) for line in ax.lines]
    assert any(label.startswith("System") for label in labels)
    assert any(label.startswith("Given flow") for label in labels)
    assert not any(label.startswith("Fan") for label in labels)


def test_natural_case_has_no_fan_plot_and_sweeps_h(results):
    result = results["natural"]
    assert "no fan" in str(report.figure_fan_system(result))
    fig = report.plot_vs_airflow(result)
    assert "Heat transfer coefficient" in fig.axes[-1].get_xlabel()
    # heat_transfer_coefficient is drawn by the efficiency figure, so not again as a sweep
    assert report.sweep_names(result) == ["fin_height"]


def test_budget_bars_add_up_to_the_junction_rise(results):
    # Identity: the stacked rises at the stated power sum to T_j - T_in.
    result = results["fan-plate"]
    ax = report.plot_resistance_breakdown(result).axes[0]
    first_bar = [p for p in ax.patches if abs(p.get_y() + p.get_height() / 2) < 1e-9]
    total = sum(p.get_width() for p in first_bar)
    rise = float(result.solution.junction_temperature - result.solution.inlet_air_temperature)
    assert total == pytest.approx(rise, rel=1e-9)


def test_figures_are_not_left_in_pyplot(results):
    import matplotlib.pyplot as plt

    before = set(plt.get_fignums())
    markup = str(report.figure_fin_profile(results["fan-plate"]))
    assert markup.startswith('<figure class="fk-figure"><img src="data:image/png;base64,')
    assert "Figure 1." in markup
    assert set(plt.get_fignums()) == before


# ------------------------------------------------------------------------------------------
# Tables and text


def test_node_table_runs_from_junction_to_inlet_air(results):
    result = results["fan-plate"]
    html = str(report.node_table(result))
    order = [
        "Junction",
        "Case",
        "Base under the source",
        "Base, mean",
        "Fin tip",
        "Outlet air",
        "Inlet air",
    ]
    positions = [html.index(name) for name in order]
    assert positions == sorted(positions)
    junction = f"{_celsius(result.solution.junction_temperature):.1f}\u00a0°C"
    assert junction in html
    assert "Outlet air" not in str(report.node_table(results["natural"]))


def test_resistance_table_lists_the_chain_and_its_total(results):
    result = results["pin-flow"]
    html = str(report.resistance_table(result))
    for name in ("R_jc", "R_int", "R_sp", "R_base", "R_sink", "Total"):
        assert name in html
    total = float(result.solution.total_resistance)
    assert f"{total:.3g}\u00a0K/W" in html


def test_headline_states_pass_and_fail(results):
    passing = results["fan-plate"]
    html = str(report.headline(passing))
    assert passing.status == "pass" and "fk-badge-pass" in html and ">PASS<" in html
    failing_case = copy.deepcopy(FAN_PLATE)
    failing_case["source"]["power"] = "80 W"
    failing = report.run(failing_case)
    assert failing.status == "fail"
    html = str(report.headline(failing))
    assert ">FAIL<" in html and "short of the required margin" in html


def test_inputs_table_shows_entered_and_si_values(results):
    html = str(report.inputs_table(results["fan-plate"]))
    assert "20 mm" in html and "0.02\u00a0m" in html
    assert "40 degC" in html and "(40.0\u00a0°C)" in html
    # Exact: 0.3 K cm^2/W = 3e-5 K m^2/W.
    assert "3e-05\u00a0K·m²/W" in html
    assert "(default)" in html  # e.g. air.altitude, not written in the fixture
    assert "title_block" not in html


def test_case_text_is_escaped(results):
    result = results["fan-plate"]
    for fragment in (report.title_block(result), report.inputs_table(result)):
        markup = str(fragment)
        assert "<script" not in markup
    assert "&lt;script&gt;" in str(report.title_block(result))
    assert "Test &amp; Co" in str(report.title_block(result))


def test_title_block_marks_a_run_by_hand_as_draft(results):
    assert "DRAFT" in str(report.title_block(results["fan-plate"], ""))
    assert "DRAFT" not in str(report.title_block(results["fan-plate"], "2025-03-14T09:30:00+01:00"))


@pytest.mark.parametrize(
    "name, cited",
    [
        (
            "fan-plate",
            [
                "Teertstra",
                "Shah, R.K., London",
                "Kays, W.M., London",
                "Yovanovich, M.M., Muzychka",
                "Standard Atmosphere",
                "CoolProp",
                "Lee, S., Optimum design",
            ],
        ),
        (
            "natural",
            ["Bar-Cohen", "Churchill, S.W., Chu", "Incropera", "Yovanovich, M.M., Muzychka"],
        ),
        ("pin-flow", ["Zukauskas", "Gaddis, E.S., Gnielinski", "Yovanovich, M.M., Muzychka"]),
    ],
)
def test_method_cites_each_correlation_it_uses(results, name, cited):
    html = str(report.method_section(results[name]))
    for source in cited:
        assert source in html, source
    assert "$" not in html  # equations are SVG images, never raw TeX
    assert html.count('class="fk-equation"') >= 3
    if name != "pin-flow":
        assert "Zukauskas" not in html


def test_warnings_are_listed_and_escaped(results):
    result = replace(results["fan-plate"], warnings=("Re_b* = 120 > 100 <outside>",))
    html = str(report.warnings_section(result))
    assert "1 WARNING" in html and "&lt;outside&gt;" in html
    quiet = replace(results["fan-plate"], warnings=())
    assert "No warning" in str(report.warnings_section(quiet))


def test_cautions_report_the_hottest_surface(results):
    result = results["fan-plate"]
    html = str(report.cautions(result))
    hottest = f"{_celsius(result.solution.source_base_centre_temperature):.1f}\u00a0°C"
    assert hottest in html
    for topic in (
        "Fan failure",
        "Dust and filter loading",
        "Flow bypass",
        "Confirm by test",
        "local codes",
    ):
        assert topic in html


# ------------------------------------------------------------------------------------------
# Single fin


def test_fin_tip_table_and_profiles(fin_result):
    html = str(report.fin_tip_table(fin_result))
    for tip in ("Convective tip", "Adiabatic tip (case B)", "corrected length", "Infinitely long"):
        assert tip in html
    fig = report.plot_fin_tip_profiles(fin_result)
    ax = fig.axes[0]
    assert _labelled_with_unit(ax.get_xlabel()) and _labelled_with_unit(ax.get_ylabel())
    convective = next(line for line in ax.lines if line.get_label().startswith("Convective"))
    # Identity: the profile starts at the prescribed base temperature.
    assert convective.get_ydata()[0] == pytest.approx(90.0, abs=1e-9)


def test_fin_efficiency_figure_has_one_panel_per_material(fin_result):
    fig = report.plot_fin_efficiency_vs_length(fin_result)
    panels = [ax for ax in fig.axes if ax.get_visible()]
    assert [ax.get_title() for ax in panels] == [
        "aluminium-6063-t5",
        "copper-c11000",
        "steel-aisi-1010",
    ]
    for ax in panels:
        assert _labelled_with_unit(ax.get_xlabel())
        assert len([line for line in ax.lines if "W/(m²·K)" in line.get_label()]) == 3
    assert _labelled_with_unit(panels[0].get_ylabel())


def test_fin_method_and_headline(fin_result):
    assert "Table 3.4" in str(report.fin_method_section(fin_result))
    headline = str(report.fin_headline(fin_result))
    assert "Fin efficiency" in headline and "no temperature limit" in headline


# ------------------------------------------------------------------------------------------
# Note support in finkit.model


@pytest.mark.identity
def test_fin_profile_is_the_table_3_4_adiabatic_form(results):
    from finkit.model import fin_temperature_profile

    result = results["pin-flow"]  # fully shrouded: adiabatic tip on the real length
    p = fin_temperature_profile(result.inputs, result.solution)
    h, k = p["heat_transfer_coefficient"], p["thermal_conductivity"]
    d = result.inputs.geometry.pin_diameter
    m = np.sqrt(4.0 * h / (k * d))
    length = p["fin_length"]
    theta_b = p["base_temperature"] - p["reference_temperature"]
    # Source: Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., Table 3.4,
    # case B: theta/theta_b = cosh m(L - x) / cosh mL.
    expected = p["reference_temperature"] + theta_b * np.cosh(m * (length - p["x"])) / np.cosh(
        m * length
    )
    np.testing.assert_allclose(p["temperature"], expected, rtol=1e-10)
    # and its tip is the model's own fin-tip temperature
    assert p["temperature"][-1] == pytest.approx(p["tip_temperature"], rel=1e-9)


@pytest.mark.identity
def test_system_and_fan_curves_cross_at_the_solved_operating_point(results):
    from finkit.model import fan_pressure, system_curve

    result = results["fan-plate"]
    q = np.array([result.results["volume_flow"]])
    dp = result.results["pressure_drop"]
    assert system_curve(result.inputs, q)["pressure_drop"][0] == pytest.approx(dp, rel=1e-6)
    assert fan_pressure(result.inputs, q)["at_inlet"][0] == pytest.approx(dp, rel=1e-3)


@pytest.mark.identity
def test_volume_flow_for_power_carries_the_stated_power(results):
    from finkit.model import note_sweep, volume_flow_for_power

    result = results["pin-flow"]
    q = volume_flow_for_power(result.inputs)
    assert q is not None and q < result.results["volume_flow"]  # the case passes with margin
    power = note_sweep(result.inputs, "airflow", np.array([q]))["allowable_power"][0]
    assert power == pytest.approx(float(result.inputs.source.power), rel=0.01)


@pytest.mark.identity
def test_h_sweep_at_the_solved_h_reproduces_the_case(results):
    from finkit.model import note_sweep

    result = results["fan-plate"]
    h = float(result.solution.heat_transfer_coefficient)
    s = note_sweep(result.inputs, "heat_transfer_coefficient", np.array([h]))
    assert s["junction_temperature"][0] == pytest.approx(
        float(result.solution.junction_temperature), abs=0.05
    )


def test_inlet_sweep_moves_the_surroundings_with_the_air(results):
    # A natural case whose walls are at the inlet temperature stays so along the sweep: the
    # allowable power falls to zero at the limit less the margin without a solver failure.
    from finkit.model import note_sweep

    result = results["natural"]
    usable = result.inputs.limit_temperature - result.inputs.required_margin
    t = np.array([usable - 40.0, usable - 10.0, usable + 1.0])
    power = note_sweep(result.inputs, "inlet_temperature", t)["allowable_power"]
    assert power[0] > power[1] > 0.0 and power[2] == 0.0


def test_report_import_does_not_load_matplotlib():
    code = "import sys, finkit.report; print('matplotlib' in sys.modules)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "False"


def test_review_section_shows_scenarios_with_the_governing_one(results):
    result = results["fan-plate"]
    html = str(report.review_section(result))
    assert "nominal" in html and "hot-air (governing)" in html  # hotter air, less margin
    hot = result.review.scenarios.row("hot-air")
    assert f"{hot.margin:.1f}\u00a0K" in html
    assert "Spread between accepted correlations" in html
    headline = str(report.headline(result))
    assert "governing one is &#x27;hot-air&#x27;" in headline


@pytest.mark.identity
def test_coarser_equation_glyphs_stay_within_half_a_step_of_matplotlibs_outline():
    # The note's equations are written with glyph outlines on a coarser grid (smaller HTML);
    # each coordinate must stay within half a grid step of matplotlib's own outline, and the
    # command structure (what is drawn) must be the same (SVG 1.1: a repeated command letter
    # may be left out).
    import io
    import re
    import xml.etree.ElementTree as ET
    from urllib.parse import unquote

    import matplotlib
    from matplotlib.font_manager import FontProperties
    from matplotlib.mathtext import math_to_image

    from finkit.report import present

    latex = r"\eta_f = \dfrac{\tanh(m L_c)}{m L_c}"
    uri = present._equation_uri(latex, 13.0)
    coarse = ET.fromstring(unquote(uri.split(",", 1)[1]).encode("utf-8"))
    buffer = io.BytesIO()
    with matplotlib.rc_context(
        {"mathtext.fontset": "stix", "svg.fonttype": "path", "svg.hashsalt": "finkit"}
    ):
        math_to_image(f"${latex}$", buffer, prop=FontProperties(size=13.0), format="svg")
    fine = ET.fromstring(buffer.getvalue())
    ns = "{http://www.w3.org/2000/svg}"

    def glyphs(root):
        return {
            p.get("id"): p
            for p in root.iter(f"{ns}path")
            if p.get("id") and "scale" in (p.get("transform") or "")
        }

    fine_glyphs, coarse_glyphs = glyphs(fine), glyphs(coarse)
    assert fine_glyphs.keys() == coarse_glyphs.keys() and len(fine_glyphs) >= 5
    step = present._GLYPH_STEP
    for name, path in fine_glyphs.items():
        assert coarse_glyphs[name].get("transform") == f"scale({step / 64:g})"
        numbers = [float(x) for x in re.findall(r"-?\d+(?:\.\d+)?", path.get("d"))]
        coarse_numbers = [
            float(x) * step for x in re.findall(r"-?\d+(?:\.\d+)?", coarse_glyphs[name].get("d"))
        ]
        assert len(numbers) == len(coarse_numbers)
        assert np.max(np.abs(np.subtract(numbers, coarse_numbers))) <= step / 2
        fine_commands = [c for c in re.findall(r"[A-Za-z]", path.get("d"))]
        coarse_commands = re.findall(r"[A-Za-z]", coarse_glyphs[name].get("d"))
        collapsed = [
            c
            for i, c in enumerate(fine_commands)
            if not (i > 0 and c == fine_commands[i - 1] and c in "LQ")
        ]
        assert coarse_commands == collapsed


def test_a_glyph_without_an_outline_is_left_as_it_is():
    # A space has no outline: matplotlib writes only its id and transform (the id's "d='"
    # must not be taken for an outline).
    from finkit.report import present

    blank = "<path id='STIXGeneral-Regular-3' transform='scale(0.015625)'/>"
    assert present._coarser_glyphs(blank) == blank
    uri = present._equation_uri(r"a \quad b", 13.0)
    assert "scale(0.5)" in uri
