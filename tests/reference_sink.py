"""Independent scalar re-implementation of the forced-convection plate-fin heat-sink model.

Written from ``docs/methods.md`` (sections a, c, e, f, h, i, j, k) and the cited literature only,
without reading finkit's own sink, correlation or model code, to cross-check
``finkit.physics.sink`` in ``tests/test_sink_crosscheck.py``. Plain Python floats, the ``math``
module and ``scipy.optimize.brentq`` / ``scipy.interpolate.PchipInterpolator``; from finkit
only the air-property table (``finkit.physics.properties.air.air_properties``) is used, so that both
sides see the same air.

Model (fully shrouded plate fins: the duct wall touches the fin tips, no bypass, adiabatic fin
tip at the fin height H):

* spacing ``b = (W - N t)/(N - 1)``; channel velocity ``V = Q/((N - 1) b H)`` with Q the
  volume flow at the inlet (docs/methods.md e1, sigma = (N - 1) b / W);
* Teertstra, Yovanovich, Culham & Lemczyk (1999) composite Nusselt number on
  ``Re_b* = (V b / nu) b / L``; h is inlet-referenced (no caloric term) [docs/methods.md e2]. The
  form was confirmed against two independent public implementations of the same paper (the
  (Re* Pr / 2)^-3 + (0.664 sqrt(Re*) Pr^(1/3) sqrt(1 + 3.65/sqrt(Re*)))^-3 composite);
* heat-transfer air properties at the film temperature (T_in + T_base)/2, with
  ``T_base = T_in + P R_sink``, solved to convergence with brentq;
* fin efficiency ``tanh(mH)/(mH)``, ``m = sqrt(2h/(k t))``; ``A_f = 2 H L`` per channel
  (N - 1 channels; the end fins' outer faces touch the shroud), ``A_b = (N - 1) b L``;
  ``eta_o`` and ``R_sink = 1/(eta_o h A_t)`` [docs/methods.md a, c];
* exact rectangular spreading series (Yovanovich, Muzychka & Culham 1999) for the average
  source temperature with ``h = 1/(R_sink W L)`` on the cooled face, plus the 1-D base
  conduction ``t_b/(k W L)`` [docs/methods.md i2] (finkit's solver uses the series since issue 12;
  the Song, Lee & Au closed form [docs/methods.md i1], whose lambda_c, Phi_c forms were confirmed
  against an independent public implementation of Lee et al. (1995), is kept for comparison);
* junction ``T_j = T_in + P (R_jc + R_int + R_sp + R_base + R_sink)`` [docs/methods.md 0];
* pressure drop at the inlet air density and viscosity (docs/methods.md e3-e5):
  ``dp = [K_c + 4 f_app L/D_h + K_e] rho V^2/2``, ``D_h = 2 b H/(b + H)``, Shah & London
  fully developed ``f Re`` polynomial on ``alpha = min(b, H)/max(b, H)`` and the composite
  ``f_app Re = sqrt((3.44/sqrt(L*))^2 + (f Re)^2)``, ``L* = L/(D_h Re_Dh)``. Laminar only
  (the cross-check keeps ``Re_Dh`` below 2000). The polynomial coefficients and the 3.44
  composite were confirmed against independent public heat-sink implementations
  (24 - 32.527 a + 46.721 a^2 - 40.829 a^3 + 22.954 a^4 - 6.089 a^5);
* entrance/exit loss coefficients (docs/methods.md e4), a named choice:

  - ``"kays_london"``: Kays & London theory with momentum-flux coefficient K_d = 1, i.e.
    Borda-Carnot exit ``K_e = (1 - sigma)^2`` and ``K_c = (1/C_c - 1)^2 + K_f`` where the jet
    velocity ratio ``1/C_c = lambda = 1 + 0.622 (1 - 0.215 sigma - 0.785 sigma^2.5)`` and the
    inlet friction term ``K_f = 0.0696 (1 - sigma^2.5) lambda^2`` are Rennels & Hudson's
    sharp-contraction fit (Pipe Flow, Wiley, 2012), the numeric substitute for the K&L C_c
    chart that docs/methods.md e4 names (it is ``fluids.contraction_sharp(method="Rennels")``
    with ``beta^2 = sigma``). With ``contraction="jet_only"`` the friction term ``K_f`` is
    left out (pure K&L form with C_c from the same fit);
  - ``"culham_muzychka"``: ``K_c = 0.42 (1 - sigma^2)``, ``K_e = (1 - sigma^2)^2`` (Culham &
    Muzychka 2001), confirmed against independent public implementations;
* fan: PCHIP through the table, pressures scaled by ``rho_in / 1.2``; operating point by
  brentq on fan minus system (docs/methods.md h);
* allowable power: brentq on the power that puts the junction at the limit.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from scipy.interpolate import PchipInterpolator
from scipy.optimize import brentq

from finkit.physics.properties.air import air_properties

FAN_RATING_DENSITY = 1.2  # kg/m3, standard air of catalogue fan curves (docs/methods.md h, CP)


@dataclass(frozen=True)
class Design:
    """One shrouded plate-fin heat sink on one device (all SI)."""

    base_width: float  # W across the flow [m]
    base_length: float  # L along the flow [m]
    base_thickness: float  # t_b [m]
    fin_count: int  # N [-]
    fin_thickness: float  # t [m]
    fin_height: float  # H [m]
    conductivity: float  # sink metal k [W m-1 K-1]
    footprint_length: float  # source size along the flow [m]
    footprint_width: float  # source size across the flow [m]
    junction_to_case_resistance: float = 0.0  # [K W-1]
    interface_resistance: float = 0.0  # [K W-1]


@dataclass(frozen=True)
class ThermalResult:
    """State of one design at one power and flow."""

    power: float
    volume_flow: float
    channel_velocity: float
    reynolds_spacing: float  # Re_b = V b / nu_film
    reynolds_modified: float  # Re_b* = Re_b b / L
    heat_transfer_coefficient: float
    fin_efficiency: float
    surface_efficiency: float
    sink_resistance: float
    spreading_resistance: float
    base_conduction_resistance: float
    base_temperature: float
    junction_temperature: float
    pressure_drop: float


def _props(temperature, pressure):
    p = air_properties(float(temperature), float(pressure))
    return {name: float(getattr(p, name)) for name in p._fields}


def fin_spacing(d: Design) -> float:
    """Clear gap b = (W - N t)/(N - 1) [m]."""
    return (d.base_width - d.fin_count * d.fin_thickness) / (d.fin_count - 1)


def open_area_ratio(d: Design) -> float:
    """sigma = (N - 1) b / W [-] (docs/methods.md e1)."""
    return (d.fin_count - 1) * fin_spacing(d) / d.base_width


def channel_velocity(d: Design, volume_flow: float) -> float:
    """Mean velocity between the fins V = Q / ((N - 1) b H) [m/s]."""
    return volume_flow / ((d.fin_count - 1) * fin_spacing(d) * d.fin_height)


def hydraulic_diameter(d: Design) -> float:
    """Fully shrouded channel D_h = 2 b H / (b + H) [m]."""
    b = fin_spacing(d)
    return 2.0 * b * d.fin_height / (b + d.fin_height)


def nusselt_teertstra(re_star: float, prandtl: float) -> float:
    """Teertstra et al. (1999) composite channel Nusselt number on the spacing [-]."""
    fully_developed = re_star * prandtl / 2.0
    developing = (
        0.664
        * math.sqrt(re_star)
        * prandtl ** (1.0 / 3.0)
        * math.sqrt(1.0 + 3.65 / math.sqrt(re_star))
    )
    return (fully_developed**-3 + developing**-3) ** (-1.0 / 3.0)


def fanning_fre_rectangular(aspect: float) -> float:
    """Shah & London fully developed f Re_Dh, rectangular duct, aspect = short/long [-]."""
    a = aspect
    return 24.0 * (1.0 - 1.3553 * a + 1.9467 * a**2 - 1.7012 * a**3 + 0.9564 * a**4 - 0.2537 * a**5)


def fanning_apparent(d: Design, reynolds_dh: float) -> float:
    """Apparent Fanning friction factor, developing laminar flow (composite with 3.44) [-]."""
    b = fin_spacing(d)
    aspect = min(b, d.fin_height) / max(b, d.fin_height)
    l_star = d.base_length / (hydraulic_diameter(d) * reynolds_dh)
    f_re = fanning_fre_rectangular(aspect)
    return math.sqrt((3.44 / math.sqrt(l_star)) ** 2 + f_re**2) / reynolds_dh


def loss_coefficients(
    sigma: float, loss_model: str, contraction: str = "rennels"
) -> tuple[float, float]:
    """Entrance (K_c) and exit (K_e) coefficients on the channel velocity head [-]."""
    if loss_model == "culham_muzychka":
        return 0.42 * (1.0 - sigma**2), (1.0 - sigma**2) ** 2
    if loss_model == "kays_london":
        jet = 1.0 + 0.622 * (1.0 - 0.215 * sigma - 0.785 * sigma**2.5)  # 1/C_c
        k_c = (jet - 1.0) ** 2
        if contraction == "rennels":
            k_c += 0.0696 * (1.0 - sigma**2.5) * jet**2
        return k_c, (1.0 - sigma) ** 2
    raise ValueError(f"loss_model={loss_model!r}")


def pressure_drop(
    d: Design,
    volume_flow: float,
    inlet_temperature: float,
    pressure: float,
    loss_model: str = "kays_london",
    contraction: str = "rennels",
) -> float:
    """Static pressure drop across the fins at inlet density and viscosity [Pa]."""
    air = _props(inlet_temperature, pressure)
    v = channel_velocity(d, volume_flow)
    dh = hydraulic_diameter(d)
    re_dh = v * dh / air["kinematic_viscosity"]
    f_app = fanning_apparent(d, re_dh)
    k_c, k_e = loss_coefficients(open_area_ratio(d), loss_model, contraction)
    return (k_c + 4.0 * f_app * d.base_length / dh + k_e) * air["density"] * v**2 / 2.0


def convection(d: Design, volume_flow: float, film_temperature: float, pressure: float) -> dict:
    """h, fin and surface efficiency and R_sink with properties at the film temperature."""
    air = _props(film_temperature, pressure)
    b = fin_spacing(d)
    v = channel_velocity(d, volume_flow)
    re_b = v * b / air["kinematic_viscosity"]
    re_star = re_b * b / d.base_length
    h = nusselt_teertstra(re_star, air["prandtl"]) * air["thermal_conductivity"] / b
    m = math.sqrt(2.0 * h / (d.conductivity * d.fin_thickness))
    mh = m * d.fin_height
    eta_f = math.tanh(mh) / mh
    # Wetted fin faces: two per channel, N - 1 channels. The outer faces of the end fins touch
    # the shroud's side walls in this fully shrouded model, so no air reaches them.
    a_fins = 2.0 * (d.fin_count - 1) * d.fin_height * d.base_length
    a_base = (d.fin_count - 1) * b * d.base_length
    a_total = a_fins + a_base
    eta_o = 1.0 - a_fins / a_total * (1.0 - eta_f)
    return {
        "re_b": re_b,
        "re_star": re_star,
        "h": h,
        "eta_f": eta_f,
        "eta_o": eta_o,
        "r_sink": 1.0 / (eta_o * h * a_total),
    }


def spreading_song_lee_au(d: Design, sink_resistance: float) -> float:
    """Average source spreading resistance, Song, Lee & Au, R_0 = R_sink [K/W]."""
    plate_area = d.base_width * d.base_length
    a = math.sqrt(d.footprint_length * d.footprint_width / math.pi)
    b = math.sqrt(plate_area / math.pi)
    eps = a / b
    tau = d.base_thickness / b
    h_eff = 1.0 / (sink_resistance * plate_area)
    biot = h_eff * b / d.conductivity
    lam = math.pi + 1.0 / (eps * math.sqrt(math.pi))
    th = math.tanh(lam * tau)
    phi = (th + lam / biot) / (1.0 + lam / biot * th)
    psi_avg = 0.5 * (1.0 - eps) ** 1.5 * phi
    return psi_avg / (math.sqrt(math.pi) * d.conductivity * a)


def spreading_series(d: Design, sink_resistance: float, terms: int = 600) -> float:
    """Average source spreading resistance, exact rectangular series (docs/methods.md i2) [K/W].

    Yovanovich, Muzychka & Culham (1999): isoflux 2a x 2b source centred on a 2c x 2d plate,
    uniform h = 1/(R_0 A_plate) on the cooled face. Written here from docs/methods.md i2 with a
    fixed, generous number of terms (600 per index: converged to about 0.02 % for these
    designs); numpy is used only to sum the double series.
    """
    import numpy as np

    a, b = d.footprint_length / 2.0, d.footprint_width / 2.0
    c, dd = d.base_length / 2.0, d.base_width / 2.0
    t, k = d.base_thickness, d.conductivity
    h = 1.0 / (sink_resistance * d.base_width * d.base_length)

    def phi(z):
        th = np.tanh(z * t)
        return (z + h / k * th) / (z * th + h / k)

    n = np.arange(1, terms + 1, dtype=float)
    delta, lam = n * np.pi / c, n * np.pi / dd
    beta = np.sqrt(delta[:, None] ** 2 + lam[None, :] ** 2)
    s1 = np.sum(np.sin(a * delta) ** 2 * phi(delta) / delta**3) / (2 * a**2 * c * dd * k)
    s2 = np.sum(np.sin(b * lam) ** 2 * phi(lam) / lam**3) / (2 * b**2 * c * dd * k)
    s3 = np.sum(
        np.sin(a * delta)[:, None] ** 2
        * np.sin(b * lam)[None, :] ** 2
        * phi(beta)
        / (delta[:, None] ** 2 * lam[None, :] ** 2 * beta)
    ) / (a**2 * b**2 * c * dd * k)
    return float(s1 + s2 + s3)


def solve_given_flow(
    d: Design,
    volume_flow: float,
    power: float,
    inlet_temperature: float,
    pressure: float = 101325.0,
    loss_model: str = "kays_london",
    contraction: str = "rennels",
) -> ThermalResult:
    """Node temperatures of one design at a given inlet volume flow and power."""

    def residual(base_temperature):
        film = 0.5 * (inlet_temperature + base_temperature)
        conv = convection(d, volume_flow, film, pressure)
        return base_temperature - inlet_temperature - power * conv["r_sink"]

    if power > 0.0:
        # upper bracket: film temperature at the top of the air-property table (500 K)
        t_upper = 2.0 * 499.0 - inlet_temperature
        t_base = brentq(residual, inlet_temperature, t_upper, xtol=1e-11, rtol=1e-14)
    else:
        t_base = inlet_temperature
    conv = convection(d, volume_flow, 0.5 * (inlet_temperature + t_base), pressure)
    r_sp = spreading_series(d, conv["r_sink"])
    r_base = d.base_thickness / (d.conductivity * d.base_width * d.base_length)
    r_total = (
        d.junction_to_case_resistance + d.interface_resistance + r_sp + r_base + conv["r_sink"]
    )
    return ThermalResult(
        power=power,
        volume_flow=volume_flow,
        channel_velocity=channel_velocity(d, volume_flow),
        reynolds_spacing=conv["re_b"],
        reynolds_modified=conv["re_star"],
        heat_transfer_coefficient=conv["h"],
        fin_efficiency=conv["eta_f"],
        surface_efficiency=conv["eta_o"],
        sink_resistance=conv["r_sink"],
        spreading_resistance=r_sp,
        base_conduction_resistance=r_base,
        base_temperature=t_base,
        junction_temperature=inlet_temperature + power * r_total,
        pressure_drop=pressure_drop(
            d, volume_flow, inlet_temperature, pressure, loss_model, contraction
        ),
    )


def fan_operating_flow(
    d: Design,
    fan_volume_flow,
    fan_static_pressure,
    inlet_temperature: float,
    pressure: float = 101325.0,
    loss_model: str = "kays_london",
    contraction: str = "rennels",
) -> float:
    """Volume flow where the density-scaled PCHIP fan curve meets the sink's dp [m3/s]."""
    rho = _props(inlet_temperature, pressure)["density"]
    curve = PchipInterpolator(list(fan_volume_flow), list(fan_static_pressure))
    q_free = float(fan_volume_flow[-1])

    def residual(q):
        fan = float(curve(q)) * rho / FAN_RATING_DENSITY
        return fan - pressure_drop(d, q, inlet_temperature, pressure, loss_model, contraction)

    return brentq(residual, 1e-9 * q_free, q_free, xtol=1e-14, rtol=1e-13)


def allowable_power(
    d: Design,
    volume_flow: float,
    limit_temperature: float,
    inlet_temperature: float,
    pressure: float = 101325.0,
    node: str = "junction",
) -> float:
    """Power that puts ``node`` ("junction" or "case") exactly at ``limit_temperature`` [W]."""

    def residual(power):
        res = solve_given_flow(d, volume_flow, power, inlet_temperature, pressure)
        temperature = res.junction_temperature
        if node == "case":
            temperature -= power * d.junction_to_case_resistance
        return temperature - limit_temperature

    upper = 10.0
    while residual(upper) < 0.0:
        upper *= 4.0
    return brentq(residual, 0.0, upper, xtol=1e-10, rtol=1e-13)
