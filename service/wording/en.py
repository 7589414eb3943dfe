"""The pack's words in English (catalogue ``en``); see ``service.wording``."""

WORDS: dict[str, str] = {
    # -- cover and contents ------------------------------------------------------------------
    # -- page headings, footers and page furniture ----------------------------------------------
    # -- chart keys (legends) and mark kinds -----------------------------------------------------
    # -- tables ------------------------------------------------------------------------------------
    "table.no_data": "no data",
    "table.partial": "partial: {done}",
    "table.days": "{elapsed} of {total} days",
    "table.day": "{elapsed} of {total} day",
    "table.estimate_header": "{label}, estimate",
    "table.estimates_note": "Estimates, not actuals: {columns}.",
    "table.continued": "{title} (continued)",
    "table.total": "Total",
    "table.total_of_shown": "Total of the {count} rows shown",
    "table.total_incomplete": "{total} ({count} periods without data or partial)",
    "table.total_incomplete_one": "{total} (1 period without data or partial)",
    "table.rows_left_out": "{count} more rows left out (the table shows the first {shown}).",
    "table.row_left_out": "1 more row left out (the table shows the first {shown}).",
    "table.missing_not_shown": "No data for {periods}, not among the rows shown.",
    "table.measured_of": "{part} of {whole}",
    "table.measured_unshown": "{count} not shown",
    "table.check_missing_ok": (
        "{missing} of {expected} periods without data, each shown as "
        "a row reading 'no data' or named under the table."
    ),
    "table.check_missing_none": "All {expected} expected periods have data and are listed.",
    "table.check_missing_bad": (
        "Periods without data that the table neither lists nor names: {periods}."
    ),
    "table.check_partial_ok": "{period} is partial ({done}) and marked so.",
    "table.check_partial_bad": "{period} is partial ({done}) but not marked so.",
    "table.check_estimates_ok": (
        "Marked as estimates in the header and listed under the table: {columns}."
    ),
    "table.check_estimates_bad": "Estimates not marked: {columns}.",
    "table.check_totals_ok": "Totals of measures that add up, matching the rows shown: {columns}.",
    "table.check_totals_bad": "Totals that are wrong or do not add up: {columns}.",
    "table.check_left_out_ok": (
        "{shown} of {rows} rows shown; the table says {left_out} were left out."
    ),
    "table.check_left_out_bad": (
        "{shown} of {rows} rows shown, but the table says {left_out} were left out."
    ),
    # -- text alternatives, reading guides, verdicts and notes -----------------------------------------
    # -- scales (axis ranges, off-scale marks) ------------------------------------------------------
    "scale.off_scale_below": "{period} so far ({completeness}): {values}, below the scale",
    "scale.off_scale_above": "{period} so far ({completeness}): {values}, above the scale",
    "scale.end_ok": "The value axis ends at the next nice number beyond the data.",
    "scale.end_high": (
        "The value axis runs to {hi}, a whole tick step or more past the greatest value shown "
        "({top})."
    ),
    "scale.end_low": (
        "The value axis starts at {lo}, a whole tick step or more before the least value shown "
        "({bottom})."
    ),
    "scale.end_percent": "The percentage axis runs to {hi}, past 100 %, though no value is above {top}.",
    "scale.partial_ok": (
        "The complete periods use {share} % of the plot height; the partial period's values are on "
        "the scale or marked off it."
    ),
    "scale.partial_squeezed": (
        "The complete periods use only {share} % of the plot height: the partial period decides the "
        "scale."
    ),
    "scale.partial_unmarked": (
        "The complete periods use {share} % of the plot height, but a value of the partial period "
        "lies outside the scale with no off-scale mark."
    ),
    # -- appendix ----------------------------------------------------------------------------------
    # -- checks' findings --------------------------------------------------------------------------
    "finding.same_measure.alone": "No other dataset of the pack carries this measure, so there is "
    "nothing to compare.",
    "finding.same_measure.agrees": "{measures}: every period another dataset of the pack also "
    "covers holds the same value there ({periods} compared).",
    "finding.same_measure.differs": "{measure} for {period} is {value} in dataset '{dataset}' but "
    "{other_value} in dataset '{other}'",
    "finding.same_measure.missing": "{measure} for {period} has no data in dataset '{dataset}' but "
    "{other_value} in dataset '{other}'",
    "finding.same_measure.more": "and {count} more",
    "finding.same_measure.failed": "The pack gives one measure two values for one period: {cases}. "
    "Correct the data so that every dataset tells the same story; a different measure needs a "
    "column name of its own.",
    "finding.same_measure.shown_alone": "no other dataset",
    "finding.same_measure.shown_agree": "{periods} compared, all agree",
    "finding.same_measure.shown_contradictions": "contradictions: {count}",
}
