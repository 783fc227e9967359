"""finkit's command line: ``finkit new``, ``finkit check``, ``finkit note``, ``finkit batch``.

Each sub-command parses its arguments and calls one public function; no physics here.

Exit codes: 0 the case passes its limit (or the command did its job); 1 the case fails its
limit; 2 the input is wrong (for ``finkit batch``: 0 every variant computed and passing, 1 some
variant fails its limit, 2 some variant could not be computed or the input is wrong; 130 the
batch was interrupted) (every :class:`finkit.errors.FinkitError` is printed to stderr as its
one-line message(s), never as a traceback) or the command line itself is wrong.

``finkit.model`` and ``finkit.notes`` are imported inside the sub-commands, so ``finkit new``
works without them.
"""

from __future__ import annotations

import argparse
import json
import os
import sys
import warnings
from importlib import resources
from pathlib import Path

from finkit.errors import FinkitError

STARTERS = ("plate-fin", "pin-fin", "natural", "sources", "single-fin")

EXIT_PASS, EXIT_FAIL, EXIT_INPUT, EXIT_INTERNAL = 0, 1, 2, 3


def starter_text(kind: str) -> str:
    """The commented starter case file for ``kind`` (one of :data:`STARTERS`).

    Parameters
    ----------
    kind : str
        Kind of case, a key of :data:`STARTERS`. [-]
    """
    if kind not in STARTERS:
        raise FinkitError(f"starter: unknown kind '{kind}' (allowed: {', '.join(STARTERS)})")
    return (resources.files("finkit") / "data" / "starters" / f"{kind}.yaml").read_text("utf-8")


def _new(args) -> int:
    text = starter_text(args.kind)
    out = Path(args.out) if args.out else Path(f"{args.kind}.yaml")
    if out.exists() and not args.force:
        raise FinkitError(f"--out: '{out}' already exists (use --force to overwrite it)")
    try:
        out.parent.mkdir(parents=True, exist_ok=True)
        out.write_text(text, encoding="utf-8")
    except OSError as exc:
        raise FinkitError(f"--out: cannot write '{out}' ({exc.strerror})") from None
    print(f"wrote {out}; edit it, then run: finkit check {out}")
    return EXIT_PASS


def _number(value) -> str:
    if value is None:
        return "-"
    if isinstance(value, bool):
        return str(value)
    if isinstance(value, int | float):
        return f"{value:.4g}"
    return str(value)


def _rows(payload: dict) -> list[tuple[str, str, str]]:
    rows = []
    for name, entry in (payload.get("results") or {}).items():
        if isinstance(entry, dict):
            value, unit = entry.get("value"), entry.get("unit", "")
        elif isinstance(entry, list | tuple) and len(entry) == 2:
            value, unit = entry
        else:
            value, unit = entry, ""
        rows.append((name, _number(value), "" if unit in (None, "1") else str(unit)))
    return rows


def _print_table(case_id: str | None, status: str, rows, warnings) -> None:
    width = max([len(r[0]) for r in rows] + [len("result")])
    vwidth = max([len(r[1]) for r in rows] + [len("value")])
    if case_id is not None:
        print(f"case {case_id}")
    print(f"{'result':<{width}}  {'value':>{vwidth}}  unit")
    for name, value, unit in rows:
        print(f"{name:<{width}}  {value:>{vwidth}}  {unit}".rstrip())
    print(f"status: {status}")
    if warnings:
        print("warnings:")
        for line in warnings:
            print(f"  - {line}")


def _strict(value):
    """JSON-safe copy: NaN and infinities become null (strict JSON has neither)."""
    if isinstance(value, float):
        return value if value == value and abs(value) != float("inf") else None
    if isinstance(value, dict):
        return {k: _strict(v) for k, v in value.items()}
    if isinstance(value, list | tuple):
        return [_strict(v) for v in value]
    return value


def _dumps(payload) -> str:
    return json.dumps(_strict(payload), indent=2, ensure_ascii=False, allow_nan=False, default=str)


def _value(block: dict, name: str):
    entry = (block or {}).get(name)
    return entry.get("value") if isinstance(entry, dict) else entry


def _governing_lines(payload: dict) -> list[str]:
    """The verdict on the governing condition, first thing ``finkit check`` prints."""
    gov = payload.get("governing")
    if not isinstance(gov, dict):
        return []
    r = payload.get("results") or {}
    node_t, limit = _value(r, "limit_node_temperature"), _value(r, "limit_temperature")
    margin, required = _value(gov, "temperature_margin"), _value(gov, "required_margin")
    allowed, power = _value(gov, "allowable_power"), _value(gov, "power")
    lines = [
        f"governing condition: {gov['condition']} ({gov.get('description') or 'as stated'})",
        f"  why: {gov.get('reason', '')}",
    ]
    if payload.get("governing_source"):
        node = next(
            (x.get("limit_node") for x in payload.get("sources") or [] if x.get("name") ==
             payload["governing_source"]),
            "limit node",
        )  # fmt: skip
        lines.append(f"  governing source: {payload['governing_source']} ({node})")
    if None not in (node_t, limit, margin, required):
        if margin >= required:
            against = f"meets the required {required:.3g} K"
        elif margin >= 0:
            against = f"{required - margin:.3g} K short of the required {required:.3g} K"
        else:
            against = f"{-margin:.3g} K above the limit"
        lines.append(
            f"  limit node {node_t:.1f} degC against the {limit:.1f} degC limit: "
            f"margin {margin:.3g} K, {against}"
        )
    if None not in (allowed, power):
        alike = ", every source scaled alike" if payload.get("governing_source") else ""
        lines.append(f"  allowable power {allowed:.3g} W against the stated {power:.3g} W{alike}")
    calibration = (payload.get("review") or {}).get("calibration") or {}
    other = calibration.get("governing_other")
    if other:
        o = other["results"]
        which = "calibrated" if other.get("is_calibrated") else "uncalibrated"
        lines.append(
            f"  {which} (multiplier {_value(calibration, 'multiplier'):.3g} on "
            f"{calibration['target'].replace('_', ' ')}): limit node "
            f"{_value(o, 'limit_node_temperature'):.1f} degC, margin "
            f"{_value(o, 'temperature_margin'):.3g} K, allowable power "
            f"{_value(o, 'allowable_power'):.3g} W"
        )
    least = gov.get("least_allowable_power_condition")
    if least and least != gov["condition"]:
        lines.append(
            f"  least allowable power: {_value(gov, 'least_allowable_power'):.3g} W in '{least}'"
        )
    return lines


def _condition_lines(payload: dict) -> list[str]:
    conditions = payload.get("conditions") or []
    if len(conditions) < 2:
        return []
    width = max(len(c["name"]) for c in conditions) + 2
    lines = [
        f"conditions ({len(conditions)}):",
        f"  {'name':<{width}}  status  node [degC]  margin [K]  allowable [W]",
    ]
    for c in conditions:
        r = c.get("results") or {}
        mark = " *" if c.get("is_governing") else ""
        lines.append(
            f"  {c['name'] + mark:<{width}}  {c['status']:<6}  "
            f"{_number(_value(r, 'limit_node_temperature')):>11}  "
            f"{_number(_value(r, 'temperature_margin')):>10}  "
            f"{_number(_value(r, 'allowable_power')):>13}"
        )
    lines.append("  (* governing)")
    return lines


def _source_lines(payload: dict) -> list[str]:
    """Each source of a several-source case at the governing condition, governing first."""
    sources = payload.get("sources") or []
    if not sources:
        return []
    width = max(len(x["name"]) for x in sources) + 2
    lines = [
        f"sources at the governing condition ({len(sources)}, governing first):",
        f"  {'name':<{width}}  status  power [W]  node       node [degC]  limit [degC]  "
        "margin [K]  alone [W]",
    ]
    for x in sources:
        lines.append(
            f"  {x['name']:<{width}}  {x['status']:<6}  {_number(_value(x, 'power')):>9}  "
            f"{x['limit_node']:<9}  {_number(_value(x, 'node_temperature')):>11}  "
            f"{_number(_value(x, 'limit_temperature')):>12}  "
            f"{_number(_value(x, 'margin')):>10}  "
            f"{_number(_value(x, 'allowable_power_alone')):>9}"
        )
    lines.append(
        "  (alone: power that source could reach with the others held, at its limit less its "
        "required margin)"
    )
    return lines


def _natural_method_line(case) -> str | None:
    """``natural convection (ORIENTATION): correlation, source, range`` of a still-air case."""
    natural = getattr(getattr(getattr(case, "air", None), "flow", None), "natural", None)
    if natural is None:
        return None
    from finkit.physics.correlations.natural import ORIENTATION_METHODS

    return f"natural convection ({natural.orientation}): {ORIENTATION_METHODS[natural.orientation]}"


def _flow_lines(result) -> list[str]:
    """How the air reaches a forced-flow sink with bypass, and what share goes round it."""
    from finkit.physics.sink.inputs import Bypass, FreeStream

    inputs, sol = getattr(result, "inputs", None), getattr(result, "solution", None)
    bypass = getattr(inputs, "bypass", None)
    if sol is None or not isinstance(bypass, Bypass | FreeStream):
        return []
    share = float(sol.bypass_volume_flow / sol.volume_flow) if float(sol.volume_flow) else 0.0
    channel, approach = float(sol.channel_velocity), float(sol.approach_velocity)
    if isinstance(bypass, FreeStream):
        return [
            "air (nominal condition): free stream, no duct (Lee 1995 bypass balance, unbounded "
            f"bypass region): {share:.0%} of the approach flow goes round the sink; channel "
            f"velocity {channel:.3g} m/s in a {approach:.3g} m/s stream"
        ]
    return [
        f"air (nominal condition): duct with clearance: {share:.0%} of the flow goes round the "
        f"fins; channel velocity {channel:.3g} m/s"
    ]


def _check(args) -> int:
    from finkit.case.schema import load_case

    case = load_case(Path(args.case))
    from finkit.model.run import run_case

    result = run_case(case)
    payload = result.to_json_dict()
    status = str(getattr(result, "status", payload.get("status")))
    if args.json:
        print(_dumps(payload))
        return EXIT_FAIL if status == "fail" else EXIT_PASS
    print(f"case {case.case_id}: status {status.upper()}")
    for line in _governing_lines(payload) + _source_lines(payload) + _condition_lines(payload):
        print(line)
    method = _natural_method_line(case)
    if method:
        print(method)
    for line in _flow_lines(result):
        print(line)
    if getattr(result, "transient", None) is not None:
        print(result.transient.check_line())
    if payload.get("governing"):
        print(f"results at the governing condition '{payload['governing']['condition']}':")
    _print_table(None, status, _rows(payload), list(result.warnings))
    return EXIT_FAIL if status == "fail" else EXIT_PASS


def _note(args) -> int:
    from finkit.notes.render import render_note

    case_path = Path(args.case)
    template, results = _note_template(args.template)
    output = render_note(
        case_path, args.out, show_code=args.show_code, template=template, results=results
    )
    html = getattr(output, "html", output)
    print(f"note written: {html}")
    for label in ("notebook", "results_json"):
        path = getattr(output, label, None)
        if path is not None:
            print(f"  {label.replace('_', '.')}: {path}")
    status = _status_of(getattr(output, "results_json", None))
    if status is not None:
        print(f"status: {status}")
    return EXIT_FAIL if status == "fail" else EXIT_PASS


#: Named note templates of ``finkit note --template NAME`` (a path to a notebook also works).
NOTE_TEMPLATES = ("trade-study",)


def _note_template(name: str | None):
    """(template path or None, results callable or None) for ``finkit note --template``."""
    if name is None:
        return None, None
    if name == "trade-study":
        from finkit.report import trade as report_trade

        return report_trade.template_path(), report_trade.results_json
    path = Path(name)
    if path.suffix != ".ipynb":
        raise FinkitError(
            f"--template: got '{name}'; allowed: {', '.join(NOTE_TEMPLATES)} or a .ipynb file"
        )
    return path, None


def _lab(args) -> int:
    import importlib.util
    import shutil
    import subprocess

    if not args.copy_only and importlib.util.find_spec("jupyterlab") is None:
        raise FinkitError(
            "finkit lab: JupyterLab is not installed in this environment; install it with "
            f"'{sys.executable} -m pip install jupyterlab' (or use --copy-only)"
        )
    source = Path(__file__).resolve().parent / "templates"
    target = Path(args.dir)
    notebooks = sorted(source.glob("*.ipynb"))
    if not notebooks:
        raise FinkitError(f"finkit lab: no templates found in '{source}'")
    try:
        target.mkdir(parents=True, exist_ok=True)
        for notebook in notebooks:
            copy = target / notebook.name
            if copy.exists() and not args.force:
                print(f"kept your copy {copy} (use --force to replace it)")
                continue
            shutil.copyfile(notebook, copy)
            print(f"copied {notebook.name} -> {copy}")
    except OSError as exc:
        raise FinkitError(f"--dir: cannot write '{target}' ({exc.strerror})") from None
    if args.copy_only:
        return EXIT_PASS
    command = [sys.executable, "-m", "jupyterlab", f"--ServerApp.root_dir={target.resolve()}"]
    if args.no_browser:
        command.append("--no-browser")
    if hasattr(os, "geteuid") and os.geteuid() == 0:
        # Containers and CI machines often run as root, which JupyterLab refuses by default.
        command.append("--allow-root")
    extra = list(args.jupyter_args or [])
    command += extra[1:] if extra[:1] == ["--"] else extra
    sys.stdout.flush()
    if os.name == "posix":
        # JupyterLab takes this process's place, so a signal to `finkit lab` (Ctrl-C, kill)
        # reaches the server itself rather than leaving it running without its parent.
        os.execv(command[0], command)
    return subprocess.call(command)


def _compare(args) -> int:
    from finkit.report.compare import compare

    comparison = compare(args.old, args.new)
    if args.json:
        print(_dumps(comparison.to_json_dict()))
    else:
        print(comparison.text())
    if args.html:
        from finkit.notes.files import atomic_write

        written = atomic_write(Path(args.html), comparison.html())
        print(f"comparison page: {written}", file=sys.stderr if args.json else sys.stdout)
    return EXIT_PASS


def _schema(args) -> int:
    from finkit.model.json_schema import case_schema, results_schema

    schema = case_schema() if args.which == "case" else results_schema()
    print(json.dumps(schema, indent=2, ensure_ascii=False))
    return EXIT_PASS


def _status_of(results_json) -> str | None:
    """The case status recorded in a note's results.json (``None`` if it cannot be read)."""
    if results_json is None:
        return None
    try:
        data = json.loads(Path(results_json).read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return None
    inner = data.get("results") if isinstance(data.get("results"), dict) else {}
    status = inner.get("status", data.get("status"))
    return status if isinstance(status, str) else None


def _batch(args) -> int:
    from finkit.batch import run_batch

    result = run_batch(
        Path(args.base),
        Path(args.variants),
        args.out,
        template=args.template,
        jobs=args.jobs,
        timeout=args.timeout,
        force=args.force,
        scheduler=args.scheduler,
        show_code=args.show_code,
        progress=not args.no_progress and sys.stderr.isatty(),
        compare_to=args.compare_to,
    )
    counts = result.counts()
    print(
        f"{len(result.outcomes)} variants: {counts['pass']} pass, {counts['fail']} fail, "
        f"{counts['error']} not computed ({counts['computed']} computed, {counts['reused']} "
        f"reused unchanged) in {result.seconds:.1f} s"
    )
    for outcome in result.outcomes:
        if outcome.status == "error":
            print(f"  {outcome.error}", file=sys.stderr)
    print(f"overview: {result.index}")
    print(f"  summary: {result.summary_csv}, {result.summary_json}")
    return result.exit_code


def _positive_int(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        value = 0
    if value < 1:
        raise argparse.ArgumentTypeError(f"{text!r} is not a whole number of at least 1")
    return value


def _positive_float(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        value = 0.0
    if not value > 0 or value == float("inf"):
        raise argparse.ArgumentTypeError(f"{text!r} is not a positive number of seconds")
    return value


def build_parser() -> argparse.ArgumentParser:
    """The argument parser of the ``finkit`` command."""
    # Long by design: the argparse declaration of every command and option, one after the other.
    from finkit import __version__

    parser = argparse.ArgumentParser(
        prog="finkit",
        description="Finned surfaces and heat sinks for air cooling: check a case file, "
        "write a calculation note.",
        epilog="Exit codes: 0 pass, 1 the case fails its limit (batch: some variant), 2 input "
        "error (batch: some variant could not be computed), 3 internal error or environment "
        "problem (disk, permissions; the details are logged).",
    )
    parser.add_argument("--version", action="version", version=f"finkit {__version__}")
    parser.add_argument(
        "--debug", action="store_true", help="show the traceback of an unexpected error"
    )
    sub = parser.add_subparsers(dest="command", required=True, metavar="COMMAND")

    new = sub.add_parser("new", help="write a commented starter case file")
    new.add_argument("kind", choices=STARTERS, help="which starter")
    new.add_argument("--out", metavar="FILE", help="file to write (default: KIND.yaml)")
    new.add_argument("--force", action="store_true", help="overwrite an existing file")
    new.set_defaults(func=_new)

    check = sub.add_parser("check", help="validate and solve a case; print the results")
    check.add_argument("case", metavar="CASE.yaml")
    check.add_argument("--json", action="store_true", help="print results.json content instead")
    check.set_defaults(func=_check)

    note = sub.add_parser("note", help="write the dated calculation note of a case")
    note.add_argument("case", metavar="CASE.yaml")
    note.add_argument("--out", metavar="DIR", required=True, help="output folder")
    note.add_argument("--show-code", action="store_true", help="keep code cells in the note")
    note.add_argument(
        "--template",
        metavar="NAME|NOTEBOOK",
        help="trade-study (needs a trade_study block), or a notebook template "
        "(default: the template of the case's kind)",
    )
    note.set_defaults(func=_note)

    comp = sub.add_parser(
        "compare",
        help="what changed between two revisions of a case, and what it did to the verdict",
        description="Compare two revisions (each a case file, a note folder or a results.json): "
        "inputs changed (as entered and in SI), results at the governing condition, conditions "
        "that changed status, warnings, software; and each input's share of the change of the "
        "governing margin.",
    )
    comp.add_argument("old", help="the earlier revision")
    comp.add_argument("new", help="the later revision")
    comp.add_argument("--json", action="store_true", help="print JSON instead of text")
    comp.add_argument("--html", metavar="FILE", help="also write an HTML page")
    comp.set_defaults(func=_compare)

    schema = sub.add_parser(
        "schema",
        help="print the JSON Schema of a case file or of results.json",
        description="Print the JSON Schema (draft 2020-12) of a case file ('case') or of a "
        "note's results.json ('results'), for editors and other tools.",
    )
    schema.add_argument("which", choices=("case", "results"))
    schema.set_defaults(func=_schema)

    lab = sub.add_parser(
        "lab",
        help="open JupyterLab on a working copy of the templates (explorer, notes)",
        description="Copy the notebook templates into a working folder (your copies are never "
        "replaced without --force), then start JupyterLab there.",
    )
    lab.add_argument("--dir", default="lab", metavar="DIR", help="working folder (default: lab)")
    lab.add_argument("--force", action="store_true", help="replace your copies of the templates")
    lab.add_argument("--no-browser", action="store_true", help="do not open a browser")
    lab.add_argument(
        "--copy-only", action="store_true", help="copy the templates, do not start JupyterLab"
    )
    lab.add_argument(
        "jupyter_args",
        nargs=argparse.REMAINDER,
        metavar="-- JUPYTER_ARGS",
        help="passed on to JupyterLab, e.g. finkit lab -- --port 8890 --ip 0.0.0.0",
    )
    lab.set_defaults(func=_lab)

    batch = sub.add_parser(
        "batch",
        help="write the notes of a base case's variants and an overview",
        description="Render a note for every row of a variant table (overrides of the base case "
        "by dotted path) and DIR/index.html, DIR/summary.csv, DIR/summary.json. "
        "Exit status: 0 every variant computed and passing, 1 some variant fails its limit, "
        "2 some variant could not be computed (or the input is wrong).",
    )
    batch.add_argument("base", metavar="BASE.yaml", help="the base case")
    batch.add_argument(
        "variants", metavar="VARIANTS.csv", help="variant table (.csv, or .yaml holding a list)"
    )
    batch.add_argument("--out", metavar="DIR", required=True, help="output folder")
    batch.add_argument(
        "--jobs", type=_positive_int, metavar="N", help="notes at a time (default: CPU cores)"
    )
    batch.add_argument(
        "--timeout",
        type=_positive_float,
        default=600.0,
        metavar="SECONDS",
        help="time limit of one variant (default: 600)",
    )
    batch.add_argument(
        "--force", action="store_true", help="recompute variants whose inputs are unchanged"
    )
    batch.add_argument(
        "--scheduler", metavar="ADDRESS", help="run on this Dask distributed scheduler"
    )
    batch.add_argument("--template", metavar="NOTEBOOK", help="notebook template to use")
    batch.add_argument("--show-code", action="store_true", help="keep code cells in the notes")
    batch.add_argument("--no-progress", action="store_true", help="no progress bar")
    batch.add_argument(
        "--compare-to",
        metavar="DIR",
        help="an earlier batch folder: mark each variant whose status or governing margin "
        "changed since, with the change in kelvin",
    )
    batch.set_defaults(func=_batch)
    return parser


#: Commands that never read or write a notebook (no jsonschema to keep from its IRI grammar).
_WITHOUT_NOTEBOOKS = ("check", "new")


def main(argv: list[str] | None = None) -> int:
    """Run the ``finkit`` command; returns the exit code.

    0 pass (or the command did its job), 1 the case fails its limit, 2 the input is wrong,
    3 an internal error or a problem of the environment (disk, permissions): one line naming
    it and the log file with the details, never a traceback (``--debug`` shows it).

    Parameters
    ----------
    argv : list of str, optional
        Command-line arguments; default ``sys.argv[1:]``. [-]
    """
    words = sys.argv[1:] if argv is None else list(argv)
    if not words or words[0] not in _WITHOUT_NOTEBOOKS:
        # finkit.notes costs about 0.02 s to import: not for a command that renders no note
        from finkit.notes.files import skip_unused_slow_imports

        skip_unused_slow_imports()
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # --help, --version, or a usage error (argparse exits 2)
        return int(exc.code or 0)
    if args.func is not _batch:
        # pint imports dask (0.08-0.1 s) whenever it is installed, only to support dask arrays
        # of quantities; no finkit command but a batch on a dask scheduler uses dask. As for
        # rfc3987_syntax above, the package is then treated as absent in this process.
        sys.modules.setdefault("dask", None)
    debug = bool(getattr(args, "debug", False))
    try:
        with warnings.catch_warnings():
            # numpy's RuntimeWarnings are the model's business, not the user's screen.
            warnings.simplefilter("ignore", RuntimeWarning)
            return args.func(args)
    except FinkitError as exc:
        lines = getattr(exc, "errors", None) or str(exc).splitlines() or [type(exc).__name__]
        for line in lines:
            print(_shortened(line), file=sys.stderr)
        return EXIT_INPUT
    except KeyboardInterrupt:
        print("interrupted", file=sys.stderr)
        return 130
    except BrokenPipeError:  # output piped into head or the like
        return EXIT_PASS
    except Exception as exc:  # noqa: BLE001 - the top-level guard: one line, never a traceback
        if debug:
            raise
        log = _log_traceback(exc)
        where = f"; details in {log}" if log else ""
        kind = "environment problem" if isinstance(exc, OSError) else "internal error"
        print(
            f"finkit {getattr(args, 'command', '')}: {kind}: {type(exc).__name__}: "
            f"{_shortened(str(exc))}{where} (run with --debug to see the traceback)",
            file=sys.stderr,
        )
        return EXIT_INTERNAL


def _shortened(text: str, limit: int = 400) -> str:
    return text if len(text) <= limit else text[: limit - 1] + "…"


def _log_traceback(exc: BaseException) -> str | None:
    """Write the traceback of an unexpected error to a log file; its path, or None."""
    import tempfile
    import traceback

    try:
        handle, name = tempfile.mkstemp(prefix="finkit-error-", suffix=".log")
        with os.fdopen(handle, "w", encoding="utf-8") as log:
            log.write("".join(traceback.format_exception(exc)))
        return name
    except OSError:
        return None


if __name__ == "__main__":
    sys.exit(main())
