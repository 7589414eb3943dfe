"""Colour arithmetic against published values and colour-science; the colour checks on plans."""

from __future__ import annotations

from typing import cast

import colour as colour_science  # test-only reference implementation; never imported by service/
import numpy as np
import pytest
from factories import (
    MONTHS,
    Json,
    guarded,
    make_column,
    make_compare_definition,
    make_dataset,
    make_definition,
    make_trend_chart,
    make_waiver,
    only_chart,
    plan_of,
    result_of,
    run_checks,
    status_of,
)

from service import colour_math as cm
from service import palette as house
from service.checks import colour as colour_check
from service.checks.registry import CheckSpec, Context, Finding
from service.checks.results import Status
from service.intents.plan import Category, ChartPlan, Panel, Series, Verdict
from service.render import style

TWO_REDS = ["#d62728", "#e0302a"]  # differ only slightly, mostly in the green channel
PALE_YELLOW = "#f0e442"


def two_series() -> Json:
    columns = [
        make_column("month", "date"),
        make_column("scheduled", "integer", "journeys"),
        make_column("operated", "integer", "journeys"),
    ]
    rows = [
        {"month": m, "scheduled": 6100, "operated": 6000 - 10 * i} for i, m in enumerate(MONTHS)
    ]
    return make_definition(
        datasets=[make_dataset(columns=columns, rows=rows)],
        charts=[make_trend_chart(measures=["scheduled", "operated"])],
    )


def with_palette(definition: Json, palette: list[str]) -> ChartPlan:
    return plan_of(definition).model_copy(update={"palette": palette})


def finding_of(spec: CheckSpec, plan: ChartPlan) -> Finding:
    """Measure a plan directly: the colour checks read only the plan, never the context."""
    return spec.measure(plan, cast(Context, None))


def measure(spec_id: str, plan: ChartPlan) -> tuple[bool, str | None]:
    spec = colour_check.DISTINCT if spec_id == "colour-distinct" else colour_check.CONTRAST
    finding = finding_of(spec, plan)
    return finding.ok, finding.shown


# --- WCAG 2.x relative luminance and contrast ------------------------------------------------------


@pytest.mark.parametrize(
    ("grey", "ratio", "passes_text", "passes_marks"),
    [
        # Source: W3C WCAG 2.x relative luminance / contrast ratio definitions; values computed
        # from those definitions against white.
        ("#777777", 4.4781, False, True),
        ("#767676", 4.5422, True, True),
        ("#949494", 3.0335, False, True),
        ("#959595", 2.9953, False, False),
        ("#000000", 21.0, True, True),
    ],
)
def test_wcag_contrast_on_white(
    grey: str, ratio: float, passes_text: bool, passes_marks: bool
) -> None:
    found = cm.contrast_ratio(grey, "#ffffff")
    assert found == pytest.approx(ratio, abs=5e-5)
    assert (found >= colour_check.MIN_TEXT_CONTRAST) is passes_text
    assert (found >= colour_check.MIN_MARK_CONTRAST) is passes_marks
    assert cm.contrast_ratio("#ffffff", grey) == found  # order does not matter


def test_srgb_decoding_and_lab() -> None:
    # Source: IEC 61966-2-1 (the linear segment below 0.04045, the power law above), from memory.
    assert cm.decode([0.04045])[0] == pytest.approx(0.04045 / 12.92)
    values = np.linspace(0, 1, 101)
    assert cm.encode(cm.decode(values)) == pytest.approx(values, abs=1e-12)
    assert cm.lab_of("#ffffff") == pytest.approx([100.0, 0.0, 0.0], abs=1e-9)
    assert cm.lab_of("#000000") == pytest.approx([0.0, 0.0, 0.0], abs=1e-9)
    # Agreement with colour-science's sRGB → XYZ → CIELAB (its matrix has more digits than the
    # standard's four, hence the tolerance).
    rng = np.random.default_rng(61966)
    for rgb in rng.random((50, 3)):
        xyz = colour_science.sRGB_to_XYZ(rgb)
        ref = colour_science.XYZ_to_Lab(xyz, colour_science.CCS_ILLUMINANTS["cie_2_1931"]["D65"])
        assert cm.linear_to_lab(cm.decode(rgb)) == pytest.approx(ref, abs=0.05)


# --- CIEDE2000 -----------------------------------------------------------------------------------


@pytest.mark.parametrize(
    ("lab1", "lab2", "expected"),
    [
        # Source: Sharma, Wu & Dalal, Color Res. Appl. 30(1):21-30, 2005, supplementary test data
        # (sample rows of its 34 pairs; scikit-image ships the same table in its test data).
        ((50, 2.6772, -79.7751), (50, 0, -82.7485), 2.0425),
        ((50, 0, 0), (50, -1, 2), 2.3669),
        ((50, 2.49, -0.001), (50, -2.49, 0.0009), 7.1792),
        ((50, 2.5, 0), (73, 25, -18), 27.1492),
        ((60.2574, -34.0099, 36.2677), (60.4626, -34.1751, 39.4387), 1.2644),
        ((2.0776, 0.0795, -1.135), (0.9033, -0.0636, -0.5514), 0.9082),
    ],
)
def test_ciede2000_sharma_pairs(
    lab1: tuple[float, float, float], lab2: tuple[float, float, float], expected: float
) -> None:
    assert float(cm.delta_e_2000(lab1, lab2)) == pytest.approx(expected, abs=1e-4)
    assert float(cm.delta_e_2000(lab2, lab1)) == pytest.approx(expected, abs=1e-4)  # symmetric


def test_ciede2000_agrees_with_colour_science() -> None:
    rng = np.random.default_rng(2005)
    lab1 = np.column_stack([rng.uniform(0, 100, 2000), rng.uniform(-110, 110, (2000, 2))])
    lab2 = np.column_stack([rng.uniform(0, 100, 2000), rng.uniform(-110, 110, (2000, 2))])
    # The hue-angle edge cases: achromatic colours, hues on either side of 0°, near-opposite hues.
    edges = np.array(
        [
            [[50, 0, 0], [50, 0, 0]],
            [[50, 0, 0], [60, 10, -10]],
            [[50, 10, 0.001], [50, 10, -0.001]],
            [[50, -10, 0.001], [50, -10, -0.001]],
            [[50, 20, 1], [50, -20, -1.2]],
            [[50, 20, -1], [50, -20, 1.2]],
        ],
        dtype=float,
    )
    lab1, lab2 = np.vstack([lab1, edges[:, 0]]), np.vstack([lab2, edges[:, 1]])
    # Source: colour-science `colour.delta_E(method="CIE 2000")`, an independent implementation.
    expected = colour_science.delta_E(lab1, lab2, method="CIE 2000")
    assert cm.delta_e_2000(lab1, lab2) == pytest.approx(expected, abs=1e-6)


# --- Colour-vision deficiency simulation ------------------------------------------------------------


@pytest.mark.parametrize(
    ("vision", "deficiency"),
    [("protan", "Protanomaly"), ("deutan", "Deuteranomaly"), ("tritan", "Tritanomaly")],
)
def test_machado_matrices_agree_with_colour_science(vision: cm.Vision, deficiency: str) -> None:
    # Source: Machado, Oliveira & Fernandes, IEEE TVCG 15(6), 2009, via colour-science.
    if vision == "tritan":
        # colour-science warns that Machado's tritan matrices approximate tritanopia by a shift of
        # the S cone; the matrix it returns is still the paper's.
        with pytest.warns(colour_science.utilities.ColourUsageWarning, match="tritanomaly"):
            reference = colour_science.matrix_cvd_Machado2009(deficiency, 1.0)
    else:
        reference = colour_science.matrix_cvd_Machado2009(deficiency, 1.0)
    assert cm.MACHADO[vision] == pytest.approx(reference, abs=1e-6)


def test_pure_red_seen_with_deutan_vision() -> None:
    seen = cm.simulate(cm.hex_to_srgb("#ff0000"), "deutan") * 255
    # Source: computed with the daltonlens reference implementation (Simulator_Machado2009,
    # deutan 1.0): [163, 144, 0]. Tolerance ±2 per channel: implementations differ in rounding to
    # 8 bits and in clipping before or after re-encoding.
    assert seen == pytest.approx([163, 144, 0], abs=2)
    assert cm.simulate(cm.hex_to_srgb("#ff0000"), "normal") == pytest.approx([1, 0, 0])


def test_simulation_stays_in_gamut() -> None:
    every = np.array(np.meshgrid(*[np.linspace(0, 1, 9)] * 3)).reshape(3, -1).T
    for vision in ("protan", "deutan", "tritan"):
        seen = cm.simulate(every, vision)
        assert seen.min() >= 0.0
        assert seen.max() <= 1.0 + 1e-12
        assert cm.simulate([1.0, 1.0, 1.0], vision) == pytest.approx([1, 1, 1], abs=1e-3)


@pytest.mark.parametrize(
    ("vision", "expected"),
    # Source: Okabe & Ito, Color Universal Design (2002, rev. 2008) colours; their minimum pairwise
    # ΔE00, computed with colorspacious at severity 100 (same Machado matrices); agreement to 0.05.
    [("normal", 21.7), ("protan", 12.2), ("deutan", 11.6), ("tritan", 10.9)],
)
def test_okabe_ito_minimum_differences(vision: cm.Vision, expected: float) -> None:
    okabe_ito = ["#000000", "#e69f00", "#56b4e9", "#009e73", "#f0e442", "#0072b2", "#d55e00"]
    found, pair = cm.min_pairwise_difference([*okabe_ito, "#cc79a7"], vision)
    assert found == pytest.approx(expected, abs=0.05)
    assert pair is not None


def test_min_pairwise_difference_edges() -> None:
    assert cm.min_pairwise_difference(["#123456"]) == (float("inf"), None)
    assert cm.min_pairwise_difference(["#123456", "#abcdef", "#123456"]) == (
        0.0,
        ("#123456", "#123456"),
    )


# --- The house palette -----------------------------------------------------------------------------


def test_house_palette_passes_both_rules_for_every_chart_size() -> None:
    palette = list(style.PALETTE)
    assert len(palette) == 8
    for c in palette:
        assert cm.contrast_ratio(c) >= 3.0, c  # WCAG 2.2 SC 1.4.11
    for text in (style.INK, style.MUTED, style.FLAG):
        assert cm.contrast_ratio(text) >= 4.5, text  # WCAG 2.2 SC 1.4.3
    for n in range(2, len(palette) + 1):  # lines use up to 4 colours, pies up to 5; all 8 pass
        for vision in cm.VISIONS:
            found, pair = cm.min_pairwise_difference(palette[:n], vision)
            assert found >= colour_check.MIN_DIFFERENCE, (n, vision, pair)
            # a muted (grey) series beside the coloured ones
            found, pair = cm.min_pairwise_difference([*palette[:n], style.MUTED], vision)
            assert found >= colour_check.MIN_DIFFERENCE, (n, vision, pair)


def test_house_palette_passes_through_the_pipeline() -> None:
    checked = run_checks(two_series())
    distinct = result_of(checked, "colour-distinct")
    assert distinct.status is Status.passed
    assert distinct.measured_text is not None
    assert distinct.measured_text.startswith("ΔE00 ")
    assert result_of(checked, "colour-contrast").status is Status.passed
    assert only_chart(checked).plan.palette == []


def test_one_colour_passes_trivially() -> None:
    checked = run_checks(make_compare_definition({"A": 90.0, "B": 80.0}))
    found = result_of(checked, "colour-distinct")
    assert (found.status, found.measured_text) == (Status.passed, "one colour")
    assert result_of(checked, "colour-contrast").status is Status.passed


# --- colour-distinct -------------------------------------------------------------------------------


def test_two_close_reds_fail_and_are_corrected_to_the_house_palette() -> None:
    definition = two_series()
    plan = with_palette(definition, TWO_REDS)
    ok, shown = measure("colour-distinct", plan)
    assert not ok
    assert shown is not None
    assert float(shown.split()[1]) < colour_check.MIN_DIFFERENCE
    guard = guarded(definition, plan)
    found = next(r for r in guard.results if r.check == "colour-distinct")
    assert found.status is Status.corrected
    assert "#d62728 and #e0302a" in found.explanation
    assert found.measured_text == shown  # before
    assert found.corrected_to is not None
    assert found.corrected_to.startswith("ΔE00 ")  # after, on the house palette
    assert guard.plan.palette == []
    assert guard.plan.flags == []


def test_custom_palette_waived_is_kept() -> None:
    definition = two_series()
    definition["waivers"] = [make_waiver("colour-distinct", "boardings-trend")]
    guard = guarded(definition, with_palette(definition, TWO_REDS))
    assert status_of(guard, "colour-distinct") is Status.waived
    assert guard.plan.palette == TWO_REDS


def test_fails_when_the_house_palette_cannot_help(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setattr(house, "PALETTE", ("#d62728", "#e0302a"))
    definition = two_series()
    guard = guarded(definition, with_palette(definition, ["#1f77b4", "#1f77b5"]))
    assert status_of(guard, "colour-distinct") is Status.failed
    assert any(f.startswith("colour-distinct: ") for f in guard.plan.flags)


def test_pie_parts_and_palette_wrap() -> None:
    plan = plan_of(make_compare_definition({"A": 50.0, "B": 30.0, "C": 20.0}))
    parts = [Category(label=f"part {i}", value=1.0) for i in range(9)]
    pie = plan.model_copy(update={"form": "pie", "categories": parts[:5]})
    assert colour_check.mark_colours(pie) == [c.lower() for c in style.PALETTE[:5]]
    assert measure("colour-distinct", pie)[0]
    wrapped = pie.model_copy(update={"categories": parts})  # 9 parts, 8 colours
    finding = finding_of(colour_check.DISTINCT, wrapped)
    assert not finding.ok
    assert "share the colour" in finding.detail


def test_muted_series_and_panels() -> None:
    plan = plan_of(two_series())
    first, second = plan.series
    muted = plan.model_copy(update={"series": [first, second.model_copy(update={"muted": True})]})
    assert colour_check.mark_colours(muted) == [style.PALETTE[0], style.MUTED.lower()]
    grey_focus = muted.model_copy(update={"palette": ["#606060"]})
    assert not measure("colour-distinct", grey_focus)[0]  # focus grey beside the muted grey

    def panel(*series: Series) -> Panel:
        return Panel(title="p", value_axis=plan.value_axis, series=list(series))

    panels = plan.model_copy(
        update={"form": "panels", "series": [], "panels": [panel(first), panel(second)]}
    )
    # each panel draws its measure in that measure's colour across the pack
    assert colour_check.colour_groups(panels) == [[style.PALETTE[0]], [style.PALETTE[1]]]
    assert measure("colour-distinct", panels) == (True, "one colour")


# --- colour-contrast -------------------------------------------------------------------------------


def test_pale_yellow_fails_contrast_and_is_corrected() -> None:
    definition = two_series()
    plan = with_palette(definition, [PALE_YELLOW, "#0072b2"])
    finding = finding_of(colour_check.CONTRAST, plan)
    assert not finding.ok
    assert finding.measured == pytest.approx(1.32, abs=0.01)  # computed, WCAG 2.x formula
    assert PALE_YELLOW in finding.detail
    guard = guarded(definition, plan)
    found = next(r for r in guard.results if r.check == "colour-contrast")
    assert found.status is Status.corrected
    assert guard.plan.palette == []


def test_contrast_waived_for_a_brand_palette() -> None:
    definition = two_series()
    definition["waivers"] = [make_waiver("colour-contrast", "boardings-trend")]
    guard = guarded(definition, with_palette(definition, [PALE_YELLOW, "#0072b2"]))
    assert status_of(guard, "colour-contrast") is Status.waived
    assert status_of(guard, "colour-distinct") is Status.passed
    assert guard.plan.palette == [PALE_YELLOW, "#0072b2"]


def test_weak_text_colour_fails(monkeypatch: pytest.MonkeyPatch) -> None:
    monkeypatch.setitem(colour_check.TEXT_COLOURS, "muted text", "#777777")
    finding = finding_of(colour_check.CONTRAST, plan_of(two_series()))
    assert not finding.ok
    assert "#777777 (4.48:1)" in finding.detail


def test_deviation_and_control_colours_follow_the_drawers() -> None:
    plan = plan_of(make_compare_definition({"A": 5.0, "B": -3.0}))
    above = [Category(label="A", value=5.0), Category(label="B", value=None)]
    deviation = plan.model_copy(update={"form": "deviation", "categories": above})
    assert colour_check.mark_colours(deviation) == [style.PALETTE[0]]  # nothing below target
    both = [*above, Category(label="C", value=-2.0)]
    deviation = deviation.model_copy(update={"categories": both})
    assert colour_check.mark_colours(deviation) == [style.PALETTE[0], style.PALETTE[1]]
    trend = plan_of(make_definition())
    signal = Verdict(index=2, text="a signal", signal=True)
    control = trend.model_copy(update={"form": "control", "verdicts": [signal]})
    assert colour_check.mark_colours(control) == [style.PALETTE[0], style.FLAG.lower()]
    assert measure("colour-distinct", control)[0]
    assert not measure("colour-distinct", control.model_copy(update={"palette": ["#a4001e"]}))[0]
