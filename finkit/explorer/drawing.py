"""The explorer's four plots and its read-out of the headline numbers (drawing only)."""

from __future__ import annotations

from typing import Any

import numpy as np

from finkit.case.units import format_quantity, from_si
from finkit.constants import ZERO_CELSIUS
from finkit.explorer.controls import _DISPLAY, _empty
from finkit.report import present


class _Drawing:
    """The plotting and read-out part of :class:`finkit.explorer.session.Explorer` (a mixin: it
    uses the explorer's unit display and figure)."""

    def _curves(self, result) -> dict[str, Any]:
        """Every curve of the plots, from finkit.model (vectorised calls)."""
        from finkit.model.sweeps import fan_pressure, note_sweep, system_curve
        from finkit.physics.sink.inputs import FanDriven, NaturalConvection

        inputs = result.inputs
        t_in = float(np.asarray(inputs.air.inlet_temperature))
        usable = inputs.limit_temperature - inputs.required_margin
        low = min(t_in - 25.0, usable - 30.0)
        high = max(inputs.limit_temperature + 3.0, t_in + 3.0)
        inlet = np.linspace(low, high, 41)
        out: dict[str, Any] = {"inlet": inlet}
        out["inlet_sweep"] = note_sweep(inputs, "inlet_temperature", inlet)
        spec = self._si_specs.get("fin_height") or self._si_specs.get("pin_height")
        heights = np.linspace(spec.minimum, spec.maximum, 36) * 1e-3
        out["heights"] = heights
        out["height_sweep"] = note_sweep(inputs, "fin_height", heights)
        if not isinstance(inputs.flow, NaturalConvection):
            q_op = float(np.asarray(result.solution.volume_flow))
            if isinstance(inputs.flow, FanDriven):
                free = float(fan_pressure(inputs, np.array([0.0]))["free_delivery"])
                q_max = free * 1.05
                qf = np.linspace(0.0, free, 60)
                out["fan"] = fan_pressure(inputs, qf)
            else:
                q_max = 2.0 * q_op
            q = np.linspace(q_max / 100.0, q_max, 60)
            out["system"] = system_curve(inputs, q)
            out["q_max"] = q_max
        return out

    def _draw(self, result, curves) -> None:
        from finkit.report.formatting import COLOURS, _style

        with _style():
            for ax in self._axes.ravel():
                _empty(ax)
            self._draw_nodes(self._axes[0, 0], result, COLOURS)
            self._draw_allowable(self._axes[0, 1], result, curves, COLOURS)
            self._draw_fan(self._axes[1, 0], result, curves, COLOURS)
            self._draw_efficiency(self._axes[1, 1], result, curves, COLOURS)

    def _draw_nodes(self, ax, result, colours) -> None:
        sol, inputs = result.solution, result.inputs
        node = inputs.limit_node
        if sol.sources is not None:
            # several sources: the lead (governing) source's chain
            k, s = inputs.lead_source, sol.sources
            name = s.names[k]
            rows = [
                (f"Junction ({name})", s.junction[..., k], node == "junction"),
                (f"Case ({name})", s.case[..., k], node == "case"),
                (f"Base peak ({name})", s.base_peak[..., k], node == "base"),
            ]
        else:
            rows = [
                ("Junction", sol.junction_temperature, node == "junction"),
                ("Case", sol.case_temperature, node == "case"),
                ("Base peak", sol.source_base_centre_temperature, node == "base"),
            ]
        rows += [
            ("Base, mean", sol.base_temperature, False),
            ("Fin tip", sol.fin_tip_temperature, False),
        ]
        if np.isfinite(float(np.asarray(sol.outlet_air_temperature))) and self._is_forced(result):
            rows.append(("Outlet air", sol.outlet_air_temperature, False))
        rows.append(("Inlet air", sol.inlet_air_temperature, False))
        t_in = self._display(float(np.asarray(sol.inlet_air_temperature)), "temperature")
        values = [self._display(float(np.asarray(t)), "temperature") for _, t, _ in rows]
        ok = result.results["temperature_margin"] >= result.results["required_margin"]
        colour = [
            (colours["primary"] if ok else colours["limit"])
            if is_node
            else (colours["air"] if name.endswith("air") else "#8fb8d8")
            for name, _, is_node in rows
        ]
        y = np.arange(len(rows))
        floor = min(0.0, t_in - 5.0)
        ax.barh(y, [v - floor for v in values], left=floor, color=colour, height=0.6)
        for yi, v in zip(y, values, strict=True):
            ax.text(v, yi, f" {v:.1f}", va="center", fontsize=8)
        limit = self._display(inputs.limit_temperature, "temperature")
        usable = self._display(inputs.limit_temperature - inputs.required_margin, "temperature")
        t_sym, dt_sym = self._symbol("temperature"), self._symbol("difference")
        ax.axvline(limit, color=colours["limit"], linestyle="--", linewidth=1.4, label="Limit")
        if inputs.required_margin > 0:
            ax.axvline(
                usable,
                color=colours["margin"],
                linestyle=":",
                linewidth=1.6,
                label="Limit less margin",
            )
        ax.set_yticks(y, [name for name, _, _ in rows], fontsize=8)
        ax.relim()
        ax.autoscale_view()
        ax.set_ylim(len(rows) - 0.5, -0.5)  # first row on top (axes are reused: no invert)
        ax.set_xlim(floor, max(limit, max(values)) * 1.12 + 2.0)
        ax.set_xlabel(f"Temperature [{t_sym}]")
        verdict = "PASS" if ok else "FAIL"
        node_t = self._display(
            result.results["limit_node_temperature"] + ZERO_CELSIUS, "temperature"
        )
        margin = self._display(result.results["temperature_margin"], "difference")
        if sol.sources is not None:
            node = f"{node} of {sol.sources.names[inputs.lead_source]}"
        ax.set_title(
            f"{node.capitalize()} {node_t:.1f} {t_sym}, "
            f"{margin:.1f} {dt_sym} below the limit: {verdict} (nominal)",
            fontsize=9,
            loc="left",
        )
        ax.grid(axis="y", visible=False)
        ax.legend(loc="lower right", fontsize=7.5)

    def _draw_allowable(self, ax, result, curves, colours) -> None:
        t_unit, t_sym = _DISPLAY[self.unit_system]["temperature"], self._symbol("temperature")
        x = from_si(curves["inlet"], "temperature", t_unit)
        power = float(np.asarray(result.solution.power))
        t_case = self._display(
            float(np.asarray(result.inputs.air.inlet_temperature)), "temperature"
        )
        ax.plot(
            x,
            curves["inlet_sweep"]["allowable_power"],
            color=colours["primary"],
            label="Allowable, limit less margin",
        )
        ax.axhline(power, color=colours["secondary"], linewidth=1.4, label=f"Power {power:.1f} W")
        ax.axvline(t_case, color=colours["air"], linestyle="-.", linewidth=1.2)
        ax.plot([t_case], [result.results["allowable_power"]], "o", color=colours["primary"])
        ax.set_xlabel(f"Inlet air temperature [{t_sym}]")
        ax.set_ylabel("Power [W]")
        ax.relim()
        ax.autoscale_view()
        ax.set_ylim(bottom=0)
        ax.set_xlim(x[0], x[-1])
        ax.set_title(
            f"Allowable power {result.results['allowable_power']:.1f} W "
            f"at {t_case:.1f} {t_sym} inlet",
            fontsize=9,
            loc="left",
        )
        ax.legend(loc="upper right", fontsize=7.5)

    def _draw_fan(self, ax, result, curves, colours) -> None:
        if "system" not in curves:
            # Natural convection has no fan or system curve: show where the heat goes instead.
            sol = result.solution
            heat = [
                float(np.asarray(sol.convection_heat_rate)),
                float(np.asarray(sol.radiation_heat_rate)),
            ]
            y = np.arange(2)
            ax.barh(y, heat, color=[colours["primary"], colours["secondary"]], height=0.5)
            for yi, q in zip(y, heat, strict=True):
                ax.text(q, yi, f" {q:.1f} W ({q / sum(heat) * 100:.0f} %)", va="center", fontsize=8)
            ax.set_yticks(y, ["Convection", "Radiation"], fontsize=8)
            ax.relim()
            ax.autoscale_view()
            ax.set_ylim(1.5, -0.5)
            ax.set_xlim(0, max(heat) * 1.45)
            ax.set_xlabel("Heat rate [W]")
            ax.grid(axis="y", visible=False)
            h = float(np.asarray(sol.heat_transfer_coefficient))
            ax.set_title(
                f"Natural convection (no fan): h {h:.2f} W/(m²·K), heat paths",
                fontsize=9,
                loc="left",
            )
            return
        to_cfm = from_si(1.0, "volume_flow", "CFM")
        p_unit, p_sym = _DISPLAY[self.unit_system]["pressure"], self._symbol("pressure")
        to_p = from_si(1.0, "pressure", p_unit)
        system = curves["system"]
        ax.plot(
            system["volume_flow"] * to_cfm,
            system["pressure_drop"] * to_p,
            color=colours["primary"],
            label=_system_label(result.inputs.bypass),
        )
        if "fan" in curves:
            fan = curves["fan"]
            ax.plot(
                fan["volume_flow"] * to_cfm,
                fan["at_inlet"] * to_p,
                color=colours["secondary"],
                label=f"Fan at {fan['inlet_density']:.3f} kg/m³",
            )
            label = "Operating point"
        else:
            label = "Given flow"
        q = result.results["volume_flow"]
        dp = result.results["pressure_drop"]
        ax.plot(
            [q * to_cfm],
            [dp * to_p],
            "o",
            color="black",
            zorder=5,
            label=f"{label} {q * to_cfm:.2f} CFM, {dp * to_p:.3g} {p_sym}",
        )
        ax.relim()
        ax.autoscale_view()
        ax.set_xlim(0, curves["q_max"] * to_cfm)
        ax.set_ylim(bottom=0)
        ax.set_xlabel(
            "Stream flow over the sink's frontal area [CFM]"
            if _is_free_stream(result.inputs.bypass)
            else "Total volume flow [CFM]"
        )
        ax.set_ylabel(f"Static pressure [{p_sym}]")
        title = "Fan and system curves" if "fan" in curves else "System curve, given flow"
        if result.inputs.bypass is not None:
            title += f" (bypass {result.results['bypass_fraction'] * 100:.0f} % of the flow)"
        ax.set_title(title, fontsize=9, loc="left")
        ax.legend(loc="upper right", fontsize=7.5)

    def _draw_efficiency(self, ax, result, curves, colours) -> None:
        l_unit, l_sym = _DISPLAY[self.unit_system]["length"], self._symbol("length")
        heights = from_si(curves["heights"], "length", l_unit)
        sweep = curves["height_sweep"]
        pins = "pin_height" in self.specs
        name = "Pin height" if pins else "Fin height"
        g = result.inputs.geometry
        h0 = self._display(float(np.asarray(g.pin_height if pins else g.fin_height)), "length")
        eta = result.results["fin_efficiency"]
        ax.plot(
            heights, sweep["fin_efficiency"], color=colours["tertiary"], label="Fin efficiency η_f"
        )
        ax.plot([h0], [eta], "o", color=colours["tertiary"])
        ax.axvline(h0, color=colours["air"], linestyle="-.", linewidth=1.2)
        ax.set_xlabel(f"{name} [{l_sym}]")
        ax.set_ylabel("Fin efficiency [-]")
        ax.relim()
        ax.autoscale_view()
        ax.set_ylim(min(0.5, float(np.nanmin(sweep["fin_efficiency"])) - 0.05), 1.0)
        ax.set_xlim(heights[0], heights[-1])
        ax.set_title(
            f"Fin efficiency {eta:.3f} at {h0:.3g} {l_sym} ({name.lower()})", fontsize=9, loc="left"
        )
        ax.legend(loc="lower left", fontsize=7.5)

    @staticmethod
    def _is_forced(result) -> bool:
        from finkit.physics.sink.inputs import NaturalConvection

        return not isinstance(result.inputs.flow, NaturalConvection)

    def _readout_html(self, result) -> str:
        r = result.results
        inputs = result.inputs
        ok = r["temperature_margin"] >= r["required_margin"]
        node = inputs.limit_node
        sources = getattr(result, "sources", ()) or ()
        if sources:
            # several sources: the governing one's node leads
            node = f"{sources[0]['limit_node']} of {sources[0]['name']}"
        t_sym, dt_sym = self._symbol("temperature"), self._symbol("difference")

        def temp(celsius):
            return f"{self._display(celsius + ZERO_CELSIUS, 'temperature'):.1f} {t_sym}"

        def diff(kelvin):
            return f"{self._display(kelvin, 'difference'):.1f} {dt_sym}"

        rows = [
            (
                f"{node.capitalize()} (limit node)",
                temp(r["limit_node_temperature"]),
                f"limit {temp(r['limit_temperature'])}",
            ),
            (
                "Margin below the limit",
                diff(r["temperature_margin"]),
                f"required {diff(r['required_margin'])}",
            ),
            (
                "Allowable power (limit less margin)",
                f"{r['allowable_power']:.1f} W",
                f"stated {float(np.asarray(result.solution.power)):.1f} W",
            ),
            ("Power at the limit", f"{r['power_at_limit']:.1f} W", ""),
            (
                "Sink resistance",
                f"{r['sink_resistance']:.4g} K/W",
                "" if r["total_resistance"] is None else f"total {r['total_resistance']:.4g} K/W",
            ),
        ]
        if r["volume_flow"] is not None:
            rows += [
                (
                    "Volume flow (through the fins)",
                    format_quantity(r["volume_flow"], "volume_flow", "CFM"),
                    format_quantity(r["sink_volume_flow"], "volume_flow", "CFM"),
                ),
                (
                    "Pressure drop",
                    f"{self._display(r['pressure_drop'], 'pressure'):.3g} "
                    f"{self._symbol('pressure')}",
                    "",
                ),
            ]
        rows += [
            ("Heat transfer coefficient", f"{r['heat_transfer_coefficient']:.1f} W/(m²·K)", ""),
            (
                "Fin / surface efficiency",
                f"{r['fin_efficiency']:.3f}",
                f"{r['surface_efficiency']:.3f}",
            ),
            ("Sink mass", f"{r['mass'] * 1e3:.0f} g", ""),
        ]
        # Inline styles: a notebook has no note stylesheet. Every text is escaped.
        colour = "#2f7d4f" if ok else "#b3202a"
        cell = 'style="padding:1px 8px;white-space:nowrap;text-align:left"'
        body = "".join(
            "<tr>" + "".join(f"<td {cell}>{present.escape(v)}</td>" for v in row) + "</tr>"
            for row in rows
        )
        verdict = present.escape("PASS" if ok else "FAIL")
        head = (
            f'<div style="font-weight:bold;color:{colour};margin-bottom:4px">{verdict} '
            f"(nominal): {present.escape(node)} "
            f"{present.escape(diff(r['temperature_margin']))} below the limit</div>"
        )
        note = present.escape(
            f"Updated in {self.seconds * 1e3:.0f} ms. Scenarios, touch check and tolerances "
            "are not solved here; run 'finkit note' on the saved case."
        )
        return (
            f'{head}<table style="border-collapse:collapse;font-size:90%">{body}</table>'
            f'<div style="font-size:85%;color:#707070;max-width:420px">{note}</div>'
        )


def _is_free_stream(bypass) -> bool:
    from finkit.physics.sink.inputs import FreeStream

    return isinstance(bypass, FreeStream)


def _system_label(bypass) -> str:
    """Legend of the system curve: the sink, with its bypass gaps or standing in a free stream
    (where the curve is the fins' pressure drop against the stream's flow at the sink)."""
    if bypass is None:
        return "System (sink)"
    if _is_free_stream(bypass):
        return "Sink in a free stream (Lee's balance)"
    return "System (sink + bypass)"
