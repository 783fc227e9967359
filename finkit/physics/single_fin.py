"""Single-fin studies: one fin of a common profile at a given base temperature and h.

What a single-fin note shows, computed here so that templates only present it:

* the headline fin (heat rate, efficiency, effectiveness, tip temperature, resistance);
* the tip conditions compared (uniform profiles): convective, adiabatic, adiabatic with the
  corrected length, infinitely long, and a prescribed tip temperature when one is given;
* efficiency against length for several materials and several h values;
* temperature profiles along the fin for each tip condition.

All physics comes from :mod:`finkit.physics.fins.analytic` (closed forms, cited there).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from finkit.constants import ZERO_CELSIUS
from finkit.errors import InputError
from finkit.physics.fins import analytic as fa
from finkit.physics.properties.materials import get_material

UNIFORM_PROFILES = ("rectangular", "pin")
PROFILES = ("rectangular", "pin", "annular", "triangular", "parabolic", "conical-pin")


@dataclass(frozen=True)
class SingleFinStudy:
    """Results of a single-fin case (SI inside the arrays; ``results`` in note units).

    Attributes
    ----------
    results : dict
        Headline values keyed as in results.json (temperatures in °C).
    warnings : tuple of str
        1-D validity and anything else out of range.
    tip_comparison : list of dict
        One row per tip condition: ``tip``, ``heat_rate`` [W], ``efficiency`` [-],
        ``ratio_to_convective`` [-] (uniform profiles only; empty otherwise).
    profiles : dict
        ``x`` [m] and one excess-temperature array [K] per tip condition (uniform profiles).
    length_study : dict
        ``length`` [m], and ``curves``: list of dicts with ``material``,
        ``heat_transfer_coefficient``
        and ``efficiency`` (array over length) [-].
    """

    results: dict
    warnings: tuple[str, ...]
    tip_comparison: list = field(default_factory=list)
    profiles: dict = field(default_factory=dict)
    length_study: dict = field(default_factory=dict)


def _section(fin):
    if fin.profile == "rectangular":
        width = fin.width if fin.width is not None else 1.0
        return fa.rectangular_fin_section(fin.thickness, width)
    return fa.pin_fin_section(fin.diameter)


def _profile_fin(fin, length, k, h, theta_b, theta_l=0.0):
    """Heat rate, efficiency and surface area of the case's profile at ``length`` (array)."""
    p = fin.profile
    if p in UNIFORM_PROFILES:
        sec = _section(fin)
        tip = fin.tip
        r = fa.uniform_fin(
            length,
            sec.perimeter,
            sec.cross_section_area,
            k,
            h,
            theta_b,
            tip=tip,
            tip_temperature_difference=theta_l,
        )
        return r.heat_rate, r.efficiency, r.fin_surface_area
    if p == "annular":
        # The study varies the radial extent r2 - r1 in place of a length.
        r = fa.annular_fin(
            fin.inner_radius, fin.inner_radius + length, fin.thickness, k, h, theta_b
        )
        return r.heat_rate, r.efficiency, r.fin_surface_area
    width = fin.width if fin.width is not None else 1.0
    if p == "triangular":
        r = fa.straight_fin_triangular(length, fin.thickness, k, h, width, theta_b)
    elif p == "parabolic":
        r = fa.straight_fin_concave_parabolic(length, fin.thickness, k, h, width, theta_b)
    elif p == "conical-pin":
        r = fa.pin_fin_conical(length, fin.diameter, k, h, theta_b)
    else:
        raise InputError(f"fin.profile: got {p!r}; allowed: {', '.join(PROFILES)}")
    return r.heat_rate, r.efficiency, r.fin_surface_area


def _base_area(fin):
    p = fin.profile
    if p in UNIFORM_PROFILES:
        return _section(fin).cross_section_area
    if p == "annular":
        return 2 * np.pi * fin.inner_radius * fin.thickness
    if p in ("triangular", "parabolic"):
        return (fin.width if fin.width is not None else 1.0) * fin.thickness
    return np.pi * fin.diameter**2 / 4.0


def _fin_length(fin):
    if fin.profile == "annular":
        return fin.outer_radius - fin.inner_radius
    return fin.length


def solve_single_fin(case) -> SingleFinStudy:
    """Compute a single-fin case's headline, tip comparison, profiles and length study.

    Parameters
    ----------
    case : finkit.case.SingleFinCase
        The validated single-fin case (fin, conditions, optional study and limit; values in
        SI, temperatures in kelvin) [-].
    """
    # Long by design: the single-fin case's outputs in turn (headline, tip comparison, profiles,
    # length study), all from the same section and h.
    fin, cond = case.fin, case.conditions
    user = case.user_materials()
    material = get_material(fin.material, user or None)
    k = material.thermal_conductivity
    h = cond.heat_transfer_coefficient
    t_inf = cond.ambient_temperature
    theta_b = cond.base_temperature - t_inf
    if theta_b <= 0:
        raise InputError(
            "conditions.base_temperature: must be above conditions.ambient_temperature "
            f"(got {cond.base_temperature - ZERO_CELSIUS:.1f} °C vs "
            f"{t_inf - ZERO_CELSIUS:.1f} °C)"
        )
    length = _fin_length(fin)
    has_tip_temperature = getattr(fin, "tip_temperature", None) is not None
    theta_l = fin.tip_temperature - t_inf if has_tip_temperature else 0.0
    warnings: list[str] = []
    tip_rows: list[dict] = []
    profiles: dict = {}

    if fin.profile in UNIFORM_PROFILES:
        sec = _section(fin)
        P, A = sec.perimeter, sec.cross_section_area
        head = fa.uniform_fin(
            length, P, A, k, h, theta_b, tip=fin.tip, tip_temperature_difference=theta_l
        )
        q, eta, eff = float(head.heat_rate), float(head.efficiency), float(head.effectiveness)
        r_fin = float(head.thermal_resistance)
        x = np.linspace(0.0, length, 101)
        tip_theta = float(
            fa.uniform_fin_temperature_difference(
                length, length, P, A, k, h, theta_b, tip=fin.tip, tip_temperature_difference=theta_l
            )
        )
        warnings += fa.one_dimensional_fin_warnings(head.transverse_biot_number)
        tips = ["convective", "adiabatic", "infinite"]
        if has_tip_temperature:
            tips.append("prescribed")
        q_conv = float(fa.uniform_fin(length, P, A, k, h, theta_b, tip="convective").heat_rate)
        for tip in tips:
            r = fa.uniform_fin(
                length, P, A, k, h, theta_b, tip=tip, tip_temperature_difference=theta_l
            )
            tip_rows.append(
                {
                    "tip": tip,
                    "heat_rate": float(r.heat_rate),
                    "efficiency": float(r.efficiency),
                    "ratio_to_convective": float(r.heat_rate) / q_conv,
                }
            )
            if tip != "infinite":
                profiles[tip] = fa.uniform_fin_temperature_difference(
                    x, length, P, A, k, h, theta_b, tip=tip, tip_temperature_difference=theta_l
                )
            else:
                m = fa.fin_parameter(P, A, k, h)
                profiles[tip] = theta_b * np.exp(-m * x)
        lc = fa.corrected_length(length, P, A)
        r = fa.uniform_fin(lc, P, A, k, h, theta_b, tip="adiabatic")
        tip_rows.insert(
            2,
            {
                "tip": "adiabatic, corrected length",
                "heat_rate": float(r.heat_rate),
                "efficiency": float(r.efficiency),
                "ratio_to_convective": float(r.heat_rate) / q_conv,
            },
        )
        profiles["x"] = x
    else:
        q_arr, eta_arr, _ = _profile_fin(fin, length, k, h, theta_b, theta_l)
        q, eta = float(q_arr), float(eta_arr)
        eff = q / (h * float(_base_area(fin)) * theta_b)
        r_fin = theta_b / q
        tip_theta = float("nan")
        half_thickness = fin.thickness / 2 if fin.thickness is not None else fin.diameter / 4
        warnings += fa.one_dimensional_fin_warnings(h * half_thickness / k)

    # Efficiency against length: the case's material and h, plus the study's lists.
    study = case.study
    keys = list(dict.fromkeys([fin.material] + (list(study.materials) if study else [])))
    hs = list(dict.fromkeys([h] + (list(study.heat_transfer_coefficients) if study else [])))
    lengths = np.linspace(0.02, 3.0, 120) * length
    curves = []
    for key in keys:
        kk = get_material(key, user or None).thermal_conductivity
        for hh in hs:
            _, e, _ = _profile_fin(fin, lengths, kk, hh, theta_b, theta_l)
            curves.append({"material": key, "heat_transfer_coefficient": hh, "efficiency": e})

    results = {
        "fin_heat_rate": q,
        "fin_efficiency": eta,
        "fin_effectiveness": eff,
        "sink_resistance": r_fin,
        "heat_transfer_coefficient": h,
        "base_temperature": cond.base_temperature - ZERO_CELSIUS,
        "fin_tip_temperature": t_inf + tip_theta - ZERO_CELSIUS if np.isfinite(tip_theta) else None,
    }
    if eff < 2.0:
        warnings.append(
            f"fin effectiveness {eff:.2f} is below about 2: the fin hardly pays for itself "
            "(Incropera et al., 6th ed., ch. 3)"
        )
    return SingleFinStudy(
        results=results,
        warnings=tuple(dict.fromkeys(warnings)),
        tip_comparison=tip_rows,
        profiles=profiles,
        length_study={"length": lengths, "curves": curves},
    )
