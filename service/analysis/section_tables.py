"""The section and junction tables of checked lines, built a stack of lines at a time."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.analysis import network
from service.analysis.line_cascade import LineCascade, stackable_groups
from service.constants import SPEED_OF_LIGHT_M_PER_S
from service.physics.loads import LoadModel, impedance_at
from service.schemas.results import JunctionResult, SectionResult


@dataclass(frozen=True)
class SectionTable:
    """One line's sections and junctions at one frequency, source side first."""

    sections: list[SectionResult]
    junctions: list[JunctionResult]


def section_tables(lines: list[LineCascade], frequencies_hz: np.ndarray, junctions: bool = True) -> list[SectionTable]:
    """Every line's section table at its frequency (the band centre), a stack of lines at a time.

    A section lists its impedance, electrical length, permittivity and geometry there; a junction
    its reflection and transmission. The step into the load is listed only for a load that is
    resistive and the same at every frequency; for other loads its reflection is complex or
    changes with frequency. Without `junctions` the junction lists are left empty (batch summaries
    do not show them).
    """
    tables: list[SectionTable | None] = [None] * len(lines)
    for indices in stackable_groups(lines):
        members = [lines[i] for i in indices]
        medium = members[0].medium
        geometry, lengths = np.array([m.geometry for m in members]), np.array([m.lengths_m for m in members])
        frequency = np.asarray(frequencies_hz, dtype=float)[indices][:, None]
        params = medium.parameters(geometry, frequency)
        degrees = 360.0 * frequency * np.sqrt(params.eps_eff) * lengths / SPEED_OF_LIGHT_M_PER_S
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
            listed = (steps if load else steps[:-1]) if junctions else []
            tables[index] = SectionTable(sections, [JunctionResult(reflection=r, transmission=1.0 + r) for r in listed])
    return tables


def _resistive_load_ohm(load: LoadModel) -> float | None:
    """The load's resistance if it is resistive and the same at every frequency, else None."""
    if load.frequency_dependent:
        return None
    impedance = impedance_at(load, 0.0)
    return impedance.real if impedance.imag == 0.0 else None
