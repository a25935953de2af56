"""The Bode-Fano limit on how well any lossless network can match an R-C or R-L load.

Fano (1950): for a parallel R-C load the reflection seen through any lossless matching network
obeys  integral ln(1/|Gamma|) d omega <= pi / (R C); for a series R-L load the limit is pi R / L.
For a series R-C and a parallel R-L load the integrand is weighted by 1/omega^2 and the limits
are pi R C and pi L / R. A constant |Gamma| over the band and total reflection elsewhere is the
best any network can do, which gives the lowest constant in-band reflection below.
"""

from __future__ import annotations

import math

from service.physics.loads import CircuitKind


def bode_fano_limit(kind: CircuitKind, resistance_ohm: float, element_value: float) -> float:
    """The right-hand side of the Fano integral for this load (rad/s, or s/rad for the 1/omega^2 forms)."""
    r, x = resistance_ohm, element_value
    return {
        "parallel-rc": math.pi / (r * x),
        "series-rl": math.pi * r / x,
        "series-rc": math.pi * r * x,
        "parallel-rl": math.pi * x / r,
    }[kind]


def bode_fano_min_reflection(
    kind: CircuitKind, resistance_ohm: float, element_value: float, start_hz: float, stop_hz: float
) -> float:
    """Lowest constant |reflection| any lossless network can hold over [start, stop]."""
    omega_1, omega_2 = 2.0 * math.pi * start_hz, 2.0 * math.pi * stop_hz
    plain = kind in ("parallel-rc", "series-rl")
    weight = omega_2 - omega_1 if plain else 1.0 / omega_1 - 1.0 / omega_2
    return math.exp(-bode_fano_limit(kind, resistance_ohm, element_value) / weight)
