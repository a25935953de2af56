"""Quarter-wave, binomial and Chebyshev designs: resolve the request, synthesize, check, report."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, replace

from service import synthesis
from service.constants import MAX_SECTIONS
from service.errors import UnmeetableRequestError
from service.pipeline.options import DesignOptions
from service.pipeline.target import Target, target_for
from service.pipeline.verify import PendingCheck, verify_one
from service.schemas.bulk import DesignSummary
from service.schemas.results import TransformerDesign
from service.schemas.transformers import MatchRequest, QuarterWaveRequest, TransformerRequest
from service.synthesis.multisection import InfeasibleDesignError

Synthesized = synthesis.SteppedDesign | synthesis.WeightedDesign


@dataclass(frozen=True)
class SteppedRecipe:
    """How to synthesize one stepped request at any section count.

    Multisection recipes synthesize a WeightedDesign: its impedances can then be found together
    with other recipes' (see pending_checks).
    """

    method: str
    theory: str
    request: MatchRequest
    target: Target
    synthesize: Callable[[int], Synthesized]
    count_for_spec: Callable[[], int]
    sections: int | None  # as requested; None means: by spec

    def pending_check(self, sections: int, notes: tuple[str, ...] = ()) -> PendingCheck:
        pending = pending_checks([self], [sections])[0]
        return replace(pending, notes=notes) if notes else pending

    def theory_sections(self) -> int:
        """The requested count, or the theory's smallest count for the spec."""
        if self.sections is not None:
            return self.sections
        try:
            return self.count_for_spec()
        except InfeasibleDesignError as exc:
            raise UnmeetableRequestError("max_reflection", str(exc)) from exc


def pending_checks(recipes: list[SteppedRecipe], counts: list[int]) -> list[PendingCheck]:
    """The pending check of every recipe at its count; multisection impedances synthesized in vectorized groups."""
    synthesized = [recipe.synthesize(count) for recipe, count in zip(recipes, counts, strict=True)]
    weighted = [index for index, result in enumerate(synthesized) if isinstance(result, synthesis.WeightedDesign)]
    for index, stepped in zip(weighted, synthesis.stepped_many([synthesized[i] for i in weighted]), strict=True):
        synthesized[index] = stepped
    return [
        PendingCheck(recipe.method, recipe.theory, recipe.request, recipe.target, stepped)
        for recipe, stepped in zip(recipes, synthesized, strict=True)
    ]


def quarter_wave_recipe(request: QuarterWaveRequest) -> SteppedRecipe:
    """One quarter-wave section."""
    target = target_for(request)

    def synthesize(_: int) -> synthesis.SteppedDesign:
        return synthesis.quarter_wave(
            request.source_ohm, target.resistance_ohm, target.edge_angle_rad, request.spec_reflection
        )

    return SteppedRecipe("quarter-wave", synthesis.SMALL_REFLECTION.name, request, target, synthesize, lambda: 1, 1)


def binomial_recipe(request: TransformerRequest) -> SteppedRecipe:
    """Maximally flat design, by section count or by spec."""
    return _multisection_recipe(
        "binomial", request, synthesis.binomial, request.spec_reflection, synthesis.binomial_sections_for
    )


def chebyshev_recipe(request: TransformerRequest) -> SteppedRecipe:
    """Equal-ripple design.

    Sections only: ripple set by the band. Spec only: smallest N, edges on the band limits.
    Both: that N and ripple, the band following from them.
    """
    ripple = request.max_reflection if request.sections is not None else None
    return _multisection_recipe("chebyshev", request, synthesis.chebyshev, ripple, synthesis.chebyshev_sections_for)


def _multisection_recipe(
    method: str,
    request: TransformerRequest,
    weigh: Callable[..., synthesis.WeightedDesign],
    level: float | None,
    count: Callable[..., int],
) -> SteppedRecipe:
    """A recipe from a method's weighing, weigh(source, load, N, edge angle, level, theory), and its
    spec-driven count, count(source, load, edge angle, spec, theory); `level` is the binomial's
    spec or the Chebyshev ripple."""
    target = target_for(request)
    theory = synthesis.THEORIES[request.theory]
    source, load, edge = request.source_ohm, target.resistance_ohm, target.edge_angle_rad
    return SteppedRecipe(
        method,
        request.theory,
        request,
        target,
        lambda sections: weigh(source, load, sections, edge, level, theory),
        lambda: count(source, load, edge, request.spec_reflection, theory),
        request.sections,
    )


def quarter_wave(request: QuarterWaveRequest, options: DesignOptions | None = None) -> TransformerDesign:
    """One quarter-wave section, checked."""
    return design_to_spec(quarter_wave_recipe(request), options)


def binomial(request: TransformerRequest, options: DesignOptions | None = None) -> TransformerDesign:
    """A binomial design, checked."""
    return design_to_spec(binomial_recipe(request), options)


def chebyshev(request: TransformerRequest, options: DesignOptions | None = None) -> TransformerDesign:
    """A Chebyshev design, checked."""
    return design_to_spec(chebyshev_recipe(request), options)


def design_to_spec(
    recipe: SteppedRecipe, options: DesignOptions | None, first: TransformerDesign | DesignSummary | None = None
) -> TransformerDesign | DesignSummary:
    """The design at the requested N, or the smallest N that the exact cascade says meets the spec.

    The theory's N is tried first (or `first`, its already-checked design or summary); where the exact
    cascade misses the spec, N grows until it meets it (or the section limit is reached), and a
    warning says so. For loads that change with frequency the theory's N is kept and refined.
    """
    theory_sections = recipe.theory_sections()
    result = first or _verified_at(recipe, theory_sections, (), options)
    if recipe.sections is not None or recipe.target.load.frequency_dependent:
        return result  # refined designs keep the theory's count: each refinement takes up to seconds
    sections = theory_sections
    while not result.verified.meets_spec and sections < MAX_SECTIONS:
        sections += 1
        note = (
            f"The {recipe.theory} theory asks for {theory_sections} sections; the exact cascade "
            f"needed {sections} to meet the spec."
        )
        result = _verified_at(recipe, sections, (note,), options)
    return result


def _verified_at(
    recipe: SteppedRecipe, sections: int, notes: tuple[str, ...], options: DesignOptions | None
) -> TransformerDesign:
    return verify_one(recipe.pending_check(sections, notes), options)
