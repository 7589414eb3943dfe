"""Text the typeface cannot draw is refused before drawing, not printed as empty boxes."""

from __future__ import annotations

from factories import (
    find,
    make_category_dataset,
    make_compare_chart,
    make_definition,
    problems_of,
    run_checks,
)

from service import glyphs


def test_dejavu_covers_latin_greek_cyrillic_and_the_symbols_we_print() -> None:
    # Common practice (no source): DejaVu Sans covers Latin, Greek and Cyrillic; the pack itself
    # prints "−", "—", "²", "≥", "ΔE00", "×" and "€".
    assert glyphs.missing("Straße Ελλάδα Москва − — ² ≥ Δ × € £ ½") == []


def test_characters_outside_the_font_are_named() -> None:
    assert glyphs.missing("route 漢字 漢") == ["漢", "字"]


def test_a_chart_title_outside_the_font_is_a_problem_with_its_path() -> None:
    definition = make_definition(
        datasets=[make_category_dataset({"a": 1.0, "b": 2.0})],
        charts=[make_compare_chart(title="Ridership 漢字")],
    )
    problem = find(problems_of(definition), "glyph_missing")
    assert problem.path == "sections[0].charts[0].title"
    assert "U+6F22" in problem.message


def test_right_to_left_category_labels_are_refused_until_they_can_be_laid_out() -> None:
    definition = make_definition(
        datasets=[make_category_dataset({"שלום": 1.0, "b": 2.0})], charts=[make_compare_chart()]
    )
    problem = find(problems_of(definition), "right_to_left_text")
    assert problem.path == "datasets[0].rows[*].route"
    assert problem.value == "שלום"


def test_ordinary_text_passes() -> None:
    checked = run_checks(
        make_definition(
            datasets=[make_category_dataset({"Straße 7": 1.0, "Μ 2": 2.0})],
            charts=[make_compare_chart()],
        )
    )
    assert not checked.blocked


def test_characters_beyond_the_basic_multilingual_plane_are_refused_even_when_the_font_has_them() -> (
    None
):
    # U+10300 OLD ITALIC LETTER A is in DejaVu Sans (asserted below), yet matplotlib would place
    # it at code 0 of a second font subset, which PDF/A checks (ISO 19005-3 6.2.11.8) reject.
    bold_a = "\U00010300"
    assert ord(bold_a) in glyphs.covered()
    assert glyphs.missing(f"Score {bold_a}") == [bold_a]
