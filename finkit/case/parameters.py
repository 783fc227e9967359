"""Notebook parameters of the note templates -> one case mapping (the papermill boundary).

A note template can be given its case three ways, the way papermill users expect:

* ``papermill TEMPLATE OUT -p case mine.yaml`` -- ``case`` is a case file path;
* ``papermill TEMPLATE OUT -f mine.yaml`` -- papermill sets each top-level key of the case file
  (``case_id``, ``kind``, ``title_block``, ``source``, ...) as a parameter of its own;
* ``case`` left at the template's demo case (a mapping), e.g. edited in JupyterLab.

and a few flat overrides for a quick what-if (``-p power "80 W"``): :data:`OVERRIDES`. A name
papermill injects that is neither a case key nor an override is an error, not a silent demo
note (papermill itself only warns about unknown parameters).
"""

from __future__ import annotations

import builtins
import copy
import os
from collections.abc import Iterable, Mapping
from typing import Any

from finkit.errors import InputError

__all__ = [
    "CASE_KEYS",
    "OVERRIDES",
    "case_from_parameters",
]

#: Quick overrides a template accepts (``papermill -p NAME VALUE``) and the case field each sets.
OVERRIDES = {
    "power": ("source", "power"),
    "inlet_temperature": ("air", "inlet_temperature"),
    "altitude": ("air", "altitude"),
    "fin_count": ("sink", "fins", "count"),
}

#: Top-level keys of a case file of either kind (papermill ``-f case.yaml`` sets each one).
CASE_KEYS = (
    "case_id",
    "kind",
    "title_block",
    "materials",
    "source",
    "sources",
    "sink",
    "air",
    "limit",
    "sweeps",
    "scenarios",
    "touch",
    "measurements",
    "calibration",
    "tolerances",
    "monte_carlo",
    "trade_study",
    "transient",
    "fin",
    "conditions",
    "study",
)

#: Names a notebook namespace holds besides the parameters (IPython's own, the template's).
_NOTEBOOK_NAMES = {
    *dir(builtins),
    *("In", "Out", "get_ipython", "exit", "quit", "open", "display"),
    *("report", "demo_case", "result"),
}


def _set(data: dict, path: tuple[str, ...], value: Any, name: str) -> None:
    node = data
    for key in path[:-1]:
        child = node.get(key)
        if child is None:
            child = node[key] = {}
        if not isinstance(child, dict):
            raise InputError(
                f"parameters.{name}: cannot set {'.'.join(path)}; the case's {key} is not a mapping"
            )
        node = child
    node[path[-1]] = value


def case_from_parameters(
    case: Any = None, *, demo: Any = None, names: Iterable[str] = (), **given: Any
) -> dict[str, Any]:
    """The case mapping a template's parameters describe.

    Parameters
    ----------
    case : str, path-like, mapping or None
        A case file path or a case mapping; None: ``demo``. [-]
    demo : mapping, optional
        The template's demo case. [-]
    names : iterable of str, optional
        Every name defined in the notebook (``dir()`` in the template), to find parameters
        papermill injected that the template does not know. [-]
    **given
        The template's parameters: the case's top-level keys (:data:`CASE_KEYS`; None when not
        given), :data:`OVERRIDES` (None keeps the case's value) and ``note_time``. [-]

    Returns
    -------
    dict
        The case as entered (unit strings stay strings), overrides applied. [-]

    Raises
    ------
    InputError
        An unknown parameter, an unknown keyword, or an override that cannot be placed; one
        line naming it and what is allowed.
    """
    from finkit.case.schema import read_case

    allowed = {*CASE_KEYS, *OVERRIDES, "note_time"}
    unexpected = sorted(set(given) - allowed)
    if unexpected:
        raise InputError(f"parameters: unknown keyword(s) {', '.join(unexpected)}")
    known = allowed | {"case", "names", "demo", "solved"} | _NOTEBOOK_NAMES
    unknown = sorted(n for n in names if not n.startswith("_") and n not in known)
    if unknown:
        raise InputError(
            f"parameters: unknown parameter(s) {', '.join(unknown)}; allowed: case (a case file "
            "path or mapping), the case's own top-level keys ("
            + ", ".join(CASE_KEYS)
            + "), note_time, and the overrides "
            + ", ".join(OVERRIDES)
        )
    keys = {k: given[k] for k in CASE_KEYS if given.get(k) is not None}
    case = demo if case is None else case
    if keys:
        data = copy.deepcopy(keys)  # papermill -f case.yaml: the file's keys, one by one
    elif isinstance(case, str | os.PathLike):
        data = read_case(case)
    elif isinstance(case, Mapping):
        data = copy.deepcopy(dict(case))
    else:
        raise InputError(
            "parameters.case: give a case file path or a case mapping, or the case's top-level "
            f"keys (got {type(case).__name__})"
        )
    for name, path in OVERRIDES.items():
        if given.get(name) is not None:
            if name == "power" and data.get("sources"):
                raise InputError(
                    f"parameters.power: got {given[name]!r}; this case lists several sources, so "
                    "there is no single source.power to override: set each one's power under "
                    "sources in the case (or a batch column such as sources.<name>.power)"
                )
            _set(data, path, given[name], name)
    return data
