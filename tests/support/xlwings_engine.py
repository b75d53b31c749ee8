"""xlwings' own conversion pipeline, run off Windows with a stand-in for its Windows engine.

The reference the harness (sheetfuncs.worksheet.harness) is checked against. The fixture
``xlwings_pipeline`` (registered in tests/conftest.py) yields xlwings' ``conversion`` module with
the stand-in engine installed; ``com_value`` gives a value as COM hands it to xlwings.
"""

from __future__ import annotations

import datetime as dt
from typing import Any

import numpy as np
import pytest
import xlwings
from xlwings import conversion
from xlwings.main import Engine

from sheetfuncs.worksheet import harness

__all__ = ["CELL_ERRORS", "WindowsLikeEngine", "xlwings_pipeline", "com_value"]

# The two element functions of xlwings 0.37's Windows engine (xlwings/_xlwindows.py,
# ``_clean_value_data_element`` and ``Engine.prepare_xl_data_element``), transcribed with the
# pywin32 time type replaced by datetime, so that xlwings' own pipeline stages (Ensure2D,
# cleaning, dimensions, writing) run here exactly as they run on Windows.
CELL_ERRORS = {
    -2146826281: "#DIV/0!", -2146826246: "#N/A", -2146826259: "#NAME?", -2146826288: "#NULL!",
    -2146826252: "#NUM!", -2146826265: "#REF!", -2146826273: "#VALUE!",
}


def _clean_element(value, datetime_builder, empty_as, number_builder, err_to_str):
    if value in ("", None):
        return empty_as
    elif isinstance(value, (dt.date, dt.datetime)):
        return datetime_builder(
            month=value.month, day=value.day, year=value.year, hour=value.hour,
            minute=value.minute, second=value.second, microsecond=value.microsecond, tzinfo=None,
        )
    elif number_builder is not None and isinstance(value, float):
        value = number_builder(value)
    elif isinstance(value, int) and value in CELL_ERRORS:
        return CELL_ERRORS[value] if err_to_str else None
    return value


class WindowsLikeEngine:
    name = "excel"
    type = "desktop"

    @staticmethod
    def clean_value_data(data, datetime_builder, empty_as, number_builder, err_to_str):
        return [[_clean_element(c, datetime_builder, empty_as, number_builder, err_to_str) for c in row]
                for row in data]

    @staticmethod
    def prepare_xl_data_element(x, options):
        if isinstance(x, (dt.date, dt.datetime)):
            return x
        elif isinstance(x, (np.floating, float)) and np.isnan(x):
            return ""
        elif isinstance(x, np.number):
            return float(x)
        elif x is None:
            return ""
        return x


@pytest.fixture(scope="module")
def xlwings_pipeline():
    engine = Engine(impl=WindowsLikeEngine())
    assert "excel" not in xlwings.engines.engines_by_name
    xlwings.engines.add(engine)
    yield conversion
    xlwings.engines.engines.remove(engine)
    del xlwings.engines.engines_by_name["excel"]


def com_value(value: Any) -> Any:
    """The value as COM hands it to xlwings: blocks as tuples of row tuples."""
    if isinstance(value, list):
        return tuple(tuple(harness.host_value(v) for v in r) for r in value)
    return harness.host_value(value)
