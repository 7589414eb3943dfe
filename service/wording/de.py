"""The pack's words in German (catalogue ``de``); see ``service.wording``."""

WORDS: dict[str, str] = {
    # -- cover and contents ------------------------------------------------------------------
    # -- page headings, footers and page furniture ----------------------------------------------
    # -- chart keys (legends) and mark kinds -----------------------------------------------------
    "key.partial_actual": "Istwert bisher, Zeitraum nicht abgeschlossen",
    "key.estimate": "Schätzung, kein Istwert",
    "key.projection": "Hochrechnung für den ganzen Zeitraum",
    "key.target": "Ziel",
    "key.signal": "Signal: mehr als gewöhnliche Streuung",
    "key.no_data": "Keine Daten",
    "key.interval": "Unsicherheitsbereich des Werts",
    # -- tables ------------------------------------------------------------------------------------
    # -- text alternatives, reading guides, verdicts and notes -----------------------------------------
    # -- appendix ----------------------------------------------------------------------------------
    # -- checks' findings --------------------------------------------------------------------------
}
