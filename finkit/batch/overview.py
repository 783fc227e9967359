"""The overview of a batch: summary.csv, summary.json and index.html."""

from __future__ import annotations

import base64
import csv
import hashlib
import html
import io
import json
import math
import re
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import Any
from urllib.parse import quote

from finkit import notes
from finkit.batch.records import (
    _VARIANT_ID,
    EXIT_ALL_PASS,
    EXIT_LIMIT_FAILED,
    EXIT_NOT_COMPUTED,
    INDEX_HTML,
    SUMMARY_CSV,
    SUMMARY_JSON,
    VariantOutcome,
    _counts,
    _exit_code,
)
from finkit.report import present

__all__ = [
    "overview_html",
]

# --------------------------------------------------------------------------------------------
# Overview: summary.csv, summary.json, index.html


def _all_result_names(outcomes: Sequence[VariantOutcome]) -> list[tuple[str, str]]:
    names: dict[str, str] = {}
    for o in outcomes:
        for name, entry in ((o.results or {}).get("results") or {}).items():
            unit = entry.get("unit", "") if isinstance(entry, Mapping) else ""
            names.setdefault(name, unit)
    return list(names.items())


def _override_columns(outcomes: Sequence[VariantOutcome]) -> list[str]:
    return list(dict.fromkeys(c for o in outcomes for c in o.overrides))


def _shown_value(value: Any) -> str:
    if value is None:
        return ""
    if isinstance(value, str):
        return value
    return json.dumps(value, ensure_ascii=False)


_NUMBER_UNIT = re.compile(r"\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([^\d\s].*)?")


def _number_and_unit(value: Any) -> tuple[float, str] | None:
    """``"40 W"`` -> (40.0, "W"), ``14`` -> (14.0, ""); None for text."""
    if isinstance(value, bool):
        return None
    if isinstance(value, int | float):
        return (float(value), "") if math.isfinite(value) else None
    if isinstance(value, str):
        match = _NUMBER_UNIT.fullmatch(value)
        if match:
            number = float(match.group(1))
            return (number, (match.group(2) or "").strip()) if math.isfinite(number) else None
    return None


def _numeric_overrides(outcomes: Sequence[VariantOutcome]) -> dict[str, str]:
    """Override columns that hold a number with one unit in every row: column -> unit."""
    out = {}
    for column in _override_columns(outcomes):
        parsed = [
            _number_and_unit(o.overrides.get(column)) for o in outcomes if column in o.overrides
        ]
        units = {p[1] for p in parsed if p is not None}
        if parsed and None not in parsed and len(units) == 1:
            out[column] = units.pop()
    return out


def _spreadsheet_text(value: str) -> str:
    """User text for a CSV cell, kept from opening as a live formula in a spreadsheet."""
    return "'" + value if value[:1] in ("=", "+", "-", "@", "\t", "\r") else value


def _governing(o: VariantOutcome) -> Mapping[str, Any]:
    governing = (o.results or {}).get("governing")
    return governing if isinstance(governing, Mapping) else {}


def _since(o: VariantOutcome, earlier: Path | None) -> str:
    """What changed for a variant since an earlier batch folder (empty if nothing did)."""
    if earlier is None or not o.variant or not _VARIANT_ID.fullmatch(o.variant):
        return ""
    path = earlier / o.variant / notes.RESULTS_JSON
    try:
        before = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return "new since the earlier batch"
    entry = (before.get("results") or {}).get("temperature_margin")
    old_margin = entry.get("value") if isinstance(entry, Mapping) else None
    margin = o.margin()[0]
    parts = []
    if before.get("status") != o.status:
        parts.append(f"status {before.get('status')} -> {o.status}")
    if isinstance(old_margin, int | float) and margin is not None:
        if abs(margin - old_margin) >= 0.005:
            parts.append(f"governing margin {margin - old_margin:+.3g} K")
    return "; ".join(parts)


def _transient_text(o: VariantOutcome) -> str:
    """The time to the limit of a variant's ``transient`` entry, as ``finkit check`` says it;
    empty without one."""
    t = (o.results or {}).get("transient")
    if not isinstance(t, dict):
        return ""
    event = t.get("event") or {}
    label = f"{event.get('condition')} at {(event.get('time') or {}).get('value', 0):.0f} s"
    time = (t.get("time_to_limit") or {}).get("value")
    reached = f"{time:.0f} s" if t.get("is_limit_reached") and time is not None else "not reached"
    text = f"time to limit after {label if event else 'the start'}: {reached}"
    required = (t.get("required_response_time") or {}).get("value")
    if required is not None:
        text += f" (required response {required:.0f} s): {t.get('status')}"
    return text


def _reason(o: VariantOutcome) -> str:
    """Why a variant has its status, in one line (the failing check, or the error); the time
    to the limit after the case's event beside it when it has one."""
    text = _steady_reason(o)
    transient = _transient_text(o)
    return f"{text}; {transient}" if text and transient else text or transient


def _steady_reason(o: VariantOutcome) -> str:
    if o.status == "error":
        return f"not computed: {o.error or o.error_kind or 'unknown error'}"
    margin, condition = o.margin()
    required = o.result_value("required_margin")
    gov = _governing(o)
    count = gov.get("condition_count")
    failing = gov.get("failing_conditions") or []
    if margin is None or required is None:
        return ""
    source = (o.results or {}).get("governing_source")
    if o.status == "pass":
        where = f"in all {count} conditions" if count else "at its condition"
        if source:
            return f"every source meets its required margin {where}"
        return f"meets the required {required:.3g} K margin {where}"
    # several sources: the governing one is named (its own limit and margin)
    at = f"{condition}, {source}" if source else condition
    if margin < 0:
        text = f"{at}: {-margin:.3g} K above the limit"
    else:
        text = f"{at}: {required - margin:.3g} K short of the required {required:.3g} K"
    if count and len(failing) > 1:
        text += f" (fails in {len(failing)} of {count} conditions)"
    return text


def _note_links(out: Path, o: VariantOutcome) -> dict[str, str | None]:
    folder = out / o.variant if o.variant and _VARIANT_ID.fullmatch(o.variant) else None
    links: dict[str, str | None] = {"note": None, "notebook": None, "failed_notebook": None}
    if folder is None:
        return links
    if o.state in ("computed", "reused"):
        links["note"] = f"{o.variant}/{notes.NOTE_HTML}"
        links["notebook"] = f"{o.variant}/{notes.NOTE_IPYNB}"
    elif (folder / notes.FAILED_IPYNB).is_file():
        links["failed_notebook"] = f"{o.variant}/{notes.FAILED_IPYNB}"
    return links


def _write_overview(
    out: Path, info: dict, outcomes: Sequence[VariantOutcome]
) -> tuple[Path, Path, Path]:
    # Long by design: writes the three overview files in turn (summary.csv, summary.json,
    # index.html).
    from finkit import __version__

    overrides = _override_columns(outcomes)
    results = _all_result_names(outcomes)
    info = {
        **info,
        "finkit_version": __version__,
        "exit_code": _exit_code(outcomes),
        "counts": _counts(outcomes),
    }

    earlier = Path(info["compare_to"]) if info.get("compare_to") else None
    records = []
    for o in outcomes:
        records.append(
            {
                "variant": o.variant,
                "row": o.row,
                "status": o.status,
                "state": o.state,
                "error_kind": o.error_kind,
                "error": o.error,
                "seconds": round(o.seconds, 3),
                "key": o.key,
                "overrides": o.overrides,
                "margin": o.margin()[0],
                "governing": o.margin()[1] if o.margin()[0] is not None else None,
                "allowable_power": o.result_value("allowable_power"),
                "reason": _reason(o),
                "since": _since(o, earlier),
                "results": (o.results or {}).get("results"),
                "warnings": (o.results or {}).get("warnings"),
                "inputs_sha256": (o.results or {}).get("inputs_sha256"),
                "note_time": (o.results or {}).get("note_time"),
                **_note_links(out, o),
            }
        )
    summary_json = notes.atomic_write(
        out / SUMMARY_JSON,
        json.dumps({"batch": info, "variants": records}, indent=2, ensure_ascii=False),
    )

    # The variant's own columns first (numbers, the unit in the header), then the verdict on
    # the governing condition, then every result of results.json.
    numeric = _numeric_overrides(outcomes)
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(
        ["variant"]
        + [f"{c} [{numeric[c]}]" if numeric.get(c) else c for c in overrides]
        + ["status", "governing condition", "governing margin [K]"]
        + ["governing allowable power [W]", "reason", "since earlier batch", "row", "state"]
        + ["error"]
        + [f"{name} [{unit}]" if unit else name for name, unit in results]
        + ["note"]
    )
    for o, record in zip(outcomes, records, strict=True):
        shown = []
        for c in overrides:
            value = o.overrides.get(c)
            if c in numeric and value is not None:
                number = _number_and_unit(value)[0]
                shown.append(str(value) if isinstance(value, int) else repr(number))
            else:
                shown.append(_spreadsheet_text(_shown_value(value)))
        writer.writerow(
            [_spreadsheet_text(o.variant)]
            + shown
            + [o.status, record["governing"] or ""]
            + ["" if record["margin"] is None else repr(record["margin"])]
            + ["" if record["allowable_power"] is None else repr(record["allowable_power"])]
            + [_spreadsheet_text(record["reason"]), record["since"], o.row, o.state]
            + [_spreadsheet_text(o.error or "")]
            + [
                "" if o.result_value(name) is None else repr(o.result_value(name))
                for name, _ in results
            ]
            + [record["note"] or record["failed_notebook"] or ""]
        )
    summary_csv = notes.atomic_write(out / SUMMARY_CSV, buffer.getvalue())
    index = notes.atomic_write(out / INDEX_HTML, overview_html(info, outcomes, out))
    return index, summary_csv, summary_json


_SORT_SCRIPT = """\
document.querySelectorAll("table.fk-sortable").forEach(function (table) {
  var heads = table.tHead.rows[0].cells;
  Array.prototype.forEach.call(heads, function (th, col) {
    if (!th.hasAttribute("data-sortable")) { return; }
    function sort() {
      var ascending = th.getAttribute("aria-sort") !== "ascending";
      Array.prototype.forEach.call(heads, function (h) { h.removeAttribute("aria-sort"); });
      th.setAttribute("aria-sort", ascending ? "ascending" : "descending");
      var body = table.tBodies[0];
      var rows = Array.prototype.slice.call(body.rows);
      rows.sort(function (a, b) {
        var x = a.cells[col].getAttribute("data-sort"), y = b.cells[col].getAttribute("data-sort");
        if (x === "" || y === "") { return x === y ? 0 : (x === "" ? 1 : -1); }
        var nx = Number(x), ny = Number(y);
        var c = (!isNaN(nx) && !isNaN(ny)) ? nx - ny : x.localeCompare(y);
        return ascending ? c : -c;
      });
      rows.forEach(function (row) { body.appendChild(row); });
    }
    th.addEventListener("click", sort);
    th.addEventListener("keydown", function (e) {
      if (e.key === "Enter" || e.key === " ") { e.preventDefault(); sort(); }
    });
  });
});
"""

_OVERVIEW_CSS = """\
body { font-family: system-ui, -apple-system, "Segoe UI", sans-serif; margin: 2em auto;
       max-width: 96em; color: #111; line-height: 1.4; padding: 0 1em; }
h1 { font-size: 1.6em; margin-bottom: 0.2em; } h2 { font-size: 1.2em; margin-top: 1.6em; }
table { border-collapse: collapse; margin: 0.6em 0; font-size: 0.92em; }
th, td { border: 1px solid #bbb; padding: 0.25em 0.55em; vertical-align: top; }
th { background: #eee; text-align: left; }
th[data-sortable] { cursor: pointer; }
th[aria-sort="ascending"]::after { content: " \\25B2"; }
th[aria-sort="descending"]::after { content: " \\25BC"; }
td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
td.id { white-space: nowrap; } td.text { min-width: 12em; max-width: 24em; }
td.variant { min-width: 9em; max-width: 15em; } td.variant .muted { font-size: 0.9em; }
div.scroll { overflow-x: auto; } th { vertical-align: bottom; }
.badge { display: inline-block; padding: 0 0.5em; border-radius: 0.3em; font-weight: bold; }
.pass { background: #d7f0d7; color: #124d12; } .fail { background: #f6d5d5; color: #7a1010; }
.error { background: #f7e7c4; color: #6b4500; } .muted { color: #666; }
.changed { color: #7a4b00; }
dl.info { display: grid; grid-template-columns: max-content auto; gap: 0.15em 1em; }
dl.info dt { font-weight: bold; } dl.info dd { margin: 0; }
ul.failures li { margin-bottom: 0.5em; } code { overflow-wrap: anywhere; }
@media print {
  @page { size: A4 landscape; margin: 10mm; }
  body { max-width: none; margin: 0; padding: 0; font-size: 8.5pt; }
  div.scroll { overflow: visible; }
  table { width: 100%; font-size: 1em; }
  thead { display: table-header-group; }
  tr, td, th { break-inside: avoid; page-break-inside: avoid; }
  h2 { break-after: avoid; }
  th::after { content: none !important; }
  td.text { max-width: none; }
  a { color: inherit; text-decoration: none; }
}
"""


def _label(column: str, unit: str) -> dict[str, str]:
    """``source.power`` -> ``{"text": "power [W]", "path": "source.power"}``: the field without
    its block, the full path on hover."""
    parts = column.split(".")
    text = " ".join(parts[1:] if len(parts) > 1 else parts).replace("_", " ")
    shown = f"{text} [{_UNIT_TEXT.get(unit, unit)}]" if unit else text
    return {"text": shown, "path": column}


def _plain(value: float) -> str:
    """A number as the variant table gives it (3000, 1.2), not rounded."""
    return format(value, "g") if abs(value) < 1e6 else format(value, ".6g")


_UNIT_TEXT = {"degC": "°C", "degF": "°F", "m^3/s": "m³/s", "m^2": "m²"}


def _sig3(value: float | None, unit: str = "") -> str:
    if value is None:
        return "—"
    text = f"{value:.3g}"
    return f"{text}\u00a0{_UNIT_TEXT.get(unit, unit)}" if unit else text


def _variant_rows(
    group: Sequence[VariantOutcome],
    varying: Sequence[str],
    texts: Sequence[str],
    out: Path,
    earlier: Path | None = None,
) -> list[dict[str, Any]]:
    """The rows of one variant table (plain values; the page template escapes them)."""
    status_order = {"fail": 0, "error": 1, "pass": 2}
    badge = {"pass": "PASS", "fail": "FAIL", "error": "NOT COMPUTED"}
    rows = []
    for o in group:
        numbers = []
        for c in varying:
            parsed = _number_and_unit(o.overrides.get(c))
            value = None if parsed is None else parsed[0]
            numbers.append(
                {
                    "sort": "" if value is None else repr(value),
                    "shown": "—" if value is None else _plain(value),
                }
            )
        margin, condition = o.margin()
        required = o.result_value("required_margin")
        allowed = o.result_value("allowable_power")
        stated = o.result_value("power")
        since = _since(o, earlier) if earlier is not None else None
        links = _note_links(out, o)
        rows.append(
            {
                "variant": o.variant,
                "texts": [
                    _shown_value(o.overrides.get(c))
                    for c in texts
                    if o.overrides.get(c) is not None
                ],
                "numbers": numbers,
                "status": o.status,
                "status_order": status_order[o.status],
                "badge": badge[o.status],
                "condition": condition if margin is not None else "",
                "margin": _sig3(margin),
                "margin_sort": "" if margin is None else repr(margin),
                "required": "" if required is None else f"{required:.3g}",
                "allowed": _sig3(allowed),
                "allowed_sort": "" if allowed is None else repr(allowed),
                "stated": "" if stated is None else f"{stated:.3g}",
                "reason": _reason(o),
                "since": since or "",
                "since_name": earlier.name if earlier is not None else "",
                "state": o.state,
                "note": quote(links["note"]) if links["note"] else "",
                "reused": o.state == "reused",
                "failed_notebook": (
                    quote(links["failed_notebook"]) if links["failed_notebook"] else ""
                ),
            }
        )
    return rows


def _esc(value: Any) -> str:
    return html.escape("" if value is None else str(value), quote=True)


def _number(value: float | None) -> str:
    return "—" if value is None else f"{value:.4g}"


def _margin_chart(outcomes: Sequence[VariantOutcome]) -> str:
    """An inline SVG bar chart of the temperature margin of each variant, limits marked."""
    rows = [(o, o.margin()[0], o.result_value("required_margin")) for o in outcomes]
    drawn = [(o, m, r) for o, m, r in rows if m is not None]
    if not drawn:
        return '<p class="muted">No variant has a temperature margin to show.</p>'
    values = [m for _, m, _ in drawn] + [r for _, _, r in drawn if r is not None] + [0.0]
    low, high = min(values), max(values)
    span = (high - low) or 1.0
    low, high = low - 0.05 * span, high + 0.08 * span
    label_w, plot_w, value_w, row_h, top = 190, 520, 80, 22, 28
    height = top + row_h * len(rows) + 42

    def x(v: float) -> float:
        return label_w + (v - low) / (high - low) * plot_w

    parts = [
        f'<svg xmlns="http://www.w3.org/2000/svg" role="img" width="{label_w + plot_w + value_w}"'
        f' height="{height}" viewBox="0 0 {label_w + plot_w + value_w} {height}"'
        ' font-family="sans-serif" font-size="12">',
        "<title>Temperature margin of each variant; the red marks are the required margins</title>",
        f'<line x1="{x(0):.1f}" y1="{top - 6}" x2="{x(0):.1f}" y2="{height - 36}" stroke="#333"/>',
    ]
    required = {r for _, _, r in drawn if r is not None}
    for i, (o, margin, need) in enumerate(rows):
        y = top + i * row_h
        parts.append(
            f'<text x="{label_w - 8}" y="{y + 15}" text-anchor="end">{_esc(o.variant)}</text>'
        )
        if margin is None:
            parts.append(f'<text x="{label_w + 4}" y="{y + 15}" fill="#8a5a00">not computed</text>')
            continue
        colour = "#3a8f3a" if o.status == "pass" else "#c0392b"
        x0, x1 = sorted((x(0), x(margin)))
        parts.append(
            f'<rect x="{x0:.1f}" y="{y + 4}" width="{max(x1 - x0, 1):.1f}" height="{row_h - 8}"'
            f' fill="{colour}"><title>{_esc(o.variant)}: {margin:.3g} K</title></rect>'
        )
        parts.append(f'<text x="{label_w + plot_w + 6}" y="{y + 15}">{margin:.3g} K</text>')
        if need is not None:
            parts.append(
                f'<line x1="{x(need):.1f}" y1="{y + 1}" x2="{x(need):.1f}" y2="{y + row_h - 1}"'
                ' stroke="#b00000" stroke-width="2.5"/>'
            )
    if len(required) == 1:
        need = required.pop()
        parts.append(
            f'<line x1="{x(need):.1f}" y1="{top - 6}" x2="{x(need):.1f}" y2="{height - 36}"'
            ' stroke="#b00000" stroke-dasharray="5,3"/>'
        )
        parts.append(
            f'<text x="{x(need):.1f}" y="{top - 10}" text-anchor="middle" fill="#b00000">'
            f"required margin {need:.3g} K</text>"
        )
    axis_y = height - 22
    for tick in _ticks(low, high):
        parts.append(
            f'<text x="{x(tick):.1f}" y="{axis_y}" text-anchor="middle" fill="#444">{tick:g}</text>'
        )
    parts.append(
        f'<text x="{label_w + plot_w / 2:.0f}" y="{height - 4}" text-anchor="middle">'
        "temperature margin below the limit, governing condition [K]</text>"
    )
    parts.append("</svg>")
    return "".join(parts)


def _ticks(low: float, high: float, count: int = 6) -> list[float]:
    raw = (high - low) / count
    magnitude = 10 ** math.floor(math.log10(raw)) if raw > 0 else 1.0
    step = next(m * magnitude for m in (1, 2, 2.5, 5, 10) if m * magnitude >= raw)
    first = math.ceil(low / step) * step
    return [round(first + i * step, 10) for i in range(int((high - first) / step) + 1)]


def overview_html(info: Mapping[str, Any], outcomes: Sequence[VariantOutcome], out: Path) -> str:
    """The batch overview page: header, sortable results table, margin chart, failures.

    Every text that comes from the base case, the variant table or an error is escaped. The
    page loads nothing; its one inline script (table sorting) is allowed by a content security
    policy that names its SHA-256, so no other script could run.

    Parameters
    ----------
    info : mapping
        Batch facts: ``date``, ``base_case``, ``variant_table``, ``template``,
        ``finkit_version``, ``counts``, ``exit_code``... [-]
    outcomes : sequence of VariantOutcome
        In table order. [-]
    out : pathlib.Path
        The batch folder (links are relative to it). [-]

    Returns
    -------
    str
        A complete HTML page. [-]
    """
    script_hash = base64.b64encode(hashlib.sha256(_SORT_SCRIPT.encode()).digest()).decode()
    csp = (
        "default-src 'none'; img-src data:; style-src 'unsafe-inline'; "
        f"script-src 'sha256-{script_hash}'; base-uri 'none'; form-action 'none'"
    )
    overrides = _override_columns(outcomes)
    counts = info.get("counts", {})
    exit_code = info.get("exit_code")
    verdict = {
        EXIT_ALL_PASS: "every variant computed and passing its limit",
        EXIT_LIMIT_FAILED: "every variant computed; some fail their limit",
        EXIT_NOT_COMPUTED: "some variants could not be computed",
    }.get(exit_code, "")

    facts = [
        ("Date", info.get("date")),
        ("Base case", info.get("base_case")),
        ("Variant table", info.get("variant_table")),
        ("Template", info.get("template")),
        ("finkit", info.get("finkit_version")),
        (
            "Variants",
            f"{len(outcomes)}: {counts.get('pass', 0)} pass, {counts.get('fail', 0)} fail, "
            f"{counts.get('error', 0)} not computed ({counts.get('computed', 0)} computed in "
            f"this run, {counts.get('reused', 0)} reused unchanged)",
        ),
        ("Exit status", f"{exit_code}: {verdict}"),
    ]
    earlier = Path(info["compare_to"]) if info.get("compare_to") else None
    numeric = _numeric_overrides(outcomes)
    varying = [
        c
        for c in numeric
        if len({_number_and_unit(o.overrides.get(c)) for o in outcomes if c in o.overrides}) > 1
    ]
    texts = [c for c in overrides if c not in numeric]
    headers = [{"text": "Variant", "path": ""}, *(_label(c, numeric[c]) for c in varying)]
    headers += [
        {"text": t, "path": ""}
        for t in ("Status", "Governing condition", "Margin [K]", "Allowable power [W]")
    ]
    headers += [{"text": "Reason", "path": ""}, {"text": "Note", "path": ""}]
    groups = [
        {
            "title": title,
            "rows": _variant_rows(
                [o for o in outcomes if o.status == status], varying, texts, out, earlier
            ),
        }
        for status, title in (("fail", "Fail"), ("error", "Not computed"), ("pass", "Pass"))
    ]
    from markupsafe import Markup

    return present.page_template("batch_overview.html.j2").render(
        csp=csp,
        css=Markup(_OVERVIEW_CSS),  # constants of this module, not user text
        script=Markup(_SORT_SCRIPT),  # the CSP names its hash: it must be verbatim
        base_case_id=info.get("base_case_id"),
        date=info.get("date"),
        facts=facts,
        headers=headers,
        groups=groups,
        margin_chart=Markup(_margin_chart(outcomes)),  # escapes its own texts
    )
