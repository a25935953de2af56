"""The exact check of lines of sections: worst reflection, verified figures and response curves.

Works only through the lines' own cascade (line_cascade.py, network.py and the media's line
parameters), never the synthesis code, so it is an independent check of a design.
"""

from __future__ import annotations

import functools
import math

import numpy as np

from service.analysis.line_cascade import LineCascade, group_as_line, stackable_groups
from service.schemas.results import ResponseCurve, VerifiedFigures

MIN_CHECK_POINTS = 257
MAX_CHECK_POINTS = 20001
CHECK_POINTS_PER_LOBE = 48
REFINE_POINTS = 17  # per peak, spanning the neighbours of its best coarse sample
REFINE_OFFSETS = np.linspace(-1.0, 1.0, REFINE_POINTS)  # in steps of the coarse grid
FINE_STEP = 2.0 / (REFINE_POINTS - 1)  # the fine grid's step, in steps of the coarse grid
PEAKS_REFINED = 6
TIE_TOLERANCE = 1e-9  # peaks this close (relative) to the largest are a tie, named by the lowest frequency
RETURN_LOSS_CAP_DB = 300.0


def check_grid_points(line: LineCascade, stop_hz: float | np.ndarray) -> int:
    """Enough frequencies to sample every lobe of the response several times.

    The response of a line of total electrical length Theta at the top of the band can turn
    through at most about 2 Theta / pi lobes between DC and there.
    """
    return int(check_grid_counts(line, stop_hz).max())


def check_grid_counts(line: LineCascade, stop_hz: float | np.ndarray) -> np.ndarray:
    """check_grid_points of each design of a stacked line (of the one line otherwise)."""
    stops = np.asarray(stop_hz, dtype=float)
    frequency = stops.reshape(stops.shape + (1,) * (line.geometry.ndim - 1 - stops.ndim))
    total = line.electrical_lengths_rad(frequency).sum(axis=-1)
    lobes = np.ceil(2.0 * total / math.pi) + 1.0
    return np.minimum(np.maximum(CHECK_POINTS_PER_LOBE * lobes + 1.0, MIN_CHECK_POINTS), MAX_CHECK_POINTS).astype(int)


def return_loss_db(reflection: np.ndarray | float) -> np.ndarray:
    """-20 log10 |reflection|, capped where the reflection vanishes."""
    floor = 10.0 ** (-RETURN_LOSS_CAP_DB / 20.0)
    return -20.0 * np.log10(np.maximum(reflection, floor))


TOTAL_REFLECTION = 1.0 - 1e-12  # |reflection| at or above this counts as total: VSWR is unbounded


def vswr(reflection: float) -> float | None:
    """Voltage standing-wave ratio of a reflection magnitude; None where the reflection is total."""
    if reflection >= TOTAL_REFLECTION:
        return None
    return (1.0 + reflection) / (1.0 - reflection)


def _grids(starts: np.ndarray, stops: np.ndarray, count: int, squeeze: bool) -> np.ndarray:
    grid = starts[:, None] + (stops - starts)[:, None] * _unit_grid(count)
    grid[:, -1] = stops
    return grid[0] if squeeze else grid


@functools.lru_cache(maxsize=64)
def _unit_grid(count: int) -> np.ndarray:
    """count evenly spread fractions 0 .. 1 (read-only: shared by every check of that size)."""
    fractions = np.linspace(0.0, 1.0, count)
    fractions.flags.writeable = False
    return fractions


def worst_reflections(line: LineCascade, grid: np.ndarray, values: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Largest |reflection| over each row of the frequency grid (..., F), and where it occurs.

    `values` is |reflection| on the grid, which samples every lobe of the response; the highest few
    local maxima (band edges included) are each refined, since near-equal ripple peaks can swap
    order between the coarse samples and the true peaks: a finer grid between the neighbours of
    each, then one evaluation at the vertex of the parabola through the best fine sample and its
    two neighbours. Every figure returned is an evaluated value, never an interpolated one.
    """
    lead, count = grid.shape[:-1], grid.shape[-1]
    grid, values = grid.reshape(-1, count), values.reshape(-1, count)
    rows = np.arange(grid.shape[0])[:, None]
    padded = np.full((grid.shape[0], count + 2), -np.inf)  # so that the band edges count as local maxima
    padded[:, 1:-1] = values
    peaks = (values >= padded[:, :-2]) & (values >= padded[:, 2:])
    candidates = min(PEAKS_REFINED, count)
    top = np.where(peaks, -values, np.inf).argpartition(candidates - 1, axis=-1)[:, :candidates]
    step = (grid[:, -1:] - grid[:, :1]) * (1.0 / (count - 1))
    peak_axis = np.arange(candidates)[None, :]
    low, high = grid[:, :1, None], grid[:, -1:, None]
    fine = _within(grid[rows, top][..., None] + step[..., None] * REFINE_OFFSETS, low, high)
    fine_values = line.reflection(fine.reshape(*lead, -1)).reshape(fine.shape)
    best = fine_values.argmax(axis=-1)
    middle = _within(best, 1, REFINE_POINTS - 2)
    before, at, after = (fine_values[rows, peak_axis, middle + k] for k in (-1, 0, 1))
    curvature = before - 2.0 * at + after
    shift = _within((0.5 * (before - after)) / np.where(curvature < 0.0, curvature, -np.inf), -1.0, 1.0)
    vertex = _within(fine[rows, peak_axis, middle] + shift * (step * FINE_STEP), low[..., 0], high[..., 0])
    vertex_values = line.reflection(vertex.reshape(*lead, -1)).reshape(vertex.shape)
    sampled, sampled_at = fine_values[rows, peak_axis, best], fine[rows, peak_axis, best]
    better = vertex_values > sampled
    worst, centre = np.where(better, vertex_values, sampled), np.where(better, vertex, sampled_at)
    # Ties: peaks within TIE_TOLERANCE of the largest count as equal, and the lowest frequency
    # among them is named, so equal-ripple designs report the same frequency however they round.
    largest = worst.max(axis=-1, keepdims=True)
    tied = worst >= largest * (1.0 - TIE_TOLERANCE)
    index = np.where(tied, centre, np.inf).argmin(axis=-1)[:, None]
    return largest[:, 0].reshape(lead), centre[rows, index][:, 0].reshape(lead)


def _within(values: np.ndarray, low: np.ndarray | float, high: np.ndarray | float) -> np.ndarray:
    """values clipped to [low, high] (np.clip's argument checks cost more than the clipping here)."""
    return np.minimum(np.maximum(values, low), high)


def worst_reflection(line: LineCascade, start_hz: float, stop_hz: float) -> tuple[float, float]:
    """Largest |reflection| of one line over [start, stop] and where it occurs."""
    grid = np.linspace(start_hz, stop_hz, check_grid_points(line, stop_hz))
    worst, where = worst_reflections(line, grid, line.reflection(grid))
    return float(worst), float(where)


def aligned_count(minimum: np.ndarray, points: np.ndarray) -> np.ndarray:
    """The smallest grid sizes >= minimum whose evenly spread grids contain every point of a
    `points` grid (elementwise)."""
    steps = np.asarray(points) - 1
    return steps * -(-(np.asarray(minimum) - 1) // steps) + 1


def check_many(
    lines: list[LineCascade],
    starts: np.ndarray,
    stops: np.ndarray,
    specs: np.ndarray,
    points: np.ndarray,
    curves: bool = True,
) -> list[tuple[VerifiedFigures, ResponseCurve | None]]:
    """The verified block and the response curve of every line, stacked where the lines allow.

    One cascade evaluation serves both: the check grid is chosen to contain the curve's
    frequencies, so the curve is read off it. Without `curves` the curve is None (batch summaries
    leave it out); the check itself is the same.
    """
    results: list[tuple[VerifiedFigures, ResponseCurve | None] | None] = [None] * len(lines)
    for group in stackable_groups(lines):
        line = group_as_line(lines, group)
        for (curve_points, grid_size), indices in _by_grid(line, group, stops, points).items():
            part = line if len(indices) == len(group) else group_as_line(lines, indices)
            checked = _check_group(part, indices, starts, stops, specs, curve_points, grid_size, curves)
            for index, result in zip(indices, checked, strict=True):
                results[index] = result
    return results


def _by_grid(
    line: LineCascade, group: list[int], stops: np.ndarray, points: np.ndarray
) -> dict[tuple[int, int], list[int]]:
    """The group's lines (stacked as `line`) by (curve points, check grid size), the grid each would
    get checked alone: so a design's figures never depend on the designs it is stacked with."""
    minimum = check_grid_counts(line, stops[group[0]] if len(group) == 1 else stops[group]).reshape(-1)
    counts = points[group]
    sizes = aligned_count(minimum, counts)
    by_grid: dict[tuple[int, int], list[int]] = {}
    for index, count, size in zip(group, counts.tolist(), sizes.tolist(), strict=True):
        by_grid.setdefault((count, size), []).append(index)
    return by_grid


def _check_group(
    line: LineCascade,
    indices: list[int],
    starts: np.ndarray,
    stops: np.ndarray,
    specs: np.ndarray,
    points: int,
    count: int,
    curves: bool,
) -> list[tuple[VerifiedFigures, ResponseCurve | None]]:
    """The figures (and curves) of the lines at `indices`, stacked as `line`, on grids of `count` points."""
    grid = _grids(starts[indices], stops[indices], count, len(indices) == 1)
    values, losses = line.response(grid, with_losses=line.medium.lossy)
    worst, where = (np.atleast_1d(a) for a in worst_reflections(line, grid, values))
    losses = None if losses is None else np.atleast_2d(losses)
    curve_stride = (count - 1) // (points - 1)
    max_losses = [None] * len(indices) if losses is None else np.max(losses, axis=-1).tolist()
    worst_rows, where_rows, spec_rows = worst.tolist(), where.tolist(), specs[indices].tolist()
    return_loss_rows = return_loss_db(worst).tolist()
    figures = [
        VerifiedFigures(
            max_reflection=worst_value,
            max_vswr=vswr(worst_value),
            min_return_loss_db=return_loss_rows[position],
            worst_frequency_hz=where_rows[position],
            spec_max_reflection=spec,
            meets_spec=worst_value <= spec * (1.0 + 1e-9),
            includes_dispersion=line.medium.dispersive,
            includes_losses=line.medium.lossy,
            max_insertion_loss_db=max_losses[position],
        )
        for position, (worst_value, spec) in enumerate(zip(worst_rows, spec_rows, strict=True))
    ]
    if not curves:
        return [(block, None) for block in figures]
    curve_values = np.atleast_2d(values)[:, ::curve_stride]
    frequencies, magnitudes, return_losses = (
        rows.tolist() for rows in (np.atleast_2d(grid)[:, ::curve_stride], curve_values, return_loss_db(curve_values))
    )
    curve_losses = [None] * len(indices) if losses is None else losses[:, ::curve_stride].tolist()
    return [
        (
            block,
            ResponseCurve(
                frequency_hz=frequencies[position],
                reflection_magnitude=magnitudes[position],
                return_loss_db=return_losses[position],
                insertion_loss_db=curve_losses[position],
            ),
        )
        for position, block in enumerate(figures)
    ]


def check(
    line: LineCascade, start_hz: float, stop_hz: float, spec_reflection: float, points: int
) -> tuple[VerifiedFigures, ResponseCurve]:
    """The verified block of one line, judged against the spec, and its response curve."""
    return check_many(
        [line], np.array([start_hz]), np.array([stop_hz]), np.array([spec_reflection]), np.array([points])
    )[0]
