"""Which checked designs are refined, within which limits, and the sentence that says what was done.

Every design into a load that is not a plain resistance (fixed reactive, lumped, measured,
Touchstone) is refined: the theory matches it at the band centre only. A design whose sections
leave limits the request set is refused, or refined within them when the request asks for that.
Tapers have too many steps to refine one by one; for them only the last section (the rotating
section, for a reactive load) is free.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.analysis.line_cascade import LineCascade
from service.analysis.worst_case import check
from service.errors import UnmeetableRequestError
from service.pipeline.options import DesignOptions
from service.pipeline.realize import quarter_wave_m
from service.pipeline.refine import refine_minimax
from service.pipeline.section_limits import geometry_bounds, refusal, section_limits
from service.pipeline.target import Target
from service.schemas.results import RefinementFigures, ResponseCurve, VerifiedFigures
from service.schemas.transformers import SynthesisRequest

AT_LIMIT = 5e-3  # a refined impedance this close (relative) to a limit is said to sit on it


@dataclass(frozen=True)
class RefinedCheck:
    """A refined line, its checked figures and curve, and the sentences that describe it."""

    line: LineCascade
    refinement: RefinementFigures
    curve: ResponseCurve
    notes: tuple[str, ...]


def limit_refusal(request: SynthesisRequest, target: Target, line: LineCascade) -> UnmeetableRequestError | None:
    """The 422 for a design that leaves a limit the request set, unless it asks for refinement."""
    if request.outside_limits == "refine" or not request.limits_given:
        return None  # only limits the request sets are hard
    return refusal(section_limits(request, target), line.impedances_at(request.band.center_hz))


def needs_refinement(request: SynthesisRequest, target: Target, line: LineCascade) -> bool:
    """True for loads that are not a plain resistance, and for designs outside the limits."""
    if not target.resistive:
        return True
    if not request.limits_given:
        return False  # the default limits take in the source and the load, between which a resistive design lies
    return section_limits(request, target).outside(line.impedances_at(request.band.center_hz)) is not None


def refined_check(
    line: LineCascade,
    request: SynthesisRequest,
    target: Target,
    theory: str,
    taper: bool,
    before: VerifiedFigures,
    options: DesignOptions,
) -> RefinedCheck:
    """Refine the line within the limits and check the result on the exact cascade."""
    band = request.band
    limits = section_limits(request, target)
    bounds = geometry_bounds(line, limits, request, options.min_feature_m)
    free = np.array([line.geometry.size - 1]) if taper else None
    refined = refine_minimax(line, band.start_hz, band.stop_hz, quarter_wave_m(line, band.center_hz), bounds, free)
    after, curve = check(refined.after, band.start_hz, band.stop_hz, request.spec_reflection, request.points)
    figures = RefinementFigures(before=before, after=after, iterations=refined.iterations)
    notes = [_refinement_note(request, target, theory, taper, figures)]
    notes += _limit_notes(refined.after.impedances_at(band.center_hz), limits.low_ohm, limits.high_ohm)
    return RefinedCheck(refined.after, figures, curve, tuple(notes))


def _refinement_note(
    request: SynthesisRequest, target: Target, theory: str, taper: bool, figures: RefinementFigures
) -> str:
    if target.rotation is not None:
        start = (
            f"the {theory} design into {target.resistance_ohm:.6g} ohm, the load's centre-frequency "
            f"impedance turned real by a last section of {request.source_ohm:g} ohm line"
        )
    elif not target.resistive:
        start = f"the {theory} design into {target.resistance_ohm:.6g} ohm, from the load at the band centre"
    else:
        start = f"the {theory} design, which leaves the impedance limits, held within them"
    what = "the last section's impedance and length" if taper else "section impedances and lengths"
    before, after = figures.before.max_reflection, figures.after.max_reflection
    if after >= before:
        return f"Refined for this load: the start was {start}; minimax refinement of {what} found nothing better."
    return (
        f"Refined for this load: the start was {start}; minimax refinement of {what} took the worst "
        f"in-band reflection from {before:.4g} to {after:.4g}."
    )


def _limit_notes(impedances_ohm: np.ndarray, low_ohm: float, high_ohm: float) -> list[str]:
    """Say where refined sections sit on an impedance limit: a wider range might do better."""
    notes = []
    for index, impedance in enumerate(impedances_ohm.tolist()):
        for bound, name in ((low_ohm, "min_impedance_ohm"), (high_ohm, "max_impedance_ohm")):
            if abs(impedance / bound - 1.0) <= AT_LIMIT:
                notes.append(
                    f"Section {index + 1} sits at the impedance limit {bound:.4g} ohm ({name}); "
                    "a wider range might lower the reflection further."
                )
    return notes
