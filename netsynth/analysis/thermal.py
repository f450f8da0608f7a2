"""How a network's value drifts with temperature, from the TCR of its parts.

Map of the module
-----------------
``REFERENCE_C``
    The temperature at which nominal values hold (25 °C).
:func:`temperature_coefficient`
    Worst-case TCR of the network in ppm/K: ``Σ S_i·|α_i|`` with the relative
    sensitivities ``S_i`` of :func:`netsynth.analysis.tolerance.sensitivities`.
:func:`value_at`
    The (low, high) value in ohms at another temperature, first order.

Bins store TCR magnitudes (datasheets print ±α), so the signs are unknown and
the worst case adds the magnitudes. Per-part sequences follow
:func:`netsynth.network.parts_in_order`.
"""

from __future__ import annotations

import math
import numbers
from collections.abc import Sequence

from netsynth.analysis.tolerance import sensitivities
from netsynth.errors import ValueParseError
from netsynth.network import Network, parts_in_order, resistance

#: °C; nominal values hold here. Common practice: datasheets specify TCR from
#: 25 °C (typically over 25..125 °C); no single standard cited here.
REFERENCE_C = 25.0

#: °C; nothing is colder
ABSOLUTE_ZERO_C = -273.15


def _check_tcr(net: Network, tcr_ppm: Sequence[float]) -> list[float]:
    """The TCR magnitudes, one per part, as finite floats."""
    count = len(parts_in_order(net))
    values = list(tcr_ppm)
    if len(values) != count:
        raise ValueParseError(
            f"got {len(values)} TCR values for a network of {count} parts: "
            "give one ppm/K figure per part, in parts_in_order order"
        )
    for index, alpha in enumerate(values):
        if isinstance(alpha, bool) or not isinstance(alpha, numbers.Real) or not math.isfinite(alpha):
            raise ValueParseError(f"TCR {index} = {alpha!r}: expected a finite number of ppm/K, e.g. 100")
    return [abs(float(alpha)) for alpha in values]


def temperature_coefficient(net: Network, tcr_ppm: Sequence[float]) -> float:
    """Worst-case magnitude of the network's temperature coefficient.

    Parameters
    ----------
    net : Network
        Any series/parallel tree.
    tcr_ppm : sequence of float
        TCR of each part in ppm/K, in :func:`parts_in_order` order. Signs are
        ignored: the magnitudes are used.

    Returns
    -------
    float
        ``Σ S_i·|α_i|`` in ppm/K, where ``S_i`` is the relative sensitivity
        (power share) of part i. With the same α on every part the result is
        exactly α, whatever the topology (R is homogeneous of degree 1).

    Raises
    ------
    ValueParseError
        If the count differs from the part count or a value is not finite.

    Notes
    -----
    First order: ``dR/R = Σ S_i·dR_i/R_i = Σ S_i·α_i·dT``; with unknown signs
    the largest magnitude is ``Σ S_i·|α_i|``.

    Examples
    --------
    A 0 ppm and a 100 ppm part of equal value in series (each S = 1/2):

    >>> from netsynth.network import from_text
    >>> round(temperature_coefficient(from_text("1k + 1k"), [0.0, 100.0]), 9)
    50.0
    """
    alphas = _check_tcr(net, tcr_ppm)
    return math.fsum(s * a for s, a in zip(sensitivities(net), alphas))


def value_at(net: Network, tcr_ppm: Sequence[float], temp_c: float) -> tuple[float, float]:
    """The network's value range at ``temp_c``, first order in the TCR.

    Parameters
    ----------
    net : Network
        Any series/parallel tree.
    tcr_ppm : sequence of float
        TCR magnitude of each part in ppm/K, in :func:`parts_in_order` order.
    temp_c : float
        Temperature in °C (above absolute zero).

    Returns
    -------
    tuple of float
        ``(low, high)`` in ohms: ``nominal × (1 ∓ tc·|temp_c − 25|·1e-6)`` with
        ``tc`` from :func:`temperature_coefficient`. Nominal tolerance is not
        included. ``low`` is clamped at 0 Ω where the first-order drift would
        exceed 100 % (far outside where a linear TCR means anything).

    Raises
    ------
    ValueParseError
        On bad TCR values or a temperature that is not finite or below absolute zero.

    Examples
    --------
    One 100 ppm/K part at 125 °C: ±100 ppm/K × 100 K = ±1 %:

    >>> from netsynth.network import from_text
    >>> [round(v, 9) for v in value_at(from_text("1k"), [100.0], 125.0)]
    [990.0, 1010.0]
    """
    if (
        isinstance(temp_c, bool)
        or not isinstance(temp_c, numbers.Real)
        or not (math.isfinite(temp_c) and temp_c >= ABSOLUTE_ZERO_C)
    ):
        raise ValueParseError(
            f"temp_c={temp_c!r}: expected a finite temperature in °C at or above {ABSOLUTE_ZERO_C}"
        )
    tc = temperature_coefficient(net, tcr_ppm)
    nominal = resistance(net)
    drift = tc * abs(temp_c - REFERENCE_C) * 1e-6
    return (max(0.0, nominal * (1.0 - drift)), nominal * (1.0 + drift))
