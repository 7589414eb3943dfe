"""``share``: parts of a whole.

The default form is zero-based bars, sorted from the largest part down (equal parts keep their input
order), each labelled with its share of the whole and its value. Shares are whole percentages by the
largest-remainder (Hamilton) method, so the labels add up to exactly 100; equal remainders are broken
by input order (the part that comes first in the data gets the extra point). Zero-valued parts are
kept and shown. Expected parts the data lacks are *not* added here: the check
``expected-parts-shown`` puts them back and records that it did.

A pie is planned only when the definition allows one (``allow_pie``); the encoder then plans it as
asked and the check ``pie-readable`` turns it into bars when it cannot be read. The rule
(:func:`pie_problem`): at most 5 parts, every part above zero, and every pair of parts differing by
at least 5 percentage points of the whole (18° of arc) *or* by a ratio of at least 1.2 (one part a
fifth larger than the other). Why: a pie is read by angle and area, which people judge less
accurately than position or length (Cleveland & McGill, "Graphical Perception", JASA 79(387):531–554,
1984). The UK Office for National Statistics style guide ("Part-to-whole",
style.ons.gov.uk) allows pies only with fewer than six categories, ranked, starting at 12 o'clock,
and asks for bars when no category is dominant; UNECE "Presenting gender statistics" (Types of
charts: pie charts) says generally no more than 6 segments. Five parts meets both. The two
separation figures are our own choice, not taken from those sources: a gap of 5 points is large
enough to see in absolute terms, and a ratio of 1.2 lets two small parts (2 % and 3 %) through,
whose difference is small in points but plain relative to their size. Within 1 point and 20 % of
each other (30 % against 31 %), two wedges look alike and the chart must not ask the eye to compare
them.
"""

from __future__ import annotations

import itertools
import math
from collections.abc import Iterable
from decimal import Decimal
from fractions import Fraction

import pandas as pd

from service import formatting, wording
from service.config import Limits
from service.data.frames import Table
from service.definition.model import ShareChart
from service.errors import Problem
from service.intents import categories, scales
from service.intents.plan import Category, ChartPlan, Scale, heading
from service.intents.registry import Encoder, Env, register

#: A pie holds at most this many parts.
MAX_PIE_PARTS = 5
#: Two parts of a pie are told apart if they differ by this many points of the whole ...
MIN_PIE_POINTS = 5.0
#: ... or if the larger is at least this many times the smaller.
MIN_PIE_RATIO = 1.2


def largest_remainder(values: list[float], total: int = 100) -> list[int]:
    """Whole-number shares of ``total`` proportional to ``values`` that add up to ``total`` exactly.

    The largest-remainder (Hamilton) method: each part first gets the whole part of its exact quota
    ``total · value / sum``; the points left over go one each to the parts with the largest
    remainders. Equal remainders are broken by input order (earlier first). Values are read exactly
    as written (``0.1`` is one tenth, not its binary neighbour), so ties in the data stay ties.
    Raises ``ValueError`` for a negative or non-finite value, or parts that sum to zero.
    """
    if not values:
        return []
    exact = [Fraction(repr(float(v))) for v in values]
    if any(v < 0 for v in exact):
        raise ValueError("a part cannot be negative")
    whole = sum(exact, Fraction(0))
    if whole == 0:
        raise ValueError("the parts sum to zero: they have no shares")
    quotas = [v * total / whole for v in exact]
    shares = [math.floor(q) for q in quotas]
    left = total - sum(shares)
    order = sorted(range(len(quotas)), key=lambda i: (shares[i] - quotas[i], i))
    for i in order[:left]:
        shares[i] += 1
    return shares


def percents(values: list[float | None]) -> list[int | None]:
    """Each part's displayed share (None for a part without a value, or when shares are undefined)."""
    present = [v for v in values if v is not None]
    if not present or any(v < 0 for v in present) or math.fsum(present) == 0:
        return [None] * len(values)
    shares = iter(largest_remainder(present))
    return [None if v is None else next(shares) for v in values]


def pie_problem(values: list[float], locale: str = "en-GB") -> str | None:
    """Why these parts cannot be read as a pie, or None when they can (see the module docstring).

    Checking neighbours in size order is enough: if two parts are too close, so are both of them to
    every part that lies between them in size.
    """
    if len(values) > MAX_PIE_PARTS:
        return wording.say("finding.pie_too_many", locale, count=len(values), most=MAX_PIE_PARTS)
    if not values:
        return wording.say("finding.pie_no_value", locale)
    if any(v <= 0 for v in values):
        return wording.say("finding.pie_zero_part", locale)
    pair = closest_pair(values)
    if pair is not None:
        small, large = pair
        points, ratio = large - small, large / small
        if points < MIN_PIE_POINTS and ratio < MIN_PIE_RATIO:
            return wording.say(
                "finding.pie_too_close",
                locale,
                small=_pct(small, locale),
                large=_pct(large, locale),
                points=formatting.points(points, locale, digits=1),
                ratio=formatting.number(ratio, locale, digits=2),
                min_points=formatting.points(MIN_PIE_POINTS, locale),
                min_ratio=formatting.number(MIN_PIE_RATIO, locale),
            )
    return None


def closest_pair(values: list[float]) -> tuple[float, float] | None:
    """The two neighbouring shares (in % of the sum) hardest to tell apart, smaller first."""
    total = math.fsum(values)
    shares = sorted(100.0 * v / total for v in values)
    pairs = list(itertools.pairwise(shares))
    if not pairs:
        return None

    def closeness(pair: tuple[float, float]) -> tuple[bool, float]:
        small, large = pair
        ratio = large / small if small > 0 else math.inf
        told_apart = large - small >= MIN_PIE_POINTS or ratio >= MIN_PIE_RATIO
        return (told_apart, large - small)

    return min(pairs, key=closeness)


def _pct(share: float, locale: str) -> str:
    return formatting.percent(share, locale, digits=1)


def decimals(values: list[float]) -> int:
    """The most decimals any value is written with (12.50 → 1, 1200 → 0)."""
    exponents = [Decimal(repr(v)).normalize().as_tuple().exponent for v in values]
    return max([0, *(-e for e in exponents if isinstance(e, int))])


def default_tolerance(values: list[float]) -> float:
    """Half a unit of the last decimal in the data, per part: the most rounding can account for."""
    return 0.5 * 10.0 ** -decimals(values) * len(values)


def problems(chart: ShareChart, table: Table, path: str, limits: Limits) -> Iterable[Problem]:
    labels = table.frame[chart.category]
    if len(labels) == 0:
        yield Problem(
            "empty_dataset",
            f"{path}.dataset",
            f"dataset '{table.name}' has no parts to share out",
            "add one row per part",
            table.name,
        )
    absent = [e for e in chart.expected_categories or [] if e not in set(labels.dropna())]
    yield from categories.problems(
        table,
        chart.category,
        path,
        limits,
        count=len(labels) + len(set(absent)),
        noun="parts",
        advice="show the largest parts and group the rest as 'Other' in the data",
    )
    values = table.frame[chart.measure]
    if len(labels) and values.notna().any() and values.fillna(0).sum() == 0:
        yield Problem(
            "no_whole",
            f"{path}.measure",
            "every part is zero, so there is no whole to share out",
            "check the data; a share chart needs parts that add up to something",
            chart.measure,
        )
    if chart.whole is not None and chart.whole <= 0:
        yield Problem(
            "no_whole",
            f"{path}.whole",
            f"the stated whole is {chart.whole}, and parts of a whole need a positive whole",
            "state the total the parts add up to",
            chart.whole,
        )
    seen: set[str] = set()
    for i, expected in enumerate(chart.expected_categories or []):
        if expected in seen:
            yield Problem(
                "duplicate_expected_category",
                f"{path}.expected_categories[{i}]",
                f"the expected part '{expected}' is listed more than once",
                "list each expected part once",
                expected,
            )
        seen.add(expected)


def bars_axis(
    categories: list[Category], unit: str, label: str, style: formatting.Style | None = None
) -> Scale:
    """A zero-based value axis holding every part."""
    lo, hi = scales.fit(
        [c.value for c in categories if c.value is not None], include_zero=True, unit=unit
    )
    return Scale(lo=lo, hi=max(hi, lo + 1e-9), unit=unit, label=label, style=style)


def sorted_parts(categories: list[Category]) -> list[Category]:
    """Largest part first (equal parts keep their order), parts without a value last."""
    present = [c for c in categories if c.value is not None]
    present.sort(key=lambda c: -(c.value or 0.0))
    return present + [c for c in categories if c.value is None]


def guide_note(values: list[float | None], style: formatting.Style, locale: str) -> str | None:
    present = [v for v in values if v is not None]
    if all(p is None for p in percents(values)):
        return None
    digits = formatting.decimals_for(present) if style.decimals is None else style.decimals
    total = formatting.show(
        math.fsum(present), style.model_copy(update={"decimals": digits}), locale
    )
    return wording.say("text.share_note", locale, total=total)


def encode(chart: ShareChart, table: Table, env: Env) -> ChartPlan:
    frame = table.frame
    values = [None if pd.isna(v) else float(v) for v in frame[chart.measure]]
    categories = [
        Category(label=str(c), value=v, percent=p)
        for c, v, p in zip(frame[chart.category], values, percents(values), strict=True)
    ]
    categories = sorted_parts(categories)
    unit = table.units.get(chart.measure, "")
    style = table.style(chart.measure)
    note = guide_note(values, style, env.locale)
    pie = chart.allow_pie
    return ChartPlan(
        **heading(chart, env.locale, table.source),
        form="pie" if pie else "bars",
        value_axis=bars_axis(
            categories, unit, formatting.titled(table.label(chart.measure), unit), style
        ),
        baseline=None if pie else 0.0,
        categories=categories,
        palette=list(env.palette or []),
        notes=[note] if note else [],
    )


ENCODER = register(Encoder("share", problems, encode, frozenset({"bars", "pie"})))
