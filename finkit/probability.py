"""The three probability functions finkit's tolerances and Monte Carlo need, in NumPy.

Importing ``scipy.special`` costs 0.15-0.3 s of every ``finkit check`` of a case with
tolerances (it pulls in NumPy's f2py through SciPy's array-API layer), for three functions:
the normal distribution function, its inverse, and the Clopper-Pearson upper bound on a
probability. They are written here from published algorithms and tested against SciPy
(tests/test_probability.py).
"""

from __future__ import annotations

import math

import numpy as np

__all__ = ["binomial_upper_bound", "normal_cdf", "normal_quantile"]

# Wichura, M.J., "Algorithm AS 241: The percentage points of the normal distribution", Applied
# Statistics 37(3), 477-484, 1988: PPND16, relative accuracy about 1e-16. Coefficients as in
# the paper (also in CPython's statistics module), highest power first.
_CENTRAL_NUM = (
    2.5090809287301226727e3,
    3.3430575583588128105e4,
    6.7265770927008700853e4,
    4.5921953931549871457e4,
    1.3731693765509461125e4,
    1.9715909503065514427e3,
    1.3314166789178437745e2,
    3.3871328727963666080e0,
)
_CENTRAL_DEN = (
    5.2264952788528545610e3,
    2.8729085735721942674e4,
    3.9307895800092710610e4,
    2.1213794301586595867e4,
    5.3941960214247511077e3,
    6.8718700749205790830e2,
    4.2313330701600911252e1,
    1.0,
)
_NEAR_NUM = (
    7.74545014278341407640e-4,
    2.27238449892691845833e-2,
    2.41780725177450611770e-1,
    1.27045825245236838258e0,
    3.64784832476320460504e0,
    5.76949722146069140550e0,
    4.63033784615654529590e0,
    1.42343711074968357734e0,
)
_NEAR_DEN = (
    1.05075007164441684324e-9,
    5.47593808499534494600e-4,
    1.51986665636164571966e-2,
    1.48103976427480074590e-1,
    6.89767334985100004550e-1,
    1.67638483018380384940e0,
    2.05319162663775882187e0,
    1.0,
)
_FAR_NUM = (
    2.01033439929228813265e-7,
    2.71155556874348757815e-5,
    1.24266094738807843860e-3,
    2.65321895265761230930e-2,
    2.96560571828504891230e-1,
    1.78482653991729133580e0,
    5.46378491116411436990e0,
    6.65790464350110377720e0,
)
_FAR_DEN = (
    2.04426310338993978564e-15,
    1.42151175831644588870e-7,
    1.84631831751005468180e-5,
    7.86869131145613259100e-4,
    1.48753612908506148525e-2,
    1.36929880922735805310e-1,
    5.99832206555887937690e-1,
    1.0,
)


def _ratio(num, den, r):
    return np.polyval(num, r) / np.polyval(den, r)


def normal_quantile(p):
    """Inverse of the standard normal distribution function (Wichura's AS 241) [-].

    Parameters
    ----------
    p : float or array_like
        Probabilities, in (0, 1) [-]; 0 and 1 give -inf and +inf.

    Examples
    --------
    >>> round(float(normal_quantile(0.975)), 12)
    1.95996398454
    """
    p = np.asarray(p, float)
    q = p - 0.5
    with np.errstate(divide="ignore", invalid="ignore"):
        central = q * _ratio(_CENTRAL_NUM, _CENTRAL_DEN, 0.180625 - q * q)
        tail = np.sqrt(-np.log(np.where(q <= 0.0, p, 1.0 - p)))
        far = np.where(
            tail <= 5.0,
            _ratio(_NEAR_NUM, _NEAR_DEN, tail - 1.6),
            _ratio(_FAR_NUM, _FAR_DEN, tail - 5.0),
        )
    out = np.where(np.abs(q) <= 0.425, central, np.where(q < 0.0, -far, far))
    out = np.where(p == 0.0, -np.inf, np.where(p == 1.0, np.inf, out))
    out = np.where((p >= 0.0) & (p <= 1.0), out, np.nan)
    return out if out.ndim else out[()]


def normal_cdf(x):
    """Standard normal distribution function, ``erfc(-x/√2)/2`` [-].

    Parameters
    ----------
    x : float or array_like
        Standard normal variate [-].

    Examples
    --------
    >>> round(float(normal_cdf(1.0)), 12)
    0.841344746069
    """
    out = 0.5 * np.vectorize(math.erfc, otypes=[float])(-np.asarray(x, float) / math.sqrt(2.0))
    return out if out.ndim else out[()]


def binomial_upper_bound(successes: int, trials: int, confidence: float) -> float:
    """One-sided Clopper-Pearson upper confidence bound on a probability [-].

    The ``p`` at which seeing at most ``successes`` in ``trials`` has probability
    ``1 - confidence``: the ``confidence`` quantile of Beta(successes + 1, trials - successes)
    (Clopper, C.J., Pearson, E.S., "The use of confidence or fiducial limits illustrated in the
    case of the binomial", Biometrika 26(4), 404-413, 1934). Found by bisection on the binomial
    distribution function summed in logarithms, to about 1e-13 in ``p``.

    Parameters
    ----------
    successes : int
        Observed count, ``0 <= successes <= trials`` [-].
    trials : int
        Number of trials, > 0 [-].
    confidence : float
        One-sided confidence level, in (0, 1) [-].

    Examples
    --------
    >>> round(binomial_upper_bound(0, 100, 0.95), 6)  # the "rule of three": about 3/n
    0.029513
    """
    k, n = int(successes), int(trials)
    if k >= n:
        return 1.0
    j = np.arange(k + 1)
    # log C(n, j) by the product C(n, j) = C(n, j-1) (n - j + 1)/j.
    log_choose = np.concatenate(([0.0], np.cumsum(np.log((n - j[1:] + 1.0) / j[1:]))))
    target = 1.0 - confidence

    def cdf(p):
        terms = log_choose + j * math.log(p) + (n - j) * math.log1p(-p)
        top = terms.max()
        return math.exp(top) * float(np.sum(np.exp(terms - top)))

    lo, hi = 0.0, 1.0
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if mid in (lo, hi):
            break
        if cdf(mid) > target:  # the distribution function falls as p rises
            lo = mid
        else:
            hi = mid
        if hi - lo <= 1e-14 * max(hi, 1e-300):
            break
    return 0.5 * (lo + hi)
