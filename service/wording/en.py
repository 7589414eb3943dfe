"""The pack's words in English (catalogue ``en``); see ``service.wording``."""

WORDS: dict[str, str] = {
    # -- cover and contents ------------------------------------------------------------------
    # -- page headings, footers and page furniture ----------------------------------------------
    # -- chart keys (legends) and mark kinds -----------------------------------------------------
    # -- tables ------------------------------------------------------------------------------------
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
}
