"""The ideal lossless TEM line: any impedance, one velocity factor."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from service.physics.media.base import LineParameters


@dataclass(frozen=True)
class IdealLine:
    """Geometry is the impedance itself; the effective permittivity is 1 / v^2."""

    velocity_factor: float = 1.0
    kind: str = "ideal"
    geometry_name: str | None = None
    dispersive: bool = False
    lossy: bool = False

    def parameters(self, geometry: np.ndarray, frequency_hz: np.ndarray) -> LineParameters:
        impedance = geometry + np.zeros(np.shape(frequency_hz))  # broadcast by the addition
        return LineParameters(impedance, np.full(impedance.shape, 1.0 / self.velocity_factor**2), None)

    def geometry_for(self, impedance_ohm: np.ndarray, frequency_hz: float) -> np.ndarray:
        return np.asarray(impedance_ohm, dtype=float)

    def notes(self, geometry: np.ndarray, start_hz: float, stop_hz: float, min_feature_m: float) -> list[str]:
        return []

    def geometry_limits(self, stop_hz: float, min_feature_m: float) -> tuple[float, float]:
        return 0.0, math.inf
