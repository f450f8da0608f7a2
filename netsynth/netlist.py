"""Networks in: read a resistor netlist (SPICE or an edge list) and find its shape between two nodes.

``netsynth check --netlist FILE --between A B`` checks a network someone drew, bridges included.
This module reads the file and works out the network's shape with networkx; the electrical
analysis (value, stress, bands) is :mod:`netsynth.analysis.netlist`, on the nodal solver.

Map of the module
-----------------
``Element`` / ``Netlist``   one resistor (name, two node names, ohms, file line) / a file of them
:func:`read_netlist`         read a file: SPICE or edge list, told apart as below
:func:`parse_spice`          SPICE: ``R<name> <node> <node> <value>`` elements
:func:`parse_edges`          edge list: ``node, node, value`` (commas or spaces)
:func:`spice_value`          a SPICE number with its scale suffix (``M`` is milli, ``MEG`` mega)
``Topology`` / :func:`topology`
    between two terminals: which parts can carry current (connectivity and biconnected blocks),
    which cannot and why, the nodal netlist of the rest, and its ``+``/``||`` form when it is
    series/parallel reducible (``None`` for a bridge).

SPICE (as read here)
    * ``*`` starts a comment line; ``;`` and `` $`` start a comment inside a line; a line
      starting with ``+`` continues the one before. Names, nodes and suffixes ignore case.
    * The first line of a deck is its title, as in every SPICE: line 1 is skipped unless it is a
      comment, a dot command, or a complete ``R`` element (a hand-written include file).
    * ``R<name> n1 n2 value`` with optional ``key=value`` parameters after it (``tc1=``,
      ``temp=`` ... are ignored; ``m=`` other than 1 is refused). ``r=value`` is also read.
      Values: a number and a scale suffix, ``T`` 1e12, ``G`` 1e9, ``MEG`` 1e6, ``K`` 1e3, ``M``
      1e-3, ``MIL`` 25.4e-6, ``U`` 1e-6, ``N`` 1e-9, ``P`` 1e-12, ``F`` 1e-15; letters after the
      suffix are ignored (``10kohm``). A value written ``4k7`` is refused: SPICE reads it as
      4 kΩ, not 4.7 kΩ. Parameters in braces and models are refused (no evaluator here).
    * ``.subckt NAME ports`` ... ``.ends``: the resistors of one subcircuit, or of the top level,
      are the network (a file with resistors in more than one is refused: keep one). Its two
      ports are the default terminals. Other elements (sources, instances, capacitors) are
      left out; those inside the chosen scope are listed in ``Netlist.notes``. ``.end`` stops
      reading; ``.control`` ... ``.endc`` is skipped.
Edge list
    One part per line: ``node, node, value`` (or separated by spaces), values in netsynth's own
    spellings (:func:`netsynth.values.parse_resistance`: ``m`` milli, ``M`` mega, ``4k7``);
    ``#`` starts a comment line; a first row whose value does not read is a header. Parts are
    named ``line N``.
Telling them apart
    A file is SPICE when a line starts with ``*``, ``.`` or ``+``, or a line does not have
    exactly three fields; otherwise an edge list.

Node names are compared ignoring case (``A`` is ``a``), and shown as first written.

Carrying current (:func:`topology`)
    With a virtual wire from A to B added, a part can carry current for some values exactly
    when it lies in the biconnected block of that wire (it is then on a simple path from A to
    B). Every other part is dead whatever its value: shorted (both ends on one node), not
    connected to the terminals, or on a dangling branch. A balanced bridge is dead only at its
    particular values: :mod:`netsynth.analysis.netlist` finds that from the currents.

References
----------
Hopcroft and Tarjan, "Efficient algorithms for graph manipulation", CACM 16 (1973) 372-378
(biconnected components; networkx's implementation). Series/parallel reduction by repeated
merging of parallel edges and removal of inner nodes of degree two: R. J. Duffin,
"Topology of series-parallel networks", J. Math. Anal. Appl. 10 (1965) 303-318 (from memory).
"""

from __future__ import annotations

import csv
import math
import os
import re
from collections import defaultdict
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal

from netsynth.atomic import read_capped, utf8_text
from netsynth.errors import ArgumentError, ValueParseError
from netsynth.network import Network, Part, parallel, series
from netsynth.nodal import Edge
from netsynth.values import parse_resistance

__all__ = [
    "Element",
    "Netlist",
    "Topology",
    "parse_edges",
    "parse_netlist",
    "parse_spice",
    "read_netlist",
    "spice_value",
    "topology",
]

#: netlists larger than this are refused (a resistor network to build by hand, not a chip)
MAX_ELEMENTS = 2_000
#: bytes read at most from a netlist file
MAX_BYTES = 5 * 2**20


@dataclass(frozen=True, slots=True)
class Element:
    """One resistor of a netlist: its name, the two nodes as written, ohms, and the file line."""

    name: str
    a: str
    b: str
    ohms: float
    line: int


@dataclass(frozen=True, slots=True)
class Netlist:
    """The resistors of one file, what kind of file it was, and the subcircuit's ports."""

    name: str
    kind: Literal["spice", "edges"]
    elements: tuple[Element, ...]
    ports: tuple[str, ...] = ()  #: the ports of the ``.subckt`` read, as written; () otherwise
    notes: tuple[str, ...] = ()  #: what was read in a way worth saying (``M`` as milli; elements left out)


# --------------------------------------------------------------------------- values

_SPICE_NUMBER = re.compile(r"([+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?)([a-zA-Zµ]*)")
_SCALE = {"t": 1e12, "g": 1e9, "k": 1e3, "m": 1e-3, "u": 1e-6, "µ": 1e-6, "n": 1e-9, "p": 1e-12, "f": 1e-15}


def spice_value(token: str) -> float:
    """A SPICE number: digits, then an optional scale suffix; later letters are ignored.

    Raises
    ------
    ValueParseError
        On anything else, with the reason (``4k7``: SPICE would read 4 kΩ).

    Examples
    --------
    >>> [spice_value(t) for t in ("4.7k", "4.7K", "1MEG", "1M", "10mohm", "2.2e3", "1u", "100")]
    [4700.0, 4700.0, 1000000.0, 0.001, 0.01, 2200.0, 1e-06, 100.0]
    """
    m = _SPICE_NUMBER.fullmatch(token.strip())
    if not m:
        if re.fullmatch(r"[+-]?\d+[a-zA-Z]+\d+", token.strip()):
            raise ValueParseError(f"cannot read {token!r}: in SPICE a letter ends the number ({token!r} would "
                                  f"be read as {re.match(r'[+-]?[0-9]+[a-zA-Z]+', token)[0]!r}); "
                                  "write 4.7k, not 4k7")
        raise ValueParseError(f"cannot read {token!r}: expected a SPICE number such as 4.7k, 1MEG, 470 or 10m")
    number, suffix = float(m[1]), m[2].lower()
    if suffix.startswith("meg"):
        return number * 1e6
    if suffix.startswith("mil"):
        return number * 25.4e-6
    return number * _SCALE.get(suffix[:1], 1.0)


# --------------------------------------------------------------------------- reading


def read_netlist(path: str | os.PathLike) -> Netlist:
    """Read a netlist file (SPICE or edge list; see the module docstring).

    Raises
    ------
    ValueParseError
        One line naming the file (and line) for a file that cannot be read or holds no
        resistor, an element that cannot be read, or more than :data:`MAX_ELEMENTS` parts.
    """
    name = os.fsdecode(os.fspath(path))
    text = utf8_text(read_capped(name, MAX_BYTES, error=ValueParseError, what="netlist"), name, error=ValueParseError)
    return parse_netlist(text, name)


def _fields(line: str) -> list[str]:
    if "," in line:
        return [c.strip() for c in next(csv.reader([line]))]
    return line.split()


def parse_netlist(text: str, name: str = "netlist") -> Netlist:
    """Read netlist text, telling SPICE from an edge list (see the module docstring)."""
    for raw in text.splitlines():
        s = raw.strip()
        if not s or s.startswith("#"):
            continue
        if s[0] in "*.+" or len(_fields(s)) != 3:
            return parse_spice(text, name)
    return parse_edges(text, name)


def _too_many(name: str) -> ValueParseError:
    return ValueParseError(f"{name}: more than {MAX_ELEMENTS} resistors; netsynth checks networks of up to "
                           f"{MAX_ELEMENTS} parts")


def parse_edges(text: str, name: str = "netlist") -> Netlist:
    """Read an edge list: one ``node, node, value`` per line (see the module docstring)."""
    elements: list[Element] = []
    for number, raw in enumerate(text.splitlines(), start=1):
        s = raw.strip()
        if not s or s.startswith("#"):
            continue
        cells = _fields(s)
        if len(cells) != 3:
            raise ValueParseError(f"{name}, line {number}: expected three fields, node, node, value "
                                  f"(found {len(cells)})")
        a, b, value = cells
        try:
            ohms = parse_resistance(value)
        except ValueParseError as e:
            if not elements and not any(ch.isdigit() for ch in value):
                continue  # a header row such as "from,to,value"
            raise ValueParseError(f"{name}, line {number}, field 'value': {e}") from None
        elements.append(_element(f"line {number}", a, b, ohms, number, name))
        if len(elements) > MAX_ELEMENTS:
            raise _too_many(name)
    if not elements:
        raise ValueParseError(f"{name}: no resistor found; write one per line as node, node, value (a, b, 4k7)")
    return Netlist(name, "edges", tuple(elements))


def _element(label: str, a: str, b: str, ohms: float, number: int, name: str) -> Element:
    if not (math.isfinite(ohms) and ohms > 0):
        raise ValueParseError(f"{name}, line {number}: {label} has {ohms!r} Ω; a part's resistance must be "
                              "finite and above zero (leave wires out, or join their nodes)")
    if not a or not b:
        raise ValueParseError(f"{name}, line {number}: {label} needs two node names")
    return Element(label, a, b, ohms, number)


def _logical_lines(text: str) -> list[tuple[int, str]]:
    """(first line number, text) of each SPICE line, continuations joined, comments removed."""
    out: list[tuple[int, str]] = []
    for number, raw in enumerate(text.splitlines(), start=1):
        s = re.split(r";| \$|\t\$", raw, maxsplit=1)[0].rstrip()
        stripped = s.strip()
        if stripped.startswith("*"):
            continue
        if stripped.startswith("+"):
            if out:
                out[-1] = (out[-1][0], out[-1][1] + " " + stripped[1:])
            continue
        out.append((number, stripped))
    return out


_IGNORED_PARAMS = {"tc", "tc1", "tc2", "temp", "dtemp", "ac", "noisy", "tce", "l", "w", "scale"}


def _resistor(tokens: list[str], number: int, name: str) -> Element:
    label = tokens[0]
    where = f"{name}, line {number}"
    if len(tokens) < 4:
        raise ValueParseError(f"{where}: {label} needs two nodes and a value: {label} n1 n2 4.7k")
    value: str | None = None
    for token in tokens[3:]:
        key, eq, rest = token.partition("=")
        key = key.lower()
        if not eq:
            if value is not None:
                raise ValueParseError(f"{where}: {label}: unexpected {token!r} after the value")
            value = token
        elif key in ("r", "resistance"):
            value = rest
        elif key == "m":
            if spice_value(rest) != 1:
                raise ValueParseError(f"{where}: {label} has m={rest}: write the parallel copies as elements")
        elif key not in _IGNORED_PARAMS:
            raise ValueParseError(f"{where}: {label}: parameter {token!r} is not read here")
    if value is None:
        raise ValueParseError(f"{where}: {label} has no value")
    if value.startswith("{") or value.startswith("'"):
        raise ValueParseError(f"{where}: {label} = {value}: parameters are not evaluated; write the number")
    try:
        ohms = spice_value(value)
    except ValueParseError as e:
        if re.fullmatch(r"[A-Za-z_]\w*", value):
            raise ValueParseError(f"{where}: {label} names a model or parameter {value!r}; models and "
                                  "parameters are not read, write the resistance") from None
        raise ValueParseError(f"{where}: {label}: {str(e)}") from None
    return _element(label, tokens[1], tokens[2], ohms, number, name)


def parse_spice(text: str, name: str = "netlist") -> Netlist:
    """Read the ``R`` elements of a SPICE deck or subcircuit (see the module docstring)."""
    scopes: dict[str, list[Element]] = {}
    ports: dict[str, tuple[str, ...]] = {}
    others: dict[str, dict[str, int]] = defaultdict(lambda: defaultdict(int))
    notes: list[str] = []
    scope = ""  # "" is the top level
    in_control = False
    title = ""
    lines = _logical_lines(text)
    for index, (number, s) in enumerate(lines):
        if not s:
            continue
        low = s.lower()
        if in_control:
            in_control = not low.startswith(".endc")
            continue
        if number == 1 and not s.startswith("."):
            try:  # line 1 is the title unless it is a complete R element
                if not low.startswith("r"):
                    raise ValueParseError("title")
                _resistor(re.sub(r"\s*=\s*", "=", s).split(), number, name)
            except ValueParseError:
                title = s
                continue
        if low.startswith("."):
            words = s.split()
            command = words[0].lower()
            if command == ".subckt":
                if scope:
                    raise ValueParseError(f"{name}, line {number}: a .subckt inside .subckt {scope} is not read "
                                          "here; put the resistors in one subcircuit")
                if len(words) < 2:
                    raise ValueParseError(f"{name}, line {number}: .subckt needs a name")
                scope = words[1]
                ports[scope] = tuple(w for w in words[2:] if "=" not in w)
            elif command == ".ends":
                scope = ""
            elif command == ".end":
                break
            elif command == ".control":
                in_control = True
            elif command in (".include", ".inc", ".lib", ".param"):
                notes.append(f"line {number}: {command} is not followed (only this file is read)")
            continue
        tokens = re.sub(r"\s*=\s*", "=", s).split()
        if tokens[0][0].lower() == "r":
            element = _resistor(tokens, number, name)
            scopes.setdefault(scope, []).append(element)
            if sum(len(v) for v in scopes.values()) > MAX_ELEMENTS:
                raise _too_many(name)
            if re.search(r"\dM(?![eE][gG])(?![iI][lL])[a-zA-Z]*$", element_value_token(tokens)):
                notes.append(f"{element.name}: {element_value_token(tokens)!r} is {element.ohms:g} Ω: in SPICE "
                             "M is milli (mega is MEG)")
        else:
            others[scope][tokens[0][0].upper()] += 1
    if not scopes:
        why = (f" (line 1, {title[:30]!r}, is read as the deck's title, as SPICE reads it)"
               if title[:1].lower() == "r" else "")
        raise ValueParseError(f"{name}: no resistor (R element) found{why}; write R1 a b 4.7k")
    if len(scopes) > 1:
        where = ", ".join("the top level" if k == "" else f"subcircuit {k}" for k in scopes)
        raise ValueParseError(f"{name}: resistors in more than one place ({where}); keep the network's "
                              "resistors in one")
    (chosen, elements), = scopes.items()
    seen: dict[str, int] = {}
    for e in elements:
        key = e.name.lower()
        if key in seen:
            raise ValueParseError(f"{name}, line {e.line}: element {e.name} is also on line {seen[key]}; "
                                  "give each element its own name")
        seen[key] = e.line
    left_out = others.get(chosen, {})
    if left_out:
        kinds = ", ".join(f"{n} {k}" for k, n in sorted(left_out.items()))
        notes.append(f"left out {sum(left_out.values())} element(s) that are not resistors ({kinds})")
    return Netlist(name, "spice", tuple(elements), ports.get(chosen, ()), tuple(notes))


def element_value_token(tokens: Sequence[str]) -> str:
    """The token of an R element that holds its value (``r=`` stripped)."""
    for token in tokens[3:]:
        key, eq, rest = token.partition("=")
        if not eq:
            return token
        if key.lower() in ("r", "resistance"):
            return rest
    return ""


# --------------------------------------------------------------------------- shape


@dataclass(frozen=True, slots=True)
class Topology:
    """A netlist between two terminals: what can carry current, and its shape.

    ``live`` and ``edges`` go together: ``edges[k]`` is element ``live[k]`` on nodal node
    numbers, terminal A = 0 and B = 1 (``node_names`` gives each number's name). ``network`` is
    the ``+``/``||`` form of the live parts when they reduce to one, else None; ``parts`` maps
    its parts, in :func:`netsynth.network.parts_in_order` order, to element indices.
    """

    netlist: Netlist
    between: tuple[str, str]
    live: tuple[int, ...]
    dead: tuple[tuple[int, str], ...]
    node_names: tuple[str, ...]
    edges: tuple[Edge, ...]
    network: Network | None

    @property
    def series_parallel(self) -> bool:
        return self.network is not None


def _key(node: str) -> str:
    return node.casefold()


def topology(netlist: Netlist, a: str | None = None, b: str | None = None) -> Topology:
    """The network between terminals `a` and `b` (default: the subcircuit's two ports).

    Raises
    ------
    ArgumentError
        If a terminal is not given and the netlist has no two ports, names no node of the
        netlist, both terminals are one node, or no path of parts joins them (naming both).
    """
    import networkx as nx

    if a is None or b is None:
        if len(netlist.ports) != 2:
            raise ArgumentError(f"{netlist.name}: name the two terminals (--between A B)" +
                                (f"; the subcircuit's ports are {' '.join(netlist.ports)}" if netlist.ports else ""))
        a, b = netlist.ports
    shown: dict[str, str] = {}
    for e in netlist.elements:
        shown.setdefault(_key(e.a), e.a)
        shown.setdefault(_key(e.b), e.b)
    for t in (a, b):
        if _key(t) not in shown:
            known = ", ".join(list(shown.values())[:12]) + (" ..." if len(shown) > 12 else "")
            raise ArgumentError(f"{netlist.name}: no node {t!r} (nodes: {known})")
    ka, kb = _key(a), _key(b)
    if ka == kb:
        raise ArgumentError(f"{netlist.name}: the terminals {a!r} and {b!r} are one node; name two different nodes")
    a, b = shown[ka], shown[kb]
    graph = nx.MultiGraph()
    graph.add_nodes_from(shown)
    dead: dict[int, str] = {}
    for i, e in enumerate(netlist.elements):
        if _key(e.a) == _key(e.b):
            dead[i] = f"both ends on node {shown[_key(e.a)]} (shorted)"
        else:
            graph.add_edge(_key(e.a), _key(e.b), key=i)
    if not nx.has_path(graph, ka, kb):
        raise ArgumentError(f"{netlist.name}: no path of parts joins {a} and {b}: the network is open between them")
    reach = nx.node_connected_component(graph, ka)
    simple = nx.Graph(graph.subgraph(reach))
    simple.add_edge(ka, kb)  # the virtual wire from A to B (merges with a part there, if any)
    block = next(set(map(frozenset, c)) for c in nx.biconnected_component_edges(simple)
                 if frozenset((ka, kb)) in set(map(frozenset, c)))
    live: list[int] = []
    for i, e in enumerate(netlist.elements):
        if i in dead:
            continue
        if _key(e.a) not in reach:
            dead[i] = f"not connected to {a} or {b}"
        elif frozenset((_key(e.a), _key(e.b))) in block:
            live.append(i)
        else:
            dead[i] = f"on a branch off the paths between {a} and {b} (dangling)"
    numbers = {ka: 0, kb: 1}
    for i in live:
        for end in (netlist.elements[i].a, netlist.elements[i].b):
            numbers.setdefault(_key(end), len(numbers))
    names = [""] * len(numbers)
    for k, n in numbers.items():
        names[n] = shown[k]
    edges = tuple(Edge(numbers[_key(netlist.elements[i].a)], numbers[_key(netlist.elements[i].b)],
                       netlist.elements[i].ohms) for i in live)
    network = _reduce(edges, [netlist.elements[i].ohms for i in live])
    return Topology(netlist, (a, b), tuple(live), tuple(sorted(dead.items())), tuple(names), edges, network)


def _reduce(edges: Sequence[Edge], ohms: Sequence[float]) -> Network | None:
    """The ``+``/``||`` form of the edges between nodes 0 and 1, or None when they do not reduce.

    Merge parallel edges and splice out inner nodes of degree two until nothing changes; the
    network is series/parallel exactly when one edge from 0 to 1 is left.
    """
    current: dict[int, tuple[int, int, Network]] = {k: (e.a, e.b, Part(w)) for k, (e, w) in enumerate(zip(edges, ohms))}
    fresh = len(current)
    changed = True
    while changed and len(current) > 1:
        changed = False
        groups: dict[frozenset, list[int]] = defaultdict(list)
        for k, (u, v, _) in current.items():
            groups[frozenset((u, v))].append(k)
        for ids in groups.values():
            if len(ids) > 1:
                u, v, _ = current[ids[0]]
                merged = parallel(*(current[k][2] for k in ids))
                for k in ids:
                    del current[k]
                current[fresh] = (u, v, merged)
                fresh += 1
                changed = True
        touching: dict[int, list[int]] = defaultdict(list)
        for k, (u, v, _) in current.items():
            touching[u].append(k)
            touching[v].append(k)
        done: set[int] = set()
        for node, ids in touching.items():
            if node in (0, 1) or len(ids) != 2 or done & set(ids):
                continue
            (u1, v1, n1), (u2, v2, n2) = current[ids[0]], current[ids[1]]
            x = u1 if v1 == node else v1
            y = u2 if v2 == node else v2
            for k in ids:
                del current[k]
                done.add(k)
            current[fresh] = (x, y, series(n1, n2))
            fresh += 1
            changed = True
    if len(current) == 1:
        (u, v, net), = current.values()
        if {u, v} == {0, 1}:
            return net
    return None
