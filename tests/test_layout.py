"""The package's layout keeps its architecture (common practice for layered code; GUIDE.md):

* imports run only downward, errors <- input <- distributions <- stats <- worksheet, report <-
  templates <- cli
  (worksheet and report never import each other; the entry modules ``__init__``, ``__main__``
  and ``udfs`` sit on top);
* no import circle between the package's modules;
* no private name (leading underscore) imported from another module;
* no module over about 600 lines, and no function over 60 lines unless its docstring says why
  in a paragraph that starts ``Length:``.

The imports are read with ``ast``, so lazy imports inside functions count as well. The checks
are run on a small package with one violation of each kind first, so that they are known to
fail when they should.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

import sheetfuncs

PACKAGE = "sheetfuncs"
#: Rank of each layer; a module may import its own layer and the layers of lower rank.
RANKS = {"errors": 0, "input": 1, "distributions": 2, "stats": 3, "worksheet": 4, "report": 4, "templates": 5,
         "engines": 4,
         "cli": 6}
ENTRY = {"", "__main__", "udfs"}  # the package itself, ``python -m``, the module xlwings loads
MODULE_LINES = 600
FUNCTION_LINES = 60


class Tree:
    """The modules of a package below ``root`` (named without the package prefix), read once."""

    def __init__(self, root: Path) -> None:
        self.files: dict[str, Path] = {}
        for path in sorted(root.rglob("*.py")):
            parts = list(path.relative_to(root).with_suffix("").parts)
            if parts[-1] == "__init__":
                parts = parts[:-1]
            self.files[".".join(parts)] = path
        self.trees = {m: ast.parse(p.read_text(encoding="utf-8")) for m, p in self.files.items()}

    def imports(self, name: str) -> list[tuple[str, list[str], int]]:
        """``(module, names imported from it, line)`` for each import of the package itself."""
        package = self.files[name].name == "__init__.py"
        here = [p for p in name.split(".") if p]
        if not package:
            here = here[:-1]
        out = []
        for node in ast.walk(self.trees[name]):
            if isinstance(node, ast.ImportFrom) and node.level:
                base = here[: len(here) - (node.level - 1)] if node.level > 1 else here
                target = ".".join(base + (node.module.split(".") if node.module else []))
                out.append((target, [a.name for a in node.names], node.lineno))
            elif isinstance(node, (ast.ImportFrom, ast.Import)):
                mods = [node.module or ""] if isinstance(node, ast.ImportFrom) else [a.name for a in node.names]
                for mod in mods:
                    if mod == PACKAGE or mod.startswith(PACKAGE + "."):
                        names = [a.name for a in node.names] if isinstance(node, ast.ImportFrom) else []
                        out.append((mod[len(PACKAGE) + 1:], names, node.lineno))
        return out

    def targets(self, name: str) -> list[tuple[str, int]]:
        """The modules ``name`` imports (an imported name that is a submodule counts as one)."""
        out = []
        for target, names, line in self.imports(name):
            subs = [f"{target}.{n}".strip(".") for n in names if f"{target}.{n}".strip(".") in self.files]
            out += [(s, line) for s in subs]
            if len(subs) < len(names) or not names:
                out.append((target, line))
        return out


def layer(name: str) -> str | None:
    first = name.split(".")[0]
    return first if first in RANKS else None


def upward_imports(tree: Tree, name: str) -> list[str]:
    if name in ENTRY:
        return []
    own = layer(name)
    if own is None:
        return [f"{name} sits outside the layers {sorted(RANKS)}"]
    bad = []
    for target, line in tree.targets(name):
        if target == "":
            continue  # the package's own attributes (e.g. __version__)
        other = layer(target)
        if other is None or (other != own and RANKS[other] >= RANKS[own]):
            bad.append(f"{name}:{line} imports {target or PACKAGE}: upward, sideways or outside the layers")
    return bad


def private_imports(tree: Tree, name: str) -> list[str]:
    bad = []
    for target, names, line in tree.imports(name):
        private = [n for n in names if n.startswith("_") and not n.startswith("__")]
        if private or any(p.startswith("_") and not p.startswith("__") for p in target.split(".")):
            bad.append(f"{name}:{line} imports private {private or target} from {target}")
    return bad


def circle(tree: Tree) -> list[str]:
    graph = {m: sorted({t for t, _ in tree.targets(m) if t in tree.files and t != m}) for m in tree.files}
    state: dict[str, int] = {}
    stack: list[str] = []

    def visit(m: str) -> list[str]:
        state[m] = 1
        stack.append(m)
        for t in graph[m]:
            if state.get(t) == 1:
                return stack[stack.index(t):] + [t]
            if t not in state and (found := visit(t)):
                return found
        stack.pop()
        state[m] = 2
        return []

    for m in sorted(graph):
        if m not in state and (found := visit(m)):
            return found
    return []


def long_functions(tree: Tree, name: str) -> list[str]:
    bad = []
    for node in ast.walk(tree.trees[name]):
        if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)):
            length = node.end_lineno - node.lineno + 1
            if length > FUNCTION_LINES and "\nLength:" not in "\n" + (ast.get_docstring(node) or ""):
                bad.append(f"{name}.{node.name} has {length} lines; split it or say why ('Length:')")
    return bad


TREE = Tree(Path(sheetfuncs.__file__).resolve().parent)


@pytest.fixture(scope="module")
def broken(tmp_path_factory) -> Tree:
    """A package with one violation of each kind."""
    root = tmp_path_factory.mktemp("pkg")
    files = {
        "__init__.py": "",
        "errors.py": "",
        "input/__init__.py": "from ..stats import core  # upward\n",
        "stats/__init__.py": "",
        "stats/core.py": "from ..input.cells import _hidden  # private\nfrom . import loop\n",
        "stats/loop.py": "def f():\n    from . import core  # a circle, lazily\n",
        "cli/__init__.py": "def long():\n" + "    x = 1\n" * 70,
    }
    for rel, text in files.items():
        (root / rel).parent.mkdir(parents=True, exist_ok=True)
        (root / rel).write_text(text)
    (root / "input/cells.py").write_text("_hidden = 1\n")
    return Tree(root)


def test_the_checks_find_each_kind_of_violation(broken):
    assert upward_imports(broken, "input") and not upward_imports(broken, "stats.core")
    assert private_imports(broken, "stats.core") and not private_imports(broken, "stats.loop")
    assert circle(broken) in (["stats.core", "stats.loop", "stats.core"], ["stats.loop", "stats.core", "stats.loop"])
    assert long_functions(broken, "cli") and not long_functions(broken, "stats.loop")


@pytest.mark.parametrize("name", sorted(TREE.files))
def test_imports_run_downward(name):
    assert upward_imports(TREE, name) == []


@pytest.mark.parametrize("name", sorted(TREE.files))
def test_no_private_name_is_imported_from_another_module(name):
    assert private_imports(TREE, name) == []


def test_no_import_circle():
    assert circle(TREE) == [], "import circle: " + " -> ".join(circle(TREE))


@pytest.mark.parametrize("name", sorted(TREE.files))
def test_module_size(name):
    lines = TREE.files[name].read_text(encoding="utf-8").count("\n")
    assert lines <= MODULE_LINES, f"{name} has {lines} lines; split it by topic"


@pytest.mark.parametrize("name", sorted(TREE.files))
def test_long_functions_say_why(name):
    assert long_functions(TREE, name) == []
