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
    "key.partial_actual": "Actual so far, period not complete",
    "key.estimate": "Estimate, not an actual",
    "key.projection": "Projection for the whole period",
    "key.target": "Target",
    "key.signal": "Signal: more than routine variation",
    "key.no_data": "No data",
    "key.interval": "Uncertainty interval of the value",
    # -- tables ------------------------------------------------------------------------------------
    "table.no_data": "no data",
    "table.partial": "partial: {done}",
    "table.days": "{elapsed} of {total} days",
    "table.day": "{elapsed} of {total} day",
    "table.estimate_header": "{label}, estimate",
    "table.estimates_note": "Estimates, not actuals: {columns}.",
    "table.continued": "{title} (continued)",
    "table.total": "Total",
    "table.total_of_shown": "Total of the {count} rows shown",
    "table.total_incomplete": "{total} ({count} periods without data or partial)",
    "table.total_incomplete_one": "{total} (1 period without data or partial)",
    "table.rows_left_out": "{count} more rows left out (the table shows the first {shown}).",
    "table.row_left_out": "1 more row left out (the table shows the first {shown}).",
    "table.missing_not_shown": "No data for {periods}, not among the rows shown.",
    "table.measured_of": "{part} of {whole}",
    "table.measured_unshown": "{count} not shown",
    "table.check_missing_ok": (
        "{missing} of {expected} periods without data, each shown as "
        "a row reading 'no data' or named under the table."
    ),
    "table.check_missing_none": "All {expected} expected periods have data and are listed.",
    "table.check_missing_bad": (
        "Periods without data that the table neither lists nor names: {periods}."
    ),
    "table.check_partial_ok": "{period} is partial ({done}) and marked so.",
    "table.check_partial_bad": "{period} is partial ({done}) but not marked so.",
    "table.check_estimates_ok": (
        "Marked as estimates in the header and listed under the table: {columns}."
    ),
    "table.check_estimates_bad": "Estimates not marked: {columns}.",
    "table.check_totals_ok": "Totals of measures that add up, matching the rows shown: {columns}.",
    "table.check_totals_bad": "Totals that are wrong or do not add up: {columns}.",
    "table.check_left_out_ok": (
        "{shown} of {rows} rows shown; the table says {left_out} were left out."
    ),
    "table.check_left_out_bad": (
        "{shown} of {rows} rows shown, but the table says {left_out} were left out."
    ),
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
    "scale.end_percent": "The percentage axis runs to {hi}, past 100%, though no value is above {top}.",
    "scale.partial_ok": (
        "The complete periods use {share} of the plot height; the partial period's values are on "
        "the scale or marked off it."
    ),
    "scale.partial_squeezed": (
        "The complete periods use only {share} of the plot height: the partial period decides the "
        "scale."
    ),
    "scale.partial_unmarked": (
        "The complete periods use {share} of the plot height, but a value of the partial period "
        "lies outside the scale with no off-scale mark."
    ),
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
    "appendix.status_advice_many": "advice",
    "appendix.status_not_applicable": "not applicable",
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
    "text.no_data": "no data",
    "text.pp_long": "{value} percentage points",
    "text.pp_short": "{value} pp",
    "text.days_of_one": "{elapsed} of {total} day",
    "text.days_of": "{elapsed} of {total} days",
    "text.estimate_of": "{name} (estimate)",
    "text.estimates_note": "Estimates, not actuals (dashed, or a hollow diamond): {names}.",
    "text.no_projection": "No projection: the last period was complete at the time of the data.",
    "text.log_note": "Logarithmic scale: equal distances show equal ratios, not equal differences.",
    "text.scale_note": "Scale starts at {start}, not zero: compare positions, not lengths.",
    "text.truncation_note": "Bars start at {start}, not zero: their lengths exaggerate the differences.",
    "text.and": "{first} and {last}",
    "text.row": "row",
    "text.scatter_guide": "Each dot is one {what}: further right means more {x}, higher means more {y}.",
    "text.fit_guide": (
        "The line is the least-squares fit ({r2}: the line accounts for {share} of the variation in "
        "{y}); it shows association, not cause."
    ),
    "text.dropped_one": "1 row without both values is not shown.",
    "text.dropped": "{count} rows without both values are not shown.",
    "text.horizontal_scale_note": (
        "Horizontal scale starts at {start}, not zero: compare positions, not lengths."
    ),
    "text.histogram_guide": "Each bar counts the {name} values between its edges.",
    "text.values_in_all": "{count} values in all.",
    "text.box_guide": (
        "The box holds the middle half of the {name} values (from Q1 to Q3); the line inside is the "
        "median; whiskers reach the furthest values within 1.5 box-lengths; dots are values beyond."
    ),
    "text.missing_value_one": "1 row has no {name} value: left out, not counted as zero.",
    "text.missing_values": "{count} rows have no {name} value: left out, not counted as zero.",
    "text.observations": "observations",
    "text.count_axis": "Number of values",
    "text.all": "All",
    "text.generic_histogram_guide": "Each bar counts the values between its edges.",
    "text.generic_box_guide": (
        "The box holds the middle half of the values (from Q1 to Q3); the line inside is the median; "
        "whiskers reach the furthest values within 1.5 box-lengths; dots are values beyond."
    ),
    "text.generic_scatter_guide": (
        "Each dot is one row: further right means more of the horizontal measure, higher means more of "
        "the vertical one."
    ),
    "text.share_note": "Percentages of the whole ({total}); they sum to 100.",
    "text.target_line": "target {value}",
    "text.no_target": "No target given for: {names}.",
    "text.deviation_note": "Bars show actual minus target.",
    "text.one_target": "The target is {value} for every category.",
    "text.minus_target": "{name} minus target",
    "text.pp_unit": "percentage points",
    "text.on_target": "on target",
    "text.rule1_above": "rule 1: beyond the upper limit",
    "text.rule1_below": "rule 1: beyond the lower limit",
    "text.rule2_above": "rule 2: 2 of 3 beyond 2 sigma above",
    "text.rule2_below": "rule 2: 2 of 3 beyond 2 sigma below",
    "text.rule3_above": "rule 3: 4 of 5 beyond 1 sigma above",
    "text.rule3_below": "rule 3: 4 of 5 beyond 1 sigma below",
    "text.rule4_above": "rule 4: {run} in a row above the centre line",
    "text.rule4_below": "rule 4: {run} in a row below the centre line",
    "text.too_little_history": "Too little history for a verdict ({count} of {needed} points)",
    "text.centre_line": "centre line {value}",
    "text.upper_limit": "upper natural process limit {value}",
    "text.lower_limit": "lower natural process limit {value}",
    "text.limits_band": "limits {lo} to {hi}; moving-range limit {range}",
    "text.no_change_to_judge": "No change to judge for {period} (no value the period before)",
    "text.latest_change": "Latest change {change} ({before} to {after})",
    "text.range_beyond": "moving range beyond its limit",
    "text.signal_verdict": "{opening}: signal ({why}; {band})",
    "text.routine_verdict": "{opening}: within routine variation ({band})",
    "text.signal_rule": "{period}: signal (rule {rules})",
    "text.signal_rules": "{period}: signal (rules {rules})",
    "text.measure_in_unit": "{name} in {unit}",
    "text.change_since": "% change since {base}",
    "text.index_unit": "Index ({base} = 100)",
    "text.base_line": "{base} = {value}",
    "text.change_opening": "Change since {base}, in %.",
    "text.index_opening": "Indexed: {base} = 100.",
    "text.units_differ_only": "Units differ ({differ}), so only the change is compared.",
    "text.only_change": "Only the change is compared.",
    "text.panels_units_differ": (
        "Units differ ({differ}): each panel has its own scale, so compare the shape of each line, not "
        "heights across panels."
    ),
    "text.panels_note": (
        "Each panel has its own scale, so compare the shape of each line, not heights across panels."
    ),
    "text.form_bars": "Bar chart",
    "text.form_dots": "Dot chart",
    "text.form_deviation": "Chart of differences from target",
    "text.form_pie": "Pie chart",
    "text.form_lines": "Line chart",
    "text.form_control": "Chart of values against their natural process limits",
    "text.form_panels": "Aligned panels",
    "text.form_histogram": "Histogram",
    "text.form_box": "Box plot",
    "text.form_scatter": "Scatter plot",
    "text.opening": "{form}: {title}",
    "text.one_category": "{count} category",
    "text.categories": "{count} categories",
    "text.highest": "highest {name} ({value})",
    "text.lowest": "lowest {name} ({value})",
    "text.no_data_for": "no data for {names}",
    "text.no_data_for_more": "no data for {names} and more",
    "text.one_period": "{period} only",
    "text.period_range": "{first} to {last}",
    "text.series_one": "{name} {value} ({period})",
    "text.series_from_to": "{name} from {first} ({first_period}) to {last} ({last_period})",
    "text.partial_period": "{period} is partial ({done})",
    "text.bins": (
        "{total} values, in bins from {lo} to {hi}; the fullest bin is {top_lo} to {top_hi} ({count})"
    ),
    "text.box": "{name}: median {median}, middle half {q1} to {q3} (n = {n})",
    "text.points": "{count} points",
    "text.points_fit": "{count} points; r² = {r2}",
    "text.corrected_by": "Corrected by the checks: {checks}.",
    "text.failed_checks": "Failed checks: {checks}.",
    "text.so_far": "{period} so far:\n{done}",
    "text.beyond_chance": "Differences between {things} are beyond chance ({test}).",
    "text.may_be_chance": "Differences between {things} may be chance ({test}): do not rank them.",
    "text.intervals_apart": (
        "Intervals ({level}) do not overlap for {count} of {pairs} pairs of {things} ({listed}); "
        "overlap does not prove equality."
    ),
    "text.intervals_overlap": (
        "The {level} intervals of all {things} overlap: the differences may be chance."
    ),
    "text.undecided": "Too few {things} have an interval to judge their differences.",
    "text.values_labelled": (
        "Values are labelled: the chart alone resolves only about {chart}; readers need {need}."
    ),
    "text.shared_scale": "The panels share one scale, so their heights can be compared.",
    "text.source_unstated": "Dataset '{dataset}' supplied by {owner}; no source was stated.",
    # -- appendix ----------------------------------------------------------------------------------
    # -- checks' findings --------------------------------------------------------------------------
    "finding.estimate_series": "{count} estimate series",
    "finding.estimates_ok": "Drawn dashed, labelled and listed: {names}; never joined to the actuals.",
    "finding.estimates_unmarked": "Estimates not drawn as estimates: {names}.",
    "finding.estimates_unlisted": "Estimates not listed on the chart.",
    "finding.actuals_only": "The chart shows actuals only.",
    "finding.last_complete": "The last period, {period}, was complete at the time of the data.",
    "finding.complete_drawn_partial": (
        "{period} was complete at the time of the data but is drawn as partial."
    ),
    "finding.partial_drawn": (
        "{period} had run {done} at the time of the data: drawn as a hollow point, not joined to the "
        "line, and labelled, so it does not read as a fall."
    ),
    "finding.partial_not_drawn": (
        "{period} had run only {done} at the time of the data, but is drawn like a complete period."
    ),
    "finding.pie_too_many": "{count} parts, more than {most}",
    "finding.pie_no_value": "no part has a value",
    "finding.pie_zero_part": "a part of zero or less has no wedge",
    "finding.pie_too_close": (
        "{small} and {large} differ by {points} and ×{ratio}, under {min_points} and ×{min_ratio}"
    ),
    "finding.no_whole": "No whole is stated: the shares are of the parts' sum, {sum}.",
    "finding.against": "{value} against {other}",
    "finding.sum_within": "The parts add up to {sum}, within {allowed} of the stated whole {whole}.",
    "finding.sum_apart": (
        "The parts add up to {sum}, but the stated whole is {whole}: {apart} apart, more than the "
        "tolerance of {allowed}. Correct the data or the stated whole."
    ),
    "finding.no_negative": "No part is negative.",
    "finding.negative_one": (
        "{count} part is negative: {listed}. A part of a whole cannot be less than nothing; show it as "
        "a change (a compare chart) instead."
    ),
    "finding.negative": (
        "{count} parts are negative: {listed}. A part of a whole cannot be less than nothing; show "
        "these as a change (a compare chart) instead."
    ),
    "finding.count_negative": "{count} negative",
    "finding.parts_absent": "{count} of {total} expected parts are not in the data: {names}.",
    "finding.parts_not_shown": "{count} of {total} not shown",
    "finding.none_listed": "none listed",
    "finding.no_expected": "No expected parts are listed.",
    "finding.parts_shown_flagged": (
        "All {total} expected parts are shown ({names} shown as 'expected, no data')."
    ),
    "finding.parts_shown": "All {total} expected parts are shown.",
    "finding.all_shown": "all shown",
    "finding.no_labels": "no labels",
    "finding.sum_of": "sum {value}",
    "finding.labels_missing": (
        "No percentage labels are shown; {names} do not carry the largest-remainder share."
    ),
    "finding.labels_wrong": (
        "The labels add up to {total}; {names} do not carry the largest-remainder share."
    ),
    "finding.no_shares": "No percentages are shown: the parts have no shares.",
    "finding.labels_ok": (
        "The percentage labels add up to 100 (largest remainder; equal remainders go to the part first "
        "in the data)."
    ),
    "finding.parts": "{count} parts",
    "finding.parts_closest": "{count} parts, closest {points} apart (×{ratio})",
    "finding.bars_measured": "bars; {shown}",
    "finding.as_bars": "Drawn as bars: {shown}.",
    "finding.pie_ok": "The pie can be read: {shown}, each pair told apart.",
    "finding.pie_bad": "A pie of these parts cannot be read: {problem}.",
    "finding.bars_from_zero": "Bars start at zero.",
    "finding.bars_asked_from": (
        "The definition asked for bars starting at {start}, which would make their lengths exaggerate "
        "the differences."
    ),
    "finding.starts_at": "starts at {start}",
    "finding.includes_zero": "includes 0",
    "finding.axis_includes_zero": "The value axis includes zero.",
    "finding.scale_noted": "The scale {shown}, and the chart says so.",
    "finding.scale_not_noted": "The scale {shown}, but the chart does not say so.",
    "finding.no_effect": "Fewer than two distinct non-zero values: no effect to exaggerate.",
    "finding.lengths_proportional": "Drawn lengths are proportional to the values (lie factor {factor}).",
    "finding.lengths_exaggerate": (
        "Drawn lengths exaggerate the differences {factor} times (lie factor {factor}, outside "
        "{low}–{high})."
    ),
    "finding.axis_lacks_periods": "the time axis does not hold every expected period",
    "finding.value_drawn_at": "{name} has a value drawn at {period}",
    "finding.joined_across": "{name} is joined across {period}",
    "finding.gap_unmarked": "{period} is not marked 'no data' for {name}",
    "finding.and_more": "{listed} and {more} more",
    "finding.period": "{count} period",
    "finding.periods": "{count} periods",
    "finding.gaps_but": "{shown} without data, but {problems}.",
    "finding.no_gaps": "Every expected period from {first} to {last} has data.",
    "finding.gaps_ok": (
        "{shown} without data ({listed}): the line is broken there and marked 'no data'; nothing is "
        "filled in."
    ),
    "finding.categories": "categories",
    "finding.anova": "one-way ANOVA F = {f}, {p}",
    "finding.distinguishable_p": "distinguishable ({p})",
    "finding.not_distinguishable_p": "not distinguishable ({p})",
    "finding.anova_apart": (
        "Differences between {things} are distinguishable: {test} (at the {level} level at least one "
        "differs beyond chance; not every pair need differ)."
    ),
    "finding.anova_chance": (
        "Differences between {things} are not distinguishable from chance: {test} (not significant at "
        "the {level} level)."
    ),
    "finding.pairs_apart_one": "{count} of {pairs} pair apart",
    "finding.pairs_apart": "{count} of {pairs} pairs apart",
    "finding.intervals_apart": (
        "Differences between {things} are distinguishable for {count} of {pairs} pairs ({listed}): "
        "their {level} intervals do not overlap; overlapping intervals do not prove the values equal."
    ),
    "finding.intervals_overlap": (
        "Every pair of {things} has overlapping {level} intervals, so no difference is clearly "
        "distinguishable; overlapping intervals do not prove the values equal."
    ),
    "finding.too_few_intervals": "too few intervals",
    "finding.undecided": "Fewer than two {things} have an interval, so their differences cannot be judged.",
    "finding.no_uncertainty": "The data gives no uncertainty for these values.",
    "finding.intervals_not_drawn": "the intervals of {names} are not drawn as given",
    "finding.verdict_not_said": "the chart does not say whether the differences are real",
    "finding.but": "But {problems}.",
    "finding.no_precision": "No precision is asked of this chart.",
    "finding.not_asked": "not asked",
    "finding.no_values_to_read": "The chart shows no values to read.",
    "finding.no_values": "no values",
    "finding.chart_alone": "the chart alone resolves about {res} (0.5 mm at {per_mm} per mm)",
    "finding.about": "about {value}",
    "finding.precision_ok": "{alone}; readers need {need}.",
    "finding.precision_labelled": "Values are labelled: {alone}, coarser than the {need} readers need.",
    "finding.labelled_about": "labelled (chart alone about {value})",
    "finding.precision_short": "Readers need to tell apart {need}, but {alone}.",
    "finding.labels_round": "Its labels round to {step}.",
    "finding.split_shared": "split into {panels} panels on one shared scale",
    "finding.split_own": "split into {panels} panels on different scales",
    "finding.panels_ok": (
        "The series are drawn in {panels} panels on one shared scale, at most {most} colour-coded in "
        "each."
    ),
    "finding.panels_differ": "The series are split into {panels} panels, but their scales differ.",
    "finding.panels_crowded": (
        "The series are split into {panels} panels, but one has {most} colour-coded series."
    ),
    "finding.other_grey": "{count} other in grey",
    "finding.others_grey": "{count} others in grey",
    "finding.highlighted": "highlighted {names}, {others}",
    "finding.count_series": "{count} series",
    "finding.highlighted_ok": "Highlighted {names}; the {others} are context, not to be told apart.",
    "finding.series_ok": "{count} colour-coded series (at most {most}): each can be told apart.",
    "finding.series_too_many": (
        "{count} series are told apart by colour alone, more than the {most} a reader can match to "
        "their labels reliably."
    ),
    "finding.units_differ": "units differ ({differ})",
    "finding.only_change": "only the change is compared",
    "finding.aligned_panels": "aligned panels, each with its own scale",
    "finding.indexed_change": "indexed as % change since {base}",
    "finding.indexed_100": "indexed to {base} = 100",
    "finding.drawn_instead": (
        "Drawn as {chosen} because {why}: never two y-axes, which would let the choice of two scales "
        "make any two lines appear to cross or move together."
    ),
    "finding.axis_per_panel": "1 value axis in each of {count} panels",
    "finding.one_axis": "1 value axis",
    "finding.no_second_axis": (
        "{shown}: this form cannot draw a second y-axis, so two y-axes are impossible."
    ),
    "finding.points": "{most} points",
    "finding.points_over": (
        "{names}: {shown}, more than the {limit} (4 per pixel column) a line {width} px wide at {dpi} "
        "dpi can show."
    ),
    "finding.points_reduced": (
        "{before} points were reduced to {after} with M4 at {px} px: the first, last, lowest and "
        "highest point of every pixel column are kept, so the drawn line is the same; no line is "
        "joined across a gap."
    ),
    "finding.points_m4": "{most} (M4 at {width} px)",
    "finding.points_gaps": (
        "{shown} in the longest series, broken by gaps: already no more than 4 per pixel column and "
        "drawn segment, as few as M4 keeps without joining across a gap."
    ),
    "finding.points_ok": (
        "At most {shown} per series: within the {limit} a line {width} px wide at {dpi} dpi can show, "
        "so every point is drawn."
    ),
    "finding.periods_of": "{drawn} of {count} periods",
    "finding.axis_missing": (
        "the time axis does not place every expected period at its own index (missing: {names})"
    ),
    "finding.axis_misplaced": "the time axis does not place every expected period at its own index",
    "finding.out_of_order": "points of {names} are out of time order",
    "finding.own_place": (
        "Each of the {count} periods from {first} to {last} has its own place on the time axis, so a "
        "gap keeps its width."
    ),
    "finding.months_equal": (
        "Calendar periods are spaced equally (a month of 28 days takes the width of one of 31)."
    ),
    "finding.linear": "The value axis is linear.",
    "finding.log_lengths": (
        "A chart of this form ({form}) uses a logarithmic value axis: the length of a bar on a log "
        "axis does not encode its value. Use a linear axis from zero, or dots or lines."
    ),
    "finding.value_axis": "value axis",
    "finding.x_axis": "x axis",
    "finding.log_not_noted": "The {names} is logarithmic, but the chart does not say so.",
    "finding.log_noted": "The scale is logarithmic, and the chart says so: {note}",
    "finding.no_guide": "The chart carries no guide to reading it.",
    "finding.guide_lines": "The reading guide runs over several lines.",
    "finding.guide": "Reading guide: {text}",
    "finding.no_line": "No line is drawn, and none was asked for.",
    "finding.line_not_asked": "A fitted line is drawn, but the definition did not ask for one.",
    "finding.line_missing": "The definition asked for a least-squares line, but none is drawn.",
    "finding.line_wrong": "The line drawn is not the least-squares fit of the data.",
    "finding.r2_not_shown": "The least-squares line is drawn, but its r² ({r2}) is not shown.",
    "finding.line_ok": "The least-squares line asked for is drawn, with {r2}.",
    "finding.no_bins": "The histogram has no bins.",
    "finding.bin_no_width": "A bin ends where it starts, or before.",
    "finding.bins_apart": "The bins do not meet: a bin starts away from where the last ended.",
    "finding.from_to": "{first} to {last}",
    "finding.bins_uneven": (
        "Bin widths run from {widths}: with raw counts, the wider bars overstate their share of the "
        "values."
    ),
    "finding.bins_even": "Every bin is {width} wide, so areas follow the counts.",
    "finding.source": "Source line: {source}",
    "finding.no_source": "Neither the chart nor its dataset names a source.",
    "finding.words": "{count} words",
    "finding.alternative": "A text alternative is placed with the chart.",
    "finding.no_alternative": "The chart has no usable text alternative.",
    "finding.no_verdict": "The latest change ({period}) carries no verdict.",
    "finding.wrong_verdict": "The verdict shown, '{shown}', is not what the history says: '{expected}'.",
    "finding.wrong_limits": "The centre line and limits drawn are not those of the history.",
    "finding.one_colour": "The chart's marks use one colour.",
    "finding.vision_normal": "normal colour vision",
    "finding.vision_protan": "simulated protan (red-blind) vision",
    "finding.vision_deutan": "simulated deutan (green-blind) vision",
    "finding.vision_tritan": "simulated tritan (blue-blind) vision",
    "finding.colours_apart": (
        "The {count} colours stay at least ΔE00 {difference} apart under normal, protan, deutan and "
        "tritan vision (closest: {first} and {second}, with {seen})."
    ),
    "finding.colour_shared": (
        "Two marks share the colour {first}: the palette has fewer colours than the chart has marks."
    ),
    "finding.colours_close": (
        "{first} and {second} are only ΔE00 {difference} apart with {seen} (at least {least} is "
        "needed): readers cannot tell those marks apart."
    ),
    "finding.contrasts": "marks {marks}, text {text}",
    "finding.text_ink": "ink",
    "finding.text_muted_text": "muted text",
    "finding.text_flag": "flag",
    "finding.contrast_ok": (
        "Every mark colour has at least {marks} contrast on white, and text at least {text}."
    ),
    "finding.marks_weak": "mark colours {colours} are below 3:1 on white",
    "finding.text_weak": "text colours {colours} are below 4.5:1 on white",
    "finding.hard_to_see": "{parts}: they are hard to see.",
    "finding.same_month": "the same month a year earlier",
    "finding.same_quarter": "the same quarter a year earlier",
    "finding.same_week": "the same week a year earlier",
    "finding.same_day": "the same day a week earlier",
    "finding.same_point": "the same point of the cycle, {lag} back",
    "finding.day_one": "{count} day",
    "finding.day_many": "{count} days",
    "finding.week_one": "{count} week",
    "finding.week_many": "{count} weeks",
    "finding.month_one": "{count} month",
    "finding.month_many": "{count} months",
    "finding.quarter_one": "{count} quarter",
    "finding.quarter_many": "{count} quarters",
    "finding.year_one": "{count} year",
    "finding.year_many": "{count} years",
    "finding.period_one": "{count} period",
    "finding.period_many": "{count} periods",
    "finding.too_short_cycle": "Fewer than {count} values: too short to look for a cycle.",
    "finding.no_cycle": "No repeating cycle was found in the data.",
    "finding.cycle_evidence": (
        "The data repeat every {span} (autocorrelation {r} at lag {lag}, above {bar})"
    ),
    "finding.cycle_shown": "{span} cycle; {window} shown",
    "finding.too_few_cycles": (
        "the chart shows only {window}, fewer than two cycles: show at least {least} so the cycle is "
        "not read as a trend"
    ),
    "finding.pair": "{before} with {after}",
    "finding.consecutive": "consecutive periods",
    "finding.compare_phase": (
        "the latest change compares {pair}, which sit at different points of the cycle: compare with "
        "{same} as well"
    ),
    "finding.cycles_shown": "{evidence}; the chart shows {count} cycles.",
    "finding.cycle_but": "{evidence}, but {advice}.",
    "finding.drawn_ratio": "drawn {drawn}",
    "finding.no_slope": "The lines have no slope to bank (flat, or fewer than two joined points).",
    "finding.suggests": "suggests {suggested}; drawn {drawn}",
    "finding.banking_ok": (
        "Banking to 45° suggests height/width {suggested}; drawn {drawn}: within a factor of 2, so the "
        "median slope is drawn near 45°."
    ),
    "finding.banking_steep": (
        "Banking to 45° suggests height/width {suggested}; drawn {drawn}: slopes look steeper than "
        "they are; a wider or shorter chart would show changes of slope more clearly (advice: 45° is "
        "not always best)."
    ),
    "finding.banking_flat": (
        "Banking to 45° suggests height/width {suggested}; drawn {drawn}: slopes look flatter than "
        "they are; a taller or narrower chart would show changes of slope more clearly (advice: 45° is "
        "not always best)."
    ),
    "finding.span": "The values span only {share} of the value axis, which flattens the line.",
    "finding.span_zero": (
        "The values span only {share} of the value axis (it starts at zero), which flattens the line."
    ),
    "finding.waived_by": "Waived by {by}.",
    "finding.waiver_expired": "A waiver expired on {date} and no longer applies.",
    "finding.correction.expected-parts-shown": (
        "Each missing part was added to the chart as 'expected, no data'."
    ),
    "finding.correction.shares-sum-to-100": (
        "The labels were recomputed by the largest-remainder method (equal remainders go to the part "
        "first in the data)."
    ),
    "finding.correction.pie-readable": "The parts were drawn as zero-based bars, largest first, instead.",
    "finding.correction.series-count": (
        "The focus series was highlighted and the others drawn in grey; without a focus, the series "
        "were split into panels on one shared scale."
    ),
    "finding.correction.bar-zero-baseline": "Bars were drawn from zero instead.",
    "finding.correction.missing-periods": (
        "The line was broken at each missing period and marked 'no data'."
    ),
    "finding.correction.partial-period": (
        "The last period was drawn hollow and labelled with its completeness."
    ),
    "finding.correction.estimates-distinct": (
        "The estimates were drawn dashed, labelled and listed on the chart."
    ),
    "finding.correction.delta-verdict": (
        "The verdict on the latest change, with its limits, was recomputed from the data and attached."
    ),
    "finding.correction.uncertainty": (
        "Each interval was drawn and a line saying whether the differences are real was added to the "
        "chart."
    ),
    "finding.correction.reading-guide": "The reading guide for the form was added to the chart.",
    "finding.correction.fit-on-request": (
        "The line was drawn as the definition asked: the least-squares fit with its r², or no line."
    ),
    "finding.correction.log-scale-noted": "A note saying the scale is logarithmic was added to the chart.",
    "finding.correction.many-points": (
        "Each long series was reduced with M4 (first, last, lowest and highest point of every pixel "
        "column, each drawn segment on its own), which draws the same line."
    ),
    "finding.correction.nonzero-scale-noted": (
        "A note saying where the scale starts was added to the chart."
    ),
    "finding.correction.precision": "Each value was labelled on the chart, with a note saying why.",
    "finding.correction.colour-distinct": (
        "The chart was drawn with the house palette instead of the custom one."
    ),
    "finding.correction.colour-contrast": (
        "The chart was drawn with the house palette instead of the custom one."
    ),
    "finding.correction.partial-period-scale": (
        "The scale was fitted to the complete periods; the partial period's values "
        "outside it are drawn as an off-scale mark with their values and completeness."
    ),
    "finding.correction.source-line": "The source line names the dataset and the report's owner instead.",
    "finding.measured.none": "none",
    "finding.measured.given": "given",
    "finding.measured.one_colour": "one colour",
    "finding.measured.no_cycle": "no cycle",
    "finding.measured.log": "log",
    "finding.measured.linear": "linear",
    "finding.measured.signal": "signal",
    "finding.measured.routine_variation": "routine variation",
    "finding.measured.too_little_history": "too little history",
    "finding.measured.complete": "complete",
    "finding.measured.log_not_noted": "log, not noted",
    "finding.measured.no_verdict": "no verdict",
    "finding.measured.wrong_verdict": "wrong verdict",
    "finding.measured.wrong_limits": "wrong limits",
    "finding.measured.no_line": "no line",
    "finding.measured.line_not_asked_for": "line not asked for",
    "finding.measured.not_the_least_squares_line": "not the least-squares line",
    "finding.measured.r²_not_shown": "r² not shown",
    "finding.measured.no_bins": "no bins",
    "finding.measured.a_bin_of_no_width": "a bin of no width",
    "finding.measured.bins_apart": "bins apart",
    "finding.measured.several_lines": "several lines",
    "finding.measured.wrong": "wrong",
    "finding.measured.too_short_to_test": "too short to test",
    "finding.measured.no_uncertainty_given": "no uncertainty given",
    "finding.measured.undecided": "undecided",
    "finding.measured.no_values": "no values",
}
