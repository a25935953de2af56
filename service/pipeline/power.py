"""Voltages, currents and fields a design carries at the requested power, with the cautions."""

from __future__ import annotations

import numpy as np

from service.analysis.line_cascade import LineCascade
from service.analysis.standing_waves import standing_waves
from service.schemas.results import PowerFigures, SectionPower
from service.schemas.transformers import MatchRequest

AIR_STRENGTH_V_PER_M = 3e6  # dry air at sea level, about 3 kV/mm (from memory; a common textbook figure)
PTFE_STRENGTH_V_PER_M = 6e7  # PTFE, about 60 kV/mm (from memory; datasheets give 20-170 kV/mm by thickness)
POWER_POINTS = 201  # frequencies over the band at which the standing waves are taken
THIN_MARGIN = 2.0  # a field within a factor of two of breakdown is warned (common practice, no source)
CAUTIONS = (
    "These are ideal-line figures at a matched source's incident power: they leave out connectors, "
    "edges and burrs that concentrate fields, heating, altitude, humidity and pulse peaks. High RF power "
    "can cause burns, arcing and fire, and radiating systems can expose people to fields above permitted "
    "limits: follow your local codes and regulations, and have any such design reviewed by qualified, "
    "licensed engineers before use."
)


def default_strength(eps_r: float) -> float | None:
    """A documented default breakdown field for air and PTFE dielectrics; None for others."""
    if eps_r <= 1.1:
        return AIR_STRENGTH_V_PER_M
    if 1.9 <= eps_r <= 2.2:
        return PTFE_STRENGTH_V_PER_M
    return None


def power_figures(request: MatchRequest, line: LineCascade) -> tuple[PowerFigures, list[str]]:
    """The power block of a design or analysis, and the warnings that go with it."""
    power = float(request.input_power_w)
    band = request.band
    frequencies = np.linspace(band.start_hz, band.stop_hz, min(request.points, POWER_POINTS))
    waves = standing_waves(line, frequencies, power)
    peak_v, peak_i = waves.peak_voltage_v, waves.peak_current_a
    medium = line.medium
    notes: list[str] = []
    strength, density = None, None
    fields = [None] * peak_v.size
    if medium.kind == "coax":
        strength = request.dielectric_strength_v_per_m or default_strength(medium.eps_r)
        inner = line.geometry / 2.0
        fields = (peak_v / (inner * np.log(medium.outer_diameter_m / 2.0 / inner))).tolist()
        if strength is None:
            notes.append(
                f"No breakdown field is known for eps_r {medium.eps_r:g}: give dielectric_strength_v_per_m to get "
                "the coax field margins."
            )
    elif medium.kind in ("microstrip", "stripline"):
        narrowest = int(np.argmin(line.geometry))
        if medium.thickness_m > 0:
            density = float(peak_i[narrowest] / (line.geometry[narrowest] * medium.thickness_m))
    margins = [None if strength is None or f is None else strength / f for f in fields]
    thin = [k + 1 for k, margin in enumerate(margins) if margin is not None and margin < THIN_MARGIN]
    if thin:
        notes.append(
            f"At {power:g} W the field at the inner conductor of section(s) {', '.join(map(str, thin))} is within a "
            f"factor of {THIN_MARGIN:g} of the dielectric's breakdown field: reduce the power or use a larger line."
        )
    notes.append("Power figures are given: see power.cautions before building for high power.")
    sections = [
        SectionPower(peak_voltage_v=v, peak_current_a=i, peak_field_v_per_m=f, field_margin=m)
        for v, i, f, m in zip(peak_v.tolist(), peak_i.tolist(), fields, margins, strict=True)
    ]
    figures = PowerFigures(
        input_power_w=power,
        incident_peak_voltage_v=float(np.sqrt(2.0 * power * request.source_ohm)),
        sections=sections,
        dielectric_strength_v_per_m=strength,
        narrowest_current_density_a_per_m2=density,
        cautions=CAUTIONS,
    )
    return figures, notes
