"""The built-in demo's report, written once for every report test that reads it."""

from __future__ import annotations

import openpyxl
import pytest

from sheetfuncs.input.demo import DEMO_FACTOR, DEMO_RESPONSE, DEMO_TITLE, DEMO_UNIT, demo_groups
from sheetfuncs.input.source import InputSource
from sheetfuncs.report import write_report


@pytest.fixture(scope="session")
def demo(tmp_path_factory):
    """(groups, path, workbook) of the demo's report, with a control and an input source."""
    tmp = tmp_path_factory.mktemp("demo")
    g = demo_groups()
    src = InputSource(path=str(tmp / "zones.xlsx"), sheet="Lot data", first_row=3, first_col=2)
    path = write_report(g, tmp / "demo.xlsx", factor=DEMO_FACTOR, response=DEMO_RESPONSE,
                        unit=DEMO_UNIT, title=DEMO_TITLE, control="Zone 1", source=src)
    return g, path, openpyxl.load_workbook(path)
