"""``make demo``: render the demo scenario's calculation notes, then its variant batch.

The demo cases in ``demo_cases/`` describe an invented product line; every number in them is
made up for demonstration. Notes go to ``demo_out/`` (or the folder given with ``--out``;
``nb200-trade-study.yaml`` is rendered as a trade-study note); the
batch of ``demo_cases/nb-series-variants.csv`` (variants of ``nb200-plate-fan.yaml``) goes to
``demo_out/nb-series-batch/`` with its overview ``index.html``, and the batch of
``demo_cases/nb400-variants.csv`` (variants of the three-source board ``nb400-board-sources.yaml``,
one on a vapour-chamber base) to ``demo_out/nb400-batch/``.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from finkit.errors import FinkitError

ROOT = Path(__file__).resolve().parent.parent
DEMO_CASES = ROOT / "demo_cases"
BATCH_BASE = DEMO_CASES / "nb200-plate-fan.yaml"
BATCH_VARIANTS = DEMO_CASES / "nb-series-variants.csv"
#: Every demo batch: (base case, variant table, output folder name).
BATCHES = (
    (BATCH_BASE, BATCH_VARIANTS, "nb-series-batch"),
    (DEMO_CASES / "nb400-board-sources.yaml", DEMO_CASES / "nb400-variants.csv", "nb400-batch"),
)
TRADE_STUDY = DEMO_CASES / "nb200-trade-study.yaml"


def main(argv: list[str] | None = None) -> int:
    """Render every demo case's note and the demo batch into ``--out``; returns the exit code.

    Parameters
    ----------
    argv : list of str, optional
        Command-line arguments; default ``sys.argv[1:]``. [-]
    """
    parser = argparse.ArgumentParser(prog="python -m finkit.demo", description=__doc__)
    parser.add_argument("--out", default=str(ROOT / "demo_out"), help="output folder")
    args = parser.parse_args(argv)
    out = Path(args.out)

    from finkit.notes.files import skip_unused_slow_imports
    from finkit.notes.render import render_note

    skip_unused_slow_imports()

    cases = sorted(DEMO_CASES.glob("*.yaml"))
    failed = 0
    print(f"Rendering {len(cases)} demo notes into {out}/")
    for path in cases:
        options = {}
        if path.name == TRADE_STUDY.name:
            # The trade-study demo gets the trade-study note (front plotted, design chosen).
            from finkit.report import trade as report_trade

            options = {
                "template": report_trade.template_path(),
                "results": report_trade.results_json,
            }
        try:
            note = render_note(path, out, **options)
        except FinkitError as exc:
            failed += 1
            print(f"  {path.name}: could not be rendered: {exc}", file=sys.stderr)
            continue
        print(f"  {path.name:30s} -> {note.html}")
    if failed:
        print(f"{failed} demo note(s) failed", file=sys.stderr)
    print(
        "Open the note.html files in a browser; each folder also holds note.ipynb and results.json."
    )

    for base, variants, folder in BATCHES:
        if not variants.is_file():
            continue
        from finkit.batch import EXIT_NOT_COMPUTED, run_batch

        batch_out = out / folder
        print(f"\nRendering the variant batch {variants.name} into {batch_out}/")
        try:
            batch = run_batch(base, variants, batch_out, progress=sys.stderr.isatty())
        except FinkitError as exc:
            print(f"  the batch could not be run: {exc}", file=sys.stderr)
            return 2
        counts = batch.counts()
        print(
            f"  {len(batch.outcomes)} variants: {counts['pass']} pass, {counts['fail']} fail "
            f"their limit (expected in the demo), {counts['error']} not computed; "
            f"{counts['computed']} computed, {counts['reused']} reused, {batch.seconds:.1f} s"
        )
        for outcome in batch.outcomes:
            if outcome.status == "error":
                print(f"  {outcome.error}", file=sys.stderr)
        print(f"  overview: {batch.index}")
        if batch.exit_code == EXIT_NOT_COMPUTED:
            failed += 1
    return 2 if failed else 0


if __name__ == "__main__":
    raise SystemExit(main())
