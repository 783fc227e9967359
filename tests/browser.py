"""Headless Chromium for the tests of the calculation notes (Debian package ``chromium``).

``.ci/ensure_chromium.sh`` installs it when ``/usr/bin/chromium`` is missing. Chromium runs
offline-minded: no first-run, background networking, component updates, sync or QUIC, and every
host name resolves to nothing, so a note that needed the network would show it.
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
import tempfile
from pathlib import Path
from typing import NamedTuple

CHROMIUM = os.environ.get("FINKIT_CHROMIUM", "/usr/bin/chromium")

_FLAGS = (
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--host-resolver-rules=MAP * ~NOTFOUND",
    "--enable-logging=stderr",
    "--v=0",
)

# Chromium logs every console message (log, warning, error, uncaught exception) as
# "[pid:tid:date:INFO:CONSOLE:line] "message", source: url (line)".
_CONSOLE = re.compile(r":CONSOLE[:(\]].*")


class BrowserRun(NamedTuple):
    """What one headless Chromium run produced."""

    returncode: int
    console: list[str]
    stderr: str


def chromium_available() -> bool:
    """True if the Chromium binary exists and is executable."""
    return os.path.isfile(CHROMIUM) and os.access(CHROMIUM, os.X_OK)


def run_chromium(url: str, *extra: str, timeout: float = 90) -> BrowserRun:
    """Run headless Chromium on ``url`` with ``extra`` flags (e.g. ``--screenshot=...``)."""
    profile = tempfile.mkdtemp(prefix="finkit-chromium-")
    try:
        completed = subprocess.run(
            [CHROMIUM, *_FLAGS, f"--user-data-dir={profile}", *extra, url],
            capture_output=True,
            text=True,
            timeout=timeout,
            check=False,
        )
    finally:
        shutil.rmtree(profile, ignore_errors=True)
    console = [line for line in completed.stderr.splitlines() if _CONSOLE.search(line)]
    return BrowserRun(completed.returncode, console, completed.stderr)


def screenshot(html: Path, png: Path, *, width: int = 1200, height: int = 1600) -> BrowserRun:
    """Screenshot of a local HTML file at the given window size."""
    return run_chromium(
        html.resolve().as_uri(), f"--screenshot={png}", f"--window-size={width},{height}"
    )


def print_to_pdf(html: Path, pdf: Path) -> BrowserRun:
    """Print a local HTML file to PDF the way a reader's "Print" would (CSS page size)."""
    return run_chromium(html.resolve().as_uri(), f"--print-to-pdf={pdf}", "--no-pdf-header-footer")


def non_white_fraction(png: Path, threshold: int = 245) -> float:
    """Fraction of pixels with any channel darker than ``threshold`` (0 for a blank page)."""
    from PIL import Image

    with Image.open(png) as image:
        gray = image.convert("L")
        histogram = gray.histogram()
    total = sum(histogram)
    return sum(histogram[:threshold]) / total


def pdf_page_sizes(pdf: Path) -> list[tuple[float, float]]:
    """Width and height in PostScript points of each page's MediaBox in a PDF file."""
    data = pdf.read_bytes()
    boxes = re.findall(
        rb"/MediaBox\s*\[\s*([-\d.]+)\s+([-\d.]+)\s+([-\d.]+)\s+([-\d.]+)\s*\]", data
    )
    return [(float(x1) - float(x0), float(y1) - float(y0)) for x0, y0, x1, y1 in boxes]
