"""The renderer draws the plan and nothing else: measured on the artists matplotlib actually drew."""

from __future__ import annotations

import io
import math
import re

import pikepdf
import pytest
from factories import make_compare_definition, make_definition, make_monthly, run_checks
from matplotlib.axes import Axes
from matplotlib.lines import Line2D
from matplotlib.patches import Rectangle
from matplotlib.text import Text

from service.checks.lie_factor import lie_factor
from service.intents.plan import ChartPlan
from service.render import charts


def _drawn(definition: dict[str, object]) -> tuple[ChartPlan, Axes]:
    plan = run_checks(definition).charts[0].plan
    figure = charts.figure_for(plan)
    figure.canvas.draw()  # lay out, so display coordinates are final
    return plan, figure.axes[0]


def _bar_lengths_px(ax: Axes) -> list[float]:
    bars = [p for p in ax.patches if isinstance(p, Rectangle)]
    return [p.get_window_extent().width for p in bars]


@pytest.mark.parametrize(
    ("baseline", "waived", "expected"),
    [
        (None, False, 1.0),  # zero-based bars: drawn lengths proportional to the values
        (45.0, False, 1.0),  # the requested baseline is corrected to zero
        (45.0, True, 10.0),  # kept as asked: 50 and 55 from 45 → lengths 5 and 10 (Tufte's formula)
    ],
)
def test_lie_factor_of_the_drawn_bars(
    baseline: float | None, waived: bool, expected: float
) -> None:
    """Lie factor = effect shown / effect in data (Tufte 1983, p. 57), here measured on the pixel
    widths of the bars matplotlib drew, not on the plan."""
    extra: dict[str, object] = {} if baseline is None else {"baseline": baseline}
    waivers = (
        [
            {
                "check": "bar-zero-baseline",
                "chart": "on-time",
                "by": "A. Reviewer",
                "reason": "The board asked to see the spread above the floor.",
            }
        ]
        if waived
        else []
    )
    definition = make_compare_definition({"a": 50.0, "b": 55.0}, **extra)
    definition["waivers"] = waivers
    plan, ax = _drawn(definition)
    assert plan.chart_id == "on-time"
    small, large = sorted(_bar_lengths_px(ax))
    assert lie_factor(50.0, 55.0, small, large) == pytest.approx(expected, rel=1e-6)


def test_gap_is_not_joined_and_partial_point_stands_alone() -> None:
    months = ["2026-07-01", "2026-08-01", "2026-09-01", "2026-10-01", "2026-11-01"]
    definition = make_definition(datasets=[make_monthly(months, [50.0, None, 52.0, 53.0, 10.0])])
    plan, ax = _drawn(definition)
    gap = plan.gaps[0].index
    partial = plan.partial
    assert partial is not None
    lines = [line for line in ax.get_lines() if isinstance(line, Line2D)]
    drawn = {float(x) for line in lines for x in line.get_xdata()}
    assert drawn == {0.0, 2.0, 3.0, 4.0}  # every present period, not the gap at index 1
    for line in lines:
        xs = [float(x) for x in line.get_xdata()]
        ys = [float(y) for y in line.get_ydata()]
        assert gap not in xs, "a line was drawn through the period with no data"
        if partial.index in xs:
            assert xs == [partial.index], "the running period was joined to the line"
            assert line.get_markerfacecolor() == "white"  # hollow
        assert all(not math.isnan(y) for y in ys)
    texts = [t.get_text() for t in ax.findobj(Text)]
    assert "no data" in texts
    assert any("8 of 30 days" in t for t in texts)


def test_dots_scale_does_not_start_at_zero_and_says_so() -> None:
    definition = make_compare_definition({"a": 3.9, "b": 4.3, "c": 4.1}, focus="differences")
    plan, ax = _drawn(definition)
    low, _ = ax.get_xlim()
    assert low > 0
    assert plan.notes
    assert ax.get_title(loc="left") == plan.notes[0]
    assert not ax.patches  # dots, not bars


def test_user_text_is_never_mathtext() -> None:
    definition = make_compare_definition({"$x^2$": 1.0, "b": 2.0})
    _, ax = _drawn(definition)
    labels = [t.get_text() for t in ax.get_yticklabels()]
    assert "$x^2$" in labels
    assert all(not t.get_parse_math() for t in ax.get_yticklabels())


def _fonts(pdf_bytes: bytes) -> dict[str, list[tuple[int, str]]]:
    """Each embedded Type 0 font's (code, text) pairs, read from its ToUnicode CMap.

    matplotlib writes every entry as ``<first> <last> [<text> ...]`` (a bfrange with an array).
    """
    fonts: dict[str, list[tuple[int, str]]] = {}
    with pikepdf.open(io.BytesIO(pdf_bytes)) as pdf:
        for obj in pdf.objects:
            if isinstance(obj, pikepdf.Dictionary) and obj.get("/Subtype") == "/Type0":
                cmap = obj.ToUnicode.read_bytes().decode("ascii")
                pairs = []
                for first, _last, texts in re.findall(
                    r"<([0-9a-f]+)> <([0-9a-f]+)> \[([^\]]*)\]", cmap
                ):
                    for offset, hexed in enumerate(re.findall(r"<([0-9a-f]+)>", texts)):
                        pairs.append(
                            (int(first, 16) + offset, bytes.fromhex(hexed).decode("utf-16be"))
                        )
                fonts[str(obj.BaseFont)] = pairs
    return fonts


def test_multi_line_text_and_characters_beyond_latin_1_stay_in_one_font_subset() -> None:
    """A two-line note with "ffi" and "fi" and a label with an en dash and an arrow: one subset per
    face, no ligature glyph, every character at its own code point, and so no code 0, which PDF/A
    validators read as .notdef whatever glyph it maps to (ISO 19005-3, 6.2.11.8; the rule as
    pikepdf 10.18's validator states it, following veraPDF)."""
    label = "7 Mill Lane \u2013 Station \u2192 Depot"
    plan = run_checks(make_compare_definition({label: 50.0, "b": 55.0})).charts[0].plan
    notes = ["Staff in the office counted fifty fine days.", "Differences are small."]
    plan = plan.model_copy(update={"notes": notes})
    figure = charts.figure_for(plan)
    assert "\n" in figure.axes[0].get_title(loc="left")  # the note is one multi-line text
    fonts = _fonts(charts.draw(plan))
    faces = [name.split("+", 1)[1] for name in fonts]
    assert sorted(faces) == ["DejaVuSans", "DejaVuSans-Oblique"]  # one subset each
    pairs = [pair for font in fonts.values() for pair in font]
    assert all(len(text) == 1 and code == ord(text) for code, text in pairs), pairs
    shown = {text for _, text in pairs}
    assert {"\u2013", "\u2192", "f", "i"} <= shown
