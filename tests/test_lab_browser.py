"""The explorer in a real JupyterLab, driven by headless Chromium (issue 14).

``finkit lab`` starts JupyterLab on copies of the templates; Chromium opens the explorer
notebook and runs it through JupyterLab's own command ("run all cells"), over the Chrome
DevTools Protocol (``websocket-client``, a dependency of Jupyter's own packages). Checked as a
user would see it: the widgets render with units, nothing scrolls sideways at 1500 px, a slider
moved with the keyboard changes the numbers, the unit toggle relabels the controls, and the
Save button writes a case of its own id. Software behaviour only; no physics is checked here.
"""

from __future__ import annotations

import importlib.util
import json
import os
import re
import shutil
import signal
import socket
import subprocess
import sys
import tempfile
import time
import urllib.request
from pathlib import Path

import pytest
from browser import CHROMIUM

pytestmark = [
    pytest.mark.slow,
    pytest.mark.skipif(not Path(CHROMIUM).exists(), reason="needs Chromium"),
    pytest.mark.skipif(
        importlib.util.find_spec("jupyterlab") is None
        or importlib.util.find_spec("websocket") is None,
        reason="needs jupyterlab and websocket-client",
    ),
]

TOKEN = "finkit-test-token"


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class _Page:
    """The smallest DevTools client: send a command, wait for its answer."""

    def __init__(self, url: str):
        import websocket

        self.ws = websocket.create_connection(url, timeout=60, suppress_origin=True)
        self.count = 0

    def call(self, method: str, **params):
        self.count += 1
        self.ws.send(json.dumps({"id": self.count, "method": method, "params": params}))
        while True:
            message = json.loads(self.ws.recv())
            if message.get("id") == self.count:
                if "error" in message:
                    raise RuntimeError(message["error"])
                return message.get("result", {})

    def js(self, expression: str):
        result = self.call(
            "Runtime.evaluate", expression=expression, returnByValue=True, awaitPromise=True
        )
        if "exceptionDetails" in result:
            raise RuntimeError(result["exceptionDetails"].get("text", "script error"))
        return result["result"].get("value")

    def wait(self, expression: str, what: str, timeout: float = 90.0):
        end = time.monotonic() + timeout
        while time.monotonic() < end:
            try:
                value = self.js(expression)
            except RuntimeError:
                value = None
            if value:
                return value
            time.sleep(0.3)
        raise AssertionError(f"timed out waiting for {what}")

    def key(self, key: str, code: int):
        for kind in ("keyDown", "keyUp"):
            self.call(
                "Input.dispatchKeyEvent",
                type=kind,
                key=key,
                code=key,
                windowsVirtualKeyCode=code,
                nativeVirtualKeyCode=code,
            )


@pytest.fixture(scope="module")
def lab():
    """JupyterLab through ``finkit lab`` and a Chromium page on the explorer notebook."""
    root = Path(tempfile.mkdtemp(prefix="finkit-lab-"))
    port = _free_port()
    log = open(root.parent / f"{root.name}.log", "w")  # noqa: SIM115 - closed below
    server = subprocess.Popen(
        [
            sys.executable,
            "-m",
            "finkit.cli",
            "lab",
            "--dir",
            str(root),
            "--no-browser",
            "--",
            f"--port={port}",
            "--ServerApp.ip=127.0.0.1",
            f"--IdentityProvider.token={TOKEN}",
            "--LabApp.expose_app_in_browser=True",
        ],
        stdout=log,
        stderr=subprocess.STDOUT,
        start_new_session=True,  # finkit lab starts JupyterLab, which starts kernels: one group
    )
    profile = tempfile.mkdtemp(prefix="finkit-chromium-")
    chromium = None
    try:
        end = time.monotonic() + 60
        while True:
            try:
                urllib.request.urlopen(
                    f"http://127.0.0.1:{port}/api/status?token={TOKEN}", timeout=2
                )
                break
            except OSError:
                assert time.monotonic() < end, "JupyterLab did not start"
                time.sleep(0.3)
        chromium = subprocess.Popen(
            [
                CHROMIUM,
                "--headless",
                "--no-sandbox",
                "--disable-gpu",
                "--no-first-run",
                "--remote-debugging-port=0",
                f"--user-data-dir={profile}",
                "--window-size=1500,1000",
                "about:blank",
            ],
            stderr=subprocess.PIPE,
            text=True,
        )
        for line in chromium.stderr:
            found = re.search(r"DevTools listening on ws://127\.0\.0\.1:(\d+)/", line)
            if found:
                break
        else:
            raise AssertionError("Chromium did not open its DevTools port")
        listing = f"http://127.0.0.1:{found.group(1)}/json/list"
        targets = json.load(urllib.request.urlopen(listing, timeout=10))
        page = _Page(next(t for t in targets if t["type"] == "page")["webSocketDebuggerUrl"])
        page.call("Page.enable")
        page.call(
            "Page.navigate", url=f"http://127.0.0.1:{port}/lab/tree/explorer.ipynb?token={TOKEN}"
        )
        page.wait("!!window.jupyterapp && !!document.querySelector('.jp-Notebook')", "the notebook")
        page.wait(
            "(() => { const w = Array.from(window.jupyterapp.shell.widgets('main'))"
            ".find(x => x.sessionContext); return w && "
            "w.sessionContext.kernelDisplayStatus === 'idle'; })()",
            "the kernel",
        )
        page.js("window.jupyterapp.commands.execute('notebook:run-all-cells')")
        page.wait("document.querySelectorAll('.widget-slider').length >= 8", "the sliders", 180)
        yield page, root
    finally:
        if chromium is not None:
            chromium.kill()
            chromium.wait()
        # the whole group: stopping only `finkit lab` left JupyterLab and its kernel running
        os.killpg(server.pid, signal.SIGTERM)
        try:
            server.wait(timeout=20)
        except subprocess.TimeoutExpired:
            os.killpg(server.pid, signal.SIGKILL)
        try:
            os.killpg(server.pid, signal.SIGKILL)  # anything of the group still there
        except ProcessLookupError:
            pass
        log.close()
        shutil.rmtree(profile, ignore_errors=True)
        shutil.rmtree(root, ignore_errors=True)


READOUT = (
    "(Array.from(document.querySelectorAll('.widget-html-content')).map(e => e.textContent)"
    ".find(t => t.includes('limit node')) || '')"
)


def _slider(label: str) -> str:
    return (
        "Array.from(document.querySelectorAll('.widget-slider')).find(e => "
        f"(e.querySelector('.widget-label') || {{}}).textContent === {json.dumps(label)})"
    )


def test_widgets_render_with_units_and_fit_the_page(lab):
    page, _ = lab
    labels = page.js(
        "Array.from(document.querySelectorAll('.widget-slider .widget-label'))"
        ".map(e => e.textContent)"
    )
    assert "Fin height [mm]" in labels and "Inlet air [°C]" in labels and "Power [W]" in labels
    assert "PASS" in page.wait(READOUT, "the numbers")
    # nothing in the explorer scrolls sideways at a 1500 px window
    wide = page.js(
        "Array.from(document.querySelectorAll('.jp-OutputArea-output, .widget-box'))"
        ".filter(e => e.scrollWidth > e.clientWidth + 1).length"
    )
    assert wide == 0
    buttons = page.js(
        "Array.from(document.querySelectorAll('.widget-button')).filter(b => "
        "b.scrollWidth > b.clientWidth + 1).map(b => b.textContent)"
    )
    assert buttons == []  # no label cut off


def test_a_slider_moved_with_the_keyboard_changes_the_numbers(lab):
    page, _ = lab
    before = page.wait(READOUT, "the numbers")
    count = int(page.js(f"{_slider('Fin count [-]')}.querySelector('.widget-readout').textContent"))
    assert page.js(
        f"(() => {{ const h = {_slider('Fin count [-]')}.querySelector('.noUi-handle'); "
        "h.focus(); return document.activeElement === h; })()"
    )
    page.key("ArrowRight", 39)
    after = page.wait(
        f"(() => {{ const t = {READOUT}; return t && t !== {json.dumps(before)} ? t : null; }})()",
        "the numbers to change",
    )
    assert after != before
    moved = page.js(f"{_slider('Fin count [-]')}.querySelector('.widget-readout').textContent")
    assert int(moved) == count + 1


def test_the_unit_toggle_relabels_the_controls(lab):
    page, _ = lab
    page.js(
        "Array.from(document.querySelectorAll('.widget-toggle-button'))"
        ".find(b => b.textContent.trim() === 'US').click()"
    )
    page.wait(f"!!{_slider('Fin height [in]')}", "the controls in inches")
    assert "°F" in page.wait(
        f"(() => {{ const t = {READOUT}; return t.includes('°F') && t; }})()", "°F"
    )
    page.js(
        "Array.from(document.querySelectorAll('.widget-toggle-button'))"
        ".find(b => b.textContent.trim() === 'SI').click()"
    )
    page.wait(f"!!{_slider('Fin height [mm]')}", "the controls back in mm")


def test_save_writes_a_case_of_its_own_id(lab):
    page, root = lab
    page.js(
        "Array.from(document.querySelectorAll('button'))"
        ".find(b => b.textContent.trim() === 'Save as case').click()"
    )
    saved = root / "nb200-plate-fan-explored.yaml"
    end = time.monotonic() + 30
    while not saved.exists() and time.monotonic() < end:
        time.sleep(0.3)
    text = saved.read_text(encoding="utf-8")
    assert "\ncase_id: nb200-plate-fan-explored\n" in text
    assert "Saved" in page.wait(
        "(Array.from(document.querySelectorAll('.widget-html-content')).map(e => e.textContent)"
        ".find(t => t.startsWith('Saved')) || '')",
        "the saved message",
    )
