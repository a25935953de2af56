"""Orchestration: synthesize with design/, check with the exact cascade, and compare the two.

The only package that calls both the synthesis theory and the independent network analysis.
"""

from service.designer.analysis import analyze
from service.designer.comparison import compare
from service.designer.stepped import binomial, chebyshev, quarter_wave
from service.designer.tapered import tapered

__all__ = ["analyze", "binomial", "chebyshev", "compare", "quarter_wave", "tapered"]
