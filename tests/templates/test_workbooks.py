"""The templates kept in workbooks/ are the ones this checkout writes (common practice for
generated files that are kept in the repository).

Regenerate them with:
    python -c "from sheetfuncs.templates import write_all; write_all('workbooks'); write_all('workbooks/calc', host='calc')"
"""

from __future__ import annotations

from pathlib import Path

import pytest

from sheetfuncs.templates import KINDS, template_parts, write_template

ROOT = Path(__file__).resolve().parents[2] / "workbooks"
REGENERATE = ("regenerate: python -c \"from sheetfuncs.templates import write_all; "
              "write_all('workbooks'); write_all('workbooks/calc', host='calc')\"")


@pytest.mark.parametrize("host", ["excel", "calc"])
@pytest.mark.parametrize("kind", KINDS)
def test_kept_template_is_current(kind, host, tmp_path) -> None:
    kept = ROOT / ("calc" if host == "calc" else "") / f"{kind}.xlsx"
    assert kept.exists(), f"{kept} is missing; {REGENERATE}"
    fresh = write_template(kind, tmp_path / f"{kind}.xlsx", host=host).path
    assert template_parts(kept) == template_parts(fresh), f"{kept} is out of date; {REGENERATE}"


def test_a_stale_template_is_told_apart(tmp_path) -> None:
    fresh = write_template(KINDS[0], tmp_path / "a.xlsx").path
    other = write_template(KINDS[1], tmp_path / "b.xlsx").path
    assert template_parts(fresh) != template_parts(other)
