"""Quarter-wave, binomial and Chebyshev designs: resolve the request, synthesize, check, report."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from service import design
from service.design.multisection import MAX_SECTIONS, InfeasibleDesignError
from service.designer.finish import Job, finish_many
from service.designer.lines import DesignOptions, Target, target_for
from service.errors import UnmeetableRequestError
from service.schemas.results import TransformerDesign
from service.schemas.transformers import MatchRequest, QuarterWaveRequest, TransformerRequest


@dataclass(frozen=True)
class Plan:
    """How to synthesize one stepped request at any section count.

    Multisection plans also say how to `weigh` a count: their impedances can then be synthesized
    together with other plans' (see jobs_for).
    """

    method: str
    theory: str
    request: MatchRequest
    target: Target
    synthesize: Callable[[int], design.SteppedDesign]
    count: Callable[[], int]
    sections: int | None  # as requested; None means: by spec
    weigh: Callable[[int], design.WeightedDesign] | None = None

    def job(self, sections: int, notes: tuple[str, ...] = ()) -> Job:
        return Job(self.method, self.theory, self.request, self.target, self.synthesize(sections), notes)

    def theory_sections(self) -> int:
        """The requested count, or the theory's smallest count for the spec."""
        if self.sections is not None:
            return self.sections
        try:
            return self.count()
        except InfeasibleDesignError as exc:
            raise UnmeetableRequestError("max_reflection", str(exc)) from exc


def jobs_for(plans: list[Plan], counts: list[int]) -> list[Job]:
    """The job of every plan at its count; multisection impedances synthesized in vectorized groups."""
    weighable = [index for index, plan in enumerate(plans) if plan.weigh is not None]
    weighted = design.stepped_many([plans[i].weigh(counts[i]) for i in weighable])
    synthesized = dict(zip(weighable, weighted, strict=True))
    return [
        Job(
            plan.method,
            plan.theory,
            plan.request,
            plan.target,
            synthesized[index] if index in synthesized else plan.synthesize(count),
        )
        for index, (plan, count) in enumerate(zip(plans, counts, strict=True))
    ]


def plan_quarter_wave(request: QuarterWaveRequest) -> Plan:
    """One quarter-wave section."""
    target = target_for(request)

    def synthesize(_: int) -> design.SteppedDesign:
        return design.quarter_wave(
            request.source_ohm, target.resistance_ohm, target.edge_angle_rad, request.spec_reflection
        )

    return Plan("quarter-wave", design.SMALL_REFLECTION.name, request, target, synthesize, lambda: 1, 1)


def plan_binomial(request: TransformerRequest) -> Plan:
    """Maximally flat design, by section count or by spec."""
    spec = request.spec_reflection
    return _multisection_plan(
        "binomial",
        request,
        lambda source, load, edge, theory, sections: design.weighted_binomial(
            source, load, sections, edge, spec, theory
        ),
        lambda source, load, edge, theory: design.binomial_sections_for(source, load, edge, spec, theory),
    )


def plan_chebyshev(request: TransformerRequest) -> Plan:
    """Equal-ripple design.

    Sections only: ripple set by the band. Spec only: smallest N, edges on the band limits.
    Both: that N and ripple, the band following from them.
    """
    ripple = request.max_reflection if request.sections is not None else None
    spec = request.spec_reflection
    return _multisection_plan(
        "chebyshev",
        request,
        lambda source, load, edge, theory, sections: design.weighted_chebyshev(
            source, load, sections, edge, ripple, theory
        ),
        lambda source, load, edge, theory: design.chebyshev_sections_for(source, load, edge, spec, theory),
    )


def _multisection_plan(
    method: str,
    request: TransformerRequest,
    weigh: Callable[..., design.WeightedDesign],
    count: Callable[..., int],
) -> Plan:
    """A plan whose weighing and count take (source, target resistance, edge angle, theory[, N])."""
    target = target_for(request)
    theory = design.THEORIES[request.theory]
    inputs = (request.source_ohm, target.resistance_ohm, target.edge_angle_rad, theory)

    def weighed(sections: int) -> design.WeightedDesign:
        return weigh(*inputs, sections)

    return Plan(
        method,
        request.theory,
        request,
        target,
        lambda sections: design.stepped_many([weighed(sections)])[0],
        lambda: count(*inputs),
        request.sections,
        weighed,
    )


def quarter_wave(request: QuarterWaveRequest, options: DesignOptions | None = None) -> TransformerDesign:
    """One quarter-wave section, checked."""
    return designed(plan_quarter_wave(request), options)


def binomial(request: TransformerRequest, options: DesignOptions | None = None) -> TransformerDesign:
    """A binomial design, checked."""
    return designed(plan_binomial(request), options)


def chebyshev(request: TransformerRequest, options: DesignOptions | None = None) -> TransformerDesign:
    """A Chebyshev design, checked."""
    return designed(plan_chebyshev(request), options)


def designed(plan: Plan, options: DesignOptions | None, first: TransformerDesign | None = None) -> TransformerDesign:
    """The design at the requested N, or the smallest N that the exact cascade says meets the spec.

    The theory's N is tried first (or `first`, its already-checked design); where the exact
    cascade misses the spec, N grows until it meets it (or the section limit is reached), and a
    warning says so. For loads that change with frequency the theory's N is kept and refined.
    """
    theory_sections = plan.theory_sections()
    result = first or _finished(plan, theory_sections, (), options)
    if plan.sections is not None or plan.target.load.frequency_dependent:
        return result  # refined designs keep the theory's count: each refinement takes up to seconds
    sections = theory_sections
    while not result.verified.meets_spec and sections < MAX_SECTIONS:
        sections += 1
        note = (
            f"The {plan.theory} theory asks for {theory_sections} sections; the exact cascade "
            f"needed {sections} to meet the spec."
        )
        result = _finished(plan, sections, (note,), options)
    return result


def _finished(plan: Plan, sections: int, notes: tuple[str, ...], options: DesignOptions | None) -> TransformerDesign:
    return finish_many([plan.job(sections, notes)], options)[0]
