"""What a design or analysis adds for the board, where the request asks: the junction steps in its
exact check (junction_effects.py) and the power figures (power.py)."""

from __future__ import annotations

from dataclasses import dataclass

from service.analysis.line_cascade import LineCascade
from service.pipeline.junction_effects import junction_check
from service.pipeline.power import power_figures
from service.schemas.results import ResponseCurve, VerifiedFigures
from service.schemas.transformers import MatchRequest


@dataclass(frozen=True)
class BoardCheck:
    """The line as checked (with its steps where asked), its figures and curve, the response fields
    it adds (junction_effects, power) and the warnings of each."""

    line: LineCascade
    figures: VerifiedFigures
    curve: ResponseCurve | None
    fields: dict[str, object]
    step_notes: tuple[str, ...]
    power_notes: tuple[str, ...]


def board_check(
    request: MatchRequest, line: LineCascade, figures: VerifiedFigures, curve: ResponseCurve | None
) -> BoardCheck:
    """The junction steps and the power figures of the line, where the request asks for them."""
    fields: dict[str, object] = {}
    step_notes: tuple[str, ...] = ()
    power_notes: tuple[str, ...] = ()
    if request.junction_effects != "ignore":
        stepped = junction_check(line, request, figures)
        line, figures, curve, step_notes = stepped.line, stepped.figures, stepped.curve, stepped.notes
        fields["junction_effects"] = stepped.block
    if request.input_power_w is not None:
        fields["power"], notes = power_figures(request, line)
        power_notes = tuple(notes)
    return BoardCheck(line, figures, curve, fields, step_notes, power_notes)
