"""Orchestration: synthesize with design/, check with the exact cascade, and compare the two.

The only module that calls both the synthesis theory and the independent network analysis.
"""

from __future__ import annotations

from collections.abc import Callable

import numpy as np

from service import design
from service.design.small_reflection import MAX_SECTIONS, InfeasibleDesignError
from service.errors import UnmeetableRequestError
from service.schemas.networks import AnalyzeRequest, SectionSpec
from service.schemas.results import (
    AnalysisResult,
    PredictedFigures,
    SectionResult,
    TransformerDesign,
    VerifiedFigures,
)
from service.schemas.transformers import QuarterWaveRequest, TransformerRequest
from service.verification import (
    LineCascade,
    electrical_length_deg,
    junction_results,
    length_for_angle_m,
    response_curve,
    return_loss_db,
    verified_figures,
)
from service.wording import hz_text, percent_text

SMALL_REFLECTION = "small-reflection"
PREDICTION_TOLERANCE = 0.01  # relative departure of the exact peak worth a warning

Synthesis = Callable[[int], design.SteppedDesign]


def analyze(request: AnalyzeRequest) -> AnalysisResult:
    """Exact figures of the user's own sections."""
    center = request.band.center_hz
    lengths = np.array([_section_length_m(s, center, request.velocity_factor) for s in request.sections])
    line = LineCascade(
        request.source_ohm,
        request.load.resistance_ohm,
        np.array([s.impedance_ohm for s in request.sections]),
        lengths,
        request.velocity_factor,
    )
    verified = verified_figures(line, request.band.start_hz, request.band.stop_hz, request.spec_reflection)
    return AnalysisResult(**_checked_blocks(line, request, verified), warnings=_spec_warnings(verified))


def quarter_wave(request: QuarterWaveRequest) -> TransformerDesign:
    """One quarter-wave section."""
    rl, edge = _real_load_and_edge(request)
    synthesized = design.quarter_wave(request.source_ohm, rl, edge, request.spec_reflection)
    return _finish("quarter-wave", request, synthesized, [])


def binomial(request: TransformerRequest) -> TransformerDesign:
    """Maximally flat design, by section count or by spec."""
    rl, edge = _real_load_and_edge(request)
    spec = request.spec_reflection

    def synthesize(sections: int) -> design.SteppedDesign:
        return design.binomial(request.source_ohm, rl, sections, edge, spec)

    return _by_count_or_spec(
        "binomial",
        request,
        synthesize,
        lambda: design.binomial_sections_for(request.source_ohm, rl, edge, spec),
    )


def chebyshev(request: TransformerRequest) -> TransformerDesign:
    """Equal-ripple design.

    Sections only: ripple set by the band. Spec only: smallest N, edges on the band limits.
    Both: that N and ripple, the band following from them.
    """
    rl, edge = _real_load_and_edge(request)

    def synthesize(sections: int) -> design.SteppedDesign:
        ripple = request.max_reflection if request.sections is not None else None
        return design.chebyshev(request.source_ohm, rl, sections, edge, ripple)

    return _by_count_or_spec(
        "chebyshev",
        request,
        synthesize,
        lambda: design.chebyshev_sections_for(request.source_ohm, rl, edge, request.spec_reflection),
    )


def _by_count_or_spec(
    method: str, request: TransformerRequest, synthesize: Synthesis, sections_for_spec: Callable[[], int]
) -> TransformerDesign:
    """The design at the requested N, or the smallest N that the exact cascade says meets the spec.

    The theory's N is tried first; where the exact cascade misses the spec, N grows until it
    meets it (or the section limit is reached), and a warning says so.
    """
    if request.sections is not None:
        return _finish(method, request, synthesize(request.sections), [])
    try:
        theory_sections = sections_for_spec()
    except InfeasibleDesignError as exc:
        raise UnmeetableRequestError("max_reflection", str(exc)) from exc
    result = _finish(method, request, synthesize(theory_sections), [])
    sections = theory_sections
    while not result.verified.meets_spec and sections < MAX_SECTIONS:
        sections += 1
        note = (
            f"Small-reflection theory asks for {theory_sections} sections; the exact cascade "
            f"needed {sections} to meet the spec."
        )
        result = _finish(method, request, synthesize(sections), [note])
    return result


def _real_load_and_edge(request: TransformerRequest) -> tuple[float, float]:
    """The resistive load and the lower band edge's electrical length at the centre frequency."""
    edge = design.band_edge_angle_rad(request.band.start_hz, request.band.stop_hz)
    return request.load.resistance_ohm, edge


def _finish(
    method: str, request: TransformerRequest, synthesized: design.SteppedDesign, notes: list[str]
) -> TransformerDesign:
    """Check the synthesized sections by the exact cascade and assemble the response."""
    center = request.band.center_hz
    line = LineCascade(
        request.source_ohm,
        request.load.resistance_ohm,
        synthesized.impedances_ohm,
        length_for_angle_m(synthesized.electrical_length_rad, center, request.velocity_factor),
        request.velocity_factor,
    )
    spec = request.spec_reflection
    verified = verified_figures(line, request.band.start_hz, request.band.stop_hz, spec)
    predicted = PredictedFigures(
        max_reflection=synthesized.predicted_max_reflection,
        bandwidth_fraction=synthesized.predicted_bandwidth_fraction,
        covers_band=synthesized.predicted_max_reflection <= spec * (1.0 + 1e-9),
    )
    warnings = [*synthesized.notes, *notes, *_coverage_warnings(request, predicted)]
    warnings += _spec_warnings(verified) + _departure_warnings(predicted, verified)
    return TransformerDesign(
        method=method,
        theory=SMALL_REFLECTION,
        predicted=predicted,
        **_checked_blocks(line, request, verified),
        warnings=warnings,
    )


def _checked_blocks(
    line: LineCascade, request: TransformerRequest | AnalyzeRequest, verified: VerifiedFigures
) -> dict[str, object]:
    """The response blocks every verified result shares."""
    center = request.band.center_hz
    degrees = electrical_length_deg(line.lengths_m, center, line.velocity_factor)
    sections = [
        SectionResult(impedance_ohm=float(z), electrical_length_deg=float(d), length_m=float(m))
        for z, d, m in zip(line.impedances_ohm, degrees, line.lengths_m, strict=True)
    ]
    return {
        "center_hz": center,
        "sections": sections,
        "total_length_m": float(np.sum(line.lengths_m)),
        "junctions": junction_results(line),
        "verified": verified,
        "response": response_curve(line, request.band.start_hz, request.band.stop_hz, request.points),
        "velocity_factor": line.velocity_factor,
    }


def _section_length_m(section: SectionSpec, center_hz: float, velocity_factor: float) -> float:
    """Physical length of a user's section, from its length or its electrical length."""
    if section.length_m is not None:
        return section.length_m
    reference = section.reference_hz or center_hz
    return float(length_for_angle_m(np.deg2rad(section.electrical_length_deg), reference, velocity_factor))


def _coverage_warnings(request: TransformerRequest, predicted: PredictedFigures) -> list[str]:
    """Where a fixed section count cannot cover the band at the spec, by the theory."""
    if predicted.covers_band:
        return []
    band = request.band
    requested = (band.stop_hz - band.start_hz) / band.center_hz
    return [
        f"By the theory this design keeps |reflection| within {request.spec_reflection:.4g} over "
        f"{percent_text(predicted.bandwidth_fraction)} bandwidth only; the requested band spans "
        f"{percent_text(requested)} and the reflection reaches {predicted.max_reflection:.4g} in it."
    ]


def _spec_warnings(verified: VerifiedFigures) -> list[str]:
    """A plain sentence when the exact cascade misses the spec."""
    if verified.meets_spec:
        return []
    excess = verified.max_reflection / verified.spec_max_reflection - 1.0
    return [
        f"The exact cascade reaches |reflection| {verified.max_reflection:.4g} "
        f"({float(return_loss_db(verified.max_reflection)):.2f} dB return loss) at "
        f"{hz_text(verified.worst_frequency_hz)}, {percent_text(excess)} above the spec "
        f"{verified.spec_max_reflection:.4g}."
    ]


def _departure_warnings(predicted: PredictedFigures, verified: VerifiedFigures) -> list[str]:
    """A plain sentence when the exact peak departs noticeably from the theory's."""
    if predicted.max_reflection <= 0.0:
        return []
    departure = verified.max_reflection / predicted.max_reflection - 1.0
    if abs(departure) <= PREDICTION_TOLERANCE:
        return []
    return [
        f"The exact worst reflection {verified.max_reflection:.4g} differs from the "
        f"small-reflection prediction {predicted.max_reflection:.4g} by {percent_text(departure)}; "
        "the theory loses accuracy as the impedance ratio grows."
    ]
