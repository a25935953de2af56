"""The parts of a response that every checked line shares, whatever made its sections."""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from service.analysis.line_cascade import LineCascade
from service.analysis.section_tables import SectionTable
from service.analysis.unmatched import unmatched_max_reflection
from service.physics.loads import CircuitLoad, LoadModel
from service.physics.media import IdealLine
from service.pipeline.options import DesignOptions
from service.schemas.results import BodeFanoFigures, ResponseCurve, VerifiedFigures
from service.schemas.transformers import MatchRequest
from service.synthesis.bode_fano import bode_fano_min_reflection


@dataclass(frozen=True)
class CheckedBlocks:
    """The response fields of a checked line, and the notes its medium has on it (warnings-to-be)."""

    fields: dict[str, Any]  # keyword arguments shared by TransformerDesign and AnalysisResult
    bode_fano: BodeFanoFigures | None
    medium_notes: list[str]


def bode_fano_figures(load: LoadModel, request: MatchRequest, verified: VerifiedFigures) -> BodeFanoFigures | None:
    """The Bode-Fano block for lumped loads, None for others."""
    if not isinstance(load, CircuitLoad):
        return None
    bound = bode_fano_min_reflection(
        load.kind, load.resistance_ohm, load.element_value, request.band.start_hz, request.band.stop_hz
    )
    return BodeFanoFigures(
        min_reflection=bound,
        verified_max_reflection=verified.max_reflection,
        spec_beats_bound=request.spec_reflection < bound,
    )


def checked_blocks(
    line: LineCascade,
    request: MatchRequest,
    verified: VerifiedFigures,
    curve: ResponseCurve | None,
    table: SectionTable,
    options: DesignOptions,
) -> CheckedBlocks:
    """The response blocks every verified result shares, and the medium's own notes."""
    band = request.band
    medium = line.medium
    bode_fano = bode_fano_figures(line.load, request, verified)
    fields = {
        "center_hz": band.center_hz,
        "sections": table.sections,
        "total_length_m": float(line.lengths_m.sum()),
        "junctions": table.junctions,
        "verified": verified,
        "response": curve,
        "velocity_factor": medium.velocity_factor if isinstance(medium, IdealLine) else None,
        "medium": medium.kind,
        "bode_fano": bode_fano,
        "unmatched_max_reflection": unmatched_max_reflection(line.load, line.source_ohm, band.start_hz, band.stop_hz),
    }
    notes = medium.notes(line.geometry, band.start_hz, band.stop_hz, options.min_feature_m)
    return CheckedBlocks(fields, bode_fano, list(notes))
