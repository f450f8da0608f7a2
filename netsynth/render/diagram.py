"""A small text drawing of a series/parallel network.

Series children sit side by side on one wire; parallel children are stacked between
two rails. Every block is a list of equal-width lines whose first line carries the
wire, so blocks compose by plain concatenation.

Example (``1k + (2k2 || 4k7)``)::

    A ──[1k]──┬──[2k2]──┬── B
              └──[4k7]──┘
"""

from __future__ import annotations

from netsynth.network import Network, Part, Series
from netsynth.values import to_code


def draw(net: Network, left: str = "A", right: str = "B") -> str:
    """The network drawn between terminals ``left`` and ``right``, as lines of text."""
    block = _block(net)
    lines = [f"{left} ─{block[0]}─ {right}"]
    pad = " " * (len(left) + 2)
    lines += [pad + line for line in block[1:]]
    return "\n".join(line.rstrip() for line in lines)


def _block(net: Network) -> list[str]:
    if isinstance(net, Part):
        return [f"─[{to_code(net.ohms)}]─"]
    kids = [_block(c) for c in net.children]
    if isinstance(net, Series):
        height = max(len(k) for k in kids)
        rows = ["" for _ in range(height)]
        for k in kids:
            width = len(k[0])
            for r in range(height):
                rows[r] += k[r] if r < len(k) else " " * width
        return rows
    width = max(len(k[0]) for k in kids)
    rows: list[str] = []
    for i, k in enumerate(kids):
        first, last = i == 0, i == len(kids) - 1
        for r, line in enumerate(k):
            fill = "─" if r == 0 else " "
            body = line + fill * (width - len(line))
            if r == 0:
                lrail = "┬" if first else ("└" if last else "├")
                rrail = "┬" if first else ("┘" if last else "┤")
            else:
                lrail = rrail = " " if last else "│"
            rows.append(f"{lrail}{body}{rrail}")
    return [("─" + rows[0] + "─")] + [" " + r + " " for r in rows[1:]]
