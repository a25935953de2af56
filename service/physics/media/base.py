"""What a transmission medium must give: geometry for an impedance, and line parameters."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Protocol

import numpy as np
from scipy.optimize import brentq


class RealizationError(ValueError):
    """The medium cannot realize the requested impedance."""


@dataclass(frozen=True)
class LineParameters:
    """Per frequency and section: characteristic impedance, effective permittivity, attenuation."""

    impedance_ohm: np.ndarray
    eps_eff: np.ndarray
    attenuation_np_per_m: np.ndarray | None


class Medium(Protocol):
    """A kind of line. `geometry` is the one dimension that sets each section's impedance."""

    kind: str
    geometry_name: str | None  # the response field the geometry goes in; None for the ideal line
    dispersive: bool
    lossy: bool

    def parameters(self, geometry: np.ndarray, frequency_hz: np.ndarray) -> LineParameters:
        """Line parameters, broadcast over geometry (..., S) and frequency (F, 1)."""
        ...

    def geometry_for(self, impedance_ohm: np.ndarray, frequency_hz: float) -> np.ndarray:
        """The geometry of each section that has the given impedance at this frequency."""
        ...

    def notes(self, geometry: np.ndarray, start_hz: float, stop_hz: float, min_feature_m: float) -> list[str]:
        """Plain warnings: validity ranges, manufacturability, higher-order modes in band."""
        ...

    def geometry_limits(self, stop_hz: float, min_feature_m: float) -> tuple[float, float]:
        """The smallest and largest geometry worth building: no feature under min_feature_m and no
        higher-order mode (by the same estimate as the notes) up to stop_hz. Bounds refinement."""
        ...


def invert_monotone(impedance_of: callable, target_ohm: float, low: float, high: float, what: str) -> float:
    """Solve impedance_of(x) = target for x in [low, high] by bracketing in log x.

    impedance_of must be monotone in x; outside its range the medium cannot realize the target.
    """
    z_low, z_high = impedance_of(low), impedance_of(high)
    if not (math.isfinite(z_low) and math.isfinite(z_high)):  # a model evaluated far outside its range
        raise RealizationError(
            f"the {what} line model gives no finite impedance over the dimensions it searches at the band "
            f"centre: the {what}'s cross-section is electrically too large for that frequency"
        )
    lo_z, hi_z = min(z_low, z_high), max(z_low, z_high)
    if not lo_z <= target_ohm <= hi_z:
        raise RealizationError(
            f"{target_ohm:.4g} ohm is outside what this {what} can realize ({lo_z:.4g} to {hi_z:.4g} ohm)"
        )
    root = brentq(lambda s: impedance_of(np.exp(s)) - target_ohm, np.log(low), np.log(high), xtol=1e-14, rtol=1e-13)
    return float(np.exp(root))
