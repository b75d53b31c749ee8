"""The ready template kinds, read back with openpyxl: formulas, array areas, block, decisions.

Sizes of the array areas are checked against the Python call through the harness
(:func:`sheetfuncs.worksheet.harness.call`) on the data read back from the written file, with
the arguments read from the formula itself.
"""

from __future__ import annotations

from pathlib import Path

import pytest
from openpyxl import load_workbook
from openpyxl.utils import range_boundaries

from sheetfuncs.templates import KINDS, write_template
from sheetfuncs.templates.layout import CAUTIONS, HEADER_FIELDS
from sheetfuncs.worksheet import harness
from sheetfuncs.worksheet.functions import REGISTRY
from tests.support.template_cells import argument_value, calls, formula_cells

#: Functions of the host a template may use besides the SF_ functions.
HOST_FUNCTIONS = {"IF", "ISNUMBER", "AND", "COUNTIF", "SQRT"}
COMPARISONS = {"<", ">", "<=", ">=", "=", "<>"}


@pytest.fixture(scope="module")
def written(tmp_path_factory: pytest.TempPathFactory) -> dict[str, tuple]:
    folder = tmp_path_factory.mktemp("kinds")
    out = {}
    for kind in KINDS:
        w = write_template(kind, folder / f"{kind}.xlsx")
        out[kind] = (w, load_workbook(w.path))
    return out


def test_kinds_are_the_four_of_the_issue() -> None:
    assert KINDS == ("compare-groups", "lot-homogeneity", "study-plan", "summary-compare")


@pytest.mark.parametrize("kind", KINDS)
def test_every_formula_parses_with_known_functions_and_right_counts(written, kind) -> None:
    _, wb = written[kind]
    found = formula_cells(wb)
    assert found, "a template without formulas"
    sf = 0
    for sheet, addr, text, _ in found:
        for call in calls(text):
            if not call.name.startswith("SF_"):
                assert call.name in HOST_FUNCTIONS, f"{sheet}!{addr}: unexpected {call.name}"
                continue
            sf += 1
            rec = REGISTRY.get(call.name)
            assert rec is not None, f"{sheet}!{addr}: {call.name} is not in the registry"
            required = sum(a.required for a in rec.args)
            assert required <= len(call.args) <= len(rec.args), (
                f"{sheet}!{addr}: {call.name} takes {required} to {len(rec.args)} arguments, "
                f"the formula gives {len(call.args)}")
    assert sf >= 1


@pytest.mark.parametrize("kind", KINDS)
def test_array_areas_have_the_size_of_the_python_call(written, kind) -> None:
    w, wb = written[kind]
    arrays = [(s, a, t, ref) for s, a, t, ref in formula_cells(wb) if ref]
    assert len(arrays) == len(w.arrays) >= 1
    for sheet, addr, text, ref in arrays:
        (call,) = calls(text)  # an array area holds exactly one SF_ call, nothing around it
        args = [argument_value(wb, a) for a in call.args]
        shown = harness.call(call.name, *args)  # the Python call through the harness
        assert isinstance(shown, list), f"{sheet}!{addr}: {call.name} shows {shown!r}"
        c1, r1, c2, r2 = range_boundaries(ref)
        assert (r2 - r1 + 1, c2 - c1 + 1) == (len(shown), len(shown[0])), f"{sheet}!{ref}"
        assert addr == ref.split(":")[0]


@pytest.mark.parametrize("kind", KINDS)
def test_block_name_and_table_cover_the_same_range(written, kind) -> None:
    w, wb = written[kind]
    dn = wb.defined_names[w.block_name]
    assert dn.attr_text == w.block_ref
    sheet, _, cells = w.block_ref.rpartition("!")
    ws = wb[sheet.strip("'")]
    table = ws.tables[w.table_name]
    assert table.ref == cells.replace("$", "")
    header = [c.value for c in ws[table.ref][0]]
    assert [col.name for col in table.tableColumns] == header
    assert all(isinstance(h, str) and h for h in header)
    assert (dn.comment == "sheetfuncs: cells") == w.cells_block
    multi = [n for n, d in wb.defined_names.items() if ":" in (d.attr_text or "")]
    assert multi == [w.block_name], "the block is the only multi-cell defined name"


def comparison_operands(text: str) -> list[str]:
    """The operands on either side of each comparison operator in a formula."""
    from openpyxl.formula import Tokenizer
    toks = [t for t in Tokenizer(text).items if t.type != "WHITE-SPACE"]
    out = []
    for i, t in enumerate(toks):
        if t.type == "OPERATOR-INFIX" and t.value in COMPARISONS:
            out += [toks[i - 1].value, toks[i + 1].value]
    return out


@pytest.mark.parametrize("kind", KINDS)
def test_every_comparison_is_guarded_by_isnumber(written, kind) -> None:
    w, wb = written[kind]
    compared = 0
    for sheet, addr, text, _ in formula_cells(wb):
        for operand in comparison_operands(text):
            compared += 1
            assert f"ISNUMBER({operand})" in text, f"{sheet}!{addr}: {operand} unguarded in {text}"
    assert compared >= 2
    ws = wb[w.record_sheet]
    for addr in w.decisions:
        text = ws[addr].value
        assert text.startswith("=IF(") and "ISNUMBER(" in text, addr


@pytest.mark.parametrize("kind", KINDS)
def test_sheet_shows_fields_instructions_cautions_and_invented_label(written, kind) -> None:
    w, wb = written[kind]
    record = [c.value for row in wb[w.record_sheet].iter_rows() for c in row if c.value]
    data = [c.value for row in wb[w.data_sheet].iter_rows() for c in row if c.value]
    for field in HEADER_FIELDS:
        assert field in record
    for caution in CAUTIONS:
        assert caution in record
    assert "How to use this sheet" in record
    assert "Example data: invented, for illustration only." in data
    assert any("invented" in str(v) for v in record)


@pytest.mark.parametrize("kind", KINDS)
def test_print_set_up(written, kind) -> None:
    _, wb = written[kind]
    for ws in wb.worksheets:
        assert int(ws.page_setup.paperSize) == int(ws.PAPERSIZE_A4) == 9  # A4: common practice
        assert ws.page_setup.fitToWidth == 1 and ws.sheet_properties.pageSetUpPr.fitToPage
        assert ws.print_area
        assert "&P" in ws.oddFooter.right.text and "&N" in ws.oddFooter.right.text


def test_summary_block_is_a_cells_block_with_group_n_mean_sd(written) -> None:
    w, wb = written["summary-compare"]
    assert w.cells_block and w.block_name == "GroupSummary"
    sheet, _, cells = w.block_ref.rpartition("!")
    header = [c.value for c in wb[sheet.strip("'")][cells.replace("$", "")][0]]
    assert header == ["Group", "n", "Mean", "SD"]


def test_data_functions_read_the_block_wide_with_labels(written) -> None:
    """Lot names may be numbers: every data function gets layout "wide" and labels TRUE."""
    for kind, (w, wb) in written.items():
        for sheet, addr, text, _ in formula_cells(wb):
            for call in calls(text):
                if call.args and call.args[0] == ((w.block_name, "OPERAND", "RANGE"),):
                    assert call.args[1:3] == ((('"wide"', "OPERAND", "TEXT"),),
                                              (("TRUE", "OPERAND", "LOGICAL"),)), f"{kind} {addr}"


def test_decision_on_example_data_reads_as_the_python_call(written) -> None:
    """The decision's p-value cell is the checks' Read row; on the example data the Python call
    (through the harness) gives a number, so the guarded decision would show a verdict."""
    w, wb = written["compare-groups"]
    grid = argument_value(wb, ((w.block_name, "OPERAND", "RANGE"),))
    checks = harness.call("SF_CHECKS", grid, "wide", True, 0.05)
    assert checks[1][0] == "Read" and isinstance(checks[1][3], float)
    text = wb[w.record_sheet][w.decisions[0]].value
    area = next(a for a in w.arrays if a.formula.startswith("SF_CHECKS("))
    c1, r1, _, _ = range_boundaries(area.ref)
    p_cell = f"{chr(64 + c1 + 3)}{r1 + 1}"
    assert f"ISNUMBER({p_cell})" in text and f"{p_cell}<Alpha" in text


def test_written_file_is_the_given_path(tmp_path: Path) -> None:
    w = write_template("study-plan", tmp_path / "plan.xlsx")
    assert w.path == tmp_path / "plan.xlsx" and w.path.is_file() and w.host == "excel"
