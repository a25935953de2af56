"""What a request asks the transformer to match: its load model, the real resistance to match at
the band centre (after a rotating section for a reactive load) and the band edge angle."""

from __future__ import annotations

from dataclasses import dataclass, replace

from service.analysis.worst_case import TOTAL_REFLECTION
from service.errors import UnmeetableRequestError
from service.physics.loads import LoadModel, impedance_at
from service.pipeline.request_models import load_model
from service.schemas.transformers import MatchRequest
from service.synthesis import band_edge_angle_rad
from service.synthesis.reactive import RotatingSection, rotating_section

REAL_TOLERANCE = 1e-12  # |X| / |Z| below which a load counts as resistive


@dataclass(frozen=True)
class Target:
    """What the transformer must match: the load's real resistance at the centre, once rotated."""

    load: LoadModel
    resistance_ohm: float
    rotation: RotatingSection | None
    edge_angle_rad: float
    resistive: bool  # a plain resistance: the theory's design is the whole answer, nothing is refined

    def unrotated(self, resistance_ohm: float) -> Target:
        """The same load matched as if it were this resistance, with no rotating section."""
        return replace(self, resistance_ohm=resistance_ohm, rotation=None)


def covered_load(request: MatchRequest) -> LoadModel:
    """The request's load model; a 422 on `band` where the band reaches beyond measured data (they
    are never extrapolated)."""
    load = load_model(request.load)
    band = request.band
    covered = load.frequency_range_hz()
    if covered is not None and (band.start_hz < covered[0] or band.stop_hz > covered[1]):
        raise UnmeetableRequestError(
            "band", f"the band reaches beyond the load data, which cover {covered[0]:g} to {covered[1]:g} Hz"
        )
    return load


def target_for(request: MatchRequest) -> Target:
    """The load model, its centre-frequency impedance turned real, and the band edge angle."""
    load = covered_load(request)
    band = request.band
    center = impedance_at(load, band.center_hz)
    if not center.real > 0.0 or abs((center - request.source_ohm) / (center + request.source_ohm)) >= TOTAL_REFLECTION:
        raise UnmeetableRequestError(
            "load",
            f"the load ({center.real:.4g}{center.imag:+.4g}j ohm at the band centre) reflects all the power "
            "it is given (|reflection| 1 to within rounding): it absorbs nothing, so no passive lossless "
            "network can match it",
        )
    edge = band_edge_angle_rad(band.start_hz, band.stop_hz)
    if abs(center.imag) <= REAL_TOLERANCE * abs(center):
        return Target(load, center.real, None, edge, not load.frequency_dependent)
    rotation = rotating_section(request.source_ohm, center)
    return Target(load, rotation.resistance_ohm, rotation, edge, False)
