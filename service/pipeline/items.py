"""Design any method from a request that names it."""

from __future__ import annotations

from pydantic import TypeAdapter

from service.pipeline.options import DesignOptions
from service.pipeline.stepped_flow import binomial, chebyshev, quarter_wave
from service.pipeline.taper_flow import tapered
from service.schemas.items import BinomialItem, ChebyshevItem, DesignItem, QuarterWaveItem, TaperItem
from service.schemas.results import TransformerDesign

DESIGNERS = {
    QuarterWaveItem: quarter_wave,
    BinomialItem: binomial,
    ChebyshevItem: chebyshev,
    TaperItem: tapered,
}


Item = QuarterWaveItem | BinomialItem | ChebyshevItem | TaperItem
ITEM_ADAPTER: TypeAdapter = TypeAdapter(DesignItem)  # a raw dict naming its method -> its request model


def design_item(item: Item, options: DesignOptions | None = None) -> TransformerDesign:
    """The design of the method the item names."""
    return DESIGNERS[type(item)](item, options)
