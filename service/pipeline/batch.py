"""Many designs at once: synthesize each, check them all in stacked cascades, then fix up the few
spec-driven designs whose exact check asks for more sections (or tapers, which need their own loop)."""

from __future__ import annotations

from service.errors import UnmeetableRequestError
from service.pipeline.items import Item, design_item
from service.pipeline.options import DesignOptions
from service.pipeline.stepped_flow import Plan, designed, jobs_for, plan_binomial, plan_chebyshev, plan_quarter_wave
from service.pipeline.verify import finish_many
from service.schemas.bulk import DesignSummary
from service.schemas.items import BinomialItem, ChebyshevItem, QuarterWaveItem
from service.schemas.results import TransformerDesign

PLANNERS = {QuarterWaveItem: plan_quarter_wave, BinomialItem: plan_binomial, ChebyshevItem: plan_chebyshev}

Outcome = TransformerDesign | DesignSummary | UnmeetableRequestError


def design_batch(items: list[Item], options: DesignOptions | None = None, summaries: bool = False) -> list[Outcome]:
    """The design (or the reason it cannot be made) of every item, in order.

    With `summaries`, stepped designs checked in the first pass come back as curve-less summaries
    (see finish_many); designs that needed another pass, and tapers, come back whole.
    """
    outcomes: list[Outcome | None] = [None] * len(items)
    planned: list[tuple[int, Plan]] = []
    for index, item in enumerate(items):
        planner = PLANNERS.get(type(item))
        try:
            if planner is None:
                outcomes[index] = design_item(item, options)
            else:
                planned.append((index, planner(item)))
        except UnmeetableRequestError as exc:
            outcomes[index] = exc
    for (index, _), outcome in zip(planned, design_plans([p for _, p in planned], options, summaries), strict=True):
        outcomes[index] = outcome
    return outcomes


def design_plans(plans: list[Plan], options: DesignOptions | None = None, summaries: bool = False) -> list[Outcome]:
    """The design of every plan, their first exact checks run together; errors stay with their plan."""
    outcomes: list[Outcome | None] = [None] * len(plans)
    ready: list[int] = []
    counts: list[int] = []
    for index, plan in enumerate(plans):
        try:
            counts.append(plan.theory_sections())
            ready.append(index)
        except UnmeetableRequestError as exc:
            outcomes[index] = exc
    checked = finish_many(jobs_for([plans[i] for i in ready], counts), options, summaries)
    for index, first in zip(ready, checked, strict=True):
        try:
            outcomes[index] = first if isinstance(first, Exception) else designed(plans[index], options, first)
        except UnmeetableRequestError as exc:  # a later pass with more sections that cannot be realized
            outcomes[index] = exc
    return outcomes
