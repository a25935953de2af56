"""Stripline impedance against a field solution of its own cross-section.

Reference: Laplace's equation solved by finite differences (five-point stencil, SciPy's sparse
direct solver) on a quarter of the cross-section, the capacitance from the field energy, and
Z0 = 1 / (c sqrt(eps_r) C_air); two grids (10 and 5 um) Richardson-extrapolated. For zero
thickness also the exact conformal-mapping result Z0 = (30 pi / sqrt(eps_r)) K(k) / K(k'),
k = sech(pi W / 2b) (Cohn 1954), with SciPy's complete elliptic integral.
"""

import math

import numpy as np
import pytest
import scipy.constants
import scipy.sparse
import scipy.sparse.linalg
from scipy.special import ellipk

from service.physics.media.stripline import NARROW_ACCURACY, NARROW_THICK_ACCURACY, stripline_impedance

SPACING = 1.6e-3
EPS_R = 3.0


def field_impedance(width: float, thickness: float, step: float) -> float:
    """Z0 by finite differences; the strip's half width and half thickness must be whole steps."""
    nx, ny = round((width / 2 + 3 * SPACING) / step), round(SPACING / 2 / step)
    sx, sy = round(width / 2 / step), round(thickness / 2 / step)
    potential = np.zeros((ny + 1, nx + 1))
    fixed = np.zeros(potential.shape, bool)
    fixed[ny, :] = fixed[:, nx] = True  # the ground plane and a far wall three spacings away
    fixed[: sy + 1, : sx + 1] = True
    potential[: sy + 1, : sx + 1] = 1.0
    free = ~fixed
    index = -np.ones(potential.shape, int)
    index[free] = np.arange(free.sum())
    rows, cols, rhs = [], [], np.zeros(free.sum())
    jj, ii = np.nonzero(free)
    for dy, dx in ((1, 0), (-1, 0), (0, 1), (0, -1)):
        nj, ni = np.abs(jj + dy), np.abs(ii + dx)  # mirror images at the two symmetry lines
        inside = free[nj, ni]
        rows.append(index[jj, ii][inside])
        cols.append(index[nj, ni][inside])
        np.add.at(rhs, index[jj, ii][~inside], potential[nj, ni][~inside])
    n = free.sum()
    matrix = scipy.sparse.csc_matrix(
        (
            np.concatenate([np.full(sum(r.size for r in rows), -1.0), np.full(n, 4.0)]),
            (np.concatenate([*rows, np.arange(n)]), np.concatenate([*cols, np.arange(n)])),
        ),
        shape=(n, n),
    )
    potential[free] = scipy.sparse.linalg.spsolve(matrix, rhs)
    energy = np.sum(np.diff(potential, axis=0) ** 2) + np.sum(np.diff(potential, axis=1) ** 2)
    energy -= 0.5 * (np.sum(np.diff(potential[:, 0]) ** 2) + np.sum(np.diff(potential[0, :]) ** 2))
    capacitance = 4 * scipy.constants.epsilon_0 * energy
    return 1.0 / (scipy.constants.c * math.sqrt(EPS_R) * capacitance)


def reference(width: float, thickness: float) -> float:
    coarse, fine = field_impedance(width, thickness, 10e-6), field_impedance(width, thickness, 5e-6)
    return 2 * fine - coarse


@pytest.mark.parametrize(
    "width, thickness, accuracy",
    [
        (0.2e-3, 20e-6, NARROW_ACCURACY),  # narrow, t/W 0.1: Cohn's round-conductor form
        (0.4e-3, 80e-6, NARROW_ACCURACY),  # narrow, t/W 0.2
        (0.2e-3, 60e-6, NARROW_THICK_ACCURACY),  # narrow and thick, t/W 0.3
        (0.1e-3, 80e-6, NARROW_THICK_ACCURACY),  # t/W 0.8, the worst measured
        (1.0e-3, 60e-6, 0.01),  # wide: Cohn's thick-strip formula
        (0.6e-3, 40e-6, 0.01),
    ],
)
def test_thick_strip_impedance_within_its_stated_accuracy(width, thickness, accuracy):
    ours = float(stripline_impedance(np.array([width]), SPACING, thickness, EPS_R)[0])
    assert abs(ours / reference(width, thickness) - 1) <= accuracy


@pytest.mark.parametrize("width", [0.1e-3, 0.5e-3, 1.5e-3, 4e-3])
def test_zero_thickness_against_the_exact_result(width):
    k = 1 / math.cosh(math.pi * width / (2 * SPACING))
    exact = 30 * math.pi / math.sqrt(EPS_R) * ellipk(k * k) / ellipk(1 - k * k)
    ours = float(stripline_impedance(np.array([width]), SPACING, 0.0, EPS_R)[0])
    # Pozar states about 1% for this closed form (from memory); measured 1.4% at W/b = 0.06.
    assert ours == pytest.approx(exact, rel=0.015)
