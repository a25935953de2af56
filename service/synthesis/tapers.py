"""Continuously tapered lines (exponential, triangular, Klopfenstein), discretized into steps.

Small-reflection theory for a taper of length L gives
Gamma(beta L) = 1/2 integral exp(-2j beta z) d/dz ln Z dz. With Gamma0 = 1/2 ln(ZL/Z0):
exponential  |Gamma| = Gamma0 |sin x / x|,              x = beta L;
triangular   |Gamma| = Gamma0 (sin(x/2) / (x/2))^2;
Klopfenstein |Gamma| = Gamma0 |cos sqrt(x^2 - A^2)| / cosh A for x >= A (Klopfenstein 1956),
the shortest taper for a given passband ripple Gamma0 / cosh A.
"""

from __future__ import annotations

import math
from typing import Literal

import numpy as np
from scipy.integrate import cumulative_simpson
from scipy.optimize import brentq
from scipy.special import i1

from service.synthesis.multisection import InfeasibleDesignError
from service.synthesis.stepped_design import SteppedDesign

TaperProfile = Literal["exponential", "triangular", "klopfenstein"]
PHI_GRID_POINTS = 20001
PREDICTION_POINTS = 4001
MAX_LENGTH_RAD = 2.0e4  # beta L at the lower band edge beyond which a taper is not sensible


def klopfenstein_phi(x: np.ndarray, a: float) -> np.ndarray:
    """phi(x, A) = integral_0^x I1(A sqrt(1 - y^2)) / (A sqrt(1 - y^2)) dy for |x| <= 1.

    Evaluated by composite Simpson quadrature of the defining integral on a fine grid (the
    integrand is smooth, tending to 1/2 where its argument vanishes), so no series recurrence
    is involved; phi(1, A) = (cosh A - 1) / A^2 is the check.
    """
    y = np.linspace(-1.0, 1.0, PHI_GRID_POINTS)
    w = a * np.sqrt(np.clip(1.0 - y * y, 0.0, None))
    integrand = np.where(w > 1e-8, i1(w) / np.where(w > 1e-8, w, 1.0), 0.5 + w * w / 16.0)
    cumulative = cumulative_simpson(integrand, x=y, initial=0.0)
    cumulative -= np.interp(0.0, y, cumulative)
    return np.interp(np.asarray(x, dtype=float), y, cumulative)


def log_profile(profile: TaperProfile, position: np.ndarray, ln_ratio: float, a: float) -> np.ndarray:
    """ln(Z(z)/Z0) at fractional positions z/L in [0, 1]; a is Klopfenstein's A (ignored otherwise)."""
    p = np.asarray(position, dtype=float)
    if profile == "exponential":
        return p * ln_ratio
    if profile == "triangular":
        return np.where(p <= 0.5, 2.0 * p * p, 4.0 * p - 2.0 * p * p - 1.0) * ln_ratio
    gamma0 = 0.5 * ln_ratio
    return 0.5 * ln_ratio + gamma0 / math.cosh(a) * a * a * klopfenstein_phi(2.0 * p - 1.0, a)


def taper_reflection(profile: TaperProfile, beta_l: np.ndarray, ln_ratio: float, a: float) -> np.ndarray:
    """The continuous taper's |Gamma| at electrical lengths beta L (small-reflection theory)."""
    x = np.asarray(beta_l, dtype=float)
    gamma0 = 0.5 * abs(ln_ratio)
    if profile == "exponential":
        return gamma0 * np.abs(np.sinc(x / math.pi))
    if profile == "triangular":
        return gamma0 * np.sinc(x / (2.0 * math.pi)) ** 2
    root = np.sqrt(np.abs(x * x - a * a))
    # below x = a the root is at most a; clamping keeps cosh finite where np.where discards it
    return gamma0 * np.where(x >= a, np.abs(np.cos(root)), np.cosh(np.minimum(root, a))) / math.cosh(a)


def _sinc_peak(k: int) -> tuple[float, float]:
    """Where |sin u / u| peaks in its k-th side lobe (tan u = u, k >= 1) and the peak value."""
    u = brentq(lambda t: math.tan(t) - t, k * math.pi + 1e-12, k * math.pi + math.pi / 2 - 1e-12)
    return u, abs(math.sin(u) / u)


def _sinc_tail_start(target: float) -> float:
    """Smallest u0 with |sin u / u| <= target for every u >= u0."""
    if target >= 1.0:
        return 0.0
    low, high = 0, 1
    while _sinc_peak(high)[1] > target:
        low, high = high, high * 2
        if high * math.pi > MAX_LENGTH_RAD:
            raise InfeasibleDesignError("the taper would have to be impractically long for this spec")
    while high - low > 1:
        middle = (low + high) // 2
        low, high = (middle, high) if _sinc_peak(middle)[1] > target else (low, middle)
    start = _sinc_peak(low)[0] if low >= 1 else 0.0
    return brentq(lambda u: abs(math.sin(u) / u) - target if u > 0 else 1.0 - target, start, high * math.pi)


def length_for_spec(profile: TaperProfile, ln_ratio: float, spec_reflection: float) -> tuple[float, float]:
    """(beta L at the lower band edge, Klopfenstein A) for the shortest taper within the spec above it."""
    gamma0 = 0.5 * abs(ln_ratio)
    if gamma0 <= spec_reflection:
        raise InfeasibleDesignError(
            f"the load already reflects less than the spec (small-reflection |Gamma0| = {gamma0:.4g}); "
            "no taper is needed"
        )
    ratio = spec_reflection / gamma0
    if profile == "klopfenstein":
        a = math.acosh(1.0 / ratio)
        return a, a
    if profile == "exponential":
        return _sinc_tail_start(ratio), 0.0
    return 2.0 * _sinc_tail_start(math.sqrt(ratio)), 0.0


def taper(
    source_ohm: float,
    load_ohm: float,
    profile: TaperProfile,
    segments: int,
    start_over_center: float,
    edge_length_rad: float | None,
    spec_reflection: float,
    design_reflection: float | None = None,
) -> SteppedDesign:
    """A taper discretized into equal segments, each at its profile's midpoint impedance.

    `edge_length_rad` is beta L at the lower band edge; None means: the shortest taper whose
    theory stays within `design_reflection` (default: the spec) from the lower band edge up.
    The predicted figures are the continuous taper's over the band; the bandwidth is the widest
    band centred on f0 within the spec (a taper passes everything above its lower edge).
    """
    ln_ratio = math.log(load_ohm / source_ohm)
    if edge_length_rad is None:
        edge_length_rad, a = length_for_spec(profile, ln_ratio, design_reflection or spec_reflection)
    else:
        a = edge_length_rad if profile == "klopfenstein" else 0.0
    if edge_length_rad > MAX_LENGTH_RAD:
        raise InfeasibleDesignError("the taper would have to be impractically long for this spec")
    positions = (np.arange(segments) + 0.5) / segments
    impedances = source_ohm * np.exp(log_profile(profile, positions, ln_ratio, a))
    total_at_center = edge_length_rad / start_over_center
    angles = np.full(segments, total_at_center / segments)
    band = np.linspace(edge_length_rad, edge_length_rad * (2.0 / start_over_center - 1.0), PREDICTION_POINTS)
    predicted = float(np.max(taper_reflection(profile, band, ln_ratio, a)))
    lowest_within = (
        length_for_spec(profile, ln_ratio, spec_reflection)[0] if 0.5 * abs(ln_ratio) > spec_reflection else 0.0
    )
    fraction = max(0.0, 2.0 * (1.0 - lowest_within / total_at_center))
    return SteppedDesign(impedances, angles, predicted, fraction)
