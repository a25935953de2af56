"""Peak RF voltage and current along each section of a line, on the exact cascade.

A source matched to the source impedance Z0 sends an incident wave of peak voltage
V+ = sqrt(2 P Z0) for an incident power P. At the line's input the voltage and current are
V = V+ (1 + G) and I = V+ (1 - G) / Z0 with G the input reflection; each section then carries
V(z) = V cosh(gamma z) - I Z sinh(gamma z) and I(z) = I cosh(gamma z) - (V / Z) sinh(gamma z)
from its source end, and hands the values at its far end to the next. Where the line's junction
steps count, each junction's circuit acts before its section: a series inductance drops
j w L I, the shunt capacitance draws j w C V (a coax step of 50 fF at 18 GHz beside 50 ohm draws
over a quarter of the line current, so the steps are not negligible here).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.analysis.line_cascade import LineCascade
from service.constants import SPEED_OF_LIGHT_M_PER_S

SAMPLES_PER_SECTION = 65  # points along each section at which |V| and |I| are taken, ends included


@dataclass(frozen=True)
class StandingWaves:
    """Each section's peak |V| (volts) and |I| (amperes) over the band, and the wave handed to the
    load at each frequency (complex V and I at the load end of the last section)."""

    peak_voltage_v: np.ndarray
    peak_current_a: np.ndarray
    load_voltage_v: np.ndarray
    load_current_a: np.ndarray


def standing_waves(line: LineCascade, frequency_hz: np.ndarray, incident_power_w: float) -> StandingWaves:
    """Walk the wave from the source through every junction and section, at these frequencies."""
    f = np.asarray(frequency_hz, dtype=float)
    incident = np.sqrt(2.0 * incident_power_w * line.source_ohm)
    reflection = line.input_reflection(f)
    voltage = incident * (1.0 + reflection)
    current = incident * (1.0 - reflection) / line.source_ohm
    params = line.medium.parameters(line.geometry, f[:, None])
    impedance = params.impedance_ohm * np.ones((f.size, line.geometry.size))
    beta = 2.0 * np.pi * f[:, None] * np.sqrt(params.eps_eff) / SPEED_OF_LIGHT_M_PER_S
    alpha = 0.0 if params.attenuation_np_per_m is None else params.attenuation_np_per_m
    gamma = (alpha + 1j * beta) * np.ones_like(impedance)
    fractions = np.linspace(0.0, 1.0, SAMPLES_PER_SECTION)
    peak_v, peak_i = np.zeros(line.geometry.size), np.zeros(line.geometry.size)
    steps = line.step_elements(f) if line.with_steps else None
    omega = 2.0 * np.pi * f
    for k in range(line.geometry.size):
        if steps is not None:
            voltage = voltage - 1j * omega * steps.left_inductance_h[:, k] * current
            current = current - 1j * omega * steps.capacitance_f[:, k] * voltage
            voltage = voltage - 1j * omega * steps.right_inductance_h[:, k] * current
        z, g = impedance[:, k, None], gamma[:, k, None] * line.lengths_m[k] * fractions
        v = voltage[:, None] * np.cosh(g) - current[:, None] * z * np.sinh(g)
        i = current[:, None] * np.cosh(g) - voltage[:, None] / z * np.sinh(g)
        peak_v[k], peak_i[k] = np.max(np.abs(v)), np.max(np.abs(i))
        voltage, current = v[:, -1], i[:, -1]
    return StandingWaves(peak_v, peak_i, voltage, current)
