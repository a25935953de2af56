"""The impedances a design's sections may take: the request's limits or sensible defaults.

Defaults: 10 to 200 ohm, the range TEM lines are commonly built in (common practice, no source),
widened to take in the source and, for a plain resistance, the load, so that no resistive design
is ever refused by a default. In a physical medium the refinement is further held to geometries
that can be built (no feature under the minimum, no higher-order mode in the band). Limits the
request sets are hard: a theory design outside them is refused, or refined within them when the
request asks for that.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.analysis.line_cascade import LineCascade
from service.errors import UnmeetableRequestError
from service.physics.media import RealizationError
from service.pipeline.target import Target
from service.schemas.transformers import SynthesisRequest

DEFAULT_LOW_OHM = 10.0
DEFAULT_HIGH_OHM = 200.0


@dataclass(frozen=True)
class SectionLimits:
    """The lowest and highest section impedance, and whether the request set each."""

    low_ohm: float
    high_ohm: float
    low_set: bool
    high_set: bool

    def outside(self, impedances_ohm: np.ndarray) -> tuple[int, str, float, float] | None:
        """The first section outside the limits as (index, limit field, bound, impedance), or None."""
        for index, impedance in enumerate(np.asarray(impedances_ohm, dtype=float).tolist()):
            if impedance < self.low_ohm * (1.0 - 1e-9):
                return index, "min_impedance_ohm", self.low_ohm, impedance
            if impedance > self.high_ohm * (1.0 + 1e-9):
                return index, "max_impedance_ohm", self.high_ohm, impedance
        return None


def section_limits(request: SynthesisRequest, target: Target) -> SectionLimits:
    """The request's limits, with the documented defaults where it sets none."""
    span = [request.source_ohm]
    if target.resistive:
        span.append(target.resistance_ohm)
    low = request.min_impedance_ohm if request.min_impedance_ohm is not None else min(DEFAULT_LOW_OHM, *span)
    high = request.max_impedance_ohm if request.max_impedance_ohm is not None else max(DEFAULT_HIGH_OHM, *span)
    return SectionLimits(low, high, request.min_impedance_ohm is not None, request.max_impedance_ohm is not None)


def refusal(limits: SectionLimits, impedances_ohm: np.ndarray) -> UnmeetableRequestError | None:
    """The 422 for a design with a section beyond a limit the request set, else None."""
    found = limits.outside(impedances_ohm)
    if found is None:
        return None
    index, field, bound, impedance = found
    if not (limits.low_set if field == "min_impedance_ohm" else limits.high_set):
        return None
    side = "below" if field == "min_impedance_ohm" else "above"
    return UnmeetableRequestError(
        field,
        f"section {index + 1} of the design needs {impedance:.4g} ohm, {side} {field} {bound:.4g} ohm; "
        "widen the limit, or set outside_limits to 'refine' to have the design refined within it",
    )


def geometry_bounds(
    line: LineCascade, limits: SectionLimits, request: SynthesisRequest, min_feature_m: float
) -> tuple[float, float]:
    """The geometry range the refinement may use: the impedance limits, narrowed to what the medium
    can build over the band, as geometry in this medium."""
    band = request.band
    low, high = limits.low_ohm, limits.high_ohm
    built = np.array(line.medium.geometry_limits(band.stop_hz, min_feature_m))
    if np.all(np.isfinite(built)) and built[0] > 0.0:
        built_ohm = line.medium.parameters(built, np.array([[band.center_hz]])).impedance_ohm[0]
        low, high = max(low, float(np.min(built_ohm))), min(high, float(np.max(built_ohm)))
    if not low < high:
        raise UnmeetableRequestError(
            "medium",
            f"no section impedance within the limits can be built in this medium over the band "
            f"(limits {limits.low_ohm:.4g} to {limits.high_ohm:.4g} ohm)",
        )
    try:
        ends = line.medium.geometry_for(np.array([low, high]), band.center_hz)
    except RealizationError as exc:
        raise UnmeetableRequestError("medium", str(exc)) from exc
    return float(np.min(ends)), float(np.max(ends))
