"""The junction steps of a physical design: included in its exact check, or compensated by
adjusting its section lengths (microstrip, stripline and coax; the models are in physics/steps.py)."""

from __future__ import annotations

from dataclasses import dataclass, replace

import numpy as np

from service.analysis.line_cascade import LineCascade
from service.analysis.worst_case import check
from service.physics.steps import MODEL_NAMES, step_notes
from service.pipeline.realize import feed_geometry, quarter_wave_m
from service.pipeline.refine import refine_minimax
from service.schemas.results import JunctionEffects, ResponseCurve, StepCircuitResult, VerifiedFigures
from service.schemas.transformers import MatchRequest

MAX_COMPENSATED_SECTIONS = 16  # each section's length is an optimizer variable


@dataclass(frozen=True)
class JunctionCheck:
    """The line with its steps (compensated or not), its verified figures and curve, and the block."""

    line: LineCascade
    figures: VerifiedFigures
    curve: ResponseCurve | None
    block: JunctionEffects
    notes: tuple[str, ...]


def junction_check(line: LineCascade, request: MatchRequest, ideal: VerifiedFigures) -> JunctionCheck:
    """Check the line with its junction steps; with `compensate`, first adjust its lengths (only)
    for the smallest worst in-band reflection with the steps, never ending worse than unadjusted."""
    band, spec = request.band, request.spec_reflection
    feed = feed_geometry(request)
    stepped = replace(line, feed_geometry=feed)
    notes = step_notes(line.medium, np.concatenate(([feed], line.geometry)), band.stop_hz)
    uncompensated, changes = None, None
    if request.junction_effects == "compensate":
        uncompensated = check(stepped, band.start_hz, band.stop_hz, spec, request.points)[0].max_reflection
        if line.geometry.size <= MAX_COMPENSATED_SECTIONS:
            frozen = (line.geometry, line.geometry)
            qw = quarter_wave_m(stepped, band.center_hz)
            stepped = refine_minimax(stepped, band.start_hz, band.stop_hz, qw, frozen).after
            changes = (stepped.lengths_m - line.lengths_m).tolist()
        else:
            notes.append(
                f"Compensation adjusts designs of up to {MAX_COMPENSATED_SECTIONS} sections; this one has "
                f"{line.geometry.size}, so its steps are included in the check but not compensated."
            )
    figures, curve = check(stepped, band.start_hz, band.stop_hz, spec, request.points)
    elements = stepped.step_elements(np.array([band.center_hz]))
    steps = [
        StepCircuitResult(source_side_inductance_h=left, capacitance_f=shunt, load_side_inductance_h=right)
        for left, shunt, right in zip(
            elements.left_inductance_h[0], elements.capacitance_f[0], elements.right_inductance_h[0], strict=True
        )
    ]
    block = JunctionEffects(
        mode=request.junction_effects,
        model=MODEL_NAMES[line.medium.kind],
        ideal_max_reflection=ideal.max_reflection,
        with_steps_max_reflection=figures.max_reflection,
        uncompensated_max_reflection=uncompensated,
        length_changes_m=changes,
        steps=steps,
    )
    notes.append(_summary(block))
    return JunctionCheck(stepped, figures, curve, block, tuple(notes))


def _summary(block: JunctionEffects) -> str:
    """One sentence on what the steps did to the design returned."""
    text = (
        f"The junction steps are in the verified figures: worst |reflection| {block.with_steps_max_reflection:.4g} "
        f"with them, {block.ideal_max_reflection:.4g} with ideal steps"
    )
    if block.length_changes_m is not None:
        longest = max(abs(change) for change in block.length_changes_m)
        text += (
            f"; compensation changed the section lengths by up to {longest * 1e3:.3g} mm "
            f"({block.uncompensated_max_reflection:.4g} before it)"
        )
    return text + "."
