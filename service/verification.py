"""The exact check of a list of line sections: figures and curves from the ABCD cascade.

Uses only network.py, never the synthesis code, so it is an independent check of a design.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from service import network
from service.loads import LoadModel
from service.schemas.results import JunctionResult, ResponseCurve, VerifiedFigures

MIN_CHECK_POINTS = 2001
MAX_CHECK_POINTS = 20001
CHECK_POINTS_PER_LOBE = 32
REFINE_POINTS = 129
RETURN_LOSS_CAP_DB = 300.0


@dataclass(frozen=True)
class LineCascade:
    """Sections between a real source and a load, source side first."""

    source_ohm: float
    load: LoadModel
    impedances_ohm: np.ndarray
    lengths_m: np.ndarray
    velocity_factor: float

    def reflection(self, frequency_hz: np.ndarray) -> np.ndarray:
        """|reflection| seen from the source line at each frequency."""
        lengths = network.electrical_length_rad(self.lengths_m, frequency_hz, self.velocity_factor)
        abcd = network.cascade(self.impedances_ohm, lengths)
        z_in = network.input_impedance(abcd, self.load.impedance_ohm(frequency_hz))
        return np.abs(network.reflection(z_in, self.source_ohm))

    def with_sections(self, impedances_ohm: np.ndarray, lengths_m: np.ndarray) -> LineCascade:
        """The same source and load with other sections."""
        return LineCascade(self.source_ohm, self.load, impedances_ohm, lengths_m, self.velocity_factor)


def check_grid_points(line: LineCascade, stop_hz: float) -> int:
    """Enough frequencies to sample every lobe of the response several times.

    The response of a line of total electrical length Theta at the top of the band can turn
    through at most about 2 Theta / pi lobes between DC and there.
    """
    electrical = network.electrical_length_rad(line.lengths_m, np.array([stop_hz]), line.velocity_factor)
    lobes = math.ceil(2.0 * float(np.sum(electrical)) / math.pi) + 1
    return int(np.clip(CHECK_POINTS_PER_LOBE * lobes + 1, MIN_CHECK_POINTS, MAX_CHECK_POINTS))


def return_loss_db(reflection: np.ndarray | float) -> np.ndarray:
    """-20 log10 |reflection|, capped where the reflection vanishes."""
    floor = 10.0 ** (-RETURN_LOSS_CAP_DB / 20.0)
    return -20.0 * np.log10(np.maximum(reflection, floor))


def vswr(reflection: float) -> float:
    """Voltage standing-wave ratio of a reflection magnitude below one."""
    return (1.0 + reflection) / (1.0 - reflection)


def worst_reflection(line: LineCascade, start_hz: float, stop_hz: float) -> tuple[float, float]:
    """Largest |reflection| over [start, stop] and where it occurs.

    A dense grid finds the worst peak (many points per lobe of the response), and a finer grid
    between its neighbours pins it down.
    """
    count = check_grid_points(line, stop_hz)
    grid = np.linspace(start_hz, stop_hz, count)
    values = line.reflection(grid)
    index = int(np.argmax(values))
    fine = np.linspace(grid[max(index - 1, 0)], grid[min(index + 1, count - 1)], REFINE_POINTS)
    fine_values = line.reflection(fine)
    fine_index = int(np.argmax(fine_values))
    if fine_values[fine_index] > values[index]:
        return float(fine_values[fine_index]), float(fine[fine_index])
    return float(values[index]), float(grid[index])


def verified_figures(
    line: LineCascade, start_hz: float, stop_hz: float, spec_reflection: float
) -> VerifiedFigures:
    """The verified block: worst reflection and its derived figures, judged against the spec."""
    worst, where = worst_reflection(line, start_hz, stop_hz)
    return VerifiedFigures(
        max_reflection=worst,
        max_vswr=vswr(worst),
        min_return_loss_db=float(return_loss_db(worst)),
        worst_frequency_hz=where,
        spec_max_reflection=spec_reflection,
        meets_spec=worst <= spec_reflection * (1.0 + 1e-9),
    )


def response_curve(line: LineCascade, start_hz: float, stop_hz: float, points: int) -> ResponseCurve:
    """The exact response at evenly spread frequencies, both band limits included."""
    frequencies = np.linspace(start_hz, stop_hz, points)
    magnitudes = line.reflection(frequencies)
    return ResponseCurve(
        frequency_hz=frequencies.tolist(),
        reflection_magnitude=magnitudes.tolist(),
        return_loss_db=return_loss_db(magnitudes).tolist(),
    )


def junction_results(line: LineCascade) -> list[JunctionResult]:
    """Reflection and transmission at every step, source to load.

    The step into the load is listed only for a fixed resistive load; for other loads its
    reflection is complex or changes with frequency.
    """
    chain = np.concatenate(([line.source_ohm], line.impedances_ohm))
    if not line.load.frequency_dependent:
        load = complex(line.load.impedance_ohm(np.zeros(1))[0])
        if load.imag == 0.0:
            chain = np.append(chain, load.real)
    return [
        JunctionResult(reflection=float(r), transmission=float(1.0 + r))
        for r in network.junction_reflections(chain)
    ]


def electrical_length_deg(length_m: np.ndarray, frequency_hz: float, velocity_factor: float) -> np.ndarray:
    """Electrical length in degrees of physical lengths at one frequency."""
    wavelength = velocity_factor * network.SPEED_OF_LIGHT_M_PER_S / frequency_hz
    return 360.0 * np.asarray(length_m) / wavelength


def length_for_angle_m(angle_rad: np.ndarray, frequency_hz: float, velocity_factor: float) -> np.ndarray:
    """Physical length that has the given electrical length at one frequency."""
    wavelength = velocity_factor * network.SPEED_OF_LIGHT_M_PER_S / frequency_hz
    return np.asarray(angle_rad) / (2.0 * math.pi) * wavelength
