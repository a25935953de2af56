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

from service import constants
from service.synthesis.exact import impedances_by_layer_peeling
from service.synthesis.stepped_design import impedances_from_weights


@dataclass(frozen=True)
class Theory:
    """How a theory measures reflection and how it builds impedances from junction weights."""

    name: str
    shaped_from_reflection: Callable[[float], float]
    reflection_from_shaped: Callable[[float], float]
    impedances: Callable[[float, float, np.ndarray], np.ndarray]
    load_level: Callable[[float, float], float]  # (source, load) -> the step's level in the shaped measure


def _identity(value: float) -> float:
    return value


def _loss_measure(reflection: float) -> float:
    """|Gamma| -> |Gamma| / sqrt(1 - |Gamma|^2), the square root of (power loss ratio - 1); infinite
    where |Gamma| rounds to 1."""
    remainder = 1.0 - reflection * reflection
    return math.inf if remainder <= 0.0 else reflection / math.sqrt(remainder)


def _loss_unmeasure(measure: float) -> float:
    return measure / math.sqrt(1.0 + measure * measure)


def _log_step_level(source_ohm: float, load_ohm: float) -> float:
    """|ln(ZL/Z0)| / 2: the whole step as the logarithmic impedance form sums it, so that an
    equal-ripple level set from it is the level the impedances then give (the textbook form)."""
    return abs(math.log(load_ohm / source_ohm)) / 2.0


def _loss_step_level(source_ohm: float, load_ohm: float) -> float:
    """|rho| / sqrt(1 - rho^2) of the bare step, the quantity layer peeling matches exactly."""
    return _loss_measure(abs((load_ohm - source_ohm) / (load_ohm + source_ohm)))


SMALL_REFLECTION = Theory(constants.SMALL_REFLECTION, _identity, _identity, impedances_from_weights, _log_step_level)
EXACT = Theory(constants.EXACT, _loss_measure, _loss_unmeasure, impedances_by_layer_peeling, _loss_step_level)
THEORIES = {theory.name: theory for theory in (SMALL_REFLECTION, EXACT)}
