"""A design's two-port S-parameters, from its sections rebuilt in the request's medium (with its steps
where the request asks for them)."""

from __future__ import annotations

import numpy as np

from service.analysis import network
from service.analysis.line_cascade import LineCascade
from service.physics.loads import impedance_at
from service.pipeline.realize import feed_geometry
from service.pipeline.request_models import load_model, medium_model
from service.schemas.results import AnalysisResult
from service.schemas.transformers import MatchRequest


def design_line(request: MatchRequest, design: AnalysisResult) -> LineCascade:
    """The design's sections as a LineCascade (geometry and lengths as the response gives them), with
    its junction steps where the request includes or compensates them, as its verified figures do."""
    medium = medium_model(request)
    name = medium.geometry_name or "impedance_ohm"
    geometry = np.array([getattr(section, name) for section in design.sections])
    lengths = np.array([section.length_m for section in design.sections])
    feed = None if request.junction_effects == "ignore" else feed_geometry(request)
    return LineCascade(request.source_ohm, load_model(request.load), medium, geometry, lengths, feed)


def two_port(request: MatchRequest, design: AnalysisResult) -> tuple[np.ndarray, np.ndarray, tuple[float, float]]:
    """(frequencies, S matrices (F, 2, 2), references): port 1 at the source, port 2 at the load resistance.

    The load resistance is the load's resistance at the band centre; for a reactive or
    frequency-dependent load the file describes the transformer alone, not its match to the load.
    """
    frequencies = np.asarray(design.response.frequency_hz)
    r1, r2 = request.source_ohm, impedance_at(load_model(request.load), request.band.center_hz).real
    abcd = design_line(request, design).abcd(frequencies)
    s11, s21 = network.s_parameters(abcd, r1, r2)
    denominator = abcd.a * r2 + abcd.b + abcd.c * r1 * r2 + abcd.d * r1
    s22 = (-abcd.a * r2 + abcd.b - abcd.c * r1 * r2 + abcd.d * r1) / denominator
    s12 = s21 * (abcd.a * abcd.d - abcd.b * abcd.c)
    matrices = np.stack([np.stack([s11, s12], axis=-1), np.stack([s21, s22], axis=-1)], axis=-2)
    return frequencies, matrices, (r1, r2)
