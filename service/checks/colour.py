"""Colour checks: the colours a chart uses can be told apart, also by colour-blind readers, and stand
out from the white page.

The colours measured are the ones the chart draws its marks with: the plan's palette (the report's
custom palette), else the house palette, at each measure's slot across the pack (``intents.colours``),
else in order, for as many colour-coded marks as the form has.
The formulas live in ``service.colour_math``; this module decides what to measure and the
thresholds. A breach on a custom palette is corrected by drawing with the house palette instead
(which must itself pass); a mandated brand palette can be kept with a waiver.
"""

from __future__ import annotations

from service import colour_math, formatting, wording
from service import palette as house
from service.checks.registry import CheckSpec, Context, Finding, register
from service.definition.model import INTENTS
from service.intents import colours
from service.intents.forms import LENGTH_FORMS, POSITION_FORMS
from service.intents.plan import ChartPlan, Series

_ALL_INTENTS = frozenset(INTENTS)
_ALL_FORMS = LENGTH_FORMS | POSITION_FORMS

MIN_DIFFERENCE = 10.0
"""ΔE00 every two mark colours keep under each vision (the Okabe–Ito set's worst case is 10.9)."""
MIN_MARK_CONTRAST = 3.0
"""WCAG 2.2 SC 1.4.11 Non-text Contrast, against the white background."""
MIN_TEXT_CONTRAST = 4.5
"""WCAG 2.2 SC 1.4.3 Contrast (Minimum), for normal-size text."""
BACKGROUND = "#ffffff"
TEXT_COLOURS = {"ink": house.INK, "muted text": house.MUTED, "flag": house.FLAG}

_SERIES_FORMS = frozenset({"lines", "control"})


def palette_of(plan: ChartPlan) -> list[str]:
    """The colours marks are drawn with, in order: the plan's palette, else the house palette."""
    return [c.lower() for c in colours.palette_of(plan)]


def _series_colours(plan: ChartPlan, series: list[Series]) -> list[str]:
    """As ``render.basic.draw_series`` colours them: each its measure's colour across the pack (else
    by position), muted series in one grey."""
    actuals = {s.slot for s in series if not s.estimate and s.slot is not None}
    coloured = [
        colours.series_colour(plan, s, i).lower()
        for i, s in enumerate(series)
        if not s.muted and not (s.estimate and s.slot in actuals)  # its measure's own colour
    ]
    return coloured + ([house.MUTED.lower()] if any(s.muted for s in series) else [])


def colour_groups(plan: ChartPlan) -> list[list[str]]:
    """The colours of the colour-coded marks on each axes, the ones a reader must tell apart.

    As the drawers colour them: lines, one colour per series; control charts, the same plus the flag
    colour of signal points; panels, each panel numbering its series from the first colour; pies, one
    colour per drawn wedge; deviation bars, the first colour above the target and the second below;
    every other form draws its marks in the first colour."""
    if plan.form == "panels":
        return [_series_colours(plan, panel.series) for panel in plan.panels] or [[]]
    if plan.form in _SERIES_FORMS:
        drawn = _series_colours(plan, plan.series)
        if plan.form == "control" and plan.series and any(v.signal for v in plan.verdicts):
            drawn.append(house.FLAG.lower())
        return [drawn]
    values = [c.value for c in plan.categories if c.value is not None]
    if plan.form == "pie":
        indexes = list(range(len([v for v in values if v > 0]))) or [0]
    elif plan.form == "deviation":
        indexes = sorted({0 if v >= 0 else 1 for v in values}) or [0]
    else:
        indexes = [0]
    return [[colours.mark_colour(plan, i).lower() for i in indexes]]


def mark_colours(plan: ChartPlan) -> list[str]:
    """Every colour the chart's marks are drawn with, once each."""
    return (
        list(dict.fromkeys(c for group in colour_groups(plan) for c in group))
        or palette_of(plan)[:1]
    )


def _distinct(plan: ChartPlan, ctx: Context) -> Finding:
    groups = [g for g in colour_groups(plan) if len(g) > 1]
    locale = plan.locale
    if not groups:
        return Finding(True, None, wording.say("finding.one_colour", locale), "one colour")
    colours = max(groups, key=len)
    found = [
        (*colour_math.min_pairwise_difference(group, vision), vision)
        for group in groups
        for vision in colour_math.VISIONS
    ]
    difference, pair, vision = min(found, key=lambda f: f[0])
    first, second = pair or (colours[0], colours[1])
    shown = f"ΔE00 {formatting.number(difference, locale, digits=1)} ({vision})"
    words = {
        "count": len(colours),
        "difference": formatting.number(difference, locale, digits=1),
        "first": first,
        "second": second,
        "seen": wording.say(f"finding.vision_{vision}", locale),
        "least": formatting.number(MIN_DIFFERENCE, locale, digits=0),
    }
    if difference >= MIN_DIFFERENCE:
        detail = wording.say("finding.colours_apart", locale, **words)
        return Finding(True, round(difference, 2), detail, shown)
    key = "finding.colour_shared" if first == second else "finding.colours_close"
    return Finding(False, round(difference, 2), wording.say(key, locale, **words), shown)


def _text_name(name: str, locale: str) -> str:
    """A text colour's role in words ("ink", "muted text", "flag")."""
    return wording.say("finding.text_" + name.replace(" ", "_"), locale)


def _contrast(plan: ChartPlan, ctx: Context) -> Finding:
    marks = {
        c: colour_math.contrast_ratio(c, BACKGROUND) for c in dict.fromkeys(mark_colours(plan))
    }
    texts = {n: colour_math.contrast_ratio(c, BACKGROUND) for n, c in TEXT_COLOURS.items()}
    lowest = min(marks, key=lambda c: marks[c])
    low_text = min(texts, key=lambda n: texts[n])
    locale = plan.locale

    def ratio(value: float) -> str:
        return f"{formatting.number(value, locale, digits=2)}:1"

    shown = wording.say(
        "finding.contrasts", locale, marks=ratio(marks[lowest]), text=ratio(texts[low_text])
    )
    weak = [f"{c} ({ratio(r)})" for c, r in marks.items() if r < MIN_MARK_CONTRAST]
    weak_text = [
        f"{_text_name(n, locale)} {TEXT_COLOURS[n]} ({ratio(r)})"
        for n, r in texts.items()
        if r < MIN_TEXT_CONTRAST
    ]
    if not weak and not weak_text:
        detail = wording.say(
            "finding.contrast_ok", locale, marks=ratio(marks[lowest]), text=ratio(texts[low_text])
        )
        return Finding(True, round(marks[lowest], 2), detail, shown)
    parts = []
    if weak:
        parts.append(wording.say("finding.marks_weak", locale, colours=", ".join(weak)))
    if weak_text:
        parts.append(wording.say("finding.text_weak", locale, colours=", ".join(weak_text)))
    text = "; ".join(parts)
    detail = wording.say("finding.hard_to_see", locale, parts=text[:1].upper() + text[1:])
    return Finding(False, round(marks[lowest], 2), detail, shown)


def _house_palette(plan: ChartPlan, ctx: Context) -> ChartPlan:
    """Draw with the house palette (the engine re-measures: it must pass, or the check fails)."""
    return plan.model_copy(update={"palette": []})


_CORRECTION = "The chart was drawn with the house palette instead of the custom one."

DISTINCT = register(
    CheckSpec(
        id="colour-distinct",
        title="Colours can be told apart, also by colour-blind readers",
        intents=_ALL_INTENTS,
        forms=_ALL_FORMS,
        measures="the smallest CIEDE2000 difference between two mark colours the chart uses, with "
        "normal vision and simulated protan, deutan and tritan vision",
        threshold=f"ΔE00 ≥ {MIN_DIFFERENCE:.0f} under each vision",
        source="Sharma, Wu & Dalal, 'The CIEDE2000 color-difference formula', Color Res. Appl. "
        "30(1), 2005; Machado, Oliveira & Fernandes, IEEE TVCG 15(6), 2009 (severity 1.0); "
        "threshold: the 8 Okabe & Ito colours (Color Universal Design, 2002/2008) reach 10.9 under "
        "tritan simulation (computed)",
        waivable=True,
        correction=_CORRECTION,
        measure=_distinct,
        correct=_house_palette,
    )
)

CONTRAST = register(
    CheckSpec(
        id="colour-contrast",
        title="Marks and text stand out from the page",
        intents=_ALL_INTENTS,
        forms=_ALL_FORMS,
        measures="the WCAG contrast ratio of each mark colour and each text colour against white",
        threshold=f"marks ≥ {MIN_MARK_CONTRAST:.0f}:1, text ≥ {MIN_TEXT_CONTRAST}:1",
        source="W3C WCAG 2.2, success criteria 1.4.11 Non-text Contrast and 1.4.3 Contrast "
        "(Minimum)",
        waivable=True,
        correction=_CORRECTION,
        measure=_contrast,
        correct=_house_palette,
    )
)
