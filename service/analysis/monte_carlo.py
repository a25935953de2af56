"""Monte Carlo yield of a realized line under manufacturing tolerances.

Each trial draws, from normal distributions with the given standard deviations: an independent
width error per section, one etch bias common to all sections, and one permittivity and one
substrate height for the board. The whole batch of trials is evaluated at once by the exact
cascade (trials x frequencies x sections), and a trial passes when its worst reflection on the
grid stays within the spec. The yield's sampling error is the binomial standard error
sqrt(p (1 - p) / N), with a Wilson 95% interval.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from service.analysis.line_cascade import LineCascade

CHUNK_TRIALS = 256
Z_95 = 1.959963984540054


@dataclass(frozen=True)
class Tolerances:
    """One-sigma manufacturing errors, in metres or (for eps_r) absolute permittivity."""

    width_m: float = 0.0
    eps_r: float = 0.0
    height_m: float = 0.0
    etch_bias_m: float = 0.0


@dataclass(frozen=True)
class YieldFigures:
    """What the trials showed."""

    trials: int
    passing: int
    worst_reflections: np.ndarray
    nominal_worst: float

    @property
    def fraction(self) -> float:
        return self.passing / self.trials

    @property
    def standard_error(self) -> float:
        p = self.fraction
        return math.sqrt(p * (1.0 - p) / self.trials)

    @property
    def interval_95(self) -> tuple[float, float]:
        """Wilson score interval for the yield."""
        n, p, z = self.trials, self.fraction, Z_95
        centre = (p + z * z / (2 * n)) / (1 + z * z / n)
        half = z * math.sqrt(p * (1 - p) / n + z * z / (4 * n * n)) / (1 + z * z / n)
        return max(0.0, centre - half), min(1.0, centre + half)


def monte_carlo(
    line: LineCascade,
    frequency_hz: np.ndarray,
    spec_reflection: float,
    tolerances: Tolerances,
    trials: int,
    seed: int,
) -> YieldFigures:
    """Yield of the line over the frequency grid; the same seed gives the same draws."""
    medium = line.medium
    rng = np.random.default_rng(seed)
    sections = line.geometry.size
    width_errors = rng.standard_normal((trials, sections)) * tolerances.width_m
    bias = rng.standard_normal((trials, 1)) * tolerances.etch_bias_m
    eps_r = np.maximum(medium.eps_r + rng.standard_normal(trials) * tolerances.eps_r, 1.0)
    nominal_height = getattr(medium, "height_m", getattr(medium, "ground_spacing_m", 1.0))
    height = np.maximum(nominal_height + rng.standard_normal(trials) * tolerances.height_m, 0.01 * nominal_height)
    geometry = np.maximum(line.geometry + width_errors + bias, 0.01 * line.geometry)
    worst = np.empty(trials)
    for start in range(0, trials, CHUNK_TRIALS):
        chunk = slice(start, min(start + CHUNK_TRIALS, trials))
        board = medium.perturbed(eps_r[chunk, None, None], height[chunk, None, None])
        trial_line = LineCascade(line.source_ohm, line.load, board, geometry[chunk, None, :], line.lengths_m)
        worst[chunk] = np.max(trial_line.reflection(frequency_hz), axis=-1)
    nominal = float(np.max(line.reflection(frequency_hz)))
    passing = int(np.count_nonzero(worst <= spec_reflection * (1.0 + 1e-9)))
    return YieldFigures(trials, passing, worst, nominal)
