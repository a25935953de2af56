"""Coaxial line: Z = (eta0 / (2 pi sqrt(eps_r))) ln(D / d), the geometry is the inner diameter d."""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from service.constants import ETA_0_OHM
from service.constants import SPEED_OF_LIGHT_M_PER_S as C0
from service.physics.media.base import LineParameters, RealizationError
from service.physics.media.conductors import LineLosses


@dataclass(frozen=True)
class CoaxLine(LineLosses):
    """A coaxial line of fixed outer diameter D."""

    eps_r: float
    outer_diameter_m: float
    kind: str = "coax"
    geometry_name: str | None = "inner_diameter_m"
    dispersive: bool = False

    def perturbed(self, eps_r: np.ndarray, height_m: np.ndarray) -> CoaxLine:
        """The same line with other (array-valued, per-trial) permittivity; coax has no substrate height."""
        return replace(self, eps_r=eps_r)

    def impedance(self, inner_diameter_m: np.ndarray) -> np.ndarray:
        """Z of each inner diameter."""
        return (
            ETA_0_OHM
            / (2.0 * math.pi * np.sqrt(self.eps_r))
            * np.log(self.outer_diameter_m / np.asarray(inner_diameter_m))
        )

    def parameters(self, geometry: np.ndarray, frequency_hz: np.ndarray) -> LineParameters:
        d = np.asarray(geometry)
        # Pozar, Microwave Engineering, ch. 2: alpha_c = Rs (1/a + 1/b) / (2 eta ln(b/a)), radii a and b.
        eta = ETA_0_OHM / np.sqrt(self.eps_r)
        radii_term = 2.0 / d + 2.0 / self.outer_diameter_m
        per_resistance = radii_term / (2.0 * eta * np.log(self.outer_diameter_m / d))
        return self.tem_parameters(
            self.impedance(d), self.eps_r, frequency_hz, lambda resistance: resistance * per_resistance
        )

    def geometry_for(self, impedance_ohm: np.ndarray, frequency_hz: float) -> np.ndarray:
        z = np.atleast_1d(np.asarray(impedance_ohm, dtype=float))
        ratio = np.exp(z * 2.0 * math.pi * np.sqrt(self.eps_r) / ETA_0_OHM)
        if np.any(ratio > 1e6):
            raise RealizationError(
                f"{float(np.max(z)):.4g} ohm needs an inner conductor too thin to build in this coax"
            )
        return self.outer_diameter_m / ratio

    def geometry_limits(self, stop_hz: float, min_feature_m: float) -> tuple[float, float]:
        no_te11 = 2.0 * C0 / (math.pi * math.sqrt(self.eps_r) * stop_hz) - self.outer_diameter_m
        widest = min(self.outer_diameter_m - 2.0 * min_feature_m, no_te11)  # a gap of min_feature_m
        return min_feature_m, max(widest, min_feature_m)

    def notes(self, geometry: np.ndarray, start_hz: float, stop_hz: float, min_feature_m: float) -> list[str]:
        notes = []
        if np.any(np.asarray(geometry) < min_feature_m):
            notes.append(
                f"An inner conductor of {float(np.min(geometry)) * 1e3:.4g} mm is thinner than the "
                f"manufacturable minimum of {min_feature_m * 1e3:.4g} mm."
            )
        cutoff = 2.0 * C0 / (math.pi * np.sqrt(self.eps_r) * (self.outer_diameter_m + np.asarray(geometry)))
        if np.any(cutoff <= stop_hz):
            notes.append(
                f"The TE11 mode propagates from about {float(np.min(cutoff)) / 1e9:.4g} GHz, within the band "
                "(cutoff estimate 2c / (pi sqrt(eps_r) (D + d)), common practice)."
            )
        return notes
