"""The exact check of a user's own sections."""

from __future__ import annotations

import numpy as np

from service.analysis.section_tables import section_tables
from service.analysis.worst_case import check
from service.pipeline.board import board_check
from service.pipeline.messages import bode_fano_warnings, spec_warnings
from service.pipeline.options import DesignOptions
from service.pipeline.realize import geometry_for, realize_geometry
from service.pipeline.shared_blocks import checked_blocks
from service.pipeline.target import covered_load
from service.schemas.networks import AnalyzeRequest
from service.schemas.results import AnalysisResult, ComplexReflection


def _geometry(request: AnalyzeRequest) -> np.ndarray:
    """Each section's geometry: as given (width, inner diameter), or realized from its impedance."""
    by_impedance = [s.impedance_ohm for s in request.sections if s.impedance_ohm is not None]
    realized = iter(geometry_for(request, np.array(by_impedance)) if by_impedance else [])
    return np.array(
        [next(realized) if s.impedance_ohm is not None else s.width_m or s.inner_diameter_m for s in request.sections]
    )


def analyze(request: AnalyzeRequest, options: DesignOptions | None = None) -> AnalysisResult:
    """Exact figures of the user's sections, realized in the request's medium.

    A section given by electrical length gets the physical length that has it at its reference
    frequency (the band centre by default); one given by length keeps it.
    """
    options = options or DesignOptions()
    center = request.band.center_hz
    angles = np.array([np.deg2rad(s.electrical_length_deg or 0.0) for s in request.sections])
    references = np.array([s.reference_hz or center for s in request.sections])
    line = realize_geometry(request, covered_load(request), _geometry(request), angles, references)
    given = np.array([s.length_m is not None for s in request.sections])
    if np.any(given):
        physical = np.array([s.length_m or 0.0 for s in request.sections])
        line = line.with_sections(line.geometry, np.where(given, physical, line.lengths_m))
    band = request.band
    verified, curve = check(line, band.start_hz, band.stop_hz, request.spec_reflection, request.points)
    board = board_check(request, line, verified, curve)
    line, verified, curve = board.line, board.figures, board.curve
    table = section_tables([line], np.array([band.center_hz]))[0]
    blocks = checked_blocks(line, request, verified, curve, table, options)
    warnings = [*blocks.medium_notes, *board.step_notes, *spec_warnings(verified)]
    warnings += bode_fano_warnings(blocks.bode_fano, request.spec_reflection)
    reflection = line.input_reflection(np.asarray(curve.frequency_hz))
    complex_curve = ComplexReflection(real=reflection.real.tolist(), imag=reflection.imag.tolist())
    fields = blocks.fields | {"input_reflection": complex_curve} | board.fields
    return AnalysisResult(**fields, warnings=[*warnings, *board.power_notes])
