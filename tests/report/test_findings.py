"""The Findings text: right for invented scenarios (a clear difference, none, unequal spreads,
non-normal residuals in small groups), and shown on the Findings sheet."""

from __future__ import annotations

from sheetfuncs import groups_from_range
from sheetfuncs.input import relabel
from sheetfuncs.report.context import prepare
from sheetfuncs.report.findings import findings, percent_words

from tests.support.scenarios import CLEAR, NONE, OVENS, UNEQUAL, findings_text, write_in


def test_findings_clear_difference(tmp_path):
    an = prepare(CLEAR, factor="Filling line", response="fill weight", unit="g")
    fi = findings(an)
    assert fi.verdict == "differs" and fi.read == "oneway"
    assert fi.headline.startswith("Yes: Filling line matters")
    text = findings_text(write_in(tmp_path, CLEAR, factor="Filling line", response="fill weight", unit="g"))
    assert fi.headline in text
    assert '"Line B" is higher than "Line A"' in text and '"Line B" is higher than "Line C"' in text
    assert "2 of the 3 pairs of groups differ clearly" in text
    assert "Read the one-way F test" in text
    assert "large by Cohen's (1988) conventions" in text


def test_findings_no_difference(tmp_path):
    fi = findings(prepare(NONE, factor="Lot", response="assay"))
    assert fi.verdict == "no difference"
    assert fi.headline.startswith("No clear effect")
    assert "does not prove the groups equal" in fi.headline
    text = findings_text(write_in(tmp_path, NONE, factor="Lot", response="assay"))
    assert "No pair of groups differs clearly" in text
    assert "is not ruled out by these data" in text or "not ruled out by these data" in text


def test_findings_unequal_variances_reads_welch(tmp_path):
    an = prepare(UNEQUAL, factor="Supplier", response="bore diameter", unit="mm")
    fi = findings(an)
    assert an.checks.variances_unequal
    assert fi.read == "welch"
    assert "Welch's test" in fi.headline
    w = an.welch
    assert f"{w.p:.4f}"[:4] in fi.headline or "p < 0.0001" in fi.headline
    text = findings_text(write_in(tmp_path, UNEQUAL, factor="Supplier", response="bore diameter", unit="mm"))
    assert "Read Welch's test (it does not assume equal variances)" in text
    assert "Games–Howell" in text  # the safer reading of pairs is named


def test_findings_unequal_variances_lead_with_games_howell_and_do_not_contradict():
    # The invented UNEQUAL scenario: Welch's p is about 0.0001, far from alpha, and the pooled
    # Tukey–Kramer comparisons find no pair while Games–Howell finds one (scipy.stats'
    # tukey_hsd is not needed: the report's own pairs are what the text must follow).
    an = prepare(UNEQUAL, factor="Supplier", response="bore diameter", unit="mm")
    fi = findings(an)
    assert fi.read == "welch" and fi.verdict == "differs" and an.welch.p < 0.001
    differ = dict(fi.sections)["Which groups differ"]
    assert differ[0].startswith("The group spreads look unequal and Welch's test is the result to read")
    assert "Games–Howell" in differ[0] and "1 of the 3 pairs of groups differs clearly" in differ[0]
    assert differ[1].startswith('• "Supplier 2" is higher than "Supplier 1"')
    pooled = next(i for i, t in enumerate(differ) if "Tukey–Kramer" in t)
    assert pooled > 1 and "pool the group variances" in differ[pooled]
    assert "near the threshold" not in fi.text()  # p = 0.0001 is not near alpha = 0.05
    letters_line = next(t for t in differ if "share a letter" in t)
    assert "pooled Tukey–Kramer" in letters_line
    text = fi.text()
    assert "about less than" not in text and "1 of the 3 pairs differ " not in text
    notes = dict(fi.sections)["Notes on the data"]
    consistent = [t for t in notes if "consistent with no difference" in t]
    assert consistent and all("not from Welch's test" in t for t in consistent)


def test_findings_near_threshold_sentence_only_near_alpha():
    # invented: three lots, the third a little higher; F's p is just below alpha (0.04) and
    # Scheffé's pairwise comparisons (never more significant than the F test) find no pair
    lots = {"Lot 1": [10.0, 10.4, 9.7, 10.2, 9.9, 10.3], "Lot 2": [10.1, 9.8, 10.3, 10.0, 10.4, 9.9],
            "Lot 3": [10.51, 10.21, 10.71, 10.41, 10.11, 10.61]}
    an = prepare(lots, method="scheffe")
    fi = findings(an)
    assert fi.verdict == "differs" and fi.read == "oneway" and 0.01 <= an.oneway.p < 0.05
    assert not any(r.differs for r in an.pairwise.rows)
    assert "No pair of groups differs clearly (Scheffé comparisons" in fi.text()
    assert "disagree near the threshold" in fi.text()


def test_findings_typo_notes_appear_once(tmp_path):
    g = groups_from_range([["Lot a", "Lot A", "Lot b"], [1.0, 2.0, 1.5], [1.2, 2.2, 1.4], [1.1, 2.1, 1.6]])
    fi = findings(prepare(g))
    assert len(fi.typo_notes) == 1
    assert fi.text().count(fi.typo_notes[0]) == 1
    sheet = findings_text(write_in(tmp_path, g))
    assert sheet.count(fi.typo_notes[0]) == 1


def test_findings_merged_labels_are_not_called_typos(tmp_path):
    g = groups_from_range([["Lot a", "Lot A", "Lot b"], [1.0, 2.0, 1.5], [1.2, 2.2, 1.4], [1.1, 2.1, 1.6]])
    fi = findings(prepare(relabel(g, merge_case=True)))
    assert fi.typo_notes == () and "Possible typo" not in fi.text()
    assert 'Label "Lot A" merged into "Lot a" (they differ only in case).' in fi.text()


def test_findings_percent_wording():
    assert percent_words(0.004) == "less than 1%"
    assert percent_words(0.25) == "about 25%"
    fi = findings(prepare(NONE))
    assert "accounts for less than 1%" in fi.text()


def test_findings_rank_test_read_and_disagreeing(tmp_path):
    # the invented OVENS scenario: non-normal residuals in small groups, so the checks read
    # Kruskal–Wallis alongside the F test, and here the two disagree
    an = prepare(OVENS, factor="Oven", response="cure time")
    fi = findings(an)
    assert fi.read == "kruskal"
    assert (an.oneway.p < 0.05) != (an.kruskal.p < 0.05)
    assert fi.verdict == "unsettled" and fi.headline.startswith("Unsettled: the two tests disagree")
    text = findings_text(write_in(tmp_path, OVENS, factor="Oven", response="cure time"))
    assert "Read the Kruskal–Wallis rank test, alongside the one-way F test" in text


def test_case_only_label_differences_are_flagged(tmp_path):
    g = groups_from_range([["Lot a", "Lot A", "Lot b"], [1.0, 2.0, 1.5], [1.2, 2.2, 1.4], [1.1, 2.1, 1.6]])
    text = findings_text(write_in(tmp_path, g))
    assert "Possible typo" in text and '"Lot a", "Lot A"' in text
