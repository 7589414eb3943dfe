"""The pack's words in English (catalogue ``en``); see ``service.wording``."""

WORDS: dict[str, str] = {
    # -- cover and contents ------------------------------------------------------------------
    "cover.period": "Reporting period",
    "cover.period_range": "{start} to {end}",
    "cover.as_of": "Data as of",
    "cover.owner": "Owner",
    "cover.audience": "Audience",
    "cover.report_id": "Report id",
    "cover.review": "Review status",
    "cover.figures": "Headline figures",
    "cover.figure": "Figure",
    "cover.latest": "Latest",
    "cover.change": "Change",
    "cover.checks": "Checks of its chart",
    "cover.change_since": "{change} from {period}",
    "cover.no_earlier": "no earlier value",
    "cover.estimate": "estimate",
    "cover.partial": "partial period",
    "cover.figure_missing": "The chart has no figure named “{name}”; it has: {names}.",
    "cover.contents": "Contents",
    "cover.integrity": "Integrity: {counts}. The appendix lists every check of every chart.",
    "cover.all_passed": "all {count} passed",
    # -- page headings, footers and page furniture ----------------------------------------------
    "page.number": "Page {page} of {pages}",
    "page.chart_on_page": "{title} (page {page})",
    "page.source": "Source: {source}",
    "page.text_alternative": "Text alternative:",
    "page.checks_line": "{counts} (details in the appendix, page {page}).",
    "page.failed": "FAILED: {checks}",
    "page.caution": (
        "These checks support, but do not replace, the report owner's judgement, the reporting "
        "standards that apply to this pack, and professional review. A check that passed shows "
        "that one rule was met, not that the figures are right."
    ),
    # -- chart keys (legends) and mark kinds -----------------------------------------------------
    # -- tables ------------------------------------------------------------------------------------
    # -- text alternatives, reading guides, verdicts and notes -----------------------------------------
    # -- appendix ----------------------------------------------------------------------------------
    "appendix.title": "Integrity checks",
    "appendix.intro": (
        "{counts}. First the checks that need a reviewer's attention, then each chart's passed "
        "checks, then the rules the checks apply, each described once."
    ),
    "appendix.meanings": (
        "corrected: the definition asked for something that breaks the rule, and the honest form "
        "was drawn instead. waived: the breach was accepted, with the reason and by whom. failed:"
        " the rule is broken and the pack cannot be signed off until it is fixed or waived. "
        "advice: worth a reader's attention, never blocking. not applicable: the chart's form "
        "cannot break the rule, so it is not counted as a pass."
    ),
    "appendix.summary_title": "Checks that need a reviewer's attention",
    "appendix.summary_none": "Every applicable check passed: nothing needs a reviewer's attention.",
    "appendix.chart": "Chart",
    "appendix.check": "Check",
    "appendix.status": "Status",
    "appendix.measured": "Measured",
    "appendix.done": "What was done",
    "appendix.why": "Why",
    "appendix.done_corrected": "Corrected: {correction}",
    "appendix.done_corrected_to": "Now: {after}.",
    "appendix.done_waived": "Waived by {by}.",
    "appendix.done_waived_until": "Waived by {by}, until {until}.",
    "appendix.done_failed": "Nothing yet: the pack cannot be signed off until this is fixed or waived.",
    "appendix.done_advice": "Reported to the reader; advice never blocks.",
    "appendix.reason": "Reason: {reason}",
    "appendix.grid_title": "Passed checks by chart",
    "appendix.grid_intro": (
        "Each chart's passed checks with what was measured. The rule and threshold of each check "
        "are under “Rules”."
    ),
    "appendix.chart_line": "{title} · page {page} · {counts}",
    "appendix.not_applicable_line": "Not applicable to this chart's form (not counted): {checks}.",
    "appendix.rules_title": "Rules",
    "appendix.rules_intro": (
        "What each check measures and the threshold it applies, once for the whole pack; the rows"
        " above name the check."
    ),
    "appendix.rule": "Rule",
    "appendix.threshold": "Threshold",
    "appendix.source": "Source",
    "appendix.fingerprint": "Definition fingerprint (SHA-256 of the definition as received): {fingerprint}",
    "appendix.count": "{count} checks",
    "appendix.status_passed": "passed",
    "appendix.status_corrected": "corrected",
    "appendix.status_waived": "waived",
    "appendix.status_failed": "failed",
    "appendix.status_advice": "advice",
    "appendix.status_not_applicable": "not applicable",
    # -- checks' findings --------------------------------------------------------------------------
}
