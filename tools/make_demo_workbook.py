"""Write workbooks/demo.xlsx: the built-in demo data (invented) as an input workbook.

    python tools/make_demo_workbook.py [OUT.xlsx]

The data come from :func:`sheetfuncs.input.demo.demo_rows`, so the workbook and the package's demo
cannot drift apart (tests/test_readers.py reads the committed file back and compares).
"""

from __future__ import annotations

import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

from openpyxl import Workbook  # noqa: E402
from openpyxl.styles import Font  # noqa: E402

from sheetfuncs.input.demo import DEMO_FACTOR, DEMO_RESPONSE, DEMO_TITLE, DEMO_UNIT, demo_rows  # noqa: E402

#: Name of the data sheet in the demo workbook (the first sheet, so it is read by default).
from sheetfuncs.cli import DEMO_SHEET as DATA_SHEET  # noqa: E402

NOTES = (
    DEMO_TITLE,
    "All numbers in this workbook are invented for demonstration; they describe no real product.",
    f"Scenario: {DEMO_RESPONSE.lower()} ({DEMO_UNIT}) of one gasket compound, sampled from each "
    f"{DEMO_FACTOR.lower()} of a curing oven; one column per zone.",
    "A blank cell marks a lost gasket; the text 'retest' shows how notes typed into data cells "
    "are ignored and logged.",
    "Try:  sheetfuncs report workbooks/demo.xlsx -o demo-report.xlsx "
    f'--factor "{DEMO_FACTOR}" --response "{DEMO_RESPONSE}" --unit "{DEMO_UNIT}"',
)


def build(path: str | Path) -> Path:
    """Write the demo workbook to ``path`` and return the path."""
    wb = Workbook()
    ws = wb.active
    ws.title = DATA_SHEET
    for row in demo_rows():
        ws.append(row)
    for cell in ws[1]:
        cell.font = Font(bold=True)
    for col in "ABCD":
        ws.column_dimensions[col].width = 11
    ws.freeze_panes = "A2"
    about = wb.create_sheet("About")
    for line in NOTES:
        about.append([line])
    about.column_dimensions["A"].width = 100
    out = Path(path)
    wb.save(out)
    return out


def main(argv: list[str] | None = None) -> int:
    args = sys.argv[1:] if argv is None else argv
    out = Path(args[0]) if args else ROOT / "workbooks" / "demo.xlsx"
    print(build(out))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
