"""The wave walked along a line with its junction steps: it must arrive at the load as the cascade says.

References: the load's own Ohm's law (V = Z_L I at the load end) and power conservation on a
lossless line (the power into the load equals P (1 - |reflection|^2), P the incident power; any
transmission-line text), both of which fail if the walk skips or misplaces a junction's circuit.
"""

import numpy as np
import pytest

from service.analysis.line_cascade import LineCascade
from service.analysis.standing_waves import standing_waves
from service.physics.loads import FixedLoad
from service.physics.media.coax import CoaxLine
from service.physics.media.microstrip import MicrostripLine

CASES = [
    (CoaxLine(eps_r=1.0, outer_diameter_m=7e-3), np.array([2.4e-3, 3.6e-3, 4.9e-3]), 3.04e-3),
    (MicrostripLine(eps_r=3.66, height_m=0.254e-3, thickness_m=35e-6), np.array([0.8e-3, 1.4e-3]), 0.55e-3),
]


@pytest.mark.parametrize("medium, geometry, feed", CASES, ids=["coax", "microstrip"])
@pytest.mark.parametrize("load_ohm", [12.0, 20.0, 35.0])
def test_the_walk_through_the_steps_reaches_the_load_as_the_cascade_says(medium, geometry, feed, load_ohm):
    f = np.linspace(8e9, 18e9, 21)
    lengths = np.full(geometry.size, 4.1e-3)
    line = LineCascade(50.0, FixedLoad(load_ohm, 0.0), medium, geometry, lengths, feed_geometry=feed)
    waves = standing_waves(line, f, 10.0)
    assert np.allclose(waves.load_voltage_v, load_ohm * waves.load_current_a, rtol=1e-9, atol=0)
    delivered = 0.5 * np.real(waves.load_voltage_v * np.conj(waves.load_current_a))
    expected = 10.0 * (1.0 - np.abs(line.input_reflection(f)) ** 2)
    assert delivered == pytest.approx(expected, rel=1e-9)
    # the steps matter at these frequencies: the walk that ignores them lands elsewhere
    ideal = standing_waves(LineCascade(50.0, FixedLoad(load_ohm, 0.0), medium, geometry, lengths), f, 10.0)
    assert np.max(np.abs(ideal.load_voltage_v - waves.load_voltage_v)) > 1e-3 * np.max(np.abs(waves.load_voltage_v))
