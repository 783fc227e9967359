"""Safe HTML building blocks for calculation-note templates.

Every function here returns a :class:`Fragment`, a piece of HTML that Jupyter displays as
``text/html`` and that nbconvert copies into the note as it is. Any text that comes from a
case file (titles, descriptions, names, free-form notes) goes through :func:`escape` first, so a
case title ``<script>alert(1)</script>`` shows as that text and never runs.

Equations are rendered at execution time by ``matplotlib.mathtext`` to an inline SVG image
(``data:image/svg+xml``), so a note needs no MathJax and no network. Markdown cells of a
template must therefore not contain ``$...$`` TeX: nbconvert would leave it as raw TeX. Write
prose in Markdown and equations with :func:`equation`. ``mathtext`` understands a subset of TeX
(fractions, roots, sub/superscripts, Greek letters, ``\\tanh``, ``\\mathrm``), not environments
such as ``align``.

Templates stay thin (see STYLE.md 2.5): they call these helpers and ``finkit.report`` and
do no
arithmetic of their own.
"""

from __future__ import annotations

import base64
import functools
import hashlib
import html
import io
import numbers
import os
import re
from collections.abc import Iterable, Mapping, Sequence
from pathlib import Path
from typing import Any
from urllib.parse import quote

__all__ = [
    "Fragment",
    "badge",
    "bullets",
    "equation",
    "escape",
    "figure",
    "heading",
    "html_table",
    "key_value_table",
    "page_template",
    "text",
]

_BADGES = {
    "pass": ("fk-badge-pass", "PASS"),
    "fail": ("fk-badge-fail", "FAIL"),
    "warn": ("fk-badge-warn", "CHECK"),
    "info": ("fk-badge-info", "INFO"),
}


class Fragment:
    """A piece of HTML built by this module from escaped parts.

    Jupyter displays it as HTML (``_repr_html_``); :func:`escape` and the table helpers insert it
    unchanged (``__html__``), so a badge can sit in a table cell. Build fragments only through the
    helpers of this module: wrapping case text in a ``Fragment`` directly bypasses escaping.
    """

    __slots__ = ("_markup",)

    def __init__(self, markup: str) -> None:
        self._markup = str(markup)

    def __html__(self) -> str:
        return self._markup

    def _repr_html_(self) -> str:
        return self._markup

    def __str__(self) -> str:
        return self._markup

    def __repr__(self) -> str:
        return f"Fragment({self._markup!r})"

    def __add__(self, other: object) -> Fragment:
        return Fragment(self._markup + escape(other))


def escape(value: Any) -> str:
    """Return ``value`` as HTML text: ``& < > " '`` escaped, fragments kept as they are.

    Parameters
    ----------
    value : object
        Any value; ``str(value)`` is escaped unless it has an ``__html__`` method (a
        :class:`Fragment`), whose markup is returned unchanged. [-]

    Returns
    -------
    str
        Text safe to place in HTML element content or in a quoted attribute. [-]

    Examples
    --------
    >>> escape("<script>alert(1)</script>")
    '&lt;script&gt;alert(1)&lt;/script&gt;'
    """
    if hasattr(value, "__html__"):
        return value.__html__()
    return html.escape(str(value), quote=True)


def _class_attr(css_class: str | None) -> str:
    return f' class="{escape(css_class)}"' if css_class else ""


def text(value: Any, *, css_class: str | None = None) -> Fragment:
    """A paragraph of escaped text; line breaks in ``value`` are kept.

    Parameters
    ----------
    value : object
        Text to show, typically from the case file. [-]
    css_class : str, optional
        Extra CSS class of the paragraph. [-]

    Returns
    -------
    Fragment
        ``<p>…</p>``. [-]

    Examples
    --------
    >>> str(text("R < 0.5 K/W\\nchecked"))
    '<p class="fk-text">R &lt; 0.5 K/W<br>checked</p>'
    """
    classes = "fk-text" + (f" {css_class}" if css_class else "")
    body = "<br>".join(escape(line) for line in str(value).split("\n"))
    return Fragment(f'<p class="{escape(classes)}">{body}</p>')


def heading(value: Any, level: int = 2) -> Fragment:
    """A heading of escaped text (for a title that comes from the case).

    Parameters
    ----------
    value : object
        Heading text. [-]
    level : int, optional
        1 to 6. [-]

    Returns
    -------
    Fragment
        ``<hN>…</hN>``. [-]
    """
    if not isinstance(level, int) or not 1 <= level <= 6:
        raise ValueError(f"heading level={level!r} is not allowed; use an integer 1 to 6")
    return Fragment(f"<h{level}>{escape(value)}</h{level}>")


def _format_cell(value: Any) -> tuple[str, bool]:
    """Cell markup and whether it is numeric (right-aligned)."""
    if hasattr(value, "__html__"):
        return value.__html__(), False
    if value is None:
        return "—", False
    if isinstance(value, bool):
        return ("yes" if value else "no"), False
    if isinstance(value, numbers.Integral):
        return escape(str(int(value))), True
    if isinstance(value, numbers.Real):
        return escape(format(float(value), ".4g")), True
    return escape(value), False


def html_table(
    rows: Iterable[Sequence[Any]],
    *,
    header: Sequence[Any] | None = None,
    caption: Any = None,
    css_class: str | None = None,
) -> Fragment:
    """A bordered table; every cell is escaped, numbers are right-aligned.

    Parameters
    ----------
    rows : iterable of sequences
        Table body, one sequence of cell values per row. Strings are escaped, integers printed
        as they are, other real numbers with 4 significant figures (format them beforehand for
        another precision), ``None`` as a dash, booleans as yes/no, fragments unchanged. [-]
    header : sequence, optional
        Column headings (escaped). [-]
    caption : object, optional
        Table caption (escaped). [-]
    css_class : str, optional
        Extra CSS class of the table. [-]

    Returns
    -------
    Fragment
        ``<table class="fk-table">…</table>``. [-]

    Examples
    --------
    >>> str(html_table([["<b>", 2]], header=["name", "n"]))[:63]
    '<table class="fk-table"><thead><tr><th>name</th><th>n</th></tr>'
    >>> str(html_table([["<b>", 2]]))[-68:]
    '<tr><td>&lt;b&gt;</td><td class="fk-num">2</td></tr></tbody></table>'
    """
    from markupsafe import Markup

    classes = "fk-table" + (f" {css_class}" if css_class else "")
    html = page_template("table.html.j2").render(
        classes=Markup(escape(classes)),
        caption=None if caption is None else Markup(escape(caption)),
        header=None if header is None else [Markup(escape(cell)) for cell in header],
        rows=[
            [(Markup(markup), is_number) for markup, is_number in map(_format_cell, row)]
            for row in rows
        ],
    )
    return Fragment(html)


def page_template(name: str):
    """A Jinja2 template of ``finkit/page_templates`` (HTML, autoescaping on).

    Parameters
    ----------
    name : str
        File name, e.g. ``"batch_overview.html.j2"``. [-]

    Returns
    -------
    jinja2.Template
        Render it with plain values; text is escaped, ``markupsafe.Markup`` is kept. [-]
    """
    import jinja2

    global _PAGE_ENV
    if _PAGE_ENV is None:
        _PAGE_ENV = jinja2.Environment(
            loader=jinja2.PackageLoader("finkit", "page_templates"),
            autoescape=True,
            undefined=jinja2.StrictUndefined,
        )
    return _PAGE_ENV.get_template(name)


_PAGE_ENV = None


def key_value_table(
    items: Mapping[Any, Any] | Iterable[Sequence[Any]],
    *,
    header: Sequence[Any] | None = None,
    caption: Any = None,
) -> Fragment:
    """A two- (or more) column table of names and values, e.g. the input echo of a case.

    Parameters
    ----------
    items : mapping or iterable of sequences
        ``{name: value}`` or rows such as ``(name, value, unit)``. Nested mappings and lists are
        shown as their ``str``. [-]
    header : sequence, optional
        Column headings (escaped). [-]
    caption : object, optional
        Table caption (escaped). [-]

    Returns
    -------
    Fragment
        ``<table class="fk-table fk-kv">…</table>``. [-]
    """
    rows = list(items.items()) if isinstance(items, Mapping) else list(items)
    return html_table(rows, header=header, caption=caption, css_class="fk-kv")


def bullets(
    items: Iterable[Any], *, ordered: bool = False, css_class: str | None = "fk-list"
) -> Fragment:
    """A list of escaped items (a :class:`Fragment` item is kept as markup).

    Parameters
    ----------
    items : iterable
        List items: text (escaped) or fragments (kept), in order. [-]
    ordered : bool, optional
        A numbered list (``<ol>``) instead of bullets (``<ul>``). [-]
    css_class : str or None, optional
        CSS class of the list. [-]

    Returns
    -------
    Fragment
        ``<ul class="fk-list"><li>…</li>…</ul>`` (or ``<ol>``). [-]

    Examples
    --------
    >>> str(bullets(["a < b", "c"]))
    '<ul class="fk-list"><li>a &lt; b</li><li>c</li></ul>'
    >>> str(bullets(["first"], ordered=True, css_class=None))
    '<ol><li>first</li></ol>'
    """
    tag = "ol" if ordered else "ul"
    body = "".join(f"<li>{escape(item)}</li>" for item in items)
    return Fragment(f"<{tag}{_class_attr(css_class)}>{body}</{tag}>")


def badge(status: bool | str | None, label: Any = None) -> Fragment:
    """A pass/fail badge for a requirement check.

    Parameters
    ----------
    status : bool or {"pass", "fail", "warn", "info"} or None
        ``True`` is "pass", ``False`` is "fail", ``None`` is "warn" (not checked). [-]
    label : object, optional
        Badge text (escaped); default PASS, FAIL, CHECK or INFO. [-]

    Returns
    -------
    Fragment
        ``<span class="fk-badge fk-badge-pass">PASS</span>`` and so on. [-]
    """
    if status is True:
        key = "pass"
    elif status is False:
        key = "fail"
    elif status is None:
        key = "warn"
    else:
        key = str(status).lower()
    if key not in _BADGES:
        raise ValueError(
            f"badge status={status!r} is not allowed; use True, False, None, "
            f"or one of {', '.join(_BADGES)}"
        )
    css, default = _BADGES[key]
    shown = default if label is None else label
    return Fragment(f'<span class="fk-badge {css}">{escape(shown)}</span>')


_SVG_METADATA = re.compile(r"<metadata>.*?</metadata>\s*|<!DOCTYPE[^>]*>\s*", re.DOTALL)


def equation(latex: str, *, label: Any = None, fontsize: float = 15.0) -> Fragment:
    """A displayed equation rendered offline to an inline SVG image by ``matplotlib.mathtext``.

    Parameters
    ----------
    latex : str
        Math in the TeX subset of ``matplotlib.mathtext``, without surrounding ``$``, e.g.
        ``r"\\eta_f = \\dfrac{\\tanh(m L_c)}{m L_c}"`` (``\\dfrac`` for a full-size fraction). [-]
    label : object, optional
        Equation number or source shown at the right, e.g. ``"(3.89)"`` (escaped). [-]
    fontsize : float, optional
        Font size. [pt]

    Returns
    -------
    Fragment
        ``<div class="fk-equation"><img src="data:image/svg+xml,…" alt="…">…</div>``;
        the ``alt`` text is the TeX source, so the equation stays searchable. [-]

    Notes
    -----
    Glyphs are written as SVG paths (``svg.fonttype = "path"``) in the STIX font set, so the
    image needs no font on the reader's machine.
    """
    parts = [
        '<div class="fk-equation">',
        f'<img class="fk-eq" src="{_equation_uri(str(latex), float(fontsize))}" '
        f'alt="{escape(latex)}">',
    ]
    if label is not None:
        parts.append(f'<span class="fk-eq-label">{escape(label)}</span>')
    parts.append("</div>")
    return Fragment("".join(parts))


@functools.lru_cache(maxsize=256)
def _equation_uri(latex: str, fontsize: float) -> str:
    """The SVG data URI of one equation; the same text always gives the same image (the SVG
    ids are salted with a fixed string), so a batch renders each equation once in its parent
    and every note reuses it, and a rendered equation is kept on disk for the next note
    (:func:`_equation_cache_file`; about 0.3 s of each heat-sink note)."""
    cache = _equation_cache_file(latex, fontsize)
    try:
        return cache.read_text(encoding="ascii")
    except (OSError, ValueError):  # not rendered yet (or unreadable): render it
        pass
    import matplotlib
    from matplotlib.font_manager import FontProperties
    from matplotlib.mathtext import math_to_image

    buffer = io.BytesIO()
    with matplotlib.rc_context(
        {"mathtext.fontset": "stix", "svg.fonttype": "path", "svg.hashsalt": "finkit"}
    ):
        math_to_image(f"${latex}$", buffer, prop=FontProperties(size=fontsize), format="svg")
    uri = _svg_data_uri(_SVG_METADATA.sub("", buffer.getvalue().decode("utf-8")))
    try:  # whole or absent: written under a temporary name, then renamed
        cache.parent.mkdir(parents=True, exist_ok=True)
        partial = cache.with_name(f"{cache.name}.{os.getpid()}.partial")
        partial.write_text(uri, encoding="ascii")
        os.replace(partial, cache)
    except OSError:  # a read-only or full cache folder only costs the rendering next time
        pass
    return uri


def equation_cache_folder() -> Path:
    """Where rendered equations are kept between runs: the user's cache folder for finkit.

    Returns
    -------
    pathlib.Path
        ``platformdirs.user_cache_dir("finkit") / "equations"`` (``FINKIT_CACHE_DIR`` replaces
        the first part when set). [-]
    """
    root = os.environ.get("FINKIT_CACHE_DIR")
    if not root:
        import platformdirs

        root = platformdirs.user_cache_dir("finkit")
    return Path(root) / "equations"


@functools.cache
def _renderer_digest() -> str:
    """SHA-256 of what makes an equation's image: this module's code and matplotlib's version."""
    import matplotlib

    digest = hashlib.sha256(Path(__file__).read_bytes())
    digest.update(matplotlib.__version__.encode())
    return digest.hexdigest()


def _equation_cache_file(latex: str, fontsize: float) -> Path:
    """The cache file of one equation, named by the hash of its text, size and renderer, so a
    changed equation, this module changed or another matplotlib never finds a stale image."""
    key = hashlib.sha256(f"{_renderer_digest()}\n{fontsize!r}\n{latex}".encode()).hexdigest()
    return equation_cache_folder() / f"{key}.txt"


def _svg_data_uri(svg: str) -> str:
    """A compact ``data:image/svg+xml,`` URI: whitespace runs collapsed, double quotes turned
    into single ones and only the characters a URI may not hold percent-encoded. About a third
    smaller than base64 (the plate-fin demo note's seven equations: 182 KB to about 125 KB)."""
    svg = re.sub(r"<!--.*?-->", "", svg, flags=re.S)  # matplotlib echoes the TeX source
    text = _coarser_glyphs(re.sub(r"\s+", " ", svg.replace('"', "'")).strip())
    encoded = re.sub(r"[%#<>\x00-\x1f\x7f-\uffff]", lambda m: quote(m.group()), text)
    return "data:image/svg+xml," + encoded


#: A glyph outline as matplotlib writes it: font units of 1/64, scaled when drawn.
_GLYPH_PATH = re.compile(r"(?<= )d='([^']*)' transform='scale\(0\.015625\)'")
#: Coarsening of the glyph coordinates: 32 of matplotlib's units become one.
_GLYPH_STEP = 32


def _coarser_glyphs(svg: str) -> str:
    """Glyph outlines on a 32 times coarser integer grid (scale 1/64 becomes 1/2).

    A step is then half of matplotlib's glyph unit: at the note's equations about 0.03 mm on
    paper, below what a 600 dpi printer resolves (0.04 mm; page 11 of the plate-fin demo note
    printed at 400 dpi showed no visible change), and the outlines take about a third less
    text (most coordinates lose a digit; a repeated line-to or curve-to command
    letter is left out, as SVG allows).
    """

    def coarser(match):
        out, previous = [], None
        for token in match.group(1).split():
            if token.isalpha():
                # A repeated L or Q may be left out (SVG repeats the last command; not after M,
                # whose further pairs are line-tos, nor Z).
                if token == previous and token in "LQ":
                    continue
                previous = token
                out.append(token)
            else:
                try:
                    out.append(str(round(float(token) / _GLYPH_STEP)))
                except ValueError:  # not an outline as expected: leave this glyph as it is
                    return match.group(0)
        return f"d='{' '.join(out)}' transform='scale({_GLYPH_STEP / 64:g})'"

    return _GLYPH_PATH.sub(coarser, svg)


def _palette_png(png: bytes) -> bytes:
    """The same PNG with a 256-colour palette, when that is smaller.

    Plots are line art on white with a handful of colours plus their anti-aliasing: a palette
    (Pillow's fast octree, no dithering) keeps them visually unchanged on screen and in print
    and makes the demo note's ten figures about 3 times smaller (603 KB to 185 KB, 14 ms a
    figure; measured on the plate-fin demo note). Lossy only in colours a plot does not use.
    """
    try:
        from PIL import Image
    except ImportError:  # pragma: no cover - Pillow ships with matplotlib
        return png
    with Image.open(io.BytesIO(png)) as image:
        rgb = image.convert("RGB")
    quantized = rgb.quantize(colors=256, method=Image.Quantize.FASTOCTREE, dither=Image.Dither.NONE)
    out = io.BytesIO()
    quantized.save(out, format="PNG")
    smaller = out.getvalue()
    if len(smaller) < len(png):
        return smaller
    full = io.BytesIO()  # full colour at the usual compression (the input may be a fast one)
    rgb.save(full, format="PNG")
    return min(full.getvalue(), png, key=len)


def figure(fig: Any, *, caption: Any = None, dpi: float = 150.0) -> Fragment:
    """A matplotlib figure as an embedded PNG with an escaped caption; the figure is closed.

    Parameters
    ----------
    fig : matplotlib.figure.Figure
        The figure to embed. It is closed afterwards so the inline backend does not show it a
        second time. [-]
    caption : object, optional
        Figure caption (escaped). [-]
    dpi : float, optional
        Resolution of the PNG; it is shown at its size in inches at 96 CSS px per inch (at
        most the page width). [dots per inch]

    Returns
    -------
    Fragment
        ``<figure class="fk-figure"><img src="data:image/png;base64,…">…</figure>``. [-]
    """
    buffer = io.BytesIO()
    # A fast intermediate PNG (zlib level 1): it is decoded at once and saved again with a
    # palette at the usual level, so its own size does not matter (about 15 ms a figure).
    fig.savefig(
        buffer,
        format="png",
        dpi=dpi,
        bbox_inches="tight",
        facecolor="white",
        pil_kwargs={"compress_level": 1},
    )
    png = _palette_png(buffer.getvalue())
    width_px = round(int.from_bytes(png[16:20], "big") / dpi * 96)  # IHDR width, in CSS px
    try:
        import matplotlib.pyplot as plt

        plt.close(fig)
    except ImportError:  # pragma: no cover - pyplot ships with matplotlib
        pass
    data = base64.b64encode(png).decode("ascii")
    alt = escape(caption) if caption is not None else "figure"
    parts = [
        '<figure class="fk-figure">',
        f'<img src="data:image/png;base64,{data}" alt="{alt}" style="width:{width_px}px">',
    ]
    if caption is not None:
        parts.append(f"<figcaption>{escape(caption)}</figcaption>")
    parts.append("</figure>")
    return Fragment("".join(parts))
