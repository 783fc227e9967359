"""The case boundary: case files in, validated SI cases out (pint and pydantic live here).

- :mod:`finkit.case.units`: the unit registry and SI conversion;
- :mod:`finkit.case.fields`: the field types shared by the schema blocks;
- :mod:`finkit.case.bounds`: envelopes and manufacturing bounds of a design;
- :mod:`finkit.case.review_blocks`, :mod:`finkit.case.explore_blocks`: the blocks of the
  scenarios, measurements, checks, tolerances, Monte Carlo and trade study;
- :mod:`finkit.case.schema`: the case file (:func:`load_case`, :class:`HeatSinkCase`, ...);
- :mod:`finkit.case.parameters`: variant columns and dotted parameter paths.

Imports only from :mod:`finkit.physics` and the base modules. The schema's public names are
re-exported here (``from finkit.case import load_case``).
"""

from finkit.case.schema import *  # noqa: F403
from finkit.case.schema import __all__  # noqa: F401
