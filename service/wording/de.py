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
    "key.partial_actual": "Istwert bisher, Zeitraum nicht abgeschlossen",
    "key.estimate": "Schätzung, kein Istwert",
    "key.projection": "Hochrechnung für den ganzen Zeitraum",
    "key.target": "Ziel",
    "key.signal": "Signal: mehr als gewöhnliche Streuung",
    "key.no_data": "Keine Daten",
    "key.interval": "Unsicherheitsbereich des Werts",
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
        "Die vollständigen Zeiträume nutzen {share} der Diagrammhöhe; die Werte des laufenden "
        "Zeitraums liegen auf der Skala oder sind außerhalb markiert."
    ),
    "scale.partial_squeezed": (
        "Die vollständigen Zeiträume nutzen nur {share} der Diagrammhöhe: der laufende Zeitraum "
        "bestimmt die Skala."
    ),
    "scale.partial_unmarked": (
        "Die vollständigen Zeiträume nutzen {share} der Diagrammhöhe, aber ein Wert des laufenden "
        "Zeitraums liegt ohne Markierung außerhalb der Skala."
    ),
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
    "appendix.status_advice_many": "Hinweise",
    "appendix.status_not_applicable": "nicht anwendbar",
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
    "text.no_data": "keine Daten",
    "text.pp_long": "{value} Prozentpunkte",
    "text.pp_short": "{value} Pp.",
    "text.days_of_one": "{elapsed} von {total} Tag",
    "text.days_of": "{elapsed} von {total} Tagen",
    "text.estimate_of": "{name} (Schätzung)",
    "text.estimates_note": "Schätzungen, keine Istwerte (gestrichelt oder als hohle Raute): {names}.",
    "text.no_projection": "Keine Hochrechnung: Der letzte Zeitraum war zum Datenstand abgeschlossen.",
    "text.log_note": (
        "Logarithmische Skala: Gleiche Abstände zeigen gleiche Verhältnisse, nicht gleiche Differenzen."
    ),
    "text.scale_note": (
        "Die Skala beginnt bei {start}, nicht bei null: Positionen vergleichen, nicht Längen."
    ),
    "text.truncation_note": (
        "Die Balken beginnen bei {start}, nicht bei null: Ihre Längen übertreiben die Unterschiede."
    ),
    "text.and": "{first} und {last}",
    "text.row": "Zeile",
    "text.scatter_guide": (
        "Jeder Punkt ist eine Einheit „{what}“: Weiter rechts heißt mehr {x}, weiter oben mehr {y}."
    ),
    "text.fit_guide": (
        "Die Linie ist die Ausgleichsgerade nach der Methode der kleinsten Quadrate ({r2}: Sie erklärt "
        "{share} der Streuung von {y}); sie zeigt einen Zusammenhang, keine Ursache."
    ),
    "text.dropped_one": "1 Zeile ohne beide Werte wird nicht gezeigt.",
    "text.dropped": "{count} Zeilen ohne beide Werte werden nicht gezeigt.",
    "text.horizontal_scale_note": (
        "Die waagerechte Skala beginnt bei {start}, nicht bei null: Positionen vergleichen, nicht "
        "Längen."
    ),
    "text.histogram_guide": "Jeder Balken zählt die Werte von {name} zwischen seinen Grenzen.",
    "text.values_in_all": "Insgesamt {count} Werte.",
    "text.box_guide": (
        "Die Box umfasst die mittlere Hälfte der Werte von {name} (von Q1 bis Q3); die Linie darin ist "
        "der Median; die Antennen reichen bis zu den äußersten Werten innerhalb von 1,5 Boxlängen; "
        "Punkte sind Werte darüber hinaus."
    ),
    "text.missing_value_one": "1 Zeile hat keinen Wert für {name}: weggelassen, nicht als null gezählt.",
    "text.missing_values": (
        "{count} Zeilen haben keinen Wert für {name}: weggelassen, nicht als null gezählt."
    ),
    "text.observations": "Beobachtungen",
    "text.count_axis": "Anzahl der Werte",
    "text.all": "Alle",
    "text.generic_histogram_guide": "Jeder Balken zählt die Werte zwischen seinen Grenzen.",
    "text.generic_box_guide": (
        "Die Box umfasst die mittlere Hälfte der Werte (von Q1 bis Q3); die Linie darin ist der "
        "Median; die Antennen reichen bis zu den äußersten Werten innerhalb von 1,5 Boxlängen; Punkte "
        "sind Werte darüber hinaus."
    ),
    "text.generic_scatter_guide": (
        "Jeder Punkt ist eine Zeile: Weiter rechts heißt mehr vom waagerechten Maß, weiter oben mehr "
        "vom senkrechten."
    ),
    "text.share_note": "Prozentanteile am Ganzen ({total}); sie ergeben zusammen 100.",
    "text.target_line": "Ziel {value}",
    "text.no_target": "Kein Ziel angegeben für: {names}.",
    "text.deviation_note": "Die Balken zeigen Ist minus Ziel.",
    "text.one_target": "Das Ziel ist {value} für jede Kategorie.",
    "text.minus_target": "{name} minus Ziel",
    "text.pp_unit": "Prozentpunkte",
    "text.on_target": "im Ziel",
    "text.rule1_above": "Regel 1: jenseits der oberen Grenze",
    "text.rule1_below": "Regel 1: jenseits der unteren Grenze",
    "text.rule2_above": "Regel 2: 2 von 3 mehr als 2 Sigma darüber",
    "text.rule2_below": "Regel 2: 2 von 3 mehr als 2 Sigma darunter",
    "text.rule3_above": "Regel 3: 4 von 5 mehr als 1 Sigma darüber",
    "text.rule3_below": "Regel 3: 4 von 5 mehr als 1 Sigma darunter",
    "text.rule4_above": "Regel 4: {run} in Folge über der Mittellinie",
    "text.rule4_below": "Regel 4: {run} in Folge unter der Mittellinie",
    "text.too_little_history": "Zu wenig Verlauf für ein Urteil ({count} von {needed} Punkten)",
    "text.centre_line": "Mittellinie {value}",
    "text.upper_limit": "obere natürliche Prozessgrenze {value}",
    "text.lower_limit": "untere natürliche Prozessgrenze {value}",
    "text.limits_band": "Grenzen {lo} bis {hi}; Grenze der gleitenden Spannweite {range}",
    "text.no_change_to_judge": "Keine Veränderung zu beurteilen für {period} (kein Wert im Zeitraum davor)",
    "text.latest_change": "Letzte Veränderung {change} ({before} bis {after})",
    "text.range_beyond": "gleitende Spannweite jenseits ihrer Grenze",
    "text.signal_verdict": "{opening}: Signal ({why}; {band})",
    "text.routine_verdict": "{opening}: im Rahmen der üblichen Schwankung ({band})",
    "text.signal_rule": "{period}: Signal (Regel {rules})",
    "text.signal_rules": "{period}: Signal (Regeln {rules})",
    "text.measure_in_unit": "{name} in {unit}",
    "text.change_since": "Veränderung in % seit {base}",
    "text.index_unit": "Index ({base} = 100)",
    "text.base_line": "{base} = {value}",
    "text.change_opening": "Veränderung seit {base}, in %.",
    "text.index_opening": "Indexiert: {base} = 100.",
    "text.units_differ_only": (
        "Die Einheiten unterscheiden sich ({differ}), daher wird nur die Veränderung verglichen."
    ),
    "text.only_change": "Nur die Veränderung wird verglichen.",
    "text.panels_units_differ": (
        "Die Einheiten unterscheiden sich ({differ}): Jedes Feld hat eine eigene Skala, also die Form "
        "jeder Linie vergleichen, nicht die Höhen über Felder hinweg."
    ),
    "text.panels_note": (
        "Jedes Feld hat eine eigene Skala, also die Form jeder Linie vergleichen, nicht die Höhen über "
        "Felder hinweg."
    ),
    "text.form_bars": "Balkendiagramm",
    "text.form_dots": "Punktdiagramm",
    "text.form_deviation": "Diagramm der Abweichungen vom Ziel",
    "text.form_pie": "Kreisdiagramm",
    "text.form_lines": "Liniendiagramm",
    "text.form_control": "Diagramm der Werte mit ihren natürlichen Prozessgrenzen",
    "text.form_panels": "Ausgerichtete Felder",
    "text.form_histogram": "Histogramm",
    "text.form_box": "Boxplot",
    "text.form_scatter": "Streudiagramm",
    "text.opening": "{form}: {title}",
    "text.one_category": "{count} Kategorie",
    "text.categories": "{count} Kategorien",
    "text.highest": "am höchsten {name} ({value})",
    "text.lowest": "am niedrigsten {name} ({value})",
    "text.no_data_for": "keine Daten für {names}",
    "text.no_data_for_more": "keine Daten für {names} und weitere",
    "text.one_period": "nur {period}",
    "text.period_range": "{first} bis {last}",
    "text.series_one": "{name} {value} ({period})",
    "text.series_from_to": "{name} von {first} ({first_period}) bis {last} ({last_period})",
    "text.partial_period": "{period} ist unvollständig ({done})",
    "text.bins": (
        "{total} Werte, in Klassen von {lo} bis {hi}; die vollste Klasse ist {top_lo} bis {top_hi} "
        "({count})"
    ),
    "text.box": "{name}: Median {median}, mittlere Hälfte {q1} bis {q3} (n = {n})",
    "text.points": "{count} Punkte",
    "text.points_fit": "{count} Punkte; r² = {r2}",
    "text.corrected_by": "Von den Prüfungen korrigiert: {checks}.",
    "text.failed_checks": "Nicht bestandene Prüfungen: {checks}.",
    "text.so_far": "{period} bisher:\n{done}",
    "text.beyond_chance": "Die Unterschiede zwischen den {things} gehen über den Zufall hinaus ({test}).",
    "text.may_be_chance": (
        "Die Unterschiede zwischen den {things} können Zufall sein ({test}): keine Rangfolge bilden."
    ),
    "text.intervals_apart": (
        "Die Intervalle ({level}) überlappen für {count} von {pairs} Paaren der {things} nicht "
        "({listed}); Überlappung beweist keine Gleichheit."
    ),
    "text.intervals_overlap": (
        "Die {level}-Intervalle aller {things} überlappen: Die Unterschiede können Zufall sein."
    ),
    "text.undecided": "Zu wenige {things} haben ein Intervall, um ihre Unterschiede zu beurteilen.",
    "text.values_labelled": (
        "Die Werte sind beschriftet: Das Diagramm allein löst nur etwa {chart} auf; Lesende brauchen "
        "{need}."
    ),
    "text.shared_scale": "Die Felder teilen eine Skala, daher lassen sich ihre Höhen vergleichen.",
    "text.source_unstated": "Datensatz „{dataset}“, geliefert von {owner}; keine Quelle angegeben.",
    # -- appendix ----------------------------------------------------------------------------------
    # -- checks' findings --------------------------------------------------------------------------
    "finding.estimate_series": "Schätzreihen: {count}",
    "finding.estimates_ok": (
        "Gestrichelt gezeichnet, beschriftet und aufgeführt: {names}; nie mit den Istwerten verbunden."
    ),
    "finding.estimates_unmarked": "Schätzungen nicht als Schätzungen gezeichnet: {names}.",
    "finding.estimates_unlisted": "Schätzungen nicht auf dem Diagramm aufgeführt.",
    "finding.actuals_only": "Das Diagramm zeigt nur Istwerte.",
    "finding.last_complete": "Der letzte Zeitraum, {period}, war zum Datenstand abgeschlossen.",
    "finding.complete_drawn_partial": (
        "{period} war zum Datenstand abgeschlossen, ist aber als unvollständig gezeichnet."
    ),
    "finding.partial_drawn": (
        "{period} war zum Datenstand {done} alt: als hohler Punkt gezeichnet, nicht mit der Linie "
        "verbunden und beschriftet, damit er nicht als Einbruch gelesen wird."
    ),
    "finding.partial_not_drawn": (
        "{period} war zum Datenstand erst {done} alt, ist aber wie ein vollständiger Zeitraum "
        "gezeichnet."
    ),
    "finding.pie_too_many": "{count} Teile, mehr als {most}",
    "finding.pie_no_value": "kein Teil hat einen Wert",
    "finding.pie_zero_part": "ein Teil von null oder weniger hat kein Segment",
    "finding.pie_too_close": (
        "{small} und {large} unterscheiden sich um {points} und ×{ratio}, weniger als {min_points} und "
        "×{min_ratio}"
    ),
    "finding.no_whole": "Kein Ganzes angegeben: Die Anteile beziehen sich auf die Summe der Teile, {sum}.",
    "finding.against": "{value} gegenüber {other}",
    "finding.sum_within": (
        "Die Teile ergeben {sum}, innerhalb von {allowed} des angegebenen Ganzen {whole}."
    ),
    "finding.sum_apart": (
        "Die Teile ergeben {sum}, das angegebene Ganze ist aber {whole}: {apart} Abstand, mehr als die "
        "Toleranz von {allowed}. Die Daten oder das angegebene Ganze korrigieren."
    ),
    "finding.no_negative": "Kein Teil ist negativ.",
    "finding.negative_one": (
        "{count} Teil ist negativ: {listed}. Ein Teil eines Ganzen kann nicht weniger als nichts sein; "
        "stattdessen als Veränderung zeigen (ein Vergleichsdiagramm)."
    ),
    "finding.negative": (
        "{count} Teile sind negativ: {listed}. Ein Teil eines Ganzen kann nicht weniger als nichts "
        "sein; stattdessen als Veränderung zeigen (ein Vergleichsdiagramm)."
    ),
    "finding.count_negative": "{count} negativ",
    "finding.parts_absent": "{count} von {total} erwarteten Teilen fehlen in den Daten: {names}.",
    "finding.parts_not_shown": "{count} von {total} nicht gezeigt",
    "finding.none_listed": "keine aufgeführt",
    "finding.no_expected": "Es sind keine erwarteten Teile aufgeführt.",
    "finding.parts_shown_flagged": (
        "Alle {total} erwarteten Teile werden gezeigt ({names} als „erwartet, keine Daten“)."
    ),
    "finding.parts_shown": "Alle {total} erwarteten Teile werden gezeigt.",
    "finding.all_shown": "alle gezeigt",
    "finding.no_labels": "keine Beschriftungen",
    "finding.sum_of": "Summe {value}",
    "finding.labels_missing": (
        "Es werden keine Prozentbeschriftungen gezeigt; {names} tragen nicht den Anteil nach größtem "
        "Rest."
    ),
    "finding.labels_wrong": (
        "Die Beschriftungen ergeben {total}; {names} tragen nicht den Anteil nach größtem Rest."
    ),
    "finding.no_shares": "Es werden keine Prozente gezeigt: Die Teile haben keine Anteile.",
    "finding.labels_ok": (
        "Die Prozentbeschriftungen ergeben 100 (größter Rest; bei gleichen Resten erhält der in den "
        "Daten erste Teil den Vorzug)."
    ),
    "finding.parts": "{count} Teile",
    "finding.parts_closest": "{count} Teile, am engsten {points} auseinander (×{ratio})",
    "finding.bars_measured": "Balken; {shown}",
    "finding.as_bars": "Als Balken gezeichnet: {shown}.",
    "finding.pie_ok": "Das Kreisdiagramm ist lesbar: {shown}, jedes Paar unterscheidbar.",
    "finding.pie_bad": "Ein Kreisdiagramm dieser Teile ist nicht lesbar: {problem}.",
    "finding.bars_from_zero": "Die Balken beginnen bei null.",
    "finding.bars_asked_from": (
        "Die Definition verlangte Balken ab {start}; ihre Längen würden die Unterschiede übertreiben."
    ),
    "finding.starts_at": "beginnt bei {start}",
    "finding.includes_zero": "enthält 0",
    "finding.axis_includes_zero": "Die Werteachse enthält null.",
    "finding.scale_noted": "Die Skala {shown}, und das Diagramm sagt es.",
    "finding.scale_not_noted": "Die Skala {shown}, aber das Diagramm sagt es nicht.",
    "finding.no_effect": (
        "Weniger als zwei verschiedene Werte ungleich null: kein Effekt, der übertrieben werden könnte."
    ),
    "finding.lengths_proportional": (
        "Die gezeichneten Längen sind proportional zu den Werten (Lügenfaktor {factor})."
    ),
    "finding.lengths_exaggerate": (
        "Die gezeichneten Längen übertreiben die Unterschiede {factor}-fach (Lügenfaktor {factor}, "
        "außerhalb von {low}–{high})."
    ),
    "finding.axis_lacks_periods": "die Zeitachse enthält nicht jeden erwarteten Zeitraum",
    "finding.value_drawn_at": "{name} hat einen gezeichneten Wert bei {period}",
    "finding.joined_across": "{name} ist über {period} hinweg verbunden",
    "finding.gap_unmarked": "{period} ist für {name} nicht als „keine Daten“ markiert",
    "finding.and_more": "{listed} und {more} weitere",
    "finding.period": "{count} Zeitraum",
    "finding.periods": "{count} Zeiträume",
    "finding.gaps_but": "{shown} ohne Daten, aber {problems}.",
    "finding.no_gaps": "Jeder erwartete Zeitraum von {first} bis {last} hat Daten.",
    "finding.gaps_ok": (
        "{shown} ohne Daten ({listed}): Die Linie ist dort unterbrochen und als „keine Daten“ "
        "markiert; nichts wird aufgefüllt."
    ),
    "finding.categories": "Kategorien",
    "finding.anova": "einfaktorielle Varianzanalyse F = {f}, {p}",
    "finding.distinguishable_p": "unterscheidbar ({p})",
    "finding.not_distinguishable_p": "nicht unterscheidbar ({p})",
    "finding.anova_apart": (
        "Die Unterschiede zwischen den {things} sind unterscheidbar: {test} (auf dem Niveau von "
        "{level} weicht mindestens eine über den Zufall hinaus ab; nicht jedes Paar muss sich "
        "unterscheiden)."
    ),
    "finding.anova_chance": (
        "Die Unterschiede zwischen den {things} sind nicht vom Zufall unterscheidbar: {test} (nicht "
        "signifikant auf dem Niveau von {level})."
    ),
    "finding.pairs_apart_one": "{count} von {pairs} Paar getrennt",
    "finding.pairs_apart": "{count} von {pairs} Paaren getrennt",
    "finding.intervals_apart": (
        "Die Unterschiede zwischen den {things} sind für {count} von {pairs} Paaren unterscheidbar "
        "({listed}): Ihre {level}-Intervalle überlappen nicht; überlappende Intervalle beweisen keine "
        "Gleichheit der Werte."
    ),
    "finding.intervals_overlap": (
        "Jedes Paar der {things} hat überlappende {level}-Intervalle, daher ist kein Unterschied klar "
        "unterscheidbar; überlappende Intervalle beweisen keine Gleichheit der Werte."
    ),
    "finding.too_few_intervals": "zu wenige Intervalle",
    "finding.undecided": (
        "Weniger als zwei {things} haben ein Intervall, daher lassen sich ihre Unterschiede nicht "
        "beurteilen."
    ),
    "finding.no_uncertainty": "Die Daten geben keine Unsicherheit für diese Werte an.",
    "finding.intervals_not_drawn": "die Intervalle von {names} sind nicht wie angegeben gezeichnet",
    "finding.verdict_not_said": "das Diagramm sagt nicht, ob die Unterschiede echt sind",
    "finding.but": "Aber {problems}.",
    "finding.no_precision": "Von diesem Diagramm wird keine Genauigkeit verlangt.",
    "finding.not_asked": "nicht verlangt",
    "finding.no_values_to_read": "Das Diagramm zeigt keine ablesbaren Werte.",
    "finding.no_values": "keine Werte",
    "finding.chart_alone": "das Diagramm allein löst etwa {res} auf (0,5 mm bei {per_mm} je mm)",
    "finding.about": "etwa {value}",
    "finding.precision_ok": "{alone}; Lesende brauchen {need}.",
    "finding.precision_labelled": (
        "Die Werte sind beschriftet: {alone}, gröber als die {need}, die Lesende brauchen."
    ),
    "finding.labelled_about": "beschriftet (Diagramm allein etwa {value})",
    "finding.precision_short": "Lesende müssen {need} unterscheiden, aber {alone}.",
    "finding.labels_round": "Seine Beschriftungen runden auf {step}.",
    "finding.split_shared": "aufgeteilt in {panels} Felder mit einer gemeinsamen Skala",
    "finding.split_own": "aufgeteilt in {panels} Felder mit verschiedenen Skalen",
    "finding.panels_ok": (
        "Die Reihen sind in {panels} Feldern mit einer gemeinsamen Skala gezeichnet, in jedem "
        "höchstens {most} farbcodiert."
    ),
    "finding.panels_differ": (
        "Die Reihen sind in {panels} Felder aufgeteilt, aber ihre Skalen unterscheiden sich."
    ),
    "finding.panels_crowded": (
        "Die Reihen sind in {panels} Felder aufgeteilt, aber eines hat {most} farbcodierte Reihen."
    ),
    "finding.other_grey": "{count} weitere in Grau",
    "finding.others_grey": "{count} weitere in Grau",
    "finding.highlighted": "hervorgehoben {names}, {others}",
    "finding.count_series": "Reihen: {count}",
    "finding.highlighted_ok": (
        "Hervorgehoben: {names}; die {others} sind Kontext und müssen nicht unterschieden werden."
    ),
    "finding.series_ok": "Farbcodierte Reihen: {count} (höchstens {most}); jede lässt sich unterscheiden.",
    "finding.series_too_many": (
        "{count} Reihen werden allein durch Farbe unterschieden, mehr als die {most}, die Lesende "
        "zuverlässig ihren Beschriftungen zuordnen können."
    ),
    "finding.units_differ": "sich die Einheiten unterscheiden ({differ})",
    "finding.only_change": "nur die Veränderung verglichen wird",
    "finding.aligned_panels": "ausgerichtete Felder mit je eigener Skala",
    "finding.indexed_change": "Veränderung in % seit {base}",
    "finding.indexed_100": "Index mit {base} = 100",
    "finding.drawn_instead": (
        "Gezeichnet als {chosen}, weil {why}: nie zwei y-Achsen, denn mit der Wahl zweier Skalen "
        "ließen sich beliebige zwei Linien scheinbar kreuzen oder gleichlaufen."
    ),
    "finding.axis_per_panel": "1 Werteachse in jedem von {count} Feldern",
    "finding.one_axis": "1 Werteachse",
    "finding.no_second_axis": (
        "{shown}: Diese Form kann keine zweite y-Achse zeichnen, zwei y-Achsen sind also unmöglich."
    ),
    "finding.points": "{most} Punkte",
    "finding.points_over": (
        "{names}: {shown}, mehr als die {limit} (4 je Pixelspalte), die eine Linie von {width} px "
        "Breite bei {dpi} dpi zeigen kann."
    ),
    "finding.points_reduced": (
        "{before} Punkte wurden mit M4 bei {px} px auf {after} reduziert: Der erste, letzte, "
        "niedrigste und höchste Punkt jeder Pixelspalte bleiben erhalten, die gezeichnete Linie ist "
        "also dieselbe; keine Linie wird über eine Lücke verbunden."
    ),
    "finding.points_m4": "{most} (M4 bei {width} px)",
    "finding.points_gaps": (
        "{shown} in der längsten Reihe, durch Lücken unterbrochen: schon nicht mehr als 4 je "
        "Pixelspalte und gezeichnetem Abschnitt, so wenige, wie M4 behält, ohne über eine Lücke zu "
        "verbinden."
    ),
    "finding.points_ok": (
        "Höchstens {shown} je Reihe: innerhalb der {limit}, die eine Linie von {width} px Breite bei "
        "{dpi} dpi zeigen kann, also wird jeder Punkt gezeichnet."
    ),
    "finding.periods_of": "{drawn} von {count} Zeiträumen",
    "finding.axis_missing": (
        "die Zeitachse setzt nicht jeden erwarteten Zeitraum an seine eigene Stelle (fehlend: {names})"
    ),
    "finding.axis_misplaced": "die Zeitachse setzt nicht jeden erwarteten Zeitraum an seine eigene Stelle",
    "finding.out_of_order": "Punkte von {names} sind nicht in zeitlicher Reihenfolge",
    "finding.own_place": (
        "Jeder der {count} Zeiträume von {first} bis {last} hat seinen eigenen Platz auf der "
        "Zeitachse, eine Lücke behält also ihre Breite."
    ),
    "finding.months_equal": (
        "Kalenderzeiträume haben gleiche Abstände (ein Monat mit 28 Tagen nimmt die Breite eines mit "
        "31 ein)."
    ),
    "finding.linear": "Die Werteachse ist linear.",
    "finding.log_lengths": (
        "Ein Diagramm dieser Form ({form}) nutzt eine logarithmische Werteachse: Die Länge eines "
        "Balkens auf einer logarithmischen Achse codiert nicht seinen Wert. Eine lineare Achse ab null "
        "oder Punkte oder Linien verwenden."
    ),
    "finding.value_axis": "Werteachse",
    "finding.x_axis": "x-Achse",
    "finding.log_not_noted": "Die {names} ist logarithmisch, aber das Diagramm sagt es nicht.",
    "finding.log_noted": "Die Skala ist logarithmisch, und das Diagramm sagt es: {note}",
    "finding.no_guide": "Das Diagramm hat keine Lesehilfe.",
    "finding.guide_lines": "Die Lesehilfe läuft über mehrere Zeilen.",
    "finding.guide": "Lesehilfe: {text}",
    "finding.no_line": "Es ist keine Linie gezeichnet, und keine wurde verlangt.",
    "finding.line_not_asked": (
        "Eine Ausgleichslinie ist gezeichnet, aber die Definition hat keine verlangt."
    ),
    "finding.line_missing": "Die Definition verlangte eine Ausgleichsgerade, aber keine ist gezeichnet.",
    "finding.line_wrong": "Die gezeichnete Linie ist nicht die Ausgleichsgerade der Daten.",
    "finding.r2_not_shown": "Die Ausgleichsgerade ist gezeichnet, aber ihr r² ({r2}) wird nicht gezeigt.",
    "finding.line_ok": "Die verlangte Ausgleichsgerade ist gezeichnet, mit {r2}.",
    "finding.no_bins": "Das Histogramm hat keine Klassen.",
    "finding.bin_no_width": "Eine Klasse endet, wo sie beginnt, oder davor.",
    "finding.bins_apart": (
        "Die Klassen schließen nicht aneinander an: Eine Klasse beginnt nicht dort, wo die vorige "
        "endete."
    ),
    "finding.from_to": "{first} bis {last}",
    "finding.bins_uneven": (
        "Die Klassenbreiten reichen von {widths}: Bei reinen Anzahlen übertreiben die breiteren Balken "
        "ihren Anteil an den Werten."
    ),
    "finding.bins_even": "Jede Klasse ist {width} breit, die Flächen folgen also den Anzahlen.",
    "finding.source": "Quellenzeile: {source}",
    "finding.no_source": "Weder das Diagramm noch sein Datensatz nennt eine Quelle.",
    "finding.words": "{count} Wörter",
    "finding.alternative": "Dem Diagramm ist eine Textalternative beigefügt.",
    "finding.no_alternative": "Das Diagramm hat keine brauchbare Textalternative.",
    "finding.no_verdict": "Die letzte Veränderung ({period}) trägt kein Urteil.",
    "finding.wrong_verdict": "Das gezeigte Urteil „{shown}“ ist nicht, was der Verlauf sagt: „{expected}“.",
    "finding.wrong_limits": "Die gezeichnete Mittellinie und die Grenzen sind nicht die des Verlaufs.",
    "finding.one_colour": "Die Markierungen des Diagramms verwenden eine Farbe.",
    "finding.vision_normal": "normalem Farbsehen",
    "finding.vision_protan": "simuliertem Protan-Sehen (rotblind)",
    "finding.vision_deutan": "simuliertem Deutan-Sehen (grünblind)",
    "finding.vision_tritan": "simuliertem Tritan-Sehen (blaublind)",
    "finding.colours_apart": (
        "Die {count} Farben bleiben bei normalem, Protan-, Deutan- und Tritan-Sehen mindestens ΔE00 "
        "{difference} auseinander (am nächsten: {first} und {second}, bei {seen})."
    ),
    "finding.colour_shared": (
        "Zwei Markierungen teilen die Farbe {first}: Die Palette hat weniger Farben, als das Diagramm "
        "Markierungen hat."
    ),
    "finding.colours_close": (
        "{first} und {second} liegen bei {seen} nur ΔE00 {difference} auseinander (mindestens {least} "
        "ist nötig): Lesende können diese Markierungen nicht unterscheiden."
    ),
    "finding.contrasts": "Markierungen {marks}, Text {text}",
    "finding.text_ink": "Schrift",
    "finding.text_muted_text": "gedämpfter Text",
    "finding.text_flag": "Warnhinweis",
    "finding.contrast_ok": (
        "Jede Markierungsfarbe hat auf Weiß mindestens {marks} Kontrast, Text mindestens {text}."
    ),
    "finding.marks_weak": "die Markierungsfarben {colours} liegen auf Weiß unter 3:1",
    "finding.text_weak": "die Textfarben {colours} liegen auf Weiß unter 4,5:1",
    "finding.hard_to_see": "{parts}: Sie sind schwer zu sehen.",
    "finding.same_month": "demselben Monat ein Jahr zuvor",
    "finding.same_quarter": "demselben Quartal ein Jahr zuvor",
    "finding.same_week": "derselben Woche ein Jahr zuvor",
    "finding.same_day": "demselben Tag eine Woche zuvor",
    "finding.same_point": "demselben Punkt des Zyklus, {lag} zurück",
    "finding.day_one": "{count} Tag",
    "finding.day_many": "{count} Tage",
    "finding.week_one": "{count} Woche",
    "finding.week_many": "{count} Wochen",
    "finding.month_one": "{count} Monat",
    "finding.month_many": "{count} Monate",
    "finding.quarter_one": "{count} Quartal",
    "finding.quarter_many": "{count} Quartale",
    "finding.year_one": "{count} Jahr",
    "finding.year_many": "{count} Jahre",
    "finding.period_one": "{count} Zeitraum",
    "finding.period_many": "{count} Zeiträume",
    "finding.too_short_cycle": "Weniger als {count} Werte: zu kurz, um nach einem Zyklus zu suchen.",
    "finding.no_cycle": "In den Daten wurde kein wiederkehrender Zyklus gefunden.",
    "finding.cycle_evidence": (
        "Die Daten wiederholen sich alle {span} (Autokorrelation {r} bei Verschiebung {lag}, über "
        "{bar})"
    ),
    "finding.cycle_shown": "Zyklus: {span}; gezeigt: {window}",
    "finding.too_few_cycles": (
        "das Diagramm zeigt nur {window}, weniger als zwei Zyklen: mindestens {least} zeigen, damit "
        "der Zyklus nicht als Trend gelesen wird"
    ),
    "finding.pair": "{before} mit {after}",
    "finding.consecutive": "aufeinanderfolgende Zeiträume",
    "finding.compare_phase": (
        "die letzte Veränderung vergleicht {pair}, die an verschiedenen Punkten des Zyklus liegen: "
        "auch mit {same} vergleichen"
    ),
    "finding.cycles_shown": "{evidence}; das Diagramm zeigt {count} Zyklen.",
    "finding.cycle_but": "{evidence}, aber {advice}.",
    "finding.drawn_ratio": "gezeichnet {drawn}",
    "finding.no_slope": (
        "Die Linien haben keine Steigung zum Ausrichten (flach oder weniger als zwei verbundene "
        "Punkte)."
    ),
    "finding.suggests": "empfohlen {suggested}; gezeichnet {drawn}",
    "finding.banking_ok": (
        "Die Ausrichtung auf 45° empfiehlt Höhe/Breite {suggested}; gezeichnet {drawn}: innerhalb "
        "eines Faktors 2, die mittlere Steigung erscheint also nahe 45°."
    ),
    "finding.banking_steep": (
        "Die Ausrichtung auf 45° empfiehlt Höhe/Breite {suggested}; gezeichnet {drawn}: Steigungen "
        "wirken steiler, als sie sind; ein breiteres oder niedrigeres Diagramm zeigte "
        "Steigungsänderungen deutlicher (Rat: 45° ist nicht immer am besten)."
    ),
    "finding.banking_flat": (
        "Die Ausrichtung auf 45° empfiehlt Höhe/Breite {suggested}; gezeichnet {drawn}: Steigungen "
        "wirken flacher, als sie sind; ein höheres oder schmaleres Diagramm zeigte Steigungsänderungen "
        "deutlicher (Rat: 45° ist nicht immer am besten)."
    ),
    "finding.span": "Die Werte nehmen nur {share} der Werteachse ein, was die Linie abflacht.",
    "finding.span_zero": (
        "Die Werte nehmen nur {share} der Werteachse ein (sie beginnt bei null), was die Linie "
        "abflacht."
    ),
    "finding.waived_by": "Ausgenommen durch {by}.",
    "finding.waiver_expired": "Eine Ausnahme ist am {date} abgelaufen und gilt nicht mehr.",
    "finding.correction.expected-parts-shown": (
        "Jeder fehlende Teil wurde dem Diagramm als „erwartet, keine Daten“ hinzugefügt."
    ),
    "finding.correction.shares-sum-to-100": (
        "Die Beschriftungen wurden nach dem Verfahren des größten Rests neu berechnet (bei gleichen "
        "Resten erhält der in den Daten erste Teil den Vorzug)."
    ),
    "finding.correction.pie-readable": (
        "Die Teile wurden stattdessen als Balken ab null gezeichnet, der größte zuerst."
    ),
    "finding.correction.series-count": (
        "Die Fokusreihe wurde hervorgehoben und die übrigen grau gezeichnet; ohne Fokus wurden die "
        "Reihen in Felder mit einer gemeinsamen Skala aufgeteilt."
    ),
    "finding.correction.bar-zero-baseline": "Die Balken wurden stattdessen ab null gezeichnet.",
    "finding.correction.missing-periods": (
        "Die Linie wurde an jedem fehlenden Zeitraum unterbrochen und als „keine Daten“ markiert."
    ),
    "finding.correction.partial-period": (
        "Der letzte Zeitraum wurde hohl gezeichnet und mit seiner Vollständigkeit beschriftet."
    ),
    "finding.correction.estimates-distinct": (
        "Die Schätzungen wurden gestrichelt gezeichnet, beschriftet und auf dem Diagramm aufgeführt."
    ),
    "finding.correction.delta-verdict": (
        "Das Urteil über die letzte Veränderung wurde samt Grenzen aus den Daten neu berechnet und "
        "beigefügt."
    ),
    "finding.correction.uncertainty": (
        "Jedes Intervall wurde gezeichnet, und eine Zeile, ob die Unterschiede echt sind, wurde dem "
        "Diagramm hinzugefügt."
    ),
    "finding.correction.reading-guide": "Die Lesehilfe für die Form wurde dem Diagramm hinzugefügt.",
    "finding.correction.fit-on-request": (
        "Die Linie wurde gezeichnet, wie die Definition es verlangt: die Ausgleichsgerade mit ihrem r² "
        "oder keine Linie."
    ),
    "finding.correction.log-scale-noted": (
        "Ein Hinweis, dass die Skala logarithmisch ist, wurde dem Diagramm hinzugefügt."
    ),
    "finding.correction.many-points": (
        "Jede lange Reihe wurde mit M4 reduziert (erster, letzter, niedrigster und höchster Punkt "
        "jeder Pixelspalte, jeder gezeichnete Abschnitt für sich), was dieselbe Linie zeichnet."
    ),
    "finding.correction.nonzero-scale-noted": (
        "Ein Hinweis, wo die Skala beginnt, wurde dem Diagramm hinzugefügt."
    ),
    "finding.correction.precision": (
        "Jeder Wert wurde auf dem Diagramm beschriftet, mit einem Hinweis auf den Grund."
    ),
    "finding.correction.colour-distinct": (
        "Das Diagramm wurde mit der Hauspalette statt der eigenen gezeichnet."
    ),
    "finding.correction.colour-contrast": (
        "Das Diagramm wurde mit der Hauspalette statt der eigenen gezeichnet."
    ),
    "finding.correction.partial-period-scale": (
        "Die Skala wurde an die abgeschlossenen Zeiträume angepasst; Werte des laufenden "
        "Zeitraums außerhalb davon sind als Marke am Rand mit Wert und Vollständigkeit gezeichnet."
    ),
    "finding.correction.source-line": (
        "Die Quellenzeile nennt stattdessen den Datensatz und den Verantwortlichen des Berichts."
    ),
    "finding.measured.none": "keine",
    "finding.measured.given": "angegeben",
    "finding.measured.one_colour": "eine Farbe",
    "finding.measured.no_cycle": "kein Zyklus",
    "finding.measured.log": "logarithmisch",
    "finding.measured.linear": "linear",
    "finding.measured.signal": "Signal",
    "finding.measured.routine_variation": "übliche Schwankung",
    "finding.measured.too_little_history": "zu wenig Verlauf",
    "finding.measured.complete": "abgeschlossen",
    "finding.measured.log_not_noted": "logarithmisch, nicht vermerkt",
    "finding.measured.no_verdict": "kein Urteil",
    "finding.measured.wrong_verdict": "falsches Urteil",
    "finding.measured.wrong_limits": "falsche Grenzen",
    "finding.measured.no_line": "keine Linie",
    "finding.measured.line_not_asked_for": "Linie nicht verlangt",
    "finding.measured.not_the_least_squares_line": "nicht die Ausgleichsgerade",
    "finding.measured.r²_not_shown": "r² nicht gezeigt",
    "finding.measured.no_bins": "keine Klassen",
    "finding.measured.a_bin_of_no_width": "eine Klasse ohne Breite",
    "finding.measured.bins_apart": "Klassen getrennt",
    "finding.measured.several_lines": "mehrere Zeilen",
    "finding.measured.wrong": "falsch",
    "finding.measured.too_short_to_test": "zu kurz zum Prüfen",
    "finding.measured.no_uncertainty_given": "keine Unsicherheit angegeben",
    "finding.measured.undecided": "unentschieden",
    "finding.measured.no_values": "keine Werte",
}
