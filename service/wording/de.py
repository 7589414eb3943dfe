"""The pack's words in German (catalogue ``de``); see ``service.wording``."""

WORDS: dict[str, str] = {
    # -- cover and contents ------------------------------------------------------------------
    # -- page headings, footers and page furniture ----------------------------------------------
    # -- chart keys (legends) and mark kinds -----------------------------------------------------
    # -- tables ------------------------------------------------------------------------------------
    "table.no_data": "keine Daten",
    "table.partial": "unvollständig: {done}",
    "table.days": "{elapsed} von {total} Tagen",
    "table.day": "{elapsed} von {total} Tag",
    "table.estimate_header": "{label}, Schätzung",
    "table.estimates_note": "Schätzungen, keine Istwerte: {columns}.",
    "table.continued": "{title} (Fortsetzung)",
    "table.total": "Summe",
    "table.total_of_shown": "Summe der {count} gezeigten Zeilen",
    "table.total_incomplete": "{total} ({count} Zeiträume ohne Daten oder unvollständig)",
    "table.total_incomplete_one": "{total} (1 Zeitraum ohne Daten oder unvollständig)",
    "table.rows_left_out": (
        "{count} weitere Zeilen ausgelassen (die Tabelle zeigt die ersten {shown})."
    ),
    "table.row_left_out": "1 weitere Zeile ausgelassen (die Tabelle zeigt die ersten {shown}).",
    "table.missing_not_shown": "Keine Daten für {periods}, nicht unter den gezeigten Zeilen.",
    "table.measured_of": "{part} von {whole}",
    "table.measured_unshown": "{count} nicht gezeigt",
    "table.check_missing_ok": (
        "{missing} von {expected} Zeiträumen ohne Daten, jeder als Zeile "
        "mit „keine Daten“ gezeigt oder unter der Tabelle genannt."
    ),
    "table.check_missing_none": (
        "Alle {expected} erwarteten Zeiträume haben Daten und sind aufgeführt."
    ),
    "table.check_missing_bad": (
        "Zeiträume ohne Daten, die die Tabelle weder aufführt noch nennt: {periods}."
    ),
    "table.check_partial_ok": "{period} ist unvollständig ({done}) und so gekennzeichnet.",
    "table.check_partial_bad": "{period} ist unvollständig ({done}), aber nicht so gekennzeichnet.",
    "table.check_estimates_ok": (
        "Im Tabellenkopf als Schätzung gekennzeichnet und unter der Tabelle genannt: {columns}."
    ),
    "table.check_estimates_bad": "Nicht gekennzeichnete Schätzungen: {columns}.",
    "table.check_totals_ok": (
        "Summen von Größen, die sich addieren lassen, passend zu den gezeigten Zeilen: {columns}."
    ),
    "table.check_totals_bad": "Summen, die falsch sind oder sich nicht addieren lassen: {columns}.",
    "table.check_left_out_ok": (
        "{shown} von {rows} Zeilen gezeigt; die Tabelle sagt, dass {left_out} ausgelassen wurden."
    ),
    "table.check_left_out_bad": (
        "{shown} von {rows} Zeilen gezeigt, aber "
        "die Tabelle sagt, dass {left_out} ausgelassen wurden."
    ),
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
