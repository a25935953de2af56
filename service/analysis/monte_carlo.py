"""Monte Carlo yield of a realized line under manufacturing tolerances.

Each trial draws, from normal distributions with the given standard deviations: an independent
width error per section, one etch bias common to all sections, and one permittivity and one
substrate height for the board. Trials are evaluated by the exact cascade in chunks
(trials x frequencies x sections, bounded by CHUNK_ELEMENTS), and a trial passes when its worst reflection on the
grid stays within the spec. Where the line's junction steps count, each trial's steps are those of its own
drawn widths and board. The yield's sampling error is the binomial standard error
sqrt(p (1 - p) / N), with a Wilson 95% interval.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from service.analysis.line_cascade import LineCascade

CHUNK_TRIALS = 256
CHUNK_ELEMENTS = 2_000_000  # trials x frequencies x sections per chunk: bounds memory, not the count
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
    clipped: dict[str, int]  # draws held at a physical floor, per quantity (eps_r, height_m, geometry)
    worst_trial: dict[str, object]  # the parameters of the trial with the largest worst reflection

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
    drawn_eps_r = medium.eps_r + rng.standard_normal(trials) * tolerances.eps_r
    nominal_height = getattr(medium, "height_m", getattr(medium, "ground_spacing_m", 1.0))
    drawn_height = nominal_height + rng.standard_normal(trials) * tolerances.height_m
    drawn_geometry = line.geometry + width_errors + bias
    # Physical floors: a permittivity below vacuum's, a board or strip thinner than 1% of nominal.
    eps_r = np.maximum(drawn_eps_r, 1.0)
    height = np.maximum(drawn_height, 0.01 * nominal_height)
    geometry = np.maximum(drawn_geometry, 0.01 * line.geometry)
    # The feed line, where the junction steps count, is etched with the board (its bias, no error of its own).
    feed = (
        None if line.feed_geometry is None else np.maximum(line.feed_geometry + bias[:, 0], 0.01 * line.feed_geometry)
    )
    clipped = {
        "eps_r": int(np.count_nonzero(drawn_eps_r < 1.0)),
        "height_m": int(np.count_nonzero(drawn_height < 0.01 * nominal_height)),
        "geometry": int(np.count_nonzero(drawn_geometry < 0.01 * line.geometry)),
    }
    worst = np.empty(trials)
    per_chunk = max(1, min(CHUNK_TRIALS, CHUNK_ELEMENTS // (np.size(frequency_hz) * sections)))
    for start in range(0, trials, per_chunk):
        chunk = slice(start, min(start + per_chunk, trials))
        board = medium.perturbed(eps_r[chunk, None, None], height[chunk, None, None])
        trial_feed = None if feed is None else feed[chunk, None, None]
        trial_line = LineCascade(
            line.source_ohm, line.load, board, geometry[chunk, None, :], line.lengths_m, trial_feed
        )
        worst[chunk] = np.max(trial_line.reflection(frequency_hz), axis=-1)
    nominal = float(np.max(line.reflection(frequency_hz)))
    passing = int(np.count_nonzero(worst <= spec_reflection * (1.0 + 1e-9)))
    index = int(np.argmax(worst))
    worst_trial = {
        "index": index,
        "max_reflection": float(worst[index]),
        "eps_r": float(eps_r[index]),
        "height_m": float(height[index]),
        "etch_bias_m": float(bias[index, 0]),
        "section_geometry_m": geometry[index].tolist(),
    }
    return YieldFigures(trials, passing, worst, nominal, clipped, worst_trial)
