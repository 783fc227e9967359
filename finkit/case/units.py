"""Units at finkit's boundary: the one pint registry, and conversion of case-file values to SI.

Case files may write physical values as strings with units (``"1.5 mm"``, ``"40 degC"``,
``"12 CFM"``, ``"0.2 inH2O"``) or as bare numbers, which mean SI (m, K, W, Pa, ...). This module
turns them into plain SI floats once, at the boundary; nothing below it (properties, fins,
correlations, geometry, airflow, sink) ever sees a pint object.

The registry :data:`ureg` is private to finkit: pint's application registry is left untouched
(no ``set_application_registry``, no ``autoconvert_offset_to_baseunit``).

Temperatures
------------
finkit keeps absolute temperatures and temperature differences apart, as pint does:

* kind ``"temperature"`` (absolute, -> K) accepts ``"40 degC"``, ``"104 degF"``, ``"313.15 K"``,
  ``"563.67 degR"`` or a bare number in kelvin. A bare number below 150 is rejected, because it is
  almost certainly a Celsius value written without its unit. ``"10 delta_degC"`` is rejected
  (it is a difference).
* kind ``"temperature_difference"`` (-> K) accepts ``"10 K"``, ``"10 delta_degC"``,
  ``"18 delta_degF"``, ``"10 degR"`` or a bare number in kelvin. ``"10 degC"`` is **rejected**
  with a message that says to write ``"10 K"`` or ``"10 delta_degC"``: on the Celsius scale
  ``10 degC`` is a temperature (283.15 K), and reading it as a difference would be a silent guess.
* In compound units a Celsius or Fahrenheit degree is always a difference (pint's rule), so
  ``"200 W/m/degC"`` and ``"0.2 degC*cm^2/W"`` are accepted.

Extra units
-----------
``CFM`` (= ``cfm``) is one cubic foot per minute and ``LFM`` (= ``lfm`` = ``fpm``, the trade's
spellings of feet per minute) one foot per minute,
both exact since 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959).
Note that without this definition pint would read ``cfm`` as centi-fermi. ``inH2O`` is the
conventional inch of water (1000 kg m⁻³ x 0.0254 m x 9.80665 m s⁻² = 249.08891 Pa) and
``mmH2O`` the conventional millimetre of water (9.80665 Pa), as in finkit's methods reference,
section 0; pint 0.25 already defines both this way, and the module checks it at import.
"""

from __future__ import annotations

import math
import re
from collections.abc import Iterable
from numbers import Real

import numpy as np

from finkit.errors import InputError

__all__ = [
    "BARE_TEMPERATURE_MIN",
    "KINDS",
    "MAX_TEXT",
    "format_quantity",
    "from_si",
    "to_si",
    "to_si_array",
]

#: Longest value text read (a quantity with its unit is a few dozen characters; pint's parser
#: takes time growing with the square of the length, so a megabyte of text is refused first).
MAX_TEXT = 200

_REGISTRY = None
_DIMENSIONS: dict = {}


def _ureg():
    """finkit's own unit registry (the only one; do not create others, do not change its
    settings), made on first use: importing pint and building a registry costs about 0.3 s,
    which ``import finkit.case.schema`` and ``finkit --help`` should not pay (issue 15). Also
    reachable
    as ``finkit.case.units.ureg``."""
    global _REGISTRY
    if _REGISTRY is None:
        registry = _new_registry()
        registry.define("CFM = foot ** 3 / minute = cfm")
        registry.define("LFM = foot / minute = lfm = fpm")
        # Conventional water column: rho = 1000 kg/m^3, g_n = 9.80665 m/s^2 (exact by
        # convention).
        _ensure_pressure_unit(
            registry,
            "inH2O",
            0.0254 * 1000.0 * 9.80665,
            "inch_H2O = inch * 1000 * kilogram / meter ** 3 * 9.80665 * meter / second ** 2"
            " = inH2O",
        )
        _ensure_pressure_unit(
            registry,
            "mmH2O",
            0.001 * 1000.0 * 9.80665,
            "mm_H2O = 1e-3 * meter * 1000 * kilogram / meter ** 3 * 9.80665 * meter / "
            "second ** 2 = mmH2O",
        )
        _DIMENSIONS.update(
            {kind: registry.parse_units(si).dimensionality for kind, (si, _, _) in KINDS.items()}
        )
        _REGISTRY = registry
    return _REGISTRY


def _new_registry():
    """pint's default registry, its parsed definitions read from pint's own disk cache.

    Parsing pint's definition file takes about 0.15 s of every process (a ``finkit check``, each
    note kernel); pint keeps the parsed form in its user cache folder when asked
    (``cache_folder=":auto:"``, keyed by the hash of the definition file, so an upgrade of pint
    cannot read a stale one) and then builds the registry in about 0.03 s. finkit's own units
    are defined after, so they never come from the cache. A cache folder that cannot be made or
    read (read-only home, damaged or half-written file) falls back to parsing, as before.
    """
    import pint

    try:
        return pint.UnitRegistry(cache_folder=":auto:")
    except Exception:  # noqa: BLE001 - any cache trouble: parse the definitions instead
        return pint.UnitRegistry()


def __getattr__(name: str):
    if name == "ureg":
        return _ureg()
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


def _ensure_pressure_unit(registry, name: str, pascal: float, definition: str) -> None:
    """Define ``name`` unless the registry already has it with exactly this value in Pa."""
    try:
        value = registry.Quantity(1.0, name).to("Pa").magnitude
    except Exception:  # not defined in this pint version
        value = None
    if value is None or not math.isclose(value, pascal, rel_tol=1e-12):
        registry.define(definition)


#: kind -> (SI unit, description used in messages, example written in a case file)
KINDS: dict[str, tuple[str, str, str]] = {
    "length": ("m", "a length", "1.5 mm"),
    "area": ("m^2", "an area", "6.25 cm^2"),
    "temperature": ("K", "an absolute temperature", "40 degC"),
    "temperature_difference": ("K", "a temperature difference", "10 K"),
    "power": ("W", "a power", "45 W"),
    "thermal_resistance": ("K/W", "a thermal resistance", "0.05 K/W"),
    "area_resistance": ("K*m^2/W", "an area-specific thermal resistance", "0.2 K*cm^2/W"),
    "thermal_conductivity": ("W/m/K", "a thermal conductivity", "200 W/m/K"),
    "heat_transfer_coefficient": ("W/m^2/K", "a heat transfer coefficient", "25 W/m^2/K"),
    "velocity": ("m/s", "a velocity", "2 m/s"),
    "volume_flow": ("m^3/s", "a volume flow", "12 CFM"),
    "pressure": ("Pa", "a pressure", "0.2 inH2O"),
    "density": ("kg/m^3", "a density", "1.2 kg/m^3"),
    "specific_heat": ("J/kg/K", "a specific heat", "900 J/kg/K"),
    "heat_capacity": ("J/K", "a heat capacity", "15 J/K"),
    "time": ("s", "a time", "120 s"),
    "dimensionless": ("", "a dimensionless number", "0.85"),
}

#: Bare numbers below this are refused as absolute temperatures [K].
BARE_TEMPERATURE_MIN = 150.0

_NUMBER = re.compile(r"^\s*([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*?)\s*$")
_ABSOLUTE_SCALES = {"degree_Celsius", "degree_Fahrenheit"}
_DELTA_SCALES = {"delta_degree_Celsius", "delta_degree_Fahrenheit"}


def _dimensionality(kind: str):
    _ureg()
    return _DIMENSIONS[kind]


def _message(field: str, body: str) -> str:
    return f"{field}: {body}" if field else body


def _shown(value) -> str:
    if value is None:
        return "an empty value"
    if isinstance(value, str):
        return f"'{value}'"
    return repr(value)


def _check_kind(kind: str) -> tuple[str, str, str]:
    try:
        return KINDS[kind]
    except KeyError:
        raise ValueError(f"unknown kind {kind!r}; allowed: {', '.join(KINDS)}") from None


def _from_number(value: float, kind: str, field: str) -> float:
    """A bare number: SI by definition, with the plausibility check for temperatures."""
    x = float(value)
    if not math.isfinite(x):
        raise InputError(_message(field, f"expected a finite number, got {_shown(value)}"))
    if kind == "temperature" and x < BARE_TEMPERATURE_MIN:
        raise InputError(
            _message(
                field,
                f"a bare number is read as kelvin and {x:g} K is not a plausible temperature "
                f"(got {_shown(value)}; add the unit, e.g. '{x:g} degC')",
            )
        )
    return x


def _unit_hint(unit_text: str, kind: str) -> str:
    if kind in ("thermal_conductivity", "heat_transfer_coefficient") and "mK" in unit_text:
        return "; 'mK' is millikelvin, write e.g. '200 W/m/K' or '25 W/m^2/K'"
    if kind == "length" and unit_text.strip() == "mil":
        return "; 'mil' is an angle, write 'thou' for 0.001 inch"
    return ""


def to_si(value, kind: str, field: str) -> float:
    """Convert one case-file value to an SI float.

    Parameters
    ----------
    value : str or float
        A string with a unit (``"1.5 mm"``, ``"40 degC"``, ``"12 CFM"``), a bare number or a
        numeric string (SI: m, K, W, Pa, ...). [unit given in the string, or SI]
    kind : str
        One of :data:`KINDS`: ``length``, ``area``, ``temperature`` (absolute),
        ``temperature_difference``,
        ``power``, ``thermal_resistance``, ``area_resistance``, ``thermal_conductivity``,
        ``heat_transfer_coefficient``, ``velocity``, ``volume_flow``, ``pressure``, ``density``,
        ``dimensionless``. [-]
    field : str
        Name of the field, used at the start of error messages (e.g. ``"sink.fins.thickness"``);
        an empty string gives the bare reason, for callers that add the field themselves. [-]

    Returns
    -------
    float
        The value in the SI unit of ``kind`` (m, m², K, K, W, K W⁻¹, K m² W⁻¹, W m⁻¹ K⁻¹,
        W m⁻² K⁻¹, m s⁻¹, m³ s⁻¹, Pa, kg m⁻³, -).

    Raises
    ------
    InputError
        One line naming the field and the value: wrong dimension
        (``"fin thickness: expected a length, got '3 W'"``), unreadable text, a Celsius value given
        for a temperature difference, a bare temperature below 150 K, a temperature below absolute
        zero, or a non-finite number.

    Examples
    --------
    >>> to_si("1.5 mm", "length", "fin thickness")
    0.0015
    >>> round(to_si("40 degC", "temperature", "inlet"), 2)
    313.15
    """
    si, what, example = _check_kind(kind)
    if isinstance(value, bool) or not isinstance(value, (str, Real)):
        raise InputError(_message(field, f"expected {what}, got {_shown(value)}"))
    if isinstance(value, Real):
        return _from_number(value, kind, field)

    if len(value) > MAX_TEXT:
        raise InputError(
            _message(
                field,
                f"a value of {len(value)} characters; at most {MAX_TEXT} are read "
                f"(starts {value[:24]!r})",
            )
        )
    text = value.replace("℃", "degC").replace("℉", "degF")
    match = _NUMBER.match(text)
    if match is None:
        raise InputError(
            _message(
                field,
                f"cannot read {_shown(value)} as {what} (write a number and a unit, "
                f"e.g. '{example}')",
            )
        )
    number, unit_text = float(match.group(1)), match.group(2)
    if not unit_text:
        return _from_number(number, kind, field)
    try:
        unit = _ureg().parse_units(unit_text)
    except Exception:  # pint raises several types (UndefinedUnitError, AssertionError, ...)
        raise InputError(
            _message(
                field,
                f"cannot read the unit in {_shown(value)} (expected {what}, e.g. '{example}'"
                f"{_unit_hint(unit_text, kind)})",
            )
        ) from None

    if unit.dimensionality != _dimensionality(kind):
        raise InputError(
            _message(field, f"expected {what}, got {_shown(value)}{_unit_hint(unit_text, kind)}")
        )

    names = set(unit._units)
    if kind == "temperature" and names & _DELTA_SCALES:
        raise InputError(
            _message(
                field,
                f"expected an absolute temperature, got {_shown(value)} (a temperature "
                f"difference; write e.g. '{number:g} degC')",
            )
        )
    if kind != "temperature" and names & _ABSOLUTE_SCALES:
        # Only a lone degC/degF reaches here: pint reads them as deltas inside compound units.
        scale, name = ("degC", "Celsius") if "degree_Celsius" in names else ("degF", "Fahrenheit")
        kelvin = _ureg().Quantity(number, unit).to("K").magnitude
        fix = f"'{number:g} K' or '{number:g} delta_degC'" if scale == "degC" else ""
        fix = fix or f"'{number:g} delta_degF'"
        raise InputError(
            _message(
                field,
                f"expected a temperature difference, got {_shown(value)} (a {name} temperature, "
                f"{kelvin:.6g} K, not a difference; write {fix})",
            )
        )

    try:
        result = float(_ureg().Quantity(number, unit).to(si).magnitude)
    except Exception:
        raise InputError(
            _message(field, f"cannot convert {_shown(value)} to {si or 'a pure number'}")
        ) from None
    if kind == "temperature" and result <= 0.0:
        raise InputError(
            _message(field, f"{_shown(value)} is at or below absolute zero ({result:.6g} K)")
        )
    return result


def to_si_array(values, kind: str, field: str) -> np.ndarray:
    """Convert a list of case-file values (e.g. a fan-curve column) to an SI float array.

    Parameters
    ----------
    values : list of str or float
        Each element as accepted by :func:`to_si`. [unit given in each string, or SI]
    kind : str
        As in :func:`to_si`. [-]
    field : str
        Field name; element ``i`` is reported as ``field[i]``. [-]

    Returns
    -------
    numpy.ndarray
        1-D float array in the SI unit of ``kind``.

    Raises
    ------
    InputError
        If ``values`` is not a list, or for the first element that cannot be converted
        (named ``field[i]``).
    """
    _check_kind(kind)
    if isinstance(values, (str, bytes, dict)) or not isinstance(values, Iterable):
        raise InputError(_message(field, f"expected a list of values, got {_shown(values)}"))
    out = [to_si(v, kind, f"{field}[{i}]" if field else f"[{i}]") for i, v in enumerate(values)]
    return np.asarray(out, dtype=float)


def from_si(value_si, kind: str, unit: str):
    """Convert SI value(s) of a kind to a display unit (for tables and plot axes).

    Parameters
    ----------
    value_si : float or array_like
        Value(s) in the SI unit of ``kind``. [SI unit of kind]
    kind : str
        As in :func:`to_si`. For ``temperature`` the unit may be ``degC``/``degF``/``K``; for
        ``temperature_difference`` a ``degC``/``degF`` unit means the delta. [-]
    unit : str
        Target unit, e.g. ``"degC"``, ``"mm"``, ``"CFM"``, ``"inH2O"``. [-]

    Returns
    -------
    float or numpy.ndarray
        The value(s) expressed in ``unit``.
    """
    si, what, _ = _check_kind(kind)
    target = _ureg().parse_units(_as_delta(unit) if kind == "temperature_difference" else unit)
    if target.dimensionality != _dimensionality(kind):
        raise InputError(f"display unit: '{unit}' is not a unit of {what}")
    magnitude = _ureg().Quantity(np.asarray(value_si, dtype=float), si).to(target).magnitude
    return float(magnitude) if np.ndim(magnitude) == 0 else magnitude


def _as_delta(unit: str) -> str:
    stripped = unit.strip()
    mapping = {"degC": "delta_degC", "°C": "delta_degC", "degF": "delta_degF", "°F": "delta_degF"}
    return mapping.get(stripped, stripped)


_SYMBOLS = {
    "degC": "°C",
    "degF": "°F",
    "delta_degC": "K",
    "K": "K",
    "CFM": "CFM",
    "cfm": "CFM",
    "LFM": "ft/min",
    "lfm": "ft/min",
    "fpm": "ft/min",
    "inH2O": "inH2O",
    "mmH2O": "mmH2O",
    "m^3/s": "m³/s",
    "m^3/h": "m³/h",
    "m^2": "m²",
    "mm^2": "mm²",
    "cm^2": "cm²",
    "kg/m^3": "kg/m³",
    "W/m/K": "W/(m·K)",
    "W/m^2/K": "W/(m²·K)",
    "K*cm^2/W": "K·cm²/W",
    "K*m^2/W": "K·m²/W",
    "K*mm^2/W": "K·mm²/W",
}


def _number(x: float, significant: int = 4) -> str:
    """``x`` to ``significant`` figures, without exponent between 1e-4 and 1e7, no trailing 0."""
    if x == 0 or not math.isfinite(x):
        return f"{x:g}"
    exponent = math.floor(math.log10(abs(x)))
    if not -4 <= exponent < 7:
        return f"{x:.{significant - 1}e}"
    text = f"{x:.{max(significant - 1 - exponent, 0)}f}"
    return text.rstrip("0").rstrip(".") if "." in text else text


def format_quantity(value_si: float, kind: str, unit: str, decimals: int | None = None) -> str:
    """Format an SI value for display in a chosen unit, e.g. 318.15 K -> ``"45.0 °C"``.

    Parameters
    ----------
    value_si : float
        Value in SI (the SI unit of ``kind``). [SI unit of kind]
    kind : str
        As in :func:`to_si`. [-]
    unit : str
        Display unit, e.g. ``"degC"``, ``"mm"``, ``"CFM"``, ``"K/W"``. [-]
    decimals : int, optional
        Digits after the decimal point. Default: 1 for temperatures and temperature differences,
        otherwise 4 significant figures. [-]

    Returns
    -------
    str
        Number, a space and the unit symbol (``°C`` for ``degC``; a temperature difference given
        in ``degC`` is shown in ``K``).

    Examples
    --------
    >>> format_quantity(318.15, "temperature", "degC")
    '45.0 °C'
    >>> format_quantity(0.0015, "length", "mm")
    '1.5 mm'
    """
    magnitude = from_si(value_si, kind, unit)
    if decimals is None and kind in ("temperature", "temperature_difference"):
        decimals = 1
    number = _number(magnitude) if decimals is None else f"{magnitude:.{decimals}f}"
    symbol = _SYMBOLS.get(unit.strip())
    if kind == "temperature_difference" and unit.strip() in ("degC", "°C", "delta_degC"):
        symbol = "K"
    elif kind == "temperature_difference" and unit.strip() in ("degF", "°F", "delta_degF"):
        symbol = "Δ°F"
    if symbol is None:
        symbol = f"{_ureg().parse_units(unit):~P}" or "-"
    return f"{number} {symbol}" if symbol != "-" else number
