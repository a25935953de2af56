"""Tapered lines: resolve the length, synthesize the discretized profile, check, report."""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from service.constants import SMALL_REFLECTION, SPEED_OF_LIGHT_M_PER_S
from service.errors import UnmeetableRequestError
from service.physics.loads import impedance_at
from service.pipeline.options import DesignOptions
from service.pipeline.realize import centre_eps_eff
from service.pipeline.search_rule import MIN_GAIN, gains_enough, with_note
from service.pipeline.target import Target, target_for
from service.pipeline.verify import verify_design
from service.schemas.results import TransformerDesign
from service.schemas.tapers import TaperRequest
from service.synthesis import SteppedDesign
from service.synthesis.multisection import InfeasibleDesignError
from service.synthesis.tapers import taper

MAX_STRETCHES = 12  # times the spec-driven length may be corrected by the exact cascade
MIN_DESIGN_FRACTION = 1e-3  # the theoretical reflection a taper is designed for never goes below this x spec


def tapered(request: TaperRequest, options: DesignOptions | None = None) -> TransformerDesign:
    """A discretized exponential, triangular or Klopfenstein taper.

    Spec-driven tapers start at the theory's shortest length; where the exact cascade misses
    the spec (small-reflection theory is optimistic for large ratios; a reactive load's match
    is narrow) the taper is redesigned for a proportionally tighter theoretical reflection. It
    is lengthened only while each step lowers the verified worst reflection by at least
    MIN_GAIN; otherwise the shortest taper that reached the best value is returned.
    For a reactive load the taper into the rotated load is tried beside tapers straight into the
    load's centre resistance and magnitude; the shortest that meets the spec, or else the best, wins.
    """
    target = target_for(request)
    candidates = [_for_target(request, target, options)]
    if target.rotation is not None:  # over a wide band a taper straight into the load can do better
        center = impedance_at(target.load, request.band.center_hz)
        for resistance in (center.real, abs(center)):
            try:
                candidates.append(_for_target(request, target.unrotated(resistance), options))
            except UnmeetableRequestError:
                continue  # e.g. that resistance already within the spec: no taper of its own
    meeting = [c for c in candidates if c.verified.meets_spec]
    if meeting:
        return min(meeting, key=lambda c: c.total_length_m)
    return min(candidates, key=lambda c: c.verified.max_reflection)


def _for_target(request: TaperRequest, target: Target, options: DesignOptions | None) -> TransformerDesign:
    """The taper into one target: of the requested length, or by spec."""
    if request.length_m is not None:
        return _taper(request, target, _edge_length_rad(request, target), None, [], options)
    spec = request.spec_reflection
    design_reflection = spec
    best = _taper(request, target, None, design_reflection, [], options)
    for _ in range(MAX_STRETCHES):
        if best.verified.meets_spec or design_reflection <= spec * MIN_DESIGN_FRACTION:
            return best
        design_reflection = max(
            design_reflection * 0.98 * spec / best.verified.max_reflection, spec * MIN_DESIGN_FRACTION
        )
        note = (
            f"The theory's shortest taper missed the spec on the exact cascade; this one is designed "
            f"for a theoretical {design_reflection:.4g} to meet {spec:.4g}."
        )
        candidate = _taper(request, target, None, design_reflection, [note], options)
        if candidate.verified.meets_spec:
            return candidate
        if not gains_enough(candidate.verified.max_reflection, best.verified.max_reflection):
            break
        best = candidate
    note = (
        f"The best this {request.profile} taper reaches is {best.verified.max_reflection:.4g} at "
        f"{best.total_length_m:.4g} m; a longer taper lowered it by less than {MIN_GAIN:.0%}, "
        f"so the spec {spec:.4g} is not met."
    )
    return with_note(best, note)


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
    if request.length_m is not None:
        synthesized = _equal_physical_steps(request, synthesized, request.length_m)
    result = verify_design("taper", SMALL_REFLECTION, request, target, synthesized, notes, options)
    return result.model_copy(update={"profile": request.profile})


def _edge_length_rad(request: TaperRequest, target: Target) -> float:
    """beta L at the lower band edge of a taper of the requested length, with the eps_eff of the
    medium at the band centre for the taper's middle impedance sqrt(Z0 RL)."""
    eps = float(centre_eps_eff(request, np.array([math.sqrt(request.source_ohm * target.resistance_ohm)]))[0])
    return 2.0 * math.pi * request.band.start_hz * math.sqrt(eps) * request.length_m / SPEED_OF_LIGHT_M_PER_S


def _equal_physical_steps(request: TaperRequest, synthesized: SteppedDesign, length_m: float) -> SteppedDesign:
    """The steps cut to equal physical lengths adding up to length_m: each step's electrical length
    from its own eps_eff at the band centre (in microstrip the permittivity changes along a taper)."""
    eps = centre_eps_eff(request, synthesized.impedances_ohm)
    step_m = length_m / synthesized.impedances_ohm.size
    angles = 2.0 * math.pi * request.band.center_hz * np.sqrt(eps) * step_m / SPEED_OF_LIGHT_M_PER_S
    return replace(synthesized, electrical_length_rad=angles)
