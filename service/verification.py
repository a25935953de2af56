"""The exact check of a list of line sections: figures and curves from the ABCD cascade.

Uses only network.py (and the media's line parameters), never the synthesis code, so it is an
independent check of a design.
"""

from __future__ import annotations

import functools
import math
from dataclasses import dataclass

import numpy as np

from service import network
from service.loads import FixedLoad, LoadModel
from service.media import Medium
from service.schemas.results import JunctionResult, ResponseCurve, SectionResult, VerifiedFigures

MIN_CHECK_POINTS = 257
MAX_CHECK_POINTS = 20001
CHECK_POINTS_PER_LOBE = 48
REFINE_POINTS = 17  # per peak, spanning the neighbours of its best coarse sample
REFINE_OFFSETS = np.linspace(-1.0, 1.0, REFINE_POINTS)  # in steps of the coarse grid
PEAKS_REFINED = 6
RETURN_LOSS_CAP_DB = 300.0
STACK_DESIGNS = 32  # designs per stacked cascade evaluation
C0 = network.SPEED_OF_LIGHT_M_PER_S


@dataclass(frozen=True)
class LineCascade:
    """Sections in a medium between a real source and a load, source side first.

    `geometry` is each section's impedance-setting dimension in the medium (the impedance itself
    for the ideal line, the strip width, the inner diameter).
    """

    source_ohm: float
    load: LoadModel
    medium: Medium
    geometry: np.ndarray
    lengths_m: np.ndarray

    def abcd(self, frequency_hz: np.ndarray) -> network.Abcd:
        """The cascade's ABCD entries at each frequency, with the medium's dispersion and losses."""
        if not self.medium.lossy:
            return self._lossless_abcd(frequency_hz).complex()
        f = np.asarray(frequency_hz, dtype=float)[..., None]
        params = self.medium.parameters(self.geometry, f)
        losses = params.attenuation_np_per_m * self.lengths_m
        return network.cascade(params.impedance_ohm, f * self._phase_per_hz(params.eps_eff), losses)

    def _lossless_abcd(self, frequency_hz: np.ndarray) -> network.LosslessAbcd:
        f = np.asarray(frequency_hz, dtype=float)[..., None]
        if self.medium.dispersive:
            params = self.medium.parameters(self.geometry, f)
            return network.lossless_cascade(params.impedance_ohm, f * self._phase_per_hz(params.eps_eff))
        impedance, phase_per_hz = self._fixed_sections
        return network.lossless_cascade(impedance, f * phase_per_hz)

    def electrical_lengths_rad(self, frequency_hz: np.ndarray) -> np.ndarray:
        """beta l of every section at each frequency: (..., F, S) for frequencies (..., F)."""
        f = np.asarray(frequency_hz, dtype=float)[..., None]
        if self.medium.dispersive:
            return f * self._phase_per_hz(self.medium.parameters(self.geometry, f).eps_eff)
        return f * self._fixed_sections[1]

    @functools.cached_property
    def _fixed_sections(self) -> tuple[np.ndarray, np.ndarray]:
        """Impedance and phase per hertz of sections that do not disperse: the same at every
        frequency, so taken once (at 1 Hz) rather than at every evaluation."""
        params = self.medium.parameters(self.geometry, np.ones((1, 1)))
        return params.impedance_ohm, self._phase_per_hz(params.eps_eff)

    def _phase_per_hz(self, eps_eff: np.ndarray) -> np.ndarray:
        """beta l / f of each section: 2 pi sqrt(eps_eff) l / c."""
        return 2.0 * np.pi * np.sqrt(eps_eff) * self.lengths_m / C0

    def reflection(self, frequency_hz: np.ndarray) -> np.ndarray:
        """|reflection| seen from the source line at each frequency."""
        return self.response(frequency_hz, with_losses=False)[0]

    def response(self, frequency_hz: np.ndarray, with_losses: bool) -> tuple[np.ndarray, np.ndarray | None]:
        """|reflection| at each frequency and, if asked, the insertion loss in dB, from one cascade.

        The insertion loss is -10 log10 of the power reaching the load over the power available
        from the source.
        """
        load = self.load.impedance_ohm(frequency_hz)
        if not self.medium.lossy:
            return network.lossless_reflection(self._lossless_abcd(frequency_hz), load, self.source_ohm), None
        abcd = self.abcd(frequency_hz)
        magnitude = np.abs(network.reflection(network.input_impedance(abcd, load), self.source_ohm))
        if not with_losses:
            return magnitude, None
        gain = network.transducer_gain(abcd, self.source_ohm, load)
        return magnitude, -10.0 * np.log10(np.maximum(gain, 1e-30))

    def eps_eff_at(self, frequency_hz: float) -> np.ndarray:
        """Each section's effective permittivity at one frequency."""
        return self.medium.parameters(self.geometry, np.array([[frequency_hz]])).eps_eff[0]

    def with_sections(self, geometry: np.ndarray, lengths_m: np.ndarray) -> LineCascade:
        """The same source, load and medium with other sections."""
        return LineCascade(self.source_ohm, self.load, self.medium, geometry, lengths_m)


def check_grid_points(line: LineCascade, stop_hz: float | np.ndarray) -> int:
    """Enough frequencies to sample every lobe of the response several times.

    The response of a line of total electrical length Theta at the top of the band can turn
    through at most about 2 Theta / pi lobes between DC and there. For a stacked line (one stop
    frequency per design) the count is the one the longest design needs.
    """
    stops = np.asarray(stop_hz, dtype=float)
    frequency = stops.reshape(stops.shape + (1,) * (line.geometry.ndim - 1 - stops.ndim))
    total = float(np.max(np.sum(line.electrical_lengths_rad(frequency), axis=-1)))
    lobes = math.ceil(2.0 * total / math.pi) + 1
    return int(np.clip(CHECK_POINTS_PER_LOBE * lobes + 1, MIN_CHECK_POINTS, MAX_CHECK_POINTS))


def return_loss_db(reflection: np.ndarray | float) -> np.ndarray:
    """-20 log10 |reflection|, capped where the reflection vanishes."""
    floor = 10.0 ** (-RETURN_LOSS_CAP_DB / 20.0)
    return -20.0 * np.log10(np.maximum(reflection, floor))


def vswr(reflection: float) -> float:
    """Voltage standing-wave ratio of a reflection magnitude below one."""
    return (1.0 + reflection) / (1.0 - reflection)


def stack(lines: list[LineCascade]) -> LineCascade:
    """Lines of equal section count in one medium into fixed loads, as one line with a leading design axis.

    The stacked line's source is (D, 1), its load a FixedLoad of (D, 1) arrays, its geometry and
    lengths (D, 1, S): evaluated at frequencies (D, F) it gives every design's response at once.
    """
    return LineCascade(
        np.array([[line.source_ohm] for line in lines]),
        FixedLoad(
            np.array([[line.load.resistance_ohm] for line in lines]),
            np.array([[line.load.reactance_ohm] for line in lines]),
        ),
        lines[0].medium,
        np.stack([line.geometry for line in lines])[:, None, :],
        np.stack([line.lengths_m for line in lines])[:, None, :],
    )


def stack_key(line: LineCascade) -> tuple | None:
    """Lines with equal keys can be stacked; None for lines that must be evaluated alone."""
    if not isinstance(line.load, FixedLoad):
        return None
    return line.geometry.size, line.medium


def stacked_groups(lines: list[LineCascade]) -> list[list[int]]:
    """Indices of the lines, grouped so that each group can be stacked (or is a single line).

    Groups hold at most STACK_DESIGNS lines: a stack of a few hundred designs makes arrays too
    big for the processor's cache, and the cascade then runs at memory speed (measured: 500
    designs x 301 frequencies x 3 sections in one stack took 2.4 times as long as in chunks of 32).
    """
    groups: dict[tuple, list[int]] = {}
    singles = []
    for index, line in enumerate(lines):
        key = stack_key(line)
        if key is None:
            singles.append([index])
        else:
            groups.setdefault(key, []).append(index)
    chunks = [group[i : i + STACK_DESIGNS] for group in groups.values() for i in range(0, len(group), STACK_DESIGNS)]
    return chunks + singles


def _evaluate(lines: list[LineCascade], indices: list[int]) -> LineCascade:
    return lines[indices[0]] if len(indices) == 1 else stack([lines[i] for i in indices])


def _grids(starts: np.ndarray, stops: np.ndarray, count: int, squeeze: bool) -> np.ndarray:
    grid = starts[:, None] + (stops - starts)[:, None] * np.linspace(0.0, 1.0, count)
    grid[:, -1] = stops
    return grid[0] if squeeze else grid


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
    peaks = np.ones(values.shape, dtype=bool)
    peaks[:, 1:-1] = (values[:, 1:-1] >= values[:, :-2]) & (values[:, 1:-1] >= values[:, 2:])
    peaks[:, 0] = values[:, 0] >= values[:, 1]
    peaks[:, -1] = values[:, -1] >= values[:, -2]
    candidates = min(PEAKS_REFINED, count)
    top = np.argpartition(-np.where(peaks, values, -np.inf), candidates - 1, axis=-1)[:, :candidates]
    step = (grid[:, -1:] - grid[:, :1]) / (count - 1)
    peak_axis = np.arange(candidates)[None, :]
    low, high = grid[:, :1, None], grid[:, -1:, None]
    fine = np.clip(grid[rows, top][..., None] + step[..., None] * REFINE_OFFSETS, low, high)
    fine_values = line.reflection(fine.reshape(*lead, -1)).reshape(fine.shape)
    best = np.argmax(fine_values, axis=-1)
    middle = np.clip(best, 1, REFINE_POINTS - 2)
    before, at, after = (fine_values[rows, peak_axis, middle + k] for k in (-1, 0, 1))
    curvature = before - 2.0 * at + after
    shift = np.clip(0.5 * (before - after) / np.where(curvature < 0.0, curvature, -np.inf), -1.0, 1.0)
    fine_step = step * 2.0 / (REFINE_POINTS - 1)
    vertex = np.clip(fine[rows, peak_axis, middle] + shift * fine_step, low[..., 0], high[..., 0])
    vertex_values = line.reflection(vertex.reshape(*lead, -1)).reshape(vertex.shape)
    sampled, sampled_at = fine_values[rows, peak_axis, best], fine[rows, peak_axis, best]
    better = vertex_values > sampled
    worst, centre = np.where(better, vertex_values, sampled), np.where(better, vertex, sampled_at)
    index = np.argmax(worst, axis=-1)[:, None]
    return worst[rows, index][:, 0].reshape(lead), centre[rows, index][:, 0].reshape(lead)


def worst_reflection(line: LineCascade, start_hz: float, stop_hz: float) -> tuple[float, float]:
    """Largest |reflection| of one line over [start, stop] and where it occurs."""
    grid = np.linspace(start_hz, stop_hz, check_grid_points(line, stop_hz))
    worst, where = worst_reflections(line, grid, line.reflection(grid))
    return float(worst), float(where)


def aligned_count(minimum: int, points: int) -> int:
    """The smallest grid size >= minimum whose evenly spread grid contains every point of a `points` grid."""
    steps = points - 1
    return steps * math.ceil((minimum - 1) / steps) + 1


def check_many(
    lines: list[LineCascade], starts: np.ndarray, stops: np.ndarray, specs: np.ndarray, points: np.ndarray
) -> list[tuple[VerifiedFigures, ResponseCurve]]:
    """The verified block and the response curve of every line, stacked where the lines allow.

    One cascade evaluation serves both: the check grid is chosen to contain the curve's
    frequencies, so the curve is read off it.
    """
    results: list[tuple[VerifiedFigures, ResponseCurve] | None] = [None] * len(lines)
    for group in stacked_groups(lines):
        by_points: dict[int, list[int]] = {}
        for index in group:
            by_points.setdefault(int(points[index]), []).append(index)
        for count, indices in by_points.items():
            for index, result in zip(indices, _check_group(lines, indices, starts, stops, specs, count), strict=True):
                results[index] = result
    return results


def _check_group(
    lines: list[LineCascade], indices: list[int], starts: np.ndarray, stops: np.ndarray, specs: np.ndarray, points: int
) -> list[tuple[VerifiedFigures, ResponseCurve]]:
    line = _evaluate(lines, indices)
    single = len(indices) == 1
    count = aligned_count(check_grid_points(line, stops[indices[0]] if single else stops[indices]), points)
    grid = _grids(starts[indices], stops[indices], count, single)
    values, losses = line.response(grid, with_losses=line.medium.lossy)
    worst, where = (np.atleast_1d(a) for a in worst_reflections(line, grid, values))
    losses = None if losses is None else np.atleast_2d(losses)
    every = (count - 1) // (points - 1)
    curve_values = np.atleast_2d(values)[:, ::every]
    frequencies, magnitudes, return_losses = (
        rows.tolist() for rows in (np.atleast_2d(grid)[:, ::every], curve_values, return_loss_db(curve_values))
    )
    curve_losses = [None] * len(indices) if losses is None else losses[:, ::every].tolist()
    max_losses = [None] * len(indices) if losses is None else np.max(losses, axis=-1).tolist()
    worst_rows, where_rows, spec_rows = worst.tolist(), where.tolist(), specs[indices].tolist()
    return_loss_rows = return_loss_db(worst).tolist()
    results = []
    for position in range(len(indices)):
        worst_value, spec = worst_rows[position], spec_rows[position]
        figures = VerifiedFigures(
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
        curve = ResponseCurve(
            frequency_hz=frequencies[position],
            reflection_magnitude=magnitudes[position],
            return_loss_db=return_losses[position],
            insertion_loss_db=curve_losses[position],
        )
        results.append((figures, curve))
    return results


def check(
    line: LineCascade, start_hz: float, stop_hz: float, spec_reflection: float, points: int
) -> tuple[VerifiedFigures, ResponseCurve]:
    """The verified block of one line, judged against the spec, and its response curve."""
    return check_many(
        [line], np.array([start_hz]), np.array([stop_hz]), np.array([spec_reflection]), np.array([points])
    )[0]


@dataclass(frozen=True)
class SectionTable:
    """One line's sections and junctions at one frequency, source side first."""

    sections: list[SectionResult]
    junctions: list[JunctionResult]


def section_tables(lines: list[LineCascade], frequencies_hz: np.ndarray) -> list[SectionTable]:
    """Every line's section table at its frequency (the band centre), a stack of lines at a time.

    A section lists its impedance, electrical length, permittivity and geometry there; a junction
    its reflection and transmission. The step into the load is listed only for a load that is
    resistive and the same at every frequency; for other loads its reflection is complex or
    changes with frequency.
    """
    tables: list[SectionTable | None] = [None] * len(lines)
    for indices in stacked_groups(lines):
        members = [lines[i] for i in indices]
        medium = members[0].medium
        geometry, lengths = np.array([m.geometry for m in members]), np.array([m.lengths_m for m in members])
        frequency = np.asarray(frequencies_hz, dtype=float)[indices][:, None]
        params = medium.parameters(geometry, frequency)
        degrees = 360.0 * frequency * np.sqrt(params.eps_eff) * lengths / C0
        loads = [_resistive_load_ohm(m.load) for m in members]
        ends = np.array([[m.source_ohm, np.nan if r is None else r] for m, r in zip(members, loads, strict=True)])
        chain = np.concatenate((ends[:, :1], params.impedance_ohm, ends[:, 1:]), axis=1)
        reflections = network.junction_reflections(chain).tolist()
        names = ["impedance_ohm", "electrical_length_deg", "length_m", "eps_eff"]
        columns = [params.impedance_ohm, degrees, lengths, params.eps_eff]
        if medium.geometry_name:
            names.append(medium.geometry_name)
            columns.append(geometry)
        rows = zip(*(column.tolist() for column in columns), strict=True)  # each (designs, sections)
        for index, row, steps, load in zip(indices, rows, reflections, loads, strict=True):  # load > 0 or None
            sections = [SectionResult(**dict(zip(names, values, strict=True))) for values in zip(*row, strict=True)]
            junctions = [JunctionResult(reflection=r, transmission=1.0 + r) for r in (steps if load else steps[:-1])]
            tables[index] = SectionTable(sections, junctions)
    return tables


def _resistive_load_ohm(load: LoadModel) -> float | None:
    """The load's resistance if it is resistive and the same at every frequency, else None."""
    if load.frequency_dependent:
        return None
    impedance = complex(load.impedance_ohm(np.zeros(1))[0])
    return impedance.real if impedance.imag == 0.0 else None
