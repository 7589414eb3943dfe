"""The pack's words in German (catalogue ``de``); see ``service.wording``."""

WORDS: dict[str, str] = {
    # -- cover and contents ------------------------------------------------------------------
    "cover.period": "Berichtszeitraum",
    "cover.period_range": "{start} bis {end}",
    "cover.as_of": "Datenstand",
    "cover.owner": "Verantwortlich",
    "cover.audience": "Zielgruppe",
    "cover.report_id": "Berichtskennung",
    "cover.review": "Prüfstatus",
    "cover.figures": "Kennzahlen",
    "cover.figure": "Kennzahl",
    "cover.latest": "Letzter Wert",
    "cover.change": "Veränderung",
    "cover.checks": "Prüfungen des Diagramms",
    "cover.change_since": "{change} gegenüber {period}",
    "cover.no_earlier": "kein früherer Wert",
    "cover.estimate": "Schätzung",
    "cover.partial": "unvollständiger Zeitraum",
    "cover.figure_missing": "Das Diagramm hat keine Kennzahl namens „{name}“; es hat: {names}.",
    "cover.contents": "Inhalt",
    "cover.integrity": "Integrität: {counts}. Der Anhang führt jede Prüfung jedes Diagramms auf.",
    "cover.all_passed": "alle {count} bestanden",
    # -- page headings, footers and page furniture ----------------------------------------------
    "page.number": "Seite {page} von {pages}",
    "page.chart_on_page": "{title} (Seite {page})",
    "page.source": "Quelle: {source}",
    "page.text_alternative": "Textalternative:",
    "page.checks_line": "{counts} (Einzelheiten im Anhang, Seite {page}).",
    "page.failed": "NICHT BESTANDEN: {checks}",
    "page.caution": (
        "Diese Prüfungen unterstützen das Urteil der Berichtsverantwortlichen, die für diesen "
        "Bericht geltenden Berichtsstandards und die fachliche Durchsicht, ersetzen sie aber "
        "nicht. Eine bestandene Prüfung zeigt, dass eine Regel eingehalten wurde, nicht, dass die"
        " Zahlen stimmen."
    ),
    # -- chart keys (legends) and mark kinds -----------------------------------------------------
    # -- tables ------------------------------------------------------------------------------------
    # -- text alternatives, reading guides, verdicts and notes -----------------------------------------
    # -- appendix ----------------------------------------------------------------------------------
    "appendix.title": "Integritätsprüfungen",
    "appendix.intro": (
        "{counts}. Zuerst die Prüfungen, die die Aufmerksamkeit der Prüfenden brauchen, dann die "
        "bestandenen Prüfungen je Diagramm, dann die Regeln der Prüfungen, jede einmal "
        "beschrieben."
    ),
    "appendix.meanings": (
        "korrigiert: die Definition verlangte etwas, das die Regel verletzt, und stattdessen "
        "wurde die ehrliche Form gezeichnet. ausgenommen: die Verletzung wurde akzeptiert, mit "
        "Begründung und Namen. nicht bestanden: die Regel ist verletzt, und der Bericht kann erst"
        " freigegeben werden, wenn dies behoben oder ausgenommen ist. Hinweis: für Lesende "
        "bemerkenswert, blockiert nie. nicht anwendbar: die Form des Diagramms kann die Regel "
        "nicht verletzen, daher zählt sie nicht als bestanden."
    ),
    "appendix.summary_title": "Prüfungen, die Aufmerksamkeit brauchen",
    "appendix.summary_none": (
        "Jede anwendbare Prüfung ist bestanden: nichts braucht die Aufmerksamkeit der Prüfenden."
    ),
    "appendix.chart": "Diagramm",
    "appendix.check": "Prüfung",
    "appendix.status": "Status",
    "appendix.measured": "Gemessen",
    "appendix.done": "Was geschah",
    "appendix.why": "Warum",
    "appendix.done_corrected": "Korrigiert: {correction}",
    "appendix.done_corrected_to": "Jetzt: {after}.",
    "appendix.done_waived": "Ausgenommen von {by}.",
    "appendix.done_waived_until": "Ausgenommen von {by}, bis {until}.",
    "appendix.done_failed": (
        "Noch nichts: der Bericht kann erst freigegeben werden, wenn dies behoben oder "
        "ausgenommen ist."
    ),
    "appendix.done_advice": "Den Lesenden mitgeteilt; ein Hinweis blockiert nie.",
    "appendix.reason": "Begründung: {reason}",
    "appendix.grid_title": "Bestandene Prüfungen je Diagramm",
    "appendix.grid_intro": (
        "Die bestandenen Prüfungen jedes Diagramms mit dem gemessenen Wert. Regel und Schwelle "
        "jeder Prüfung stehen unter „Regeln“."
    ),
    "appendix.chart_line": "{title} · Seite {page} · {counts}",
    "appendix.not_applicable_line": (
        "Für die Form dieses Diagramms nicht anwendbar (nicht gezählt): {checks}."
    ),
    "appendix.rules_title": "Regeln",
    "appendix.rules_intro": (
        "Was jede Prüfung misst und welche Schwelle sie anlegt, einmal für den ganzen Bericht; "
        "die Zeilen oben nennen die Prüfung."
    ),
    "appendix.rule": "Regel",
    "appendix.threshold": "Schwelle",
    "appendix.source": "Quelle",
    "appendix.fingerprint": (
        "Fingerabdruck der Definition (SHA-256 der Definition wie empfangen): {fingerprint}"
    ),
    "appendix.count": "{count} Prüfungen",
    "appendix.status_passed": "bestanden",
    "appendix.status_corrected": "korrigiert",
    "appendix.status_waived": "ausgenommen",
    "appendix.status_failed": "nicht bestanden",
    "appendix.status_advice": "Hinweis",
    "appendix.status_not_applicable": "nicht anwendbar",
    # -- checks' findings --------------------------------------------------------------------------
}
