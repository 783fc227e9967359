r"""Temperature field of a heat-sink base heated by several rectangular sources.

Each source is an isoflux rectangle anywhere on the top face of a rectangular plate
(``length`` along the flow, ``width`` across it, thickness ``t``); the finned face below is
cooled with a uniform coefficient ``h`` and the edges are adiabatic. The plate may conduct
differently in its plane (``k_in``) and through its thickness (``k_through``), as the effective
conductivities of a vapour chamber or a heat-pipe base do. The field is the Fourier cosine
series of the flux channel (docs/methods.md i2b; Muzychka, Culham & Yovanovich 2003 for
eccentric and several sources), superposed over the sources since the problem is linear.

Everything here is referred to the **mean temperature of the finned face** (the ``base``
node of :mod:`finkit.physics.sink`, ``T_in + Q R_sink``): the values returned are rises above
it per watt, and include the one-dimensional conduction ``t/(k_through A)``.

Derivation (re-derived here; the isotropic form is the published one). With the flux on the
top face expanded as :math:`q = \sum c_{mn}\cos(\lambda_m x)\cos(\delta_n y)`,
:math:`\lambda_m = m\pi/L`, :math:`\delta_n = n\pi/W`, each mode of the temperature
satisfies :math:`k_{in}(\partial_{xx} + \partial_{yy})\theta + k_{through}\partial_{zz}\theta = 0`,
so it decays through the thickness with :math:`\kappa = \zeta\sqrt{k_{in}/k_{through}}`,
:math:`\zeta = \sqrt{\lambda_m^2 + \delta_n^2}`. The top-face amplitude is

.. math::
    \theta_{mn} = \frac{c_{mn}}{k_e\,\zeta}\,
    \frac{\zeta + (h/k_e)\tanh(\zeta t_e)}{\zeta\tanh(\zeta t_e) + h/k_e},
    \qquad k_e = \sqrt{k_{in} k_{through}},\quad t_e = t\sqrt{k_{in}/k_{through}}

which is the isotropic solution of Yovanovich, Muzychka & Culham (1999) for a plate of
conductivity ``k_e`` and thickness ``t_e`` (the stretched-coordinate equivalence of an
orthotropic plate; Muzychka, Culham & Yovanovich, "Thermal spreading resistance in compound
and orthotropic systems", J. Thermophysics and Heat Transfer 18, 45-51, 2004). For a source of
power ``P`` over ``l_x x l_y`` centred at ``(x_c, y_c)``:

.. math::
    c_{mn} = \frac{P\,\epsilon_m\epsilon_n}{L W} f_m g_n,\quad
    f_m = \frac{\sin(\lambda_m l_x/2)}{\lambda_m l_x/2}\cos(\lambda_m x_c),\quad
    g_n = \frac{\sin(\delta_n l_y/2)}{\delta_n l_y/2}\cos(\delta_n y_c)

with :math:`\epsilon_0 = 1`, :math:`\epsilon_{k\ge1} = 2`, :math:`f_0 = g_0 = 1`; the mean of
a mode over another footprint is the product of its ``f`` and ``g`` there. The (0, 0) mode is
the one-dimensional part, of which only ``t/k_through`` is kept (``1/h`` belongs to the sink
resistance).
"""

from __future__ import annotations

import functools
from dataclasses import dataclass

import numpy as np

from finkit.errors import GeometryError, InputError
from finkit.interpolation import uniform_spline_weights

__all__ = [
    "BasePlate",
    "SharedRiseTable",
    "SourceFootprint",
    "SourceInfluence",
    "base_rise_map",
    "shared_rise_table",
    "source_influence",
]

#: Modes per index: ``MODES_PER_RATIO`` times the plate-to-footprint edge ratio of the smallest
#: footprint, clipped to [``MIN_MODES``, ``MAX_MODES``] (footprint means then converge within
#: about 0.1 %, point values within about 0.5 %; measured in the tests).
MODES_PER_RATIO = 12.0
MIN_MODES = 48
MAX_MODES = 480

#: Points per footprint edge at which the peak base temperature under a source is sought.
PEAK_POINTS = 9

#: Values of the finned-face coefficient at which :func:`shared_rise_table` sums the series before
#: interpolating, for more designs than this.
INTERPOLATION_NODES = 16

#: Work (designs x nodes x values) of one block of :class:`SharedRiseTable`'s matrix products.
#: OpenBLAS runs a product this small on the calling thread (its limit is 65536 times its
#: GEMM_MULTITHREAD_THRESHOLD, 4); larger ones wake its threads, which on a machine of few,
#: busy cores cost more than they save (measured: a 20 000-sample Monte Carlo of three sources
#: took 0.3 s instead of 0.18 s). Blocks this size also keep the field in cache, where one array
#: of 20 000 x 243 values (39 MB) would cost more in page faults than in arithmetic.
BLOCK_WORK = 2**18


@dataclass(frozen=True)
class BasePlate:
    """A rectangular base plate, possibly orthotropic.

    Attributes
    ----------
    length : float
        Edge along the flow [m].
    width : float
        Edge across the flow [m].
    thickness : float
        Plate thickness [m].
    in_plane_conductivity : float
        Conductivity in the plane of the plate [W m⁻¹ K⁻¹].
    through_conductivity : float
        Conductivity through the thickness [W m⁻¹ K⁻¹].
    """

    length: float
    width: float
    thickness: float
    in_plane_conductivity: float
    through_conductivity: float


@dataclass(frozen=True)
class SourceFootprint:
    """Where a source sits on the base: footprint and centre, from the inlet-side corner.

    Attributes
    ----------
    length : float
        Footprint edge along the flow [m].
    width : float
        Footprint edge across the flow [m].
    centre_along : float
        Distance of the footprint centre from the inlet edge of the base [m].
    centre_across : float
        Distance of the footprint centre from the side edge at the corner of reference [m].
    """

    length: float
    width: float
    centre_along: float
    centre_across: float


@dataclass(frozen=True)
class SourceInfluence:
    """Base temperature rises per watt, above the mean of the finned face.

    Attributes
    ----------
    mean : numpy.ndarray
        ``mean[i, j]``: rise of the mean base temperature under source ``i`` per watt of
        source ``j`` (one-dimensional conduction included) [K W⁻¹].
    points : numpy.ndarray
        ``points[i, k, j]``: rise at sample point ``k`` of footprint ``i`` per watt of source
        ``j`` [K W⁻¹]; the peak under source ``i`` is the largest of ``points[i] @ powers``.
    point_along, point_across : numpy.ndarray
        Coordinates of the sample points ``[i, k]`` from the inlet-side corner [m].
    centre : numpy.ndarray
        ``centre[i, j]``: rise at the centre of footprint ``i`` per watt of source ``j`` [K W⁻¹].
    modes : tuple of int
        Modes used along and across the flow [-].
    """

    mean: np.ndarray
    points: np.ndarray
    point_along: np.ndarray
    point_across: np.ndarray
    centre: np.ndarray
    modes: tuple[int, int]

    def mean_rise(self, powers) -> np.ndarray:
        """Rise of the mean base temperature under each source for the given powers [K].

        Parameters
        ----------
        powers : array_like
            Power of each source, in the order of the footprints [W].
        """
        return self.mean @ _powers(powers, self.mean.shape[0])

    def peak_rise(self, powers) -> tuple[np.ndarray, np.ndarray]:
        """Highest rise under each footprint and the index of its sample point [K], [-].

        Parameters
        ----------
        powers : array_like
            Power of each source, in the order of the footprints [W].
        """
        field = self.points @ _powers(powers, self.mean.shape[0])
        where = np.argmax(field, axis=1)
        return field[np.arange(field.shape[0]), where], where


def _check(plate: BasePlate, footprints) -> None:
    for name in ("length", "width", "thickness", "in_plane_conductivity", "through_conductivity"):
        value = getattr(plate, name)
        if not (np.isfinite(value) and value > 0):
            raise InputError(f"base {name} = {value:.4g} is not allowed; must be > 0")
    for i, f in enumerate(footprints):
        if not (f.length > 0 and f.width > 0):
            raise InputError(
                f"source {i + 1}: footprint {f.length:.4g} x {f.width:.4g} m must be > 0"
            )
        if not (np.isfinite(f.centre_along) and np.isfinite(f.centre_across)):
            raise InputError(
                f"source {i + 1}: centre ({f.centre_along}, {f.centre_across}) m must be finite"
            )
        tol = 1e-9 * max(plate.length, plate.width)
        along = (f.centre_along - f.length / 2, f.centre_along + f.length / 2)
        across = (f.centre_across - f.width / 2, f.centre_across + f.width / 2)
        if along[0] < -tol or along[1] > plate.length + tol:
            raise GeometryError(
                f"source {i + 1}: footprint spans {along[0] * 1e3:.1f}…{along[1] * 1e3:.1f} mm "
                f"along the flow; must lie within the base length 0…{plate.length * 1e3:.1f} mm"
            )
        if across[0] < -tol or across[1] > plate.width + tol:
            raise GeometryError(
                f"source {i + 1}: footprint spans {across[0] * 1e3:.1f}…{across[1] * 1e3:.1f} mm "
                f"across the flow; must lie within the base width 0…{plate.width * 1e3:.1f} mm"
            )


def _mode_count(edge: float, smallest: float, modes: int | None) -> int:
    if modes is not None:
        if int(modes) < 1:
            raise InputError(f"modes = {modes} is not allowed; must be ≥ 1")
        return int(modes)
    return int(np.clip(np.ceil(MODES_PER_RATIO * edge / smallest), MIN_MODES, MAX_MODES))


def _profiles(wavenumbers, centres, sizes):
    """``sinc(k l/2) cos(k x_c)`` per footprint (rows) and mode (columns); 1 for mode 0."""
    half = 0.5 * np.outer(sizes, wavenumbers)
    with np.errstate(invalid="ignore", divide="ignore"):
        sinc = np.where(half > 0, np.sin(half) / np.where(half > 0, half, 1.0), 1.0)
    return sinc * np.cos(np.outer(centres, wavenumbers))


def _mode_weights(plate: BasePlate, h: float, lam, delta):
    """``eps_m eps_n G(zeta_mn) / (L W)`` [K W⁻¹]: the top-face amplitude per unit source
    power of each mode, with ``1/h`` dropped from the uniform mode."""
    k_in, k_z, t = plate.in_plane_conductivity, plate.through_conductivity, plate.thickness
    k_e = np.sqrt(k_in * k_z)
    t_e = t * np.sqrt(k_in / k_z)
    zeta = np.hypot(lam[:, None], delta[None, :])
    biot = h / k_e
    with np.errstate(invalid="ignore", divide="ignore"):
        th = np.tanh(zeta * t_e)
        g = (zeta + biot * th) / (zeta * th + biot) / (k_e * zeta)
    g[0, 0] = t / k_z
    eps_m = np.where(np.arange(lam.size) == 0, 1.0, 2.0)
    eps_n = np.where(np.arange(delta.size) == 0, 1.0, 2.0)
    return g * eps_m[:, None] * eps_n[None, :] / (plate.length * plate.width)


def source_influence(
    plate: BasePlate,
    footprints,
    heat_transfer_coefficient: float,
    *,
    modes: int | None = None,
    peak_points: int = PEAK_POINTS,
) -> SourceInfluence:
    """Base temperature rise under each source per watt of every source (superposition).

    Parameters
    ----------
    plate : BasePlate
        The base: length along the flow, width, thickness [m]; in-plane and through
        conductivities [W m⁻¹ K⁻¹].
    footprints : sequence of SourceFootprint
        Where each source sits, from the inlet-side corner [m].
    heat_transfer_coefficient : float
        Uniform coefficient on the finned face; for a heat sink ``1/(R_sink A_base)`` so that
        the fins and the exposed base carry the heat [W m⁻² K⁻¹].
    modes : int or None
        Modes per index; None chooses them from the plate-to-footprint ratio [-].
    peak_points : int
        Sample points per footprint edge for the peak; odd so the centre is one of them [-].

    Returns
    -------
    SourceInfluence
        Mean, centre and sample-point rises per watt above the finned face's mean temperature.

    Notes
    -----
    See the module docstring for the series. The sum is evaluated as matrix products over the
    modes, so a few sources with hundreds of modes per index take milliseconds. The peak is the
    largest value at ``peak_points x peak_points`` points spread over the footprint (its edges
    included): for a source near an adiabatic edge the hottest point moves off the centre.

    References
    ----------
    Muzychka, Y.S., Culham, J.R., Yovanovich, M.M., "Thermal spreading resistance of eccentric
    heat sources on rectangular flux channels", Journal of Electronic Packaging 125, 178-185,
    2003.

    Muzychka, Y.S., Culham, J.R., Yovanovich, M.M., "Thermal spreading resistance in compound
    and orthotropic systems", Journal of Thermophysics and Heat Transfer 18, 45-51, 2004.

    Examples
    --------
    >>> plate = BasePlate(0.1, 0.1, 0.005, 200.0, 200.0)
    >>> one = [SourceFootprint(0.02, 0.02, 0.05, 0.05)]
    >>> r = source_influence(plate, one, 200.0)
    >>> round(float(r.mean[0, 0]), 3)  # centred: the rectangular series, 0.191 + t/(k A)
    0.194
    """
    geometry = _Geometry.of(plate, footprints, modes, peak_points)
    mean, points = geometry.influence(_positive_h(heat_transfer_coefficient))
    return SourceInfluence(
        mean=mean,
        points=points,
        point_along=geometry.point_along,
        point_across=geometry.point_across,
        centre=points[:, geometry.centre_index, :],
        modes=geometry.modes,
    )


@dataclass(frozen=True)
class SharedRiseTable:
    """Rises per watt of total power of many designs, as the sums at a few values of ``h``.

    Either each design takes the node of its own ``h`` (``selection``; at most ``nodes``
    distinct values, the sums exact) or a weighted sum of the nodes (``weights``: the
    not-a-knot cubic spline in ``log h`` written as cardinal weights, so ``weights @ values``
    is the spline through the node values). Made by :func:`shared_rise_table`.

    Attributes
    ----------
    node_mean : numpy.ndarray
        ``node_mean[u, i]``: mean rise under source ``i`` at node ``u`` [K W⁻¹].
    node_points : numpy.ndarray
        ``node_points[u, i, k]``: rise at sample point ``k`` of source ``i`` at node ``u``
        [K W⁻¹].
    selection : numpy.ndarray or None
        ``selection[d]``: the node of design ``d`` (designs flattened), or None [-].
    weights : numpy.ndarray or None
        ``weights[d, u]``: the spline weight of node ``u`` for design ``d``, or None [-].
    point_along, point_across : numpy.ndarray
        Coordinates of the sample points ``[i, k]`` from the inlet-side corner [m].
    design_shape : tuple of int
        Shape of the design axes [-].
    """

    node_mean: np.ndarray
    node_points: np.ndarray
    selection: np.ndarray | None
    weights: np.ndarray | None
    point_along: np.ndarray
    point_across: np.ndarray
    design_shape: tuple[int, ...]

    def _rows(self, values: np.ndarray, rows: slice) -> np.ndarray:
        """Per-design values (designs flattened, ``rows`` of them) from the node values."""
        flat = values.reshape(values.shape[0], -1)
        if self.selection is not None:
            return flat[self.selection[rows]]
        return self.weights[rows] @ flat

    def _blocks(self, values_per_design: int):
        """Slices of the flattened designs, a block of matrix work at a time (BLOCK_WORK)."""
        count = int(np.prod(self.design_shape, dtype=int))
        nodes = self.node_mean.shape[0]
        block = max(1, BLOCK_WORK // max(1, nodes * values_per_design))
        return [slice(start, min(start + block, count)) for start in range(0, count, block)]

    def _per_design(self, values: np.ndarray) -> np.ndarray:
        size = int(np.prod(values.shape[1:], dtype=int))
        out = np.empty((int(np.prod(self.design_shape, dtype=int)), size))
        for rows in self._blocks(size):
            out[rows] = self._rows(values, rows)
        return out.reshape(self.design_shape + values.shape[1:])

    @property
    def mean(self) -> np.ndarray:
        """``mean[..., i]``: mean rise under source ``i`` per watt of total power [K W⁻¹]."""
        return self._per_design(self.node_mean)

    @property
    def points(self) -> np.ndarray:
        """``points[..., i, k]``: rise at sample point ``k`` of source ``i`` per watt of total
        power [K W⁻¹] (every design at once: for many designs prefer :meth:`peak`)."""
        return self._per_design(self.node_points)

    def peak(self, scale, offset_rate, offset_field) -> tuple[np.ndarray, np.ndarray]:
        """Highest of ``scale * points + offset_rate * offset_field`` under each source.

        Evaluated in blocks of designs (:data:`BLOCK_WORK`), with the same arithmetic as
        forming ``points`` whole (the same numbers, but for the last digit a matrix product of
        other dimensions may round differently).

        Parameters
        ----------
        scale : float or array_like
            Per design: the total power multiplying the rises per watt [W].
        offset_rate : float or array_like
            Per design: the multiplier of ``offset_field`` (an air temperature rise) [K].
        offset_field : array_like
            ``offset_field[i, k]``: a term added at each sample point per unit of
            ``offset_rate`` [-].

        Returns
        -------
        tuple of numpy.ndarray
            ``(value[..., i], index[..., i])``: the highest value under source ``i`` [K] and
            the index of its sample point [-].
        """
        count = int(np.prod(self.design_shape, dtype=int))
        n_src = self.node_points.shape[1]
        scale = np.broadcast_to(np.asarray(scale, float), self.design_shape).reshape(-1, 1)
        rate = np.broadcast_to(np.asarray(offset_rate, float), self.design_shape).reshape(-1, 1)
        offset = np.broadcast_to(np.asarray(offset_field, float), self.node_points.shape[1:])
        offset = offset.reshape(1, -1)
        value = np.empty((count, n_src))
        index = np.empty((count, n_src), dtype=int)
        for rows in self._blocks(offset.size):
            field = scale[rows] * self._rows(self.node_points, rows) + rate[rows] * offset
            field = field.reshape(-1, n_src, offset.size // n_src)
            where = np.argmax(field, axis=-1)
            index[rows] = where
            value[rows] = np.take_along_axis(field, where[..., None], axis=-1)[..., 0]
        shape = self.design_shape + (n_src,)
        return value.reshape(shape), index.reshape(shape)


def shared_rise_table(
    plate: BasePlate,
    footprints,
    shares,
    heat_transfer_coefficient,
    *,
    modes: int | None = None,
    peak_points: int = PEAK_POINTS,
    nodes: int = INTERPOLATION_NODES,
) -> SharedRiseTable:
    """Rises per watt of total power for many designs whose sources keep their power shares.

    When the sources scale together (a sweep of the total power, of the airflow or of the
    inlet air, a scenario's power factor, a Monte Carlo's samples), each design differs only
    in the coefficient on the finned face; the rises per watt of total power are smooth in
    ``log h``, so for more designs than ``nodes`` they are computed at ``nodes`` values of
    ``h`` spread over the range and interpolated (not-a-knot cubic spline in ``log h``; within
    1e-6 of the direct sum, tested). The table keeps those sums and each design's weights on
    them, so that :meth:`SharedRiseTable.peak` searches the sample points of many designs block
    by block instead of forming them all at once.

    Parameters
    ----------
    plate : BasePlate
        The base (see :func:`source_influence`) [-].
    footprints : sequence of SourceFootprint
        Where each source sits [m].
    shares : array_like
        Each source's share of the total power, summing to 1 [-].
    heat_transfer_coefficient : float or array_like
        Coefficient on the finned face of each design [W m⁻² K⁻¹].
    modes : int or None
        Modes per index; None as in :func:`source_influence` [-].
    peak_points : int
        Sample points per footprint edge for the peak [-].
    nodes : int
        Values of ``h`` at which the sums are evaluated when interpolating [-].

    Returns
    -------
    SharedRiseTable
        Node sums and the designs' selection or spline weights [-].
    """
    geometry = _Geometry.of(plate, tuple(footprints), modes, peak_points)
    share = np.asarray(shares, float)
    h = _positive_h(heat_transfer_coefficient)
    flat = h.ravel()
    unique, inverse = np.unique(flat, return_inverse=True)
    selection = weights = None
    if unique.size <= nodes:
        at = unique
        selection = inverse.ravel()
    else:
        grid = np.linspace(np.log(unique[0]), np.log(unique[-1]), nodes)
        at = np.exp(grid)
        weights = uniform_spline_weights(grid, np.log(flat))
    values = [geometry.shared_influence(v, share) for v in at]
    return SharedRiseTable(
        node_mean=np.stack([m for m, _ in values]),
        node_points=np.stack([p for _, p in values]),
        selection=selection,
        weights=weights,
        point_along=geometry.point_along,
        point_across=geometry.point_across,
        design_shape=h.shape,
    )


def _powers(powers, count: int) -> np.ndarray:
    p = np.asarray(powers, float)
    if p.shape != (count,) or not np.all(np.isfinite(p)):
        raise InputError(
            f"powers: got {np.shape(p)} values; expected {count} finite powers [W], one per source"
        )
    return p


def _positive_h(value):
    h = np.asarray(value, float)
    if np.any(~(np.isfinite(h) & (h > 0))):
        bad = float(h.ravel()[np.argmax(~(np.isfinite(h.ravel()) & (h.ravel() > 0)))])
        raise InputError(
            f"heat_transfer_coefficient = {bad:.4g} W/(m² K) is not allowed; must be > 0"
        )
    return h


@dataclass(frozen=True)
class _Geometry:
    """What the series needs that does not depend on ``h``: modes, footprint profiles and the
    cosines at the sample points."""

    plate: BasePlate
    lx: np.ndarray
    lam: np.ndarray
    delta: np.ndarray
    f: np.ndarray
    g: np.ndarray
    point_along: np.ndarray
    point_across: np.ndarray
    centre_index: int
    modes: tuple[int, int]
    cos_along: np.ndarray  # (S, K1, M): cos(lam_m x) at the grid's positions along the flow
    cos_across: np.ndarray  # (S, K1, N): cos(delta_n y) at its positions across

    @classmethod
    def of(cls, plate, footprints, modes, peak_points) -> _Geometry:
        """The geometry of these sources on this plate; remembered for the last few layouts
        (a layout's allowable power and its sweeps ask for the same one many times)."""
        try:
            return _geometry_of(plate, tuple(footprints), modes, int(peak_points))
        except TypeError:  # an unhashable footprint: build it without remembering
            return cls._build(plate, footprints, modes, peak_points)

    @classmethod
    def _build(cls, plate, footprints, modes, peak_points) -> _Geometry:
        footprints = list(footprints)
        if not footprints:
            raise InputError("sources: none given; at least one source is needed")
        _check(plate, footprints)
        lx = np.array([f.length for f in footprints])
        ly = np.array([f.width for f in footprints])
        xc = np.array([f.centre_along for f in footprints])
        yc = np.array([f.centre_across for f in footprints])
        m_count = _mode_count(plate.length, lx.min(), modes)
        n_count = _mode_count(plate.width, ly.min(), modes)
        lam = np.arange(m_count + 1) * np.pi / plate.length
        delta = np.arange(n_count + 1) * np.pi / plate.width
        count = max(int(peak_points), 1) | 1
        frac = np.linspace(-0.5, 0.5, count) if count > 1 else np.zeros(1)
        n_src = len(footprints)
        px = np.broadcast_to(xc[:, None, None] + lx[:, None, None] * frac[None, :, None],
                             (n_src, count, count)).reshape(n_src, -1)  # fmt: skip
        py = np.broadcast_to(yc[:, None, None] + ly[:, None, None] * frac[None, None, :],
                             (n_src, count, count)).reshape(n_src, -1)  # fmt: skip
        return cls(
            plate=plate,
            lx=lx,
            lam=lam,
            delta=delta,
            f=_profiles(lam, xc, lx),  # (S, M)
            g=_profiles(delta, yc, ly),  # (S, N)
            point_along=px,
            point_across=py,
            centre_index=(count * count) // 2,
            modes=(m_count, n_count),
            cos_along=np.cos((xc[:, None] + lx[:, None] * frac)[..., None] * lam),
            cos_across=np.cos((yc[:, None] + ly[:, None] * frac)[..., None] * delta),
        )

    def shared_influence(self, h: float, share) -> tuple[np.ndarray, np.ndarray]:
        """``(mean[i], points[i, k])`` per watt of total power shared as ``share`` at ``h``.

        The same as contracting :meth:`influence` with ``share``, summed in the other order:
        the sources' amplitudes are combined first, so the sample points see one amplitude
        instead of one per source (about S times less work for S sources).
        """
        weights = _mode_weights(self.plate, float(h), self.lam, self.delta)
        amplitude = weights * ((np.asarray(share, float)[:, None] * self.f).T @ self.g)  # (M, N)
        mean = ((self.f @ amplitude) * self.g).sum(axis=1)
        # The sample points of a source form a tensor grid (along x across), so the double
        # cosine sum factors: cos(lam x_a) A cos(delta y_b) for all a, b at once.
        points = (self.cos_along @ amplitude) @ self.cos_across.transpose(0, 2, 1)
        return mean, points.reshape(self.f.shape[0], -1)

    def influence(self, h: float) -> tuple[np.ndarray, np.ndarray]:
        """``(mean[i, j], points[i, k, j])`` per watt of source ``j`` at coefficient ``h``."""
        f, g = self.f, self.g
        weights = _mode_weights(self.plate, float(h), self.lam, self.delta)
        n_src, n_m, n_n = f.shape[0], self.lam.size, self.delta.size
        # Top-face amplitudes of each source per watt, A[j] = f_j W g_j (outer), as (M, S*N).
        amplitude = (f[:, :, None] * weights[None] * g[:, None, :]).transpose(1, 0, 2)
        amplitude = amplitude.reshape(n_m, n_src * n_n)
        # mean[i, j] = sum_mn f_i,m A_j,mn g_i,n
        mean = ((f @ amplitude).reshape(n_src, n_src, n_n) * g[:, None, :]).sum(axis=2)
        # points[i, (a, b), j] = cos(lam x_ia) A_j cos(delta y_ib): the sample points of a source
        # form a tensor grid, so the double sum factors (as in shared_influence).
        per_source = amplitude.reshape(n_m, n_src, n_n).transpose(1, 0, 2)  # (S_j, M, N)
        grid = (self.cos_along[:, None] @ per_source[None]) @ self.cos_across[:, None].transpose(
            0, 1, 3, 2
        )  # (S_i, S_j, K1, K1)
        points = grid.reshape(n_src, n_src, -1).transpose(0, 2, 1)
        return mean, points


@functools.lru_cache(maxsize=8)
def _geometry_of(plate, footprints, modes, peak_points) -> _Geometry:
    return _Geometry._build(plate, footprints, modes, peak_points)


def base_rise_map(
    plate: BasePlate,
    footprints,
    powers,
    heat_transfer_coefficient: float,
    *,
    points_along: int = 81,
    points_across: int = 61,
    modes: int | None = None,
):
    """Rise of the top-face base temperature above the finned face's mean, on a plan grid.

    Parameters
    ----------
    plate : BasePlate
        The base (see :func:`source_influence`) [-].
    footprints : sequence of SourceFootprint
        Where each source sits [m].
    powers : array_like
        Power of each source [W].
    heat_transfer_coefficient : float
        Uniform coefficient on the finned face [W m⁻² K⁻¹].
    points_along, points_across : int
        Grid points along and across the flow, edges included [-].
    modes : int or None
        Modes per index; None as in :func:`source_influence` [-].

    Returns
    -------
    tuple of numpy.ndarray
        ``(along, across, rise)``: grid coordinates [m] and the rise ``rise[across, along]`` [K].
    """
    geometry = _Geometry.of(plate, footprints, modes, 1)
    h = float(_positive_h(heat_transfer_coefficient))
    p = _powers(powers, len(geometry.lx))
    lam, delta = geometry.lam, geometry.delta
    weights = _mode_weights(plate, h, lam, delta)
    amplitude = weights * ((p[:, None] * geometry.f).T @ geometry.g)
    along = np.linspace(0.0, plate.length, points_along)
    across = np.linspace(0.0, plate.width, points_across)
    rise = np.cos(np.outer(across, delta)) @ amplitude.T @ np.cos(np.outer(lam, along))
    return along, across, rise
