"""Check a synthesized design by the exact cascade and assemble the response."""

from __future__ import annotations

from service import design
from service.designer.lines import DesignOptions, Target, checked_blocks, line_for, quarter_wave_m
from service.designer.reporting import (
    bode_fano_warnings,
    coverage_warnings,
    departure_warnings,
    spec_warnings,
)
from service.refinement import refine_minimax
from service.schemas.results import PredictedFigures, RefinementFigures, TransformerDesign
from service.schemas.transformers import MatchRequest
from service.verification import verified_figures

THEORY_METHODS = ("binomial", "chebyshev")  # the methods a request may switch to the exact theory


def finish(
    method: str,
    theory: str,
    request: MatchRequest,
    target: Target,
    synthesized: design.SteppedDesign,
    notes: list[str] | None = None,
    options: DesignOptions | None = None,
) -> TransformerDesign:
    """The verified response for a synthesized design (refined first for frequency-dependent loads)."""
    band, spec = request.band, request.spec_reflection
    line = line_for(request, target, synthesized.impedances_ohm, synthesized.electrical_length_rad)
    verified = verified_figures(line, band.start_hz, band.stop_hz, spec)
    refinement = None
    if target.load.frequency_dependent:
        refined = refine_minimax(line, band.start_hz, band.stop_hz, quarter_wave_m(line, band.center_hz))
        line = refined.after
        after = verified_figures(line, band.start_hz, band.stop_hz, spec)
        refinement = RefinementFigures(before=verified, after=after, iterations=refined.iterations)
        verified = after
    predicted = PredictedFigures(
        max_reflection=synthesized.predicted_max_reflection,
        bandwidth_fraction=synthesized.predicted_bandwidth_fraction,
        covers_band=synthesized.predicted_max_reflection <= spec * (1.0 + 1e-9),
        departure_fraction=_departure(verified.max_reflection, synthesized.predicted_max_reflection),
    )
    blocks = checked_blocks(line, request, verified, options or DesignOptions())
    requested_fraction = (band.stop_hz - band.start_hz) / band.center_hz
    warnings = [*synthesized.notes, *(notes or []), *blocks.pop("medium_notes")]
    warnings += coverage_warnings(spec, requested_fraction, predicted)
    suggest_exact = theory == design.SMALL_REFLECTION.name and method in THEORY_METHODS
    warnings += spec_warnings(verified, suggest_exact)
    if target.rotation is None and not target.load.frequency_dependent:
        warnings += departure_warnings(predicted, verified, theory, line.medium)
    else:
        warnings.append(
            f"The {theory} prediction covers the transformer into the load's centre-frequency "
            f"resistance ({target.resistance_ohm:.6g} ohm) only; for this load rely on the verified figures."
        )
    warnings += bode_fano_warnings(blocks["bode_fano"], spec)
    if target.rotation is not None:
        warnings.append(_rotation_note(request, target))
    return TransformerDesign(
        method=method, theory=theory, predicted=predicted, refinement=refinement, **blocks, warnings=warnings
    )


def _departure(verified: float, predicted: float) -> float:
    """verified / predicted - 1, or 0 where both are (numerically) zero."""
    if predicted <= 1e-15:
        return 0.0 if verified <= 1e-12 else float("inf")
    return verified / predicted - 1.0


def _rotation_note(request: MatchRequest, target: Target) -> str:
    """Tell the user what the last section is for."""
    degrees = float(target.rotation.electrical_length_rad) * 180.0 / 3.141592653589793
    return (
        f"The last section is {degrees:.4g} degrees of {request.source_ohm:g} ohm line that turns the "
        f"load real ({target.resistance_ohm:.6g} ohm) at the band centre; the transformer matches that."
    )
