"""Exact synthesis of a commensurate stepped line from its insertion-loss function.

The power loss ratio of N quarter-wave sections is 1 + k^2 P(cos theta)^2 (Collin 1955; Riblet
1957). With z = exp(-2j theta), the reflection is B(z)/A(z): B = k p(z), where p holds the
coefficients of exp(-jN theta) P(cos theta) (the same junction weights small-reflection theory
uses), and A is the spectral factor of z^N + k^2 p(z) p_rev(z) with all its zeros outside the
unit circle. Peeling one junction at a time off B/A (the layer recursion) gives every step's
reflection, and the steps give the impedances.
"""

from __future__ import annotations

import math

import numpy as np


def impedances_by_layer_peeling(source_ohm: float, load_ohm: float, weights: np.ndarray) -> np.ndarray:
    """Section impedances (source side first) whose exact response has the shape of `weights`.

    The scale k follows from the DC condition: at theta = 0 the line vanishes and the source
    sees the bare load, so k^2 P(1)^2 = rho^2 / (1 - rho^2).
    """
    rho = (load_ohm - source_ohm) / (load_ohm + source_ohm)
    sections = weights.size - 1
    if rho == 0.0:
        return np.full(sections, source_ohm)
    scale = abs(rho) / math.sqrt(1.0 - rho * rho) / float(np.sum(weights))
    numerator = math.copysign(scale, rho) * np.asarray(weights, dtype=float)
    denominator = _spectral_factor(numerator)
    steps = _peel_junctions(numerator, denominator)
    ratios = np.cumprod((1.0 + steps[:-1]) / (1.0 - steps[:-1]))
    return source_ohm * ratios


def _spectral_factor(numerator: np.ndarray) -> np.ndarray:
    """A(z), coefficients in ascending powers, with |A|^2 = 1 + |B|^2 on |z| = 1 and no zeros inside."""
    sections = numerator.size - 1
    product = np.convolve(numerator, numerator[::-1])
    product[sections] += 1.0
    roots = np.roots(product[::-1])
    outside = roots[np.argsort(np.abs(roots))][sections:]
    factor = np.real(np.poly(outside))[::-1]
    target = math.sqrt(1.0 + float(np.sum(numerator)) ** 2)
    return factor * (target / float(np.sum(factor)))


def _peel_junctions(numerator: np.ndarray, denominator: np.ndarray) -> np.ndarray:
    """Junction reflections r_0 .. r_N from B/A by the layer recursion.

    r = B(0)/A(0); the rest of the line then has reflection (B - r A) / (z (A - r B)).
    """
    b, a = numerator.copy(), denominator.copy()
    steps = []
    for _ in range(numerator.size - 1):
        r = b[0] / a[0]
        steps.append(r)
        b, a = (b - r * a)[1:], (a - r * b)[:-1]
    steps.append(b[0] / a[0])
    return np.array(steps)
