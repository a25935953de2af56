"""Quarter-wave, binomial and Chebyshev designs: resolve the request, synthesize, check, report."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, replace

from service import synthesis
from service.constants import MAX_SECTIONS
from service.errors import UnmeetableRequestError
from service.pipeline.options import DesignOptions
from service.pipeline.target import Target, target_for
from service.pipeline.verify import Job, finish_one
from service.schemas.bulk import DesignSummary
from service.schemas.results import TransformerDesign
from service.schemas.transformers import MatchRequest, QuarterWaveRequest, TransformerRequest
from service.synthesis.multisection import InfeasibleDesignError

Synthesized = synthesis.SteppedDesign | synthesis.WeightedDesign


@dataclass(frozen=True)
class Plan:
    """How to synthesize one stepped request at any section count.

    Multisection plans synthesize a WeightedDesign: its impedances can then be found together
    with other plans' (see jobs_for).
    """

    method: str
    theory: str
    request: MatchRequest
    target: Target
    synthesize: Callable[[int], Synthesized]
    count: Callable[[], int]
    sections: int | None  # as requested; None means: by spec

    def job(self, sections: int, notes: tuple[str, ...] = ()) -> Job:
        job = jobs_for([self], [sections])[0]
        return replace(job, notes=notes) if notes else job

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
    synthesized = [plan.synthesize(count) for plan, count in zip(plans, counts, strict=True)]
    weighted = [index for index, result in enumerate(synthesized) if isinstance(result, synthesis.WeightedDesign)]
    for index, stepped in zip(weighted, synthesis.stepped_many([synthesized[i] for i in weighted]), strict=True):
        synthesized[index] = stepped
    return [
        Job(plan.method, plan.theory, plan.request, plan.target, stepped)
        for plan, stepped in zip(plans, synthesized, strict=True)
    ]


def plan_quarter_wave(request: QuarterWaveRequest) -> Plan:
    """One quarter-wave section."""
    target = target_for(request)

    def synthesize(_: int) -> synthesis.SteppedDesign:
        return synthesis.quarter_wave(
            request.source_ohm, target.resistance_ohm, target.edge_angle_rad, request.spec_reflection
        )

    return Plan("quarter-wave", synthesis.SMALL_REFLECTION.name, request, target, synthesize, lambda: 1, 1)


def plan_binomial(request: TransformerRequest) -> Plan:
    """Maximally flat design, by section count or by spec."""
    return _multisection_plan(
        "binomial", request, synthesis.binomial, request.spec_reflection, synthesis.binomial_sections_for
    )


def plan_chebyshev(request: TransformerRequest) -> Plan:
    """Equal-ripple design.

    Sections only: ripple set by the band. Spec only: smallest N, edges on the band limits.
    Both: that N and ripple, the band following from them.
    """
    ripple = request.max_reflection if request.sections is not None else None
    return _multisection_plan("chebyshev", request, synthesis.chebyshev, ripple, synthesis.chebyshev_sections_for)


def _multisection_plan(
    method: str,
    request: TransformerRequest,
    weigh: Callable[..., synthesis.WeightedDesign],
    shape: float | None,
    count: Callable[..., int],
) -> Plan:
    """A plan from a method's weighing, weigh(source, load, N, edge angle, shape, theory), and its
    spec-driven count, count(source, load, edge angle, spec, theory); `shape` is the binomial's
    spec or the Chebyshev ripple."""
    target = target_for(request)
    theory = synthesis.THEORIES[request.theory]
    source, load, edge = request.source_ohm, target.resistance_ohm, target.edge_angle_rad
    return Plan(
        method,
        request.theory,
        request,
        target,
        lambda sections: weigh(source, load, sections, edge, shape, theory),
        lambda: count(source, load, edge, request.spec_reflection, theory),
        request.sections,
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


def designed(
    plan: Plan, options: DesignOptions | None, first: TransformerDesign | DesignSummary | None = None
) -> TransformerDesign | DesignSummary:
    """The design at the requested N, or the smallest N that the exact cascade says meets the spec.

    The theory's N is tried first (or `first`, its already-checked design or summary); where the exact
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
    return finish_one(plan.job(sections, notes), options)
