"""Tests of the uncertainty and model-form sections of the heat-sink note (finkit.report, section
"uncertainty and model-form sections") and of their support in finkit.model
(``model_form_check``), with the two presentation fixes that came with them
(``finkit.report.present.bullets``; ``finkit.model.review.TouchResult.statement`` in °C).

Mostly presentation: each section appears only when it applies; every figure labels its axes
with units; the histogram marks the limit, the limit less the margin and the nominal; the
tornado is sorted and centred on the nominal. Where a shown number is physics, it is checked
against an independent computation: the model-form table against
``finkit.physics.conduction.compare_with_chain`` called directly, the grid convergence index against
``finkit.physics.conduction.refine_study``, the plotted histogram against ``numpy.histogram`` of the
samples, the exceedance bound against the closed form of Clopper & Pearson for no exceedance.

The cases are small invented fixtures written out here (not the demo cases).
"""

from __future__ import annotations

import copy
import html
import math
import re
from pathlib import Path

import numpy as np
import pytest

from finkit import report
from finkit.constants import ZERO_CELSIUS
from finkit.report import present, studies

ROOT_DEMO = Path(__file__).resolve().parent.parent / "demo_cases"

TITLE = {"project": "Fixture project", "part": "Fixture sink", "revision": "T", "prepared_by": "T"}

PLATE = {
    "case_id": "fixture-sections-plate",
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
}

TOLERANCES = {
    "heat_transfer": {
        "distribution": "normal",
        "relative": "10 %",
        "source": "correlation <b>scatter</b>",
    },
    "power": {"distribution": "uniform", "absolute": "2 W", "source": "estimate"},
    "inlet_temperature": {"distribution": "triangular", "low": "37 degC", "high": "44 degC"},
    "interface_resistance": {
        "distribution": "normal",
        "low": "0.05 K/W",
        "high": "0.1 K/W",
        "sigmas": 2,
        "source": "bond line",
    },
}

PIN = {
    "case_id": "fixture-sections-pin",
    "kind": "heat-sink",
    "title_block": TITLE,
    "source": {
        "power": "40 W",
        "footprint_length": "25 mm",
        "footprint_width": "25 mm",
        "junction_to_case": "0.3 K/W",
        "interface": {"resistance": "0.05 K/W"},
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
    "air": {"inlet_temperature": "35 degC", "flow": {"volume_flow": "12 CFM"}},
    "limit": {"node": "base", "temperature": "90 degC", "required_margin": "5 K"},
}


def _with_tolerances(case: dict, samples: int = 4000) -> dict:
    out = copy.deepcopy(case)
    out["tolerances"] = copy.deepcopy(TOLERANCES)
    out["monte_carlo"] = {"samples": samples, "seed": 3}
    return out


@pytest.fixture(scope="module")
def toleranced():
    return report.run(_with_tolerances(PLATE))


@pytest.fixture(scope="module")
def plain():
    return report.run(copy.deepcopy(PLATE))


@pytest.fixture(scope="module")
def pin():
    return report.run(copy.deepcopy(PIN))


@pytest.fixture(scope="module")
def check(plain):
    from finkit.model import model_form_check

    return model_form_check(plain)


def _c(kelvin) -> float:
    return float(kelvin) - ZERO_CELSIUS


def _labelled_with_unit(text: str) -> bool:
    return "[" in text and text.rstrip().endswith("]") and len(text.split("[")[0].strip()) > 0


def _text(fragment) -> str:
    """Visible text of a fragment (tags removed, no-break spaces as spaces)."""
    return html.unescape(re.sub(r"<[^>]+>", " ", str(fragment))).replace("\u00a0", " ")


def _vertical_at(fig, prefix: str) -> list[float]:
    return [
        float(np.ravel(line.get_xdata())[0])
        for ax in fig.axes
        for line in ax.lines
        if str(line.get_label()).startswith(prefix)
    ]


# ------------------------------------------------------------------------------------------
# Sections appear only where they apply


def test_uncertainty_part_only_with_a_tolerances_block(toleranced, plain, pin):
    assert toleranced.uncertainty is not None and plain.uncertainty is None
    for result in (plain, pin):
        for function in (
            report.uncertainty_section,
            report.tolerance_table,
            report.monte_carlo_table,
            report.figure_uncertainty_distribution,
            report.figure_tornado,
        ):
            assert str(function(result)) == "", function.__name__
    assert "Uncertainty from the input tolerances" in str(report.uncertainty_section(toleranced))
    assert 'src="data:image/png;base64,' in str(report.figure_uncertainty_distribution(toleranced))
    assert 'src="data:image/png;base64,' in str(report.figure_tornado(toleranced))


def test_uncertainty_figures_are_numbered_before_the_plots(toleranced, plain):
    # The uncertainty figures come first in the note, so the plots of section 8 move down.
    assert "Figure 1." in str(report.figure_uncertainty_distribution(toleranced))
    assert "Figure 2." in str(report.figure_tornado(toleranced))
    assert "Figure 3." in str(report.figure_fin_profile(toleranced))
    assert "Figure 1." in str(report.figure_fin_profile(plain))


def test_model_form_covers_plate_fins_and_says_so_for_pins(plain, pin, check):
    from finkit.model import model_form_check

    assert check.is_covered
    pin_check = model_form_check(pin)
    assert not pin_check.is_covered and pin_check.comparison is None
    text = _text(report.model_form_section(pin))
    assert "Not covered" in text and "plate-fin sinks only" in text
    assert "<table" not in str(report.model_form_section(pin))
    assert "Not covered" in _text(report.model_form_table(pin, pin_check))


def test_template_places_the_section_after_the_review_checks():
    from pathlib import Path

    import nbformat

    from finkit import notes

    path = Path(__file__).resolve().parent.parent / "templates"
    cells = nbformat.read(path / notes.TEMPLATES_BY_KIND["heat-sink"], as_version=4).cells
    sources = [c.source.strip() for c in cells]
    start = sources.index("report.review_section(result)") + 1
    assert sources[start] == "report.figure_calibration(result)"
    assert sources[start + 1] == "report.transient_section(result)"
    start += 1
    assert sources[start + 1].startswith("## 3. Uncertainty and model form")
    assert sources[start + 2 : start + 6] == [
        "report.uncertainty_section(result)",
        "report.figure_uncertainty_distribution(result)",
        "report.figure_tornado(result)",
        "report.model_form_section(result)",
    ]
    assert sources[start + 6].startswith("## 4. Plots")


# ------------------------------------------------------------------------------------------
# Figures


def test_uncertainty_figures_label_their_axes_with_units(toleranced):
    hist = report.plot_uncertainty_distribution(toleranced)
    ax = hist.axes[0]
    assert _labelled_with_unit(ax.get_xlabel()) and "°C" in ax.get_xlabel()
    assert _labelled_with_unit(ax.get_ylabel()) and "%" in ax.get_ylabel()
    tornado = report.plot_tornado(toleranced)
    ax = tornado.axes[0]
    assert _labelled_with_unit(ax.get_xlabel()) and "°C" in ax.get_xlabel()
    names = [t.get_text() for t in ax.get_yticklabels()]
    assert all(name[:1].isalpha() for name in names)  # a bar chart names its bars


def test_histogram_marks_limit_margin_and_nominal(toleranced):
    mc = toleranced.uncertainty.monte_carlo
    fig = report.plot_uncertainty_distribution(toleranced)
    limit_c = _c(mc.limit_temperature)
    assert any(abs(x - limit_c) < 1e-9 for x in _vertical_at(fig, "Limit "))
    usable = limit_c - mc.required_margin
    assert any(abs(x - usable) < 1e-9 for x in _vertical_at(fig, "Limit less required margin"))
    nominal = _c(toleranced.solution.junction_temperature)  # the limit node is the junction
    assert _vertical_at(fig, "Deterministic") == [pytest.approx(nominal, abs=1e-9)]
    # the whole limit is in view
    low, high = fig.axes[0].get_xlim()
    assert low < nominal < limit_c < high


def test_histogram_is_the_samples(toleranced):
    # Identity: the bars are numpy.histogram of the samples on the same edges, in % of samples.
    mc = toleranced.uncertainty.monte_carlo
    ax = report.plot_uncertainty_distribution(toleranced).axes[0]
    bars = [p for p in ax.patches if p.get_height() >= 0 and p.get_width() > 0]
    edges = np.array([p.get_x() for p in bars] + [bars[-1].get_x() + bars[-1].get_width()])
    heights = np.array([p.get_height() for p in bars])
    samples = np.asarray(mc.limit_node_temperature) - ZERO_CELSIUS
    # the last edge rebuilt as x + width can fall a rounding error below the largest sample
    edges[-1] = max(edges[-1], samples.max())
    counts, _ = np.histogram(samples, bins=edges)
    assert heights == pytest.approx(counts / mc.count * 100.0, rel=1e-9, abs=1e-12)
    assert heights.sum() == pytest.approx(100.0, rel=1e-9)


def test_tornado_is_sorted_and_centred_on_the_nominal(toleranced):
    tornado = toleranced.uncertainty.tornado
    ax = report.plot_tornado(toleranced).axes[0]
    nominal = _c(tornado.nominal_temperature)
    rows: dict[int, list] = {}
    for patch in ax.patches:
        rows.setdefault(round(patch.get_y() + patch.get_height() / 2), []).append(patch)
    assert sorted(rows) == list(range(len(tornado.bars)))
    swings = []
    for row, bar in enumerate(tornado.bars):
        patches = rows[row]
        ends = set()
        for p in patches:
            left, right = p.get_x(), p.get_x() + p.get_width()
            assert min(abs(left - nominal), abs(right - nominal)) < 1e-9  # starts at nominal
            ends.add(round(right if abs(left - nominal) < 1e-9 else left, 9))
        expected = {round(_c(bar.low_temperature), 9), round(_c(bar.high_temperature), 9)}
        assert ends == expected
        swings.append(max(ends) - min(ends))
    assert swings == sorted(swings, reverse=True)  # largest swing first
    bottom, top = ax.get_ylim()
    assert bottom > top  # row 0 (largest swing) drawn at the top
    assert _vertical_at(ax.figure, "Deterministic") == [pytest.approx(nominal, abs=1e-9)]


# ------------------------------------------------------------------------------------------
# Tables and text


def test_tolerance_table_lists_each_input_with_its_source_escaped(toleranced):
    markup = str(report.tolerance_table(toleranced))
    text = _text(markup)
    assert "correlation &lt;b&gt;scatter&lt;/b&gt;" in markup and "<b>" not in markup
    assert "±10 % (1 σ)" in text  # heat transfer, relative, normal
    assert "±2.00 W (bounds)" in text  # power, absolute, uniform
    assert "37.0 °C to 44.0 °C (mode at the nominal value)" in text  # triangular bounds
    assert "0.05 K/W to 0.1 K/W (mean ± 2 σ)" in text  # normal from bounds
    assert "— (not stated)" in text  # the inlet temperature has no source
    # sampled sigma of a uniform ±2 W: 2/sqrt(3) = 1.1547 W (variance of the uniform law)
    assert "1.15 W" in text


def test_monte_carlo_table_shows_percentiles_and_bounds(toleranced):
    mc = toleranced.uncertainty.monte_carlo
    text = _text(report.monte_carlo_table(toleranced))
    for p, value in mc.percentiles().items():
        assert f"P{p:g}: " in text
        assert f"{_c(value):.1f} °C" in text
    assert f"{_c(mc.mean()):.1f} °C (σ {mc.std():.1f} K)" in text
    n = mc.count
    assert f"{n:,}".replace(",", " ") in text
    if mc.probability_exceeding_limit == 0:
        # Source: Clopper & Pearson (1934): with no exceedance in n trials the one-sided upper
        # bound at confidence c is 1 - (1 - c)^(1/n), close to the "rule of three" 3/n.
        bound = 1.0 - 0.05 ** (1.0 / n)
        assert f"at most {format(bound * 100, '.2g')} % at 95 % confidence" in text


def test_uncertainty_reading_states_what_the_numbers_do_not_mean(toleranced):
    text = _text(report.uncertainty_section(toleranced))
    assert "the user's" in text and "independently" in text
    assert "±15-25 %" in text and "common practice" in text
    assert "95 % upper bound" in text


def test_missing_h_tolerance_is_called_out():
    case = _with_tolerances(PLATE, samples=500)
    del case["tolerances"]["heat_transfer"]
    text = _text(report.uncertainty_section(report.run(case)))
    assert "The case gives no tolerance on the air-side h" in text


def _number(text: str) -> float:
    return float(text.replace("\u2212", "-").split()[0].replace("%", ""))


def test_model_form_table_matches_compare_with_chain_called_directly(plain, check):
    from finkit.physics import conduction

    args = check.arguments
    # The arguments are the case's own: geometry and footprint as entered, the solved h.
    assert (args["base_width"], args["base_length"], args["base_thickness"]) == pytest.approx(
        (0.060, 0.050, 0.004)
    )
    assert (args["fin_count"], args["fin_thickness"], args["fin_height"]) == pytest.approx(
        (12, 0.001, 0.025)
    )
    assert (args["source_length"], args["source_width"]) == pytest.approx((0.020, 0.020))
    assert args["heat_transfer_coefficient"] == float(plain.solution.heat_transfer_coefficient)
    assert args["thermal_conductivity"] == float(plain.inputs.material.thermal_conductivity)
    direct = conduction.compare_with_chain(
        **args, mesh_cell_size=check.mesh_cell_size, refinement_levels=check.levels
    )
    markup = str(report.model_form_table(plain, check))
    cells = [
        re.sub(r"<[^>]+>", "", c).replace("\u00a0", " ")
        for c in re.findall(r"<td[^>]*>(.*?)</td>", markup)
    ]
    rows = [cells[i : i + 4] for i in range(0, len(cells), 4)]
    by_name = {row[0]: row[1:] for row in rows}
    shown = by_name["Mean source to air"]
    assert _number(shown[0]) == pytest.approx(direct.chain_resistance_song_lee_au, rel=5e-3)
    assert _number(shown[1]) == pytest.approx(direct.chain_resistance_series, rel=5e-3)
    assert _number(shown[2]) == pytest.approx(direct.conduction_resistance, rel=5e-3)
    sp = by_name["Spreading R_sp"]
    assert _number(sp[0]) == pytest.approx(direct.spreading_resistance_song_lee_au, rel=5e-3)
    assert _number(sp[1]) == pytest.approx(direct.spreading_resistance_series, rel=5e-3)
    diff = by_name["Difference from 3-D"]
    assert _number(diff[0]) == pytest.approx(100 * direct.relative_difference_song_lee_au, abs=0.06)
    assert _number(diff[1]) == pytest.approx(100 * direct.relative_difference_series, abs=0.06)
    kelvin = float(re.search(r"\(([^ ]+) K\)", diff[0]).group(1).replace("\u2212", "-"))
    power = float(plain.solution.power)
    expected = power * (direct.chain_resistance_song_lee_au - direct.conduction_resistance)
    assert kelvin == pytest.approx(expected, abs=0.006)
    assert "reference" in by_name["Difference from 3-D"][2]
    # the verdict sentence is the conduction module's own
    section = _text(report.model_form_section(plain))
    assert direct.verdict[1:40] in section


def test_model_form_grid_convergence_index_is_roache_of_the_refinement_study(check):
    # Identity: GCI = 1.25 |R_ext - R_fine| / R_fine equals refine_study's
    # 1.25 |(R_3 - R_2)/R_3| / (r^p - 1) (Roache 1994) on the same meshes.
    from finkit.physics import conduction

    study = conduction.refine_study(
        **check.arguments, mesh_cell_size=check.mesh_cell_size, levels=check.levels
    )
    assert check.is_extrapolated
    assert check.grid_convergence_index == pytest.approx(study.grid_convergence_index, rel=1e-9)
    assert check.finest_resistance == pytest.approx(study.resistances[-1], rel=1e-12)
    assert check.cell_counts == tuple(int(n) for n in study.cell_counts)


def test_model_form_check_keeps_to_its_cell_budget(plain, check):
    from finkit.model import MODEL_FORM_MAX_CELLS, model_form_check

    assert check.cell_counts[-1] <= MODEL_FORM_MAX_CELLS
    assert check.comparison.solution.cell_count == check.cell_counts[-1]
    small = model_form_check(plain, max_cells=check.cell_counts[0] * 8 + 1)  # levels 1, 2 fit
    assert small.levels == (2,) and not small.is_extrapolated
    assert math.isnan(small.grid_convergence_index)
    assert small.cell_counts == (check.cell_counts[0] * 8,)
    statement = studies._mesh_statement(small)
    assert "not estimated" in statement and "refine_study" in statement


def test_model_form_section_states_mesh_and_meaning(plain, check):
    text = _text(report.model_form_section(plain))
    assert "Richardson extrapolation" in text and "grid convergence index" in text
    counts = [f"{n:,}".replace(",", " ") for n in check.cell_counts]
    assert all(c in text for c in counts)
    assert "of the" in text and "margin" in text
    assert "conservative" in text


# ------------------------------------------------------------------------------------------
# Presentation fixes


def test_bullets_escape_items_and_keep_fragments():
    markup = str(present.bullets(["a < b", present.badge(True)]))
    assert markup.startswith('<ul class="fk-list"><li>a &lt; b</li>')
    assert '<span class="fk-badge fk-badge-pass">PASS</span>' in markup
    assert str(present.bullets(["x"], ordered=True, css_class="fk-refs")) == (
        '<ol class="fk-refs"><li>x</li></ol>'
    )


def test_touch_statement_prints_degrees_celsius():
    case = copy.deepcopy(PLATE)
    case["touch"] = {
        "limit_temperature": "70 degC",
        "reference_ambient": "25 degC",
        "basis": "fixture basis",
        "surfaces": ["base"],
    }
    statement = report.run(case).review.touch.statement
    assert "degC" not in statement
    assert "\u00a0°C reference ambient" in statement


def test_calibration_figure_shows_measured_against_predicted():
    # The plotted points are the calibration's own numbers (measured vs predicted, in °C).
    from finkit.case import load_case
    from finkit.model import run_case
    from finkit.report import plot_calibration

    result = run_case(load_case(ROOT_DEMO / "nb200-plate-fan.yaml"))
    cal = result.review.calibration
    fig = plot_calibration(result)
    ax = fig.axes[0]
    assert ax.get_xlabel() == "Measured temperature [°C]"
    assert ax.get_ylabel() == "Predicted temperature [°C]"
    lines = {line.get_label(): line for line in ax.get_lines()}
    fitted = next(v for k, v in lines.items() if k.startswith("Model with multiplier"))
    np.testing.assert_allclose(fitted.get_xdata(), np.asarray(cal.measured) - 273.15)
    np.testing.assert_allclose(fitted.get_ydata(), np.asarray(cal.predicted) - 273.15)
