"""Quarter-wave, binomial and Chebyshev designs: resolve the request, synthesize, check, report."""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, replace

from service import synthesis
from service.constants import MAX_SECTIONS
from service.errors import UnmeetableRequestError
from service.pipeline.options import DesignOptions
from service.pipeline.search_rule import MIN_GAIN, gains_enough, with_note
from service.pipeline.target import Target, target_for
from service.pipeline.verify import PendingCheck, verify_one
from service.pipeline.wording import count_text
from service.schemas.bulk import DesignSummary
from service.schemas.results import TransformerDesign
from service.schemas.transformers import MatchRequest, QuarterWaveRequest, TransformerRequest
from service.synthesis.multisection import InfeasibleDesignError

MAX_REFINED_SECTIONS = 8  # refined designs: each count costs a refinement of up to two seconds

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
    ripple = request.spec_reflection if request.sections is not None and request.spec_given else None
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
    """The design at the requested N, or by spec the shortest design the exact cascade finds best.

    The theory's N is tried first (or `first`, its already-checked design or summary). Where the
    exact cascade misses the spec, N grows while each added section lowers the verified worst
    reflection by at least MIN_GAIN; the search ends at the first design that meets
    the spec, or returns the shortest design that reached the best value found, and says so.
    """
    theory_sections = recipe.theory_sections()
    best = first or _verified_at(recipe, theory_sections, (), options)
    if recipe.sections is not None or best.verified.meets_spec:
        return best
    refined = not recipe.target.resistive
    ceiling = MAX_REFINED_SECTIONS if refined else MAX_SECTIONS
    sections = theory_sections
    while sections < ceiling:
        sections += 1
        candidate = _verified_at(recipe, sections, (), options)
        if candidate.verified.meets_spec:
            extra = len(candidate.sections) - sections  # a rotating section, for a reactive load
            asked = count_text(theory_sections + extra, "section") + (" (with the rotating section)" if extra else "")
            note = (
                f"The {recipe.theory} theory asks for {asked}; the exact cascade needed "
                f"{len(candidate.sections)} to meet the spec."
            )
            return with_note(candidate, note)
        if not gains_enough(candidate.verified.max_reflection, best.verified.max_reflection):
            break
        best = candidate
    return with_note(best, _best_found_note(recipe, best, sections >= ceiling))


def _best_found_note(recipe: SteppedRecipe, best: TransformerDesign | DesignSummary, at_ceiling: bool) -> str:
    count = len(best.sections)
    why = (
        f"the search stops at {count_text(count, 'section')}"
        if at_ceiling
        else f"one more section lowered it by less than {MIN_GAIN:.0%}"
    )
    bound = (
        f" The Bode-Fano bound for this load and band is {best.bode_fano.min_reflection:.4g}."
        if (getattr(best, "bode_fano", None) is not None)
        else ""
    )
    return (
        f"The best this {recipe.method} design reaches is {best.verified.max_reflection:.4g} with "
        f"{count_text(count, 'section')} ({why}); the spec {best.verified.spec_max_reflection:.4g} "
        f"is not met.{bound}"
    )


def _verified_at(
    recipe: SteppedRecipe, sections: int, notes: tuple[str, ...], options: DesignOptions | None
) -> TransformerDesign:
    return verify_one(recipe.pending_check(sections, notes), options)
