"""Microstrip: Hammerstad and Jensen (1980) statics with the conductor-thickness correction,
Kirschning and Jansen (1982) dispersion of the effective permittivity and the impedance.

Validity stated by the authors (Hammerstad-Jensen: 0.01 <= W/h <= 100, eps_r <= 128;
Kirschning-Jansen: 0.1 <= W/h <= 100, 1 <= eps_r <= 20, f h <= 25 GHz mm).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from service.constants import ETA_0_OHM
from service.constants import SPEED_OF_LIGHT_M_PER_S as C0
from service.physics.media.base import LineParameters, invert_monotone
from service.physics.media.conductors import LineLosses

HJ_U_RANGE = (0.01, 100.0)
KJ_U_RANGE = (0.1, 100.0)
KJ_EPS_MAX = 20.0
KJ_FN_MAX_GHZ_MM = 25.0


def _z_air(u: np.ndarray) -> np.ndarray:
    """Impedance of the zero-thickness strip in air (Hammerstad-Jensen)."""
    f = 6.0 + (2.0 * math.pi - 6.0) * np.exp(-((30.666 / u) ** 0.7528))
    return ETA_0_OHM / (2.0 * math.pi) * np.log(f / u + np.sqrt(1.0 + 4.0 / (u * u)))


def _eps_eff_zero_thickness(u: np.ndarray, eps_r: float) -> np.ndarray:
    a = 1.0 + np.log((u**4 + (u / 52.0) ** 2) / (u**4 + 0.432)) / 49.0 + np.log(1.0 + (u / 18.1) ** 3) / 18.7
    b = 0.564 * ((eps_r - 0.9) / (eps_r + 3.0)) ** 0.053
    return 0.5 * (eps_r + 1.0) + 0.5 * (eps_r - 1.0) * (1.0 + 10.0 / u) ** (-a * b)


def static_line(u: np.ndarray, eps_r: float, t_over_h: float) -> tuple[np.ndarray, np.ndarray]:
    """(impedance, effective permittivity) at DC for width ratio u = W/h and thickness ratio t/h."""
    u = np.asarray(u, dtype=float)
    t = np.asarray(t_over_h, dtype=float)
    safe_t = np.where(t > 0.0, t, 1.0)
    coth = 1.0 / np.tanh(np.sqrt(6.517 * u))
    du_air = np.where(t > 0.0, safe_t / math.pi * np.log(1.0 + 4.0 * math.e / (safe_t * coth * coth)), 0.0)
    du_r = 0.5 * (1.0 + 1.0 / np.cosh(np.sqrt(eps_r - 1.0))) * du_air
    u_air, u_r = u + du_air, u + du_r
    eps_eff = _eps_eff_zero_thickness(u_r, eps_r) * (_z_air(u_air) / _z_air(u_r)) ** 2
    impedance = _z_air(u_r) / np.sqrt(_eps_eff_zero_thickness(u_r, eps_r))
    return impedance, eps_eff


def dispersive_line(
    u: np.ndarray, eps_r: float, t_over_h: float, height_m: float, frequency_hz: np.ndarray
) -> tuple[np.ndarray, np.ndarray]:
    """(impedance, effective permittivity) at each frequency, broadcast over u and frequency."""
    z0, e0 = static_line(u, eps_r, t_over_h)
    u = np.asarray(u, dtype=float)
    fn = np.asarray(frequency_hz, dtype=float) * height_m * 1e-6  # GHz * mm
    p1 = 0.27488 + (0.6315 + 0.525 / (1.0 + 0.0157 * fn) ** 20) * u - 0.065683 * np.exp(-8.7513 * u)
    p2 = 0.33622 * (1.0 - np.exp(-0.03442 * eps_r))
    p3 = 0.0363 * np.exp(-4.6 * u) * (1.0 - np.exp(-((fn / 38.7) ** 4.97)))
    p4 = 1.0 + 2.751 * (1.0 - np.exp(-((eps_r / 15.916) ** 8)))
    p = p1 * p2 * ((0.1844 + p3 * p4) * fn) ** 1.5763
    eps_f = eps_r - (eps_r - e0) / (1.0 + p)

    r1 = 0.03891 * eps_r**1.4
    r2 = 0.267 * u**7
    r3 = 4.766 * np.exp(-3.228 * u**0.641)
    r4 = 0.016 + (0.0514 * eps_r) ** 4.524
    r5 = (fn / 28.843) ** 12
    r6 = 22.2 * u**1.92
    r7 = 1.206 - 0.3144 * np.exp(-r1) * (1.0 - np.exp(-r2))
    r8 = 1.0 + 1.275 * (1.0 - np.exp(-0.004625 * r3 * eps_r**1.674 * (fn / 18.365) ** 2.745))
    r9 = (
        5.086
        * r4
        * r5
        / (0.3838 + 0.386 * r4)
        * np.exp(-r6)
        / (1.0 + 1.2992 * r5)
        * (eps_r - 1.0) ** 6
        / (1.0 + 10.0 * (eps_r - 1.0) ** 6)
    )
    r10 = 0.00044 * eps_r**2.136 + 0.0184
    r11 = (fn / 19.47) ** 6 / (1.0 + 0.0962 * (fn / 19.47) ** 6)
    r12 = 1.0 / (1.0 + 0.00245 * u * u)
    r13 = 0.9408 * eps_f**r8 - 0.9603
    r14 = (0.9408 - r9) * e0**r8 - 0.9603
    r15 = 0.707 * r10 * (fn / 12.3) ** 1.097
    r16 = 1.0 + 0.0503 * eps_r**2 * r11 * (1.0 - np.exp(-((u / 15.0) ** 6)))
    r17 = r7 * (1.0 - 1.1241 * r12 / r16 * np.exp(-0.026 * fn**1.15656 - r15))
    return z0 * (r13 / r14) ** r17, eps_f


def transverse_resonance_hz(width_m: np.ndarray, height_m: float, eps_r: float) -> np.ndarray:
    """First transverse resonance of a wide strip, c / (sqrt(eps_r) (2 W + 0.8 h)) (common practice)."""
    return C0 / (np.sqrt(eps_r) * (2.0 * np.asarray(width_m) + 0.8 * height_m))


@dataclass(frozen=True)
class MicrostripLine(LineLosses):
    """A strip of width W (the geometry) on a substrate of height h over a ground plane."""

    eps_r: float
    height_m: float
    thickness_m: float
    kind: str = "microstrip"
    geometry_name: str | None = "width_m"
    dispersive: bool = True

    def perturbed(self, eps_r: np.ndarray, height_m: np.ndarray) -> MicrostripLine:
        """The same line with other (array-valued, per-trial) permittivity and substrate height."""
        return replace(self, eps_r=eps_r, height_m=height_m)

    def parameters(self, geometry: np.ndarray, frequency_hz: np.ndarray) -> LineParameters:
        u = np.asarray(geometry) / self.height_m
        impedance, eps_eff = dispersive_line(
            u, self.eps_r, self.thickness_m / self.height_m, self.height_m, frequency_hz
        )
        attenuation = None
        if self.lossy:
            f = np.broadcast_to(np.asarray(frequency_hz, dtype=float), impedance.shape)
            attenuation = np.zeros(impedance.shape)
            if self.loss_tangent > 0.0:
                k0 = 2.0 * math.pi * f / C0
                filling = np.where(self.eps_r > 1.0, (eps_eff - 1.0) / np.maximum(self.eps_r - 1.0, 1e-300), 0.0)
                attenuation = attenuation + k0 * self.eps_r * filling * self.loss_tangent / (2.0 * np.sqrt(eps_eff))
            if self.conductivity_s_per_m is not None:
                # Hammerstad and Jensen (1980): alpha_c = Rs Kr Ki / (Z0 W), with the current
                # distribution factor Ki = exp(-1.2 (Z0 / eta0)^0.7); the model scikit-rf's MLine uses.
                resistance = self.conductor_resistance_ohm(f)
                distribution = np.exp(-1.2 * (impedance / ETA_0_OHM) ** 0.7)
                attenuation = attenuation + resistance * distribution / (impedance * np.asarray(geometry))
        return LineParameters(impedance, eps_eff, attenuation)

    def geometry_for(self, impedance_ohm: np.ndarray, frequency_hz: float) -> np.ndarray:
        f = np.array([frequency_hz])

        def impedance_of(width: float) -> float:
            return float(self.parameters(np.array([width]), f).impedance_ohm[0])

        low, high = HJ_U_RANGE[0] * self.height_m / 10.0, HJ_U_RANGE[1] * self.height_m * 10.0
        return np.array(
            [invert_monotone(impedance_of, float(z), low, high, "microstrip") for z in np.atleast_1d(impedance_ohm)]
        )

    def geometry_limits(self, stop_hz: float, min_feature_m: float) -> tuple[float, float]:
        widest = (C0 / (math.sqrt(self.eps_r) * stop_hz) - 0.8 * self.height_m) / 2.0  # transverse resonance
        return min_feature_m, max(widest, min_feature_m)

    def notes(self, geometry: np.ndarray, start_hz: float, stop_hz: float, min_feature_m: float) -> list[str]:
        u = np.asarray(geometry) / self.height_m
        notes = []
        if np.any((u < HJ_U_RANGE[0]) | (u > HJ_U_RANGE[1])):
            notes.append("A width lies outside the Hammerstad-Jensen validity range 0.01 <= W/h <= 100.")
        if np.any((u < KJ_U_RANGE[0]) | (u > KJ_U_RANGE[1])) or self.eps_r > KJ_EPS_MAX:
            notes.append(
                "A width or the permittivity lies outside the Kirschning-Jansen dispersion validity "
                "(0.1 <= W/h <= 100, eps_r <= 20); the dispersion figures are extrapolated."
            )
        if stop_hz * self.height_m * 1e-6 > KJ_FN_MAX_GHZ_MM:
            notes.append("The band exceeds f h = 25 GHz mm, the Kirschning-Jansen validity limit.")
        narrow = np.asarray(geometry) < min_feature_m
        if np.any(narrow):
            notes.append(
                f"A strip of {float(np.min(geometry)) * 1e3:.4g} mm is narrower than the manufacturable "
                f"minimum of {min_feature_m * 1e3:.4g} mm."
            )
        resonance = transverse_resonance_hz(geometry, self.height_m, self.eps_r)
        if np.any(resonance <= stop_hz):
            notes.append(
                f"A strip is wide enough for a transverse resonance at {float(np.min(resonance)) / 1e9:.4g} GHz, "
                "within or below the band."
            )
        notes += self.thin_conductor_notes(self.thickness_m, start_hz)
        return notes
