"""LibreOffice on this machine: its programs, its Python, installing the extension, driving Calc.

* :func:`office_python`: the Python that LibreOffice runs components in. On Linux
  distributions LibreOffice uses the system's ``python3`` (the one that can ``import uno``);
  the builds from libreoffice.org for Windows and macOS bundle their own (``program/python``).
* :func:`site_dirs`: the site-packages folders of the Python environment that holds
  sheetfuncs, which the component adds to LibreOffice's Python;
* :func:`check_import`: can LibreOffice's Python import sheetfuncs from there? (numpy and
  scipy are compiled for one Python version, so the environment must match LibreOffice's);
* :func:`install`: ``unopkg add`` for the current user, for every user (``--shared``), or into
  a given profile;
* :func:`run_job`: run :mod:`.driver` in LibreOffice's Python on a JSON job.
"""

from __future__ import annotations

import json
import os
import shutil
import subprocess
import sys
import tempfile
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ...errors import InputError

__all__ = [
    "Office", "find_office", "office_python", "site_dirs", "check_import", "install",
    "office_environment", "run_job",
    "IMPORT_CHECK",
]

_TIMEOUT = 600
#: What LibreOffice's Python runs to see whether it can import sheetfuncs from the folders given
#: as arguments: the same steps as the component (site folders first on the path).
IMPORT_CHECK = (
    "import site, sys\n"
    "sys.path[:] = [p for p in sys.path if p]  # not the current folder: LibreOffice's differs\n"
    "before = list(sys.path)\n"
    "for d in sys.argv[1:]: site.addsitedir(d)\n"
    "sys.path[:] = [p for p in sys.path if p not in before] + before\n"
    "import sheetfuncs.worksheet.calc.host, numpy, scipy.stats\n"
    "print(sheetfuncs.__version__, sys.version.split()[0])\n"
)


@dataclass(frozen=True)
class Office:
    """LibreOffice's programs: ``soffice``, ``unopkg`` and the Python it runs components in."""

    soffice: Path
    unopkg: Path | None
    python: Path | None


def find_office() -> Office:
    """LibreOffice on this machine, or one line saying how to install it."""
    exe = shutil.which("soffice") or shutil.which("libreoffice")
    if exe is None:
        raise InputError(
            "LibreOffice was not found (no soffice on PATH); install it (Debian/Ubuntu: "
            "apt-get install --no-install-recommends libreoffice-calc python3-uno "
            "libreoffice-script-provider-python) and try again"
        )
    program = Path(exe).resolve().parent
    unopkg = shutil.which("unopkg") or next(
        (str(p) for p in (program / "unopkg", program / "unopkg.exe") if p.exists()), None)
    return Office(Path(exe), Path(unopkg) if unopkg else None, office_python(program))


def office_python(program: Path) -> Path | None:
    """The Python LibreOffice runs components in: its own (Windows, macOS builds) or the
    system's ``python3`` that can import ``uno`` (Linux distributions)."""
    for candidate in (program / "python", program / "python.exe",
                      program.parent / "Resources" / "python"):
        if candidate.exists():
            return candidate
    for name in ("/usr/bin/python3", shutil.which("python3")):
        if name and _runs(Path(name), "import uno, pyuno"):
            return Path(name)
    return None


def _runs(python: Path, code: str) -> bool:
    try:
        return subprocess.run([str(python), "-c", code], capture_output=True, timeout=60).returncode == 0
    except (OSError, subprocess.SubprocessError):
        return False


def site_dirs(python: Path | None = None) -> tuple[str, ...]:
    """The site-packages folders of ``python``'s environment (this one when ``None``)."""
    code = ("import json, sysconfig; p = sysconfig.get_paths(); "
            "print(json.dumps(sorted({p['purelib'], p['platlib']})))")
    exe = str(python) if python else sys.executable
    try:
        done = subprocess.run([exe, "-c", code], capture_output=True, text=True, timeout=60)
    except OSError as err:
        raise InputError(f"cannot run the Python {exe} ({err.strerror}); give the path of a "
                         "Python that has sheetfuncs installed") from None
    if done.returncode != 0:
        raise InputError(f"{exe} did not run as a Python; give the path of a Python that has "
                         "sheetfuncs installed")
    return tuple(json.loads(done.stdout))


def check_import(office: Office, dirs: tuple[str, ...], python: Path | None = None) -> str:
    """``"<sheetfuncs version> <Python version>"`` as LibreOffice's Python imports sheetfuncs
    from ``dirs``; one line saying what to do when it cannot."""
    if office.python is None:
        raise InputError(
            "LibreOffice's Python was not found; install LibreOffice's Python bridge "
            "(Debian/Ubuntu: apt-get install --no-install-recommends python3-uno "
            "libreoffice-script-provider-python) and try again"
        )
    done = subprocess.run([str(office.python), "-c", IMPORT_CHECK, *dirs],
                          capture_output=True, text=True, timeout=120)
    if done.returncode == 0:
        return done.stdout.strip()
    last = (done.stderr.strip().splitlines() or ["no output"])[-1]
    env = str(python or sys.executable)
    raise InputError(
        f"LibreOffice's Python ({office.python}) cannot import sheetfuncs from the environment "
        f"of {env} ({last}); make an environment from LibreOffice's Python and install "
        f"sheetfuncs into it: {office.python} -m venv --system-site-packages ~/sheetfuncs-calc "
        "&& ~/sheetfuncs-calc/bin/pip install sheetfuncs, then run: sheetfuncs calc install "
        "--python ~/sheetfuncs-calc/bin/python"
    )


def install(office: Office, oxt: Path, *, shared: bool = False, profile: Path | None = None) -> str:
    """``unopkg add`` the extension; returns what unopkg said. Root may only install shared."""
    if office.unopkg is None:
        raise InputError("unopkg (LibreOffice's extension installer) was not found beside "
                         f"{office.soffice}; reinstall LibreOffice")
    if not shared and hasattr(os, "geteuid") and os.geteuid() == 0:
        raise InputError(
            "unopkg does not install an extension for one user when run as root; run sheetfuncs "
            "calc install as the user who runs LibreOffice, or add --shared to install it for "
            "every user of this machine"
        )
    cmd = [str(office.unopkg), "add", "--force", "--suppress-license"]
    if shared:
        cmd.append("--shared")
    if profile is not None:
        cmd.append(f"-env:UserInstallation={Path(profile).resolve().as_uri()}")
    done = subprocess.run([*cmd, str(oxt)], capture_output=True, text=True, timeout=_TIMEOUT)
    said = " ".join((done.stdout + " " + done.stderr).split())
    if done.returncode != 0:
        raise InputError(f"unopkg could not install the extension: {said[:300]}; close "
                         "LibreOffice and try again")
    return said


def office_environment(office: Office) -> dict[str, str]:
    """The environment to start LibreOffice in. Its embedded Python finds its standard library
    through the first ``python3`` on PATH: another Python's folder first on PATH (an activated
    virtual environment of another Python, pyenv) makes it load a foreign standard library and
    fail. LibreOffice's Python's own folder goes first, and PYTHONHOME is dropped."""
    env = {k: v for k, v in os.environ.items() if k not in ("PYTHONHOME", "VIRTUAL_ENV")}
    if office.python is not None:
        env["PATH"] = os.pathsep.join([str(office.python.parent), env.get("PATH", "")])
    env["SHEETFUNCS_SOFFICE"] = str(office.soffice)
    return env


def run_job(office: Office, steps: list[dict[str, Any]], profile: Path | None,
            timeout: int = _TIMEOUT) -> dict[str, Any]:
    """Run :mod:`.driver` in LibreOffice's Python: start Calc headless on ``profile`` (the
    user's own profile when ``None``), do ``steps``, and return what they read."""
    if office.python is None:
        check_import(office, ())  # raises the line that says what to install
    driver = Path(__file__).with_name("driver.py")
    with tempfile.TemporaryDirectory(prefix="sheetfuncs-calc-") as tmp:
        job, out = Path(tmp) / "job.json", Path(tmp) / "out.json"
        job.write_text(json.dumps({"profile": None if profile is None else str(profile), "steps": steps,
                                   "pipe": f"sheetfuncs{os.getpid()}"}), encoding="utf-8")
        env = office_environment(office)
        try:
            done = subprocess.run([str(office.python), str(driver), str(job), str(out)],
                                  capture_output=True, text=True, timeout=timeout, env=env)
        except subprocess.TimeoutExpired:
            raise InputError(f"LibreOffice did not finish within {timeout} s; close other "
                             "LibreOffice windows and try again") from None
        if done.returncode != 0 or not out.exists():
            last = (done.stderr.strip().splitlines() or ["no output"])[-1]
            raise InputError(f"driving LibreOffice failed ({last}); close LibreOffice and try again")
        return json.loads(out.read_text(encoding="utf-8"))
