"""The exact check of a list of line sections: figures and curves from the ABCD cascade.

Uses only network.py (and the media's line parameters), never the synthesis code, so it is an
independent check of a design.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from service import network
from service.loads import LoadModel
from service.media import Medium
from service.schemas.results import JunctionResult, ResponseCurve, VerifiedFigures

MIN_CHECK_POINTS = 2001
MAX_CHECK_POINTS = 20001
CHECK_POINTS_PER_LOBE = 32
REFINE_POINTS = 129
RETURN_LOSS_CAP_DB = 300.0
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
        f = np.asarray(frequency_hz, dtype=float)
        params = self.medium.parameters(self.geometry, f[..., None])
        angles = 2.0 * np.pi * f[..., None] * np.sqrt(params.eps_eff) * self.lengths_m / C0
        losses = None if params.attenuation_np_per_m is None else params.attenuation_np_per_m * self.lengths_m
        return network.cascade(params.impedance_ohm, angles, losses)

    def reflection(self, frequency_hz: np.ndarray) -> np.ndarray:
        """|reflection| seen from the source line at each frequency."""
        z_in = network.input_impedance(self.abcd(frequency_hz), self.load.impedance_ohm(frequency_hz))
        return np.abs(network.reflection(z_in, self.source_ohm))

    def insertion_loss_db(self, frequency_hz: np.ndarray) -> np.ndarray:
        """-10 log10 of the power reaching the load over the power available from the source."""
        gain = network.transducer_gain(self.abcd(frequency_hz), self.source_ohm, self.load.impedance_ohm(frequency_hz))
        return -10.0 * np.log10(np.maximum(gain, 1e-30))

    def impedances_at(self, frequency_hz: float) -> np.ndarray:
        """Each section's characteristic impedance at one frequency."""
        return self.medium.parameters(self.geometry, np.array([[frequency_hz]])).impedance_ohm[0]

    def eps_eff_at(self, frequency_hz: float) -> np.ndarray:
        """Each section's effective permittivity at one frequency."""
        return self.medium.parameters(self.geometry, np.array([[frequency_hz]])).eps_eff[0]

    def with_sections(self, geometry: np.ndarray, lengths_m: np.ndarray) -> LineCascade:
        """The same source, load and medium with other sections."""
        return LineCascade(self.source_ohm, self.load, self.medium, geometry, lengths_m)


def check_grid_points(line: LineCascade, stop_hz: float) -> int:
    """Enough frequencies to sample every lobe of the response several times.

    The response of a line of total electrical length Theta at the top of the band can turn
    through at most about 2 Theta / pi lobes between DC and there.
    """
    total = float(np.sum(electrical_length_rad(line, stop_hz)))
    lobes = math.ceil(2.0 * total / math.pi) + 1
    return int(np.clip(CHECK_POINTS_PER_LOBE * lobes + 1, MIN_CHECK_POINTS, MAX_CHECK_POINTS))


def electrical_length_rad(line: LineCascade, frequency_hz: float) -> np.ndarray:
    """beta l of each section at one frequency."""
    return 2.0 * np.pi * frequency_hz * np.sqrt(line.eps_eff_at(frequency_hz)) * line.lengths_m / C0


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


def verified_figures(line: LineCascade, start_hz: float, stop_hz: float, spec_reflection: float) -> VerifiedFigures:
    """The verified block: worst reflection and its derived figures, judged against the spec."""
    worst, where = worst_reflection(line, start_hz, stop_hz)
    lossy = line.medium.lossy
    max_loss = None
    if lossy:
        max_loss = float(np.max(line.insertion_loss_db(np.linspace(start_hz, stop_hz, MIN_CHECK_POINTS))))
    return VerifiedFigures(
        max_reflection=worst,
        max_vswr=vswr(worst),
        min_return_loss_db=float(return_loss_db(worst)),
        worst_frequency_hz=where,
        spec_max_reflection=spec_reflection,
        meets_spec=worst <= spec_reflection * (1.0 + 1e-9),
        includes_dispersion=line.medium.dispersive,
        includes_losses=lossy,
        max_insertion_loss_db=max_loss,
    )


def response_curve(line: LineCascade, start_hz: float, stop_hz: float, points: int) -> ResponseCurve:
    """The exact response at evenly spread frequencies, both band limits included."""
    frequencies = np.linspace(start_hz, stop_hz, points)
    magnitudes = line.reflection(frequencies)
    loss = line.insertion_loss_db(frequencies).tolist() if line.medium.lossy else None
    return ResponseCurve(
        frequency_hz=frequencies.tolist(),
        reflection_magnitude=magnitudes.tolist(),
        return_loss_db=return_loss_db(magnitudes).tolist(),
        insertion_loss_db=loss,
    )


def junction_results(line: LineCascade, frequency_hz: float) -> list[JunctionResult]:
    """Reflection and transmission at every step, source to load, at one frequency.

    The step into the load is listed only for a fixed resistive load; for other loads its
    reflection is complex or changes with frequency.
    """
    chain = np.concatenate(([line.source_ohm], line.impedances_at(frequency_hz)))
    if not line.load.frequency_dependent:
        load = complex(line.load.impedance_ohm(np.zeros(1))[0])
        if load.imag == 0.0:
            chain = np.append(chain, load.real)
    return [
        JunctionResult(reflection=float(r), transmission=float(1.0 + r)) for r in network.junction_reflections(chain)
    ]
