"""The note's HTML: nbconvert with finkit's page template; the check that it is safe."""

from __future__ import annotations

import re
from functools import lru_cache
from html.parser import HTMLParser
from typing import Any

from finkit.errors import InputError
from finkit.notes.files import (
    _HTML_TEMPLATE_NAME,
    _PACKAGE_DIR,
    PAPER_SIZES,
)

__all__ = [
    "check_note_html",
    "check_paper",
    "render_html",
]


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


def check_paper(paper: str) -> None:
    """Refuse a paper size the printed note does not offer.

    Parameters
    ----------
    paper : str
        Paper size, one of :data:`PAPER_SIZES`. [-]
    """
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
    check_paper(paper)
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
