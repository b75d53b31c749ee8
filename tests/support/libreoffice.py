"""Running LibreOffice headless from the tests: recalculate a workbook, render it to PDF and PNG.

Each conversion uses its own throw-away LibreOffice profile (``-env:UserInstallation``) so that
parallel test runs never clash, and a timeout so that a stuck office process cannot hang the run.
Outside CI a missing LibreOffice skips the tests that need it, saying how to install it; with
the ``CI`` environment variable set it fails them instead.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import tempfile
from pathlib import Path

import pytest

INSTALL = "apt-get install -y --no-install-recommends libreoffice-calc-nogui poppler-utils"
TIMEOUT = 180


def soffice() -> str | None:
    return shutil.which("soffice") or shutil.which("libreoffice")


def require_office() -> None:
    """Skip (outside CI) or fail (in CI) unless LibreOffice and pdftoppm are installed."""
    missing = [name for name, found in (("soffice", soffice()), ("pdftoppm", shutil.which("pdftoppm")))
               if not found]
    if not missing:
        return
    reason = f"{' and '.join(missing)} not found; install LibreOffice and poppler with: {INSTALL}"
    if os.environ.get("CI"):
        pytest.fail(reason + " (CI is set, so this is a failure, not a skip)")
    pytest.skip(reason)


def convert(src: Path, fmt: str, outdir: Path, timeout: int = TIMEOUT) -> Path:
    """``soffice --headless --convert-to fmt`` (xlsx recalculates every formula on load)."""
    exe = soffice()
    assert exe, "LibreOffice is not installed"
    outdir.mkdir(parents=True, exist_ok=True)
    profile = Path(tempfile.mkdtemp(prefix="sheetfuncs-lo-"))
    try:
        cmd = [exe, f"-env:UserInstallation={profile.as_uri()}", "--headless", "--norestore",
               "--nolockcheck", "--convert-to", fmt, "--outdir", str(outdir), str(src)]
        done = subprocess.run(cmd, capture_output=True, text=True, timeout=timeout)
    finally:
        shutil.rmtree(profile, ignore_errors=True)
    out = outdir / (src.stem + "." + fmt.split(":")[0])
    assert out.exists(), f"LibreOffice did not write {out}: {done.stdout} {done.stderr}"
    return out


def convert_many(srcs: list[Path], fmt: str, outdir: Path, timeout: int = TIMEOUT) -> list[Path]:
    """One ``soffice --convert-to`` call for many files (it accepts any number): one office
    start-up for the lot. Returns the converted files, in the order of ``srcs``."""
    exe = soffice()
    assert exe, "LibreOffice is not installed"
    stems = [p.stem for p in srcs]
    assert len(set(stems)) == len(stems), "files converted together need distinct names"
    outdir.mkdir(parents=True, exist_ok=True)
    profile = Path(tempfile.mkdtemp(prefix="sheetfuncs-lo-"))
    try:
        cmd = [exe, f"-env:UserInstallation={profile.as_uri()}", "--headless", "--norestore",
               "--nolockcheck", "--convert-to", fmt, "--outdir", str(outdir), *map(str, srcs)]
        done = subprocess.run(cmd, capture_output=True, text=True, timeout=timeout + 30 * len(srcs))
    finally:
        shutil.rmtree(profile, ignore_errors=True)
    outs = [outdir / (p.stem + "." + fmt.split(":")[0]) for p in srcs]
    missing = [str(o) for o in outs if not o.exists()]
    assert not missing, f"LibreOffice did not write {missing}: {done.stdout} {done.stderr}"
    return outs


def render_png(pdf: Path, prefix: Path, first: int = 1, last: int = 3, dpi: int = 50) -> list[Path]:
    """Pages ``first..last`` of a PDF as PNG files (poppler's pdftoppm)."""
    prefix.parent.mkdir(parents=True, exist_ok=True)
    subprocess.run(["pdftoppm", "-f", str(first), "-l", str(last), "-r", str(dpi), "-png", str(pdf),
                    str(prefix)], check=True, capture_output=True, timeout=TIMEOUT)
    return sorted(prefix.parent.glob(prefix.name + "*.png"))
