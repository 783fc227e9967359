"""Transient response of the heat-sink chain: the lumped RC network on the steady chain.

The method is written out in docs/methods.md m.

The steady chain of :mod:`finkit.physics.sink` (junction -> case -> base under the source ->
base plate -> fins and exposed base -> inlet air) becomes a lumped RC network:

* **nodes** (in this order): ``junction``, ``case``, ``base`` (the base under the source,
  where a spreader's capacity is put), ``base_plate`` (the whole base at the fin roots) and
  one or more fin nodes (``fins``, or ``fin_1`` root ... ``fin_n`` tip). That is 5 nodes with
  the default single fin node, ``4 + n`` with ``n`` fin nodes;
* **conductances** come from the steady solution of the operating condition in force
  (:class:`finkit.physics.sink.SinkSolution`): ``1/R_jc``, ``1/R_int``,
  ``1/(R_sp + R_base)``, and the sink conductance ``1/R_sink`` split between the fins and
  the exposed base in proportion to their share of the steady heat flow
  (``eta_f A_f / (eta_o A_t)``);
* **heat capacities**: base plate and fins from the geometry, the material's density and its
  specific heat; junction, case and spreader only where the user gives them (0 otherwise: a
  node without capacity follows the others at once, which makes the junction rise sooner:
  the conservative choice when no value is known).

A single fin node sits at the mean fin temperature. For an adiabatic-tip fin the mean excess is
``eta_f`` times the root excess, so the fin node is tied to the base plate by
``G_fins / (1 - eta_f)`` and to the air by ``G_fins / eta_f``: in series they give back the
steady fin conductance ``G_fins`` exactly. With ``n > 1`` fin nodes the fin is a ladder of
``n`` equal segments (conduction ``k A_c / dx`` between them, half a segment to the root,
adiabatic tip) whose total convective conductance is chosen so that the ladder's steady
conductance equals ``G_fins``. Either way, the steady state of the network is the steady
solution of the condition: every transient ends on it.

Assumptions (stated in the note):

* lumped nodes; the heat transfer coefficient, the fin efficiency and the split of the sink
  conductance are those of the steady solution of the condition in force, switched at once
  when the condition changes (the flow settles in seconds, the metal in minutes);
* the air temperature rise through the sink is quasi-steady (it is inside ``R_sink``; the air
  holds no heat);
* the base plate's capacity sits at the fin roots, below the spreading and base resistances,
  so right after a power step the junction rises by ``P (R_jc + R_int + R_sp + R_base)`` at
  once: faster than the real, distributed base (conservative for the time to a limit);
* a natural-convection sink keeps the h of its steady state (h would really rise with the
  excess temperature).

Lumping checks (:func:`lumping_numbers`): the fin's along-height Biot number
``(m H)^2 = G_fin,conv H / (k A_c)`` and its Fourier number ``alpha t / H^2`` at the shortest
time of interest; a single fin node is poor when the Fourier number is below 1 (the fin has
not yet conducted through in that time) and the Biot number above 0.1 (it has a gradient).
These thresholds are common practice, no source.

Everything here is pure (SI floats and numpy arrays); the ODEs are solved exactly through the
network's modes (:mod:`~finkit.physics.transient.modal`), in pieces between the times where
the condition or the power changes, several designs at once; ``scipy.integrate.solve_ivp``
(``BDF``, stiff-capable, with the exact Jacobian) remains selectable and takes over where the
modes are not real and decaying.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from finkit.errors import InputError
from finkit.physics.geometry import PinFinSink, PlateFinSink

__all__ = [
    "CHAIN_NODES",
    "FIN_BIOT_LIMIT",
    "FIN_FOURIER_LIMIT",
    "LumpingNumbers",
    "RESISTANCE_FLOOR",
    "ThermalNetwork",
    "chain_network",
    "lumping_numbers",
]

#: Nodes of the chain above the fins, in order (the power enters at the first).
CHAIN_NODES = ("junction", "case", "base", "base_plate")

#: Smallest resistance used between two nodes [K W⁻¹]: a zero resistance (no ``R_jc`` given,
#: say) becomes this, so the two nodes differ by at most ``P * 1e-9`` K.
RESISTANCE_FLOOR = 1e-9

#: Thresholds of the fin lumping check (common practice, no source).
FIN_BIOT_LIMIT = 0.1
FIN_FOURIER_LIMIT = 1.0


# --------------------------------------------------------------------------------------
# The network
# --------------------------------------------------------------------------------------


@dataclass(frozen=True)
class ThermalNetwork:
    """A lumped RC network of one or more designs (leading axis: design).

    Attributes
    ----------
    node_names : tuple of str
        Names of the ``n`` nodes. [-]
    conductance : ndarray, shape (designs, n, n)
        Symmetric conductance between nodes, zero diagonal [W K⁻¹].
    air_conductance : ndarray, shape (designs, n)
        Conductance from each node to the inlet air [W K⁻¹].
    heat_capacity : ndarray, shape (designs, n)
        Heat capacity of each node; 0 = no capacity (the node follows at once) [J K⁻¹].
    inlet_temperature : ndarray, shape (designs,)
        Inlet air temperature [K].
    power_node : int
        Index of the node the power enters. [-]
    """

    node_names: tuple[str, ...]
    conductance: np.ndarray
    air_conductance: np.ndarray
    heat_capacity: np.ndarray
    inlet_temperature: np.ndarray
    power_node: int = 0

    @property
    def design_count(self) -> int:
        """Number of designs. [-]"""
        return self.conductance.shape[0]

    def matrix(self) -> np.ndarray:
        """The conductance (Laplacian plus air) matrix ``K``, ``K T = q`` [W K⁻¹]."""
        g = self.conductance
        k = -g.copy()
        idx = np.arange(g.shape[1])
        k[:, idx, idx] = g.sum(axis=2) + self.air_conductance
        return k


def _series(a, b):
    return a * b / (a + b)


def _ladder_conductance(total_convective, link, count):
    """Steady conductance of an ``count``-segment fin ladder from the root [W K⁻¹].

    ``link`` is ``k A_c / dx`` [W K⁻¹]; the root is half a segment from the first node; the tip
    is adiabatic; each node convects ``total_convective / count`` to the air.
    """
    g = total_convective / count
    y = g
    for _ in range(count - 1):
        y = g + _series(link, y)
    return _series(2.0 * link, y)


def _fin_geometry(geometry):
    """Height [m], total cross-section of all fins [m²], fin and base metal volume [m³]."""
    base_volume = (
        np.asarray(geometry.base_width, float) * geometry.base_length * geometry.base_thickness
    )
    if isinstance(geometry, PlateFinSink):
        height = np.asarray(geometry.fin_height, float)
        section = (
            geometry.fin_count * np.asarray(geometry.fin_thickness, float) * (geometry.base_length)
        )
    elif isinstance(geometry, PinFinSink):
        height = np.asarray(geometry.pin_height, float)
        section = geometry.pin_count * np.pi * np.asarray(geometry.pin_diameter, float) ** 2 / 4
    else:  # pragma: no cover - guarded by the callers
        raise InputError(f"geometry: expected a plate-fin or pin-fin sink, got {geometry!r}")
    fin_volume = np.asarray(geometry.volume, float) - base_volume
    return height, section, fin_volume, base_volume


def _fin_share(solution, geometry):
    """Share of the sink conductance that flows through the fins [-].

    From the overall surface efficiency ``eta_o = 1 - a (1 - eta_f)`` with ``a = A_f / A_t``
    (methods.md section c): ``a = (1 - eta_o)/(1 - eta_f)``; the fins carry
    ``eta_f a / eta_o``. Where ``eta_f`` is within 1e-6 of 1 the geometric area ratio is used.
    """
    eta_f = np.asarray(solution.fin_efficiency, float)
    eta_o = np.asarray(solution.surface_efficiency, float)
    geometric = 1.0 - np.asarray(geometry.base_exposed_area, float) / geometry.total_area
    with np.errstate(divide="ignore", invalid="ignore"):
        a = np.where(1.0 - eta_f > 1e-6, (1.0 - eta_o) / (1.0 - eta_f), geometric)
    a = np.clip(np.nan_to_num(a, nan=geometric), 0.0, 1.0)
    share = eta_f * a / np.maximum(eta_o, 1e-12)
    return np.clip(share, 0.0, 1.0)


def chain_network(
    solution,
    geometry: PlateFinSink | PinFinSink,
    thermal_conductivity,
    density,
    specific_heat,
    *,
    junction_heat_capacity=0.0,
    case_heat_capacity=0.0,
    spreader_heat_capacity=0.0,
    fin_node_count: int = 1,
) -> ThermalNetwork:
    """The lumped RC network of a solved heat sink at one operating condition.

    Parameters
    ----------
    solution : finkit.physics.sink.SinkSolution
        Steady solution of the condition; its resistances, fin and surface efficiency and
        inlet air temperature are used. [-]
    geometry : PlateFinSink or PinFinSink
        The sink (base plate and fin metal volumes, fin height and cross-section). [-]
    thermal_conductivity : float or array
        Conductivity of the sink metal (fin ladder only) [W m⁻¹ K⁻¹].
    density : float or array
        Density of the sink metal [kg m⁻³].
    specific_heat : float or array
        Specific heat of the sink metal [J kg⁻¹ K⁻¹].
    junction_heat_capacity : float or array
        Heat capacity lumped at the junction (die) [J K⁻¹]; 0 = none.
    case_heat_capacity : float or array
        Heat capacity lumped at the case (package, lid) [J K⁻¹]; 0 = none.
    spreader_heat_capacity : float or array
        Heat capacity of a spreader between case and base, lumped at the base under the
        source [J K⁻¹]; 0 = none.
    fin_node_count : int
        Fin nodes: 1 = one node at the mean fin temperature; more = a ladder along the fin
        height. [-]

    Returns
    -------
    ThermalNetwork
        ``4 + fin_node_count`` nodes (:data:`CHAIN_NODES` then the fin nodes), the power at
        the junction.

    Raises
    ------
    InputError
        If ``fin_node_count`` is not a whole number of at least 1, or a ladder of that many
        nodes cannot carry the steady fin heat (use fewer or more nodes).
    """
    n_fin = int(fin_node_count)
    if n_fin != fin_node_count or n_fin < 1:
        raise InputError(f"fin_node_count: must be a whole number >= 1 (got {fin_node_count!r})")
    r_jc = np.asarray(solution.junction_to_case_resistance, float)
    r_int = np.asarray(solution.interface_resistance, float)
    r_below = np.asarray(solution.spreading_resistance + solution.base_conduction_resistance)
    r_sink = np.asarray(solution.sink_resistance, float)
    height, section, fin_volume, base_volume = _fin_geometry(geometry)
    rho_c = np.asarray(density, float) * np.asarray(specific_heat, float)
    eta_f = np.clip(np.asarray(solution.fin_efficiency, float), 1e-9, 1.0 - 1e-9)
    share = _fin_share(solution, geometry)
    g_sink = 1.0 / r_sink
    g_fins = share * g_sink
    g_exposed = (1.0 - share) * g_sink
    arrays = np.broadcast_arrays(
        r_jc, r_int, r_below, g_fins, g_exposed, eta_f, rho_c, height, section, fin_volume,
        base_volume, np.asarray(thermal_conductivity, float), junction_heat_capacity,
        case_heat_capacity, spreader_heat_capacity, np.asarray(solution.inlet_air_temperature),
    )  # fmt: skip
    (r_jc, r_int, r_below, g_fins, g_exposed, eta_f, rho_c, height, section, fin_volume,
     base_volume, k, c_j, c_c, c_sp, t_in) = (np.atleast_1d(np.array(a, float)).ravel()
                                              for a in arrays)  # fmt: skip
    designs = r_jc.size
    names = CHAIN_NODES + (("fins",) if n_fin == 1 else tuple(f"fin_{i + 1}" for i in range(n_fin)))
    n = len(names)
    g = np.zeros((designs, n, n))
    air = np.zeros((designs, n))
    cap = np.zeros((designs, n))

    def link(i, j, value):
        g[:, i, j] = value
        g[:, j, i] = value

    link(0, 1, 1.0 / np.maximum(r_jc, RESISTANCE_FLOOR))
    link(1, 2, 1.0 / np.maximum(r_int, RESISTANCE_FLOOR))
    link(2, 3, 1.0 / np.maximum(r_below, RESISTANCE_FLOOR))
    air[:, 3] = g_exposed
    cap[:, 0], cap[:, 1], cap[:, 2] = c_j, c_c, c_sp
    cap[:, 3] = rho_c * base_volume
    if n_fin == 1:
        link(3, 4, g_fins / (1.0 - eta_f))
        air[:, 4] = g_fins / eta_f
        cap[:, 4] = rho_c * fin_volume
    else:
        conduction = k * section / (height / n_fin)
        convective = _ladder_convection(g_fins, conduction, n_fin)
        link(3, 4, 2.0 * conduction)
        for i in range(4, 4 + n_fin - 1):
            link(i, i + 1, conduction)
        air[:, 4:] = (convective / n_fin)[:, None]
        cap[:, 4:] = (rho_c * fin_volume / n_fin)[:, None]
    return ThermalNetwork(names, g, air, cap, t_in, power_node=0)


def _ladder_convection(target, link, count):
    """Total convective conductance of a fin ladder whose steady conductance is ``target``."""
    limit = 2.0 * link  # the ladder can never carry more than its root link
    if np.any(target >= limit * (1.0 - 1e-9)):
        raise InputError(
            f"fin_nodes: a ladder of {count} fin nodes cannot carry the steady fin heat "
            "(the fin is short and thick for its h); use fewer fin nodes"
        )
    lo = np.asarray(target, float).copy()  # ladder conductance <= its convective conductance
    hi = lo * 2.0
    for _ in range(200):
        short = _ladder_conductance(hi, link, count) < target
        if not np.any(short):
            break
        hi = np.where(short, hi * 4.0, hi)
    for _ in range(200):  # bisection in log space; the ladder conductance rises with it
        mid = np.sqrt(lo * hi)
        below = _ladder_conductance(mid, link, count) < target
        lo, hi = np.where(below, mid, lo), np.where(below, hi, mid)
        if np.all(hi / lo - 1.0 < 1e-14):
            break
    return 0.5 * (lo + hi)


@dataclass(frozen=True)
class LumpingNumbers:
    """How well one fin node and one base node represent the metal in a transient.

    Attributes
    ----------
    fin_biot_number : ndarray
        ``(m H)^2 = h P H^2 / (k A_c)``, from the steady fin conductance [-].
    fin_fourier_number : ndarray
        ``alpha t / H^2`` at the time of interest ``t`` [-].
    base_fourier_number : ndarray
        ``alpha t / (L_half)^2`` with ``L_half`` half the longer base side: how far heat has
        spread through the base plate in that time [-].
    is_fin_lumping_poor : ndarray of bool
        Fin Biot number above :data:`FIN_BIOT_LIMIT` and Fourier number below
        :data:`FIN_FOURIER_LIMIT`: one fin node misrepresents the first moments. [-]
    """

    fin_biot_number: np.ndarray
    fin_fourier_number: np.ndarray
    base_fourier_number: np.ndarray
    is_fin_lumping_poor: np.ndarray


def lumping_numbers(
    solution, geometry, thermal_conductivity, density, specific_heat, time
) -> LumpingNumbers:
    """Fin Biot and Fourier numbers and the base Fourier number of a lumped transient.

    Parameters
    ----------
    solution : finkit.physics.sink.SinkSolution
        Steady solution of the condition (fin and surface efficiency, sink resistance). [-]
    geometry : PlateFinSink or PinFinSink
        The sink. [-]
    thermal_conductivity : float or array
        Sink metal conductivity [W m⁻¹ K⁻¹].
    density : float or array
        Sink metal density [kg m⁻³].
    specific_heat : float or array
        Sink metal specific heat [J kg⁻¹ K⁻¹].
    time : float or array
        Shortest time of interest (a required response time, a pulse width) [s].

    Returns
    -------
    LumpingNumbers
        The numbers and the verdict on a single fin node.

    Notes
    -----
    The fin's convective conductance per unit of ``k A_c / H`` is ``(m H)^2`` for a uniform
    fin (``m^2 = h P / (k A_c)``); it is recovered from the steady fin conductance through the
    adiabatic-tip efficiency ``eta_f = tanh(mH)/(mH)``, inverted numerically.
    """
    height, section, _, _ = _fin_geometry(geometry)
    k = np.asarray(thermal_conductivity, float)
    alpha = k / (np.asarray(density, float) * np.asarray(specific_heat, float))
    eta_f = np.clip(np.asarray(solution.fin_efficiency, float), 1e-6, 1.0 - 1e-12)
    # Invert eta = tanh(x)/x for x = m H (monotonic decreasing in x).
    x = np.full_like(eta_f, 1.0)
    for _ in range(100):
        f = np.tanh(x) / x - eta_f
        df = (1.0 / np.cosh(x) ** 2 - np.tanh(x) / x) / x
        x = np.clip(x - f / df, 1e-8, 1e6)
    biot = x**2
    t = np.asarray(time, float)
    fin_fourier = alpha * t / height**2
    half = 0.5 * np.maximum(geometry.base_width, geometry.base_length)
    base_fourier = alpha * t / half**2
    poor = (biot > FIN_BIOT_LIMIT) & (fin_fourier < FIN_FOURIER_LIMIT)
    return LumpingNumbers(biot, fin_fourier, base_fourier, poor)
