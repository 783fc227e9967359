"""NumPy interpolants and the one-parameter fit against the scipy routines they stand in for.

Cross-checks against a reference library (scipy, also a runtime dependency of finkit, used here
only as the reference): ``scipy.interpolate.PchipInterpolator`` (Fritsch & Carlson 1980 slopes
with Fritsch & Butland 1984 interior means), ``scipy.interpolate.CubicSpline`` (not-a-knot) and
``scipy.optimize.least_squares``. Random tables are generated here; no physics is checked.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.interpolate import CubicSpline, PchipInterpolator
from scipy.optimize import least_squares

from finkit.interpolation import MonotoneCubic, uniform_spline, uniform_spline_weights
from finkit.model.review.calibration import _one_parameter_fit


def _tables(seed: int):
    rng = np.random.default_rng(seed)
    for n in (2, 3, 4, 7, 12):
        for _ in range(40):
            x = np.concatenate([[0.0], np.cumsum(rng.uniform(0.01, 1.0, n - 1))])
            y = rng.normal(size=n) * rng.choice([1.0, 100.0])
            if rng.random() < 0.3:
                y = np.sort(y)[::-1]  # a fan curve: falling pressure
            if n > 2 and rng.random() < 0.3:
                y[2] = y[1]  # a flat step
            yield x, y


@pytest.mark.crosscheck
@pytest.mark.parametrize("seed", [1, 2])
def test_monotone_cubic_is_scipys_pchip(seed):
    for x, y in _tables(seed):
        q = np.concatenate([np.linspace(x[0] - 0.1, x[-1] + 0.1, 157), x, [np.nan]])
        ref = PchipInterpolator(x, y, extrapolate=False)
        ours = MonotoneCubic(x, y)
        for expected, got in ((ref(q), ours(q)), (ref.derivative()(q), ours.slope(q))):
            np.testing.assert_array_equal(np.isnan(got), np.isnan(expected))
            ok = ~np.isnan(expected)
            scale = np.max(np.abs(expected[ok])) + 1.0
            np.testing.assert_allclose(got[ok], expected[ok], rtol=0, atol=1e-12 * scale)


@pytest.mark.crosscheck
def test_uniform_spline_is_scipys_not_a_knot_cubic_spline():
    x = np.linspace(-2.0, 3.0, 48)
    y = np.sin(2.0 * x) + 0.1 * x**3
    q = np.linspace(-2.0, 3.0, 1001)
    np.testing.assert_allclose(uniform_spline(x, y)(q), CubicSpline(x, y)(q), rtol=0, atol=1e-12)


@pytest.mark.crosscheck
def test_uniform_spline_weights_give_scipys_not_a_knot_spline_of_any_values():
    # Cross-check: scipy.interpolate.CubicSpline (not-a-knot, extrapolating its end pieces),
    # for values with trailing dimensions, at queries inside the grid, on its nodes and beyond.
    rng = np.random.default_rng(3)
    x = np.linspace(np.log(5.0), np.log(400.0), 16)
    y = np.exp(-0.3 * x)[:, None, None] * rng.uniform(0.5, 2.0, (1, 3, 81))
    q = np.concatenate([rng.uniform(x[0], x[-1], 500), x, [x[0] - 0.05, x[-1] + 0.05]])
    w = uniform_spline_weights(x, q)
    assert w.shape == (q.size, x.size)
    expected = CubicSpline(x, y)(q)
    got = (w @ y.reshape(x.size, -1)).reshape(expected.shape)
    np.testing.assert_allclose(got, expected, rtol=0, atol=1e-12 * np.abs(y).max())
    # ... the same spline as uniform_spline evaluates piece by piece
    np.testing.assert_allclose(got, uniform_spline(x, y)(q), rtol=0, atol=1e-13 * np.abs(y).max())


@pytest.mark.identity
def test_uniform_spline_weights_are_a_partition_of_unity_and_cardinal_on_the_nodes():
    # Identity: a spline through constant values is that constant, so every row sums to 1; at
    # a node the spline takes the node's value, so the weights there are a unit vector.
    x = np.linspace(0.0, 3.0, 9)
    w = uniform_spline_weights(x, np.linspace(-0.2, 3.2, 41))
    np.testing.assert_allclose(w.sum(axis=1), 1.0, rtol=0, atol=1e-13)
    np.testing.assert_allclose(uniform_spline_weights(x, x), np.eye(x.size), rtol=0, atol=1e-13)


@pytest.mark.crosscheck
@pytest.mark.parametrize("true_rate", [0.3, 1.7, 6.0])
def test_one_parameter_fit_is_scipys_least_squares(true_rate):
    # y = exp(-k t) with noise: a non-linear fit in one bounded parameter, residuals non-zero
    rng = np.random.default_rng(7)
    t = np.linspace(0.0, 3.0, 12)
    y = np.exp(-true_rate * t) + rng.normal(scale=0.01, size=t.size)

    def residual(p):
        return np.exp(-p[0] * t) - y

    c, r, jac = _one_parameter_fit(residual, 1.0, (0.05, 20.0))
    ref = least_squares(residual, x0=[1.0], bounds=([0.05], [20.0]), jac="3-point", xtol=1e-12)
    assert c == pytest.approx(ref.x[0], rel=1e-7)  # scipy stops on its own xtol, not exactly
    # ... and the fit is at the minimum: the gradient of the sum of squares vanishes
    gradient = float(residual([c]) @ (-t * np.exp(-c * t)))
    assert abs(gradient) <= 1e-9
    np.testing.assert_allclose(r, residual([c]))
    np.testing.assert_allclose(jac.ravel(), np.asarray(ref.jac).ravel(), rtol=1e-5)


def test_one_parameter_fit_stops_at_a_bound():
    # the unconstrained optimum (c = 50) is beyond the upper bound: the fit sits on the bound
    c, _, _ = _one_parameter_fit(lambda p: np.array([p[0] - 50.0, p[0] - 50.0]), 1.0, (0.05, 20.0))
    assert c == 20.0
