"""The ranges netsynth accepts, in one place, each with the reason it was chosen.

Every number and every piece of text that enters netsynth (a value typed on the command
line, a cell of a bin file, an argument of the Python API, a network expression) is checked
against these limits where it enters, and refused with one line that names the input and
the range. Inside the limits every command finishes or refuses in bounded time and memory
(``benchmarks/limits_check.py`` measures the largest accepted network and bin file), and
every number it computes stays finite, so nothing it prints or writes as JSON is ``inf`` or
``NaN``.

Which error: text that cannot be read, or reads as a value outside a range, raises
:class:`~netsynth.errors.ValueParseError` (from :mod:`netsynth.values`); a number passed to
the API outside a range raises :class:`~netsynth.errors.ArgumentError`; a bin file,
:class:`~netsynth.errors.StockError` with file, line and field.

Map of the module
-----------------
magnitudes     ``MIN_OHMS`` .. ``MAX_OHMS``, volts, amps, watts, duty, TCR, quantity
temperatures   ``ABSOLUTE_ZERO_C``; ambient (``MIN_AMBIENT_C`` .. ``MAX_AMBIENT_C``); ``MAX_TEMP_C``
sizes          parts, nesting, expression and value length, bin file bytes/lines/columns/rows,
               netlist nodes/edges and the nodal solver's work
text           :func:`excerpt`: at most :data:`EXCERPT_CHARS` characters of an input, on one line

The ranges are judgement, not standards; the reasons are stated beside each constant.
Values marked "from memory" were not checked against a datasheet.

Examples
--------
>>> MIN_OHMS, MAX_OHMS
(1e-06, 1000000000000.0)
>>> excerpt("1" * 100)
'1111111111111111111111111111111111111...'
"""

from __future__ import annotations

__all__ = [
    "ABSOLUTE_ZERO_C",
    "AMPS_RANGE",
    "DUTY_RANGE",
    "EXCERPT_CHARS",
    "FRACTION_RANGE",
    "MAX_AMBIENT_C",
    "MAX_AMPS",
    "MAX_BIN_BYTES",
    "MAX_BIN_COLUMNS",
    "MAX_BIN_LINE_CHARS",
    "MAX_BIN_ROWS",
    "MAX_EXPRESSION_CHARS",
    "MAX_LEVELS",
    "MAX_LINES_PER_VALUE",
    "MAX_NESTING",
    "MAX_NETLIST_EDGES",
    "MAX_NETLIST_NODES",
    "MAX_NODAL_FILL",
    "MAX_OHMS",
    "MAX_PARTS",
    "MAX_QTY",
    "MAX_TCR_PPM",
    "MAX_TEMP_C",
    "MAX_VALUE_CHARS",
    "MAX_VOLTS",
    "MAX_WATTS",
    "MIN_AMBIENT_C",
    "MIN_AMPS",
    "MIN_DERATE",
    "MIN_DUTY",
    "MIN_FRACTION",
    "MIN_OHMS",
    "MIN_TCR_PPM",
    "MIN_RATING_W",
    "MIN_VOLTS",
    "MIN_WATTS",
    "OHMS_RANGE",
    "RATING_RANGE",
    "TCR_RANGE",
    "VOLTS_RANGE",
    "WATTS_RANGE",
    "excerpt",
]

# ------------------------------------------------------------------ magnitudes (SI base units)

#: Ω; the smallest resistance accepted (a part, a target, a range end). The smallest
#: current-sense shunts are some tens of µΩ (from memory: 50 µΩ metal-strip shunts); below
#: 1 µΩ a solder joint alone is larger than the part.
MIN_OHMS = 1e-6
#: Ω; the largest resistance accepted. High-megohm parts for electrometers and HV dividers
#: reach 1 TΩ (from memory; a few special parts go higher, where surface leakage rules).
MAX_OHMS = 1e12
#: the resistance range as people read it, for messages
OHMS_RANGE = "1 µΩ to 1 TΩ (1e-6 to 1e12 Ω)"

#: V; drives and voltage ratings. Below 1 µV thermal EMFs of the joints (µV per kelvin, from
#: memory) swamp the drop; 1 MV is beyond any bench or HV divider string.
MIN_VOLTS, MAX_VOLTS = 1e-6, 1e6
VOLTS_RANGE = "1 µV to 1 MV (1e-6 to 1e6 V)"
#: A; 1 pA is what a 1 TΩ part passes at 1 V; 10 kA is beyond the largest shunts (from memory,
#: metering shunts end around a few kA).
MIN_AMPS, MAX_AMPS = 1e-12, 1e4
AMPS_RANGE = "1 pA to 10 kA (1e-12 to 1e4 A)"
#: W; drives and power ratings. 1 pW to 1 MW covers every drive above from a signal to a
#: megawatt dummy load; a rating outside it is a typo.
MIN_WATTS, MAX_WATTS = 1e-12, 1e6
WATTS_RANGE = "1 pW to 1 MW (1e-12 to 1e6 W)"
#: W; the smallest power rating of a part in a bin (up to :data:`MAX_WATTS`). The smallest chip
#: resistors are rated 1/50 W or so (from memory: 01005 size); below 1 mW no part is sold.
MIN_RATING_W = 1e-3
RATING_RANGE = "1 mW to 1 MW (1e-3 to 1e6 W)"
#: fraction; a duty cycle below 1 ppm is a single pulse, which the pulse-load curve of the
#: part maker (not modelled) governs, not the average-power rating.
MIN_DUTY = 1e-6
DUTY_RANGE = "1 ppm to 100 % (1e-6 to 1)"
#: fraction; the smallest non-zero tolerance, accuracy or spec. Errors below 1e-12 are the float
#: noise of the computation itself (the report shows them as exact); 0 still means "exact".
MIN_FRACTION = 1e-12
FRACTION_RANGE = "1e-12 (1 ppt) up to, not including, 100 %"
#: fraction; the smallest derating factor. A margin below 1 % of a rating is no margin but a
#: different part; it also keeps every derated limit far from float underflow.
MIN_DERATE = 0.01
#: ppm/K; the largest TCR magnitude in a bin. Carbon-film and carbon-composition parts reach
#: about ±1500 ppm/K (from memory); 1 %/K is a thermistor, not a resistor in this sense.
MAX_TCR_PPM = 1e4
#: ppm/K; the smallest non-zero TCR. The best metal-foil parts quote some 0.05 ppm/K (from memory);
#: a millionth of a ppm/K is float noise, and 0 still means "no drift".
MIN_TCR_PPM = 1e-6
TCR_RANGE = "0, or from 1e-6 to 1e4 ppm/K"
#: parts of one stock line or kit value. A million is a pallet of reels; more is a typo, and a
#: blank quantity means "as many as needed" anyway.
MAX_QTY = 1_000_000

# ------------------------------------------------------------------ temperatures (°C)

#: °C; absolute zero (0 K, SI Brochure 9th ed. §2.3.1: t/°C = T/K − 273.15). Every
#: temperature must lie above it.
ABSOLUTE_ZERO_C = -273.15
#: °C; the ambient temperatures accepted: a practical range (common practice, no source) wide
#: enough for any bench or enclosure; a value outside is far more likely a typo, or kelvin.
MIN_AMBIENT_C, MAX_AMBIENT_C = -100.0, 300.0
#: °C; the ceiling on a part temperature (``--temp``, ``temp_c``, a bin's ``max_temp``): far
#: beyond the upper category temperature of any resistor (155 °C for common film parts, Vishay
#: D/CRCW and Yageo CFR/MFR datasheets; a few hundred °C for special parts, from memory), so a
#: value above it is a typo or kelvin. With :data:`MAX_TCR_PPM` it also bounds the drift.
MAX_TEMP_C = 1000.0

# ------------------------------------------------------------------ sizes

#: parts in one network (typed, built by the API, or searched). A 10 000-part network is far
#: beyond anything soldered by hand; the nodal check of one takes well under a second.
MAX_PARTS = 10_000
#: parentheses nested in a typed network (a repeat's ``Ns(`` counts as one). Hand-written
#: networks nest a few levels; 100 leaves room for generated ones.
MAX_NESTING = 100
#: series/parallel levels of a network tree (a part is level 0; a group is one more than its
#: deepest child). Equal to :data:`MAX_NESTING`: the compact form of a tree puts at most one
#: parenthesis per level (``2s(2p(1k))`` has two levels), so every tree within the limit prints
#: in a form :func:`netsynth.network.from_text` reads back. Every tree walk stays far below
#: Python's recursion limit at this depth; deeper trees are refused where they are built.
MAX_LEVELS = MAX_NESTING
#: characters of a network expression: a 10 000-part network written out in full with long
#: spellings (``4.7 kΩ + ``, about 12 characters a part) fits with room to spare.
MAX_EXPRESSION_CHARS = 200_000
#: characters of one value (``4.7 kohms``, ``0.0000012345678901234567``): every spelling in
#: :mod:`netsynth.values`, with all 17 significant digits, fits in 64.
MAX_VALUE_CHARS = 64

#: bytes of a bin file (read at most this plus one, then refused: an endless device or pipe is
#: never read to the end). :data:`MAX_BIN_ROWS` rows of a few hundred characters fit.
MAX_BIN_BYTES = 8 * 2**20
#: characters of one line of a bin file: a row with a long note or location fits.
MAX_BIN_LINE_CHARS = 4096
#: columns of a bin file's header: the 10 of the format and room for extra ones of your own.
MAX_BIN_COLUMNS = 64
#: rows (stock lines) of a bin file, comments and blank lines not counted. A full E192 series
#: from 1 Ω to 10 MΩ is 1344 values; a bin of ten thousand lines is a warehouse.
MAX_BIN_ROWS = 10_000
#: stock lines of one value (rows of one value with different ratings, or different drawers'
#: texts that did not merge). Tying parts to lines is a matching over the lines of a value; a
#: hundred lines of one value is already a warehouse of one part.
MAX_LINES_PER_VALUE = 100

#: resistors and nodes of a netlist the nodal solver takes: one edge per part of the largest
#: network, and at most one node more than edges in a connected two-terminal netlist.
MAX_NETLIST_EDGES = MAX_PARTS
MAX_NETLIST_NODES = MAX_PARTS + 1
#: work of the nodal solver's sparse elimination: the sum over eliminated nodes of (degree)²,
#: which bounds both the entries it creates and its time (about a second at the bound). A
#: series/parallel network needs a few per node (measured: at most 1.3 × 10⁴ for 10 000 parts); a general
#: netlist that needs more (a 70 × 70 resistor mesh) is refused rather than allowed to fill
#: gigabytes.
MAX_NODAL_FILL = 2_000_000

# ------------------------------------------------------------------ text in messages

#: characters of an input quoted in an error message, at most
EXCERPT_CHARS = 40


def excerpt(text: str, limit: int = EXCERPT_CHARS) -> str:
    """At most `limit` characters of `text` on one line (runs of whitespace as one space), cut with ``...``.

    Linear in `limit`, whatever the length of `text`: only its head is looked at.

    Examples
    --------
    >>> excerpt("4k7"), excerpt("a\\nb"), excerpt("x" * 50, 10)
    ('4k7', 'a b', 'xxxxxxx...')
    """
    whole = str(text)
    head = whole[: 4 * limit]
    flat = " ".join(head.split())
    if len(whole) <= 4 * limit and len(flat) <= limit:
        return flat
    return flat[: max(limit - 3, 1)] + "..."
