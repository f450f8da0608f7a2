"""Several targets from one bin: each network takes its parts out of the bin before the next.

A calibration ladder (several temperatures), a ring shunt (several sections) and a multiplier
chain are built from one drawer, and a part used for one target is not in the drawer for the
next. :func:`in_turn` searches the targets one after another, each in the bin that is left.

This order is **greedy, not a joint optimum**: the first target gets the pick of the drawer,
and a later target may land further off than it would had the first taken other parts. With
an unlimited bin (a kit, the default bin) the order does not matter.

``synthesize`` is passed in (usually :func:`netsynth.api.make` with the caller's options), since
this package sits below the API.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Callable, Iterable, Sequence

from netsynth.design import Design, PickLine
from netsynth.errors import InfeasibleError
from netsynth.stock import StockBin

__all__ = ["GREEDY_NOTE", "in_turn", "take_parts"]

#: what every report of targets built in turn says about the order
GREEDY_NOTE = ("targets are built in the order given, each from the parts the earlier ones left in the bin; "
               "this greedy order is not a joint optimum (another order or a joint search may do better)")


def take_parts(stock: StockBin, picks: Iterable[PickLine]) -> StockBin:
    """The bin with the picked parts taken out (lines of unlimited count stay as they are).

    Lines that run empty are dropped; the others keep their bin-file line numbers.

    Raises
    ------
    InfeasibleError
        When the picks take every part the bin holds, or more of a line than it holds.

    Examples
    --------
    >>> from netsynth.stock import StockItem
    >>> from netsynth.design import PickLine
    >>> b = StockBin((StockItem(100.0, 2), StockItem(220.0, 1)))
    >>> [(i.ohms, i.count) for i in take_parts(b, [PickLine(b.items[0], 1), PickLine(b.items[1], 1)]).items]
    [(100.0, 1)]
    """
    taken: dict[int, int] = {}
    for pick in picks:
        index = next((i for i, item in enumerate(stock.items) if item is pick.line or item == pick.line), None)
        if index is None:
            raise InfeasibleError(f"a picked part ({pick.line.ohms!r} Ω) is not a line of the bin {stock.name!r}")
        taken[index] = taken.get(index, 0) + pick.count
    left = []
    for i, item in enumerate(stock.items):
        n = taken.get(i, 0)
        if item.count is None or n == 0:
            left.append(item)
            continue
        if n > item.count:
            raise InfeasibleError(f"the picks take {n} of {item.ohms!r} Ω but the bin's line {item.line} holds "
                                  f"{item.count}")
        if item.count > n:
            left.append(dataclasses.replace(item, count=item.count - n))
    if not left:
        raise InfeasibleError(f"the bin {stock.name!r} is empty after the earlier targets took their parts; "
                              "add parts or ask for fewer targets")
    return StockBin(tuple(left), name=stock.name)


def in_turn(targets: Sequence[float], stock: StockBin,
            synthesize: Callable[[float, StockBin, int], Design]) -> tuple[Design, ...]:
    """Synthesize each target in order, each from the parts the earlier ones left (see the module docstring).

    Parameters
    ----------
    targets : ohms, in the order they get their pick of the bin
    stock : the bin
    synthesize : ``synthesize(target_ohms, stock, index)`` returns the design of target ``index``

    Raises
    ------
    InfeasibleError
        When the bin runs out before the last target (names the target).
    """
    designs = []
    left = stock
    for index, target in enumerate(targets):
        design = synthesize(target, left, index)
        designs.append(design)
        if index + 1 < len(targets):
            try:
                left = take_parts(left, design.pick_list)
            except InfeasibleError as exc:
                raise InfeasibleError(f"target {index + 2} of {len(targets)}: {exc}") from None
    return tuple(designs)
