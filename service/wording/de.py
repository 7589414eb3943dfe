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
    "finding.same_measure.alone": "Kein anderer Datensatz des Berichts enthält diese Messgröße; es "
    "gibt nichts zu vergleichen.",
    "finding.same_measure.agrees": "{measures}: Jede Periode, die auch ein anderer Datensatz des "
    "Berichts abdeckt, hat dort denselben Wert ({periods} verglichen).",
    "finding.same_measure.differs": "{measure} für {period} ist {value} im Datensatz „{dataset}“, "
    "aber {other_value} im Datensatz „{other}“",
    "finding.same_measure.missing": "{measure} für {period} hat keine Daten im Datensatz "
    "„{dataset}“, aber {other_value} im Datensatz „{other}“",
    "finding.same_measure.more": "und {count} weitere",
    "finding.same_measure.failed": "Der Bericht gibt einer Messgröße zwei Werte für dieselbe "
    "Periode: {cases}. Korrigieren Sie die Daten, sodass jeder Datensatz dasselbe erzählt; eine "
    "andere Messgröße braucht einen eigenen Spaltennamen.",
    "finding.same_measure.shown_alone": "kein anderer Datensatz",
    "finding.same_measure.shown_agree": "{periods} verglichen, alle gleich",
    "finding.same_measure.shown_contradictions": "Widersprüche: {count}",
}
