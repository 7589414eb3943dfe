"""The pack's words in English (catalogue ``en``); see ``service.wording``."""

WORDS: dict[str, str] = {
    # -- cover and contents ------------------------------------------------------------------
    # -- page headings, footers and page furniture ----------------------------------------------
    # -- chart keys (legends) and mark kinds -----------------------------------------------------
    "key.partial_actual": "Actual so far, period not complete",
    "key.estimate": "Estimate, not an actual",
    "key.projection": "Projection for the whole period",
    "key.target": "Target",
    "key.signal": "Signal: more than routine variation",
    "key.no_data": "No data",
    "key.interval": "Uncertainty interval of the value",
    # -- tables ------------------------------------------------------------------------------------
    # -- text alternatives, reading guides, verdicts and notes -----------------------------------------
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
