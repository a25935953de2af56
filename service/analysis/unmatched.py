"""The load connected straight to the source line: the figure any match must beat."""

from __future__ import annotations

import numpy as np

from service.physics.loads import FixedLoad, LoadModel, TabulatedLoad

UNMATCHED_POINTS = 2001


def unmatched_max_reflection(load: LoadModel, source_ohm: float, start_hz: float, stop_hz: float) -> float:
    """The largest |reflection| of the bare load against the source over the band: on a dense grid,
    plus every tabulated frequency in the band, where a measured load's corners lie."""
    if isinstance(load, FixedLoad):
        frequencies = np.array([start_hz])
    else:
        frequencies = np.linspace(start_hz, stop_hz, UNMATCHED_POINTS)
        if isinstance(load, TabulatedLoad):
            inside = load.frequency_hz[(load.frequency_hz >= start_hz) & (load.frequency_hz <= stop_hz)]
            frequencies = np.concatenate((frequencies, inside))
    impedance = np.asarray(load.impedance_ohm(frequencies))
    return float(np.max(np.abs((impedance - source_ohm) / (impedance + source_ohm))))
