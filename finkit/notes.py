"""Calculation notes: execute a notebook template for one case, render a self-contained HTML note.

:func:`render_note` runs a notebook template with papermill, injecting the case and the note time
into the cell tagged ``parameters``, then renders the executed notebook to HTML with nbconvert and
the page frame in ``finkit/html_template`` (code hidden, images embedded, no script, no external
URL). It writes ``<out_dir>/<case_id>/results.json``, ``note.ipynb`` and, last, ``note.html``.

Contract for notebook templates (``templates/<kind>.ipynb`` at the top of the source tree):

* One code cell tagged ``parameters`` assigns ``case`` (a dict, the case as entered in its YAML
  file: unit strings such as ``"2.5 mm"`` stay strings) and ``note_time`` (a str, ISO 8601 with
  time zone). Papermill adds a cell tagged ``injected-parameters`` after it with the values of
  the run; the ``parameters`` cell itself is left out of the HTML.
* Text from the case is shown only through :mod:`finkit.report.present` (escaped); equations through
  :func:`finkit.report.present.equation` (no ``$...$`` in Markdown: there is no MathJax).
* The page frame (document control header, provenance, sign-off block, page numbers in print)
  comes from ``nb.metadata["finkit"]``, which :func:`render_note` fills; templates do not repeat
  it. Templates write no files (they run in a scratch folder that is deleted).
* Cells tagged ``remove-cell`` are left out of the HTML, ``remove-input`` show only their output,
  ``remove-output`` only their input (when code is shown).

Whatever a template displays, :func:`check_note_html` must find nothing: no ``<script>``, no
event-handler attribute, no external resource. Otherwise :func:`render_note` raises
:class:`NoteRenderError` and writes nothing.
"""

from __future__ import annotations

import datetime as _dt
import hashlib
import importlib
import json
import math
import os
import platform
import re
import secrets
import shutil
import signal
import sys
import tempfile
import threading
import time
from collections.abc import Callable, Mapping
from functools import lru_cache
from html.parser import HTMLParser
from pathlib import Path
from typing import Any, NamedTuple

from finkit.errors import FinkitError, InputError, NotSupportedError
from finkit.model import handover

__all__ = [
    "KERNEL_NAME",
    "TEMPLATES_BY_KIND",
    "NoteExecutionError",
    "NoteOutput",
    "NoteRenderError",
    "PreparedCase",
    "atomic_write",
    "case_folder",
    "check_note_html",
    "ensure_kernel",
    "inputs_sha256",
    "prepare_case",
    "provenance",
    "render_html",
    "render_note",
    "template_path",
]

NOTE_HTML = "note.html"
NOTE_IPYNB = "note.ipynb"
RESULTS_JSON = "results.json"
FAILED_IPYNB = "note.failed.ipynb"

#: Notebook template of each case kind, in the top-level ``templates/`` folder.
TEMPLATES_BY_KIND = {
    "heat-sink": "heat_sink_note.ipynb",
    "single-fin": "single_fin_note.ipynb",
}

#: Name of the Jupyter kernel that runs this interpreter (see :func:`ensure_kernel`).
KERNEL_NAME = "finkit"

PAPER_SIZES = ("A4", "letter")

_PACKAGE_DIR = Path(__file__).resolve().parent
# The note templates are package data (``finkit/templates``; ``<repo>/templates`` links to them so
# they can be opened in JupyterLab from a source checkout), so an installed wheel finds them too.
_TEMPLATE_DIR = _PACKAGE_DIR / "templates"
_HTML_TEMPLATE_NAME = "html_template"

_CASE_ID = re.compile(r"[A-Za-z0-9][A-Za-z0-9._-]{0,99}")
_WINDOWS_RESERVED = {"CON", "PRN", "AUX", "NUL"} | {
    f"{p}{i}" for p in ("COM", "LPT") for i in "123456789"
}

_LIBRARIES = ("numpy", "scipy", "CoolProp", "pint", "matplotlib", "papermill", "nbconvert")


def skip_unused_slow_imports() -> None:
    """Keep a finkit command from importing an optional package it never uses (process-wide).

    nbformat validates notebooks with jsonschema, and jsonschema imports ``rfc3987_syntax``
    whenever it is installed (JupyterLab's event system pulls it in), only to check the "iri"
    string format. Importing it compiles about 40 grammars: 0.8-0.9 s of every ``finkit note``
    and ``finkit batch`` process on a 2-core machine (measured, issue 15). Notebook schemas use
    no IRI format, so a command blocks that import; jsonschema treats the package as absent, as
    on an installation without JupyterLab. Called by the command-line entry points only, so a
    program that imports finkit as a library keeps its own choice. A no-op when the package was
    already imported.
    """
    sys.modules.setdefault("rfc3987_syntax", None)


class NoteExecutionError(FinkitError):
    """A notebook template failed to run for a case (cell exception, dead kernel, timeout)."""


class NoteRenderError(FinkitError):
    """An executed note would not be a safe, self-contained HTML page."""


class NoteOutput(NamedTuple):
    """Paths written by :func:`render_note`."""

    folder: Path
    html: Path
    notebook: Path
    results_json: Path


class PreparedCase(NamedTuple):
    """A case ready to be injected into a template (see :func:`prepare_case`)."""

    case: dict
    case_id: str
    kind: str
    validated: Any


# --------------------------------------------------------------------------------------------
# Files


def atomic_write(path: str | os.PathLike, data: str | bytes) -> Path:
    """Write a file so that readers see the old content or the complete new one, never a part.

    The data goes to a temporary file in the same folder, is flushed and fsynced, then renamed
    over ``path`` with :func:`os.replace` (atomic on POSIX and Windows); the folder is fsynced
    where the platform allows. On any error the temporary file is removed and ``path`` is
    unchanged.

    Parameters
    ----------
    path : path-like
        Destination; its folder must exist. [-]
    data : str or bytes
        Content; ``str`` is written as UTF-8. [-]

    Returns
    -------
    pathlib.Path
        ``path``. [-]
    """
    path = Path(path)
    payload = data.encode("utf-8") if isinstance(data, str) else bytes(data)
    tmp_name = path.parent / f".{path.name}.{secrets.token_hex(6)}.tmp"
    # os.open with mode 0o666 lets the umask decide the permissions, as for a plain open().
    fd = os.open(tmp_name, os.O_WRONLY | os.O_CREAT | os.O_EXCL | getattr(os, "O_BINARY", 0), 0o666)
    try:
        with os.fdopen(fd, "wb") as handle:
            handle.write(payload)
            handle.flush()
            os.fsync(handle.fileno())
        os.replace(tmp_name, path)
    except BaseException:
        Path(tmp_name).unlink(missing_ok=True)
        raise
    _fsync_dir(path.parent)
    return path


def _fsync_dir(folder: Path) -> None:
    try:
        fd = os.open(folder, os.O_RDONLY)
    except OSError:  # e.g. Windows cannot open a directory
        return
    try:
        os.fsync(fd)
    except OSError:
        pass
    finally:
        os.close(fd)


def case_folder(out_dir: str | os.PathLike, case_id: str) -> Path:
    """The folder ``out_dir/case_id`` of a note, after checking ``case_id`` is a safe name.

    Parameters
    ----------
    out_dir : path-like
        Output folder (need not exist yet). [-]
    case_id : str
        1 to 100 characters from ``A-Z a-z 0-9 . _ -``, starting with a letter or digit, without
        ``..``, not a reserved device name. [-]

    Returns
    -------
    pathlib.Path
        The resolved folder, guaranteed to be a direct child of the resolved ``out_dir``. [-]

    Raises
    ------
    finkit.errors.InputError
        If ``case_id`` is not such a name, or the folder would resolve outside ``out_dir``
        (e.g. through a symbolic link).
    """
    allowed = (
        "1-100 characters A-Z a-z 0-9 . _ - starting with a letter or digit, no '..', "
        "no path separator"
    )
    if not isinstance(case_id, str) or not _CASE_ID.fullmatch(case_id) or ".." in case_id:
        raise InputError(f"case_id={case_id!r} is not a safe folder name; allowed: {allowed}")
    if case_id.split(".")[0].upper() in _WINDOWS_RESERVED:
        raise InputError(f"case_id={case_id!r} is a reserved device name; allowed: {allowed}")
    base = Path(out_dir).resolve()
    folder = (base / case_id).resolve()
    if folder.parent != base:
        raise InputError(
            f"case_id={case_id!r} resolves to {folder}, outside the output folder {base}"
        )
    return folder


# --------------------------------------------------------------------------------------------
# Case, template, kernel


def _json_safe(value: Any, where: str) -> Any:
    """A JSON-safe deep copy of ``value``; dates become ISO strings."""
    if isinstance(value, Mapping):
        out = {}
        for key, item in value.items():
            if not isinstance(key, str):
                raise InputError(f"case key {key!r} at {where} is not a string; quote it")
            out[key] = _json_safe(item, f"{where}.{key}")
        return out
    if isinstance(value, list | tuple):
        return [_json_safe(item, f"{where}[{i}]") for i, item in enumerate(value)]
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
        data = _json_safe(raw, "case")
    else:
        data = _json_safe(_read_case_mapping(case), "case")
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


def _check_template(path: Path) -> set[str]:
    """The template has one cell tagged ``parameters`` that defines ``case`` and ``note_time``;
    returns the names that cell defines."""
    import nbformat
    import papermill

    nb = nbformat.read(path, as_version=4)
    tagged = [c for c in nb.cells if "parameters" in c.get("metadata", {}).get("tags", [])]
    if len(tagged) != 1:
        raise InputError(
            f"template {path.name}: {len(tagged)} cells tagged 'parameters'; exactly one is needed"
        )
    names = set(papermill.inspect_notebook(str(path)))
    missing = {"case", "note_time"} - names
    if missing:
        raise InputError(
            f"template {path.name}: the parameters cell does not define "
            f"{', '.join(sorted(missing))}"
        )
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


# --------------------------------------------------------------------------------------------
# Provenance


def inputs_sha256(case: Any) -> str:
    """SHA-256 of a case's inputs, hexadecimal.

    For a validated case (what ``finkit.case.load_case`` returns) this is
    ``finkit.case.case_inputs_sha256(case)``: the hash of its SI content, the same whatever units
    or key order the file used. For a plain mapping (a case not validated, as in the tests of the
    note machinery) it is the SHA-256 of the canonical JSON of the mapping (keys sorted, no
    spaces, UTF-8).

    Parameters
    ----------
    case : finkit.case.Case or mapping
        Validated case, or the case as entered (JSON-safe). [-]

    Returns
    -------
    str
        64 hexadecimal digits. [-]
    """
    if hasattr(case, "model_dump"):
        from finkit.case.schema import case_inputs_sha256

        return case_inputs_sha256(case)
    canonical = json.dumps(
        case, sort_keys=True, separators=(",", ":"), ensure_ascii=False, allow_nan=False
    )
    return hashlib.sha256(canonical.encode("utf-8")).hexdigest()


@lru_cache(maxsize=1)
def _library_versions() -> dict[str, str]:
    from importlib.metadata import PackageNotFoundError, version

    versions = {"python": platform.python_version()}
    for name in _LIBRARIES:
        try:
            versions[name] = version(name)
        except PackageNotFoundError:
            versions[name] = "not installed"
    return versions


def provenance(
    case: Any, *, template: str | None = None, note_time: str | None = None
) -> dict[str, Any]:
    """What a reviewer needs to reproduce a note: versions, template, inputs hash, time.

    Parameters
    ----------
    case : finkit.case.Case or mapping
        Validated case, or the case as entered (JSON-safe); see :func:`inputs_sha256`. [-]
    template : str, optional
        File name of the notebook template. [-]
    note_time : str, optional
        Execution time, ISO 8601 with time zone; default now. [-]

    Returns
    -------
    dict
        ``finkit_version``, ``template``, ``case_id``, ``kind``, ``inputs_sha256``,
        ``note_time``, ``libraries`` (python, numpy, scipy, CoolProp, pint, matplotlib,
        papermill, nbconvert versions) and ``signoff`` (the names of the title block's
        prepared by, checked by and approved by, for the sign-off table; empty when not
        given). [-]
    """
    from finkit import __version__

    block = _field(case, "title_block") or {}
    signoff = {role: _field(block, role) or "" for role in _SIGNOFF_ROLES}
    return {
        "finkit_version": __version__,
        "template": template,
        "case_id": _field(case, "case_id"),
        "kind": _field(case, "kind"),
        "inputs_sha256": inputs_sha256(case),
        "note_time": note_time if note_time is not None else _note_time(None),
        "libraries": dict(_library_versions()),
        "signoff": {role: str(name) for role, name in signoff.items()},
    }


_SIGNOFF_ROLES = ("prepared_by", "checked_by", "approved_by")


def _field(case: Any, name: str) -> Any:
    if isinstance(case, Mapping):
        return case.get(name)
    return getattr(case, name, None)


def _note_time(value: _dt.datetime | str | None) -> str:
    if value is None:
        return _dt.datetime.now().astimezone().isoformat(timespec="seconds")
    if isinstance(value, str):
        try:
            value = _dt.datetime.fromisoformat(value)
        except ValueError:
            raise InputError(
                f"execution_time={value!r} is not ISO 8601; e.g. 2025-03-14T09:30:00+01:00"
            ) from None
    if not isinstance(value, _dt.datetime):
        raise InputError(f"execution_time={value!r} must be a datetime or an ISO 8601 string")
    if value.tzinfo is None or value.utcoffset() is None:
        raise InputError(f"execution_time={value.isoformat()!r} has no time zone; add one")
    return value.isoformat(timespec="seconds")


# --------------------------------------------------------------------------------------------
# HTML


class _NoteHTMLScanner(HTMLParser):
    _LOADING = {
        "script",
        "link",
        "img",
        "iframe",
        "frame",
        "object",
        "embed",
        "source",
        "video",
        "audio",
        "track",
        "input",
        "image",
        "use",
        "base",
        "form",
        "meta",
    }
    _URL_ATTRS = {
        "src",
        "href",
        "srcset",
        "data",
        "poster",
        "xlink:href",
        "action",
        "formaction",
        "background",
        "content",
    }

    def __init__(self) -> None:
        super().__init__(convert_charrefs=True)
        self.problems: list[str] = []
        self._in_style = False

    def handle_starttag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        if tag == "script":
            self.problems.append("<script> element (a note runs no script)")
        if tag in {"iframe", "frame", "object", "embed", "base"}:
            self.problems.append(f"<{tag}> element")
        if tag == "meta" and any(k == "http-equiv" for k, _ in attrs):
            self.problems.append("<meta http-equiv> element")
        for key, value in attrs:
            if key.startswith("on"):
                self.problems.append(f"event handler {key}= on <{tag}>")
                continue
            if key == "style" and value and _external_css_urls(value):
                self.problems.append(f"url() to {_external_css_urls(value)[0][:60]} in style=")
            if value is None or key not in self._URL_ATTRS:
                continue
            url = value.strip().lower()
            if url.startswith(("javascript:", "vbscript:")):
                self.problems.append(f"{key}={value[:40]!r} on <{tag}>")
            elif tag in self._LOADING and re.match(r"(https?:|ftp:|//|file:)", url):
                self.problems.append(f"external {key}={value[:60]!r} on <{tag}>")
        self._in_style = tag == "style"

    def handle_startendtag(self, tag: str, attrs: list[tuple[str, str | None]]) -> None:
        self.handle_starttag(tag, attrs)
        self._in_style = False

    def handle_endtag(self, tag: str) -> None:
        if tag == "style":
            self._in_style = False

    def handle_data(self, data: str) -> None:
        if self._in_style:
            lowered = data.lower()
            if "@import" in lowered:
                self.problems.append("@import in a <style> element")
            for url in _external_css_urls(lowered):
                self.problems.append(f"url({url[:60]}) in a <style> element")


def _external_css_urls(css: str) -> list[str]:
    """The url(...) targets in CSS text that are neither data: URIs nor #fragments."""
    targets = re.findall(r"url\(\s*['\"]?\s*([^'\")\s]*)", css.lower())
    return [t for t in targets if not t.startswith(("data:", "#"))]


def check_note_html(html: str) -> list[str]:
    """Problems that keep an HTML page from being a safe, self-contained note.

    Looks for ``<script>``, ``<iframe>``/``<object>``/``<embed>``/``<base>``, ``on*=`` event
    handlers, ``javascript:`` URLs, resources loaded from ``http(s)://``, ``//`` or ``file:``
    (``src``, ``href`` of ``<link>``, ``srcset`` …) and ``@import``/``url()`` in style sheets
    other than ``data:``. Hyperlinks (``<a href="https://…">``) are allowed: they load nothing.

    Parameters
    ----------
    html : str
        The page. [-]

    Returns
    -------
    list of str
        One line per problem; empty for a good note. [-]
    """
    scanner = _NoteHTMLScanner()
    scanner.feed(html)
    scanner.close()
    return scanner.problems


def _check_paper(paper: str) -> None:
    if paper not in PAPER_SIZES:
        raise InputError(f"paper={paper!r} is not allowed; use {' or '.join(PAPER_SIZES)}")


def _css_string(value: str) -> str:
    """``value`` as a double-quoted CSS string (anything unusual as a hex escape)."""
    out = []
    for char in value:
        if char.isalnum() or char in " .,:;_-+()/[]#@=":
            out.append(char)
        else:
            out.append(f"\\{ord(char):x} ")
    return '"' + "".join(out) + '"'


@lru_cache(maxsize=2)
def _html_exporter(show_code: bool) -> Any:
    """The nbconvert exporter of a note, built once per process for each ``show_code``.

    Building an exporter loads and compiles its Jinja templates (about 0.15 s); the exporter
    keeps no state between ``from_notebook_node`` calls, so one is reused for every note (and
    a warm parent process of :mod:`finkit.batch` hands it, compiled, to its children).
    """
    from nbconvert import HTMLExporter
    from nbconvert.preprocessors import TagRemovePreprocessor
    from traitlets.config import Config

    config = Config()
    exporter_config = config.HTMLExporter
    exporter_config.extra_template_basedirs = [str(_PACKAGE_DIR)]
    exporter_config.template_name = _HTML_TEMPLATE_NAME
    exporter_config.exclude_input = not show_code
    exporter_config.exclude_input_prompt = True
    exporter_config.exclude_output_prompt = True
    exporter_config.exclude_anchor_links = True
    exporter_config.embed_images = True
    exporter_config.mathjax_url = ""
    exporter_config.require_js_url = ""
    exporter_config.jupyter_widgets_base_url = ""
    exporter_config.widget_renderer_url = ""
    config.TagRemovePreprocessor.enabled = True
    config.TagRemovePreprocessor.remove_cell_tags = ("parameters", "remove-cell", "remove_cell")
    config.TagRemovePreprocessor.remove_input_tags = ("remove-input", "remove_input")
    config.TagRemovePreprocessor.remove_all_outputs_tags = ("remove-output", "remove_output")
    exporter = HTMLExporter(config=config)
    exporter.register_preprocessor(TagRemovePreprocessor(config=config), enabled=True)
    return exporter


def render_html(nb: Any, *, show_code: bool = False, paper: str = "A4") -> str:
    """Render an executed notebook to the HTML of a note (nbconvert, finkit page frame).

    Parameters
    ----------
    nb : nbformat.NotebookNode
        Executed notebook; ``nb.metadata["finkit"]`` (set by :func:`render_note`) feeds the
        header, provenance and sign-off blocks. [-]
    show_code : bool, optional
        Show code cells' input (the cell tagged ``parameters`` is always left out). [-]
    paper : {"A4", "letter"}, optional
        Paper size of the printed note (CSS ``@page size``). [-]

    Returns
    -------
    str
        A complete HTML page with no script and no external resource. [-]
    """
    _check_paper(paper)
    exporter = _html_exporter(bool(show_code))

    meta = nb.metadata.get("finkit", {})
    prov = meta.get("provenance", {})
    footer_left = " · ".join(
        str(part) for part in (prov.get("case_id"), prov.get("note_time")) if part
    )
    page_css = (
        f"@page {{ size: {paper}; "
        f"@bottom-left {{ content: {_css_string(footer_left)}; }} "
        '@bottom-right { content: "Page " counter(page) " of " counter(pages); } }'
    )
    resources = {"metadata": {"name": "note"}, "finkit": {"page_css": page_css, "paper": paper}}
    body, _ = exporter.from_notebook_node(nb, resources=resources)
    return body


# --------------------------------------------------------------------------------------------
# The note


#: Modules a note kernel imports while the parent solves the case: those the template's first
#: cells import anyway (the report module, the classes of the solved result it unpickles, the
#: fan curve's interpolator, matplotlib's figure), then the unit registry the first cell makes.
#: Imported by name, so that no name is bound in the notebook's namespace.
_WARM_MODULES = (
    "finkit.report",
    "finkit.model",
    "finkit.model.review",
    "finkit.model.uncertainty",
    "finkit.report.compare",
    "matplotlib.figure",
    "matplotlib.backends.backend_agg",
)
_WARM_IMPORTS = (
    f"for __finkit_module in {_WARM_MODULES!r}:\n"
    "    __import__(__finkit_module)\n"
    "del __finkit_module\n"
    "__import__('finkit.case.units', fromlist=['_ureg'])._ureg()\n"
)


def _fork_is_safe() -> bool:
    """A fork copies only the calling thread: safe only while this process runs no other."""
    return hasattr(os, "fork") and threading.active_count() == 1


class _ComparisonPrefetch:
    """Solve the cases of the comparison with the previous revision in a forked process.

    Comparing a case with its previous revision solves that revision and the cases its
    attribution tries (:func:`finkit.report.compare.prefetch`), none of which needs the current
    case's
    results; a child forked before the kernel starts solves them while the parent solves the
    case, on the second core, and hands the solutions back through a file in the scratch
    folder (issue 15). Nothing but the content-keyed solution caches comes back; anything that
    goes wrong leaves the parent to solve them itself, as before.
    """

    def __init__(self, validated: Any, scratch: Path):
        self.pid = None
        self.path = scratch / "prefetch.pickle"
        previous = getattr(validated, "previous_revision", None)
        if previous is None or not _fork_is_safe():
            return
        entered = getattr(validated, "entered", None)
        pid = os.fork()
        if pid == 0:  # the child: solve, write, leave without running any exit handler
            status = 1
            try:
                import pickle

                from finkit.report import compare

                compare.prefetch(previous.source, entered)
                atomic_write(self.path, pickle.dumps(compare.cached_solutions()))
                status = 0
            except BaseException:  # noqa: BLE001 - the parent solves them itself
                pass
            finally:
                os._exit(status)
        self.pid = pid

    def collect(self, timeout: float) -> None:
        """Wait for the child (at most ``timeout``) and take its solutions into the caches."""
        if self.pid is None:
            return
        deadline = time.monotonic() + timeout
        while time.monotonic() < deadline:
            done, _ = os.waitpid(self.pid, os.WNOHANG)
            if done:
                self.pid = None
                break
            time.sleep(0.01)
        self.stop()
        try:
            import pickle

            from finkit.report import compare

            with open(self.path, "rb") as handle:
                compare.add_cached_solutions(pickle.load(handle))
        except Exception:  # noqa: BLE001 - missing or damaged: solved in the parent
            pass

    def stop(self) -> None:
        """End the child if it still runs (a failed note, or one past its time)."""
        if self.pid is None:
            return
        try:
            os.kill(self.pid, signal.SIGKILL)
            os.waitpid(self.pid, 0)
        except OSError:
            pass
        self.pid = None


def _warm_html_exporter(show_code: bool) -> threading.Thread:
    """Build and exercise the note's HTML exporter in a thread while the kernel runs the cells
    (imports and template compilation, about 0.4 s that the parent would otherwise pay after
    the cells); :func:`render_html` then finds it built."""

    def warm() -> None:
        try:
            import nbformat

            nb = nbformat.v4.new_notebook()
            nb.cells = [nbformat.v4.new_markdown_cell("warm-up")]
            nb.metadata["finkit"] = {"status": "complete", "provenance": {"case_id": "warm-up"}}
            render_html(nb, show_code=show_code)
        except Exception:  # noqa: BLE001 - the real render reports any problem
            pass

    thread = threading.Thread(target=warm, name="finkit-html-warm-up", daemon=True)
    thread.start()
    return thread


class _EarlyKernel:
    """A note's own kernel, started before the case is solved.

    A fresh kernel process per note, as papermill would start it, only earlier: it boots and
    imports the modules the note's first cells need (:data:`_WARM_IMPORTS`, a silent request
    that leaves nothing in the notebook's namespace or history) while the parent solves the
    case; on two cores that hides the kernel's start-up (issue 15). No state reaches the note
    that the template's cells did not make: the imports are the ones the cells do.
    """

    def __init__(self, kernel: str, cwd: Path, case_id: str):
        # The asynchronous manager papermill's client makes for itself: with a blocking one,
        # nbclient's per-cell time limit is never applied.
        from jupyter_client.manager import AsyncKernelManager
        from jupyter_core.utils import run_sync

        self._run_sync = run_sync
        self.manager = AsyncKernelManager(kernel_name=kernel)
        self._client = None
        self._warm_id = None
        try:
            run_sync(self.manager.start_kernel)(cwd=str(cwd))
            self._client = self.manager.client()
            self._client.start_channels()
            self._warm_id = self._client.execute(_WARM_IMPORTS, silent=True, store_history=False)
        except Exception as exc:  # noqa: BLE001 - reported as the note's failure, one line
            self.stop()
            raise NoteExecutionError(
                f"note for case {case_id!r}: the kernel {kernel!r} could not start: "
                f"{_one_line(exc)}"
            ) from exc

    def ready(self, timeout: float = 60.0) -> Any:
        """Wait for the warm-up to finish (never more than ``timeout``); the kernel manager."""
        import queue

        client, self._client = self._client, None
        if client is not None:
            deadline = time.monotonic() + timeout
            try:
                get = self._run_sync(client.get_shell_msg)
                while time.monotonic() < deadline:
                    reply = get(timeout=max(deadline - time.monotonic(), 0.01))
                    if reply.get("parent_header", {}).get("msg_id") == self._warm_id:
                        break
            except queue.Empty:  # a slow kernel: papermill waits for it as usual
                pass
            finally:
                client.stop_channels()
        return self.manager

    def stop(self) -> None:
        """Stop the kernel at once: the note is complete or has failed."""
        if self._client is not None:
            self._client.stop_channels()
            self._client = None
        try:
            if self.manager.has_kernel:
                self._run_sync(self.manager.shutdown_kernel)(now=True)
        except Exception:  # noqa: BLE001 - an already dead kernel is what we wanted
            pass


def _one_line(text: str, limit: int = 160) -> str:
    line = " ".join(str(text).split())
    return line if len(line) <= limit else line[: limit - 1] + "…"


def _executed_cells(nb: Any) -> list:
    """The cells as executed: without the error-marker cells papermill adds to a failed run."""
    from papermill.execute import ERROR_MARKER_TAG

    return [c for c in nb.cells if ERROR_MARKER_TAG not in c.get("metadata", {}).get("tags", [])]


def _failing_index(cells: list) -> int | None:
    """Index of the last code cell that papermill started (the one that failed)."""
    found = None
    for index, cell in enumerate(cells):
        if cell.cell_type == "code" and cell.get("metadata", {}).get("papermill", {}).get(
            "start_time"
        ):
            found = index
    return found


def _describe_cell(cells: list, index: int | None) -> str:
    """``template cell 4 (In [4], 'first line')``, the template cell counted from 1."""
    if index is None or not 0 <= index < len(cells):
        return "kernel start"
    cell = cells[index]
    injected_before = any(
        "injected-parameters" in c.get("metadata", {}).get("tags", []) for c in cells[:index]
    )
    if "injected-parameters" in cell.get("metadata", {}).get("tags", []):
        place = "the injected parameters cell"
    else:
        place = f"template cell {index + 1 - injected_before}"
    first = next((line.strip() for line in cell.source.splitlines() if line.strip()), "")
    count = cell.get("execution_count")
    prompt = f"In [{count}], " if count is not None else ""
    return f"{place} ({prompt}{_one_line(first, 60)!r})"


def render_note(
    case: str | os.PathLike | Mapping[str, Any],
    out_dir: str | os.PathLike,
    *,
    template: str | os.PathLike | None = None,
    show_code: bool = False,
    kernel_name: str | None = None,
    execution_time: _dt.datetime | str | None = None,
    timeout: float = 600,
    paper: str = "A4",
    validate: bool = True,
    results: Callable[[Any], Mapping[str, Any]] | None = None,
    kernel_manager: Any = None,
    stages: dict[str, float] | None = None,
) -> NoteOutput:
    """Execute the note template for a case and write a dated, self-contained HTML note.

    Steps: check the case (``prepare_case``) and its folder name, compute the results (before
    any cell runs, so a case the model rejects fails fast), execute the template with
    papermill in a scratch folder injecting ``case`` and ``note_time``, record the provenance in
    the notebook metadata, render the HTML, check it (:func:`check_note_html`), then write
    ``results.json``, ``note.ipynb`` and last ``note.html`` into ``out_dir/<case_id>/``, each
    atomically. An existing ``note.html`` is removed just before the new set is written, so
    ``note.html`` present means the three files come from the same run.

    Parameters
    ----------
    case : path-like or mapping
        YAML case file or case mapping (as entered). [-]
    out_dir : path-like
        Output folder; the note goes into its sub-folder named after the case id. [-]
    template : path-like, optional
        Notebook template; default ``templates/<kind>`` (:data:`TEMPLATES_BY_KIND`). [-]
    show_code : bool, optional
        Keep code cells' input in the HTML. [-]
    kernel_name : str, optional
        Jupyter kernel; default the ``finkit`` kernel of this interpreter
        (:func:`ensure_kernel`). [-]
    execution_time : datetime or str, optional
        Note time with time zone (tests pass a fixed one); default now. [-]
    timeout : float, optional
        Time limit per cell. [s]
    paper : {"A4", "letter"}, optional
        Paper size of the printed note. [-]
    validate : bool, optional
        Validate with ``finkit.case.load_case`` (see :func:`prepare_case`). [-]
    results : callable, optional
        ``results(validated_case) -> mapping`` written to ``results.json``; default
        ``finkit.model.run_case(case).to_json_dict()``, whose solution is also handed to the
        kernel when the template takes a ``solved`` parameter
        (:func:`finkit.model.handover.write_solved`), so the note never solves its case twice. [-]
    kernel_manager : jupyter_client.KernelManager, optional
        Execute with this kernel manager (passed to papermill as ``km``) instead of starting
        the kernel ``kernel_name``; :mod:`finkit.batch` passes an in-process kernel here.
        Default: a new kernel process, started before the case is solved so that it boots
        meanwhile, and stopped when the notebook has run. [-]
    stages : dict, optional
        Filled with the seconds each stage took (:data:`NOTE_STAGES`), for benchmarks and the
        batch's timing table. [s]

    Returns
    -------
    NoteOutput
        ``folder``, ``html``, ``notebook`` and ``results_json`` paths. [-]

    Raises
    ------
    finkit.errors.InputError
        Bad case, case id, template or time; nothing is written.
    NoteExecutionError
        The template failed; the partial notebook is kept as ``note.failed.ipynb`` (metadata
        ``finkit.status = "failed"``) and any previous note is left as it was.
    NoteRenderError
        The HTML would contain a script or an external resource; nothing is written.

    Notes
    -----
    ``results.json`` is the results mapping (``CaseResult.to_json_dict()``) with two keys added:
    ``note_time`` and ``provenance`` (the dict of :func:`provenance`, also stored in the notebook
    metadata as ``nb.metadata["finkit"]["provenance"]`` and shown in the note's footer).
    """
    clock = _StageClock(stages)
    prepared = prepare_case(case, validate=validate)
    folder = case_folder(out_dir, prepared.case_id)
    template_file = template_path(prepared.kind, template)
    template_parameters = _check_template(template_file)
    note_time = _note_time(execution_time)
    _check_paper(paper)
    if not (isinstance(timeout, int | float) and timeout > 0):
        raise InputError(f"timeout={timeout!r} s is not allowed; use a positive number of seconds")

    if kernel_manager is not None:
        kernel = kernel_name or KERNEL_NAME
    else:
        kernel = kernel_name or ensure_kernel()

    folder.parent.mkdir(parents=True, exist_ok=True)
    scratch = Path(
        tempfile.mkdtemp(dir=folder.parent, prefix=f".{prepared.case_id}.", suffix=".partial")
    )
    own_kernel = None
    prefetch = None
    clock.mark("check case and template")
    try:
        if kernel_manager is None:
            if results is None and "solved" in template_parameters:
                if getattr(prepared.validated, "previous_revision", None) is not None:
                    # Imported once, before the fork, rather than in both processes.
                    for name in ("finkit.model", "finkit.model.review", "finkit.report.compare"):
                        importlib.import_module(name)
                prefetch = _ComparisonPrefetch(prepared.validated, scratch)
            # Started before the solve, so the kernel boots while the case is solved.
            own_kernel = _EarlyKernel(kernel, scratch, prepared.case_id)
        clock.mark("start kernel")
        parameters: dict[str, Any] = {"case": prepared.case, "note_time": note_time}
        if results is None:
            from finkit.model.run import run_case

            solved = run_case(prepared.validated)
            result_dict = dict(solved.to_json_dict())
            clock.mark("solve")
            if "solved" in template_parameters:
                extra = {}
                if getattr(prepared.validated, "previous_revision", None) is not None:
                    from finkit.report.inputs import changes_since

                    if prefetch is not None:
                        prefetch.collect(timeout)

                    extra["comparison"] = changes_since(solved)
                handover.write_solved(
                    scratch / handover.SOLVED_PICKLE, prepared.validated, solved, **extra
                )
                parameters["solved"] = str(scratch / handover.SOLVED_PICKLE)
                clock.mark("compare with the previous revision")
        else:
            result_dict = dict(results(prepared.validated))
            clock.mark("solve")
        prov = provenance(prepared.validated, template=template_file.name, note_time=note_time)
        clash = {"note_time", "provenance"} & set(result_dict)
        if clash:
            raise NoteRenderError(
                f"results already hold the keys {sorted(clash)} that the note adds"
            )
        try:
            results_text = json.dumps(
                {**result_dict, "note_time": note_time, "provenance": prov},
                indent=2,
                ensure_ascii=False,
                allow_nan=False,
            )
        except (TypeError, ValueError) as exc:
            raise NoteRenderError(
                f"results of case {prepared.case_id!r} are not strict JSON: {_one_line(exc)}"
            ) from None

        import nbformat
        import papermill

        if own_kernel is not None:
            kernel_manager = own_kernel.ready(timeout)
        clock.mark("wait for the kernel")
        html_warm_up = _warm_html_exporter(show_code) if own_kernel is not None else None
        executed_path = scratch / NOTE_IPYNB
        try:
            nb = papermill.execute_notebook(
                str(template_file),
                str(executed_path),
                parameters=parameters,
                kernel_name=kernel,
                execution_timeout=timeout,
                progress_bar=False,
                log_output=False,
                cwd=str(scratch),
                km=kernel_manager,
            )
        except Exception as exc:  # noqa: BLE001 - every failure is reported the same way
            message = _execution_failure(exc, executed_path, prepared, prov, folder, timeout)
            raise NoteExecutionError(message) from exc
        clock.mark("run the cells")
        if own_kernel is not None:
            own_kernel.stop()
            own_kernel = None
        clock.mark("stop the kernel")

        nb.metadata["finkit"] = {"status": "complete", "provenance": prov}
        nb.metadata.setdefault("papermill", {})["output_path"] = str(folder / NOTE_IPYNB)
        notebook_text = nbformat.writes(nb)
        if html_warm_up is not None:
            html_warm_up.join()
        html = render_html(nb, show_code=show_code, paper=paper)
        problems = check_note_html(html)
        if problems:
            raise NoteRenderError(
                f"note for case {prepared.case_id!r} is not self-contained and safe: "
                f"{'; '.join(sorted(set(problems)))[:300]}"
            )
        clock.mark("notebook and HTML")

        folder.mkdir(exist_ok=True)
        (folder / NOTE_HTML).unlink(missing_ok=True)
        atomic_write(folder / RESULTS_JSON, results_text)
        atomic_write(folder / NOTE_IPYNB, notebook_text)
        (folder / FAILED_IPYNB).unlink(missing_ok=True)
        clear_stale(folder)
        atomic_write(folder / NOTE_HTML, html)
        clock.mark("write the files")
    finally:
        if prefetch is not None:
            prefetch.stop()
        if own_kernel is not None:
            own_kernel.stop()
        shutil.rmtree(scratch, ignore_errors=True)
    return NoteOutput(folder, folder / NOTE_HTML, folder / NOTE_IPYNB, folder / RESULTS_JSON)


#: The stages :func:`render_note` times (its ``stages`` argument), in order.
NOTE_STAGES = (
    "check case and template",
    "start kernel",
    "solve",
    "compare with the previous revision",
    "wait for the kernel",
    "run the cells",
    "stop the kernel",
    "notebook and HTML",
    "write the files",
)


class _StageClock:
    """Seconds between marks, added into a dict (nothing when no dict is given)."""

    def __init__(self, stages: dict[str, float] | None):
        self.stages = stages
        self.last = time.perf_counter()

    def mark(self, name: str) -> None:
        now = time.perf_counter()
        if self.stages is not None:
            self.stages[name] = self.stages.get(name, 0.0) + now - self.last
        self.last = now


STALE_MARKER = "STALE.txt"
#: A note's outputs and the names they take when a later run of its case fails.
_STALE_NAMES = {
    "note.html": "note.stale.html",
    "note.ipynb": "note.stale.ipynb",
    "results.json": "results.stale.json",
}


def mark_stale(folder: Path, reason: str) -> list[str]:
    """Rename a case folder's earlier note so that nobody signs it for the edited case.

    The earlier note, notebook and results.json keep their content (nothing produced is lost)
    under ``*.stale.*`` names, and ``STALE.txt`` says why. Returns the names renamed.
    """
    renamed = []
    for name, stale in _STALE_NAMES.items():
        if (folder / name).is_file():
            os.replace(folder / name, folder / stale)
            renamed.append(stale)
    if renamed or (folder / STALE_MARKER).exists():
        atomic_write(
            folder / STALE_MARKER,
            "The note in this folder (" + ", ".join(renamed or ["note.stale.html"]) + ") is from "
            "an earlier run. The latest run of this case did not complete, so the note does not "
            f"describe the current case file; do not sign it.\nLatest run: {reason}\n",
        )
    return renamed


def clear_stale(folder: Path) -> None:
    """Remove the stale copies once a new note of the case is complete."""
    for stale in (*_STALE_NAMES.values(), STALE_MARKER):
        (folder / stale).unlink(missing_ok=True)


def _execution_failure(
    exc: Exception,
    executed_path: Path,
    prepared: PreparedCase,
    prov: dict,
    folder: Path,
    timeout: float,
) -> str:
    """One-line message for a failed run; keeps the partial notebook as note.failed.ipynb."""
    import nbformat
    from papermill.exceptions import PapermillExecutionError

    nb = None
    if executed_path.is_file():
        try:
            nb = nbformat.read(executed_path, as_version=4)
        except Exception:  # noqa: BLE001 - a torn partial file is not worth a second error
            nb = None

    cells = _executed_cells(nb) if nb is not None else []
    if isinstance(exc, PapermillExecutionError):
        where = _describe_cell(cells, exc.cell_index) if cells else f"In [{exc.exec_count}]"
        what = f"{exc.ename}: {_one_line(exc.evalue)}"
    else:
        where = _describe_cell(cells, _failing_index(cells))
        name = type(exc).__name__
        if isinstance(exc, TimeoutError) or name == "CellTimeoutError":
            what = f"time limit of {timeout:g} s per cell exceeded"
        elif name == "DeadKernelError":
            what = f"the kernel died ({_one_line(exc)})"
        else:
            what = f"{name}: {_one_line(exc)}"
    message = f"note for case {prepared.case_id!r} failed at {where}: {what}"

    if nb is not None:
        nb.metadata["finkit"] = {"status": "failed", "error": message, "provenance": prov}
        folder.mkdir(exist_ok=True)
        atomic_write(folder / FAILED_IPYNB, nbformat.writes(nb))
    if folder.is_dir():
        mark_stale(folder, message)
    return message


#: The demo case each template opens with (its ``parameters`` cell), relative to the repository.
TEMPLATE_DEFAULTS = {
    "heat_sink_note.ipynb": "demo_cases/nb200-plate-fan.yaml",
    "single_fin_note.ipynb": "demo_cases/nb-fin-study.yaml",
    "trade_study_note.ipynb": "demo_cases/nb200-trade-study.yaml",
    "explorer.ipynb": "demo_cases/nb200-plate-fan.yaml",
}


def template_default_case(template: str | os.PathLike) -> dict:
    """The ``case`` dict a template's ``parameters`` cell defines (its default scenario)."""
    import nbformat

    nb = nbformat.read(Path(template), as_version=4)
    cell, name = _default_case_cell(nb)
    namespace: dict = {}
    exec(compile(cell.source, str(template), "exec"), namespace)  # our own template file
    return namespace[name]


def _default_case_cell(nb):
    """(cell, variable) holding a template's default case: the cell tagged ``demo-case``
    (``demo_case = {...}``, note templates) or else the ``parameters`` cell (``case = {...}``)."""
    for tag, name in (("demo-case", "demo_case"), ("parameters", "case")):
        for cell in nb.cells:
            if tag in cell.metadata.get("tags", []):
                return cell, name
    raise ValueError("template has neither a demo-case nor a parameters cell")


def sync_template_defaults() -> list[Path]:
    """Rewrite each template's default ``case`` from its demo file; returns those changed."""
    import pprint

    import nbformat
    import yaml

    changed = []
    for name, demo in TEMPLATE_DEFAULTS.items():
        path = _TEMPLATE_DIR / name
        case = yaml.safe_load((_PACKAGE_DIR.parent / demo).read_text(encoding="utf-8"))
        if template_default_case(path) == case:
            continue
        nb = nbformat.read(path, as_version=4)
        cell, name = _default_case_cell(nb)
        head, _, rest = cell.source.partition(f"{name} = ")
        tail = rest[rest.index("\nnote_time") :] if "\nnote_time" in rest else ""
        cell.source = head + f"{name} = " + pprint.pformat(case, sort_dicts=False, width=96) + tail
        atomic_write(path, nbformat.writes(nb))
        changed.append(path)
    return changed


def main(argv: list[str] | None = None) -> int:
    """``python -m finkit.notes``: register the kernel (make), or sync template defaults."""
    import argparse

    parser = argparse.ArgumentParser(prog="python -m finkit.notes")
    parser.add_argument("--ensure-kernel", action="store_true", help="install the finkit kernel")
    parser.add_argument(
        "--sync-defaults",
        action="store_true",
        help="rewrite each template's default case from its demo case file",
    )
    args = parser.parse_args(argv)
    if args.ensure_kernel:
        print(f"Jupyter kernel {ensure_kernel()!r} ready for {sys.executable}")
    if args.sync_defaults:
        for path in sync_template_defaults():
            print(f"updated {path}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
