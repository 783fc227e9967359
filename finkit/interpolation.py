"""Interpolants in NumPy: a not-a-knot cubic spline on a uniform grid and a monotone cubic.

The same curves as ``scipy.interpolate.CubicSpline`` and ``PchipInterpolator`` (the tests
compare them), kept here because importing ``scipy.interpolate`` costs about 0.3 s, paid by
every ``finkit check`` of a fan-cooled case (the fan curve) and of a case with a Monte Carlo
spread (the spreading resistance) when scipy's were used. Lowest layer: NumPy only.
"""

from __future__ import annotations

import numpy as np

__all__ = [
    "MonotoneCubic",
    "uniform_spline",
    "uniform_spline_coefficients",
    "uniform_spline_weights",
]


def uniform_spline_coefficients(x: np.ndarray, y: np.ndarray) -> np.ndarray:
    """Not-a-knot cubic spline through (x, y) on a uniform grid, in scipy's PPoly layout.

    Returns ``c`` of shape (4, n - 1, ...) with ``S(x) = sum_m c[m] dx**(3 - m)`` on each
    interval (the same spline as ``scipy.interpolate.CubicSpline``, tested). ``y`` may have
    trailing dimensions.

    Parameters
    ----------
    x : numpy.ndarray
        Uniform grid, increasing, at least 4 points [unit of x].
    y : numpy.ndarray
        Values at the nodes, first axis along ``x`` [unit of y].
    """
    n, h = x.size, float(x[1] - x[0])
    a = np.zeros((n, n))
    rhs = np.zeros((n,) + y.shape[1:])
    a[0, :3] = (1.0, -2.0, 1.0)  # not-a-knot: third derivative continuous at x[1]
    a[-1, -3:] = (1.0, -2.0, 1.0)  # ... and at x[-2]
    for i in range(1, n - 1):
        a[i, i - 1 : i + 2] = (1.0, 4.0, 1.0)
        rhs[i] = 6.0 * (y[i + 1] - 2.0 * y[i] + y[i - 1]) / h**2
    # second derivatives at the nodes (trailing dimensions as columns)
    m = np.linalg.solve(a, rhs.reshape(n, -1)).reshape(rhs.shape)
    return np.stack(
        [
            (m[1:] - m[:-1]) / (6.0 * h),
            m[:-1] / 2.0,
            (y[1:] - y[:-1]) / h - h * (2.0 * m[:-1] + m[1:]) / 6.0,
            y[:-1],
        ]
    )


def uniform_spline(x: np.ndarray, y: np.ndarray):
    """The not-a-knot cubic spline through ``(x, y)`` on a uniform grid, as a function.

    Parameters
    ----------
    x : numpy.ndarray
        Uniform grid, increasing, at least 4 points [unit of x].
    y : numpy.ndarray
        Values at the nodes, first axis along ``x``; trailing dimensions are interpolated
        alike [unit of y].

    Returns
    -------
    callable
        ``spline(q) -> array`` of shape ``q.shape + y.shape[1:]``; outside the grid the end
        polynomials are extended (as ``CubicSpline(x, y)`` does by default) [unit of y].
    """
    x = np.asarray(x, dtype=float)
    c = uniform_spline_coefficients(x, np.asarray(y, dtype=float))
    x0, h, last = float(x[0]), float(x[1] - x[0]), x.size - 2

    def spline(q):
        q = np.asarray(q, dtype=float)
        k = np.clip(np.floor((q - x0) / h).astype(int), 0, last)
        t = q - (x0 + k * h)
        t = t.reshape(t.shape + (1,) * (c.ndim - 2))  # y with trailing dimensions
        return ((c[0][k] * t + c[1][k]) * t + c[2][k]) * t + c[3][k]

    return spline


def uniform_spline_weights(x: np.ndarray, q) -> np.ndarray:
    """Weights ``w`` with ``w @ y == uniform_spline(x, y)(q)`` for any ``y`` (to round-off).

    The spline is linear in the values at the nodes, so its value at ``q`` is a weighted sum of
    them, the weights being the cardinal splines (the spline through each unit vector) at
    ``q``. Many queries against values with many trailing dimensions then cost one matrix
    product instead of gathering four coefficients per query and trailing element.

    Parameters
    ----------
    x : numpy.ndarray
        Uniform grid, increasing, at least 4 points [unit of x].
    q : array_like
        Query points; outside the grid the end polynomials are extended, as
        :func:`uniform_spline` does [unit of x].

    Returns
    -------
    numpy.ndarray
        Shape ``q.shape + (x.size,)`` [-].
    """
    x = np.asarray(x, dtype=float)
    c = uniform_spline_coefficients(x, np.eye(x.size))  # (4, n - 1, n): the cardinal splines
    x0, h, last = float(x[0]), float(x[1] - x[0]), x.size - 2
    q = np.asarray(q, dtype=float)
    k = np.clip(np.floor((q - x0) / h).astype(int), 0, last)
    t = (q - (x0 + k * h))[..., None]
    return ((c[0][k] * t + c[1][k]) * t + c[2][k]) * t + c[3][k]


class MonotoneCubic:
    """Piecewise cubic Hermite interpolant with Fritsch-Carlson slopes (PCHIP); NaN outside.

    The same curve as ``scipy.interpolate.PchipInterpolator(x, y, extrapolate=False)``
    (tested equal to rounding): interior slopes are the weighted harmonic mean of the two
    secant slopes, zero where they differ in sign or one is zero (Fritsch & Butland 1984);
    end slopes from the three-point formula, limited so the curve keeps the data's shape.
    Kept in NumPy because importing ``scipy.interpolate`` costs about 0.3 s of every
    ``finkit check`` of a fan-cooled case.

    References: Fritsch, F.N., Carlson, R.E., "Monotone piecewise cubic interpolation", SIAM
    J. Numer. Anal. 17(2), 238-246, 1980; Fritsch, F.N., Butland, J., "A method for
    constructing local monotone piecewise cubic interpolants", SIAM J. Sci. Stat. Comput.
    5(2), 300-304, 1984.
    """

    def __init__(self, x: np.ndarray, y: np.ndarray):
        self.x = np.asarray(x, dtype=float)
        self.y = np.asarray(y, dtype=float)
        h = np.diff(self.x)
        m = np.diff(self.y) / h
        d = self.d = self._node_slopes(h, m)
        # y(t) = y_k + d_k t + c2 t^2 + c3 t^3 on interval k, t = x - x_k
        self.c2 = (3.0 * m - 2.0 * d[:-1] - d[1:]) / h
        self.c3 = (d[:-1] + d[1:] - 2.0 * m) / h**2

    @staticmethod
    def _node_slopes(h: np.ndarray, m: np.ndarray) -> np.ndarray:
        if m.size == 1:
            return np.array([m[0], m[0]])
        d = np.zeros(m.size + 1)
        w1 = 2.0 * h[1:] + h[:-1]
        w2 = h[1:] + 2.0 * h[:-1]
        flat = (np.sign(m[1:]) != np.sign(m[:-1])) | (m[1:] == 0) | (m[:-1] == 0)
        with np.errstate(divide="ignore", invalid="ignore"):
            mean = (w1 / m[:-1] + w2 / m[1:]) / (w1 + w2)
            d[1:-1] = np.where(flat, 0.0, 1.0 / mean)

        def end(h0, h1, m0, m1):
            e = ((2.0 * h0 + h1) * m0 - h0 * m1) / (h0 + h1)
            if np.sign(e) != np.sign(m0):
                return 0.0
            if np.sign(m0) != np.sign(m1) and abs(e) > 3.0 * abs(m0):
                return 3.0 * m0
            return e

        d[0] = end(h[0], h[1], m[0], m[1])
        d[-1] = end(h[-1], h[-2], m[-1], m[-2])
        return d

    def _interval(self, q: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        k = np.clip(np.searchsorted(self.x, q, side="right") - 1, 0, self.x.size - 2)
        outside = ~((q >= self.x[0]) & (q <= self.x[-1]))  # NaN is outside too
        return k, q - self.x[k], outside

    def __call__(self, q) -> np.ndarray:
        q = np.asarray(q, dtype=float)
        k, t, outside = self._interval(q)
        value = self.y[k] + t * (self.d[k] + t * (self.c2[k] + t * self.c3[k]))
        return np.where(outside, np.nan, value)

    def slope(self, q) -> np.ndarray:
        """d y / d x at ``q``; NaN outside the table.

        Parameters
        ----------
        q : array_like
            Where to evaluate the slope [unit of x].
        """
        q = np.asarray(q, dtype=float)
        k, t, outside = self._interval(q)
        value = self.d[k] + t * (2.0 * self.c2[k] + 3.0 * t * self.c3[k])
        return np.where(outside, np.nan, value)
