"""The review pages' colours meet WCAG 2.1 contrast minimums: 4.5:1 for text (WCAG 2.1 §1.4.3,
Contrast (Minimum)) and 3:1 for focus rings and field borders (WCAG 2.1 §1.4.11, Non-text
Contrast), computed with WCAG 2.1's relative-luminance formula from the style sheet itself."""

from __future__ import annotations

import re

import pytest

from service.colour_math import contrast_ratio
from service.web import STATIC

CSS = (STATIC / "review.css").read_text()
VARIABLES = dict(re.findall(r"--([\w-]+):\s*(#[0-9a-fA-F]{6})\s*;", CSS))

TEXT = [
    ("ink", "paper"),
    ("muted", "paper"),
    ("link", "paper"),
    ("ink", "panel"),
    ("muted", "panel"),
    ("link", "panel"),
    ("ink", "#ffffff"),
    ("masthead-ink", "masthead"),
    ("button-ink", "button"),
    ("failed-ink", "failed-bg"),
    ("waived-ink", "waived-bg"),
    ("ok-ink", "ok-bg"),
]
"""Every text colour with every background it is drawn on."""
NON_TEXT = [
    ("focus", "paper"),
    ("focus", "panel"),
    ("focus", "#ffffff"),
    ("masthead-focus", "masthead"),
    ("muted", "#ffffff"),  # the border of a text field
]


def luminance(colour: str) -> float:
    """Relative luminance, WCAG 2.1 definition (sRGB; linear below 0.03928)."""
    channels = [int(colour[i : i + 2], 16) / 255 for i in (1, 3, 5)]
    r, g, b = (c / 12.92 if c <= 0.03928 else ((c + 0.055) / 1.055) ** 2.4 for c in channels)
    return 0.2126 * r + 0.7152 * g + 0.0722 * b


def ratio(first: str, second: str) -> float:
    """WCAG 2.1 contrast ratio (L1 + 0.05) / (L2 + 0.05), lighter over darker."""
    a, b = sorted((luminance(first), luminance(second)), reverse=True)
    return (a + 0.05) / (b + 0.05)


def colour(name: str) -> str:
    return name if name.startswith("#") else VARIABLES[name]


def test_the_formula_against_known_values() -> None:
    assert ratio("#000000", "#ffffff") == pytest.approx(21.0)  # the scale's maximum, by definition
    assert ratio("#ffffff", "#ffffff") == pytest.approx(1.0)
    # WebAIM's contrast checker gives #767676 on white 4.54:1 and #777777 4.48:1 (from memory).
    assert round(ratio("#767676", "#ffffff"), 2) == 4.54
    assert round(ratio("#777777", "#ffffff"), 2) == 4.48


@pytest.mark.parametrize(("text", "background"), TEXT)
def test_text_meets_4_5_to_1(text: str, background: str) -> None:
    measured = ratio(colour(text), colour(background))
    assert measured >= 4.5, f"{text} on {background}: {measured:.2f}:1"
    assert measured == pytest.approx(contrast_ratio(colour(text), colour(background)), abs=0.01)


@pytest.mark.parametrize(("mark", "background"), NON_TEXT)
def test_focus_rings_and_borders_meet_3_to_1(mark: str, background: str) -> None:
    measured = ratio(colour(mark), colour(background))
    assert measured >= 3.0, f"{mark} on {background}: {measured:.2f}:1"


def _used(property_pattern: str) -> set[str]:
    found = set()
    for value in re.findall(rf"(?<![-\w]){property_pattern}\s*:\s*([^;}}]+)", CSS):
        found |= set(re.findall(r"var\(--([\w-]+)\)", value))
        found |= {v.lower() for v in re.findall(r"#[0-9a-fA-F]{6}", value)}
    return found


def test_every_colour_the_sheet_uses_is_measured() -> None:
    """A colour added to the sheet without a pair above fails here, so it cannot go unmeasured."""
    assert _used("color") <= {fg for fg, _ in TEXT}
    assert _used("background(?:-color)?") <= {bg for _, bg in TEXT}
    assert _used("outline(?:-color)?") <= {mark for mark, _ in NON_TEXT}
    assert {"ink", "paper", "focus"} <= _used("color") | _used("background") | _used("outline")
