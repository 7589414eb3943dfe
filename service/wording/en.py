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
}
