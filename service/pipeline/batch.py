"""Many designs at once: synthesize each, check them all in stacked cascades, then fix up the few
spec-driven designs whose exact check asks for more sections (or tapers, which need their own loop)."""

from __future__ import annotations

from service.errors import UnmeetableRequestError
from service.pipeline.items import Item, design_item
from service.pipeline.options import DesignOptions
from service.pipeline.stepped_flow import (
    SteppedRecipe,
    binomial_recipe,
    chebyshev_recipe,
    design_to_spec,
    pending_checks,
    quarter_wave_recipe,
)
from service.pipeline.verify import DesignOutcome, verify_many
from service.schemas.items import BinomialItem, ChebyshevItem, QuarterWaveItem

PLANNERS = {QuarterWaveItem: quarter_wave_recipe, BinomialItem: binomial_recipe, ChebyshevItem: chebyshev_recipe}


def design_batch(
    items: list[Item], options: DesignOptions | None = None, summaries: bool = False
) -> list[DesignOutcome]:
    """The design (or the reason it cannot be made) of every item, in order.

    With `summaries`, stepped designs checked in the first pass come back as curve-less summaries
    (see verify_many); designs that needed another pass, and tapers, come back whole.
    """
    outcomes: list[DesignOutcome | None] = [None] * len(items)
    planned: list[tuple[int, SteppedRecipe]] = []
    for index, item in enumerate(items):
        planner = PLANNERS.get(type(item))
        try:
            if planner is None:
                outcomes[index] = design_item(item, options)
            else:
                planned.append((index, planner(item)))
        except UnmeetableRequestError as exc:
            outcomes[index] = exc
    for (index, _), outcome in zip(planned, design_recipes([p for _, p in planned], options, summaries), strict=True):
        outcomes[index] = outcome
    return outcomes


def design_recipes(
    recipes: list[SteppedRecipe], options: DesignOptions | None = None, summaries: bool = False
) -> list[DesignOutcome]:
    """The design of every recipe, their first exact checks run together; errors stay with their recipe."""
    outcomes: list[DesignOutcome | None] = [None] * len(recipes)
    ready: list[int] = []
    counts: list[int] = []
    for index, recipe in enumerate(recipes):
        try:
            counts.append(recipe.theory_sections())
            ready.append(index)
        except UnmeetableRequestError as exc:
            outcomes[index] = exc
    checked = verify_many(pending_checks([recipes[i] for i in ready], counts), options, summaries)
    for index, first in zip(ready, checked, strict=True):
        try:
            outcomes[index] = first if isinstance(first, Exception) else design_to_spec(recipes[index], options, first)
        except UnmeetableRequestError as exc:  # a later pass with more sections that cannot be realized
            outcomes[index] = exc
    return outcomes
