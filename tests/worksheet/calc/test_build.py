"""The Calc extension generated from the registry (sheetfuncs/worksheet/calc/build.py): the IDL,
the wizard texts, the component's text, and the whole .oxt compiled with the SDK's real
unoidl-write and read back with unoidl-read (both from LibreOffice's SDK; no LibreOffice runs).
"""

from __future__ import annotations

import ast
import re
import subprocess
import xml.etree.ElementTree as ET
import zipfile
from pathlib import Path
from typing import Any

import pytest

from sheetfuncs.errors import InputError
from sheetfuncs.udfs import REGISTRY
from sheetfuncs.worksheet.calc import build
from sheetfuncs.worksheet.calc.build import (
    CATEGORY, COMPONENT_FILE, addins_xcu, build_extension, compile_idl, component_text, find_sdk_tool,
    idl_text,
)
from sheetfuncs.worksheet.calc.names import SERVICE, argument_name, method_name

OOR = "{http://openoffice.org/2001/registry}"
MANIFEST = "{http://openoffice.org/2001/manifest}"
LANG = "{http://www.w3.org/XML/1998/namespace}lang"
TABLE, SCALAR = "sequence< sequence< any > >", "any"
RANGE = "com::sun::star::table::XCellRange"
CALLER = "com::sun::star::beans::XPropertySet"
# One method declaration, as written by idl_text and as printed by unoidl-read (which adds '::'
# in front of full type names).
METHOD = re.compile(r"^\s*(any|sequence< sequence< any > >) (\w+)\((.*)\);$", re.M)


def _methods(text: str) -> dict[str, tuple[str, list[tuple[str, str]]]]:
    """{method: (return type, [(parameter type, parameter name), ...])} of an IDL text."""
    out = {}
    for returns, name, params in METHOD.findall(text):
        pairs = [p.removeprefix("[in] ").rsplit(" ", 1) for p in params.split(", ")]
        out[name] = (returns, [(t.removeprefix("::"), n) for t, n in pairs])
    return out


def _expected_params(name: str) -> list[tuple[str, str]]:
    """From the registry itself: the caller first, 'data' as a cell range, the others any."""
    return [(CALLER, "document")] + [
        (RANGE if a.name == "data" else "any", argument_name(a.name)) for a in REGISTRY[name].args
    ]


def test_idl_has_one_method_per_function() -> None:
    methods = _methods(idl_text())
    assert sorted(methods) == sorted(method_name(n) for n in REGISTRY)
    for name, rec in REGISTRY.items():
        returns, params = methods[method_name(name)]
        assert returns == (TABLE if rec.result == "table" else SCALAR), f"{name}: returns {returns}"
        assert params == _expected_params(name), f"{name}: parameters {params}"
    assert "interface XFunctions : com::sun::star::uno::XInterface" in idl_text()
    assert idl_text().startswith("module org { module sheetfuncs { module calc { ")


def test_idl_of_a_smaller_registry() -> None:
    two = {n: REGISTRY[n] for n in ("SF_P", "SF_FTAIL")}
    assert sorted(_methods(idl_text(two))) == ["sfFtail", "sfP"]
    # SF_FTAIL has no data range: every argument is any
    assert [t for t, _ in _methods(idl_text(two))["sfFtail"][1]] == [CALLER, "any", "any", "any"]


def _xcu_functions(text: str) -> dict[str, ET.Element]:
    root = ET.fromstring(text.encode("utf-8"))
    assert root.tag == f"{OOR}component-data"
    assert (root.get(f"{OOR}name"), root.get(f"{OOR}package")) == ("CalcAddIns", "org.openoffice.Office")
    (info,) = root
    assert info.get(f"{OOR}name") == "AddInInfo"
    (service,) = info
    assert service.get(f"{OOR}name") == SERVICE
    (functions,) = service
    assert functions.get(f"{OOR}name") == "AddInFunctions"
    return {node.get(f"{OOR}name"): node for node in functions}


def _props(node: ET.Element) -> dict[str, str]:
    out = {}
    for prop in node.findall("prop"):
        (value,) = prop.findall("value")
        out[prop.get(f"{OOR}name")] = value.text or ""
    return out


def test_xcu_holds_the_registry_texts() -> None:
    nodes = _xcu_functions(addins_xcu())
    assert sorted(nodes) == sorted(method_name(n) for n in REGISTRY)
    for name, rec in REGISTRY.items():
        node = nodes[method_name(name)]
        props = _props(node)
        assert props["DisplayName"] == name
        assert props["Description"] == rec.description, f"{name}: description differs"
        assert props["Category"] == CATEGORY == "Add-In"
        assert props["CompatibilityName"] == name
        (params,) = node.findall("node")
        assert params.get(f"{OOR}name") == "Parameters"
        assert [p.get(f"{OOR}name") for p in params] == [argument_name(a.name) for a in rec.args]
        for p, a in zip(params, rec.args):
            assert _props(p) == {"DisplayName": a.name, "Description": a.dialog_text}, f"{name}({a.name})"
        # texts in US English; the category is not localised
        langs = {prop.get(f"{OOR}name"): prop.find("value").get(LANG) for prop in node.findall("prop")}
        assert langs == {"DisplayName": "en-US", "Description": "en-US", "Category": None,
                         "CompatibilityName": "en-US"}


def test_xcu_escapes_markup_in_texts() -> None:
    import dataclasses

    rec = REGISTRY["SF_P"]
    odd = dataclasses.replace(rec, description='p < 0.05 & "quoted" <b>')
    node = _xcu_functions(addins_xcu({"SF_P": odd}))["sfP"]
    assert _props(node)["Description"] == 'p < 0.05 & "quoted" <b>'


def _settings(text: str) -> dict[str, Any]:
    tree = ast.parse(text)
    (value,) = [n.value for n in tree.body if isinstance(n, ast.AnnAssign) and getattr(n.target, "id", "") == "SETTINGS"]
    return ast.literal_eval(value)


def test_component_text_has_its_settings_and_compiles() -> None:
    text = component_text(["/opt/env/lib/python3.11/site-packages", "/tmp/it's here"])
    compile(text, COMPONENT_FILE, "exec")
    settings = _settings(text)
    assert settings["service"] == "org.sheetfuncs.calc.Functions"
    assert settings["site_dirs"] == ["/opt/env/lib/python3.11/site-packages", "/tmp/it's here"]
    assert sorted(settings["functions"].values()) == sorted(REGISTRY)
    assert all(settings["functions"][method_name(n)] == n for n in REGISTRY)
    # the source as shipped keeps its marker, empty: the build fills it
    shipped = Path(build.__file__).with_name("component.py").read_text(encoding="utf-8")
    assert _settings(shipped) == {}
    changed = [(a, b) for a, b in zip(text.splitlines(), shipped.splitlines()) if a != b]
    assert len(text.splitlines()) == len(shipped.splitlines()) and len(changed) == 1
    assert changed[0][0] == f"SETTINGS: dict = {settings!r}"


# --------------------------------------------------------------------------------------------
# the SDK's real programs


def _sdk(name: str) -> Path:
    tool = find_sdk_tool(name)
    assert tool is not None, (
        f"{name} not found; install the LibreOffice SDK (Debian: apt-get install "
        "--no-install-recommends libreoffice-dev libreoffice-dev-common)"
    )
    return tool


def _read_rdb(rdb: Path) -> str:
    """unoidl-read's text of our type library (LibreOffice's registries go first)."""
    tool = _sdk("unoidl-read")
    program = tool.resolve().parents[2] / "program"  # .../libreoffice/sdk/bin/unoidl-read
    done = subprocess.run(
        [str(tool), str(program / "types.rdb"), str(program / "types" / "offapi.rdb"), str(rdb)],
        capture_output=True, text=True, timeout=120,
    )
    assert done.returncode == 0, done.stderr
    return done.stdout


@pytest.fixture(scope="module")
def oxt(tmp_path_factory) -> tuple[build.Built, Path]:
    target = tmp_path_factory.mktemp("oxt") / "out" / "sheetfuncs.oxt"
    return build_extension(target, site_dirs=["/opt/env/site-packages"], version="9.8.7"), target


def test_extension_members(oxt) -> None:
    built, target = oxt
    assert built.path == target and built.size == target.stat().st_size
    assert built.functions == tuple(REGISTRY) and built.site_dirs == ("/opt/env/site-packages",)
    assert target.stat().st_mode & 0o777 == 0o644
    assert not target.with_name(target.name + ".part").exists()
    with zipfile.ZipFile(target) as zf:
        assert zf.testzip() is None
        names = set(zf.namelist())
        assert names == {"META-INF/manifest.xml", "description.xml", "types.rdb", COMPONENT_FILE,
                         "CalcAddIns.xcu"}
        manifest = ET.fromstring(zf.read("META-INF/manifest.xml"))
        entries = {e.get(f"{MANIFEST}full-path"): e.get(f"{MANIFEST}media-type") for e in manifest}
        assert set(entries) <= names and set(entries) == {"types.rdb", COMPONENT_FILE, "CalcAddIns.xcu"}
        assert entries[COMPONENT_FILE] == "application/vnd.sun.star.uno-component;type=Python"
        desc = ET.fromstring(zf.read("description.xml"))
        ns = "{http://openoffice.org/extensions/description/2006}"
        assert desc.find(f"{ns}identifier").get("value") == "org.sheetfuncs.calc"
        assert desc.find(f"{ns}version").get("value") == "9.8.7"
        assert _settings(zf.read(COMPONENT_FILE).decode())["site_dirs"] == ["/opt/env/site-packages"]
        assert sorted(_xcu_functions(zf.read("CalcAddIns.xcu").decode())) == sorted(map(method_name, REGISTRY))


def test_compiled_types_list_every_method(oxt, tmp_path) -> None:
    _, target = oxt
    rdb = tmp_path / "types.rdb"
    with zipfile.ZipFile(target) as zf:
        rdb.write_bytes(zf.read("types.rdb"))
    methods = _methods(_read_rdb(rdb))
    assert sorted(methods) == sorted(method_name(n) for n in REGISTRY)
    for name, rec in REGISTRY.items():
        returns, params = methods[method_name(name)]
        assert returns == (TABLE if rec.result == "table" else SCALAR)
        assert params == _expected_params(name), f"{name}: compiled parameters {params}"


def test_unoidl_write_refuses_an_underscore_before_lower_case() -> None:
    # the rule names.py follows, measured with the SDK: 'factor_name' is not an identifier
    idl = "module a { interface XB : com::sun::star::uno::XInterface { any f([in] any factor_name); }; };\n"
    with pytest.raises(RuntimeError, match="^unoidl-write failed: .*factor_name"):
        compile_idl(idl, _sdk("unoidl-write"))
    assert compile_idl(idl.replace("factor_name", "factorName"), _sdk("unoidl-write"))


def test_missing_unoidl_write_gives_one_line(tmp_path, monkeypatch) -> None:
    monkeypatch.setenv("PATH", str(tmp_path))  # neither unoidl-write nor soffice to be found
    assert find_sdk_tool("unoidl-write") is None
    target = tmp_path / "x.oxt"
    with pytest.raises(InputError) as err:
        build_extension(target)
    line = str(err.value)
    assert line.startswith("sheetfuncs: unoidl-write (LibreOffice SDK) was not found") and "\n" not in line
    assert "apt-get install --no-install-recommends libreoffice-dev libreoffice-dev-common" in line
    assert not target.exists() and not list(tmp_path.iterdir())


def test_unoidl_write_without_type_registries_gives_one_line(tmp_path, monkeypatch) -> None:
    tool = tmp_path / "sdk" / "bin" / "unoidl-write"
    tool.parent.mkdir(parents=True)
    tool.write_text("#!/bin/sh\nexit 0\n")
    tool.chmod(0o755)
    monkeypatch.setenv("PATH", str(tool.parent))
    assert find_sdk_tool("unoidl-write") == tool
    with pytest.raises(InputError, match=r"^sheetfuncs: LibreOffice's type registries .* were not found"):
        compile_idl(idl_text(), tool)
