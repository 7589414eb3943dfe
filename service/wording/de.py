"""The pack's words in German (catalogue ``de``); see ``service.wording``."""

WORDS: dict[str, str] = {
    # -- cover and contents ------------------------------------------------------------------
    # -- page headings, footers and page furniture ----------------------------------------------
    # -- chart keys (legends) and mark kinds -----------------------------------------------------
    # -- tables ------------------------------------------------------------------------------------
    # -- text alternatives, reading guides, verdicts and notes -----------------------------------------
    # -- scales (axis ranges, off-scale marks) ------------------------------------------------------
    "scale.off_scale_below": "{period} bisher ({completeness}): {values}, unterhalb der Skala",
    "scale.off_scale_above": "{period} bisher ({completeness}): {values}, oberhalb der Skala",
    "scale.end_ok": "Die Werteachse endet bei der nächsten runden Zahl über den Daten.",
    "scale.end_high": (
        "Die Werteachse reicht bis {hi}, einen ganzen Teilstrich oder mehr über den größten "
        "gezeigten Wert ({top})."
    ),
    "scale.end_low": (
        "Die Werteachse beginnt bei {lo}, einen ganzen Teilstrich oder mehr unter dem kleinsten "
        "gezeigten Wert ({bottom})."
    ),
    "scale.end_percent": (
        "Die Prozentachse reicht bis {hi}, über 100 % hinaus, obwohl kein Wert über {top} liegt."
    ),
    "scale.partial_ok": (
        "Die vollständigen Zeiträume nutzen {share} % der Diagrammhöhe; die Werte des laufenden "
        "Zeitraums liegen auf der Skala oder sind außerhalb markiert."
    ),
    "scale.partial_squeezed": (
        "Die vollständigen Zeiträume nutzen nur {share} % der Diagrammhöhe: der laufende Zeitraum "
        "bestimmt die Skala."
    ),
    "scale.partial_unmarked": (
        "Die vollständigen Zeiträume nutzen {share} % der Diagrammhöhe, aber ein Wert des laufenden "
        "Zeitraums liegt ohne Markierung außerhalb der Skala."
    ),
    # -- appendix ----------------------------------------------------------------------------------
    # -- checks' findings --------------------------------------------------------------------------
}
