"""Spreading resistance in a heat-sink base, and interface / contact resistances.

A heat source (device footprint) smaller than the base heats it locally; the extra resistance
between the source and a base that conducted one-dimensionally is the spreading resistance.
Both models here assume a centred isoflux source on one face of a plate whose other face is
cooled with a uniform coefficient (``h`` or ``1/(R_0 A_plate)``) and whose edges are adiabatic.

The chain from the source (mean temperature) to the air is::

    R = R_TIM + R_sp,avg + t/(k A_plate) + R_0

where ``R_0`` is the resistance from the cooled face to the air (e.g. the fin-array resistance);
``one_dimensional`` below is ``t/(k A_plate)`` and is not part of ``average``/``maximum``.
"""

from __future__ import annotations

from typing import NamedTuple

import numpy as np

from finkit.errors import GeometryError, InputError
from finkit.interpolation import uniform_spline

__all__ = [
    "SpreadingResistance",
    "contact_resistance",
    "interface_resistance",
    "spreading_resistance_rectangular_series",
    "spreading_resistance_song_lee_au",
]

_SQRT_PI = np.sqrt(np.pi)


class SpreadingResistance(NamedTuple):
    """Spreading resistance of a base plate.

    Attributes
    ----------
    average : numpy.ndarray
        Spreading resistance referred to the mean source temperature [K W⁻¹].
    maximum : numpy.ndarray
        Spreading resistance referred to the maximum (centre) source temperature [K W⁻¹].
    one_dimensional : numpy.ndarray
        One-dimensional conduction through the plate, ``t/(k A_plate)`` [K W⁻¹].
    psi_average : numpy.ndarray
        ``average * k * sqrt(A_source)`` [-].
    psi_maximum : numpy.ndarray
        ``maximum * k * sqrt(A_source)`` [-].
    """

    average: np.ndarray
    maximum: np.ndarray
    one_dimensional: np.ndarray
    psi_average: np.ndarray
    psi_maximum: np.ndarray


def _positive(name, value, unit):
    v = np.asarray(value, dtype=float)
    if np.any(~(v > 0.0)):
        raise InputError(f"{name} = {np.min(v):.4g} {unit} is not allowed; must be > 0")
    return v


def spreading_resistance_song_lee_au(
    source_area, plate_area, plate_thickness, thermal_conductivity, sink_resistance
):
    r"""Spreading resistance of a centred source on a cooled plate, closed form (Song, Lee & Au).

    Parameters
    ----------
    source_area : float or array_like
        Heat-source (footprint) area [m²].
    plate_area : float or array_like
        Base-plate area, ``≥ source_area`` [m²].
    plate_thickness : float or array_like
        Base-plate thickness [m].
    thermal_conductivity : float or array_like
        Base-plate thermal conductivity [W m⁻¹ K⁻¹].
    sink_resistance : float or array_like
        Resistance from the cooled face of the plate to the fluid, ``R_0`` (e.g. the fin-array
        resistance); it sets ``h_eff = 1/(R_0 A_plate)`` [K W⁻¹].

    Returns
    -------
    SpreadingResistance
        Average and maximum spreading resistance, the 1-D plate resistance, and ``psi``.

    Raises
    ------
    GeometryError
        Source larger than the plate.

    Notes
    -----
    Source and plate are replaced by discs of equal area (docs/methods.md i1):

    .. math::
        a = \sqrt{A_s/\pi},\ b = \sqrt{A_p/\pi},\ \epsilon = a/b,\ \tau = t/b,\
        Bi = \frac{h_{eff} b}{k},\ h_{eff} = \frac{1}{R_0 A_p},\
        \lambda_c = \pi + \frac{1}{\epsilon\sqrt{\pi}}

    .. math::
        \Phi_c = \frac{\tanh(\lambda_c\tau) + \lambda_c/Bi}{1 + (\lambda_c/Bi)\tanh(\lambda_c\tau)},
        \quad \psi_{avg} = \tfrac12 (1-\epsilon)^{3/2}\Phi_c,
        \quad \psi_{max} = \frac{(1-\epsilon)\Phi_c}{\sqrt\pi}

    ``R_sp = psi/(sqrt(pi) k a) = psi/(k sqrt(A_s))``. Limits: ``eps -> 1`` gives 0; a small source
    on a thick plate (``eps -> 0``, ``tau -> inf``) gives ``psi_max = 1/sqrt(pi)`` (exact for an
    isoflux disc on a half space) and ``psi_avg = 0.5`` (exact 0.4789). Against the exact series
    (:func:`spreading_resistance_rectangular_series`), square sources with eps = 0.1-0.5 on a
    100 mm aluminium plate 2-10 mm thick with R_0 = 0.1-1 K/W, the average is within -8 … +8 %
    (computed in the tests; thin plates with a low R_0 are overestimated, high R_0 underestimated).

    References
    ----------
    Song, S., Lee, S., Au, V., "Closed-form equation for thermal constriction/spreading
    resistances with variable resistance boundary condition", Proc. International Electronics
    Packaging Conference (IEPS), 1994, pp. 111-121.

    Lee, S., Song, S., Au, V., Moran, K.P., "Constriction/spreading resistance model for
    electronics packaging", Proc. 4th ASME/JSME Thermal Engineering Joint Conference, Vol. 4,
    1995, pp. 199-206.

    Examples
    --------
    >>> r = spreading_resistance_song_lee_au(0.02**2, 0.1**2, 0.005, 200.0, 0.5)
    >>> round(float(r.average), 3), round(float(r.one_dimensional), 4)
    (0.182, 0.0025)
    """
    As = _positive("source_area", source_area, "m²")
    Ap = _positive("plate_area", plate_area, "m²")
    t = _positive("plate_thickness", plate_thickness, "m")
    k = _positive("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    R0 = _positive("sink_resistance", sink_resistance, "K W⁻¹")
    if np.any(As > Ap * (1.0 + 1e-12)):
        raise GeometryError("source_area exceeds plate_area; must be ≤ plate_area")
    a = np.sqrt(As / np.pi)
    b = np.sqrt(Ap / np.pi)
    eps = np.minimum(a / b, 1.0)
    tau = t / b
    h_eff = 1.0 / (R0 * Ap)
    Bi = h_eff * b / k
    lam = np.pi + 1.0 / (eps * _SQRT_PI)
    th = np.tanh(lam * tau)
    ratio = lam / Bi
    Phi = (th + ratio) / (1.0 + ratio * th)
    psi_avg = 0.5 * (1.0 - eps) ** 1.5 * Phi
    psi_max = (1.0 - eps) * Phi / _SQRT_PI
    scale = 1.0 / (k * np.sqrt(As))
    return SpreadingResistance(
        average=psi_avg * scale,
        maximum=psi_max * scale,
        one_dimensional=t / (k * Ap),
        psi_average=psi_avg,
        psi_maximum=psi_max,
    )


def spreading_resistance_rectangular_series(
    source_length,
    source_width,
    plate_length,
    plate_width,
    plate_thickness,
    thermal_conductivity,
    heat_transfer_coefficient,
    terms=None,
):
    r"""Spreading resistance of a centred rectangular source on a cooled plate, exact series.

    Parameters
    ----------
    source_length : float or array_like
        Source edge along the plate length, ``2a`` [m].
    source_width : float or array_like
        Source edge along the plate width, ``2b`` [m].
    plate_length : float or array_like
        Plate length, ``2c ≥ 2a`` [m].
    plate_width : float or array_like
        Plate width, ``2d ≥ 2b`` [m].
    plate_thickness : float or array_like
        Plate thickness, t [m].
    thermal_conductivity : float or array_like
        Plate thermal conductivity, k [W m⁻¹ K⁻¹].
    heat_transfer_coefficient : float or array_like
        Uniform coefficient on the cooled face, h (use ``1/(R_0 A_plate)`` for a sink resistance
        ``R_0``) [W m⁻² K⁻¹].
    terms : int or None
        Number of terms per series index (M = N); the double sum has ``terms**2`` terms [-].
        None (default) chooses them per design from the plate-to-source ratio:
        ``M = 4 (2c)/(2a)`` and ``N = 4 (2d)/(2b)`` for the double sum (at least 24, at most
        :data:`SERIES_MAX_TERMS`) and 4 times more for the single sums, which truncates the
        mean within ±0.2 % and the centre within ±0.5 % of the converged series (measured
        against 2000 x 2000 terms for sources of 1-30 % of the plate edge, in the tests).

    Returns
    -------
    SpreadingResistance
        Average and maximum (centre) spreading resistance, ``t/(k A_plate)``, and ``psi``.

    Notes
    -----
    Separation of variables for an isoflux ``2a x 2b`` source centred on a ``2c x 2d`` plate,
    adiabatic edges, uniform ``h`` on the opposite face (docs/methods.md i2; half-widths a, b, c,
    d):

    .. math::
        R_{avg} = \frac{1}{2a^2cdk}\sum_m \frac{\sin^2(a\delta_m)\,\phi(\delta_m)}{\delta_m^3}
        + \frac{1}{2b^2cdk}\sum_n \frac{\sin^2(b\lambda_n)\,\phi(\lambda_n)}{\lambda_n^3}
        + \frac{1}{a^2b^2cdk}\sum_m\sum_n
          \frac{\sin^2(a\delta_m)\sin^2(b\lambda_n)\,\phi(\beta_{mn})}
               {\delta_m^2\lambda_n^2\beta_{mn}}

    .. math::
        R_{max} = \frac{1}{2acdk}\sum_m \frac{\sin(a\delta_m)\,\phi(\delta_m)}{\delta_m^2}
        + \frac{1}{2bcdk}\sum_n \frac{\sin(b\lambda_n)\,\phi(\lambda_n)}{\lambda_n^2}
        + \frac{1}{abcdk}\sum_m\sum_n
          \frac{\sin(a\delta_m)\sin(b\lambda_n)\,\phi(\beta_{mn})}{\delta_m\lambda_n\beta_{mn}}

    with ``delta_m = m pi/c``, ``lambda_n = n pi/d``, ``beta_mn = sqrt(delta_m^2 + lambda_n^2)`` and
    ``phi(z) = [z + (h/k) tanh(z t)] / [z tanh(z t) + h/k]``. ``R_max`` is the centre temperature
    (the hottest point of a centred source); it follows from the same eigenfunction expansion with
    ``cos(0) = 1`` in place of the source average, derived here. The uniform part of the solution
    is ``t/(4cdk) + 1/(4cdh)``; only ``t/(k A_plate)`` is returned (``one_dimensional``), the film
    part being the caller's ``R_0``.

    The average series converges like ``1/m^3`` (200 terms: 4 significant figures); the maximum
    like ``1/m^2``, so it needs more terms for the same accuracy. Checked here: extrapolated to a
    vanishing source on a thick plate, the series reproduces the half-space values of a square
    isoflux source, ``k sqrt(A) R = 0.4732`` (mean) and ``2 ln(1 + sqrt 2)/pi = 0.5611`` (centre),
    and doubling the terms changes the average by less than 0.1 %.

    References
    ----------
    Yovanovich, M.M., Muzychka, Y.S., Culham, J.R., "Spreading resistance of isoflux rectangles and
    strips on compound flux channels", Journal of Thermophysics and Heat Transfer 13, 495-500,
    1999.

    Muzychka, Y.S., Culham, J.R., Yovanovich, M.M., "Thermal spreading resistance of eccentric heat
    sources on rectangular flux channels", Journal of Electronic Packaging 125, 178-185, 2003.

    Examples
    --------
    >>> r = spreading_resistance_rectangular_series(0.02, 0.02, 0.1, 0.1, 0.005, 200.0, 200.0)
    >>> round(float(r.average), 3)
    0.191
    """
    a = 0.5 * _positive("source_length", source_length, "m")
    b = 0.5 * _positive("source_width", source_width, "m")
    c = 0.5 * _positive("plate_length", plate_length, "m")
    d = 0.5 * _positive("plate_width", plate_width, "m")
    t = _positive("plate_thickness", plate_thickness, "m")
    k = _positive("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    h = _positive("heat_transfer_coefficient", heat_transfer_coefficient, "W m⁻² K⁻¹")
    if np.any(a > c * (1.0 + 1e-12)) or np.any(b > d * (1.0 + 1e-12)):
        raise GeometryError("source does not fit on the plate: source edges must be ≤ plate edges")
    if terms is not None and int(terms) < 1:
        raise InputError(f"terms = {terms} is not allowed; must be ≥ 1")

    a, b, c, d, t, k, h = (np.array(v, float) for v in np.broadcast_arrays(a, b, c, d, t, k, h))
    shape = a.shape
    a, b, c, d, t, k, h = (v.ravel() for v in (a, b, c, d, t, k, h))
    if terms is None:
        m_count = np.clip(np.ceil(SERIES_TERMS_PER_RATIO * c / a), 24, SERIES_MAX_TERMS)
        n_count = np.clip(np.ceil(SERIES_TERMS_PER_RATIO * d / b), 24, SERIES_MAX_TERMS)
    else:
        m_count = np.full(a.shape, int(terms), float)
        n_count = m_count
    single = np.maximum(m_count, n_count) * (4 if terms is None else 1)
    avg, mx = np.empty(a.shape), np.empty(a.shape)
    direct = np.ones(a.shape, bool)
    if terms is None and a.size > _INTERPOLATION_NODES * 8:
        # Many designs on few geometries (a Monte Carlo on conductivity and sink resistance):
        # R = F(h/k)/k with F smooth in log(h/k), so F is summed at a few nodes per geometry
        # and interpolated (cubic spline in log(h/k); within 1e-6 of the direct sum, tested).
        geometry = np.stack([a, b, c, d, t], axis=1)
        unique, inverse = _unique_rows(geometry)
        for g in range(unique.shape[0]):
            members = np.flatnonzero(inverse == g)
            if members.size <= _INTERPOLATION_NODES * 8:
                continue
            hk = h[members] / k[members]
            lo, hi = np.log(np.min(hk)), np.log(np.max(hk))
            grid = np.linspace(lo, hi + 1e-9 * (1 + abs(hi)), _INTERPOLATION_NODES)
            nodes = np.exp(grid)
            one = np.ones_like(nodes)
            ga, gb, gc, gd, gt = (np.full_like(nodes, v) for v in unique[g])
            first = members[0]
            f_avg, f_max = _chunked_sums(
                ga, gb, gc, gd, gt, one, nodes,
                m_count[first] * one, n_count[first] * one, single[first] * one,
            )  # fmt: skip
            x = np.log(hk)
            avg[members] = uniform_spline(grid, f_avg)(x) / k[members]
            mx[members] = uniform_spline(grid, f_max)(x) / k[members]
            direct[members] = False
    sel = np.flatnonzero(direct)
    if sel.size:
        avg[sel], mx[sel] = _chunked_sums(
            a[sel], b[sel], c[sel], d[sel], t[sel], k[sel], h[sel],
            m_count[sel], n_count[sel], single[sel],
        )  # fmt: skip
    root_source = np.sqrt(4.0 * a * b)
    cdk = c * d * k
    return SpreadingResistance(
        average=avg.reshape(shape),
        maximum=mx.reshape(shape),
        one_dimensional=(t / (4.0 * cdk)).reshape(shape),
        psi_average=(avg * k * root_source).reshape(shape),
        psi_maximum=(mx * k * root_source).reshape(shape),
    )


def _unique_rows(rows: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """``np.unique(rows, axis=0, return_inverse=True)`` by a lexicographic sort of the columns:
    the same groups, about ten times faster for thousands of rows of floats (``np.unique``
    with ``axis`` sorts a structured view)."""
    order = np.lexsort(rows.T[::-1])
    ordered = rows[order]
    starts = np.ones(len(rows), bool)
    starts[1:] = np.any(ordered[1:] != ordered[:-1], axis=1)
    inverse = np.empty(len(rows), np.intp)
    inverse[order] = np.cumsum(starts) - 1
    return ordered[starts], inverse


SERIES_TERMS_PER_RATIO = 4.0
"""Double-sum terms per plate-to-source edge ratio when the series chooses its own length [-]."""

SERIES_MAX_TERMS = 1000
"""Most double-sum terms per index when the series chooses its own length [-] (reached only by
sources smaller than 1/250 of the plate edge)."""

_SERIES_CHUNK_ELEMENTS = 2_000_000
_INTERPOLATION_NODES = 48


def _chunked_sums(a, b, c, d, t, k, h, m_count, n_count, single):
    """:func:`_rectangular_series_sums` over designs in chunks of similar series length, so
    memory stays bounded for many designs."""
    avg, mx = np.empty(a.shape), np.empty(a.shape)
    order = np.argsort(m_count * n_count, kind="stable")
    start = 0
    while start < order.size:
        size = m_count[order[start]] * n_count[order[start]]
        stop = start + 1
        while stop < order.size:
            size = max(size, m_count[order[stop]] * n_count[order[stop]])
            if (stop + 1 - start) * size > _SERIES_CHUNK_ELEMENTS:
                break
            stop += 1
        sel = order[start:stop]
        avg[sel], mx[sel] = _rectangular_series_sums(
            a[sel], b[sel], c[sel], d[sel], t[sel], k[sel], h[sel],
            m_count[sel], n_count[sel], single[sel],
        )  # fmt: skip
        start = stop
    return avg, mx


def _rectangular_series_sums(a, b, c, d, t, k, h, m_count, n_count, single_count):
    """Mean and centre spreading resistance of 1-D design arrays (half-widths) [K W⁻¹].

    Each design keeps its own number of terms (the arrays are padded to the largest and the
    extra terms masked), so a design gives the same value alone or among others.
    """

    def col(x):  # parameters on a trailing axis for the single sums
        return x[..., None]

    def phi(z, t_, Bi_):
        th = np.tanh(z * t_)
        return (z + Bi_ * th) / (z * th + Bi_)

    hk = h / k
    cdk = c * d * k
    idx = np.arange(1, int(np.max(single_count)) + 1, dtype=float)
    delta = idx * np.pi / col(c)
    lam = idx * np.pi / col(d)
    kept = idx <= col(single_count)
    sa = np.sin(col(a) * delta) * kept
    sb = np.sin(col(b) * lam) * kept
    phi_d = phi(delta, col(t), col(hk))
    phi_l = phi(lam, col(t), col(hk))
    avg = np.sum(sa**2 * phi_d / delta**3, axis=-1) / (2.0 * a**2 * cdk) + np.sum(
        sb**2 * phi_l / lam**3, axis=-1
    ) / (2.0 * b**2 * cdk)
    mx = np.sum(sa * phi_d / delta**2, axis=-1) / (2.0 * a * cdk) + np.sum(
        sb * phi_l / lam**2, axis=-1
    ) / (2.0 * b * cdk)

    m_idx = np.arange(1, int(np.max(m_count)) + 1, dtype=float)
    n_idx = np.arange(1, int(np.max(n_count)) + 1, dtype=float)
    dd = (m_idx * np.pi / col(c))[..., :, None]  # (D, M, 1)
    ll = (n_idx * np.pi / col(d))[..., None, :]  # (D, 1, N)
    beta = np.sqrt(dd**2 + ll**2)
    phi_b = phi(beta, t[:, None, None], hk[:, None, None])
    sa2 = np.sin(a[:, None, None] * dd) * (m_idx <= col(m_count))[..., :, None]
    sb2 = np.sin(b[:, None, None] * ll) * (n_idx <= col(n_count))[..., None, :]
    avg = avg + np.sum(sa2**2 * sb2**2 * phi_b / (dd**2 * ll**2 * beta), axis=(-2, -1)) / (
        a**2 * b**2 * cdk
    )
    mx = mx + np.sum(sa2 * sb2 * phi_b / (dd * ll * beta), axis=(-2, -1)) / (a * b * cdk)
    return avg, mx


def interface_resistance(
    area, resistance=None, area_resistance=None, thickness=None, thermal_conductivity=None
):
    r"""Thermal resistance of an interface material, given in exactly one way.

    Parameters
    ----------
    area : float or array_like
        Contact (footprint) area of the interface [m²].
    resistance : float or array_like, optional
        The resistance itself, e.g. from a datasheet for this footprint [K W⁻¹].
    area_resistance : float or array_like, optional
        Area-specific resistance ``R''`` (measured, including contact resistances) [m² K W⁻¹].
    thickness : float or array_like, optional
        Bond-line thickness; give together with ``thermal_conductivity`` [m].
    thermal_conductivity : float or array_like, optional
        Bulk conductivity of the material; give together with ``thickness`` [W m⁻¹ K⁻¹].

    Returns
    -------
    numpy.ndarray or float
        Interface resistance [K W⁻¹].

    Raises
    ------
    InputError
        When not exactly one of ``resistance``, ``area_resistance`` or
        ``thickness`` + ``thermal_conductivity`` is given, or a value is negative.

    Notes
    -----
    ``R = resistance``, or ``R = R''/A``, or ``R = BLT/(k A)``. A datasheet bulk conductivity
    usually excludes the two contact resistances at the faces; add them (:func:`contact_resistance`)
    or use a measured ``R''`` instead (docs/methods.md i3).

    Examples
    --------
    >>> round(float(interface_resistance(4e-4, thickness=50e-6, thermal_conductivity=2.5)), 4)
    0.05
    """
    A = _positive("area", area, "m²")
    bulk = (thickness is not None) or (thermal_conductivity is not None)
    given = [resistance is not None, area_resistance is not None, bulk]
    if sum(given) != 1:
        raise InputError(
            "interface: give exactly one of resistance, area_resistance, or thickness with "
            "thermal_conductivity"
        )
    if resistance is not None:
        R = np.asarray(resistance, dtype=float)
        if np.any(R < 0.0):
            raise InputError(f"resistance = {np.min(R):.4g} K/W is not allowed; must be ≥ 0")
        return R * np.ones_like(A)
    if area_resistance is not None:
        return contact_resistance(area_resistance, A)
    if thickness is None or thermal_conductivity is None:
        raise InputError("interface: thickness and thermal_conductivity must be given together")
    blt = np.asarray(thickness, dtype=float)
    if np.any(blt < 0.0):
        raise InputError(f"thickness = {np.min(blt):.4g} m is not allowed; must be ≥ 0")
    k = _positive("thermal_conductivity", thermal_conductivity, "W m⁻¹ K⁻¹")
    return blt / (k * A)


def contact_resistance(area_resistance, area):
    r"""Contact resistance from an area-specific value, ``R = R''/A``.

    Parameters
    ----------
    area_resistance : float or array_like
        Area-specific contact resistance ``R''`` [m² K W⁻¹].
    area : float or array_like
        Apparent contact area [m²].

    Returns
    -------
    numpy.ndarray or float
        Contact resistance [K W⁻¹].

    Notes
    -----
    Typical ``R''`` (common practice, no single source; docs/methods.md i3): thin greases
    5e-6 - 3e-5 m² K W⁻¹, gap pads 5e-5 - 3e-4, dry aluminium on aluminium at low pressure
    1e-4 - 5e-4.

    Examples
    --------
    >>> round(float(contact_resistance(1e-5, 4e-4)), 4)
    0.025
    """
    Rpp = np.asarray(area_resistance, dtype=float)
    if np.any(Rpp < 0.0):
        raise InputError(f"area_resistance = {np.min(Rpp):.4g} m² K/W is not allowed; must be ≥ 0")
    A = _positive("area", area, "m²")
    return Rpp / A
