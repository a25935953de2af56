"""Check synthesized designs by the exact cascade and assemble their responses.

`verify_many` checks a whole list of designs at once: lines of equal shape are stacked so that
the cascade runs over designs x frequencies x sections in one go.
"""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from service import synthesis
from service.analysis.line_cascade import LineCascade
from service.analysis.section_tables import SectionTable, section_tables
from service.analysis.worst_case import check_many
from service.constants import SMALL_REFLECTION
from service.errors import UnmeetableRequestError
from service.pipeline.board import board_check
from service.pipeline.messages import (
    bode_fano_warnings,
    coverage_warnings,
    departure_warnings,
    plausibility_warnings,
    spec_warnings,
    total_reflection_warnings,
    unmatched_warnings,
)
from service.pipeline.options import DesignOptions
from service.pipeline.realize import line_for
from service.pipeline.refined_check import limit_refusal, needs_refinement, refined_check
from service.pipeline.shared_blocks import checked_blocks
from service.pipeline.target import Target
from service.schemas.bulk import DesignSummary
from service.schemas.results import (
    PredictedFigures,
    RefinementFigures,
    ResponseCurve,
    TransformerDesign,
    VerifiedFigures,
)
from service.schemas.transformers import MatchRequest

THEORY_METHODS = ("binomial", "chebyshev")  # the methods a request may switch to the exact theory


@dataclass(frozen=True)
class PendingCheck:
    """A synthesized design waiting for its exact check."""

    method: str
    theory: str
    request: MatchRequest
    target: Target
    synthesized: synthesis.SteppedDesign
    notes: tuple[str, ...] = ()


DesignOutcome = TransformerDesign | DesignSummary | UnmeetableRequestError


def verify_design(
    method: str,
    theory: str,
    request: MatchRequest,
    target: Target,
    synthesized: synthesis.SteppedDesign,
    notes: list[str] | None = None,
    options: DesignOptions | None = None,
) -> TransformerDesign:
    """The verified response for one synthesized design."""
    return verify_one(PendingCheck(method, theory, request, target, synthesized, tuple(notes or ())), options)


def verify_one(pending: PendingCheck, options: DesignOptions | None = None) -> TransformerDesign:
    """The verified response for one pending check; raises UnmeetableRequestError where it cannot be realized."""
    result = verify_many([pending], options)[0]
    if isinstance(result, UnmeetableRequestError):
        raise result
    return result


def verify_many(
    queue: list[PendingCheck], options: DesignOptions | None = None, summaries: bool = False
) -> list[DesignOutcome]:
    """Verified responses for many designs (refined first for frequency-dependent loads).

    With `summaries`, each result is the table-sized DesignSummary without its curve, and the
    parts only a full design shows (curve, junction table) are never built. A pending check whose sections
    its medium cannot realize gets its UnmeetableRequestError in its place: it never sinks the rest.
    """
    lines = [_line_or_error(pending) for pending in queue]
    kept = [index for index, line in enumerate(lines) if isinstance(line, LineCascade)]
    done = _verify_lines([queue[i] for i in kept], [lines[i] for i in kept], options or DesignOptions(), summaries)
    results: list[DesignOutcome] = list(lines)
    for index, result in zip(kept, done, strict=True):
        results[index] = result
    return results


def _line_or_error(pending: PendingCheck) -> LineCascade | UnmeetableRequestError:
    try:
        line = line_for(
            pending.request,
            pending.target,
            pending.synthesized.impedances_ohm,
            pending.synthesized.electrical_length_rad,
        )
    except UnmeetableRequestError as exc:
        return exc
    return limit_refusal(pending.request, pending.target, line) or line


def _verify_lines(
    queue: list[PendingCheck], lines: list[LineCascade], options: DesignOptions, summaries: bool
) -> list[TransformerDesign | DesignSummary]:
    starts = np.array([j.request.band.start_hz for j in queue])
    stops = np.array([j.request.band.stop_hz for j in queue])
    specs = np.array([j.request.spec_reflection for j in queue])
    points = np.array([j.request.points for j in queue])
    checked = []
    verified = check_many(lines, starts, stops, specs, points, curves=not summaries)
    for pending, line, (figures, curve) in zip(queue, lines, verified, strict=True):
        refinement, notes = None, ()
        if needs_refinement(pending.request, pending.target, line):
            taper = pending.method == "taper"
            refined = refined_check(line, pending.request, pending.target, pending.theory, taper, figures, options)
            line, refinement, curve, notes = refined.line, refined.refinement, refined.curve, refined.notes
            figures = refinement.after
        board = board_check(pending.request, line, figures, curve)
        line, figures, curve = board.line, board.figures, board.curve
        notes = (*notes, *board.step_notes, *board.power_notes)
        checked.append((replace(pending, notes=pending.notes + notes), line, figures, refinement, curve, board.fields))
    centers = np.array([j.request.band.center_hz for j in queue])
    tables = section_tables([line for _, line, *_ in checked], centers, junctions=not summaries)
    return [_assemble(*parts, table, options, summaries) for parts, table in zip(checked, tables, strict=True)]


def _assemble(
    pending: PendingCheck,
    line: LineCascade,
    verified: VerifiedFigures,
    refinement: RefinementFigures | None,
    curve: ResponseCurve | None,
    extras: dict[str, object],
    table: SectionTable,
    options: DesignOptions,
    summary: bool,
) -> TransformerDesign | DesignSummary:
    request, target, synthesized, theory = pending.request, pending.target, pending.synthesized, pending.theory
    band, spec = request.band, request.spec_reflection
    predicted = PredictedFigures(
        max_reflection=synthesized.predicted_max_reflection,
        bandwidth_fraction=synthesized.predicted_bandwidth_fraction,
        covers_band=synthesized.predicted_max_reflection <= spec * (1.0 + 1e-9),
        departure_fraction=_departure(verified.max_reflection, synthesized.predicted_max_reflection),
    )
    blocks = checked_blocks(line, request, verified, curve, table, options)
    requested_fraction = (band.stop_hz - band.start_hz) / band.center_hz
    warnings = [*synthesized.notes, *pending.notes, *blocks.medium_notes]
    warnings += coverage_warnings(spec, requested_fraction, predicted)
    resistive = target.resistive
    suggest_exact = resistive and refinement is None and theory == SMALL_REFLECTION and pending.method in THEORY_METHODS
    warnings += spec_warnings(verified, suggest_exact)
    if resistive and refinement is None:
        warnings += departure_warnings(predicted, verified, theory, line.medium)
    elif resistive:
        warnings.append(f"The {theory} prediction is that of the unrefined design; rely on the verified figures.")
    else:
        warnings.append(
            f"The {theory} prediction covers the transformer into the load's centre-frequency "
            f"resistance ({target.resistance_ohm:.6g} ohm) only; for this load rely on the verified figures."
        )
    warnings += bode_fano_warnings(blocks.bode_fano, spec)
    warnings += unmatched_warnings(verified, blocks.fields["unmatched_max_reflection"])
    warnings += total_reflection_warnings(verified)
    warnings += plausibility_warnings(band.stop_hz, float(line.lengths_m.sum()))
    fields = {"method": pending.method, "theory": theory, "predicted": predicted, "refinement": refinement}
    fields["rotating_section"] = target.rotation is not None
    fields |= extras  # junction_effects and power, where the request asks for them
    fields |= blocks.fields | {"warnings": warnings}
    return DesignSummary.picked(fields, include_curve=False) if summary else TransformerDesign(**fields)


def _departure(verified: float, predicted: float) -> float | None:
    """verified / predicted - 1; None where the prediction is (numerically) zero."""
    if predicted <= 1e-15:
        return 0.0 if verified <= 1e-12 else None
    return verified / predicted - 1.0
