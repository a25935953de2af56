"""Design any method from a request that names it."""

from __future__ import annotations

from service.pipeline.options import DesignOptions
from service.pipeline.stepped_flow import binomial, chebyshev, quarter_wave
from service.pipeline.taper_flow import tapered
from service.schemas.items import BinomialItem, ChebyshevItem, QuarterWaveItem, TaperItem
from service.schemas.results import TransformerDesign

DESIGNERS = {
    QuarterWaveItem: quarter_wave,
    BinomialItem: binomial,
    ChebyshevItem: chebyshev,
    TaperItem: tapered,
}


Item = QuarterWaveItem | BinomialItem | ChebyshevItem | TaperItem


def design_item(item: Item, options: DesignOptions | None = None) -> TransformerDesign:
    """The design of the method the item names."""
    return DESIGNERS[type(item)](item, options)
