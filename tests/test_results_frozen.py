"""results.json of every demo case, frozen: a restructuring must not change a single byte.

Regression: frozen own output, labelled as such. The stored copies in ``tests/data/results/``
are ``CaseResult.to_json_dict()`` of each demo case with the two fields that change from run to
run or release to release removed (``created``, ``finkit_version``), written as ``finkit note``
writes results.json, with the repository's folder written as ``<repository>``. They were made
by the code before the move into layered packages (commit 0bd8a52) and are equal byte for byte
after it. A change of the physics that is meant changes them: regenerate with
``python tests/test_results_frozen.py`` and say why in the commit.
"""

from __future__ import annotations

import json
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
STORED = ROOT / "tests" / "data" / "results"
CASES = sorted((ROOT / "demo_cases").glob("*.yaml"))
VOLATILE = ("created", "finkit_version")


def frozen_text(case_file: Path) -> str:
    from finkit.case import load_case
    from finkit.model import run_case

    result = dict(run_case(load_case(case_file)).to_json_dict())
    for key in VOLATILE:
        result.pop(key)
    text = json.dumps(result, indent=2, ensure_ascii=False, allow_nan=False) + "\n"
    # a previous revision is named by its absolute path: the clone's folder is not a result
    return text.replace(json.dumps(str(ROOT))[1:-1], "<repository>")


@pytest.mark.regression
@pytest.mark.parametrize("case_file", CASES, ids=[c.stem for c in CASES])
def test_results_json_is_unchanged(case_file):
    stored = STORED / f"{case_file.stem}.json"
    assert stored.is_file(), f"no stored copy for {case_file.name}; regenerate (see docstring)"
    assert frozen_text(case_file) == stored.read_text(encoding="utf-8")


def test_every_stored_copy_has_its_demo_case():
    assert sorted(p.stem for p in STORED.glob("*.json")) == sorted(c.stem for c in CASES)


if __name__ == "__main__":  # regenerate the stored copies
    for case_file in CASES:
        (STORED / f"{case_file.stem}.json").write_text(frozen_text(case_file), encoding="utf-8")
    sys.exit(0)
