"""Turning a complex load real with a length of source-impedance line."""

from __future__ import annotations

import math
from dataclasses import dataclass


@dataclass(frozen=True)
class RotatingSection:
    """A source-impedance line at the load, and the real resistance seen through it at the centre."""

    electrical_length_rad: float
    resistance_ohm: float


def rotating_section(source_ohm: float, load_ohm: complex) -> RotatingSection:
    """The shorter line that brings the load to the nearer voltage maximum or minimum.

    Along a line of Z0 the reflection turns by -2 beta l. Where its phase reaches 0 (voltage
    maximum) the impedance is Z0 * VSWR, where it reaches pi (minimum) it is Z0 / VSWR.
    """
    gamma = (load_ohm - source_ohm) / (load_ohm + source_ohm)
    magnitude = abs(gamma)
    phase = math.atan2(gamma.imag, gamma.real) % (2.0 * math.pi)
    vswr = (1.0 + magnitude) / (1.0 - magnitude)
    to_maximum = phase / 2.0
    to_minimum = ((phase - math.pi) % (2.0 * math.pi)) / 2.0
    if to_maximum <= to_minimum:
        return RotatingSection(to_maximum, source_ohm * vswr)
    return RotatingSection(to_minimum, source_ohm / vswr)
