"""Design any method from a request that names it."""

from __future__ import annotations

from service.designer.lines import DesignOptions
from service.designer.stepped import binomial, chebyshev, quarter_wave
from service.designer.tapered import tapered
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
