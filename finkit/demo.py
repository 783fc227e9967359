"""``make demo``: render the demo scenario's calculation notes (and, when present, its batch).

The demo cases in ``demo_cases/`` describe an invented product line; every number in them is
made up for demonstration. Notes go to ``demo_out/`` (or the folder given with ``--out``).
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from finkit.errors import FinkitError

ROOT = Path(__file__).resolve().parent.parent
DEMO_CASES = ROOT / "demo_cases"


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(prog="python -m finkit.demo", description=__doc__)
    parser.add_argument("--out", default=str(ROOT / "demo_out"), help="output folder")
    args = parser.parse_args(argv)
    out = Path(args.out)

    from finkit.notes import render_note

    cases = sorted(DEMO_CASES.glob("*.yaml"))
    failed = 0
    print(f"Rendering {len(cases)} demo notes into {out}/")
    for path in cases:
        try:
            note = render_note(path, out)
        except FinkitError as exc:
            failed += 1
            print(f"  {path.name}: could not be rendered: {exc}", file=sys.stderr)
            continue
        print(f"  {path.name:28s} -> {note.html}")
    if failed:
        print(f"{failed} demo note(s) failed", file=sys.stderr)
        return 2
    print(
        "Open the note.html files in a browser; each folder also holds note.ipynb and results.json."
    )
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
