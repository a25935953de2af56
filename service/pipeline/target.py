"""From a request's load and band to a checked line: the shared pipeline of every method."""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.analysis.line_cascade import LineCascade
from service.analysis.section_tables import SectionTable
from service.constants import SPEED_OF_LIGHT_M_PER_S
from service.errors import UnmeetableRequestError
from service.physics.loads import CircuitLoad, LoadModel, impedance_at
from service.physics.media import IdealLine, RealizationError
from service.schemas.results import BodeFanoFigures, ResponseCurve, VerifiedFigures
from service.schemas.transformers import MatchRequest
from service.synthesis import band_edge_angle_rad
from service.synthesis.bode_fano import bode_fano_min_reflection
from service.synthesis.reactive import RotatingSection, rotating_section

REAL_TOLERANCE = 1e-12  # |X| / |Z| below which a load counts as resistive
DEFAULT_MIN_FEATURE_M = 1e-4


@dataclass(frozen=True)
class DesignOptions:
    """Operator settings that shape warnings, passed down from the app's settings."""

    min_feature_m: float = DEFAULT_MIN_FEATURE_M


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
    center = impedance_at(load, band.center_hz)
    if not center.real > 0.0:
        raise UnmeetableRequestError("load", "the load has no positive resistance at the band centre")
    edge = band_edge_angle_rad(band.start_hz, band.stop_hz)
    if abs(center.imag) <= REAL_TOLERANCE * abs(center):
        return Target(load, center.real, None, edge)
    rotation = rotating_section(request.source_ohm, center)
    return Target(load, rotation.resistance_ohm, rotation, edge)


def line_for(request: MatchRequest, target: Target, impedances_ohm: np.ndarray, angles_rad: np.ndarray) -> LineCascade:
    """The synthesized sections, followed by the rotating section where the load needs one."""
    if target.rotation is not None:
        impedances_ohm = np.append(impedances_ohm, request.source_ohm)
        angles_rad = np.append(angles_rad, target.rotation.electrical_length_rad)
    return realize(request, target.load, impedances_ohm, angles_rad, request.band.center_hz)


def realize(
    request: MatchRequest,
    load: LoadModel,
    impedances_ohm: np.ndarray,
    angles_rad: np.ndarray,
    frequency_hz: float | np.ndarray,
) -> LineCascade:
    """Sections of these impedances and electrical lengths (each at its frequency) in the request's medium.

    The geometry is found for the impedance at the band centre; each length makes the section's
    electrical length right at its frequency, with the medium's effective permittivity there.
    """
    medium = request.medium_model()
    try:
        geometry = medium.geometry_for(impedances_ohm, request.band.center_hz)
    except RealizationError as exc:
        raise UnmeetableRequestError("medium", str(exc)) from exc
    frequencies = np.asarray(frequency_hz, dtype=float) * np.ones(np.shape(geometry))
    eps = medium.parameters(geometry, frequencies).eps_eff  # each section at its own frequency
    lengths = np.asarray(angles_rad) * SPEED_OF_LIGHT_M_PER_S / (2.0 * np.pi * frequencies * np.sqrt(eps))
    return LineCascade(request.source_ohm, load, medium, geometry, lengths)


def quarter_wave_m(line: LineCascade, frequency_hz: float) -> float:
    """A representative quarter wavelength on the line (at the mean permittivity of its sections)."""
    eps = float(np.mean(line.eps_eff_at(frequency_hz)))
    return SPEED_OF_LIGHT_M_PER_S / (4.0 * frequency_hz * np.sqrt(eps))


def bode_fano_figures(load: LoadModel, request: MatchRequest, verified: VerifiedFigures) -> BodeFanoFigures | None:
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


def checked_blocks(
    line: LineCascade,
    request: MatchRequest,
    verified: VerifiedFigures,
    curve: ResponseCurve | None,
    table: SectionTable,
    options: DesignOptions,
) -> dict[str, object]:
    """The response blocks every verified result shares, and the medium's own notes."""
    band = request.band
    medium = line.medium
    return {
        "center_hz": band.center_hz,
        "sections": table.sections,
        "total_length_m": float(line.lengths_m.sum()),
        "junctions": table.junctions,
        "verified": verified,
        "response": curve,
        "velocity_factor": medium.velocity_factor if isinstance(medium, IdealLine) else None,
        "medium": medium.kind,
        "bode_fano": bode_fano_figures(line.load, request, verified),
        "medium_notes": medium.notes(line.geometry, band.start_hz, band.stop_hz, options.min_feature_m),
    }
