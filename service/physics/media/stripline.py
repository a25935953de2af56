"""Symmetric stripline: a strip of width W and thickness t centred between ground planes b apart.

Impedance: for W/(b - t) >= 0.35, Cohn's thick-strip formula (Cohn 1955, the fringing
capacitance of a strip of thickness t). Below that, for a zero-thickness strip, the effective
width W_e = W - (0.35 (b - t) - W)^2 / (b - t) (the closed form as given in Pozar, Microwave
Engineering, ch. 3). For a narrow strip of thickness t with t/W <= 0.2, Cohn's narrow-strip
formula Z0 = (60 / sqrt(eps_r)) ln(4 b / (pi d0)), with the equivalent round-conductor diameter
d0 = (W / 2) (1 + (t / (pi W)) (1 + ln(4 pi W / t)) + 0.51 pi (t / W)^2) (Cohn 1955); for thicker
narrow strips, where that formula falls off fast, the thick-strip fringing with the effective
width above. Measured against a finite-difference field solution: within 2.5% and 6% in those
two regions, about 1% for wide strips (README, Line models). Conductor loss: Pozar, Microwave
Engineering, eq. 3.199-3.200 (from the incremental-inductance rule). A TEM line: eps_eff = eps_r, no dispersion.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, replace

import numpy as np

from service.constants import SPEED_OF_LIGHT_M_PER_S as C0
from service.physics.media.base import LineParameters, invert_monotone
from service.physics.media.conductors import LineLosses

WIDE_LIMIT = 0.35
ROUND_CONDUCTOR_MAX_T_OVER_W = 0.2  # narrow strips up to this t / W use Cohn's round-conductor formula
NARROW_ACCURACY = 0.025  # measured against a finite-difference solution, t / W <= 0.2
NARROW_THICK_ACCURACY = 0.06  # measured, t / W > 0.2 (the effective-width form)


def fringing_term(t_over_b: float | np.ndarray) -> np.ndarray:
    """Cohn's normalized fringing capacitance; ln(2) * 2 / pi = 0.441 at zero thickness."""
    x = 1.0 - np.asarray(t_over_b, dtype=float)
    thin = x >= 1.0
    safe = np.where(thin, 0.5, x)
    thick = (2.0 / safe * np.log(1.0 / safe + 1.0) - (1.0 / safe - 1.0) * np.log(1.0 / (safe * safe) - 1.0)) / math.pi
    return np.where(thin, 2.0 * np.log(2.0) / math.pi, thick)


def stripline_impedance(width_m: np.ndarray, spacing_m: float, thickness_m: float, eps_r: float) -> np.ndarray:
    """Characteristic impedance of the strip, for each width."""
    width = np.asarray(width_m, dtype=float)
    w = width / (spacing_m - thickness_m)
    fringing = fringing_term(thickness_m / spacing_m)
    effective_width = (
        30.0 * math.pi / np.sqrt(eps_r) / (np.where(w < WIDE_LIMIT, w - (WIDE_LIMIT - w) ** 2, w) + fringing)
    )
    if thickness_m == 0.0:
        return effective_width
    ratio = thickness_m / np.maximum(width, 1e-300)
    round_enough = (w < WIDE_LIMIT) & (ratio <= ROUND_CONDUCTOR_MAX_T_OVER_W)
    safe = np.where(round_enough, ratio, ROUND_CONDUCTOR_MAX_T_OVER_W)
    diameter = 0.5 * width * (1.0 + safe / math.pi * (1.0 + np.log(4.0 * math.pi / safe)) + 0.51 * math.pi * safe**2)
    round_conductor = 60.0 / np.sqrt(eps_r) * np.log(4.0 * spacing_m / (math.pi * diameter))
    return np.where(round_enough, round_conductor, effective_width)


def stripline_conductor_attenuation(
    resistance_ohm: np.ndarray,
    width_m: np.ndarray,
    spacing_m: float,
    thickness_m: float,
    eps_r: float,
    impedance_ohm: np.ndarray,
) -> np.ndarray:
    """Conductor attenuation in Np/m (Pozar, eq. 3.199-3.200): one form below sqrt(eps_r) Z0 = 120 ohm
    (wider strips), another above it."""
    b, t, w = spacing_m, thickness_m, np.asarray(width_m, dtype=float)
    a_term = 1.0 + 2.0 * w / (b - t) + (b + t) / (math.pi * (b - t)) * math.log((2.0 * b - t) / t)
    b_term = 1.0 + b / (0.5 * w + 0.7 * t) * (0.5 + 0.414 * t / w + np.log(4.0 * math.pi * w / t) / (2.0 * math.pi))
    low = 2.7e-3 * resistance_ohm * eps_r * impedance_ohm / (30.0 * math.pi * (b - t)) * a_term
    high = 0.16 * resistance_ohm / (impedance_ohm * b) * b_term
    return np.where(math.sqrt(eps_r) * impedance_ohm < 120.0, low, high)


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

        def conductor(resistance: np.ndarray) -> np.ndarray:
            return stripline_conductor_attenuation(
                resistance, geometry, self.ground_spacing_m, self.thickness_m, self.eps_r, z
            )

        return self.tem_parameters(z, self.eps_r, frequency_hz, conductor)

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
        narrow = (w < WIDE_LIMIT) & (self.thickness_m > 0.0)
        if np.any(narrow):
            thick = narrow & (self.thickness_m / np.asarray(geometry) > ROUND_CONDUCTOR_MAX_T_OVER_W)
            accuracy = NARROW_THICK_ACCURACY if np.any(thick) else NARROW_ACCURACY
            notes.append(
                f"A strip is narrower than W/(b - t) = 0.35 with a thickness of its own: its impedance "
                f"holds to about {accuracy:.1%} (measured against a finite-difference field solution; "
                "see the README, Line models)."
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
        notes += self.thin_conductor_notes(self.thickness_m, start_hz)
        return notes
