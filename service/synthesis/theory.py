"""The two synthesis theories, as the two things in which they differ.

Small-reflection theory shapes the reflection itself: |Gamma(theta)| = |rho| F(theta). The exact
theory shapes the insertion-loss function instead: |Gamma|/sqrt(1 - |Gamma|^2) =
(|rho|/sqrt(1 - rho^2)) F(theta). Both then turn the same junction weights into impedances,
the first in the logarithmic form, the second by exact layer peeling.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from service.synthesis.exact import impedances_by_layer_peeling
from service.synthesis.stepped_design import impedances_from_weights


@dataclass(frozen=True)
class Theory:
    """How a theory measures reflection and how it builds impedances from junction weights."""

    name: str
    measure: Callable[[float], float]
    unmeasure: Callable[[float], float]
    impedances: Callable[[float, float, np.ndarray], np.ndarray]


def _identity(value: float) -> float:
    return value


def _loss_measure(reflection: float) -> float:
    """|Gamma| -> |Gamma| / sqrt(1 - |Gamma|^2), the square root of (power loss ratio - 1)."""
    return reflection / math.sqrt(1.0 - reflection * reflection)


def _loss_unmeasure(measure: float) -> float:
    return measure / math.sqrt(1.0 + measure * measure)


SMALL_REFLECTION = Theory("small-reflection", _identity, _identity, impedances_from_weights)
EXACT = Theory("exact", _loss_measure, _loss_unmeasure, impedances_by_layer_peeling)
THEORIES = {theory.name: theory for theory in (SMALL_REFLECTION, EXACT)}
