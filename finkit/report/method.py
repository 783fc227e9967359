"""The method, the equations, assumptions, warnings and the cautions of a note.

Part of the note sections (:mod:`finkit.report`); no physics: every number comes from
:mod:`finkit.model`.
"""

from __future__ import annotations

from typing import Any

from finkit.report import present
from finkit.report.ahead import shareable
from finkit.report.flow_situations import (
    free_convection_credit,
    free_convection_method,
    free_stream_method,
    several_sources_method,
)
from finkit.report.formatting import (
    _R,
    H_SCATTER,
    _air,
    _bullets,
    _c,
    _f,
    _is_fan,
    _is_free_stream,
    _is_heat_sink,
    _is_natural,
    _is_plate,
    _join,
    _numbered,
    _q,
    _review_of,
)

__all__ = [
    "assumptions",
    "cautions",
    "method_section",
    "references",
    "warnings_section",
]


# --------------------------------------------------------------------------------------------
# Method, assumptions, warnings


_REFS = {
    "incropera": "Incropera, F.P., DeWitt, D.P., Bergman, T.L., Lavine, A.S., Fundamentals of "
    "Heat and Mass Transfer, 6th ed., Wiley, 2007 (fins: section 3.6, Tables 3.4 and 3.5; "
    "radiation exchange: chapter 13).",
    "teertstra": "Teertstra, P., Yovanovich, M.M., Culham, J.R., Lemczyk, T., Analytical forced "
    "convection modeling of plate fin heat sinks, Proc. 15th IEEE SEMI-THERM Symposium, 1999, "
    "pp. 34-41.",
    "vdi": "VDI Heat Atlas, 2nd ed., Springer, 2010, ch. G1 (Gnielinski, V.); VDI-Wärmeatlas, "
    "9th ed., 2002, sec. Gb 7 (plane gap).",
    "gnielinski": "Gnielinski, V., New equations for heat and mass transfer in turbulent pipe and "
    "channel flow, Int. Chem. Eng. 16, 359-368, 1976.",
    "shah_london": "Shah, R.K., London, A.L., Laminar Flow Forced Convection in Ducts, Academic "
    "Press, 1978.",
    "muzychka": "Muzychka, Y.S., Yovanovich, M.M., Pressure drop in laminar developing flow in "
    "noncircular ducts: a scaling and modeling approach, J. Fluids Eng. 131(11), 111105, 2009.",
    "kays_london": "Kays, W.M., London, A.L., Compact Heat Exchangers, 3rd ed., McGraw-Hill, "
    "1984, ch. 5 (entrance and exit losses; effectiveness-NTU).",
    "rennels": "Rennels, D.C., Hudson, H.M., Pipe Flow: A Practical and Comprehensive Guide, "
    "Wiley, 2012 (jet contraction ratio).",
    "culham_muzychka": "Culham, J.R., Muzychka, Y.S., Optimization of plate fin heat sinks using "
    "entropy generation minimization, IEEE Trans. Comp. Pack. Technol. 24(2), 159-165, 2001.",
    "zukauskas": "Zukauskas, A., Heat transfer from tubes in crossflow, Advances in Heat "
    "Transfer 8, 93-160, 1972; Zukauskas, A., Convective heat transfer in cross flow, in Kakac, "
    "Shah & Aung (eds.), Handbook of Single-Phase Convective Heat Transfer, Wiley, 1987.",
    "gaddis": "Gaddis, E.S., Gnielinski, V., Pressure drop in cross flow across tube bundles, "
    "Int. Chem. Eng. 25(1), 1-15, 1985 (also VDI Heat Atlas, 2nd ed., 2010, ch. L1).",
    "bar_cohen": "Bar-Cohen, A., Rohsenow, W.M., Thermally optimum spacing of vertical, natural "
    "convection cooled, parallel plates, J. Heat Transfer 106(1), 116-123, 1984.",
    "elenbaas": "Elenbaas, W., Heat dissipation of parallel plates by free convection, Physica "
    "9(1), 1-28, 1942.",
    "jones_smith": "Jones, C.D., Smith, L.F., Optimum arrangement of rectangular fins on "
    "horizontal surfaces for free-convection heat transfer, J. Heat Transfer 92(1), 6-10, 1970.",
    "churchill_chu": "Churchill, S.W., Chu, H.H.S., Correlating equations for laminar and "
    "turbulent free convection from a vertical plate, Int. J. Heat Mass Transfer 18, "
    "1323-1329, 1975.",
    "vdi_bank": "Gnielinski, V., Heat transfer in cross-flow around single rows of tubes and "
    "through tube bundles, in VDI Heat Atlas, 2nd ed., Springer, 2010, ch. G7.",
    "song_lee_au": "Song, S., Lee, S., Au, V., Closed-form equation for thermal constriction/"
    "spreading resistances with variable resistance boundary condition, Proc. IEPS Conference, "
    "1994, pp. 111-121.",
    "yovanovich_series": "Yovanovich, M.M., Muzychka, Y.S., Culham, J.R., Spreading resistance "
    "of isoflux rectangles and strips on compound flux channels, J. Thermophys. Heat Transfer "
    "13(4), 495-500, 1999.",
    "muzychka_eccentric": "Muzychka, Y.S., Culham, J.R., Yovanovich, M.M., Thermal spreading "
    "resistance of eccentric heat sources on rectangular flux channels, J. Electronic Packaging "
    "125(2), 178-185, 2003.",
    "muzychka_orthotropic": "Muzychka, Y.S., Culham, J.R., Yovanovich, M.M., Thermal spreading "
    "resistance in compound and orthotropic systems, J. Thermophys. Heat Transfer 18(1), 45-51, "
    "2004.",
    "atmosphere": "U.S. Standard Atmosphere, 1976, NOAA/NASA/USAF, Washington DC, 1976; "
    "ISO 2533:1975 Standard Atmosphere.",
    "coolprop": "Bell, I.H., Wronski, J., Quoilin, S., Lemort, V., Pure and pseudo-pure fluid "
    "thermophysical property evaluation and the open-source thermophysical property library "
    "CoolProp, Ind. Eng. Chem. Res. 53(6), 2498-2508, 2014 (dry air, tabulated by finkit).",
    "bypass": "Lee, S., Optimum design and selection of heat sinks, IEEE Trans. CPMT-A 18(4), "
    "812-817, 1995 (flow bypass as parallel branches at one pressure difference).",
    "churchill_mixed": "Churchill, S.W., A comprehensive correlating equation for laminar, "
    "assisting, forced and free convection, AIChE J. 23(1), 10-16, 1977 (with Incropera et al., "
    "6th ed., section 9.9, Eq. 9.64).",
    "simons_schmidt": "Simons, R.E., Schmidt, R.R., A simple method to estimate heat sink air "
    "flow bypass, Electronics Cooling 3(2), 36-37, 1997.",
}


def _orientation(result) -> str:
    """The still-air orientation of a natural-convection case (``NaturalConvection``)."""
    return getattr(result.inputs.flow, "orientation", "vertical-fins")


def _reference_keys(result) -> list[str]:
    if not _is_heat_sink(result):
        return ["incropera"]
    opts = result.inputs.options
    keys = []
    if _is_natural(result) and _orientation(result) == "horizontal-base-fins-up":
        keys += ["jones_smith", "incropera"]
    elif _is_natural(result):
        method = getattr(opts, "natural_channel_method", "bar_cohen_rohsenow")
        keys += ["bar_cohen" if method == "bar_cohen_rohsenow" else "elenbaas", "churchill_chu"]
        keys += ["incropera"]
    elif _is_plate(result):
        if opts.plate_channel_method in ("teertstra", "lower"):
            keys += ["teertstra"]
        if opts.plate_channel_method in ("vdi", "lower"):
            keys += ["vdi", "gnielinski"]
        keys += ["shah_london", "muzychka"]
        keys += (
            ["kays_london", "rennels"] if opts.loss_model == "kays_london" else ["culham_muzychka"]
        )
        keys += ["incropera"]
    else:
        method = getattr(opts, "pin_bank_method", "lower")
        keys += ["zukauskas"] if method in ("zukauskas", "lower") else []
        keys += ["vdi_bank"] if method in ("gnielinski", "lower") else []
        keys += ["gaddis", "kays_london", "incropera"]
    if not _is_natural(result) and result.inputs.bypass is not None:
        keys.append("bypass")
        if _is_free_stream(result):
            keys.append("simons_schmidt")
    credit = free_convection_credit(result)
    if credit is not None and credit.orientation == "horizontal-base-fins-up":
        keys += ["churchill_mixed", "jones_smith", "incropera"]
    elif credit is not None:
        keys += ["churchill_mixed", "bar_cohen", "churchill_chu", "incropera"]
    keys += ["yovanovich_series"]
    if getattr(result.inputs, "sources", None) is not None:
        keys += ["muzychka_eccentric", "muzychka_orthotropic"]
    keys += ["atmosphere", "coolprop"]
    return list(dict.fromkeys(keys))


def _cite(result, key: str) -> str:
    return f"[{_reference_keys(result).index(key) + 1}]"


def references(result) -> present.Fragment:
    """The numbered reference list of the method section (only the sources this case uses).

    Parameters
    ----------
    result : finkit.model.CaseResult
        The solved case. [-]

    Returns
    -------
    present.Fragment
        An ordered list of full citations. [-]
    """
    return _join(
        present.heading("References", 3), _numbered(_REFS[k] for k in _reference_keys(result))
    )


@shareable
def method_section(result) -> present.Fragment:
    """How the numbers were obtained: the thermal chain and each correlation used, cited.

    Which paragraphs appear depends on the case: plate or pin fins, forced (given flow or fan)
    or natural convection, bypass, the channel and loss models chosen in the model options.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        Paragraphs, equations (offline SVG) and the reference list. [-]
    """
    # Long by design: the note's method text in reading order, one paragraph or equation per step;
    # splitting it would scatter one page of prose over many functions.
    cite = lambda key: _cite(result, key)  # noqa: E731 - local shorthand
    opts = result.inputs.options
    parts: list[Any] = [
        present.text(
            f"The heat flows from the junction to the {_air(result)} through a chain of "
            "resistances in series: junction to case (from the device data), the interface "
            "material, spreading from the source footprint into the base, one-dimensional "
            "conduction through the base, and the sink (fins and exposed base to the air). The "
            f"sink resistance is referred to the {_air(result)} temperature and includes the "
            "heating of the air along "
            "the sink."
        ),
        present.equation(
            r"T_j = T_{in} + Q\,\left(R_{jc} + R_{int} + R_{sp} + R_{base} + R_{sink}\right)"
        ),
        present.text(
            "Two questions are answered with the same equations: the node temperatures at the "
            "stated power, and the allowable power, the power at which the limit node reaches "
            "the limit less the required margin."
        ),
        *several_sources_method(result, cite),
        present.heading("Air", 3),
        present.text(
            f"Dry air. The pressure is that of the standard atmosphere at the stated altitude "
            f"{cite('atmosphere')}; the temperature is the stated {_air(result)} temperature, "
            "not the standard-atmosphere one. Properties (density, viscosity, conductivity, "
            f"specific heat, Prandtl number) come from CoolProp {cite('coolprop')}, tabulated and "
            "interpolated by finkit."
        ),
    ]
    if _is_natural(result) and _orientation(result) == "horizontal-base-fins-up":
        parts += [
            present.heading("Natural convection from plate fins on a horizontal base, fins up", 3),
            present.text(
                "The base is horizontal and the fins stand up from it; air is drawn in over the "
                "open ends and sides of the fin channels and leaves upward. Every convecting "
                "surface (fin faces, fin tips, the base between and beside the fins) uses the "
                f"array correlation of Jones & Smith {cite('jones_smith')}, built on the fin "
                "spacing S, properties at the film temperature:"
            ),
            present.equation(
                r"Nu_S = \dfrac{h\,S}{k_a} = 6.7\times10^{-4}\,Ra_S\left[1 - \exp\left(-"
                r"\left(\dfrac{7640}{Ra_S}\right)^{0.44}\right)\right]^{1.7},\quad Ra_S = "
                r"\dfrac{g\,\beta\,(T_b - T_{in})\,S^3}{\nu\,\alpha}"
            ),
            present.text(
                "Validity: 200 ≤ Ra_S ≤ 6×10^5 (air), isothermal fins; a case outside it gets a "
                "warning. The correlation has no fin height or length in it. Its constants "
                "were recalled from the source, not read from it; for large Ra_S it reduces to "
                "0.54 Ra^(1/4), the law of an upward-facing heated plate, which supports them. "
                "There is no second accepted correlation for this orientation in finkit, so no "
                "model-form spread is shown. Radiation leaves the array through the channel "
                "openings (each channel a two-surface enclosure with an effective emissivity) "
                "and from the outer surfaces, at the mean surface temperature, to surroundings "
                f"at the stated temperature {cite('incropera')}. Because h depends on the base "
                "temperature, the heat balance is solved for the base temperature by a "
                "bracketed root search."
            ),
        ]
    elif _is_natural(result):
        method = getattr(opts, "natural_channel_method", "bar_cohen_rohsenow")
        parts += [
            present.heading("Natural convection from vertical plate fins", 3),
            present.text(
                "The channels between the fins (and the base between them) use the composite "
                "correlation for symmetric isothermal vertical parallel plates "
                + (
                    f"of Bar-Cohen & Rohsenow {cite('bar_cohen')}"
                    if method == "bar_cohen_rohsenow"
                    else f"of Elenbaas {cite('elenbaas')}"
                )
                + ", with the Elenbaas number built on the fin spacing S and the fin length L "
                "in the vertical direction, properties at the film temperature:"
            ),
            present.equation(
                r"Nu_S = \dfrac{h\,S}{k_a} = \left[\dfrac{576}{El^2} + \dfrac{2.87}{El^{1/2}}"
                r"\right]^{-1/2},\quad El = Ra_S\,\dfrac{S}{L},\quad Ra_S = \dfrac{g\,\beta\,"
                r"(T_b - T_{in})\,S^3}{\nu\,\alpha}"
                if method == "bar_cohen_rohsenow"
                else r"Nu_S = \dfrac{El}{24}\left[1 - e^{-35/El}\right]^{3/4}"
            ),
            present.text(
                f"The outer faces of the two end fins use the vertical-plate correlation of "
                f"Churchill & Chu {cite('churchill_chu')}. Radiation leaves the array through the "
                "channel openings (each channel a two-surface enclosure with an effective "
                "emissivity) and from the outer surfaces, at the mean surface temperature, to "
                f"surroundings at the stated temperature {cite('incropera')}. Because h depends "
                "on the base temperature, the heat balance is solved for the base temperature by "
                "a bracketed root search."
            ),
        ]
    elif _is_plate(result):
        channel = opts.plate_channel_method
        parts.append(present.heading("Forced convection in the fin channels", 3))
        teertstra = [
            present.text(
                f"The laminar-developing model is the composite of Teertstra et al. "
                f"{cite('teertstra')}, on the channel Reynolds number built on the fin "
                "spacing b and the channel velocity, reduced by b/L. Its h is referred to "
                "the inlet air: the heating of the air along the channel is inside it."
            ),
            present.equation(
                r"Nu_b = \dfrac{h\,b}{k_a} = \left[\left(\dfrac{Re_b^{*}\,Pr}{2}\right)^{-3}"
                r" + \left(0.664\,\sqrt{Re_b^{*}}\,Pr^{1/3}\sqrt{1+\dfrac{3.65}"
                r"{\sqrt{Re_b^{*}}}}\right)^{-3}\right]^{-1/3},\quad Re_b^{*} = "
                r"\dfrac{V_{ch}\,b}{\nu}\,\dfrac{b}{L}"
            ),
        ]
        vdi = present.text(
            f"The second model is the VDI plane-gap correlation {cite('vdi')}: laminar "
            "developing flow, the transition interpolation between Re = 2300 and 10^4 on the "
            f"gap diameter 2b, and the Gnielinski turbulent equation {cite('gnielinski')}; its "
            "h is referred to the local bulk air, so the air heating is taken into account by "
            f"effectiveness-NTU for an isothermal base {cite('kays_london')}."
        )
        if channel == "lower":
            parts += [
                present.text(
                    "Two accepted models are evaluated and the one giving the higher sink "
                    "resistance (less heat transfer) is used, design by design. Near and above "
                    "Re_Dh = 2300 they bracket the channel flow: a heat-sink channel is far "
                    "shorter than the laminar entry length 0.05 Re_Dh D_h, so its boundary "
                    "layers are still developing and laminar, unless an upstream fan trips "
                    "them into transition. Taking the lower heat transfer is finkit's "
                    "conservative choice; the correlation spread shows both."
                ),
                *teertstra,
                vdi,
            ]
        elif channel == "teertstra":
            parts += [*teertstra]
        else:
            parts.append(vdi)
        parts.append(
            present.text(
                "The outer faces of the two end fins are not counted: the flow model sends "
                "air only through the channels between fins (conservative)."
            )
        )
        parts.append(
            present.equation(
                r"\varepsilon = 1 - e^{-NTU},\quad NTU = \dfrac{\eta_o\,h\,A_t}{\dot m\,c_p},"
                r"\quad R_{sink} = \dfrac{1}{\varepsilon\,\dot m\,c_p}\ \ \mathrm{(bulk\ h)},"
                r"\quad R_{sink} = \dfrac{1}{\eta_o\,h\,A_t}\ \ \mathrm{(inlet\ h)}"
            )
        )
    else:
        parts += [
            present.heading("Forced convection across the pin array", 3),
            present.text(
                {
                    "lower": "Two accepted tube-bank correlations are evaluated and the lower h "
                    "is used, design by design (finkit's conservative choice; neither was "
                    "fitted to short pins on a heated base, and the correlation spread shows "
                    "both). ",
                    "zukauskas": "",
                    "gnielinski": "",
                }[getattr(opts, "pin_bank_method", "lower")]
                + f"Zukauskas {cite('zukauskas')} works on the Reynolds number at the largest "
                "velocity between pins, with the row correction C2 for fewer than 20 rows and "
                "the property-ratio factor (Pr/Pr_s)^1/4 taken as 1 for air. Its published "
                "table steps where its constants change (up to 27 %); finkit joins "
                "neighbouring branches over a factor 1.4 in Re_D,max on the side where the "
                "table is higher, so h is continuous and never above the table. Gnielinski "
                f"{cite('vdi_bank')} treats each pin as a body streamed over half its "
                "circumference, l = pi D/2, at the velocity in the void fraction psi, with an "
                "arrangement factor f_A and a row factor for fewer than 10 rows. The base "
                "between the pins uses the laminar flat-plate mean coefficient "
                f"{cite('incropera')}. The h is referred to the local bulk air, so the air "
                "heating is taken into account by effectiveness-NTU for an isothermal base "
                f"{cite('kays_london')}."
            ),
            present.equation(
                r"Nu_D = C\,C_2(N_L)\,Re_{D,max}^{\,m}\,Pr^{0.36},\quad Nu_l = f_A\left[0.3"
                r" + \sqrt{Nu_{lam}^2 + Nu_{turb}^2}\right],\quad Re_{\psi,l} = "
                r"\dfrac{V\,l}{\psi\,\nu}"
            ),
            present.equation(
                r"\varepsilon = 1 - e^{-NTU},\quad NTU = \dfrac{\eta_o\,h\,A_t}{\dot m\,c_p}"
            ),
        ]
    # Fin efficiency (all)
    if _is_plate(result):
        parts += [
            present.heading("Fin and surface efficiency", 3),
            present.text(
                "Each fin is a one-dimensional fin of uniform thickness t with the area-mean h, "
                "adiabatic at the tip on the corrected length L_c = H + t/2"
                + (
                    f" {cite('incropera')}, since the tips see the still air."
                    if _is_natural(result)
                    else " when the tip sees the air (a gap above the tips) and on the real "
                    f"height H when a shroud touches the tips {cite('incropera')}."
                )
                + " The fins and the exposed base together give the surface efficiency:"
            ),
            present.equation(
                r"\eta_f = \dfrac{\tanh(m L_c)}{m L_c},\quad m = \sqrt{\dfrac{2h}{k\,t}},"
                r"\quad \eta_o = 1 - \dfrac{A_f}{A_t}\,(1 - \eta_f)"
            ),
        ]
    else:
        parts += [
            present.heading("Pin and surface efficiency", 3),
            present.text(
                "Each pin is a one-dimensional fin of diameter D, adiabatic at the tip on the "
                "corrected length L_c = H + D/4 when the tip sees the air and on H when a "
                f"shroud touches the tips {cite('incropera')}."
            ),
            present.equation(
                r"\eta_f = \dfrac{\tanh(m L_c)}{m L_c},\quad m = \sqrt{\dfrac{4h}{k\,D}},"
                r"\quad \eta_o = 1 - \dfrac{N A_f}{A_t}\,(1 - \eta_f)"
            ),
        ]
    if not _is_natural(result):
        parts.append(present.heading("Pressure drop, bypass and operating point", 3))
        if _is_plate(result):
            loss = (
                f"Kays & London {cite('kays_london')} (jet contraction ratio from Rennels & "
                f"Hudson {cite('rennels')})"
                if opts.loss_model == "kays_london"
                else f"Culham & Muzychka {cite('culham_muzychka')}"
            )
            parts += [
                present.text(
                    "The pressure drop across the fins adds the entrance contraction, the "
                    "developing-flow apparent friction in the rectangular channels (Shah & "
                    f"London {cite('shah_london')}, composite form of Muzychka & Yovanovich "
                    f"{cite('muzychka')}; Fanning friction factor) and the exit expansion, with "
                    f"loss coefficients from {loss}:"
                ),
                present.equation(
                    r"\Delta p = \left[K_c + 4 f_{app}\,\dfrac{L}{D_h} + K_e\right]\,"
                    r"\dfrac{\rho\,V_{ch}^2}{2}"
                ),
            ]
        else:
            parts.append(
                present.text(
                    "The pressure drop across the pin array follows Gaddis & Gnielinski "
                    f"{cite('gaddis')} (laminar and turbulent parts, in-line or staggered)."
                )
            )
        flow_text = "Pressure drop and fan use the inlet air density and viscosity. "
        if _is_free_stream(result):
            parts += free_stream_method(cite)
            flow_text = "Pressure drop uses the inlet air density and viscosity. "
        elif result.inputs.bypass is not None:
            flow_text += (
                "With clearance between the sink and the duct, the flow splits between the fins "
                "and the gaps so that both branches see the same pressure difference "
                f"{cite('bypass')}. "
            )
        if _is_fan(result):
            flow_text += (
                "The fan curve, scaled from its rating density to the inlet air density (fan "
                "laws: at a given speed and volume flow the pressure is proportional to the "
                "density), is crossed with this system curve to give the operating point."
            )
        else:
            flow_text += "The volume flow is given in the case file."
        parts.append(present.text(flow_text))
        parts += free_convection_method(result, cite)
    parts += [
        present.heading("Spreading and base conduction", 3),
        present.text(
            "The source is centred on the base. Spreading from its footprint (2a x 2b) into "
            "the base (2c x 2d), with the sink resistance as a uniform coefficient "
            "h = 1/(R_sink A_base) on the finned face, follows the exact series for an isoflux "
            f"rectangle on a rectangular plate {cite('yovanovich_series')}, summed to 4 terms "
            "per plate-to-source edge ratio (within 0.5 % of the converged series). It gives "
            "both the footprint mean (R_sp, used for the case and junction) and the footprint "
            "centre, the hottest point of the base (the base limit node and touch check):"
        ),
        present.equation(
            r"R_{sp} = \dfrac{1}{2a^2cdk}\sum_m \dfrac{\sin^2(a\delta_m)\,\phi(\delta_m)}"
            r"{\delta_m^3} + \dfrac{1}{2b^2cdk}\sum_n \dfrac{\sin^2(b\lambda_n)\,"
            r"\phi(\lambda_n)}{\lambda_n^3} + \dfrac{1}{a^2b^2cdk}\sum_m\sum_n "
            r"\dfrac{\sin^2(a\delta_m)\sin^2(b\lambda_n)\,\phi(\beta_{mn})}"
            r"{\delta_m^2\lambda_n^2\beta_{mn}}"
        ),
        present.equation(
            r"\delta_m = \dfrac{m\pi}{c},\quad \lambda_n = \dfrac{n\pi}{d},\quad "
            r"\beta_{mn} = \sqrt{\delta_m^2+\lambda_n^2},\quad \phi(z) = "
            r"\dfrac{z + (h/k)\tanh(z t_b)}{z\tanh(z t_b) + h/k}"
        ),
        present.text(
            "The one-dimensional base resistance is t_b/(k A_base); the interface resistance is "
            "the area-specific resistance (or bond-line thickness over conductivity) over the "
            "footprint area."
        ),
        references(result),
    ]
    return _join(*parts)


def assumptions(result) -> present.Fragment:
    """The modelling assumptions of this heat-sink case, as a list.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        A bulleted list. [-]
    """
    items = [
        (
            "Steady state at the stated power for every steady check; the transient section "
            "states its own assumptions."
            if getattr(result, "transient", None) is not None
            else "Steady state at the stated power; no transients, no power cycling."
        ),
        "All the power leaves through the heat sink: no heat through the board or the "
        "enclosure (conservative for the junction).",
        (
            "Each source's junction-to-case resistance is taken from its device data for the "
            "heat-flow path into the sink."
            if getattr(result.inputs, "sources", None) is not None
            else f"Junction to case {_q(_f(result.solution.junction_to_case_resistance), *_R)} "
            "is taken from the device data for the heat-flow path into the sink."
        ),
        (
            "Each source heats its footprint uniformly where it sits on the base; the base "
            "field is the superposition of every source's spreading solution with a uniform "
            "coefficient on the finned face. The case and junction of each source sit on the "
            "base temperature averaged over its footprint; the highest base temperature over "
            "the footprint is its base limit node, and the hottest of all is the base touch "
            "temperature."
            if getattr(result.inputs, "sources", None) is not None
            else "The source is centred on the base and heats its footprint uniformly. The case "
            "and junction sit on the base temperature averaged over the footprint; the centre "
            "of the footprint, the hottest point of the base, is reported too and is the base "
            "limit node and the base touch temperature (spreading resistance to the centre from "
            "the exact rectangular series)."
        ),
        "Fins are one-dimensional (temperature uniform across the fin thickness or pin "
        "section), with a uniform heat transfer coefficient over their surface, a constant "
        "conductivity, and an isothermal base at the mean base temperature (fin-efficiency "
        "model).",
        (
            "Dry still air at the stated ambient temperature"
            if _is_natural(result)
            else "Dry air at the stated inlet temperature, uniform over the inlet"
        )
        + ", at the pressure of the standard atmosphere at the stated altitude.",
        "Material conductivity and finish emissivity are constant, taken from the finkit "
        "material table unless the case file overrides them.",
    ]
    if _is_natural(result):
        items += [
            (
                "Horizontal base facing up with the fins standing up from it, in still air, "
                "free to draw air in over the open fin ends and sides and release it above"
                if _orientation(result) == "horizontal-base-fins-up"
                else "Vertical base with vertical fins in still air, free to draw air from "
                "below and release it above"
            )
            + "; no enclosure walls, chimney or neighbouring heat sources.",
            "Air properties for convection at the film temperature (ambient air and base mean).",
            "Radiation from an isothermal sink at its mean surface temperature to surroundings "
            "at the stated surroundings temperature.",
        ]
    else:
        items += [
            "Air properties for heat transfer at the film temperature (inlet air and mean "
            "base), iterated with the solution; pressure drop and fan at the inlet air density "
            "and viscosity.",
            "Radiation is credited beside the weak forced flow, as the case asks."
            if getattr(free_convection_credit(result), "radiation", False)
            else "Radiation is not credited in forced convection (conservative; usually below "
            "about 10 % of the heat).",
            "Free convection is credited beside the weak forced flow (Churchill's combination, "
            "n = 3), as the case asks."
            if free_convection_credit(result) is not None
            else "Free convection is not credited beside the forced flow (conservative where "
            "buoyancy aids the flow; a warning says when it is not negligible).",
            "Pressure drop of the sink only (and its bypass): no filter, grille, bend or "
            "enclosure loss unless the model options add one.",
        ]
        if _is_free_stream(result):
            items.append(
                "Free stream: the approach velocity is that of the undisturbed stream at the "
                "sink (over the fin height, outside the board's boundary layer and any upstream "
                "wake); the bypass region is unbounded and the wake suction behind the sink is "
                "not credited (both conservative); no air is taken to leak out of the open fin "
                "tops along the flow (optimistic for long sinks); expect about ±10-20 % on the "
                "flow through the fins."
            )
        elif result.inputs.bypass is not None:
            items.append(
                "Bypass: the fins and the gaps see the same pressure difference; mixing and "
                "momentum exchange at the sink exit are neglected (expect about ±10-20 % on "
                "the flow through the fins)."
            )
        if _is_fan(result):
            items.append(
                "The fan curve scales with air density at constant speed (fan laws); the fan "
                "sees the full system pressure drop with no inlet or outlet system effect."
            )
    return _bullets(items)


def warnings_section(result) -> present.Fragment:
    """The model's warnings (validity ranges left, 1-D fin validity, anything unusual).

    Parameters
    ----------
    result : finkit.model.CaseResult
        The solved case. [-]

    Returns
    -------
    present.Fragment
        A badge and a list of warnings, or a statement that there are none. [-]
    """
    if not result.warnings:
        if not _is_heat_sink(result):
            return present.text(
                "No warning: the fins are one-dimensional (transverse Biot number below 0.1). "
                "No correlation is used: the heat transfer coefficient is an input."
            )
        return present.text(
            "No warning: every correlation was used inside its stated range and the fins are "
            "one-dimensional (transverse Biot number below 0.1)."
        )
    count = len(result.warnings)
    return _join(
        present.badge("warn", f"{count} WARNING" + ("S" if count > 1 else "")),
        present.text(
            "The results below rest on correlations used outside their stated range or on "
            "assumptions that are stretched; judge their effect before relying on the margin."
        ),
        _bullets(result.warnings),
    )


# --------------------------------------------------------------------------------------------
# Cautions


def _conditions_where(result, test) -> list[str]:
    table = result.conditions
    return [] if table is None else [r.name for r in table.rows if test(r)]


def _names(names: list[str]) -> str:
    return ", ".join(f"'{n}'" for n in names)


def cautions(result) -> present.Fragment:
    """What the calculation does not cover, each caution shown only where it applies.

    A caution says what was done where the case covers it (a failed fan or a dusty filter
    checked as a scenario) and what to do where it does not. Natural-convection notes say
    nothing of fans, inlet or outlet air or shrouds.

    Parameters
    ----------
    result : finkit.model.CaseResult
        A solved heat-sink case. [-]

    Returns
    -------
    present.Fragment
        A bulleted list, with the hottest surface temperatures of the governing condition. [-]
    """
    # Long by design: the cautions of a note, one short paragraph each, chosen by the case.
    gov = result.governing
    sol = gov.solution if gov is not None and gov.solution is not None else result.solution
    where = f" in the governing condition '{gov.name}'" if gov is not None else ""
    items = [
        f"Touchable hot surfaces: the base under the source reaches about "
        f"{_c(_f(sol.source_base_centre_temperature))}{where} (at its centre) and the "
        f"fin tips {_c(_f(sol.fin_tip_temperature))}. If the sink or anything it heats can be "
        "touched, compare with the accessible-surface limits of the product's safety standard "
        "for the material and contact time that apply; finkit does not judge this."
        + (
            " The touch-temperature check in section 2 compares them with the case's own limit."
            if getattr(_review_of(result), "touch", None) is not None
            else ""
        ),
    ]
    if not _is_natural(result):
        fan = result.case.air.flow.fan
        failed = _conditions_where(result, lambda r: "stopped" in " ".join(r.changes))
        if fan is not None and failed:
            items.append(
                f"Fan failure was checked: {_names(failed)} (stopped fans taken out of the fan "
                "combination, with the leak through them where the case gives it). A fan-fail "
                "alarm or shutdown is still needed if the product must not run on with a "
                "stopped fan for long; check the time it takes against the product's policy."
            )
        elif fan is not None and fan.count > 1:
            items.append(
                f"Fan failure was not checked: the case has {fan.count} fans and no scenario "
                "with a stopped fan. With one fan stopped (N+1 designs) the flow drops by more "
                "than that fan's share, since air can recirculate through the stopped fan; add "
                "a scenario with failed_fans."
            )
        elif fan is not None:
            items.append(
                "Fan failure: the case has one fan; if it stops the sink is left to natural "
                "convection and will overheat at this power. The product needs fan monitoring "
                "and a shutdown or power reduction."
            )
        else:
            items.append(
                "Airflow is stated, not computed from a fan: confirm it at the worst case "
                "(fan ageing, supply voltage, a stopped fan, a loaded filter)."
            )
        dusty = _conditions_where(
            result, lambda r: any(w in " ".join(r.changes) for w in ("filter", "dust", "fouling"))
        )
        if dusty:
            items.append(
                f"Dust and filter loading were checked: {_names(dusty)}. Heavier loading than "
                "assumed there, or narrow fin gaps, foul faster; keep the maintenance interval "
                "that the scenario assumes."
            )
        else:
            items.append(
                "Dust and filter loading were not checked: a loaded filter or dust on the fins "
                "raises the pressure drop and cuts the flow, and narrow fin gaps foul fastest. "
                "Add a scenario with a filter, deposit_thickness or fouling_resistance."
            )
        bypass = result.inputs.bypass
        items.append(
            "Flow bypass: air takes the easiest path. "
            + (
                "Standing in the open stream, the sink takes only part of the air aimed at it "
                "(air side, section 1); "
                if _is_free_stream(result)
                else "The modelled gaps round the sink divert part of the flow (air side, section "
                "1); "
                if bypass is not None
                else "No bypass gap is stated, so all the air is taken to pass through the fins; "
            )
            + "cables, missing blanking or a looser enclosure can divert far more."
        )
    else:
        items += [
            (
                "Natural convection needs free inflow over the open fin ends and sides and "
                "outflow above the fins. Covers, "
                if _orientation(result) == "horizontal-base-fins-up"
                else "Natural convection needs free inflow below and outflow above the fins. "
                "Covers, "
            )
            + "nearby walls, another mounting orientation or neighbouring hot parts change h "
            "strongly; radiation depends on the finish staying as specified.",
            "Dust on the fins and finish ageing lower both convection and radiation.",
        ]
    items += [
        f"Correlations carry a scatter of typically {H_SCATTER} in h"
        + ("" if _is_natural(result) else " and more in pressure drop")
        + "; judge the margin against the temperature rise above the "
        + ("surrounding air" if _is_natural(result) else "inlet air")
        + ", not the absolute temperature.",
    ]
    calibration = getattr(_review_of(result), "calibration", None)
    if calibration is None:
        items.append(
            "Confirm by test: measure the case (or junction) temperature rise on a prototype "
            "in the real enclosure at the stated power, and compare the rise, not the absolute "
            "temperature."
        )
    else:
        items.append(
            f"Test data were compared ({len(calibration.names)} point(s), section 2)"
            + (
                "; the model reads low against them, so the calibrated result on page 1 is the "
                "one to sign against unless the difference is explained."
                if calibration.reads_low
                else "."
            )
        )
    items += [
        "Interface materials: datasheet resistances are typical values at laboratory pressure; "
        "use the real mounting pressure and a tolerance.",
        "This note is an engineering calculation aid. It does not replace local codes, the "
        "product's safety standard or the judgement of a licensed or otherwise qualified "
        "engineer, who remains responsible for the design.",
    ]
    return _bullets(items)
