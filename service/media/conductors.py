"""Conductor and dielectric loss helpers shared by the physical media."""

from __future__ import annotations

import numpy as np

MU_0 = 4e-7 * np.pi  # H/m (the SI value to the precision that matters here)
ETA_0 = 376.730313668  # ohm, impedance of free space


def surface_resistance_ohm(frequency_hz: np.ndarray, conductivity_s_per_m: float) -> np.ndarray:
    """Rs = sqrt(omega mu0 / (2 sigma))."""
    return np.sqrt(np.pi * np.asarray(frequency_hz) * MU_0 / conductivity_s_per_m)


def roughness_factor(frequency_hz: np.ndarray, conductivity_s_per_m: float, roughness_m: float) -> np.ndarray:
    """Hammerstad's roughness correction 1 + (2/pi) atan(1.4 (Delta / skin depth)^2)."""
    skin_depth = 1.0 / np.sqrt(np.pi * np.asarray(frequency_hz) * MU_0 * conductivity_s_per_m)
    return 1.0 + (2.0 / np.pi) * np.arctan(1.4 * (roughness_m / skin_depth) ** 2)


def tem_dielectric_attenuation(frequency_hz: np.ndarray, eps_r: float, loss_tangent: float) -> np.ndarray:
    """alpha_d = k tan(delta) / 2 (Np/m) for a line filled with the dielectric."""
    k = 2.0 * np.pi * np.asarray(frequency_hz) * np.sqrt(eps_r) / 299_792_458.0
    return 0.5 * k * loss_tangent
