"""Tests of the parser (sheetfuncs.cli.parser): usage errors as two lines with exit code 2,
values that start with a minus sign, input files after the options, help and version."""

from __future__ import annotations

from pathlib import Path

import pytest

from sheetfuncs.cli import build_parser, main
from sheetfuncs.cli.parser import positive_mb, real, whole
from sheetfuncs.input import workbook_properties
from tests.support.cli import problem_files, run, small_csv, strict_json, write_csv


@pytest.mark.parametrize(
    "argv",
    [
        [],
        ["bogus"],
        ["table"],
        ["table", "x.csv", "--json", "--csv"],
        ["report", "x.csv"],
        ["report", "x.csv", "-o", "a.xlsx", "--out-dir", "d"],
        ["plan", "--groups", "three", "--effect", "0.25"],
        ["table", "x.csv", "--layout", "diagonal"],
        ["table", "x.csv", "--size-limit", "-5"],
    ],
)
def test_usage_errors_exit_2(argv, capsys):
    code, out, err = run(argv, capsys)
    assert code == 2 and out == ""
    assert "Traceback" not in err
    usage, line = err.splitlines()  # the command's usage, then one line that says what is wrong
    assert usage.startswith("usage: sheetfuncs")
    assert line.startswith("sheetfuncs: ") and line.endswith("--help)")


@pytest.mark.parametrize(
    "argv, fragment",
    [
        (["report", "lots.csv", "one.csv", "-o", "r.xlsx"], "use --out-dir DIR for several inputs"),
        (["table", "lots.csv", "one.csv"], "table reads one input"),
        (["table", "lots.csv", "--alpha", "abc"], 'argument --alpha: must be a number, not "abc"'),
        (["plan", "--groups", "three", "--effect", "0.25"], "must be a whole number"),
        (["table", "lots.csv", "--bogus"], "unrecognized arguments: --bogus"),
        (["demo", "-o", "demo.csv"], 'the report must be an .xlsx file, not "demo.csv"'),
    ],
)
def test_usage_problems_give_usage_and_one_line(tmp_path, capsys, monkeypatch, argv, fragment):
    monkeypatch.chdir(tmp_path)
    problem_files(tmp_path)
    code, out, err = run(argv, capsys)
    assert code == 2 and out == ""
    usage, line = err.splitlines()
    assert usage.startswith(f"usage: sheetfuncs {argv[0]} ")
    assert line.startswith(f"sheetfuncs: {argv[0]}: ") and fragment in line
    assert not (tmp_path / "r.xlsx").exists()


# --------------------------------------------------------------------------------------------
# values that start with a minus sign


@pytest.mark.parametrize("option", ["--title", "--factor", "--response", "--unit"])
def test_dash_values_are_documented_and_hinted(tmp_path, capsys, option):
    src = small_csv(tmp_path)
    assert main(["report", "--help"]) == 0
    helptext = " ".join(capsys.readouterr().out.split())
    assert f'for a value that starts with "-", write {option}=-2+3' in helptext
    code, out, err = run(["report", str(src), "-o", str(tmp_path / "r.xlsx"), option, "-2+3"],
                         capsys)
    assert code == 2 and out == ""
    assert f"write {option}=VALUE (e.g. {option}=-2+3)" in err.splitlines()[-1]
    assert not (tmp_path / "r.xlsx").exists()


def test_dash_value_with_equals_sign_is_taken(tmp_path, capsys):
    src = small_csv(tmp_path)
    out = tmp_path / "r.xlsx"
    code, _, err = run(["report", str(src), "-o", str(out), "--title=-2+3", "--unit=-dB"], capsys)
    assert code == 0, err
    assert "-2+3" in workbook_properties(out)["title"]


# --------------------------------------------------------------------------------------------
# input files after the options


def test_report_inputs_may_follow_the_options(tmp_path, capsys, monkeypatch):
    monkeypatch.chdir(tmp_path)
    a, b = small_csv(tmp_path, "a.csv"), small_csv(tmp_path, "b.csv", shift=0.5)
    code, out, err = run(["report", a.name, "--out-dir", "made/here", b.name], capsys)
    assert code == 0, err
    assert sorted(p.name for p in (tmp_path / "made" / "here").iterdir()) == [
        "a-report.xlsx", "b-report.xlsx"]  # --out-dir is created when missing
    assert out.splitlines() == [f"wrote {Path('made', 'here', f'{x.stem}-report.xlsx')}"
                                for x in (a, b)]  # in the order given


# --------------------------------------------------------------------------------------------
# option types, help and version


def test_option_types_name_the_bad_value():
    assert positive_mb("0.5") == 0.5 and real("-1e-3") == -0.001 and whole("12") == 12
    for check, text, words in [
        (positive_mb, "abc", 'must be a number of megabytes, not "abc"'),
        (positive_mb, "0", 'must be a positive number of megabytes, not "0"'),
        (positive_mb, "nan", 'must be a positive number of megabytes, not "nan"'),
        (real, "1,5", 'must be a number, not "1,5"'),
        (whole, "2.5", 'must be a whole number, not "2.5"'),
    ]:
        with pytest.raises(Exception, match=words) as caught:
            check(text)
        assert type(caught.value).__name__ == "ArgumentTypeError"


def test_each_command_ends_its_help_with_progress_and_help(capsys):
    for cmd in ("report", "demo", "table", "plan"):
        assert main([cmd, "--help"]) == 0
        text = capsys.readouterr().out
        head, other = text.split("\nother:\n")
        assert other.count("\n\n") == 0  # the last group
        assert "-h, --help" in other and "--help" not in head
        assert ("--progress, --no-progress" in other) == (cmd != "plan")  # plan reads no file


def test_build_parser_names_each_command_in_its_messages():
    parser = build_parser()
    args = parser.parse_args(["plan", "--groups", "3", "--effect", "0.25"])
    assert args.command == "plan" and args.alpha == 0.05 and args.power is None  # the command applies DEFAULT_POWER (0.8) unless --n is given
    assert args.parser.prog == "sheetfuncs plan"
    args = parser.parse_args(["table", "x.csv"])
    assert args.fmt == "text" and args.size_limit == 512 and args.parser.prog == "sheetfuncs table"


def test_version(capsys):
    code, out, _ = run(["--version"], capsys)
    from sheetfuncs import __version__

    assert code == 0 and out.strip() == f"sheetfuncs {__version__}"


def test_help_reads_well(capsys):
    assert main(["--help"]) == 0
    top = capsys.readouterr().out
    assert "commands:" in top and "positional arguments" not in top
    assert "sheetfuncs demo" in top and "Exit codes" in top
    for cmd in ("report", "demo", "table", "plan"):
        assert main([cmd, "--help"]) == 0
        text = capsys.readouterr().out
        assert text.startswith(f"usage: sheetfuncs {cmd} ")
        assert "positional arguments" not in text and "show this help and exit" in text
    assert main(["report", "--help"]) == 0
    text = " ".join(capsys.readouterr().out.split())
    for default in ("(default 0.05)", "(default tukey)", "(default Factor)", "(default Response)",
                    "(default 512)", "(default: the first worksheet)"):
        assert default in text, default


# -- the reading options: --errors missing, --merge-case, --rename ------------------------------


def na_csv(tmp_path: Path) -> Path:
    """Invented fill weights of three heads with two #N/A cells and a case-only label typo."""
    rows = [["Head 1", "Head 2", "head 2"], [50.2, 50.9, 50.7], ["#N/A", 50.8, 51.0],
            [50.4, "#N/A", 50.6], [50.1, 50.7, None]]
    return write_csv(tmp_path / "fill.csv", rows)


def test_errors_missing_merge_case_and_rename_on_the_command_line(tmp_path, capsys):
    path = str(na_csv(tmp_path))
    code, out, err = run(["table", path], capsys)
    assert code == 1 and err == (
        "sheetfuncs: the data hold the error #N/A at A3 of fill.csv (and 1 more); fix or clear "
        "that cell; or, to read error cells as missing values, give --errors missing (Python: "
        'errors="missing")\n'
    )
    code, out, err = run(["table", path, "--json", "--errors", "missing"], capsys)
    assert code == 0, err
    doc = strict_json(out)
    assert [(g["Group"], g["n"]) for g in doc["groups"]] == [("Head 1", 3), ("Head 2", 3), ("head 2", 3)]
    assert [(c["address"], c["action"]) for c in doc["input"]["ignored_cells"]] == [
        ("A3", "missing"), ("B4", "missing"),
    ]
    code, out, err = run(["table", path, "--json", "--errors", "missing", "--merge-case"], capsys)
    assert code == 0, err
    doc = strict_json(out)
    assert [(g["Group"], g["n"]) for g in doc["groups"]] == [("Head 1", 3), ("Head 2", 6)]
    assert doc["input"]["notes"] == ['label "head 2" merged into "Head 2" (they differ only in case)']
    code, out, err = run(["table", path, "--json", "--errors", "missing", "--rename", "head 2=Head 3",
                          "--rename", "Head 1=Head 0"], capsys)
    assert code == 0, err
    assert [g["Group"] for g in strict_json(out)["groups"]] == ["Head 0", "Head 2", "Head 3"]


@pytest.mark.parametrize("extra, message", [
    (["--rename", "head 2"],
     'cannot read the rename "head 2"; write it as OLD=NEW, e.g. --rename "supplier B=Supplier B"'),
    (["--rename", "Head 9=X"],
     'no group is labelled "Head 9", so it cannot be renamed; the labels are "Head 1", "Head 2", '
     '"head 2"'),
])
def test_bad_renames_exit_1_with_one_line(tmp_path, capsys, extra, message):
    code, out, err = run(["table", str(na_csv(tmp_path)), "--errors", "missing", *extra], capsys)
    assert code == 1 and out == "" and err == f"sheetfuncs: {message}\n"


def test_template_kinds_in_the_help_are_the_templates_kinds():
    from sheetfuncs.cli.parser import TEMPLATE_KINDS
    from sheetfuncs.templates import KINDS

    assert TEMPLATE_KINDS == tuple(KINDS)
