"""Tests of sheetfuncs.input.files.detect: the data block of a sheet read without a range.

The corpus (tests/support/qa_sheets.py) holds invented QA sheets; no number is computed here,
values are only read back as they were written (common practice: compare with what was written).
"""

from __future__ import annotations

import pytest

from sheetfuncs.errors import InputError
from sheetfuncs.input.files.reader import read_groups
from tests.support.qa_sheets import CASES, build


@pytest.fixture(scope="module")
def corpus(tmp_path_factory):
    return build(tmp_path_factory.mktemp("corpus"))


def test_the_corpus_is_large_enough():
    assert len(CASES) >= 12


def used_cells(loaded) -> set[tuple[int, int]]:
    """The sheet cells the groups were read from: the rectangle's non-blank cells that no
    range rule left out."""
    src = loaded.block.source
    noted = {(src.first_row + n.row, src.first_col + n.col) for n in loaded.groups.cells}
    return {(src.first_row + i, src.first_col + j)
            for i, row in enumerate(loaded.block.rows) for j, v in enumerate(row)
            if v is not None and v != "" and (src.first_row + i, src.first_col + j) not in noted}


@pytest.mark.parametrize("index", range(len(CASES)), ids=[c.name for c in CASES])
def test_each_sheet_reads_as_an_analyst_reads_it(corpus, index):
    case, path = corpus[index]
    if case.error:
        with pytest.raises(InputError) as ei:
            read_groups(path, layout=case.layout)
        assert ei.value.reason == case.error
        assert "\n" not in str(ei.value)
        return
    loaded = read_groups(path, layout=case.layout)
    got = {lab: arr.tolist() for lab, arr in loaded.groups}
    assert got == case.groups
    r = loaded.reading
    assert r.detected and r.block == case.block and loaded.block.ref == case.block
    assert {x.kind for x in r.left_out} >= case.kinds
    if case.note:
        assert any(case.note in n for n in r.notes), r.notes


@pytest.mark.parametrize("index", range(len(CASES)), ids=[c.name for c in CASES])
def test_accounting_over_the_corpus(corpus, index):
    case, path = corpus[index]
    if case.error:
        return
    loaded = read_groups(path, layout=case.layout)
    r = loaded.reading
    assert r.balanced and r.cells_read == r.cells_used + r.cells_left_out
    left = [c for x in r.left_out for c in x.cells]
    assert len(left) == len(set(left))  # no cell left out twice
    assert all(x.ref and x.reason for x in r.left_out)
    used = used_cells(loaded)
    assert not used & set(left)  # no cell both used and left out
    assert len(used) == r.cells_used


def test_tablets_reading_names_every_left_out_part(corpus):
    case, path = next((c, p) for c, p in corpus if c.name == "tablets")
    r = read_groups(path).reading
    entries = {(x.ref, x.reason) for x in r.left_out}
    assert ("A1:A2", "title or note above the table") in entries
    assert ("A3:A15", "identifier column (Sample)") in entries
    assert ("A16:E17", "summary rows (Mean, SD)") in entries
    assert r.summary(("Head 1", "Head 2", "Head 3", "Head 4"), (12, 12, 12, 12)).startswith(
        "read 'Fill weights'!B3:E15: 4 groups, 48 values")


def test_labels_option_still_applies(corpus):
    case, path = next((c, p) for c, p in corpus if c.name == "numeric lot headers")
    loaded = read_groups(path, labels="no")
    assert loaded.groups.counts == (7, 7, 7) and loaded.reading.block == "A2:C8"
    assert loaded.groups.arrays[0][0] == 1001.0
    loaded = read_groups(path, labels="yes")
    assert loaded.groups.labels == ("1001", "1002", "1003")


def test_a_range_reads_only_by_the_range_rules(corpus):
    case, path = next((c, p) for c, p in corpus if c.name == "two stacked blocks")
    loaded = read_groups(path, cell_range="A13:C21", labels="yes")
    assert loaded.groups.labels == ("Line A", "Line B", "Line C")
    assert not loaded.reading.detected


# --------------------------------------------------------------------------------------------
# far cells and the cell limit

FAR_SCRIPT = """
import resource, sys, time
from sheetfuncs.input.files.reader import read_groups
t = time.perf_counter()
loaded = read_groups(sys.argv[1])
print(time.perf_counter() - t, resource.getrusage(resource.RUSAGE_SELF).ru_maxrss, loaded.groups.counts,
      loaded.reading.block)
"""


def test_a_far_cell_costs_nothing(corpus):
    import subprocess
    import sys

    case, path = next((c, p) for c, p in corpus if c.name == "far cell")
    done = subprocess.run([sys.executable, "-c", FAR_SCRIPT, str(path)], capture_output=True, text=True,
                          timeout=120, check=True)
    seconds, rss_kib = done.stdout.split()[:2]
    assert float(seconds) < 30
    assert int(rss_kib) < 1024 * 1024  # KiB on Linux: under 1 GB
    assert "(8, 8, 8) A1:C9" in done.stdout
    loaded = read_groups(path)
    (far,) = [x for x in loaded.reading.left_out if x.kind == "other-block"]
    assert far.ref == "XFD1048576" and far.reason == "another block, not read"


def test_a_range_larger_than_the_cell_limit_is_one_line(corpus):
    from sheetfuncs.input.files.reader import read_cells

    case, path = next((c, p) for c, p in corpus if c.name == "far cell")
    with pytest.raises(InputError) as ei:
        read_cells(path, cell_range="A1:XFD1048576")
    assert ei.value.reason == (
        'the range A1:XFD1048576 of sheet "Hardness" spans 17,179,869,184 cells, more than the '
        "limit of 20,000,000; give a smaller --range or raise --max-cells")
    with pytest.raises(InputError) as ei:
        read_cells(path)
    assert ei.value.reason.startswith('the used range A1:XFD1048576 of sheet "Hardness" in far.xlsx spans')
    # the first rows only: within the limit
    assert read_cells(path, cell_range="A1:XFD9").n_cols == 16384


def test_non_blank_cells_are_counted_against_the_limit(corpus):
    case, path = next((c, p) for c, p in corpus if c.name == "tablets")
    with pytest.raises(InputError) as ei:
        read_groups(path, max_cells=50)
    assert ei.value.reason == ('sheet "Fill weights" of tablets.xlsx holds more than 50 non-blank '
                               "cells (the limit); give a --range or raise --max-cells")


# --------------------------------------------------------------------------------------------
# saved by a spreadsheet program


def test_tablets_saved_by_libreoffice_read_the_same(corpus, tmp_path):
    from tests.support.libreoffice import convert, require_office

    require_office()
    case, path = next((c, p) for c, p in corpus if c.name == "tablets")
    src = tmp_path / "src" / "tablets_lo.xlsx"
    src.parent.mkdir()
    src.write_bytes(path.read_bytes())
    saved = convert(src, "xlsx", tmp_path / "out")
    a, b = read_groups(path), read_groups(saved)
    assert a.groups.labels == b.groups.labels
    assert all((x == y).all() for x, y in zip(a.groups.arrays, b.groups.arrays))
    assert [(x.ref, x.reason) for x in a.reading.left_out] == [(x.ref, x.reason) for x in b.reading.left_out]


def test_an_error_saved_by_libreoffice_is_missing_not_a_computed_measurement(tmp_path):
    # LibreOffice saves a typed #N/A as the formula =#N/A with its error value: with
    # --errors missing it is one missing value, and no note calls it a computed measurement
    import openpyxl

    from tests.support.libreoffice import convert, require_office

    require_office()
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Hardness"
    ws.append(["Tablet hardness (invented data)"])
    ws.append(["Sample", "Press A", "Press B"])
    for i, (a, b) in enumerate([(88.1, 90.2), (87.6, 91.0), (88.4, "#N/A"), (87.9, 90.6)], 1):
        ws.append([i, a, b])
    ws.append(["Mean", "=AVERAGE(B3:B6)", "=AVERAGE(C3:C6)"])
    src = tmp_path / "src" / "na.xlsx"
    src.parent.mkdir()
    wb.save(src)
    saved = convert(src, "xlsx", tmp_path / "out")
    loaded = read_groups(saved, errors="missing")
    assert loaded.groups.labels == ("Press A", "Press B") and loaded.groups.counts == (4, 3)
    assert [(x.ref, x.kind) for x in loaded.reading.left_out if x.kind == "missing"] == [("C5", "missing")]
    assert not any("computed by formulas" in n for n in loaded.reading.notes)
    assert loaded.reading.balanced


def test_date_and_comment_columns_are_named_for_what_they_hold(tmp_path):
    # invented fill weights with a date per sample and a comment on one row
    import datetime as dt

    import openpyxl

    wb = openpyxl.Workbook()
    ws = wb.active
    ws.append(["Fill weights (invented data)"])
    ws.append(["Date", "Head 1", "Head 2", "Comment"])
    for i, (a, b) in enumerate([(50.1, 50.6), (50.3, 50.9), (50.0, 50.7), (50.2, 50.8)]):
        ws.append([dt.datetime(2026, 11, i + 1), a, b] + (["re-weighed"] if i == 2 else []))
    wb.save(tmp_path / "dated.xlsx")
    r = read_groups(tmp_path / "dated.xlsx").reading
    assert [(x.ref, x.reason, x.kind) for x in r.left_out] == [
        ("A1", "title or note above the table", "title"),
        ("A2:A6", "date column (Date)", "identifier"),
        ("D2:D5", "comment column (Comment)", "comment"),
    ]
