"""Pure synthesis of matching transformers: floats and arrays in, plain dataclasses out."""

from service.design.small_reflection import (
    InfeasibleDesignError,
    binomial,
    binomial_sections_for,
    chebyshev,
    chebyshev_sections_for,
    quarter_wave,
)
from service.design.stepped import SteppedDesign, band_edge_angle_rad, load_reflection

__all__ = [
    "InfeasibleDesignError",
    "SteppedDesign",
    "band_edge_angle_rad",
    "binomial",
    "binomial_sections_for",
    "chebyshev",
    "chebyshev_sections_for",
    "load_reflection",
    "quarter_wave",
]
