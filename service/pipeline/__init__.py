"""Orchestration: synthesize with synthesis/, realize in a medium, check with analysis/, and compare the two.

The only package that calls both the synthesis theory and the independent network analysis.
"""

from service.pipeline.analyze import analyze
from service.pipeline.compare import compare, compare_items
from service.pipeline.items import design_item
from service.pipeline.layout import layout_files
from service.pipeline.stepped_flow import binomial, chebyshev, quarter_wave
from service.pipeline.taper_flow import tapered
from service.pipeline.yield_flow import yield_analysis

__all__ = [
    "analyze",
    "binomial",
    "chebyshev",
    "compare",
    "compare_items",
    "design_item",
    "layout_files",
    "quarter_wave",
    "tapered",
    "yield_analysis",
]
