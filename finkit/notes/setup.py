"""Before a note runs: the case checked and prepared, the template found, the kernel registered."""

from __future__ import annotations

import datetime as _dt
import json
import math
import os
import sys
from collections.abc import Mapping
from pathlib import Path
from typing import Any

from finkit.errors import InputError, NotSupportedError
from finkit.notes.files import (
    _TEMPLATE_DIR,
    KERNEL_NAME,
    TEMPLATES_BY_KIND,
    PreparedCase,
    atomic_write,
)

__all__ = [
    "check_template",
    "ensure_kernel",
    "json_safe",
    "parameter_names",
    "prepare_case",
    "template_path",
]


# --------------------------------------------------------------------------------------------
# Case, template, kernel


def json_safe(value: Any, where: str) -> Any:
    """A JSON-safe deep copy of ``value``; dates become ISO strings.

    Parameters
    ----------
    value : object
        A case mapping as entered, or a part of it. [-]
    where : str
        Path of ``value`` in the case, for the error message. [-]
    """
    if isinstance(value, Mapping):
        out = {}
        for key, item in value.items():
            if not isinstance(key, str):
                raise InputError(f"case key {key!r} at {where} is not a string; quote it")
            out[key] = json_safe(item, f"{where}.{key}")
        return out
    if isinstance(value, list | tuple):
        return [json_safe(item, f"{where}[{i}]") for i, item in enumerate(value)]
    if value is None or isinstance(value, str | bool | int):
        return value
    if isinstance(value, float):
        if not math.isfinite(value):
            raise InputError(f"case value at {where} is {value!r}; only finite numbers allowed")
        return value
    if isinstance(value, _dt.date):  # YAML turns 2025-01-31 into a date
        return value.isoformat()
    raise InputError(
        f"case value at {where} has type {type(value).__name__}; allowed: "
        "str, number, bool, null, list, mapping"
    )


def prepare_case(
    case: str | os.PathLike | Mapping[str, Any], *, validate: bool = True
) -> PreparedCase:
    """Read and check a case for a note: the dict to inject, its id and kind.

    Parameters
    ----------
    case : path-like or mapping
        A YAML case file or the case as a mapping (as entered: unit strings allowed). [-]
    validate : bool, optional
        Validate with ``finkit.case.load_case`` (imported here, when called). With ``False``
        the mapping is only made JSON-safe and must itself hold ``case_id`` and ``kind``; used
        by tests of the note machinery. [-]

    Returns
    -------
    PreparedCase
        ``case`` (JSON-safe deep copy, as entered), ``case_id``, ``kind`` and ``validated``
        (what ``load_case`` returned, or the dict when ``validate`` is false). [-]
    """
    if validate:
        # load_case reads the file itself (duplicate keys, YAML errors, source path) and keeps
        # the case as entered in ``.entered``.
        from finkit.case.schema import load_case

        source = dict(case) if isinstance(case, Mapping) else Path(case)
        validated: Any = load_case(source)
        entered = getattr(validated, "entered", None)
        raw = entered if isinstance(entered, Mapping) else source
        if not isinstance(raw, Mapping):
            raise NotSupportedError("finkit.case.load_case returned a case without .entered")
        data = json_safe(raw, "case")
    else:
        data = json_safe(_read_case_mapping(case), "case")
        validated = data
    case_id = getattr(validated, "case_id", None) or data.get("case_id")
    kind = getattr(validated, "kind", None) or data.get("kind")
    if not case_id:
        raise InputError("case: field 'case_id' is missing; give a short name like NB-200-rev-A")
    if not isinstance(kind, str) or not kind:
        raise InputError(f"case: field 'kind' is missing; allowed: {', '.join(TEMPLATES_BY_KIND)}")
    return PreparedCase(data, str(case_id), kind, validated)


def _read_case_mapping(case: str | os.PathLike | Mapping[str, Any]) -> Mapping[str, Any]:
    """The mapping given, or the top-level mapping of a YAML file (no validation)."""
    if isinstance(case, Mapping):
        return case
    path = Path(case)
    if not path.is_file():
        raise InputError(f"case file {str(path)!r} does not exist")
    import yaml

    try:
        raw = yaml.safe_load(path.read_text(encoding="utf-8"))
    except yaml.YAMLError as exc:
        first = str(exc).splitlines()[0] if str(exc) else type(exc).__name__
        raise InputError(f"case file {str(path)!r} is not valid YAML: {first}") from None
    if not isinstance(raw, Mapping):
        raise InputError(f"case file {str(path)!r} must hold a mapping at the top level")
    return raw


def template_path(kind: str, template: str | os.PathLike | None = None) -> Path:
    """The notebook template for a case kind, or the one given.

    Parameters
    ----------
    kind : str
        Case kind, a key of :data:`TEMPLATES_BY_KIND`. [-]
    template : path-like, optional
        An explicit ``.ipynb`` template; overrides the kind. [-]

    Returns
    -------
    pathlib.Path
        An existing notebook file. [-]
    """
    if template is not None:
        path = Path(template)
        if path.suffix != ".ipynb" or not path.is_file():
            raise InputError(f"template={str(path)!r} is not an existing .ipynb file")
        return path
    if kind not in TEMPLATES_BY_KIND:
        raise InputError(
            f"kind={kind!r} has no note template; allowed: {', '.join(TEMPLATES_BY_KIND)}"
        )
    path = _TEMPLATE_DIR / TEMPLATES_BY_KIND[kind]
    if not path.is_file():
        raise NotSupportedError(f"kind={kind!r}: note template {path} is not installed")
    return path


def check_template(path: Path) -> set[str]:
    """The template has one cell tagged ``parameters`` that defines ``case`` and ``note_time``;
    returns the names that cell defines.

    Parameters
    ----------
    path : pathlib.Path
        Notebook template. [-]
    """
    import nbformat

    nb = nbformat.read(path, as_version=4)
    tagged = [c for c in nb.cells if "parameters" in c.get("metadata", {}).get("tags", [])]
    if len(tagged) != 1:
        raise InputError(
            f"template {path.name}: {len(tagged)} cells tagged 'parameters'; exactly one is needed"
        )
    names = parameter_names(tagged[0].source, path.name)
    missing = {"case", "note_time"} - names
    if missing:
        raise InputError(
            f"template {path.name}: the parameters cell does not define "
            f"{', '.join(sorted(missing))}"
        )
    return names


def parameter_names(source: str, template: str = "template") -> set[str]:
    """The names a parameters cell binds at its top level (``x = ...``, ``x: T = ...``).

    What papermill's ``inspect_notebook`` reports for a Python parameters cell (tested against
    it on finkit's templates), read with :mod:`ast` so that checking a template does not import
    papermill (0.15 s of every ``finkit note`` and of an unchanged batch re-run).

    Parameters
    ----------
    source : str
        The cell's code. [-]
    template : str, optional
        The template's name, for the error message. [-]
    """
    import ast

    try:
        tree = ast.parse(source)
    except SyntaxError as exc:
        raise InputError(
            f"template {template}: the parameters cell is not valid Python ({exc.msg}, line "
            f"{exc.lineno})"
        ) from None
    names: set[str] = set()
    for node in tree.body:
        targets = node.targets if isinstance(node, ast.Assign) else []
        if isinstance(node, ast.AnnAssign):
            targets = [node.target]
        for target in targets:
            elts = target.elts if isinstance(target, ast.Tuple | ast.List) else [target]
            names.update(e.id for e in elts if isinstance(e, ast.Name))
    return names


def ensure_kernel(name: str = KERNEL_NAME) -> str:
    """Make sure a Jupyter kernel named ``name`` runs this interpreter; install it if missing.

    The kernelspec is installed into this environment (``sys.prefix/share/jupyter/kernels``),
    so nothing outside the project's virtual environment is touched; only if that folder is not
    writable is it installed for the user.

    Parameters
    ----------
    name : str, optional
        Kernel name. [-]

    Returns
    -------
    str
        ``name``, ready to pass to papermill. [-]

    Raises
    ------
    finkit.errors.NotSupportedError
        If ipykernel is not installed, or a kernelspec of that name found first on the Jupyter
        path runs another interpreter.
    """
    try:
        import ipykernel.kernelspec
    except ImportError:
        raise NotSupportedError(
            f"ipykernel is not installed for {sys.executable}; install finkit with its dependencies"
        ) from None
    from jupyter_client.kernelspec import KernelSpecManager, NoSuchKernel

    manager = KernelSpecManager()
    try:
        spec = manager.get_kernel_spec(name)
    except NoSuchKernel:
        spec = None
    if spec is None:
        try:
            ipykernel.kernelspec.install(
                kernel_name=name, display_name=f"Python ({name})", prefix=sys.prefix
            )
        except OSError:
            ipykernel.kernelspec.install(
                kernel_name=name, display_name=f"Python ({name})", user=True
            )
        spec = KernelSpecManager().get_kernel_spec(name)
    program = spec.argv[0] if spec.argv else ""
    # jupyter_client replaces a bare "python"/"python3"/"python3.X" by sys.executable.
    bare = {
        "python",
        f"python{sys.version_info[0]}",
        f"python{sys.version_info[0]}.{sys.version_info[1]}",
    }
    if program not in bare and not _same_interpreter(program, sys.executable):
        raise NotSupportedError(
            f"kernel {name!r} at {spec.resource_dir} runs {program}, not {sys.executable}; "
            f"remove it (jupyter kernelspec remove {name}) or pass kernel_name"
        )
    _quiet_kernel(spec)
    return name


_KERNEL_LOG_LEVEL = "--IPKernelApp.log_level=ERROR"


def _quiet_kernel(spec) -> None:
    """Let a kernelspec inside this environment log errors only.

    Each kernel otherwise prints jupyter's notice that it talks over local TCP without
    encryption, once per note, which buries the lines a user should read. Kernel errors still
    show, and a failing cell is reported by :func:`render_note` either way.
    """
    path = Path(spec.resource_dir) / "kernel.json"
    inside = Path(sys.prefix).resolve() in path.resolve().parents
    if not inside or _KERNEL_LOG_LEVEL in spec.argv or not path.is_file():
        return
    data = json.loads(path.read_text(encoding="utf-8"))
    data["argv"] = [*data["argv"], _KERNEL_LOG_LEVEL]
    atomic_write(path, json.dumps(data, indent=1))


def _same_interpreter(program: str, executable: str) -> bool:
    """True when two paths start the same Python of the same environment.

    ``.venv/bin/python`` and ``.venv/bin/python3`` are links to one interpreter; a link to the
    same interpreter from another environment's ``bin`` folder is a different environment.
    """
    a, b = os.path.abspath(program), os.path.abspath(executable)
    if a == b:
        return True
    try:
        return os.path.dirname(a) == os.path.dirname(b) and os.path.samefile(a, b)
    except OSError:
        return False
