"""Tapered lines: resolve the length, synthesize the discretized profile, check, report."""

from __future__ import annotations

import math

from service.constants import SMALL_REFLECTION, SPEED_OF_LIGHT_M_PER_S
from service.errors import UnmeetableRequestError
from service.pipeline.options import DesignOptions
from service.pipeline.target import Target, target_for
from service.pipeline.verify import verify_design
from service.schemas.results import TransformerDesign
from service.schemas.tapers import TaperRequest
from service.synthesis.multisection import InfeasibleDesignError
from service.synthesis.tapers import taper

MAX_STRETCHES = 12  # times the spec-driven length may be corrected by the exact cascade


def tapered(request: TaperRequest, options: DesignOptions | None = None) -> TransformerDesign:
    """A discretized exponential, triangular or Klopfenstein taper.

    Spec-driven tapers start at the theory's shortest length; where the exact cascade misses
    the spec (small-reflection theory is optimistic for large ratios) the taper is redesigned
    for a proportionally tighter theoretical reflection until the cascade meets the spec.
    """
    target = target_for(request)
    if request.length_m is not None:
        beta_start = 2.0 * math.pi * request.band.start_hz / (request.velocity_factor * SPEED_OF_LIGHT_M_PER_S)
        return _taper(request, target, beta_start * request.length_m, None, [], options)
    spec = request.spec_reflection
    design_reflection = spec
    result = _taper(request, target, None, design_reflection, [], options)
    for _ in range(MAX_STRETCHES):
        if result.verified.meets_spec or target.load.frequency_dependent:
            break  # a refined taper is not stretched: each refinement takes up to seconds
        design_reflection *= 0.98 * spec / result.verified.max_reflection
        note = (
            f"The theory's shortest taper missed the spec on the exact cascade; this one is designed "
            f"for a theoretical {design_reflection:.4g} to meet {spec:.4g}."
        )
        result = _taper(request, target, None, design_reflection, [note], options)
    return result


def _taper(
    request: TaperRequest,
    target: Target,
    edge_length_rad: float | None,
    design_reflection: float | None,
    notes: list[str],
    options: DesignOptions | None,
) -> TransformerDesign:
    band = request.band
    try:
        synthesized = taper(
            request.source_ohm,
            target.resistance_ohm,
            request.profile,
            request.segments,
            band.start_hz / band.center_hz,
            edge_length_rad,
            request.spec_reflection,
            design_reflection,
        )
    except InfeasibleDesignError as exc:
        raise UnmeetableRequestError("max_reflection", str(exc)) from exc
    result = verify_design("taper", SMALL_REFLECTION, request, target, synthesized, notes, options)
    return result.model_copy(update={"profile": request.profile})
