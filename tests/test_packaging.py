"""finkit is a real package: a wheel carries its templates and renders a note from any folder.

Software behaviour, no physics. The slow test builds the wheel, installs it (not editable) in a
new virtual environment and renders a note there from a folder outside the source tree.
"""

from __future__ import annotations

import shutil
import subprocess
import sys
import tomllib
import venv
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent


def test_licence_is_an_spdx_string_and_templates_are_package_data():
    meta = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))
    assert meta["project"]["license"] == "MIT"
    data = meta["tool"]["setuptools"]["package-data"]["finkit"]
    assert "templates/*.ipynb" in data
    from finkit import notes

    assert notes.template_path("heat-sink").is_file()
    assert (ROOT / "templates" / "heat_sink_note.ipynb").resolve() == notes.template_path(
        "heat-sink"
    ).resolve()


@pytest.mark.slow
def test_wheel_installed_in_a_new_environment_renders_a_note_elsewhere(tmp_path):
    dist = tmp_path / "dist"
    build = subprocess.run(
        [sys.executable, "-m", "pip", "wheel", str(ROOT), "--no-deps", "-q", "-w", str(dist)],
        capture_output=True,
        text=True,
        check=False,
    )
    assert build.returncode == 0, build.stderr[-2000:]
    wheel = next(dist.glob("finkit-*.whl"))
    env = tmp_path / "env"
    venv.create(env, with_pip=True)
    python = env / "bin" / "python"
    install = subprocess.run(
        [str(python), "-m", "pip", "install", "-q", str(wheel)],
        capture_output=True,
        text=True,
        check=False,
    )
    assert install.returncode == 0, install.stderr[-2000:]
    work = tmp_path / "elsewhere"
    work.mkdir()
    shutil.copy(ROOT / "demo_cases" / "nb300-pin-ducted.yaml", work / "case.yaml")
    where = subprocess.run(
        [str(python), "-c", "import finkit; print(finkit.__file__)"],
        capture_output=True,
        text=True,
        check=True,
        cwd=work,
    )
    assert where.stdout.startswith(str(env)), where.stdout  # the installed copy, not the tree
    note = subprocess.run(
        [str(env / "bin" / "finkit"), "note", "case.yaml", "--out", "out"],
        capture_output=True,
        text=True,
        check=False,
        cwd=work,
    )
    assert note.returncode == 0, note.stderr[-2000:]
    html = (work / "out" / "nb300-pin-ducted" / "note.html").read_text(encoding="utf-8")
    assert "NB-300 converter module heat sink" in html
