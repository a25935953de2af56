"""Minimax refinement of a line's sections against a load that changes with frequency.

The synthesized design matches the load at the centre frequency only. Here the section
geometries (impedances on the ideal line, strip widths, inner diameters) and lengths are
adjusted (SciPy SLSQP on the epigraph form: minimize t subject to |Gamma(f_k)|^2 <= t on a grid
over the band) so that the worst in-band reflection is as small as the optimizer can make it.
The exact cascade is both the objective and the final judge.
"""

from __future__ import annotations

import time
from dataclasses import dataclass

import numpy as np
from scipy.optimize import minimize

from service.analysis.line_cascade import LineCascade
from service.analysis.worst_case import worst_reflection

GRID_POINTS = 81
MAX_ITERATIONS = 150
MAX_SECONDS = 1.5  # the optimizer stops here with the best point so far, so no request runs long
GEOMETRY_FREEDOM = 4.0  # each section's geometry (impedance, width, diameter) may move within this factor
MAX_LENGTH_FACTOR = 2.0  # each length may shrink to zero or grow to this many times a quarter wave


@dataclass(frozen=True)
class Refinement:
    """The line before and after refinement, and how long the optimizer worked."""

    before: LineCascade
    after: LineCascade
    iterations: int


def refine_minimax(line: LineCascade, start_hz: float, stop_hz: float, quarter_wave_m: float) -> Refinement:
    """Adjust section geometry (hence impedance) and lengths for the smallest worst-case reflection.

    The result is never worse than the start: if the optimizer does not improve the worst
    reflection on the dense check grid, the original line is kept. The optimizer gets at most
    MAX_ITERATIONS iterations and MAX_SECONDS of time, whichever ends first.
    """
    grid = np.linspace(start_hz, stop_hz, GRID_POINTS)
    count = line.geometry.size
    log_start = np.log(line.geometry)

    def unpack(x: np.ndarray) -> LineCascade:
        return line.with_sections(np.exp(x[:count]), x[count : 2 * count] * quarter_wave_m)

    def margins(x: np.ndarray) -> np.ndarray:
        return x[-1] - unpack(x).reflection(grid) ** 2

    start = np.concatenate((log_start, line.lengths_m / quarter_wave_m, [0.0]))
    start[-1] = float(np.max(line.reflection(grid) ** 2))
    log_freedom = np.log(GEOMETRY_FREEDOM)
    bounds = [(z - log_freedom, z + log_freedom) for z in log_start]
    bounds += [(0.0, MAX_LENGTH_FACTOR)] * count + [(0.0, 1.0)]
    deadline = time.monotonic() + MAX_SECONDS

    def out_of_time(*_: object) -> None:
        if time.monotonic() > deadline:
            raise StopIteration

    result = minimize(
        lambda x: x[-1],
        start,
        jac=lambda x: np.eye(x.size)[-1],
        method="SLSQP",
        bounds=bounds,
        constraints=[{"type": "ineq", "fun": margins}],
        options={"maxiter": MAX_ITERATIONS, "ftol": 1e-12},
        callback=out_of_time,
    )
    refined = unpack(result.x)
    if worst_reflection(refined, start_hz, stop_hz)[0] >= worst_reflection(line, start_hz, stop_hz)[0]:
        refined = line
    return Refinement(line, refined, int(result.nit))
