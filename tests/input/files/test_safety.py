"""Tests of sheetfuncs.input.files.safety: each refused input gets its one clear line.

Entity bombs, the size limit, corrupt, encrypted and old-format files; then, through the command
line and a written report: macros never run or copied, inputs never overwritten, existing
outputs kept, and formula-like labels that stay text all the way into a written report. (Empty
and missing sheets and formulas without saved values: test_xlsx.py.)
"""

from __future__ import annotations

import struct
import zipfile
from pathlib import Path

import openpyxl
import pytest

from sheetfuncs.input.files import safety, xlsx
from sheetfuncs.cli import main
from sheetfuncs.errors import InputError
from sheetfuncs.input.files.reader import read_cells, read_groups
from sheetfuncs.input.files.safety import check_archive, openpyxl_uses_defusedxml
from tests.support.workbooks import make_book, patch_zip, sheet_xml

ROWS = [["A", "B"], [1.0, 2.0], [1.5, 2.5], [1.2, 2.1]]
SHEET = "xl/worksheets/sheet1.xml"
ENCRYPTED = (
    "sheetfuncs: locked.xlsx is encrypted (password-protected); remove the password in a "
    "spreadsheet program (save a copy without one) and read that copy"
)


def _book(tmp_path: Path, name: str = "in.xlsx") -> Path:
    return make_book(tmp_path / name, {"Data": ROWS})


def _laughs(levels: int) -> str:
    ents = ['<!ENTITY lol0 "lol">'] + [
        f'<!ENTITY lol{i} "{("&lol%d;" % (i - 1)) * 10}">' for i in range(1, levels + 1)
    ]
    return f"<!DOCTYPE worksheet [{''.join(ents)}]>", f"&lol{levels};"


def _bomb(tmp_path: Path, levels: int, member: str = SHEET, name: str = "bomb.xlsx") -> Path:
    src = _book(tmp_path, "clean.xlsx")
    xml = sheet_xml(src, member)
    dtd, ref = _laughs(levels)
    decl_end = xml.index("?>") + 2 if xml.startswith("<?xml") else 0
    xml = xml[:decl_end] + dtd + xml[decl_end:]
    if member == SHEET:
        xml = xml.replace("<t>A</t>", f"<t>{ref}</t>", 1)
    return patch_zip(src, tmp_path / name, {member: xml.encode()})


# --------------------------------------------------------------------------------------------
# XML entity bombs


def test_openpyxl_parses_through_defusedxml():
    assert openpyxl.DEFUSEDXML is True
    assert openpyxl_uses_defusedxml()


def test_entity_bomb_is_refused_before_parsing(tmp_path):
    path = _bomb(tmp_path, 9)  # 10**9 expansions if it were ever expanded
    with pytest.raises(InputError) as ei:
        read_cells(path)
    msg = str(ei.value)
    assert msg == (
        "sheetfuncs: bomb.xlsx contains an XML document type declaration (in "
        "xl/worksheets/sheet1.xml), which workbooks never need and XML entity bombs use; "
        "refusing to read it: re-save the workbook from a spreadsheet program you trust"
    )


@pytest.mark.parametrize("member", ["xl/workbook.xml", "[Content_Types].xml", "_rels/.rels"])
def test_entity_bomb_in_any_part_is_refused(tmp_path, member):
    path = _bomb(tmp_path, 9, member)
    with pytest.raises(InputError, match=r"XML document type declaration \(in " + member.replace("[", r"\[").replace(".", r"\.")):
        read_cells(path)


def test_bomb_behind_comments_and_utf16_is_still_found(tmp_path):
    src = _book(tmp_path, "clean.xlsx")
    xml = sheet_xml(src)
    dtd, _ = _laughs(2)
    decl_end = xml.index("?>") + 2 if xml.startswith("<?xml") else 0
    padded = xml[:decl_end] + "<!--" + "x" * 40000 + "-->\n" + dtd + xml[decl_end:]
    path = patch_zip(src, tmp_path / "padded.xlsx", {SHEET: padded.encode()})
    with pytest.raises(InputError, match="document type declaration"):
        read_cells(path)
    u16 = (xml[:decl_end].replace("UTF-8", "UTF-16") + dtd + xml[decl_end:]).encode("utf-16")
    path = patch_zip(src, tmp_path / "u16.xlsx", {SHEET: u16})
    with pytest.raises(InputError, match="document type declaration"):
        read_cells(path)


def test_bomb_behind_a_huge_comment_is_refused_by_defusedxml(tmp_path):
    # the prolog scan stops after 1 MB; the defused parser behind it still refuses
    src = _book(tmp_path, "clean.xlsx")
    xml = sheet_xml(src)
    dtd, _ = _laughs(2)
    padded = "<!--" + "x" * (1024 * 1024 + 100) + "-->" + dtd + xml
    path = patch_zip(src, tmp_path / "deep.xlsx", {SHEET: padded.encode()})
    with pytest.raises(InputError, match=r"^sheetfuncs: deep\.xlsx contains an XML document type declaration"):
        read_cells(path)


def test_defusedxml_inside_openpyxl_refuses_a_bomb_the_scan_missed(tmp_path, monkeypatch):
    from defusedxml import DefusedXmlException

    path = _bomb(tmp_path, 3)  # small: harmless even if it were expanded
    # openpyxl on its own refuses it (defusedxml): the library is configured safely.
    with pytest.raises(Exception) as ei:
        wb = openpyxl.load_workbook(path, read_only=True, data_only=True)
        try:
            list(wb.worksheets[0].values)
        finally:
            wb.close()
    chain, cur = [], ei.value
    while cur is not None:
        chain.append(cur)
        cur = cur.__cause__ or cur.__context__
    assert any(isinstance(x, DefusedXmlException) for x in chain)
    # With the prolog scan switched off, the reader still turns it into the one clear line.
    monkeypatch.setattr(safety, "_has_doctype", lambda zf, info: False)
    with pytest.raises(InputError, match=r"bomb\.xlsx contains an XML document type declaration"):
        read_cells(path)


def test_workbooks_are_refused_when_openpyxl_is_not_defused(tmp_path, monkeypatch):
    monkeypatch.setattr(xlsx, "openpyxl_uses_defusedxml", lambda: False)
    with pytest.raises(InputError, match="openpyxl is not parsing through defusedxml"):
        read_cells(_book(tmp_path))


# --------------------------------------------------------------------------------------------
# size limit


def _forge_size(path: Path, member: str, size: int) -> Path:
    """Rewrite the central directory's uncompressed size of ``member`` (nothing is inflated)."""
    data = bytearray(path.read_bytes())
    name = member.encode()
    pos = 0
    while True:
        pos = data.find(b"PK\x01\x02", pos)
        assert pos >= 0, "member not in the central directory"
        nlen = struct.unpack_from("<H", data, pos + 28)[0]
        if bytes(data[pos + 46:pos + 46 + nlen]) == name:
            struct.pack_into("<I", data, pos + 24, size)
            break
        pos += 4
    path.write_bytes(bytes(data))
    return path


def test_size_limit_is_checked_from_the_zip_directory(tmp_path):
    path = _forge_size(_book(tmp_path, "huge.xlsx"), SHEET, 600 * 1024 * 1024)
    with zipfile.ZipFile(path) as z:
        assert sum(i.file_size for i in z.infolist()) > 600 * 1024 * 1024
    with pytest.raises(InputError) as ei:
        read_cells(path)
    assert str(ei.value).startswith(
        "sheetfuncs: huge.xlsx would unpack to 600 MB, more than the 512 MB limit for workbooks; "
        "if you trust the file, raise the limit (command line: --size-limit 601)"
    )


def test_size_limit_can_be_raised(tmp_path, capsys):
    path = _book(tmp_path)
    with pytest.raises(InputError, match="more than the 1 kB limit"):
        read_cells(path, size_limit=1024)
    assert read_cells(path, size_limit=10 * 1024 * 1024).n_rows == 4
    # the command line: a tiny limit refuses, the default reads
    assert main(["table", str(path), "--size-limit", "0.001"]) == 1
    err = capsys.readouterr().err
    assert "limit for workbooks" in err and err.count("\n") == 1
    assert main(["table", str(path), "--json"]) == 0


# --------------------------------------------------------------------------------------------
# corrupt, encrypted, old formats


def test_truncated_workbook(tmp_path):
    good = _book(tmp_path).read_bytes()
    path = tmp_path / "cut.xlsx"
    path.write_bytes(good[: len(good) // 2])
    with pytest.raises(InputError, match=r"^sheetfuncs: cut\.xlsx is damaged and cannot be read as a workbook"):
        read_cells(path)


def test_damaged_member_data(tmp_path):
    src = _book(tmp_path)
    data = bytearray(src.read_bytes())
    with zipfile.ZipFile(src) as z:
        info = z.getinfo(SHEET)
    start = info.header_offset + 30 + len(info.filename.encode()) + len(info.extra)
    for i in range(start + 10, start + info.compress_size - 4):
        data[i] ^= 0x5A
    path = tmp_path / "garbled.xlsx"
    path.write_bytes(bytes(data))
    with pytest.raises(InputError, match=r"^sheetfuncs: garbled\.xlsx (is damaged|cannot be read)"):
        read_cells(path)


def test_unknown_zip_compression_method(tmp_path):
    data = bytearray(_book(tmp_path).read_bytes())
    pos = data.find(b"PK\x01\x02")
    struct.pack_into("<H", data, pos + 10, 9)  # Deflate64 (PKWARE APPNOTE 4.4.5)
    path = tmp_path / "d64.xlsx"
    path.write_bytes(bytes(data))
    with pytest.raises(InputError, match=r"^sheetfuncs: d64\.xlsx uses a zip compression method that cannot be read"):
        read_cells(path)


def test_not_a_workbook(tmp_path):
    text = tmp_path / "data.xlsx"
    text.write_text("A,B\n1,2\n")
    with pytest.raises(InputError, match=r"not an \.xlsx workbook .*looks like text: if it is CSV data, give it a \.csv name"):
        check_archive(text)  # read_cells judges by content first: tests/input/files/test_filetype.py
    empty = tmp_path / "empty.xlsx"
    empty.write_bytes(b"")
    with pytest.raises(InputError, match=r"empty\.xlsx is empty"):
        read_cells(empty)
    other = tmp_path / "other.xlsx"
    with zipfile.ZipFile(other, "w") as z:
        z.writestr("readme.txt", "hello")
    with pytest.raises(InputError, match=r"other\.xlsx is a zip archive but not a workbook"):
        read_cells(other)
    junk = tmp_path / "junk.xlsx"
    junk.write_bytes(bytes(range(256)) * 8)
    with pytest.raises(InputError, match=r"junk\.xlsx is not an \.xlsx workbook \(not a zip archive\)"):
        read_cells(junk)


def _cfb(streams: dict[str, bytes]) -> bytes:
    """A minimal compound file ([MS-CFB] version 3, 512-byte sectors) holding ``streams``.

    Each stream is padded to 4,096 bytes (the mini-stream cutoff) so it lives in ordinary
    sectors. Sector 0 is the FAT, sector 1 the directory, then the streams' sectors.
    """
    end, free, fatsect, nostream = 0xFFFFFFFE, 0xFFFFFFFF, 0xFFFFFFFD, 0xFFFFFFFF
    assert len(streams) <= 3
    fat = [fatsect, end]
    entries = []
    body = b""
    nxt = 2
    for name, data in streams.items():
        data = data.ljust(4096, b"\0")
        n = len(data) // 512
        fat += list(range(nxt + 1, nxt + n)) + [end]
        entries.append((name, 2, nxt, len(data)))
        body += data
        nxt += n
    fat += [free] * (128 - len(fat))

    def entry(name: str, kind: int, start: int, size: int, left=nostream, right=nostream,
              child=nostream) -> bytes:
        raw = name.encode("utf-16-le") + b"\0\0"
        return (raw.ljust(64, b"\0") + struct.pack("<HBB", len(raw), kind, 1)
                + struct.pack("<III", left, right, child) + b"\0" * 16 + b"\0" * 4
                + b"\0" * 16 + struct.pack("<IQ", start, size))

    dir_sector = entry("Root Entry", 5, end, 0, child=1 if entries else nostream)
    for i, (name, kind, start, size) in enumerate(entries, 1):
        right = i + 1 if i < len(entries) else nostream
        dir_sector += entry(name, kind, start, size, right=right)
    dir_sector = dir_sector.ljust(512, b"\0")
    header = (b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1" + b"\0" * 16
              + struct.pack("<HHHHH", 0x3E, 3, 0xFFFE, 9, 6) + b"\0" * 6
              + struct.pack("<IIIIIIIII", 0, 1, 1, 0, 4096, end, 0, end, 0)
              + struct.pack("<109I", 0, *([free] * 108)))
    assert len(header) == 512
    return header + struct.pack("<128I", *fat) + dir_sector + body


def test_encrypted_workbook(tmp_path):
    path = tmp_path / "locked.xlsx"
    path.write_bytes(_cfb({"EncryptionInfo": b"\x04\x00\x04\x00", "EncryptedPackage": b"\x10"}))
    assert safety._cfb_names(path) >= {"Root Entry", "EncryptionInfo", "EncryptedPackage"}
    with pytest.raises(InputError) as ei:
        read_cells(path)
    assert str(ei.value) == ENCRYPTED


def test_workbook_encrypted_by_an_independent_implementation(tmp_path):
    # reference library: msoffcrypto-tool encrypts with a password as [MS-OFFCRYPTO] (agile
    # encryption); the reader must recognise the result without the password
    import io

    import openpyxl
    from msoffcrypto.format.ooxml import OOXMLFile

    wb = openpyxl.Workbook()
    for row in (("Zone 1", "Zone 2"), (181.2, 182.4), (180.7, 181.9)):  # invented readings
        wb.active.append(row)
    plain = io.BytesIO()
    wb.save(plain)
    plain.seek(0)
    path = tmp_path / "locked.xlsx"
    with open(path, "wb") as out:
        OOXMLFile(plain).encrypt("a password", out)
    with pytest.raises(InputError) as ei:
        read_cells(path)
    assert str(ei.value) == ENCRYPTED


def test_old_binary_workbook_in_disguise(tmp_path):
    path = tmp_path / "old.xlsx"
    path.write_bytes(_cfb({"Workbook": b"\x09\x08"}))
    with pytest.raises(InputError) as ei:
        check_archive(path)
    assert str(ei.value) == (
        "sheetfuncs: old.xlsx is an old binary .xls workbook (whatever its name says), which "
        "sheetfuncs does not read; save it as .xlsx (Excel Workbook) and try again"
    )


# --------------------------------------------------------------------------------------------
# through the command line and a written report


def _xlsm(tmp_path: Path) -> Path:
    rows = [["Lot A", "Lot B"], [1.0, 2.0], [1.5, 2.5], [1.2, 2.1], [1.1, 2.4]]
    src = make_book(tmp_path / "m.xlsx", {"Data": rows})
    with zipfile.ZipFile(src) as z:
        ct = z.read("[Content_Types].xml").decode()
        rels = z.read("xl/_rels/workbook.xml.rels").decode()
    ct = ct.replace("application/vnd.openxmlformats-officedocument.spreadsheetml.sheet.main+xml",
                    "application/vnd.ms-excel.sheet.macroEnabled.main+xml")
    ct = ct.replace("</Types>", '<Default Extension="bin" ContentType="application/vnd.ms-office.vbaProject"/></Types>')
    rels = rels.replace("</Relationships>", '<Relationship Id="rIdVba" Type="http://schemas.microsoft.com/office/2006/relationships/vbaProject" Target="vbaProject.bin"/></Relationships>')
    return patch_zip(src, tmp_path / "macro.xlsm", {
        "[Content_Types].xml": ct.encode(),
        "xl/_rels/workbook.xml.rels": rels.encode(),
        "xl/vbaProject.bin": b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1 not a real macro project",
    })


def test_macros_are_not_loaded(tmp_path):
    wb = xlsx._open_workbook(_xlsm(tmp_path), data_only=True)
    try:
        assert wb.vba_archive is None
    finally:
        wb.close()


def test_report_never_carries_macros_over(tmp_path, capsys):
    src = _xlsm(tmp_path)
    out = tmp_path / "r.xlsx"
    assert main(["report", str(src), "-o", str(out)]) == 0
    with zipfile.ZipFile(out) as z:
        names = z.namelist()
        types = z.read("[Content_Types].xml").decode()
    assert not any("vba" in n.lower() for n in names)
    assert "macroEnabled" not in types and "vbaProject" not in types


def test_report_never_overwrites_its_input(tmp_path, capsys):
    src = _book(tmp_path, "lots.xlsx")
    before = src.read_bytes()
    for extra in ([], ["--force"]):
        assert main(["report", str(src), "-o", str(src), *extra]) == 1
        err = capsys.readouterr().err
        assert "would overwrite the input" in err and err.count("\n") == 1
        assert src.read_bytes() == before
    # nor through the writer's own check
    from sheetfuncs.report import write_report

    loaded = read_groups(src)
    with pytest.raises(InputError):
        write_report(loaded.groups, src, force=True, source=loaded.source)
    assert src.read_bytes() == before


def test_existing_report_is_kept_unless_forced(tmp_path, capsys):
    src = _book(tmp_path)
    out = tmp_path / "r.xlsx"
    out.write_bytes(b"keep me")
    assert main(["report", str(src), "-o", str(out)]) == 1
    assert "already exists and is kept; add --force" in capsys.readouterr().err
    assert out.read_bytes() == b"keep me"
    assert main(["report", str(src), "-o", str(out), "--force"]) == 0
    assert zipfile.is_zipfile(out)
    assert not [p for p in tmp_path.iterdir() if p.name.startswith(".") or p.suffix == ".tmp"]
    (tmp_path / "folder.xlsx").mkdir()
    assert main(["report", str(src), "-o", str(tmp_path / "folder.xlsx"), "--force"]) == 1
    assert "folder.xlsx names a folder; give -o a file name" in capsys.readouterr().err


@pytest.mark.parametrize("kind", ["csv", "xlsx"])
def test_formula_like_labels_stay_text_in_the_report(tmp_path, kind):
    labels = ["=1+2", "+A1", "-B", "@SUM(A1)", "\tTab", "\rCR"]
    values = [[1.0 + i, 1.3 + i, 1.1 + i] for i in range(len(labels))]
    if kind == "csv":
        src = tmp_path / "labels.csv"
        lines = [",".join('"' + lab + '"' for lab in labels)]
        lines += [",".join(str(values[j][i]) for j in range(len(labels))) for i in range(3)]
        src.write_text("\n".join(lines) + "\n", encoding="utf-8")
    else:
        wb = openpyxl.Workbook()
        ws = wb.active
        for j, lab in enumerate(labels, 1):
            c = ws.cell(row=1, column=j, value=lab)
            c.data_type = "s"  # stored as text, as a spreadsheet stores typed '=1+2
            for i in range(3):
                ws.cell(row=2 + i, column=j, value=values[j - 1][i])
        src = tmp_path / "labels.xlsx"
        wb.save(src)
    loaded = read_groups(src, labels="yes")
    assert loaded.groups.labels == tuple(lab.strip() for lab in labels)
    out = tmp_path / "report.xlsx"
    assert main(["report", str(src), "-o", str(out), "--factor", "=cmd|' /C calc'!A0"]) == 0
    wb = openpyxl.load_workbook(out)  # formulas as written, not values
    formulas = []
    texts = set()
    for ws in wb.worksheets:
        for row in ws.iter_rows():
            for c in row:
                if c.data_type == "f":
                    formulas.append(str(c.value))
                elif isinstance(c.value, str):
                    texts.add(c.value)
    for lab in loaded.groups.labels + ("=cmd|' /C calc'!A0",):
        assert lab in texts or any(lab in t for t in texts)
        # no formula the writer made contains the label as formula text of its own
        assert not any(f == lab or f.startswith(lab) for f in formulas)


def test_demo_reads_an_existing_files_properties_safely(tmp_path, monkeypatch, capsys):
    # a file dressed as a demo report, but with a document type declaration in its
    # properties part: the properties are never parsed, so the file is kept
    monkeypatch.chdir(tmp_path)
    assert main(["demo", "-o", "real.xlsx"]) == 0
    core = sheet_xml(tmp_path / "real.xlsx", "docProps/core.xml")
    dtd, _ = _laughs(6)
    decl_end = core.index("?>") + 2 if core.startswith("<?xml") else 0
    bad = patch_zip(tmp_path / "real.xlsx", tmp_path / "dressed.xlsx",
                    {"docProps/core.xml": (core[:decl_end] + dtd + core[decl_end:]).encode()})
    before = bad.read_bytes()
    capsys.readouterr()
    assert main(["demo", "-o", "dressed.xlsx"]) == 1
    (line,) = capsys.readouterr().err.splitlines()
    assert "is not a sheetfuncs demo report, so it is kept" in line
    assert bad.read_bytes() == before
    with pytest.raises(InputError, match="document type declaration"):
        xlsx.workbook_properties(bad)
