"""Orchestration: synthesize with design/, check with the exact cascade, and compare the two.

The only package that calls both the synthesis theory and the independent network analysis.
"""

from service.designer.analysis import analyze
from service.designer.comparison import compare
from service.designer.items import design_item
from service.designer.stepped import binomial, chebyshev, quarter_wave
from service.designer.tapered import tapered
from service.designer.tolerance_analysis import yield_analysis

__all__ = [
    "analyze",
    "binomial",
    "chebyshev",
    "compare",
    "design_item",
    "quarter_wave",
    "tapered",
    "yield_analysis",
]
