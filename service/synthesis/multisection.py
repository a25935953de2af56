"""Quarter-wave, binomial and Chebyshev stepped transformers, in either synthesis theory.

The response of N quarter-wave sections is a polynomial in z = exp(-2j theta) whose
coefficients are the junction weights: sum_n w_n exp(-2jn theta). The binomial (maximally flat)
design takes w_n = C(N, n), giving cos^N theta; the Chebyshev (equal ripple) design takes the
weights of T_N(scale cos theta). The theory (see theory.py) sets what the polynomial shapes,
the reflection or the insertion-loss function, and how impedances follow from the weights.
"""

from __future__ import annotations

import functools
import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np
from scipy.special import comb

from service.constants import MAX_SECTIONS
from service.synthesis.stepped_design import SteppedDesign, fraction_from_edge_angle, load_reflection
from service.synthesis.theory import SMALL_REFLECTION, Theory

MAX_SCALE = 1e100
FULL_BAND_FRACTION = 2.0  # the whole period 0 .. 2 f0 of a commensurate line


class InfeasibleDesignError(ValueError):
    """The requested specification cannot be met within the allowed number of sections."""


def quarter_wave(source_ohm: float, load_ohm: float, edge_angle_rad: float, spec_reflection: float) -> SteppedDesign:
    """Single quarter-wave section Z1 = sqrt(Z0 ZL); its response formula is exact for one section."""
    impedance = math.sqrt(source_ohm * load_ohm)
    mismatch = abs(load_ohm - source_ohm)
    edge_sec_sq = 1.0 / math.cos(edge_angle_rad) ** 2
    predicted = mismatch / math.sqrt(mismatch**2 + 4.0 * source_ohm * load_ohm * edge_sec_sq)
    if spec_reflection >= abs(load_reflection(source_ohm, load_ohm)):
        fraction = FULL_BAND_FRACTION
    else:
        cos_edge = (
            2.0 * spec_reflection * math.sqrt(source_ohm * load_ohm) / (math.sqrt(1.0 - spec_reflection**2) * mismatch)
        )
        fraction = fraction_from_edge_angle(math.acos(cos_edge))
    return SteppedDesign.quarter_waves(np.array([impedance]), predicted, fraction)


def binomial_weights(sections: int) -> np.ndarray:
    """Junction weights C(N, n), n = 0..N, of the maximally flat response cos^N theta."""
    return comb(sections, np.arange(sections + 1))


@dataclass(frozen=True)
class WeightedDesign:
    """A multisection design short of its impedances: junction weights and the theory's predictions.

    `stepped_many` turns many of them into impedances at once, one vectorized synthesis per
    theory and section count.
    """

    source_ohm: float
    load_ohm: float
    weights: np.ndarray
    theory: Theory
    predicted_max_reflection: float
    predicted_bandwidth_fraction: float
    notes: tuple[str, ...] = ()

    def stepped(self) -> SteppedDesign:
        """This design with its impedances (for many designs at once, see stepped_many)."""
        return stepped_many([self])[0]


def stepped_many(designs: list[WeightedDesign]) -> list[SteppedDesign]:
    """The stepped design of every weighted design, in order."""
    groups: dict[tuple[str, int], list[int]] = {}
    for index, weighted in enumerate(designs):
        groups.setdefault((weighted.theory.name, weighted.weights.size), []).append(index)
    stepped: list[SteppedDesign | None] = [None] * len(designs)
    for indices in groups.values():
        members = [designs[i] for i in indices]
        impedances = members[0].theory.impedances(
            np.array([m.source_ohm for m in members]),
            np.array([m.load_ohm for m in members]),
            np.array([m.weights for m in members]),
        )
        for index, member, row in zip(indices, members, impedances, strict=True):
            stepped[index] = SteppedDesign.quarter_waves(
                row, member.predicted_max_reflection, member.predicted_bandwidth_fraction, member.notes
            )
    return stepped


def binomial(
    source_ohm: float,
    load_ohm: float,
    sections: int,
    edge_angle_rad: float,
    spec_reflection: float,
    theory: Theory = SMALL_REFLECTION,
) -> WeightedDesign:
    """Binomial design: shaped(|Gamma|) = shaped(|rho|) |cos theta|^N, rho = (ZL - Z0) / (ZL + Z0).

    The predicted bandwidth is the band within the spec reflection.
    """
    rho = theory.shaped_from_reflection(abs(load_reflection(source_ohm, load_ohm)))
    spec = theory.shaped_from_reflection(spec_reflection)
    predicted = theory.reflection_from_shaped(rho * abs(math.cos(edge_angle_rad)) ** sections)
    if spec >= rho:
        fraction = FULL_BAND_FRACTION
    else:
        fraction = fraction_from_edge_angle(math.acos((spec / rho) ** (1.0 / sections)))
    return WeightedDesign(source_ohm, load_ohm, binomial_weights(sections), theory, predicted, fraction)


def binomial_sections_for(
    source_ohm: float,
    load_ohm: float,
    edge_angle_rad: float,
    max_reflection: float,
    theory: Theory = SMALL_REFLECTION,
) -> int:
    """Smallest N whose binomial response stays within max_reflection over the band:
    cos^N(theta_edge) <= spec / rho, i.e. N >= ln(rho / spec) / -ln cos(theta_edge)."""
    growth_per_section = -math.log(math.cos(edge_angle_rad))
    rho = theory.shaped_from_reflection(abs(load_reflection(source_ohm, load_ohm)))
    return _smallest_count(rho, max_reflection, theory, growth_per_section, math.log, "binomial")


@functools.lru_cache(maxsize=4096)
def chebyshev_weights(sections: int, scale: float) -> np.ndarray:
    """Junction weights of T_N(scale cos theta) / T_N(scale), n = 0..N, from its cos((N-2n) theta) terms.

    Remembered per (N, scale), read-only: the designs of a batch or sweep mostly share one band.

    Dividing by T_N(scale) (the weights only matter up to a common factor) keeps them finite for
    very narrow bands, where scale = sec(theta_edge) is huge and T_N(scale) overflows.

    T_N(scale x) is a polynomial of degree N in x, so its Chebyshev series b_m (the coefficients of
    cos(m theta), since cos(m theta) = T_m(cos theta)) follows exactly from its values at the N+1
    Chebyshev-Gauss nodes by the discrete cosine sum. Coefficient b_m belongs half to junction n
    and half to junction N-n (m = N - 2n), except the middle one for even N.
    """
    count = sections + 1
    nodes = math.pi * (np.arange(count) + 0.5) / count
    values = chebyshev_ratio(sections, scale * np.cos(nodes), scale)
    series = 2.0 / count * np.cos(np.outer(np.arange(count), nodes)) @ values
    series[0] *= 0.5
    orders = np.abs(sections - 2 * np.arange(count))
    weights = series[orders] / 2.0
    if sections % 2 == 0:
        weights[sections // 2] *= 2.0
    weights.setflags(write=False)
    return weights


def chebyshev_ratio(sections: int, y: np.ndarray, scale: float) -> np.ndarray:
    """T_N(y) / T_N(scale) for real y and scale >= 1, evaluated without overflow.

    Inside [-1, 1] T_N(y) = cos(N acos y); outside it is +-cosh(N acosh |y|), and the ratio of two
    cosh values is taken through exponentials of their difference.
    """
    top = sections * np.arccosh(max(scale, 1.0))
    magnitude = sections * np.arccosh(np.maximum(np.abs(y), 1.0))
    outside = np.exp(magnitude - top) * (1.0 + np.exp(-2.0 * magnitude)) / (1.0 + np.exp(-2.0 * top))
    inside = np.cos(sections * np.arccos(np.clip(y, -1.0, 1.0))) * 2.0 * np.exp(-top) / (1.0 + np.exp(-2.0 * top))
    sign = np.where(y < 0.0, (-1.0) ** sections, 1.0)
    return np.where(np.abs(y) <= 1.0, inside, sign * outside)


@functools.lru_cache(maxsize=4096)
def chebyshev_peak_ratio(sections: int, argument: float, scale: float) -> float:
    """max |T_N(y)| over |y| <= argument (>= 0), divided by T_N(scale) (scale >= 1), without overflow.

    Remembered like the weights."""
    if argument >= 1.0:
        return float(chebyshev_ratio(sections, np.array([argument]), scale)[0])
    extrema = np.cos(np.arange(sections + 1) * math.pi / sections)
    peak = 1.0 if np.any(np.abs(extrema) <= argument) else abs(math.cos(sections * math.acos(argument)))
    return peak * float(chebyshev_ratio(sections, np.array([1.0]), scale)[0])


def _bounded_scale(scale: float) -> float:
    """Beyond MAX_SCALE, T_N(s cos theta) / T_N(s) equals cos^N theta to double precision."""
    return min(scale, MAX_SCALE)


def chebyshev(
    source_ohm: float,
    load_ohm: float,
    sections: int,
    edge_angle_rad: float,
    ripple: float | None = None,
    theory: Theory = SMALL_REFLECTION,
) -> WeightedDesign:
    """Chebyshev (equal ripple) design: shaped(|Gamma|) = level |T_N(scale cos theta)| / T_N(scale).

    `level` is the theory's load_level: for small-reflection theory |ln(ZL/Z0)|/2, the form its
    logarithmic impedances sum to, so sec(theta_m) and the impedances agree (the textbook form).

    With no ripple the equal-ripple edges are put on the band limits, the lowest ripple N
    sections can give over the band. With a ripple the edges follow from it. The predicted
    bandwidth is the equal-ripple band.
    """
    rho_reflection = abs(load_reflection(source_ohm, load_ohm))
    rho = theory.load_level(source_ohm, load_ohm)
    notes: tuple[str, ...] = ()
    if ripple is None:
        scale = _bounded_scale(1.0 / math.cos(edge_angle_rad))
    elif theory.shaped_from_reflection(ripple) < rho:
        growth_per_section = math.acosh(rho / theory.shaped_from_reflection(ripple)) / sections
        scale = _bounded_scale(
            math.cosh(growth_per_section) if growth_per_section < math.acosh(MAX_SCALE) else MAX_SCALE
        )
    else:
        scale = 1.0
        notes = (
            f"The bare load reflects only {rho_reflection:.4g}, within the requested ripple "
            f"{ripple:.4g}: the equal-ripple design degenerates to a response that never exceeds "
            "the load's own reflection.",
        )
    weights = chebyshev_weights(sections, scale)
    predicted = theory.reflection_from_shaped(
        rho * chebyshev_peak_ratio(sections, scale * math.cos(edge_angle_rad), scale)
    )
    fraction = fraction_from_edge_angle(math.acos(1.0 / scale))
    return WeightedDesign(source_ohm, load_ohm, weights, theory, predicted, fraction, notes)


def chebyshev_sections_for(
    source_ohm: float,
    load_ohm: float,
    edge_angle_rad: float,
    max_reflection: float,
    theory: Theory = SMALL_REFLECTION,
) -> int:
    """Smallest N whose equal-ripple response over the band stays within max_reflection:
    T_N(sec theta_edge) >= rho / spec, i.e. N >= acosh(rho / spec) / acosh(sec theta_edge)."""
    growth_per_section = math.acosh(1.0 / math.cos(edge_angle_rad))
    rho = theory.load_level(source_ohm, load_ohm)
    return _smallest_count(rho, max_reflection, theory, growth_per_section, math.acosh, "Chebyshev")


def _smallest_count(
    rho: float,
    max_reflection: float,
    theory: Theory,
    growth_per_section: float,
    growth: Callable[[float], float],
    method: str,
) -> int:
    """N >= growth(rho / spec) / growth_per_section, rho and spec in the theory's shaped measure;
    1 if the load already meets the spec."""
    spec = theory.shaped_from_reflection(max_reflection)
    if rho <= spec:
        return 1
    if growth_per_section == 0.0:
        raise InfeasibleDesignError("the band reaches down to DC, where no stepped line can match")
    return _at_least_one(growth(rho / spec) / growth_per_section, method)


def _at_least_one(required: float, method: str) -> int:
    """Round a required section count up (with a little slack for rounding) and check the limit."""
    if not required - 1e-9 <= MAX_SECTIONS:  # also catches inf and nan
        needed = f"{math.ceil(required - 1e-9)}" if math.isfinite(required) else "unboundedly many"
        raise InfeasibleDesignError(
            f"a {method} transformer would need {needed} sections to meet the spec over this "
            f"band; at most {MAX_SECTIONS} are allowed"
        )
    return max(1, math.ceil(required - 1e-9))
