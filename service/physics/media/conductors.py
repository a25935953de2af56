"""Conductor and dielectric loss helpers shared by the physical media."""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from service.constants import MU_0_H_PER_M, SPEED_OF_LIGHT_M_PER_S
from service.physics.media.base import LineParameters


def surface_resistance_ohm(frequency_hz: np.ndarray, conductivity_s_per_m: float) -> np.ndarray:
    """Rs = sqrt(omega mu0 / (2 sigma))."""
    return np.sqrt(np.pi * np.asarray(frequency_hz) * MU_0_H_PER_M / conductivity_s_per_m)


def roughness_factor(frequency_hz: np.ndarray, conductivity_s_per_m: float, roughness_m: float) -> np.ndarray:
    """Hammerstad's roughness correction 1 + (2/pi) atan(1.4 (Delta / skin depth)^2)."""
    skin_depth = 1.0 / np.sqrt(np.pi * np.asarray(frequency_hz) * MU_0_H_PER_M * conductivity_s_per_m)
    return 1.0 + (2.0 / np.pi) * np.arctan(1.4 * (roughness_m / skin_depth) ** 2)


def tem_dielectric_attenuation(frequency_hz: np.ndarray, eps_r: float, loss_tangent: float) -> np.ndarray:
    """alpha_d = k tan(delta) / 2 (Np/m) for a line filled with the dielectric."""
    k = 2.0 * np.pi * np.asarray(frequency_hz) * np.sqrt(eps_r) / SPEED_OF_LIGHT_M_PER_S
    return 0.5 * k * loss_tangent


@dataclass(frozen=True, kw_only=True)
class LineLosses:
    """The loss data a physical line may carry; none by default (a lossless line)."""

    loss_tangent: float = 0.0
    conductivity_s_per_m: float | None = None
    roughness_m: float = 0.0

    @property
    def lossy(self) -> bool:
        return self.loss_tangent > 0.0 or self.conductivity_s_per_m is not None

    def thin_conductor_notes(self, thickness_m: float, start_hz: float) -> list[str]:
        """The conductor-loss models hold for conductors at least three skin depths thick (common
        practice, no source); say so where the lowest band frequency has thinner ones."""
        if self.conductivity_s_per_m is None or thickness_m <= 0.0:
            return []
        depth = 1.0 / math.sqrt(math.pi * start_hz * MU_0_H_PER_M * self.conductivity_s_per_m)
        if thickness_m >= 3.0 * depth:
            return []
        return [
            f"The strip is {thickness_m / depth:.3g} skin depths thick at the band start; the conductor "
            "loss model assumes at least 3, so the insertion loss there is underestimated."
        ]

    def conductor_resistance_ohm(self, frequency_hz: np.ndarray) -> np.ndarray:
        """Surface resistance with the roughness correction, at each frequency."""
        rs = surface_resistance_ohm(frequency_hz, self.conductivity_s_per_m)
        return rs * roughness_factor(frequency_hz, self.conductivity_s_per_m, self.roughness_m)

    def tem_parameters(
        self,
        impedance_ohm: np.ndarray,
        eps_r: float,
        frequency_hz: np.ndarray,
        conductor: Callable[[np.ndarray], np.ndarray],
    ) -> LineParameters:
        """Line parameters of a TEM line filled with its dielectric (eps_eff = eps_r, no dispersion).

        `conductor` turns the rough-surface resistance at each frequency into the conductor attenuation.
        """
        shape = np.broadcast_shapes(np.shape(impedance_ohm), np.shape(frequency_hz))
        attenuation = None
        if self.lossy:
            f = np.broadcast_to(np.asarray(frequency_hz, dtype=float), shape)
            attenuation = tem_dielectric_attenuation(f, eps_r, self.loss_tangent)
            if self.conductivity_s_per_m is not None:
                attenuation = attenuation + conductor(self.conductor_resistance_ohm(f))
        return LineParameters(np.broadcast_to(impedance_ohm, shape), np.full(shape, eps_r), attenuation)
