"""Quarter-wave, binomial and Chebyshev designs: resolve the request, synthesize, check, report."""

from __future__ import annotations

from collections.abc import Callable

from service import design
from service.design.multisection import MAX_SECTIONS, InfeasibleDesignError
from service.designer.finish import finish
from service.designer.lines import DesignOptions, Target, target_for
from service.errors import UnmeetableRequestError
from service.schemas.results import TransformerDesign
from service.schemas.transformers import QuarterWaveRequest, TransformerRequest

Synthesis = Callable[[int], design.SteppedDesign]


def quarter_wave(request: QuarterWaveRequest, options: DesignOptions | None = None) -> TransformerDesign:
    """One quarter-wave section."""
    target = target_for(request)
    synthesized = design.quarter_wave(
        request.source_ohm, target.resistance_ohm, target.edge_angle_rad, request.spec_reflection
    )
    return finish("quarter-wave", design.SMALL_REFLECTION.name, request, target, synthesized, options=options)


def binomial(request: TransformerRequest, options: DesignOptions | None = None) -> TransformerDesign:
    """Maximally flat design, by section count or by spec."""
    target = target_for(request)
    theory = design.THEORIES[request.theory]
    spec = request.spec_reflection

    def synthesize(sections: int) -> design.SteppedDesign:
        return design.binomial(request.source_ohm, target.resistance_ohm, sections, target.edge_angle_rad, spec, theory)

    def count() -> int:
        return design.binomial_sections_for(
            request.source_ohm, target.resistance_ohm, target.edge_angle_rad, spec, theory
        )

    return _by_count_or_spec("binomial", request, target, synthesize, count, options)


def chebyshev(request: TransformerRequest, options: DesignOptions | None = None) -> TransformerDesign:
    """Equal-ripple design.

    Sections only: ripple set by the band. Spec only: smallest N, edges on the band limits.
    Both: that N and ripple, the band following from them.
    """
    target = target_for(request)
    theory = design.THEORIES[request.theory]
    ripple = request.max_reflection if request.sections is not None else None

    def synthesize(sections: int) -> design.SteppedDesign:
        return design.chebyshev(
            request.source_ohm, target.resistance_ohm, sections, target.edge_angle_rad, ripple, theory
        )

    def count() -> int:
        return design.chebyshev_sections_for(
            request.source_ohm, target.resistance_ohm, target.edge_angle_rad, request.spec_reflection, theory
        )

    return _by_count_or_spec("chebyshev", request, target, synthesize, count, options)


def _by_count_or_spec(
    method: str,
    request: TransformerRequest,
    target: Target,
    synthesize: Synthesis,
    count: Callable[[], int],
    options: DesignOptions | None,
) -> TransformerDesign:
    """The design at the requested N, or the smallest N that the exact cascade says meets the spec.

    The theory's N is tried first; where the exact cascade misses the spec, N grows until it
    meets it (or the section limit is reached), and a warning says so.
    """
    if request.sections is not None:
        return finish(method, request.theory, request, target, synthesize(request.sections), options=options)
    try:
        theory_sections = count()
    except InfeasibleDesignError as exc:
        raise UnmeetableRequestError("max_reflection", str(exc)) from exc
    result = finish(method, request.theory, request, target, synthesize(theory_sections), options=options)
    sections = theory_sections
    while not result.verified.meets_spec and sections < MAX_SECTIONS:
        sections += 1
        note = (
            f"The {request.theory} theory asks for {theory_sections} sections; the exact cascade "
            f"needed {sections} to meet the spec."
        )
        result = finish(method, request.theory, request, target, synthesize(sections), [note], options)
    return result
