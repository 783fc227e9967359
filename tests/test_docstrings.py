"""Every public function documents each of its parameters, with the parameter's unit.

Common practice, no source: the contributor guide's docstring rule (numpydoc ``Parameters``
section; each parameter's description carries its unit in brackets, ``[m]``, ``[W m⁻² K⁻¹]``,
``[-]`` for a number without unit or an object). Software behaviour only; no physics.
"""

from __future__ import annotations

import ast
import re
from pathlib import Path

PACKAGE = Path(__file__).resolve().parents[1] / "finkit"
_SECTION_END = re.compile(r"\n(Returns|Raises|Notes|Examples|References|Yields|See Also)\n")


def _public_functions():
    """(dotted name, parameter names, docstring) of every public function and method."""
    for path in sorted(PACKAGE.rglob("*.py")):
        module = ".".join(path.relative_to(PACKAGE.parent).with_suffix("").parts)
        tree = ast.parse(path.read_text(encoding="utf-8"))
        for node in tree.body:
            functions = []
            if isinstance(node, ast.FunctionDef) and not node.name.startswith("_"):
                functions = [(node.name, node)]
            elif isinstance(node, ast.ClassDef) and not node.name.startswith("_"):
                functions = [
                    (f"{node.name}.{m.name}", m)
                    for m in node.body
                    if isinstance(m, ast.FunctionDef) and not m.name.startswith("_")
                ]
            for name, function in functions:
                args = function.args.posonlyargs + function.args.args + function.args.kwonlyargs
                params = [a.arg for a in args if a.arg not in ("self", "cls")]
                if params:
                    yield f"{module}.{name}", params, ast.get_docstring(function) or ""


def parameter_problems(params: list[str], doc: str) -> list[str]:
    """What is missing from a docstring: a Parameters section, a parameter, a unit."""
    if "Parameters\n" not in doc:
        return ["no Parameters section"]
    section = _SECTION_END.split(doc.split("Parameters\n", 1)[1])[0]
    problems = []
    for param in params:
        # an entry starts at the left margin: "name : type" or "a, b : type" (not a description
        # line that happens to hold the name)
        names = rf"^(?=\w)[\w, ]*\b{re.escape(param)}\b[\w, ]*(\s*:[^\n]*)?$"
        indented = r"(\n(    |\t)[^\n]*|\n\s*\n(    |\t)[^\n]*)*"
        entry = re.search(names + indented, section, re.M)
        if entry is None:
            problems.append(f"{param} not documented")
        elif not re.search(r"\[[^\]\n]*\]", entry.group(0)):
            problems.append(f"{param} has no [unit]")
    return problems


def test_every_public_function_documents_its_parameters_with_units():
    found = [
        f"{name}: {problem}"
        for name, params, doc in _public_functions()
        for problem in parameter_problems(params, doc)
    ]
    assert found == [], f"{len(found)} problems:\n" + "\n".join(found)


def test_the_check_finds_a_missing_unit_and_a_missing_parameter():
    doc = "Sum.\n\nParameters\n----------\na : float\n    First. [m]\nb : float\n    Second.\n"
    assert parameter_problems(["a", "b"], doc) == ["b has no [unit]"]
    assert parameter_problems(["a", "c"], doc) == ["c not documented"]
    assert parameter_problems(["a"], "Sum.") == ["no Parameters section"]
    # a description line that holds another parameter's name is not that parameter's entry
    doc = "F.\n\nParameters\n----------\nflow : Flow\n    How air moves. [-]\nair : A\n    A.\n"
    assert parameter_problems(["flow", "air"], doc) == ["air has no [unit]"]
