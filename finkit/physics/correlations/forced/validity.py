"""Validity ranges of the forced-convection correlations (plate-fin channels and pin-fin arrays)."""

from __future__ import annotations

import numpy as np

from finkit.errors import InputError
from finkit.validity import ValidityRange

__all__ = [
    "FLAT_PLATE_LAMINAR_REYNOLDS",
    "GADDIS_GNIELINSKI_DIAGONAL_RATIO",
    "GADDIS_GNIELINSKI_INLINE_LONGITUDINAL_RATIO",
    "GADDIS_GNIELINSKI_INLINE_TRANSVERSE_RATIO",
    "GADDIS_GNIELINSKI_REYNOLDS",
    "GADDIS_GNIELINSKI_ROW_COUNT",
    "GADDIS_GNIELINSKI_STAGGERED_LONGITUDINAL_RATIO",
    "GADDIS_GNIELINSKI_STAGGERED_TRANSVERSE_RATIO",
    "GNIELINSKI_BANK_PRANDTL",
    "GNIELINSKI_BANK_REYNOLDS",
    "LAMINAR_LIMIT_REYNOLDS",
    "LOSS_MODELS",
    "PIN_ASPECT_RATIO",
    "PIN_BANK_METHODS",
    "PIN_BANK_PRESSURE_DROP_METHODS",
    "PLATE_CHANNEL_FRICTION_REYNOLDS",
    "PLATE_CHANNEL_METHODS",
    "TEERTSTRA_MODIFIED_REYNOLDS",
    "TURBULENT_LIMIT_REYNOLDS",
    "VDI_CHANNEL_PRANDTL",
    "VDI_CHANNEL_REYNOLDS",
    "ZUKAUSKAS_BLEND_FACTOR",
    "ZUKAUSKAS_LONGITUDINAL_RATIO",
    "ZUKAUSKAS_PRANDTL",
    "ZUKAUSKAS_REYNOLDS",
    "ZUKAUSKAS_ROW_TABLE",
    "ZUKAUSKAS_TRANSVERSE_RATIO",
]

#: Heat-transfer models for plate-fin channels accepted by :func:`plate_fin_channel_flow`.
PLATE_CHANNEL_METHODS = ("teertstra", "vdi")
#: Entrance/exit loss models accepted by :func:`loss_coefficients`.
LOSS_MODELS = ("kays_london", "culham_muzychka")
#: Pin-array pressure-drop methods accepted by :func:`pin_fin_bank_flow`.
PIN_BANK_PRESSURE_DROP_METHODS = ("gaddis_gnielinski",)
#: Pin-array heat-transfer models accepted by :func:`pin_fin_bank_flow`: ``"lower"`` (default)
#: takes, design by design, the lower h of the two published correlations (both refer h to the
#: bulk air, so their h compare directly); ``"zukauskas"`` and ``"gnielinski"`` use one of them.
PIN_BANK_METHODS = ("lower", "zukauskas", "gnielinski")

#: Factor on Re_D,max over which two neighbouring Zukauskas branches are joined
#: (:func:`nusselt_pin_bank_zukauskas`): the band runs from a boundary up (the table steps up
#: there) or down (it steps down) by this factor, on the side where the table is higher [-].
ZUKAUSKAS_BLEND_FACTOR = 1.4

#: Upper Reynolds number of laminar duct flow (on the hydraulic diameter) [-].
LAMINAR_LIMIT_REYNOLDS = 2300.0
#: Lower Reynolds number of fully turbulent duct flow in the VDI Heat Atlas (Gnielinski) [-].
TURBULENT_LIMIT_REYNOLDS = 1.0e4

# --------------------------------------------------------------------------------------------
# Validity ranges
# --------------------------------------------------------------------------------------------
TEERTSTRA_MODIFIED_REYNOLDS = ValidityRange(
    method="Teertstra et al. (1999) plate-fin channel",
    quantity="Re_b*",
    low=0.1,
    high=100.0,
    source="Teertstra, Yovanovich, Culham & Lemczyk 1999, abstract (docs/methods.md e2)",
)
VDI_CHANNEL_PRANDTL = ValidityRange(
    method="VDI Heat Atlas parallel-plate channel, laminar developing flow",
    quantity="Pr",
    low=0.1,
    high=1000.0,
    source="VDI-Wärmeatlas 9th ed. 2002, sec. Gb 7 (as stated in the FluidDissipation library)",
)
VDI_CHANNEL_REYNOLDS = ValidityRange(
    method="VDI Heat Atlas parallel-plate channel (Gnielinski turbulent branch)",
    quantity="Re_2b",
    low=0.0,
    high=1.0e6,
    source="VDI-Wärmeatlas 9th ed. 2002, sec. Gb 7 (Gnielinski equation)",
)
PLATE_CHANNEL_FRICTION_REYNOLDS = ValidityRange(
    method="plate-channel friction: laminar apparent (Shah & London) / turbulent (Konakov)",
    quantity="Re_Dh",
    low=0.0,
    high=LAMINAR_LIMIT_REYNOLDS,
    source="laminar duct flow; 2300 to 1e4 is transitional, where the larger of the laminar and "
    "turbulent friction factors is used (common practice, no source)",
)
ZUKAUSKAS_REYNOLDS = ValidityRange(
    method="Zukauskas tube-bank correlation (pin array)",
    quantity="Re_D,max",
    low=1.0,
    high=2.0e6,
    source="Zukauskas 1987 as tabulated by Bejan 2013 (docs/methods.md f1)",
)
ZUKAUSKAS_PRANDTL = ValidityRange(
    method="Zukauskas tube-bank correlation (pin array)",
    quantity="Pr",
    low=0.7,
    high=500.0,
    source="Zukauskas 1972; Incropera et al. 6th ed. Table 7.5 (docs/methods.md f1)",
)
ZUKAUSKAS_TRANSVERSE_RATIO = ValidityRange(
    method="pin-bank heat transfer (Zukauskas; Gnielinski)",
    quantity="S_T/D",
    low=1.25,
    high=3.0,
    source="pitch ratios of the tube banks behind both correlations, about 1.25 to 3 (from "
    "memory: Zukauskas 1972; VDI Heat Atlas ch. G7)",
)
ZUKAUSKAS_LONGITUDINAL_RATIO = ValidityRange(
    method="pin-bank heat transfer (Zukauskas; Gnielinski)",
    quantity="S_L/D",
    low=1.0,
    high=3.0,
    source="pitch ratios of the tube banks behind both correlations, about 1 to 3 along the "
    "flow (from memory: Zukauskas 1972; VDI Heat Atlas ch. G7)",
)
PIN_ASPECT_RATIO = ValidityRange(
    method="pin-bank heat transfer (tube-bank data on long tubes)",
    quantity="pin height / diameter H/D",
    low=4.0,
    high=np.inf,
    source="tube-bank correlations come from long tubes; on short pins the base (end-wall) "
    "flow dominates and h can differ by 20 % or more (common practice, no source)",
)
GNIELINSKI_BANK_REYNOLDS = ValidityRange(
    method="Gnielinski tube-bundle correlation (pin array)",
    quantity="Re_psi,l",
    low=10.0,
    high=1.0e6,
    source="VDI Heat Atlas, ch. G7 (Gnielinski), as stated in the FluidDissipation library",
)
GNIELINSKI_BANK_PRANDTL = ValidityRange(
    method="Gnielinski tube-bundle correlation (pin array)",
    quantity="Pr",
    low=0.6,
    high=1.0e3,
    source="VDI Heat Atlas, ch. G7 (Gnielinski), as stated in the FluidDissipation library",
)
GADDIS_GNIELINSKI_REYNOLDS = ValidityRange(
    method="Gaddis & Gnielinski (1985) tube-bank pressure drop",
    quantity="Re_D,max",
    low=1.0,
    high=3.0e5,
    source="VDI Heat Atlas 2010, ch. L1 (experimental range)",
)
GADDIS_GNIELINSKI_ROW_COUNT = ValidityRange(
    method="Gaddis & Gnielinski (1985) tube-bank pressure drop",
    quantity="row count N_L",
    low=5.0,
    high=np.inf,
    source="VDI Heat Atlas 2010, ch. L1 (experimental range)",
)
GADDIS_GNIELINSKI_INLINE_TRANSVERSE_RATIO = ValidityRange(
    method="Gaddis & Gnielinski (1985) in-line tube-bank pressure drop",
    quantity="S_T/D",
    low=1.25,
    high=3.0,
    source="VDI Heat Atlas 2010, ch. L1 (pitch ratios tested for Re >= 1e3)",
)
GADDIS_GNIELINSKI_INLINE_LONGITUDINAL_RATIO = ValidityRange(
    method="Gaddis & Gnielinski (1985) in-line tube-bank pressure drop",
    quantity="S_L/D",
    low=1.2,
    high=3.0,
    source="VDI Heat Atlas 2010, ch. L1 (pitch ratios tested for Re >= 1e3)",
)
GADDIS_GNIELINSKI_STAGGERED_TRANSVERSE_RATIO = ValidityRange(
    method="Gaddis & Gnielinski (1985) staggered tube-bank pressure drop",
    quantity="S_T/D",
    low=1.25,
    high=3.0,
    source="VDI Heat Atlas 2010, ch. L1 (pitch ratios tested for Re >= 1e3)",
)
GADDIS_GNIELINSKI_STAGGERED_LONGITUDINAL_RATIO = ValidityRange(
    method="Gaddis & Gnielinski (1985) staggered tube-bank pressure drop",
    quantity="S_L/D",
    low=0.6,
    high=3.0,
    source="VDI Heat Atlas 2010, ch. L1 (pitch ratios tested for Re >= 1e3)",
)
GADDIS_GNIELINSKI_DIAGONAL_RATIO = ValidityRange(
    method="Gaddis & Gnielinski (1985) staggered tube-bank pressure drop",
    quantity="S_D/D",
    low=1.25,
    high=np.inf,
    source="VDI Heat Atlas 2010, ch. L1 (pitch ratios tested for Re >= 1e3)",
)
FLAT_PLATE_LAMINAR_REYNOLDS = ValidityRange(
    method="laminar flat plate 0.664 Re^0.5 Pr^(1/3) (pin-array base)",
    quantity="Re_L",
    low=0.0,
    high=5.0e5,
    source="Incropera et al. 6th ed., Eq. 7.30 with transition at 5e5",
)

#: Zukauskas row correction C2(N_L): row counts and in-line / staggered factors
#: (Incropera et al. 6th ed. Table 7.6; C2 = 1 for N_L >= 20).
ZUKAUSKAS_ROW_TABLE = {
    "row_count": (1.0, 2.0, 3.0, 4.0, 5.0, 7.0, 10.0, 13.0, 16.0, 20.0),
    "inline": (0.70, 0.80, 0.86, 0.90, 0.92, 0.95, 0.97, 0.98, 0.99, 1.0),
    "staggered": (0.64, 0.76, 0.84, 0.89, 0.92, 0.95, 0.97, 0.98, 0.99, 1.0),
}


def _as_float(x):
    return np.asarray(x, dtype=float)


def _check_choice(name, value, allowed):
    if not isinstance(value, str) or value not in allowed:
        raise InputError(f"{name} = {value!r} is not allowed; use one of {allowed}")
