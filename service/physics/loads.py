"""Load impedances as functions of frequency: fixed, lumped circuits and tabulated data.

Plain numerics shared by the synthesis orchestration and the exact check; no HTTP, no pydantic.
"""

from __future__ import annotations

import functools
from dataclasses import dataclass
from typing import Literal, Protocol

import numpy as np

CircuitKind = Literal["series-rl", "series-rc", "parallel-rc", "parallel-rl"]


class LoadModel(Protocol):
    """Anything that gives the load impedance at each frequency."""

    frequency_dependent: bool

    def impedance_ohm(self, frequency_hz: np.ndarray) -> np.ndarray:
        """Complex load impedance at each frequency."""
        ...

    def frequency_range_hz(self) -> tuple[float, float] | None:
        """The frequencies the model is valid over; None for all frequencies."""
        ...


@dataclass(frozen=True)
class FixedLoad:
    """A load of the same impedance at every frequency."""

    resistance_ohm: float
    reactance_ohm: float = 0.0
    frequency_dependent: bool = False

    def impedance_ohm(self, frequency_hz: np.ndarray) -> np.ndarray:
        return self.complex_ohm * np.ones(np.shape(frequency_hz))

    @functools.cached_property
    def complex_ohm(self) -> np.ndarray:
        """R + jX, formed once: every evaluation of a line needs it (it broadcasts against any
        frequencies, so evaluations use it as it is)."""
        return np.asarray(self.resistance_ohm) + 1j * np.asarray(self.reactance_ohm)

    def frequency_range_hz(self) -> tuple[float, float] | None:
        return None


@dataclass(frozen=True)
class CircuitLoad:
    """A resistor with one inductor or capacitor, in series or in parallel."""

    kind: CircuitKind
    resistance_ohm: float
    element_value: float  # henry for an inductor, farad for a capacitor
    frequency_dependent: bool = True

    def impedance_ohm(self, frequency_hz: np.ndarray) -> np.ndarray:
        omega = 2.0 * np.pi * np.asarray(frequency_hz, dtype=float)
        if self.kind.endswith("rl"):
            element = 1j * omega * self.element_value
        else:
            element = 1.0 / (1j * omega * self.element_value)
        r = self.resistance_ohm
        if self.kind.startswith("series"):
            return r + element
        return r * element / (r + element)

    def frequency_range_hz(self) -> tuple[float, float] | None:
        return None


@dataclass(frozen=True)
class TabulatedLoad:
    """Measured impedances, interpolated linearly in resistance and reactance."""

    frequency_hz: np.ndarray
    impedances_ohm: np.ndarray
    frequency_dependent: bool = True

    def impedance_ohm(self, frequency_hz: np.ndarray) -> np.ndarray:
        f = np.asarray(frequency_hz, dtype=float)
        real = np.interp(f, self.frequency_hz, self.impedances_ohm.real)
        imag = np.interp(f, self.frequency_hz, self.impedances_ohm.imag)
        return real + 1j * imag

    def frequency_range_hz(self) -> tuple[float, float] | None:
        return float(self.frequency_hz[0]), float(self.frequency_hz[-1])


def impedance_at(load: LoadModel, frequency_hz: float) -> complex:
    """The load's impedance at one frequency (a fixed load's without any array work)."""
    if isinstance(load, FixedLoad):
        return complex(load.resistance_ohm, load.reactance_ohm)
    return complex(load.impedance_ohm(np.array([frequency_hz]))[0])
