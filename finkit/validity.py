"""Validity ranges of published methods, and the warnings a case gets when it leaves one.

The physics functions stay silent: they compute for whatever they are given. Each module
that implements a correlation declares the range its source states as a :class:`ValidityRange`
constant; the code that assembles a result (``finkit.model``) calls :func:`check_range` with the
dimensionless groups it computed and collects the messages into the result's warnings.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


@dataclass(frozen=True)
class ValidityRange:
    """The range of one quantity over which a method was published or validated.

    Attributes
    ----------
    method : str
        Short name of the method as shown in a note,
        e.g. ``"Teertstra et al. (1999) plate channel"``.
    quantity : str
        Symbol of the checked quantity as printed, e.g. ``"Re_b*"``.
    low, high : float
        Inclusive limits; use ``-inf`` / ``inf`` for one-sided ranges.
    source : str
        Where the range is stated (author, year, or "common practice, no source").
    """

    method: str
    quantity: str
    low: float
    high: float
    source: str


def check_range(rng: ValidityRange, value) -> list[str]:
    """Return a one-line warning if any element of ``value`` lies outside ``rng`` (else ``[]``).

    Parameters
    ----------
    rng : ValidityRange
        The range to check against [-].
    value : float or array_like
        The quantity's value(s) for the case [unit of the quantity]. NaNs are ignored.

    Returns
    -------
    list of str
        Empty when every value is inside; otherwise one message naming the method, the quantity,
        the value (or the span of values) and the allowed range.
    """
    v = np.asarray(value, dtype=float)
    finite = v[np.isfinite(v)]
    if finite.size == 0:
        return []
    lo, hi = float(finite.min()), float(finite.max())
    if lo >= rng.low and hi <= rng.high:
        return []
    shown = f"{lo:.4g}" if lo == hi else f"{lo:.4g} to {hi:.4g}"
    return [
        f"{rng.method}: {rng.quantity} = {shown} is outside its range "
        f"{rng.low:.4g} to {rng.high:.4g} ({rng.source}); the result is an extrapolation"
    ]
