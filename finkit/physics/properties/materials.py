"""Solid materials for fins and heat-sink bases: conductivity, density, specific heat, emissivity.

Every number carries its source text (``Material.sources``). Conductivities are room-temperature
(about 300 K) values; alloy values vary with temper and supplier by about ±5-10 %, so a case
may override them (:meth:`Material.with_override`, or a user material with the same key) and
the note prints the value and source used.

Emissivities are total hemispherical values near room temperature, which in practice span a
range for each finish: each material stores a typical value and a (low, high) range per finish,
only for finishes that make sense for it (no anodising of steel, for instance).

Finishes (:data:`FINISHES`):

- ``polished``: mechanically or electro-polished bright metal.
- ``bare``: clean as-extruded, as-rolled, as-machined or as-cast metal, not polished.
- ``oxidised``: visibly oxidised or weathered metal (heat-tinted, tarnished, dull).
- ``anodised-black``: black (dyed) anodic coating on aluminium.
- ``anodised-clear``: clear (undyed) anodic coating on aluminium; thickness-dependent.
- ``painted``: painted, lacquered or powder-coated (any colour; the infrared emissivity of
  ordinary paints hardly depends on their visible colour).
"""

from __future__ import annotations

import re
from collections.abc import Mapping
from dataclasses import dataclass
from math import inf
from numbers import Real
from types import MappingProxyType

from finkit.errors import InputError

__all__ = [
    "FINISHES",
    "Material",
    "get_material",
    "list_materials",
    "material_emissivity",
]

#: Surface finishes an emissivity can be given for.
FINISHES = ("polished", "bare", "oxidised", "anodised-black", "anodised-clear", "painted")


def _is_key(text) -> bool:
    return bool(isinstance(text, str) and _KEY.fullmatch(text))


_KEY = re.compile(r"[a-z0-9]+(?:[-.][a-z0-9]+)*")


@dataclass(frozen=True)
class Material:
    """A solid material with its properties near room temperature and their sources.

    Attributes
    ----------
    key : str
        Lowercase key with hyphens, e.g. ``"aluminium-6063-t5"``.
    name : str
        Human-readable name, e.g. ``"Aluminium 6063-T5 (extrusion)"``.
    thermal_conductivity : float
        Thermal conductivity near 300 K [W m⁻¹ K⁻¹].
    density : float or None
        Density [kg m⁻³]; ``None`` only for a user material that does not give it.
    emissivity : Mapping[str, float]
        Typical total hemispherical emissivity per finish [-]. Built-in materials use the
        finishes of :data:`FINISHES`; a user material may name others (lowercase, hyphens).
    emissivity_range : Mapping[str, tuple[float, float]]
        (low, high) emissivity per finish, same keys as ``emissivity`` [-].
    sources : Mapping[str, str]
        Source text per value: keys ``"thermal_conductivity"``, ``"density"``,
        ``"specific_heat"`` and ``"emissivity:<finish>"`` for each finish (covering the typical
        value and the range).
    specific_heat : float or None
        Specific heat capacity near 300 K [J kg⁻¹ K⁻¹], for transients; ``None`` only for a
        user material that does not give it.

    Raises
    ------
    InputError
        On construction, if a value is not physically sensible (k or density not positive,
        emissivity outside (0, 1], typical value outside its range), a key or finish is not
        lowercase-with-hyphens, the two emissivity mappings have different finishes, or a
        value has no source.
    """

    key: str
    name: str
    thermal_conductivity: float
    density: float | None
    emissivity: Mapping[str, float]
    emissivity_range: Mapping[str, tuple[float, float]]
    sources: Mapping[str, str]
    specific_heat: float | None = None

    def __post_init__(self):
        key = self.key
        if not _is_key(key):
            raise InputError(f"material key = {key!r} must be lowercase words joined by hyphens")
        for field in ("thermal_conductivity", "density", "specific_heat"):
            value = getattr(self, field)
            if field != "thermal_conductivity" and value is None:
                continue
            if isinstance(value, bool) or not isinstance(value, Real) or not 0.0 < value < inf:
                raise InputError(f"{key}: {field} = {value!r} must be a finite number > 0")
            object.__setattr__(self, field, float(value))
        emissivity = dict(self.emissivity)
        ranges = {finish: tuple(map(float, rng)) for finish, rng in self.emissivity_range.items()}
        if set(emissivity) != set(ranges):
            raise InputError(
                f"{key}: emissivity finishes {sorted(emissivity)} and emissivity_range finishes "
                f"{sorted(ranges)} differ"
            )
        for finish, value in emissivity.items():
            if not _is_key(finish):
                raise InputError(
                    f"{key}: finish = {finish!r} must be lowercase words joined by hyphens "
                    f"(built-in finishes: {', '.join(FINISHES)})"
                )
            low, high = ranges[finish]
            if isinstance(value, bool) or not isinstance(value, Real):
                raise InputError(f"{key}: emissivity[{finish}] = {value!r} must be a number")
            if not (0.0 < low <= float(value) <= high <= 1.0):
                raise InputError(
                    f"{key}: emissivity[{finish}] = {value!r} with range ({low}, {high}) must "
                    "satisfy 0 < low <= typical <= high <= 1"
                )
            emissivity[finish] = float(value)
        sources = dict(self.sources)
        needed = ["thermal_conductivity"] + [
            field for field in ("density", "specific_heat") if getattr(self, field) is not None
        ]
        needed += [f"emissivity:{finish}" for finish in emissivity]
        missing = [name for name in needed if not str(sources.get(name, "")).strip()]
        if missing:
            raise InputError(f"{key}: no source given for {', '.join(missing)}")
        object.__setattr__(self, "emissivity", MappingProxyType(emissivity))
        object.__setattr__(self, "emissivity_range", MappingProxyType(ranges))
        object.__setattr__(self, "sources", MappingProxyType(sources))

    def with_override(
        self,
        source: str,
        *,
        name: str | None = None,
        thermal_conductivity: float | None = None,
        density: float | None = None,
        emissivity: Mapping[str, float] | None = None,
        specific_heat: float | None = None,
    ) -> Material:
        """A copy with some values replaced, each replaced value credited to ``source``.

        Parameters
        ----------
        source : str
            Where the new values come from, e.g. ``"case file, supplier datasheet rev. C"`` [-].
        name : str, optional
            New human-readable name [-].
        thermal_conductivity : float, optional
            New conductivity [W m⁻¹ K⁻¹].
        density : float, optional
            New density [kg m⁻³].
        emissivity : Mapping[str, float], optional
            New emissivity per finish [-]; its range becomes (value, value). New finishes
            are added.
        specific_heat : float, optional
            New specific heat [J kg⁻¹ K⁻¹].

        Returns
        -------
        Material
            The modified copy (same key); the original is unchanged.
        """
        if not str(source).strip():
            raise InputError(f"{self.key}: an override needs a source text")
        sources = dict(self.sources)
        values = {
            "thermal_conductivity": self.thermal_conductivity,
            "density": self.density,
            "specific_heat": self.specific_heat,
        }
        given = {
            "thermal_conductivity": thermal_conductivity,
            "density": density,
            "specific_heat": specific_heat,
        }
        for field, value in given.items():
            if value is not None:
                values[field] = value
                sources[field] = source
        typical = dict(self.emissivity)
        ranges = dict(self.emissivity_range)
        for finish, value in (emissivity or {}).items():
            typical[finish] = value
            ranges[finish] = (value, value)
            sources[f"emissivity:{finish}"] = source
        return Material(self.key, name or self.name, **values, emissivity=typical,
                        emissivity_range=ranges, sources=sources)  # fmt: skip


# --------------------------------------------------------------------------------------------
# Sources
# --------------------------------------------------------------------------------------------

_INCROPERA_A1 = (
    "Incropera, DeWitt, Bergman & Lavine, Fundamentals of Heat and Mass Transfer, 6th ed. "
    "(2007), Table A.1, 300 K"
)
_INCROPERA_A1_CONFIRMED = _INCROPERA_A1 + " (confirmed against a public reproduction of the table)"
_INCROPERA_A1_MEMORY = _INCROPERA_A1 + " (from memory; not confirmed against the table)"
_ASM_VOL2 = (
    "ASM Handbook Vol. 2, Properties and Selection: Nonferrous Alloys (1990), typical "
    "value (from memory, as quoted in the finkit methods reference, section l; not confirmed)"
)
_EN12524 = (
    "EN 12524:2000, Table 1, metals (design value), as tabulated in ht 1.2 "
    "ht.insulation.building_materials"
)
_IR_TABLES = (
    "emissivity tables of infrared-thermometry instrument manuals (compilations of handbook data)"
)
_G3 = "finkit methods reference, section g3 (common practice, no single source)"
_CP = "common practice, no source"

# Emissivity sets per material family: finish -> (typical, (low, high), source text).
_ALUMINIUM_WROUGHT = {
    "polished": (
        0.05,
        (0.03, 0.06),
        f"{_G3}: bare/polished Al 0.03-0.06; {_IR_TABLES}: polished Al 0.04-0.06 "
        "(total, 50-100 °C)",
    ),
    "bare": (
        0.09,
        (0.05, 0.12),
        f"typical: {_IR_TABLES}: as-received Al sheet and plate 0.09 (total, 100 °C); range: {_CP}",
    ),
    "oxidised": (
        0.2,
        (0.1, 0.31),
        f"{_G3}: as-extruded or lightly oxidised Al 0.1-0.3; {_IR_TABLES}: heavily oxidised Al "
        "0.20-0.31 (total, 90-500 °C)",
    ),
    "anodised-black": (
        0.85,
        (0.8, 0.95),
        f"{_G3}: black anodised Al 0.80-0.95; {_IR_TABLES}: black dull anodised Al 0.95 "
        "(8-14 µm band, 70 °C)",
    ),
    "anodised-clear": (
        0.75,
        (0.55, 0.85),
        f"{_G3}: clear anodised Al 0.7-0.85, depending on coating thickness; low end: "
        f"{_IR_TABLES}: thin chromic-acid anodised Al sheet 0.55 (total, 100 °C); "
        "typical: common practice, no source",
    ),
    "painted": (
        0.9,
        (0.85, 0.95),
        f"{_G3}: painted surfaces 0.85-0.95; {_IR_TABLES}: lacquers and paints 0.87-0.98 (total)",
    ),
}
_ALUMINIUM_CAST = {
    "bare": (
        0.2,
        (0.1, 0.45),
        f"{_CP}: as-cast surfaces are rougher than extrusions; {_G3}: lightly oxidised Al "
        f"0.1-0.3; {_IR_TABLES}: blast-cleaned cast Al 0.46 (8-14 µm band, 70 °C)",
    ),
    "painted": _ALUMINIUM_WROUGHT["painted"],
}
_COPPER = {
    "polished": (
        0.03,
        (0.02, 0.05),
        f"{_G3}: polished Cu 0.02-0.05; {_IR_TABLES}: polished Cu 0.02-0.03 (total, 50-100 °C)",
    ),
    "bare": (
        0.07,
        (0.04, 0.15),
        f"typical: {_IR_TABLES}: commercial burnished and scraped Cu 0.07 (total, 20-27 °C); "
        f"range: {_CP}",
    ),
    "oxidised": (
        0.65,
        (0.5, 0.8),
        f"{_G3}: oxidised Cu 0.5-0.8; {_IR_TABLES}: oxidised Cu 0.6-0.7 (total, 50 °C), heavily "
        "oxidised 0.78 (20 °C)",
    ),
    "painted": _ALUMINIUM_WROUGHT["painted"],
}
_CARBON_STEEL = {
    "polished": (
        0.07,
        (0.05, 0.1),
        f"{_IR_TABLES}: polished steel 0.07 (total, 100 °C), electrolytic 0.05; range: {_CP}",
    ),
    "bare": (
        0.5,
        (0.24, 0.77),
        f"{_IR_TABLES}: freshly rolled steel 0.24 (20 °C), rolled sheet 0.56 (50 °C), hot rolled "
        f"0.77 (20 °C), all total; typical: {_CP}",
    ),
    "oxidised": (
        0.8,
        (0.74, 0.88),
        f"{_IR_TABLES}: oxidised steel 0.74 (total, 100 °C) and 0.79 (200 °C), strongly "
        "oxidised 0.88 (50 °C)",
    ),
    "painted": _ALUMINIUM_WROUGHT["painted"],
}
_STAINLESS = {
    "polished": (
        0.15,
        (0.07, 0.17),
        f"{_IR_TABLES}: buffed 18-8 stainless 0.16 (total, 25 °C), polished 0.07 (8-14 µm band); "
        "Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., Table A.11: typical "
        "polished stainless 0.17 at 300 K (from memory); typical: common practice, no source",
    ),
    "bare": (
        0.25,
        (0.16, 0.44),
        f"{_G3}: stainless steel 0.1-0.6; {_IR_TABLES}: untreated stainless sheet 0.28 "
        f"(8-14 µm band, 70 °C), type 304 0.36-0.44 (215-490 °C); typical: {_CP}",
    ),
    "oxidised": (
        0.6,
        (0.5, 0.7),
        f"{_G3}: stainless steel up to 0.6; stainless steel after repeated heating 0.5-0.7 "
        "(230-900 °C), table of total emittances reproduced in an online cable-rating "
        "documentation page",
    ),
}


def _material(key, name, k, k_source, rho, rho_source, finishes):
    cp, cp_source = _SPECIFIC_HEAT[key]
    return Material(
        key=key,
        name=name,
        thermal_conductivity=k,
        density=rho,
        specific_heat=cp,
        emissivity={finish: v[0] for finish, v in finishes.items()},
        emissivity_range={finish: v[1] for finish, v in finishes.items()},
        sources={
            "thermal_conductivity": k_source,
            "density": rho_source,
            "specific_heat": cp_source,
            **{f"emissivity:{finish}": v[2] for finish, v in finishes.items()},
        },
    )


# Specific heat near 300 K [J kg⁻¹ K⁻¹] and its source, by material key. Alloy values differ
# from the pure metal by a few per cent, which matters little beside the other inputs of a
# transient (heat transfer coefficient, device capacitance).
_CP_CONFIRMED = (
    "Incropera, DeWitt, Bergman & Lavine, Fundamentals of Heat and Mass Transfer, 6th ed. "
    "(2007), Table A.1, c_p at 300 K (confirmed against a public reproduction of the table)"
)
_CP_MEMORY = _INCROPERA_A1_MEMORY.replace("Table A.1, 300 K", "Table A.1, c_p at 300 K")
_ASM_CP = (
    "ASM Handbook Vol. 2, Properties and Selection: Nonferrous Alloys (1990), typical specific "
    "heat at 20-100 °C (from memory; not confirmed)"
)
_CDA_CP = (
    "Copper Development Association alloy data, 0.092 Btu/lb °F at 68 °F = 385 J/kg K "
    "(from memory; not confirmed); equal to pure copper in Incropera et al., 6th ed., Table A.1"
)
_EN12524_CP = _EN12524 + ", specific heat c_p (checked against ht 1.2 here)"
_SPECIFIC_HEAT = {
    "aluminium-pure": (903.0, _CP_CONFIRMED),
    "aluminium-1050": (900.0, _ASM_CP),
    "aluminium-1100": (904.0, _ASM_CP),
    "aluminium-6063-t5": (900.0, _ASM_CP + "; pure aluminium 903 J/kg K in Incropera Table A.1"),
    "aluminium-6063-t6": (900.0, _ASM_CP + "; pure aluminium 903 J/kg K in Incropera Table A.1"),
    "aluminium-6061-t6": (896.0, _ASM_CP + "; pure aluminium 903 J/kg K in Incropera Table A.1"),
    "aluminium-2024-t6": (875.0, _CP_CONFIRMED),
    "aluminium-a380-die-cast": (
        963.0,
        "die-casting alloy data sheets, 0.230 Btu/lb °F at 212 °F (from memory; not confirmed)",
    ),
    "copper-pure": (385.0, _CP_CONFIRMED),
    "copper-c11000": (385.0, _CDA_CP),
    "copper-c10100": (385.0, _CDA_CP),
    "steel-plain-carbon": (434.0, _CP_MEMORY),
    "steel-aisi-1010": (434.0, _CP_MEMORY),
    "stainless-steel-304": (477.0, _CP_MEMORY),
    "stainless-steel-316": (468.0, _CP_CONFIRMED),
    "aluminium-alloys-en12524": (880.0, _EN12524_CP),
    "copper-en12524": (380.0, _EN12524_CP),
    "steel-en12524": (450.0, _EN12524_CP),
    "stainless-steel-en12524": (460.0, _EN12524_CP),
}

_MATERIALS = (
    _material(
        "aluminium-pure", "Aluminium, pure",
        237.0, _INCROPERA_A1_CONFIRMED, 2702.0, _INCROPERA_A1_CONFIRMED, _ALUMINIUM_WROUGHT,
    ),
    _material(
        "aluminium-1050", "Aluminium 1050 (99.5 % Al), O temper",
        230.0, _ASM_VOL2, 2705.0, _ASM_VOL2, _ALUMINIUM_WROUGHT,
    ),
    _material(
        "aluminium-1100", "Aluminium 1100 (99.0 % Al), O temper",
        222.0, _ASM_VOL2 + "; corroborated by an online alloy database (222 W/m K at 25 °C)",
        2710.0, _ASM_VOL2, _ALUMINIUM_WROUGHT,
    ),
    _material(
        "aluminium-6063-t5", "Aluminium 6063-T5 extrusion (6060-T5 is similar)",
        209.0, _ASM_VOL2 + "; supplier datasheets", 2700.0, _ASM_VOL2, _ALUMINIUM_WROUGHT,
    ),
    _material(
        "aluminium-6063-t6", "Aluminium 6063-T6 extrusion",
        200.0, _ASM_VOL2, 2700.0, _ASM_VOL2, _ALUMINIUM_WROUGHT,
    ),
    _material(
        "aluminium-6061-t6", "Aluminium 6061-T6",
        167.0, _ASM_VOL2 + "; corroborated by an online alloy database (167 W/m K at 25 °C)",
        2700.0, _ASM_VOL2, _ALUMINIUM_WROUGHT,
    ),
    _material(
        "aluminium-2024-t6", "Aluminium 2024-T6",
        177.0, _INCROPERA_A1_CONFIRMED, 2770.0, _INCROPERA_A1_CONFIRMED, _ALUMINIUM_WROUGHT,
    ),
    _material(
        "aluminium-a380-die-cast", "Die-cast aluminium A380 (ADC12 is similar)",
        96.0,
        "die-casting alloy data sheets, typical 96 W/m K for A380 (from memory, as quoted in "
        "the finkit methods reference, section l; not confirmed)",
        2710.0, "die-casting alloy data sheets, 0.098 lb/in³ (from memory; not confirmed)",
        _ALUMINIUM_CAST,
    ),
    _material(
        "copper-pure", "Copper, pure",
        401.0, _INCROPERA_A1_CONFIRMED, 8933.0, _INCROPERA_A1_CONFIRMED, _COPPER,
    ),
    _material(
        "copper-c11000", "Copper C11000 (electrolytic tough pitch, ETP)",
        388.0,
        "Copper Development Association alloy data (from memory, as quoted in the finkit "
        "methods reference, section l); corroborated by the CRC Handbook table of alloy "
        "conductivities: ETP copper 390 W/m K at 273 K and 380 W/m K at 373 K",
        8890.0, "Copper Development Association alloy data, 0.321 lb/in³ (from memory)", _COPPER,
    ),
    _material(
        "copper-c10100", "Copper C10100 (oxygen-free electronic, OFE)",
        391.0,
        "Copper Development Association alloy data (from memory, as quoted in the finkit "
        "methods reference, section l; not confirmed)",
        8940.0, "Copper Development Association alloy data, 0.323 lb/in³ (from memory)", _COPPER,
    ),
    _material(
        "steel-plain-carbon", "Carbon steel, plain (Mn ≤ 1 %, Si ≤ 0.1 %)",
        60.5, _INCROPERA_A1_MEMORY, 7854.0, _INCROPERA_A1_MEMORY, _CARBON_STEEL,
    ),
    _material(
        "steel-aisi-1010", "Carbon steel AISI 1010",
        63.9, _INCROPERA_A1_MEMORY, 7832.0, _INCROPERA_A1_MEMORY, _CARBON_STEEL,
    ),
    _material(
        "stainless-steel-304", "Stainless steel AISI 304",
        14.9, _INCROPERA_A1_MEMORY, 7900.0, _INCROPERA_A1_MEMORY, _STAINLESS,
    ),
    _material(
        "stainless-steel-316", "Stainless steel AISI 316",
        13.4, _INCROPERA_A1_MEMORY, 8238.0, _INCROPERA_A1_MEMORY, _STAINLESS,
    ),
    _material(
        "aluminium-alloys-en12524", "Aluminium alloys, generic design value (EN 12524)",
        160.0, _EN12524, 2800.0, _EN12524, _ALUMINIUM_WROUGHT,
    ),
    _material(
        "copper-en12524", "Copper, generic design value (EN 12524)",
        380.0, _EN12524, 8900.0, _EN12524, _COPPER,
    ),
    _material(
        "steel-en12524", "Steel, generic design value (EN 12524)",
        50.0, _EN12524, 7800.0, _EN12524, _CARBON_STEEL,
    ),
    _material(
        "stainless-steel-en12524", "Stainless steel, generic design value (EN 12524)",
        17.0, _EN12524, 7900.0, _EN12524, _STAINLESS,
    ),
)  # fmt: skip

_BY_KEY = MappingProxyType({m.key: m for m in _MATERIALS})


def list_materials(user_materials: Mapping | None = None) -> tuple[str, ...]:
    """Keys of the built-in materials (plus user materials), sorted.

    Parameters
    ----------
    user_materials : Mapping[str, Material or Mapping], optional
        Extra materials by key, as for :func:`get_material` [-].

    Returns
    -------
    tuple of str
        Sorted material keys.
    """
    return tuple(sorted({**_BY_KEY, **_checked_user_materials(user_materials)}))


_USER_FIELDS = ("name", "thermal_conductivity", "density", "specific_heat", "emissivity", "source")


def _from_user_entry(key: str, entry: Mapping) -> Material:
    """A user material from a plain mapping (the form the case file gives)."""
    unknown = sorted(set(entry) - set(_USER_FIELDS))
    if unknown:
        raise InputError(
            f"user_materials[{key!r}]: unknown field(s) {', '.join(map(str, unknown))}; "
            f"allowed: {', '.join(_USER_FIELDS)}"
        )
    source = entry.get("source")
    if not isinstance(source, str) or not source.strip():
        raise InputError(f"user_materials[{key!r}]: source must say where the values come from")
    emissivity = dict(entry.get("emissivity") or {})
    base = _BY_KEY.get(key)
    if base is not None:  # override the built-in entry, field by field
        return base.with_override(
            source,
            name=entry.get("name"),
            thermal_conductivity=entry.get("thermal_conductivity"),
            density=entry.get("density"),
            emissivity=emissivity,
            specific_heat=entry.get("specific_heat"),
        )
    if entry.get("thermal_conductivity") is None:
        raise InputError(f"user_materials[{key!r}]: thermal_conductivity is required")
    density = entry.get("density")
    specific_heat = entry.get("specific_heat")
    return Material(
        key=key,
        name=entry.get("name") or key,
        thermal_conductivity=entry["thermal_conductivity"],
        density=density,
        specific_heat=specific_heat,
        emissivity=emissivity,
        emissivity_range={finish: (value, value) for finish, value in emissivity.items()},
        sources={
            "thermal_conductivity": source,
            **({"density": source} if density is not None else {}),
            **({"specific_heat": source} if specific_heat is not None else {}),
            **{f"emissivity:{finish}": source for finish in emissivity},
        },
    )


def _checked_user_materials(user_materials) -> dict[str, Material]:
    if user_materials is None:
        return {}
    if not isinstance(user_materials, Mapping):
        raise InputError(
            f"user_materials = {type(user_materials).__name__} must map keys to materials"
        )
    out = {}
    for key, entry in user_materials.items():
        if isinstance(entry, Material):
            if entry.key != key:
                raise InputError(f"user_materials[{key!r}] has key {entry.key!r}; they must match")
            out[key] = entry
        elif isinstance(entry, Mapping):
            if not _is_key(key):
                raise InputError(
                    f"user_materials key = {key!r} must be lowercase words joined by hyphens"
                )
            out[key] = _from_user_entry(key, entry)
        else:
            raise InputError(
                f"user_materials[{key!r}] = {type(entry).__name__} must be a Material or a "
                f"mapping with fields {', '.join(_USER_FIELDS)}"
            )
    return out


def get_material(key: str, user_materials: Mapping | None = None) -> Material:
    """Look up a material by key; user materials add to or override the built-in table.

    Parameters
    ----------
    key : str
        Material key, e.g. ``"aluminium-6063-t5"`` (see :func:`list_materials`) [-].
    user_materials : Mapping[str, Material or Mapping], optional
        Materials by key. A :class:`Material` replaces a built-in entry of the same key
        whole. A plain mapping (the case-file form: ``name``, ``thermal_conductivity``
        [W m⁻¹ K⁻¹], ``density`` [kg m⁻³], ``specific_heat`` [J kg⁻¹ K⁻¹], ``emissivity``
        {finish: value} [-], ``source``)
        overrides only the values it gives when the key is built in (each credited to
        ``source``), and otherwise defines a new material (``thermal_conductivity`` required;
        each given emissivity has the range (value, value)).

    Returns
    -------
    Material
        The material, with the sources of its values.

    Raises
    ------
    InputError
        If ``key`` is unknown (the message lists the valid keys), or ``user_materials`` is
        malformed.

    Examples
    --------
    >>> get_material("aluminium-6063-t5").thermal_conductivity
    209.0
    """
    table = {**_BY_KEY, **_checked_user_materials(user_materials)}
    try:
        return table[key]
    except (KeyError, TypeError):
        raise InputError(
            f"material = {key!r} is unknown; valid keys: {', '.join(sorted(table))}"
        ) from None


def material_emissivity(material: Material | str, finish: str) -> float:
    """Typical total hemispherical emissivity of a material with a surface finish.

    Parameters
    ----------
    material : Material or str
        A material, or the key of a built-in material [-].
    finish : str
        One of the material's finishes (a subset of :data:`FINISHES`) [-].

    Returns
    -------
    float
        Typical emissivity [-]; the (low, high) range is ``material.emissivity_range[finish]``
        and its source ``material.sources["emissivity:" + finish]``.

    Raises
    ------
    InputError
        If the material has no such finish (the message lists the valid finishes) or the key
        is unknown.

    Examples
    --------
    >>> material_emissivity("aluminium-6063-t5", "anodised-black")
    0.85
    """
    if not isinstance(material, Material):
        material = get_material(material)
    try:
        return material.emissivity[finish]
    except (KeyError, TypeError):
        raise InputError(
            f"finish = {finish!r} is not available for material {material.key!r}; valid "
            f"finishes: {', '.join(material.emissivity) or '(none given)'}"
        ) from None
