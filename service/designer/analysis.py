"""The exact check of a user's own sections."""

from __future__ import annotations

import numpy as np

from service.designer.lines import checked_blocks
from service.designer.reporting import bode_fano_warnings, spec_warnings
from service.schemas.networks import AnalyzeRequest, SectionSpec
from service.schemas.results import AnalysisResult
from service.verification import LineCascade, length_for_angle_m, verified_figures


def analyze(request: AnalyzeRequest) -> AnalysisResult:
    """Exact figures of the user's sections."""
    center = request.band.center_hz
    lengths = np.array([_section_length_m(s, center, request.velocity_factor) for s in request.sections])
    line = LineCascade(
        request.source_ohm,
        request.load.model(),
        np.array([s.impedance_ohm for s in request.sections]),
        lengths,
        request.velocity_factor,
    )
    verified = verified_figures(line, request.band.start_hz, request.band.stop_hz, request.spec_reflection)
    blocks = checked_blocks(line, request, verified)
    warnings = spec_warnings(verified) + bode_fano_warnings(blocks["bode_fano"], request.spec_reflection)
    return AnalysisResult(**blocks, warnings=warnings)


def _section_length_m(section: SectionSpec, center_hz: float, velocity_factor: float) -> float:
    """Physical length of a user's section, from its length or its electrical length."""
    if section.length_m is not None:
        return section.length_m
    reference = section.reference_hz or center_hz
    return float(length_for_angle_m(np.deg2rad(section.electrical_length_deg), reference, velocity_factor))
