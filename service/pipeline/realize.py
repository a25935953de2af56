"""From section impedances and electrical lengths to a line in the request's medium."""

from __future__ import annotations

import numpy as np

from service.analysis.line_cascade import LineCascade
from service.constants import SPEED_OF_LIGHT_M_PER_S
from service.errors import UnmeetableRequestError
from service.physics.loads import LoadModel
from service.physics.media import RealizationError
from service.pipeline.request_models import medium_model
from service.pipeline.target import Target
from service.schemas.transformers import MatchRequest


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
    return realize_geometry(request, load, geometry_for(request, impedances_ohm), angles_rad, frequency_hz)


def realize_geometry(
    request: MatchRequest,
    load: LoadModel,
    geometry: np.ndarray,
    angles_rad: np.ndarray,
    frequency_hz: float | np.ndarray,
) -> LineCascade:
    """Sections of these geometries (widths, diameters; impedances on the ideal line) whose lengths
    give these electrical lengths, each at its frequency."""
    medium = medium_model(request)
    frequencies = np.asarray(frequency_hz, dtype=float) * np.ones(np.shape(geometry))
    eps = medium.parameters(geometry, frequencies).eps_eff  # each section at its own frequency
    lengths = np.asarray(angles_rad) * SPEED_OF_LIGHT_M_PER_S / (2.0 * np.pi * frequencies * np.sqrt(eps))
    return LineCascade(request.source_ohm, load, medium, geometry, lengths)


def geometry_for(request: MatchRequest, impedances_ohm: np.ndarray) -> np.ndarray:
    """Each impedance's geometry in the request's medium at the band centre; a 422 on `medium`
    where the medium cannot realize one."""
    try:
        return medium_model(request).geometry_for(np.asarray(impedances_ohm, dtype=float), request.band.center_hz)
    except RealizationError as exc:
        raise UnmeetableRequestError("medium", str(exc)) from exc


def feed_geometry(request: MatchRequest) -> float:
    """The source's feed line in the request's medium (a line of the source impedance): the first
    junction step is between it and section 1."""
    return float(geometry_for(request, np.array([request.source_ohm]))[0])


def centre_eps_eff(request: MatchRequest, impedances_ohm: np.ndarray) -> np.ndarray:
    """Each impedance's effective permittivity in the request's medium at the band centre."""
    geometry = geometry_for(request, impedances_ohm)
    centre = np.full((1, geometry.size), request.band.center_hz)
    return medium_model(request).parameters(geometry, centre).eps_eff[0]


def quarter_wave_m(line: LineCascade, frequency_hz: float) -> float:
    """A representative quarter wavelength on the line (at the mean permittivity of its sections)."""
    eps = float(np.mean(line.eps_eff_at(frequency_hz)))
    return SPEED_OF_LIGHT_M_PER_S / (4.0 * frequency_hz * np.sqrt(eps))
