"""The user's stock bin: which resistor values are on hand, how many, and their ratings.

Map of the package
------------------
``items``    :class:`StockItem` (one line of the bin, with its line number) and :class:`StockBin`
             (the whole bin, sorted by value); the ``DEFAULT_*`` ratings, :data:`COLUMNS`, the
             field checks and the merge rule (same value and ratings: one part)
``kits``     bins netsynth builds: :func:`kit_bin`, :func:`default_bin`, :func:`bin_from_values`
``binfile``  the bin file format (CSV): :func:`load_bin`, :func:`save_bin` (atomic)

Imports run one way: this module imports ``kits`` and ``binfile``, and both import ``items``,
which imports neither.  The public names are re-exported here, so
``from netsynth.stock import StockBin, load_bin, kit_bin`` is the way to reach them.
"""

from __future__ import annotations

from netsynth.stock.binfile import load_bin, save_bin
from netsynth.stock.items import (
    COLUMNS,
    DEFAULT_MAX_TEMP_C,
    DEFAULT_MAX_VOLTS,
    DEFAULT_POWER_W,
    DEFAULT_TCR_PPM,
    DEFAULT_TOLERANCE,
    StockBin,
    StockItem,
    bin_order,
)
from netsynth.stock.kits import bin_from_values, default_bin, kit_bin

__all__ = [
    "COLUMNS",
    "DEFAULT_MAX_TEMP_C",
    "DEFAULT_MAX_VOLTS",
    "DEFAULT_POWER_W",
    "DEFAULT_TCR_PPM",
    "DEFAULT_TOLERANCE",
    "StockBin",
    "StockItem",
    "bin_from_values",
    "bin_order",
    "default_bin",
    "kit_bin",
    "load_bin",
    "save_bin",
]
