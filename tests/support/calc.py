"""A real LibreOffice Calc with the sheetfuncs extension, for the tests: built from this checkout
and installed into a throw-away profile.

The extension is built from the registry of this checkout and points LibreOffice's Python at
the test run's own environment plus the checkout (so the component imports the code under
test). ``unopkg`` refuses a per-user install when run as root; as root the profile is then
installed by an unprivileged user (``setpriv`` to ``nobody``), the recipe found when the issue
was written, and the office itself runs as root on that profile. Outside CI a missing
LibreOffice, SDK or Python bridge skips, saying what to install; with ``CI`` set it fails.
"""

from __future__ import annotations

import os
import shutil
import subprocess
import tempfile
from pathlib import Path

import pytest

from sheetfuncs.worksheet.calc.build import build_extension, find_sdk_tool
from sheetfuncs.worksheet.calc.office import Office, find_office, install, site_dirs

INSTALL = ("apt-get install -y --no-install-recommends libreoffice-calc-nogui python3-uno "
           "libreoffice-script-provider-python libreoffice-dev libreoffice-dev-common")
CHECKOUT = Path(__file__).resolve().parents[2]


def require_calc() -> Office:
    """LibreOffice with its Python bridge and SDK, or skip (outside CI) / fail (in CI)."""
    missing = []
    try:
        office = find_office()
    except Exception:
        office = None
        missing.append("soffice")
    if office is not None and office.python is None:
        missing.append("LibreOffice's Python bridge (python3-uno)")
    if find_sdk_tool("unoidl-write") is None:
        missing.append("unoidl-write (LibreOffice SDK)")
    if not missing:
        return office  # type: ignore[return-value]
    reason = f"{' and '.join(missing)} not found; install with: {INSTALL}"
    if os.environ.get("CI"):
        pytest.fail(reason + " (CI is set, so this is a failure, not a skip)")
    pytest.skip(reason)


def _shared_dir(prefix: str) -> Path:
    """A folder under the system's temporary folder that an unprivileged user can use."""
    folder = Path(tempfile.mkdtemp(prefix=prefix, dir="/tmp" if os.name == "posix" else None))
    folder.chmod(0o777)
    return folder


def installed_profile(office: Office) -> Path:
    """A new LibreOffice profile with the extension of this checkout installed."""
    work = _shared_dir("sheetfuncs-calc-")
    oxt = build_extension(work / "sheetfuncs.oxt", site_dirs=(str(CHECKOUT), *site_dirs())).path
    profile = work / "profile"
    profile.mkdir()
    profile.chmod(0o777)
    if hasattr(os, "geteuid") and os.geteuid() == 0:
        cmd = ["setpriv", "--reuid=nobody", "--regid=nogroup", "--clear-groups",
               "env", f"HOME={profile}", str(office.unopkg), "add", "--force",
               "--suppress-license", f"-env:UserInstallation={profile.as_uri()}", str(oxt)]
        done = subprocess.run(cmd, capture_output=True, text=True, timeout=300)
        assert done.returncode == 0, f"unopkg failed: {done.stdout} {done.stderr}"
    else:
        install(office, oxt, profile=profile)
    return profile


def remove(profile: Path) -> None:
    shutil.rmtree(profile.parent, ignore_errors=True)


@pytest.fixture(scope="session")
def calc_office():
    """LibreOffice and a throw-away profile with this checkout's extension installed: built and
    installed once per test run, shared by every module that drives Calc."""
    office = require_calc()
    profile = installed_profile(office)
    yield office, profile
    remove(profile)
