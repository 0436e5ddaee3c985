"""The package's shape: module and function sizes, names that look like tests, layering.

Limits (the project's own rules, DEVELOPERS.md): a module of at most 600 lines of code and a
function of at most 100, docstrings, comments and blank lines not counted; no file named like a
test inside the package; calculation layers import neither ipywidgets nor plotly.
"""

from __future__ import annotations

import ast
import io
import pathlib
import tokenize

import pytest

PACKAGE = pathlib.Path(__file__).resolve().parents[1] / "workbench"
MODULES = sorted(p for p in PACKAGE.rglob("*.py") if "__pycache__" not in p.parts)
MODULE_LIMIT = 600
FUNCTION_LIMIT = 100


def code_lines(source: str) -> set[int]:
    """Line numbers that carry code: not blank, not a comment, not part of a docstring."""
    tree = ast.parse(source)
    docstring_lines: set[int] = set()
    for node in ast.walk(tree):
        if isinstance(node, (ast.Module, ast.ClassDef, ast.FunctionDef, ast.AsyncFunctionDef)):
            body = node.body
            if body and isinstance(body[0], ast.Expr) and isinstance(
                    getattr(body[0], "value", None), ast.Constant) and isinstance(
                    body[0].value.value, str):
                docstring_lines.update(range(body[0].lineno, body[0].end_lineno + 1))
    lines: set[int] = set()
    for tok in tokenize.generate_tokens(io.StringIO(source).readline):
        if tok.type in (tokenize.COMMENT, tokenize.NL, tokenize.NEWLINE, tokenize.INDENT,
                        tokenize.DEDENT, tokenize.ENDMARKER):
            continue
        for line in range(tok.start[0], tok.end[0] + 1):
            if line not in docstring_lines:
                lines.add(line)
    return lines


def test_code_line_counter_skips_docstrings_and_comments():
    source = 'def f():\n    """Doc\n    string."""\n    # comment\n\n    return 1\n'
    assert code_lines(source) == {1, 6}


@pytest.mark.parametrize("path", MODULES, ids=[str(p.relative_to(PACKAGE)) for p in MODULES])
def test_module_and_function_sizes(path):
    source = path.read_text(encoding="utf-8")
    lines = code_lines(source)
    assert len(lines) <= MODULE_LIMIT, f"{path.name}: {len(lines)} lines of code"
    long = []
    for node in ast.walk(ast.parse(source)):
        if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef)):
            size = sum(1 for n in lines if node.lineno <= n <= node.end_lineno)
            if size > FUNCTION_LIMIT:
                long.append(f"{node.name} ({size})")
    assert not long, f"{path.name}: functions over {FUNCTION_LIMIT} lines of code: {long}"


def test_no_module_in_the_package_is_named_like_a_test():
    named = [str(p.relative_to(PACKAGE)) for p in MODULES
             if p.name.startswith("test_") or p.name.endswith("_test.py")]
    assert named == []


CALCULATION = [p for p in MODULES if "ui" not in p.relative_to(PACKAGE).parts[:1]
               and p.name not in ("cli.py", "__main__.py")]


@pytest.mark.parametrize("path", CALCULATION,
                         ids=[str(p.relative_to(PACKAGE)) for p in CALCULATION])
def test_calculation_layers_import_no_widgets_or_plotly(path):
    tree = ast.parse(path.read_text(encoding="utf-8"))
    imported = set()
    for node in ast.walk(tree):
        if isinstance(node, ast.Import):
            imported.update(alias.name.split(".")[0] for alias in node.names)
        elif isinstance(node, ast.ImportFrom) and node.level == 0 and node.module:
            imported.add(node.module.split(".")[0])
        elif isinstance(node, ast.ImportFrom) and node.level and node.module:
            assert not node.module.startswith("ui"), f"{path.name} imports the ui layer"
    assert not imported & {"ipywidgets", "plotly", "anywidget"}, (
        f"{path.name} imports {sorted(imported & {'ipywidgets', 'plotly', 'anywidget'})}")
