"""From a request's load and band to a checked line: the shared pipeline of every method."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.design import band_edge_angle_rad
from service.design.bode_fano import bode_fano_min_reflection
from service.design.reactive import RotatingSection, rotating_section
from service.errors import UnmeetableRequestError
from service.loads import CircuitLoad, LoadModel
from service.schemas.results import BodeFanoFigures, SectionResult, VerifiedFigures
from service.schemas.transformers import MatchRequest
from service.verification import (
    LineCascade,
    electrical_length_deg,
    junction_results,
    length_for_angle_m,
    response_curve,
)

REAL_TOLERANCE = 1e-12  # |X| / |Z| below which a load counts as resistive


@dataclass(frozen=True)
class Target:
    """What the transformer must match: the load's real resistance at the centre, once rotated."""

    load: LoadModel
    resistance_ohm: float
    rotation: RotatingSection | None
    edge_angle_rad: float


def target_for(request: MatchRequest) -> Target:
    """The load model, its centre-frequency impedance turned real, and the band edge angle."""
    load = request.load.model()
    band = request.band
    covered = load.frequency_range_hz()
    if covered is not None and (band.start_hz < covered[0] or band.stop_hz > covered[1]):
        raise UnmeetableRequestError(
            "band", f"the band reaches beyond the load data, which cover {covered[0]:g} to {covered[1]:g} Hz"
        )
    center = complex(load.impedance_ohm(np.array([band.center_hz]))[0])
    if not center.real > 0.0:
        raise UnmeetableRequestError("load", "the load has no positive resistance at the band centre")
    edge = band_edge_angle_rad(band.start_hz, band.stop_hz)
    if abs(center.imag) <= REAL_TOLERANCE * abs(center):
        return Target(load, center.real, None, edge)
    rotation = rotating_section(request.source_ohm, center)
    return Target(load, rotation.resistance_ohm, rotation, edge)


def line_for(
    request: MatchRequest, target: Target, impedances_ohm: np.ndarray, angles_rad: np.ndarray
) -> LineCascade:
    """The synthesized sections, followed by the rotating section where the load needs one."""
    if target.rotation is not None:
        impedances_ohm = np.append(impedances_ohm, request.source_ohm)
        angles_rad = np.append(angles_rad, target.rotation.electrical_length_rad)
    lengths = length_for_angle_m(angles_rad, request.band.center_hz, request.velocity_factor)
    return LineCascade(request.source_ohm, target.load, impedances_ohm, lengths, request.velocity_factor)


def bode_fano_figures(
    load: LoadModel, request: MatchRequest, verified: VerifiedFigures
) -> BodeFanoFigures | None:
    """The Bode-Fano block for lumped loads, None for others."""
    if not isinstance(load, CircuitLoad):
        return None
    bound = bode_fano_min_reflection(
        load.kind, load.resistance_ohm, load.element_value, request.band.start_hz, request.band.stop_hz
    )
    return BodeFanoFigures(
        min_reflection=bound,
        verified_max_reflection=verified.max_reflection,
        spec_beats_bound=request.spec_reflection < bound,
    )


def checked_blocks(line: LineCascade, request: MatchRequest, verified: VerifiedFigures) -> dict[str, object]:
    """The response blocks every verified result shares."""
    center = request.band.center_hz
    degrees = electrical_length_deg(line.lengths_m, center, line.velocity_factor)
    sections = [
        SectionResult(impedance_ohm=float(z), electrical_length_deg=float(d), length_m=float(m))
        for z, d, m in zip(line.impedances_ohm, degrees, line.lengths_m, strict=True)
    ]
    return {
        "center_hz": center,
        "sections": sections,
        "total_length_m": float(np.sum(line.lengths_m)),
        "junctions": junction_results(line),
        "verified": verified,
        "response": response_curve(line, request.band.start_hz, request.band.stop_hz, request.points),
        "velocity_factor": line.velocity_factor,
        "bode_fano": bode_fano_figures(line.load, request, verified),
    }
