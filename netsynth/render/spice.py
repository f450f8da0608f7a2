"""A network as a SPICE subcircuit, and a small deck around it for an operating-point check.

:func:`to_spice` writes ``.subckt NAME A B`` with one ``R`` element per part, in the order of
:func:`netsynth.network.parts_in_order`, on the nodes of :func:`netsynth.network.to_netlist`:
terminal 0 is ``A``, terminal 1 is ``B`` and inner node *i* is ``N<i>`` (``N2``, ``N3``, ...).
:func:`to_spice_deck` adds a DC source across the terminals, ``.op`` and ``.end``.

Element names
    ``R<k>_L<line>``: *k* counts the parts from 1 in that order and *line* is the bin line
    the part is taken from (``part.line.line``), so a simulator's report points back at the
    drawer. A part with no stock line (typed by hand), or with line 0 (not numbered yet),
    is plain ``R<k>``.
Values
    Plain numbers in scientific notation with the shortest digits that read back exactly
    (``4.7e3``, ``1e-3``, ``2.2e6``), never a scale suffix: in SPICE ``M`` is milli and mega
    is ``MEG``, and a plain number cannot be misread by any simulator.
Tolerance and temperature coefficient
    Written as a comment line after each element, never as ``TC1=``. A stock line's tcr is
    a magnitude (written ``+/-100 ppm/K``): the sign is unknown, and a ``TC1`` parameter would assert
    one, so a temperature sweep would move every part the same, guessed way. To simulate a
    corner, add ``TC1=+1e-4`` or ``TC1=-1e-4`` (1/K, i.e. ppm/K × 1e-6) by hand.
Comments
    Whole lines starting with ``*``; free text from the bin (location) is put on one line.

The text is plain ASCII apart from what the bin's own text holds, and reads in ngspice
(checked by tests/test_spice.py against :func:`netsynth.nodal.solve_network`).
"""

from __future__ import annotations

import math
import re
from decimal import Decimal

from netsynth.errors import ArgumentError
from netsynth.network import Network, Part, parts_in_order, to_netlist
from netsynth.render.compact import compact

__all__ = ["spice_number", "to_spice", "to_spice_deck"]

_NAME = re.compile(r"[A-Za-z_][A-Za-z0-9_]*")
#: the longest network description put in a comment line; longer ones are cut with "..."
_MAX_COMMENT = 200


def spice_number(x: float) -> str:
    """A float as a plain SPICE number: shortest round-trip digits, scientific notation.

    Examples
    --------
    >>> [spice_number(v) for v in (4700.0, 0.001, 2.2e6, 3370.0, 10.0, 1.0, 0.25)]
    ['4.7e3', '1e-3', '2.2e6', '3.37e3', '1e1', '1', '2.5e-1']
    """
    if not math.isfinite(x):
        raise ArgumentError(f"cannot write {x!r} as a SPICE number: it must be finite")
    d = Decimal(repr(float(x))).normalize()
    sign = "-" if d < 0 else ""
    digits = "".join(map(str, d.as_tuple().digits))
    mantissa = digits[0] + ("." + digits[1:] if len(digits) > 1 else "")
    exponent = d.adjusted()
    return f"{sign}{mantissa}" + (f"e{exponent}" if exponent else "")


def _node(index: int) -> str:
    return {0: "A", 1: "B"}.get(index, f"N{index}")


def _element_name(k: int, part: Part) -> str:
    if part.line is None or part.line.line == 0:
        return f"R{k}"
    return f"R{k}_L{part.line.line}"


def _one_line(text: str, limit: int = _MAX_COMMENT) -> str:
    flat = " ".join(text.split())
    return flat if len(flat) <= limit else flat[: limit - 3] + "..."


def _part_comment(name: str, part: Part) -> str:
    if part.line is None:
        return f"* {name}: not from the bin; tolerance and tcr unknown"
    item = part.line
    where = f", location {_one_line(item.location, 60)}" if item.location else ""
    return (f"* {name}: tolerance +/-{item.tolerance * 100:g} %, tcr +/-{item.tcr_ppm:g} ppm/K "
            f"(sign unknown; TC1 = +/-{item.tcr_ppm * 1e-6:g} /K), bin line {item.line}{where}")


def _checked_name(name: str) -> str:
    if not isinstance(name, str) or not _NAME.fullmatch(name):
        raise ArgumentError(f"name={name!r}: a subcircuit name is a letter or '_' followed by letters, "
                            "digits or '_', such as NETSYNTH")
    return name


def to_spice(net: Network, name: str = "NETSYNTH", title: str | None = None) -> str:
    """The network as ``.subckt NAME A B`` ... ``.ends NAME``, one ``R`` element per part.

    Parameters
    ----------
    net : Network
        Any series/parallel tree; parts may carry stock lines.
    name : str
        Subcircuit name: a letter or ``_``, then letters, digits or ``_``.
    title : str, optional
        Written as the first comment line; by default the network in its compact text form.

    Returns
    -------
    str
        Lines ending in ``\\n``: comments (``*``), ``.subckt``, the elements, each followed by
        its tolerance/tcr comment, and ``.ends``. Include it with ``.include`` or paste it.

    Raises
    ------
    ArgumentError
        If `name` is not a valid subcircuit name.

    Examples
    --------
    >>> from netsynth.network import from_text
    >>> print(to_spice(from_text("1k + (2k2 || 4k7)")), end="")
    * netsynth network: 1k + (2k2 || 4k7)
    * terminals A and B; values in ohms; tolerance and tcr (magnitude, sign unknown) as comments
    .subckt NETSYNTH A B
    R1 A N2 1e3
    * R1: not from the bin; tolerance and tcr unknown
    R2 N2 B 2.2e3
    * R2: not from the bin; tolerance and tcr unknown
    R3 N2 B 4.7e3
    * R3: not from the bin; tolerance and tcr unknown
    .ends NETSYNTH
    """
    _checked_name(name)
    edges, _ = to_netlist(net)
    parts = parts_in_order(net)
    heading = title if title is not None else f"netsynth network: {compact(net)}"
    lines = [
        f"* {_one_line(heading)}",
        "* terminals A and B; values in ohms; tolerance and tcr (magnitude, sign unknown) as comments",
        f".subckt {name} A B",
    ]
    for k, (edge, part) in enumerate(zip(edges, parts, strict=True), start=1):
        element = _element_name(k, part)
        lines.append(f"{element} {_node(edge.a)} {_node(edge.b)} {spice_number(edge.ohms)}")
        lines.append(_part_comment(element, part))
    lines.append(f".ends {name}")
    return "\n".join(lines) + "\n"


def to_spice_deck(net: Network, volts: float, name: str = "NETSYNTH") -> str:
    """A complete SPICE deck: the subcircuit, a DC source of `volts` across A-B, ``.op``, ``.end``.

    Terminal B is the deck's ground (node ``0``); the source is ``VDRIVE A 0 DC <volts>`` and
    the subcircuit instance ``XNET A 0 <name>``. The current SPICE reports for ``VDRIVE`` flows
    into its + terminal, so the network's current is minus that, and its resistance is
    ``volts / -I(VDRIVE)``. In ngspice an element ``R1`` of the subcircuit is ``r.xnet.r1``.

    Raises
    ------
    ArgumentError
        If `volts` is not finite, or `name` is not a valid subcircuit name.

    Examples
    --------
    >>> from netsynth.network import from_text
    >>> print(to_spice_deck(from_text("1k + 1k"), 5.0), end="")
    * netsynth operating point at 5 V across A-B (B is ground)
    * netsynth network: 2s(1k)
    * terminals A and B; values in ohms; tolerance and tcr (magnitude, sign unknown) as comments
    .subckt NETSYNTH A B
    R1 A N2 1e3
    * R1: not from the bin; tolerance and tcr unknown
    R2 N2 B 1e3
    * R2: not from the bin; tolerance and tcr unknown
    .ends NETSYNTH
    VDRIVE A 0 DC 5
    XNET A 0 NETSYNTH
    .op
    .end
    """
    if isinstance(volts, bool) or not isinstance(volts, (int, float)) or not math.isfinite(volts):
        raise ArgumentError(f"volts={volts!r}: the drive voltage must be a finite number")
    return (
        f"* netsynth operating point at {float(volts):g} V across A-B (B is ground)\n"
        + to_spice(net, name)
        + f"VDRIVE A 0 DC {spice_number(float(volts))}\n"
        + f"XNET A 0 {name}\n"
        + ".op\n"
        + ".end\n"
    )
