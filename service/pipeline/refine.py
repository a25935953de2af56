"""Minimax refinement of a line's sections against a load that is not a plain resistance.

The synthesized design matches the load at the centre frequency only. Here the section
geometries (impedances on the ideal line, strip widths, inner diameters) and lengths are
adjusted so that the worst in-band reflection is as small as the optimizer can make it: SciPy's
SLSQP on the epigraph form (minimize t subject to |Gamma(f_k)|^2 <= t on a grid over the band).
A minimax problem over a band has many local optima, so the search starts from the theory's
design and from seeded random designs within the bounds; every start gets a short run, the
best few run to convergence. The constraint Jacobian comes from one stacked cascade evaluation
of all perturbed lines. The exact cascade is both the objective and the final judge.
"""

from __future__ import annotations

import time
from dataclasses import dataclass

import numpy as np
from scipy.optimize import minimize

from service.analysis.line_cascade import LineCascade
from service.analysis.worst_case import worst_reflection

GRID_POINTS = 81
RANDOM_STARTS = 11  # seeded random starts besides the theory's design (fewer for one free section)
RANDOM_STARTS_PER_SECTION = 3
PROBE_ITERATIONS = 30  # iterations every start gets
FINALISTS = 2  # starts that then run to convergence
MAX_ITERATIONS = 200
MAX_SECONDS = 2.0  # the whole search stops here with the best point so far
MAX_LENGTH_FACTOR = 2.0  # each length may shrink to zero or grow to this many times a quarter wave
STEP = 1e-7  # forward-difference step in the scaled variables
SEED = 20261202  # a fixed seed: the same request always gets the same design


@dataclass(frozen=True)
class Refinement:
    """The line before and after refinement, and how long the optimizer worked."""

    before: LineCascade
    after: LineCascade
    iterations: int


@dataclass(frozen=True)
class _Problem:
    """The epigraph problem over the free sections: x = (log geometry, length / quarter wave, t)."""

    line: LineCascade
    grid: np.ndarray
    quarter_wave_m: float
    free: np.ndarray  # indices of the sections the optimizer may change

    def lines(self, x: np.ndarray) -> LineCascade:
        """The line of each row of x (rows, 2 F + 1), stacked as (rows, 1, S)."""
        rows, count = x.shape[0], self.free.size
        geometry = np.repeat(self.line.geometry[None, None, :], rows, axis=0)
        lengths = np.repeat(self.line.lengths_m[None, None, :], rows, axis=0)
        geometry[:, 0, self.free] = np.exp(x[:, :count])
        lengths[:, 0, self.free] = x[:, count : 2 * count] * self.quarter_wave_m
        return self.line.with_sections(geometry, lengths)

    def line_of(self, x: np.ndarray) -> LineCascade:
        """The single line of one point x."""
        stacked = self.lines(x[None, :])
        return self.line.with_sections(stacked.geometry[0, 0], stacked.lengths_m[0, 0])

    def squared(self, x: np.ndarray) -> np.ndarray:
        """|Gamma|^2 on the grid for each row of x."""
        return self.lines(x).reflection(self.grid) ** 2

    def margins(self, x: np.ndarray) -> np.ndarray:
        return x[-1] - self.squared(x[None, :])[0]

    def margins_jacobian(self, x: np.ndarray) -> np.ndarray:
        variables = x.size - 1
        probes = np.repeat(x[None, :], variables + 1, axis=0)
        probes[np.arange(1, variables + 1), np.arange(variables)] += STEP
        values = self.squared(probes)
        jacobian = np.ones((self.grid.size, x.size))
        jacobian[:, :variables] = -(values[1:] - values[0]).T / STEP
        return jacobian

    def worst_on_grid(self, x: np.ndarray) -> float:
        return float(np.sqrt(np.max(self.squared(x[None, :]))))

    def solve(self, start: np.ndarray, bounds: list[tuple[float, float]], iterations: int, deadline: float):
        """SLSQP from `start` (without t) for at most `iterations`, stopping at the deadline."""
        x0 = np.append(start, np.max(self.squared(start[None, :])))

        def out_of_time(*_: object) -> None:
            if time.monotonic() > deadline:
                raise StopIteration

        result = minimize(
            lambda x: x[-1],
            x0,
            jac=lambda x: np.eye(x.size)[-1],
            method="SLSQP",
            bounds=[*bounds, (0.0, 1.0)],
            constraints=[{"type": "ineq", "fun": self.margins, "jac": self.margins_jacobian}],
            options={"maxiter": iterations, "ftol": 1e-12},
            callback=out_of_time,
        )
        return np.clip(result.x[:-1], [b[0] for b in bounds], [b[1] for b in bounds]), int(result.nit)


def refine_minimax(
    line: LineCascade,
    start_hz: float,
    stop_hz: float,
    quarter_wave_m: float,
    geometry_bounds: tuple[float | np.ndarray, float | np.ndarray],
    free: np.ndarray | None = None,
) -> Refinement:
    """Adjust the free sections' geometry (hence impedance) and lengths for the smallest worst-case
    reflection, each geometry within geometry_bounds (one pair for all, or one per free section:
    equal bounds hold a geometry fixed, so that only lengths move).

    The result is never worse, on the dense check, than the start held within the bounds; the
    whole search takes at most MAX_SECONDS.
    """
    free = np.arange(line.geometry.size) if free is None else np.asarray(free)
    problem = _Problem(line, np.linspace(start_hz, stop_hz, GRID_POINTS), quarter_wave_m, free)
    log_low = np.broadcast_to(np.log(geometry_bounds[0]), free.shape)
    log_high = np.broadcast_to(np.log(geometry_bounds[1]), free.shape)
    bounds = [*zip(log_low.tolist(), log_high.tolist(), strict=True)] + [(0.0, MAX_LENGTH_FACTOR)] * free.size
    theory = np.concatenate(
        (np.clip(np.log(line.geometry[free]), log_low, log_high), line.lengths_m[free] / quarter_wave_m)
    )
    theory = np.clip(theory, [b[0] for b in bounds], [b[1] for b in bounds])
    rng = np.random.default_rng(SEED)
    randoms = [
        np.concatenate(
            (rng.uniform(log_low, log_high, free.size), rng.uniform(0.2, MAX_LENGTH_FACTOR - 0.2, free.size))
        )
        for _ in range(min(RANDOM_STARTS, RANDOM_STARTS_PER_SECTION * free.size))
    ]
    deadline = time.monotonic() + MAX_SECONDS
    iterations = 0
    probed = []
    for start in [theory, *randoms]:
        x, used = problem.solve(start, bounds, PROBE_ITERATIONS, deadline)
        probed.append((problem.worst_on_grid(x), x))
        iterations += used
    probed.sort(key=lambda pair: pair[0])
    candidates = [theory, *(x for _, x in probed[:FINALISTS])]
    for _, x in probed[:FINALISTS]:
        finished, used = problem.solve(x, bounds, MAX_ITERATIONS, deadline)
        candidates.append(finished)
        iterations += used
    refined = [problem.line_of(x) for x in candidates]
    scores = [worst_reflection(r, start_hz, stop_hz)[0] for r in refined]
    return Refinement(line, refined[int(np.argmin(scores))], iterations)
