"""Pure synthesis of matching transformers: floats and arrays in, plain dataclasses out."""

from service.synthesis.multisection import (
    InfeasibleDesignError,
    WeightedDesign,
    binomial,
    binomial_sections_for,
    chebyshev,
    chebyshev_sections_for,
    quarter_wave,
    stepped_many,
)
from service.synthesis.stepped_design import SteppedDesign, band_edge_angle_rad, load_reflection
from service.synthesis.theory import EXACT, SMALL_REFLECTION, THEORIES, Theory

__all__ = [
    "EXACT",
    "SMALL_REFLECTION",
    "THEORIES",
    "InfeasibleDesignError",
    "SteppedDesign",
    "Theory",
    "WeightedDesign",
    "band_edge_angle_rad",
    "binomial",
    "binomial_sections_for",
    "chebyshev",
    "chebyshev_sections_for",
    "load_reflection",
    "quarter_wave",
    "stepped_many",
]
