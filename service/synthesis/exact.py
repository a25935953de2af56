"""Exact synthesis of a commensurate stepped line from its insertion-loss function.

The power loss ratio of N quarter-wave sections is 1 + k^2 P(cos theta)^2 (Collin 1955; Riblet
1957). With z = exp(-2j theta), the reflection is B(z)/A(z): B = k p(z), where p holds the
coefficients of exp(-jN theta) P(cos theta) (the same junction weights small-reflection theory
uses), and A is the spectral factor of z^N + k^2 p(z) p_rev(z) with all its zeros outside the
unit circle. Peeling one junction at a time off B/A (the layer recursion) gives every step's
reflection, and the steps give the impedances.
"""

from __future__ import annotations

import functools

import numpy as np
from numpy.typing import ArrayLike


def impedances_by_layer_peeling(source_ohm: ArrayLike, load_ohm: ArrayLike, weights: np.ndarray) -> np.ndarray:
    """Section impedances (source side first) whose exact response has the shape of `weights`.

    Vectorized over leading axes: sources and loads (...) with weights (..., N+1) give (..., N).
    The scale k follows from the DC condition: at theta = 0 the line vanishes and the source
    sees the bare load, so k^2 P(1)^2 = rho^2 / (1 - rho^2).
    """
    source, load = np.asarray(source_ohm, dtype=float), np.asarray(load_ohm, dtype=float)
    weights = np.asarray(weights, dtype=float)
    rho = ((load - source) / (load + source))[..., None]
    matched = rho == 0.0
    any_matched = matched.any()
    if any_matched:
        rho = np.where(matched, 0.5, rho)  # any mismatch will do; matched rows are replaced below
    scale = np.abs(rho) / np.sqrt(1.0 - rho * rho) / weights.sum(axis=-1, keepdims=True)
    numerator = np.copysign(scale, rho) * weights
    steps = _peel_junctions(numerator, _spectral_factor(numerator))[..., :-1]
    ratios = ((1.0 + steps) / (1.0 - steps)).cumprod(axis=-1)
    return (np.where(matched, 1.0, ratios) if any_matched else ratios) * source[..., None]


def _spectral_factor(numerator: np.ndarray) -> np.ndarray:
    """A(z), coefficients in ascending powers, with |A|^2 = 1 + |B|^2 on |z| = 1 and no zeros inside.

    For every row of `numerator` (..., N+1) at once: the zeros of z^N + B(z) B_rev(z) (from the
    eigenvalues of its companion matrix) come in pairs r, 1/r*; the N outside the unit circle
    are A's zeros.
    """
    sections = numerator.shape[-1] - 1
    lead = numerator.shape[:-1]
    # B(z) B_rev(z) by a skewed sum: row i of the outer product, shifted right by i, summed over i
    skewed = np.zeros((*lead, sections + 1, 2 * sections + 2))
    skewed[..., : sections + 1] = numerator[..., :, None] * numerator[..., None, ::-1]
    product = skewed.reshape(*lead, -1)[..., : (sections + 1) * (2 * sections + 1)]
    product = product.reshape(*lead, sections + 1, 2 * sections + 1).sum(axis=-2)
    product[..., sections] += 1.0
    roots = _polynomial_roots(product).reshape(-1, 2 * sections)
    order = np.abs(roots).argsort(axis=-1)[:, sections:]
    outside = roots[np.arange(roots.shape[0])[:, None], order].reshape(*lead, sections)
    factor = np.zeros((*lead, sections + 1), dtype=complex)  # descending powers
    factor[..., 0] = 1.0
    for index in range(sections):  # multiply in (z - root), one root at a time
        root = outside[..., index : index + 1]
        factor[..., 1 : index + 2] = factor[..., 1 : index + 2] - root * factor[..., : index + 1]
    factor = factor.real[..., ::-1]
    target = np.sqrt(1.0 + numerator.sum(axis=-1, keepdims=True) ** 2)
    return factor * (target / factor.sum(axis=-1, keepdims=True))


def _polynomial_roots(coefficients: np.ndarray) -> np.ndarray:
    """Zeros of each row's polynomial (..., M+1), coefficients in either order (the product is palindromic),
    as the eigenvalues of its companion matrix; the leading coefficient must not vanish."""
    degree = coefficients.shape[-1] - 1
    companion = np.empty((*coefficients.shape[:-1], degree, degree))
    companion[...] = _shift_matrix(degree)
    companion[..., 0, :] = -coefficients[..., 1:] / coefficients[..., :1]
    return np.linalg.eigvals(companion)


@functools.lru_cache(maxsize=128)
def _shift_matrix(degree: int) -> np.ndarray:
    """Ones below the diagonal: the part of every companion matrix of this degree that does not
    depend on the coefficients (read-only, shared)."""
    shift = np.eye(degree, k=-1)
    shift.flags.writeable = False
    return shift


def _peel_junctions(numerator: np.ndarray, denominator: np.ndarray) -> np.ndarray:
    """Junction reflections r_0 .. r_N of every row from B/A by the layer recursion.

    r = B(0)/A(0); the rest of the line then has reflection (B - r A) / (z (A - r B)).
    """
    b, a = numerator, denominator
    steps = []
    for _ in range(numerator.shape[-1] - 1):
        r = b[..., :1] / a[..., :1]
        steps.append(r)
        b, a = (b - r * a)[..., 1:], (a - r * b)[..., :-1]
    steps.append(b[..., :1] / a[..., :1])
    return np.concatenate(steps, axis=-1)
