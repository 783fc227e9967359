"""The Pareto front of a trade study's objectives."""

from __future__ import annotations

import numpy as np

from finkit.errors import InputError

__all__ = [
    "pareto_front",
]


# --------------------------------------------------------------------------------------
# Pareto front
# --------------------------------------------------------------------------------------


def _front_2d(points: np.ndarray) -> np.ndarray:
    """Non-dominated mask of unique 2-D points (sort + sweep)."""
    order = np.lexsort((points[:, 1], points[:, 0]))
    second = points[order, 1]
    best_before = np.concatenate(([np.inf], np.minimum.accumulate(second)[:-1]))
    keep = np.zeros(len(points), dtype=bool)
    keep[order] = second < best_before
    return keep


def _front_nd(points: np.ndarray) -> np.ndarray:
    """Non-dominated mask of unique points, any dimension (filter, O(n * front size))."""
    order = np.lexsort(points.T[::-1])
    p = points[order]
    index = np.arange(len(p))
    i = 0
    while i < len(p):
        # Points not dominated by p[i] (p[i] itself stays: unique points differ somewhere).
        keep = np.any(p < p[i], axis=1)
        keep[i] = True
        p, index = p[keep], index[keep]
        i = int(np.sum(keep[:i])) + 1
    mask = np.zeros(len(points), dtype=bool)
    mask[order[index]] = True
    return mask


def pareto_front(objectives) -> np.ndarray:
    """Mask of the non-dominated rows when every column is minimised.

    Parameters
    ----------
    objectives : array_like, shape (n, k)
        One row per design, one column per objective (smaller is better) [any units]. Rows
        with a NaN are left out (never on the front).

    Returns
    -------
    numpy.ndarray of bool, shape (n,)
        True for rows that no other row dominates. Row a dominates row b when a is no worse in
        every column and better in at least one; identical rows do not dominate each other, so
        duplicates of a front point are all on the front.

    Notes
    -----
    Duplicate rows are merged first (:func:`numpy.unique`). Two objectives: sort by the first
    (then the second) and keep each point whose second value is below every earlier one,
    O(n log n). More objectives: after a lexicographic sort the first remaining point is
    non-dominated; remove everything it dominates and repeat, O(n · front size).

    Examples
    --------
    >>> pareto_front([[1, 5], [2, 3], [3, 4], [4, 1]]).tolist()
    [True, True, False, True]
    """
    values = np.asarray(objectives, dtype=float)
    if values.ndim != 2:
        raise InputError(
            f"objectives: expected a 2-D array (designs x objectives), got {values.ndim}-D"
        )
    n = values.shape[0]
    mask = np.zeros(n, dtype=bool)
    valid = np.all(np.isfinite(values), axis=1)
    if not np.any(valid) or values.shape[1] == 0:
        return mask
    unique, inverse = np.unique(values[valid], axis=0, return_inverse=True)
    if unique.shape[1] == 1:
        front = unique[:, 0] == unique[:, 0].min()
    elif unique.shape[1] == 2:
        front = _front_2d(unique)
    else:
        front = _front_nd(unique)
    mask[np.flatnonzero(valid)] = front[np.ravel(inverse)]
    return mask
