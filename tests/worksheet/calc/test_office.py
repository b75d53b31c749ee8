"""LibreOffice on this machine, without starting it (sheetfuncs/worksheet/calc/office.py): the
site folders of a Python, the environment LibreOffice starts in, unopkg's command line and the
root rule, and the import check with stand-ins for LibreOffice's Python.
"""

from __future__ import annotations

import os
import shutil
import sys
import sysconfig
from pathlib import Path

import pytest

import sheetfuncs
from sheetfuncs.errors import InputError
from sheetfuncs.worksheet.calc import office as office_mod
from sheetfuncs.worksheet.calc.office import Office, check_import, install, office_environment, site_dirs

CHECKOUT = Path(sheetfuncs.__file__).resolve().parents[1]


def _script(path: Path, body: str) -> Path:
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text("#!/bin/sh\n" + body + "\n")
    path.chmod(0o755)
    return path


def _office(tmp_path: Path, python: Path | None = None, unopkg: Path | None = None) -> Office:
    return Office(tmp_path / "program" / "soffice", unopkg, python)


# --------------------------------------------------------------------------------------------
# site folders


def test_site_dirs_of_this_python() -> None:
    paths = sysconfig.get_paths()
    assert site_dirs() == tuple(sorted({paths["purelib"], paths["platlib"]}))
    assert site_dirs(Path(sys.executable)) == site_dirs()


def test_site_dirs_of_something_else_is_one_line(tmp_path) -> None:
    with pytest.raises(InputError, match=r"^sheetfuncs: cannot run the Python .*nothing-here .*give the path"):
        site_dirs(tmp_path / "nothing-here")
    not_python = _script(tmp_path / "bin" / "python", "exit 3")
    with pytest.raises(InputError) as err:
        site_dirs(not_python)
    assert str(err.value) == (f"sheetfuncs: {not_python} did not run as a Python; give the path of a "
                              "Python that has sheetfuncs installed")


# --------------------------------------------------------------------------------------------
# the environment LibreOffice starts in


def test_office_environment_puts_office_python_first(tmp_path, monkeypatch) -> None:
    # LibreOffice's embedded Python finds its standard library through the first python3 on PATH;
    # a pyenv or virtual-environment python3 of another build first on PATH made Calc fail with
    # std::bad_alloc (measured with LibreOffice 7.4 while the Calc front was written).
    office_python = _script(tmp_path / "office" / "bin" / "python3", "exit 0")
    other = _script(tmp_path / "pyenv" / "shims" / "python3", "exit 0")
    monkeypatch.setenv("PATH", os.pathsep.join([str(other.parent), "/usr/bin"]))
    monkeypatch.setenv("PYTHONHOME", str(tmp_path / "pyenv"))
    monkeypatch.setenv("VIRTUAL_ENV", str(tmp_path / "venv"))
    monkeypatch.setenv("SHEETFUNCS_KEEP", "kept")
    office = _office(tmp_path, python=office_python)
    env = office_environment(office)
    assert env["PATH"].split(os.pathsep) == [str(office_python.parent), str(other.parent), "/usr/bin"]
    assert shutil.which("python3", path=env["PATH"]) == str(office_python)
    assert "PYTHONHOME" not in env and "VIRTUAL_ENV" not in env
    assert env["SHEETFUNCS_SOFFICE"] == str(office.soffice) and env["SHEETFUNCS_KEEP"] == "kept"
    assert os.environ["PYTHONHOME"] == str(tmp_path / "pyenv"), "the caller's environment is left alone"


def test_office_environment_without_office_python(tmp_path, monkeypatch) -> None:
    monkeypatch.setenv("PATH", "/usr/bin")
    assert office_environment(_office(tmp_path))["PATH"] == "/usr/bin"


# --------------------------------------------------------------------------------------------
# unopkg


def _fake_unopkg(tmp_path: Path, rc: int = 0) -> tuple[Path, Path]:
    said = tmp_path / "unopkg-args"
    return _script(tmp_path / "program" / "unopkg", f'echo "$@" > {said}\necho "added: $*"\nexit {rc}'), said


def test_install_as_root_for_one_user_is_refused(tmp_path, monkeypatch) -> None:
    unopkg, said = _fake_unopkg(tmp_path)
    monkeypatch.setattr(office_mod.os, "geteuid", lambda: 0)
    with pytest.raises(InputError) as err:
        install(_office(tmp_path, unopkg=unopkg), tmp_path / "x.oxt")
    assert str(err.value) == (
        "sheetfuncs: unopkg does not install an extension for one user when run as root; run "
        "sheetfuncs calc install as the user who runs LibreOffice, or add --shared to install it "
        "for every user of this machine")
    assert not said.exists(), "unopkg must not run"
    # --shared is allowed as root
    out = install(_office(tmp_path, unopkg=unopkg), tmp_path / "x.oxt", shared=True)
    assert said.read_text().split() == ["add", "--force", "--suppress-license", "--shared", str(tmp_path / "x.oxt")]
    assert out.startswith("added: add --force")


def test_install_into_a_profile(tmp_path, monkeypatch) -> None:
    unopkg, said = _fake_unopkg(tmp_path)
    monkeypatch.setattr(office_mod.os, "geteuid", lambda: 1000)
    install(_office(tmp_path, unopkg=unopkg), tmp_path / "x.oxt", profile=tmp_path / "profile")
    assert said.read_text().split() == [
        "add", "--force", "--suppress-license", f"-env:UserInstallation=file://{tmp_path}/profile",
        str(tmp_path / "x.oxt")]


def test_install_failures_are_one_line(tmp_path, monkeypatch) -> None:
    monkeypatch.setattr(office_mod.os, "geteuid", lambda: 1000)
    with pytest.raises(InputError, match=r"^sheetfuncs: unopkg \(LibreOffice's extension installer\) was not found"):
        install(_office(tmp_path), tmp_path / "x.oxt")
    unopkg, _ = _fake_unopkg(tmp_path, rc=1)
    with pytest.raises(InputError) as err:
        install(_office(tmp_path, unopkg=unopkg), tmp_path / "x.oxt")
    line = str(err.value)
    assert line.startswith("sheetfuncs: unopkg could not install the extension: added: add --force")
    assert line.endswith("; close LibreOffice and try again") and "\n" not in line


# --------------------------------------------------------------------------------------------
# can LibreOffice's Python import sheetfuncs?


def _isolated_python(tmp_path: Path, *flags: str) -> Path:
    """A stand-in for LibreOffice's Python: this Python with ``flags`` (-I: no PYTHONPATH, no
    user site, no current folder; -S: no site-packages either)."""
    return _script(tmp_path / "office" / "python", f'exec {sys.executable} {" ".join(flags)} "$@"')


def test_check_import_when_sheetfuncs_is_there(tmp_path) -> None:
    # a site folder whose .pth file points at this checkout, as an editable install does
    site = tmp_path / "site"
    site.mkdir()
    (site / "sheetfuncs-checkout.pth").write_text(f"{CHECKOUT}\n")
    python = _isolated_python(tmp_path, "-I")
    found = check_import(_office(tmp_path, python=python), (str(site),))
    assert found == f"{sheetfuncs.__version__} {sys.version.split()[0]}"


def test_check_import_failure_says_what_to_do(tmp_path, monkeypatch) -> None:
    # run from the checkout itself: the current folder holds sheetfuncs, but LibreOffice's Python
    # runs elsewhere, so the check must not find it there (-S only: the current folder would be
    # on the path of a plain `python -c`)
    monkeypatch.chdir(CHECKOUT)
    empty = tmp_path / "empty-site"
    empty.mkdir()
    python = _isolated_python(tmp_path, "-S")
    with pytest.raises(InputError) as err:
        check_import(_office(tmp_path, python=python), (str(empty),), python=Path("/opt/env/bin/python"))
    line = str(err.value)
    assert "\n" not in line
    assert line.startswith(f"sheetfuncs: LibreOffice's Python ({python}) cannot import sheetfuncs from the "
                           "environment of /opt/env/bin/python (ModuleNotFoundError: No module named 'sheetfuncs')")
    assert f"{python} -m venv --system-site-packages ~/sheetfuncs-calc" in line
    assert line.endswith("sheetfuncs calc install --python ~/sheetfuncs-calc/bin/python")


def test_check_import_without_office_python(tmp_path) -> None:
    with pytest.raises(InputError, match=r"^sheetfuncs: LibreOffice's Python was not found; install .*python3-uno"):
        check_import(_office(tmp_path), ())
