"""A board's values from one drawer (``netsynth plan``).

Map of the package
------------------
``needs``  the needs file (CSV: ref, target, within, volts/amps/watts): :class:`Need`, :func:`load_needs`
``board``  candidates per need, the shared allocation, lines, checks: :func:`plan_board`, :class:`BoardPlan`
"""

from __future__ import annotations

from netsynth.plan.board import BoardPlan, NeedResult, plan_board
from netsynth.plan.needs import DEFAULT_WITHIN, Need, load_needs

__all__ = ["DEFAULT_WITHIN", "BoardPlan", "Need", "NeedResult", "load_needs", "plan_board"]
