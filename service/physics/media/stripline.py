"""Symmetric stripline: a strip of width W centred between ground planes b apart.

Impedance from Cohn's thick-strip formula (Cohn 1955, fringing capacitance of a strip of
thickness t, accurate for W/(b - t) >= 0.35) with Wheeler's narrow-strip effective width
W_e = W - (0.35 b - W)^2 / b form below that (the zero-thickness closed form as given in Pozar,
Microwave Engineering, ch. 3). A TEM line: eps_eff = eps_r, no dispersion.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from service.constants import SPEED_OF_LIGHT_M_PER_S as C0
from service.physics.media.base import LineParameters, invert_monotone
from service.physics.media.conductors import LineLosses

WIDE_LIMIT = 0.35


def fringing_term(t_over_b: float | np.ndarray) -> np.ndarray:
    """Cohn's normalized fringing capacitance; ln(2) * 2 / pi = 0.441 at zero thickness."""
    x = 1.0 - np.asarray(t_over_b, dtype=float)
    thin = x >= 1.0
    safe = np.where(thin, 0.5, x)
    thick = (2.0 / safe * np.log(1.0 / safe + 1.0) - (1.0 / safe - 1.0) * np.log(1.0 / (safe * safe) - 1.0)) / math.pi
    return np.where(thin, 2.0 * np.log(2.0) / math.pi, thick)


def stripline_impedance(width_m: np.ndarray, spacing_m: float, thickness_m: float, eps_r: float) -> np.ndarray:
    """Characteristic impedance of the strip, for each width."""
    w = np.asarray(width_m, dtype=float) / (spacing_m - thickness_m)
    effective = np.where(w < WIDE_LIMIT, w - (WIDE_LIMIT - w) ** 2, w)
    return 30.0 * math.pi / np.sqrt(eps_r) / (effective + fringing_term(thickness_m / spacing_m))


@dataclass(frozen=True)
class StriplineLine(LineLosses):
    """Stripline of the given ground spacing, strip thickness and dielectric."""

    eps_r: float
    ground_spacing_m: float
    thickness_m: float
    kind: str = "stripline"
    geometry_name: str | None = "width_m"
    dispersive: bool = False

    def perturbed(self, eps_r: np.ndarray, height_m: np.ndarray) -> StriplineLine:
        """The same line with other (array-valued, per-trial) permittivity and substrate height."""
        return replace(self, eps_r=eps_r, ground_spacing_m=height_m)

    def parameters(self, geometry: np.ndarray, frequency_hz: np.ndarray) -> LineParameters:
        z = stripline_impedance(geometry, self.ground_spacing_m, self.thickness_m, self.eps_r)
        w = np.asarray(geometry)
        # Conductor loss by the incremental-inductance estimate for both strip faces and grounds:
        # alpha_c ~ Rs / (Z0 (W + t)) * (1 + W / b) / 2 (common practice, no source).
        factor = (1.0 + w / self.ground_spacing_m) / (2.0 * (w + self.thickness_m))
        return self.tem_parameters(z, self.eps_r, frequency_hz, lambda resistance: resistance * factor / z)

    def geometry_for(self, impedance_ohm: np.ndarray, frequency_hz: float) -> np.ndarray:
        def impedance_of(width: float) -> float:
            return float(stripline_impedance(np.array([width]), self.ground_spacing_m, self.thickness_m, self.eps_r)[0])

        low, high = 1e-3 * self.ground_spacing_m, 100.0 * self.ground_spacing_m
        return np.array(
            [invert_monotone(impedance_of, float(z), low, high, "stripline") for z in np.atleast_1d(impedance_ohm)]
        )

    def geometry_limits(self, stop_hz: float, min_feature_m: float) -> tuple[float, float]:
        widest = (C0 / (math.sqrt(self.eps_r) * stop_hz) - math.pi * self.ground_spacing_m / 2.0) / 2.0
        return min_feature_m, max(widest, min_feature_m)

    def notes(self, geometry: np.ndarray, start_hz: float, stop_hz: float, min_feature_m: float) -> list[str]:
        w = np.asarray(geometry) / (self.ground_spacing_m - self.thickness_m)
        notes = []
        if self.thickness_m > 0.0 and np.any(w < WIDE_LIMIT):
            notes.append(
                "A strip is narrower than W/(b - t) = 0.35, where Cohn's thick-strip formula is "
                "extended by the zero-thickness narrow-strip correction; expect about 1% error."
            )
        if np.any(np.asarray(geometry) < min_feature_m):
            notes.append(
                f"A strip of {float(np.min(geometry)) * 1e3:.4g} mm is narrower than the manufacturable "
                f"minimum of {min_feature_m * 1e3:.4g} mm."
            )
        cutoff = C0 / (np.sqrt(self.eps_r) * (2.0 * np.asarray(geometry) + math.pi * self.ground_spacing_m / 2.0))
        if np.any(cutoff <= stop_hz):
            notes.append(
                f"A strip is wide enough for a higher-order mode from about {float(np.min(cutoff)) / 1e9:.4g} GHz, "
                "within or below the band (common practice estimate)."
            )
        return notes
