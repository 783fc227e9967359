"""finkit.probability against SciPy (a general-purpose reference library) and published values.

The module exists to keep ``scipy.special`` out of ``finkit check`` (issue 15); these checks
hold its three functions to SciPy's to round-off.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy import special

from finkit.probability import binomial_upper_bound, normal_cdf, normal_quantile


@pytest.mark.crosscheck
def test_normal_quantile_matches_scipy_ndtri_over_the_whole_range():
    rng = np.random.default_rng(7)
    p = np.concatenate(
        [rng.random(100_000), np.logspace(-300, -1, 300), 1.0 - np.logspace(-16, -1, 100)]
    )
    p = p[(p > 0) & (p < 1)]
    ours, ref = normal_quantile(p), special.ndtri(p)
    assert np.max(np.abs(ours - ref) / np.maximum(1.0, np.abs(ref))) < 1e-14
    assert normal_quantile(0.0) == -np.inf and normal_quantile(1.0) == np.inf
    assert np.shape(normal_quantile(0.3)) == ()


@pytest.mark.published
def test_normal_quantile_of_the_usual_two_sided_95_percent_point():
    # z(0.975) = 1.959963985 (Abramowitz & Stegun, Handbook of Mathematical Functions, 1964,
    # Table 26.5; from memory to these digits).
    assert normal_quantile(0.975) == pytest.approx(1.959963985, abs=1e-9)


@pytest.mark.crosscheck
def test_normal_cdf_matches_scipy_ndtr():
    x = np.linspace(-9.0, 9.0, 2001)
    assert np.max(np.abs(normal_cdf(x) - special.ndtr(x))) < 2e-16
    assert np.shape(normal_cdf(0.4)) == ()


@pytest.mark.crosscheck
@pytest.mark.parametrize(
    ("k", "n", "confidence"),
    [
        (0, 100, 0.95),
        (3, 10, 0.9),
        (5, 20_000, 0.95),
        (150, 20_000, 0.99),
        (10_000, 20_000, 0.95),
        (19_999, 20_000, 0.95),
        (0, 20_000, 0.5),
    ],
)
def test_clopper_pearson_bound_matches_scipy_betaincinv(k, n, confidence):
    ref = special.betaincinv(k + 1, n - k, confidence)
    assert binomial_upper_bound(k, n, confidence) == pytest.approx(ref, rel=1e-12, abs=1e-15)


@pytest.mark.published
def test_clopper_pearson_with_no_event_is_near_the_rule_of_three():
    # With no event in n trials the one-sided 95 % bound is 1 - 0.05^(1/n) (exact), about 3/n
    # (Hanley, J.A., Lippman-Hand, A., "If nothing goes wrong, is everything all right?",
    # JAMA 249(13), 1743-1745, 1983).
    n = 1000
    assert binomial_upper_bound(0, n, 0.95) == pytest.approx(1 - 0.05 ** (1 / n), rel=1e-12)
    assert binomial_upper_bound(n, n, 0.95) == 1.0
