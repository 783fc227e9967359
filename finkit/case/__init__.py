"""The case boundary: case files in, validated SI cases out (pint and pydantic live here).

- :mod:`finkit.case.units`: the unit registry and SI conversion;
- :mod:`finkit.case.fields`: the field types shared by the schema blocks;
- :mod:`finkit.case.bounds`: envelopes and manufacturing bounds of a design;
- :mod:`finkit.case.review_blocks`, :mod:`finkit.case.explore_blocks`: the blocks of the
  scenarios, measurements, checks, tolerances, Monte Carlo and trade study;
- :mod:`finkit.case.parts`, :mod:`finkit.case.heat_sink`, :mod:`finkit.case.single_fin`: the
  field types, the shared parts and the two kinds of case;
- :mod:`finkit.case.messages`, :mod:`finkit.case.cross_checks`: reading a file, one-line
  errors, checks across sections;
- :mod:`finkit.case.schema`: :func:`load_case` and the case types;
- :mod:`finkit.case.parameters`: variant columns and dotted parameter paths.

Imports only from :mod:`finkit.physics` and the base modules. The public names of the case file
are re-exported here (``from finkit.case import load_case``).
"""

from finkit.case import cross_checks, heat_sink, messages, parts, schema, single_fin
from finkit.case.cross_checks import *  # noqa: F403
from finkit.case.heat_sink import *  # noqa: F403
from finkit.case.messages import *  # noqa: F403
from finkit.case.parts import *  # noqa: F403
from finkit.case.schema import *  # noqa: F403
from finkit.case.single_fin import *  # noqa: F403

__all__ = [
    name
    for module in (parts, heat_sink, single_fin, messages, cross_checks, schema)
    for name in getattr(module, "__all__", ())
]
