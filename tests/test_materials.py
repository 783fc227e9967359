"""Tests of finkit.physics.properties.materials: sources, sanity, published values, overrides."""

import dataclasses

import pytest

from finkit.errors import InputError
from finkit.physics.properties.materials import (
    FINISHES,
    Material,
    get_material,
    list_materials,
    material_emissivity,
)

ALL = [get_material(key) for key in list_materials()]


@pytest.mark.parametrize("material", ALL, ids=lambda m: m.key)
def test_every_value_has_a_source(material):
    expected = {"thermal_conductivity", "density", "specific_heat"} | {
        f"emissivity:{finish}" for finish in material.emissivity
    }
    assert set(material.sources) == expected
    assert all(len(text.strip()) > 10 for text in material.sources.values())
    assert set(material.emissivity_range) == set(material.emissivity)
    assert set(material.emissivity) <= set(FINISHES)
    assert material.emissivity, "every material has at least one finish"


@pytest.mark.parametrize("material", ALL, ids=lambda m: m.key)
def test_values_are_physically_sensible(material):
    # Common practice, no source: engineering metals near 300 K lie between stainless steel
    # (~13 W/m K) and pure copper (~400 W/m K); densities between aluminium (~2700 kg/m3)
    # and copper (~8900 kg/m3).
    assert 10.0 <= material.thermal_conductivity <= 410.0
    assert 2600.0 <= material.density <= 9000.0
    family = material.key.split("-")[0]
    if family == "aluminium":
        assert 2650.0 <= material.density <= 2850.0
        assert 80.0 <= material.thermal_conductivity <= 240.0
    elif family == "copper":
        assert 8850.0 <= material.density <= 8960.0
        assert 370.0 <= material.thermal_conductivity <= 405.0
    for finish, typical in material.emissivity.items():
        low, high = material.emissivity_range[finish]
        assert 0.0 < low <= typical <= high <= 1.0


@pytest.mark.published
@pytest.mark.parametrize(
    ("key", "conductivity", "density"),
    [
        # Source: Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., Table A.1
        # (300 K), confirmed against a public reproduction of the table; printed to 3-4 figures.
        ("aluminium-pure", 237.0, 2702.0),
        ("aluminium-2024-t6", 177.0, 2770.0),
        ("copper-pure", 401.0, 8933.0),
        # Source: same table, From memory (not confirmed).
        ("steel-plain-carbon", 60.5, 7854.0),
        ("steel-aisi-1010", 63.9, 7832.0),
        ("stainless-steel-304", 14.9, 7900.0),
        ("stainless-steel-316", 13.4, 8238.0),
    ],
)
def test_incropera_table_a1(key, conductivity, density):
    material = get_material(key)
    assert material.thermal_conductivity == pytest.approx(conductivity, rel=5e-3)
    assert material.density == pytest.approx(density, rel=5e-4)
    assert "Table A.1" in material.sources["thermal_conductivity"]


@pytest.mark.published
@pytest.mark.parametrize(
    ("key", "ht_name"),
    [
        ("aluminium-alloys-en12524", "Metals, aluminium alloys"),
        ("copper-en12524", "Metals, copper"),
        ("steel-en12524", "Metals, steel"),
        ("stainless-steel-en12524", "Metals, stainless steel"),
    ],
)
def test_en12524_generic_values_match_ht(key, ht_name):
    # Cross-check: ht 1.2 ht.insulation.k_material / rho_material (EN 12524:2000 values).
    from ht.insulation import k_material, rho_material

    material = get_material(key)
    assert material.thermal_conductivity == pytest.approx(k_material(ht_name), rel=1e-12)
    assert material.density == pytest.approx(rho_material(ht_name), rel=1e-12)
    assert "EN 12524" in material.sources["thermal_conductivity"]


@pytest.mark.published
@pytest.mark.parametrize(
    ("key", "specific_heat"),
    [
        # Source: Incropera et al., Fundamentals of Heat and Mass Transfer, 6th ed., Table A.1,
        # c_p at 300 K, confirmed against a public reproduction of the table; 3 figures.
        ("aluminium-pure", 903.0),
        ("aluminium-2024-t6", 875.0),
        ("copper-pure", 385.0),
        ("stainless-steel-316", 468.0),
        # Source: same table, from memory (not confirmed).
        ("steel-plain-carbon", 434.0),
        ("steel-aisi-1010", 434.0),
        ("stainless-steel-304", 477.0),
    ],
)
def test_incropera_table_a1_specific_heat(key, specific_heat):
    material = get_material(key)
    assert material.specific_heat == pytest.approx(specific_heat, rel=5e-3)
    assert "Table A.1" in material.sources["specific_heat"]


@pytest.mark.published
@pytest.mark.parametrize(
    ("key", "ht_name"),
    [
        ("aluminium-alloys-en12524", "Metals, aluminium alloys"),
        ("copper-en12524", "Metals, copper"),
        ("steel-en12524", "Metals, steel"),
        ("stainless-steel-en12524", "Metals, stainless steel"),
    ],
)
def test_en12524_specific_heat_matches_ht(key, ht_name):
    # Cross-check: ht 1.2 ht.insulation.Cp_material (EN 12524:2000 values).
    from ht.insulation import Cp_material

    assert get_material(key).specific_heat == pytest.approx(Cp_material(ht_name), rel=1e-12)


def test_every_built_in_material_has_a_specific_heat():
    # Common practice, no source: metals near 300 K lie between copper (~385 J/kg K) and
    # aluminium (~900-960 J/kg K for alloys).
    for material in ALL:
        assert 370.0 <= material.specific_heat <= 970.0


def test_user_material_specific_heat():
    material = get_material(
        "my-alloy",
        {"my-alloy": {"thermal_conductivity": 150.0, "specific_heat": 880.0, "source": "lab"}},
    )
    assert material.specific_heat == 880.0
    assert material.sources["specific_heat"] == "lab"
    assert (
        get_material(
            "my-other", {"my-other": {"thermal_conductivity": 150.0, "source": "lab"}}
        ).specific_heat
        is None
    )


@pytest.mark.published
def test_alloy_conductivity_ordering():
    # Common practice, no source: alloying lowers conductivity, so within each family the
    # purer grade conducts better (pure > 1050 > 1100 > 6063-T5 > 6063-T6 > 6061-T6 > die-cast;
    # pure Cu > C10100 > C11000 > EN 12524 design value; carbon steel > stainless).
    k = {m.key: m.thermal_conductivity for m in ALL}
    chain = [
        "aluminium-pure",
        "aluminium-1050",
        "aluminium-1100",
        "aluminium-6063-t5",
        "aluminium-6063-t6",
        "aluminium-6061-t6",
        "aluminium-a380-die-cast",
    ]
    assert all(k[a] > k[b] for a, b in zip(chain, chain[1:], strict=False))
    copper = ["copper-pure", "copper-c10100", "copper-c11000", "copper-en12524"]
    assert all(k[a] > k[b] for a, b in zip(copper, copper[1:], strict=False))
    assert min(k["steel-aisi-1010"], k["steel-plain-carbon"]) > 3 * k["stainless-steel-304"]


@pytest.mark.published
def test_emissivity_ranges_follow_common_practice():
    # Source: finkit methods reference, section g3 (common practice): black anodised Al
    # 0.80-0.95, clear anodised 0.7-0.85, polished Al 0.03-0.06, polished Cu 0.02-0.05,
    # oxidised Cu 0.5-0.8, painted 0.85-0.95.
    al = get_material("aluminium-6063-t5")
    assert 0.80 <= al.emissivity["anodised-black"] <= 0.95
    assert 0.70 <= al.emissivity["anodised-clear"] <= 0.85
    assert 0.03 <= al.emissivity["polished"] <= 0.06
    assert 0.85 <= al.emissivity["painted"] <= 0.95
    cu = get_material("copper-c11000")
    assert 0.02 <= cu.emissivity["polished"] <= 0.05
    assert 0.5 <= cu.emissivity["oxidised"] <= 0.8
    # Finishes that make no sense are absent: no anodising of copper, steel or die-castings.
    for key in (
        "copper-c11000",
        "steel-aisi-1010",
        "stainless-steel-304",
        "aluminium-a380-die-cast",
    ):
        assert "anodised-black" not in get_material(key).emissivity


def test_unknown_key_lists_valid_keys():
    with pytest.raises(InputError) as info:
        get_material("unobtainium")
    message = str(info.value)
    assert "\n" not in message
    assert message.startswith("material = 'unobtainium' is unknown")
    assert all(key in message for key in list_materials())


def test_unknown_finish_lists_valid_finishes():
    with pytest.raises(InputError) as info:
        material_emissivity("copper-c11000", "anodised-black")
    message = str(info.value)
    assert "\n" not in message
    assert "polished, bare, oxidised, painted" in message
    assert material_emissivity("copper-c11000", "oxidised") == 0.65
    assert material_emissivity(get_material("aluminium-6063-t5"), "anodised-black") == 0.85


def _custom(key="norrbeck-special", k=180.0):
    return Material(
        key=key,
        name="Example alloy",
        thermal_conductivity=k,
        density=2690.0,
        emissivity={"anodised-black": 0.88},
        emissivity_range={"anodised-black": (0.85, 0.9)},
        sources={
            "thermal_conductivity": "supplier datasheet",
            "density": "supplier datasheet",
            "emissivity:anodised-black": "measured",
        },
    )


def test_user_materials_add_and_override():
    added = _custom()
    assert get_material("norrbeck-special", {"norrbeck-special": added}) is added
    assert "norrbeck-special" in list_materials({"norrbeck-special": added})
    override = _custom(key="aluminium-6063-t5", k=201.0)
    got = get_material("aluminium-6063-t5", {"aluminium-6063-t5": override})
    assert got.thermal_conductivity == 201.0
    # The built-in table is untouched.
    assert get_material("aluminium-6063-t5").thermal_conductivity == 209.0
    with pytest.raises(InputError, match="must match"):
        get_material("x", {"x": _custom()})
    with pytest.raises(InputError, match="must be a Material or a mapping"):
        get_material("x", {"x": 42.0})


def test_user_materials_in_case_file_form():
    # The case file gives plain mappings; for a built-in key only the given values change.
    entry = {
        "name": "6063-T5, our extruder",
        "thermal_conductivity": 201.0,
        "density": None,
        "emissivity": {"anodised-black": 0.9},
        "source": "extruder datasheet",
    }
    got = get_material("aluminium-6063-t5", {"aluminium-6063-t5": entry})
    base = get_material("aluminium-6063-t5")
    assert got.thermal_conductivity == 201.0
    assert got.sources["thermal_conductivity"] == "extruder datasheet"
    assert got.density == base.density and got.sources["density"] == base.sources["density"]
    assert got.emissivity["anodised-black"] == 0.9
    assert got.emissivity["bare"] == base.emissivity["bare"]
    assert got.name == "6063-T5, our extruder"
    # A new key defines a new material; custom finish names are allowed for user materials.
    new = get_material(
        "norrbeck-cast",
        {
            "norrbeck-cast": {
                "name": "Cast housing alloy",
                "thermal_conductivity": 130.0,
                "emissivity": {"powder-coated": 0.92},
                "source": "supplier datasheet",
            }
        },
    )
    assert new.density is None
    assert material_emissivity(new, "powder-coated") == 0.92
    assert new.emissivity_range["powder-coated"] == (0.92, 0.92)
    with pytest.raises(InputError, match="thermal_conductivity is required"):
        get_material("norrbeck-x", {"norrbeck-x": {"name": "x", "source": "y"}})
    with pytest.raises(InputError, match="unknown field"):
        get_material("norrbeck-x", {"norrbeck-x": {"conductivity": 1.0, "source": "y"}})
    with pytest.raises(InputError, match="source"):
        get_material("norrbeck-x", {"norrbeck-x": {"thermal_conductivity": 100.0}})
    with pytest.raises(InputError, match="thermal_conductivity"):
        get_material("norrbeck-x", {"norrbeck-x": {"thermal_conductivity": -1.0, "source": "y"}})


def test_with_override_credits_the_new_source():
    base = get_material("aluminium-6063-t5")
    changed = base.with_override(
        "case file: supplier datasheet", thermal_conductivity=205.0, emissivity={"bare": 0.12}
    )
    assert changed.thermal_conductivity == 205.0
    assert changed.sources["thermal_conductivity"] == "case file: supplier datasheet"
    assert changed.emissivity["bare"] == 0.12
    assert changed.emissivity_range["bare"] == (0.12, 0.12)
    assert changed.sources["density"] == base.sources["density"]
    assert base.thermal_conductivity == 209.0 and base.emissivity["bare"] == 0.09


@pytest.mark.parametrize(
    "changes",
    [
        {"thermal_conductivity": -5.0},
        {"density": 0.0},
        {"thermal_conductivity": float("nan")},
        {"emissivity": {"anodised-black": 1.2}},
        {"emissivity": {"Bad Finish": 0.1}, "emissivity_range": {"Bad Finish": (0.05, 0.2)}},
        {"sources": {"thermal_conductivity": "x", "density": "y"}},
        {"key": "Bad Key"},
    ],
)
def test_invalid_material_is_rejected(changes):
    fields = {f.name: getattr(_custom(), f.name) for f in dataclasses.fields(Material)}
    fields.update(changes)
    if "emissivity" in changes and "emissivity_range" not in changes:
        fields["emissivity_range"] = {k: (0.5, 1.0) for k in changes["emissivity"]}
    with pytest.raises(InputError):
        Material(**fields)


def test_material_is_immutable():
    material = get_material("copper-pure")
    with pytest.raises(dataclasses.FrozenInstanceError):
        material.thermal_conductivity = 1.0
    with pytest.raises(TypeError):
        material.emissivity["polished"] = 0.5
