"""Plate-fin and pin-fin heat-sink geometry: derived areas, counts and validation.

Every dimension is in metres (SI). Fields may be floats or numpy arrays that broadcast together,
so that one geometry object can stand for a whole sweep of designs; derived quantities are
properties computed with numpy and broadcast the same way. A geometry that cannot exist (fins
that do not fit, overlapping pins, a non-positive size) raises :class:`finkit.errors.GeometryError`
on construction with a one-line message naming the fields and their values.

Conventions (docs/methods.md section e and f):

* ``base_width`` W is across the flow, ``base_length`` L along the flow.
* Plate fins run the full base length; the two edge fins are flush with the base edges, so the
  clear gap between fins is ``b = (W - N t) / (N - 1)``.
* Pins stand on a rectangular grid of transverse pitch S_T (across the flow) and longitudinal pitch
  S_L (along the flow); in a staggered array every second row is shifted by S_T / 2.
"""

from __future__ import annotations

from dataclasses import dataclass, fields

import numpy as np

from finkit.errors import GeometryError, InputError

__all__ = ["PlateFinSink", "PinFinSink", "PIN_ARRANGEMENTS", "fins_fit"]

#: Pin arrangements understood by :class:`PinFinSink` and :mod:`finkit.physics.correlations.forced`.
PIN_ARRANGEMENTS = ("inline", "staggered")

# Relative tolerance used when a count must be a whole number or a length must fit.
_FIT_TOLERANCE = 1e-9


def _shown(value) -> str:
    """Short text of a field value for an error message (scalar, or the offending elements)."""
    a = np.asarray(value, dtype=float)
    if a.ndim == 0:
        return f"{float(a):.6g}"
    flat = a.ravel()
    if flat.size <= 4:
        return "[" + ", ".join(f"{v:.6g}" for v in flat) + "]"
    return f"array of {flat.size} values from {flat.min():.6g} to {flat.max():.6g}"


def _first_bad(mask, *values) -> str:
    """Text of the first offending element of each value where ``mask`` is true."""
    m = np.asarray(mask)
    if m.ndim == 0:
        return ", ".join(_shown(v) for v in values)
    arrays = np.broadcast_arrays(*(np.asarray(v, dtype=float) for v in values), m)
    index = np.argwhere(arrays[-1])[0]
    return ", ".join(f"{float(a[tuple(index)]):.6g}" for a in arrays[:-1]) + (
        f" (first bad element at index {tuple(int(i) for i in index)})"
    )


def _check_positive(obj, names) -> None:
    for name in names:
        value = np.asarray(getattr(obj, name), dtype=float)
        bad = ~(value > 0) | ~np.isfinite(value)
        if np.any(bad):
            raise GeometryError(
                f"{name} = {_first_bad(bad, value)} is not allowed; it must be a finite "
                "length > 0 m"
            )


def fins_fit(base_width, fin_count, fin_thickness):
    """True where ``fin_count`` fins of ``fin_thickness`` leave a gap on ``base_width``.

    The one rule for whether plate fins fit, ``W - N t > 0`` (to a relative tolerance of
    ``_FIT_TOLERANCE`` of W): :class:`PlateFinSink` raises where it is false, and the case file's
    check (:class:`finkit.case.Sink`) names the fields. Arrays broadcast [-].

    Parameters
    ----------
    base_width : float or array_like
        Base width W across the flow [m].
    fin_count : int or array_like
        Number of fins N [-].
    fin_thickness : float or array_like
        Fin thickness t (uniform) [m].
    """
    w = np.asarray(base_width, dtype=float)
    n = np.asarray(fin_count, dtype=float)
    t = np.asarray(fin_thickness, dtype=float)
    return w - n * t > _FIT_TOLERANCE * w


@dataclass(frozen=True)
class PlateFinSink:
    """Straight plate-fin heat sink with fins along the flow over the full base length.

    Parameters
    ----------
    base_width : float or array_like
        Base width W across the flow [m].
    base_length : float or array_like
        Base length L along the flow; equals the fin length [m].
    base_thickness : float or array_like
        Base plate thickness t_b [m].
    fin_count : int or array_like
        Number of fins N (a whole number, at least 2) [-].
    fin_thickness : float or array_like
        Fin thickness t (uniform) [m].
    fin_height : float or array_like
        Fin height H from the top of the base to the fin tip [m].

    Notes
    -----
    The edge fins are flush with the base edges, so the clear gap is
    ``b = (W - N t) / (N - 1)`` (docs/methods.md section e). Areas per fin: the two faces
    ``2 H L`` and the tip ``t L``; the two fin ends (``t H`` each, at inlet and outlet) are left
    out everywhere (:attr:`fin_end_area_each` gives them if wanted). The base is exposed only
    between fins: ``(N - 1) b L``; the base edges and underside are not counted.

    Raises
    ------
    GeometryError
        If a size is not positive, the fin count is not a whole number >= 2, or the fins do not
        fit across the base (``b <= 0``).
    """

    base_width: float | np.ndarray
    base_length: float | np.ndarray
    base_thickness: float | np.ndarray
    fin_count: int | np.ndarray
    fin_thickness: float | np.ndarray
    fin_height: float | np.ndarray

    def __post_init__(self) -> None:
        self.validate()

    def validate(self) -> None:
        """Raise :class:`GeometryError` if any element of the geometry cannot exist."""
        for f in fields(self):
            try:
                np.asarray(getattr(self, f.name), dtype=float)
            except (TypeError, ValueError):
                raise GeometryError(
                    f"{f.name} = {getattr(self, f.name)!r} is not a number or array of numbers"
                ) from None
        _check_positive(
            self, ("base_width", "base_length", "base_thickness", "fin_thickness", "fin_height")
        )
        n = np.asarray(self.fin_count, dtype=float)
        bad = ~np.isfinite(n) | (np.abs(n - np.round(n)) > _FIT_TOLERANCE) | (n < 2)
        if np.any(bad):
            raise GeometryError(
                f"fin_count = {_first_bad(bad, n)} is not allowed; it must be a whole number >= 2"
            )
        w = np.asarray(self.base_width, dtype=float)
        t = np.asarray(self.fin_thickness, dtype=float)
        bad = ~fins_fit(w, n, t)
        if np.any(bad):
            raise GeometryError(
                "fin_count * fin_thickness >= base_width: fins do not fit "
                f"(fin_count, fin_thickness, base_width = {_first_bad(bad, n, t, w)}); "
                "the fin spacing (W - N t)/(N - 1) must be > 0"
            )

    # -- counts and spacings -------------------------------------------------------------------
    @property
    def fin_spacing(self):
        """Clear gap between adjacent fins ``b = (W - N t)/(N - 1)`` [m]."""
        n = np.asarray(self.fin_count, dtype=float)
        return (np.asarray(self.base_width, dtype=float) - n * self.fin_thickness) / (n - 1.0)

    @property
    def fin_pitch(self):
        """Centre-to-centre fin distance ``b + t`` [m]."""
        return self.fin_spacing + np.asarray(self.fin_thickness, dtype=float)

    @property
    def channel_count(self):
        """Number of flow channels between fins ``N - 1`` [-]."""
        return np.asarray(self.fin_count, dtype=float) - 1.0

    @property
    def channel_aspect_ratio(self):
        """Channel gap over fin height ``b / H`` [-] (may exceed 1 for short, wide gaps)."""
        return self.fin_spacing / np.asarray(self.fin_height, dtype=float)

    # -- areas ---------------------------------------------------------------------------------
    @property
    def fin_face_area_each(self):
        """Both faces of one fin ``2 H L`` [m²]."""
        return 2.0 * np.asarray(self.fin_height, dtype=float) * self.base_length

    @property
    def fin_tip_area_each(self):
        """Tip of one fin ``t L`` [m²]."""
        return np.asarray(self.fin_thickness, dtype=float) * self.base_length

    @property
    def fin_end_area_each(self):
        """Inlet and outlet end faces of one fin ``2 t H`` [m²] (not included in any total)."""
        return 2.0 * np.asarray(self.fin_thickness, dtype=float) * self.fin_height

    @property
    def fin_area_each(self):
        """Wetted area of one fin with an exposed tip ``2 H L + t L`` [m²] (ends excluded)."""
        return self.fin_face_area_each + self.fin_tip_area_each

    @property
    def base_exposed_area(self):
        """Base area between the fins ``(N - 1) b L`` [m²]."""
        return self.channel_count * self.fin_spacing * self.base_length

    @property
    def total_area(self):
        """Wetted area with exposed fin tips ``N (2 H L + t L) + (N - 1) b L`` [m²].

        Use for an open-top sink; for a shrouded sink (tips touch the shroud) use
        :attr:`total_area_shrouded`.
        """
        n = np.asarray(self.fin_count, dtype=float)
        return n * self.fin_area_each + self.base_exposed_area

    @property
    def total_area_shrouded(self):
        """Wetted area without fin tips ``N 2 H L + (N - 1) b L`` [m²]."""
        n = np.asarray(self.fin_count, dtype=float)
        return n * self.fin_face_area_each + self.base_exposed_area

    @property
    def frontal_area(self):
        """Frontal area of the fin region ``W H`` [m²] (base plate not included).

        The approach velocity of :func:`finkit.physics.correlations.forced.plate_fin_channel_flow`
        is
        defined on this area.
        """
        return np.asarray(self.base_width, dtype=float) * self.fin_height

    @property
    def overall_frontal_area(self):
        """Frontal area including the base plate ``W (H + t_b)`` [m²]."""
        return np.asarray(self.base_width, dtype=float) * (
            np.asarray(self.fin_height, dtype=float) + self.base_thickness
        )

    @property
    def open_frontal_area(self):
        """Open (flow) area between fins ``(N - 1) b H`` [m²]."""
        return self.channel_count * self.fin_spacing * self.fin_height

    @property
    def open_area_ratio(self):
        """Open-area ratio of the fin region ``sigma = (N - 1) b / W`` [-] (docs/methods.md e1).

        Channel velocity = approach velocity / sigma. This is the exact ratio of open to frontal
        area of the fin region, not the per-pitch ``b/(b + t)`` of Teertstra et al., which differs
        by the factor ``N/(N - 1)``.
        """
        return self.channel_count * self.fin_spacing / np.asarray(self.base_width, dtype=float)

    @property
    def hydraulic_diameter_shrouded(self):
        """Hydraulic diameter of a shrouded channel ``2 b H / (b + H)`` [m] (four walls wetted)."""
        b = self.fin_spacing
        h = np.asarray(self.fin_height, dtype=float)
        return 2.0 * b * h / (b + h)

    @property
    def hydraulic_diameter_open(self):
        """Hydraulic diameter of an open-top channel ``4 b H / (b + 2 H)`` [m] (top not wetted)."""
        b = self.fin_spacing
        h = np.asarray(self.fin_height, dtype=float)
        return 4.0 * b * h / (b + 2.0 * h)

    def hydraulic_diameter(self, is_shrouded=True):
        """Channel hydraulic diameter [m], shrouded or open-top (see the two properties).

        Parameters
        ----------
        is_shrouded : bool or array_like, default True
            True: shrouded channel (four walls wetted); False: open top [-].
        """
        return np.where(is_shrouded, self.hydraulic_diameter_shrouded, self.hydraulic_diameter_open)

    # -- metal ---------------------------------------------------------------------------------
    @property
    def volume(self):
        """Metal volume ``W L t_b + N t H L`` [m³]."""
        n = np.asarray(self.fin_count, dtype=float)
        w = np.asarray(self.base_width, dtype=float)
        return w * self.base_length * self.base_thickness + n * self.fin_thickness * (
            np.asarray(self.fin_height, dtype=float) * self.base_length
        )

    def mass(self, density):
        """Metal mass [kg] for a solid ``density`` [kg m⁻³].

        Parameters
        ----------
        density : float or array_like
            Density of the sink's metal [kg m⁻³].
        """
        return self.volume * np.asarray(density, dtype=float)


@dataclass(frozen=True)
class PinFinSink:
    """Cylindrical pin-fin heat sink, in-line or staggered, pins on a rectangular base.

    Parameters
    ----------
    base_width : float or array_like
        Base width W across the flow [m].
    base_length : float or array_like
        Base length L along the flow [m].
    base_thickness : float or array_like
        Base plate thickness [m].
    pin_diameter : float or array_like
        Pin diameter D [m].
    pin_height : float or array_like
        Pin height H from the top of the base to the pin tip [m].
    transverse_pitch : float or array_like
        Centre distance S_T between pins of one row (across the flow) [m].
    longitudinal_pitch : float or array_like
        Centre distance S_L between rows (along the flow) [m].
    arrangement : str
        ``"inline"`` or ``"staggered"`` (one value for the whole object) [-].

    Notes
    -----
    Counting rule. A row holds ``pins_per_row = floor((W - D)/S_T) + 1`` pins (as many as fit with
    the outer pins inside the base edges); there are ``row_count = floor((L - D)/S_L) + 1`` rows.
    In a staggered array the even rows (2nd, 4th, ...) are shifted by S_T/2; they hold
    ``pins_per_row`` pins if ``(pins_per_row - 1/2) S_T + D <= W`` and one pin fewer otherwise.
    The array is centred on the base (this does not change any area).

    Errors: pins overlapping (``S_T <= D``; in-line ``S_L <= D``; staggered diagonal pitch
    ``S_D = sqrt(S_L^2 + (S_T/2)^2) <= D`` or ``2 S_L <= D``), pins not fitting (``D > W``,
    ``D > L``, or an empty shifted row), non-positive sizes.
    """

    base_width: float | np.ndarray
    base_length: float | np.ndarray
    base_thickness: float | np.ndarray
    pin_diameter: float | np.ndarray
    pin_height: float | np.ndarray
    transverse_pitch: float | np.ndarray
    longitudinal_pitch: float | np.ndarray
    arrangement: str = "inline"

    def __post_init__(self) -> None:
        self.validate()

    def validate(self) -> None:
        """Raise :class:`GeometryError` (or InputError for the arrangement) if impossible."""
        if not isinstance(self.arrangement, str) or self.arrangement not in PIN_ARRANGEMENTS:
            raise InputError(
                f"arrangement = {self.arrangement!r} is not allowed; use one of {PIN_ARRANGEMENTS}"
            )
        names = (
            "base_width",
            "base_length",
            "base_thickness",
            "pin_diameter",
            "pin_height",
            "transverse_pitch",
            "longitudinal_pitch",
        )
        for name in names:
            try:
                np.asarray(getattr(self, name), dtype=float)
            except (TypeError, ValueError):
                raise GeometryError(
                    f"{name} = {getattr(self, name)!r} is not a number or array of numbers"
                ) from None
        _check_positive(self, names)
        d = np.asarray(self.pin_diameter, dtype=float)
        st = np.asarray(self.transverse_pitch, dtype=float)
        sl = np.asarray(self.longitudinal_pitch, dtype=float)
        w = np.asarray(self.base_width, dtype=float)
        length = np.asarray(self.base_length, dtype=float)
        bad = st <= d
        if np.any(bad):
            raise GeometryError(
                "transverse_pitch <= pin_diameter: pins overlap "
                f"(transverse_pitch, pin_diameter = {_first_bad(bad, st, d)}); "
                "transverse_pitch must exceed pin_diameter"
            )
        if self.arrangement == "inline":
            bad = sl <= d
            if np.any(bad):
                raise GeometryError(
                    "longitudinal_pitch <= pin_diameter: in-line pins overlap "
                    f"(longitudinal_pitch, pin_diameter = {_first_bad(bad, sl, d)}); "
                    "longitudinal_pitch must exceed pin_diameter"
                )
        else:
            sd = np.sqrt(sl**2 + (st / 2.0) ** 2)
            bad = (sd <= d) | (2.0 * sl <= d)
            if np.any(bad):
                raise GeometryError(
                    "staggered pins overlap: diagonal pitch sqrt(longitudinal_pitch^2 + "
                    "(transverse_pitch/2)^2) and 2*longitudinal_pitch must exceed pin_diameter "
                    f"(longitudinal_pitch, transverse_pitch, pin_diameter = "
                    f"{_first_bad(bad, sl, st, d)})"
                )
        bad = d > w * (1.0 + _FIT_TOLERANCE)
        if np.any(bad):
            raise GeometryError(
                f"pin_diameter > base_width: no pin fits (pin_diameter, base_width = "
                f"{_first_bad(bad, d, w)})"
            )
        bad = d > length * (1.0 + _FIT_TOLERANCE)
        if np.any(bad):
            raise GeometryError(
                f"pin_diameter > base_length: no row fits (pin_diameter, base_length = "
                f"{_first_bad(bad, d, length)})"
            )
        if self.arrangement == "staggered":
            bad = (self.row_count >= 2) & (self.pins_per_shifted_row < 1)
            if np.any(bad):
                raise GeometryError(
                    "staggered array with one pin per row leaves the shifted rows empty "
                    f"(base_width, transverse_pitch, pin_diameter = {_first_bad(bad, w, st, d)}); "
                    "widen the base or reduce transverse_pitch"
                )

    # -- counts --------------------------------------------------------------------------------
    @property
    def pins_per_row(self):
        """Pins in a full (odd) row ``floor((W - D)/S_T) + 1`` [-] (whole numbers, as floats)."""
        w = np.asarray(self.base_width, dtype=float)
        d = np.asarray(self.pin_diameter, dtype=float)
        return np.floor((w - d) / self.transverse_pitch + _FIT_TOLERANCE) + 1.0

    @property
    def pins_per_shifted_row(self):
        """Pins in an even (shifted) row [-]: equal to :attr:`pins_per_row` for in-line arrays."""
        n = self.pins_per_row
        if self.arrangement == "inline":
            return n
        w = np.asarray(self.base_width, dtype=float)
        d = np.asarray(self.pin_diameter, dtype=float)
        fits = (n - 0.5) * self.transverse_pitch + d <= w * (1.0 + _FIT_TOLERANCE)
        return np.where(fits, n, n - 1.0)

    @property
    def row_count(self):
        """Rows along the flow ``floor((L - D)/S_L) + 1`` [-] (float array of whole numbers)."""
        length = np.asarray(self.base_length, dtype=float)
        d = np.asarray(self.pin_diameter, dtype=float)
        return np.floor((length - d) / self.longitudinal_pitch + _FIT_TOLERANCE) + 1.0

    @property
    def pin_count(self):
        """Total number of pins [-]: odd rows full, even rows :attr:`pins_per_shifted_row`."""
        rows = self.row_count
        odd_rows = np.ceil(rows / 2.0)
        even_rows = np.floor(rows / 2.0)
        return odd_rows * self.pins_per_row + even_rows * self.pins_per_shifted_row

    # -- pitches -------------------------------------------------------------------------------
    @property
    def diagonal_pitch(self):
        """Diagonal pitch ``S_D = sqrt(S_L^2 + (S_T/2)^2)`` [m] (staggered arrays)."""
        return np.sqrt(
            np.asarray(self.longitudinal_pitch, dtype=float) ** 2
            + (np.asarray(self.transverse_pitch, dtype=float) / 2.0) ** 2
        )

    @property
    def min_free_flow_ratio(self):
        """Minimum free-flow area over frontal area [-] = approach velocity / maximum velocity.

        In-line: ``(S_T - D)/S_T``. Staggered: the smaller of the transverse gap ``S_T - D`` and
        the two diagonal gaps ``2 (S_D - D)``, over ``S_T`` (docs/methods.md section f).
        """
        st = np.asarray(self.transverse_pitch, dtype=float)
        d = np.asarray(self.pin_diameter, dtype=float)
        gap = st - d
        if self.arrangement == "staggered":
            gap = np.minimum(gap, 2.0 * (self.diagonal_pitch - d))
        return gap / st

    # -- areas ---------------------------------------------------------------------------------
    @property
    def pin_side_area_each(self):
        """Side area of one pin ``pi D H`` [m²]."""
        return np.pi * np.asarray(self.pin_diameter, dtype=float) * self.pin_height

    @property
    def pin_tip_area_each(self):
        """Tip area of one pin ``pi D^2 / 4`` [m²]."""
        return np.pi * np.asarray(self.pin_diameter, dtype=float) ** 2 / 4.0

    @property
    def pin_area_each(self):
        """Wetted area of one pin with an exposed tip ``pi D H + pi D^2/4`` [m²]."""
        return self.pin_side_area_each + self.pin_tip_area_each

    @property
    def base_exposed_area(self):
        """Base area around the pins ``W L - N pi D^2/4`` [m²]."""
        return (
            np.asarray(self.base_width, dtype=float) * self.base_length
            - self.pin_count * self.pin_tip_area_each
        )

    @property
    def total_area(self):
        """Wetted area with exposed pin tips ``N (pi D H + pi D^2/4) + base`` [m²]."""
        return self.pin_count * self.pin_area_each + self.base_exposed_area

    @property
    def total_area_shrouded(self):
        """Wetted area without pin tips ``N pi D H + base`` [m²] (tips touch a shroud)."""
        return self.pin_count * self.pin_side_area_each + self.base_exposed_area

    @property
    def frontal_area(self):
        """Frontal area of the pin region ``W H`` [m²] (base plate not included)."""
        return np.asarray(self.base_width, dtype=float) * self.pin_height

    # -- metal ---------------------------------------------------------------------------------
    @property
    def volume(self):
        """Metal volume ``W L t_b + N pi D^2/4 H`` [m³]."""
        return (
            np.asarray(self.base_width, dtype=float) * self.base_length * self.base_thickness
            + self.pin_count * self.pin_tip_area_each * self.pin_height
        )

    def mass(self, density):
        """Metal mass [kg] for a solid ``density`` [kg m⁻³].

        Parameters
        ----------
        density : float or array_like
            Density of the sink's metal [kg m⁻³].
        """
        return self.volume * np.asarray(density, dtype=float)
