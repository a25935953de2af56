"""Many designs at once: synthesize each, check them all in stacked cascades, then fix up the few
spec-driven designs whose exact check asks for more sections (or tapers, which need their own loop)."""

from __future__ import annotations

from service.designer.finish import finish_many
from service.designer.items import Item, design_item
from service.designer.lines import DesignOptions
from service.designer.stepped import Plan, designed, jobs_for, plan_binomial, plan_chebyshev, plan_quarter_wave
from service.errors import UnmeetableRequestError
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
    positions: list[int] = []
    plans: list[Plan] = []
    counts: list[int] = []
    for index, item in enumerate(items):
        try:
            planner = PLANNERS.get(type(item))
            if planner is None:
                outcomes[index] = design_item(item, options)
                continue
            plan = planner(item)
            counts.append(plan.theory_sections())
            plans.append(plan)
            positions.append(index)
        except UnmeetableRequestError as exc:
            outcomes[index] = exc
    for index, plan, first in zip(
        positions, plans, finish_many(jobs_for(plans, counts), options, summaries), strict=True
    ):
        outcomes[index] = designed(plan, options, first)
    return outcomes
