"""The physical models a request's wire fields stand for: its load and the medium of its line.

Kept out of schemas/ so that the wire format depends on nothing but pydantic and the shared
constants; the Touchstone text of a load is read here, once per distinct text.
"""

from __future__ import annotations

import functools

import numpy as np

from service.errors import InvalidFieldError
from service.formats.touchstone import OnePort, TouchstoneError, read_one_port
from service.physics.loads import CircuitLoad, FixedLoad, LoadModel, TabulatedLoad
from service.physics.media import CoaxLine, IdealLine, Medium, MicrostripLine, StriplineLine
from service.schemas.loads import Load
from service.schemas.media import CoaxSpec, IdealSpec, MicrostripSpec, StriplineSpec
from service.schemas.transformers import MatchRequest


@functools.lru_cache(maxsize=16)
def _one_port(text: str) -> OnePort:
    """The parsed file; cached because compare, batches and sweeps read one text many times."""
    try:
        return read_one_port(text)
    except TouchstoneError as exc:
        raise InvalidFieldError("load.touchstone", str(exc)) from None


def load_model(load: Load) -> LoadModel:
    """The load as a function of frequency."""
    if load.circuit is not None:
        return CircuitLoad(load.circuit.kind, load.circuit.resistance_ohm, load.circuit.element_value)
    if load.measured is not None:
        return TabulatedLoad(
            np.array([p.frequency_hz for p in load.measured]),
            np.array([complex(p.resistance_ohm, p.reactance_ohm) for p in load.measured]),
        )
    if load.touchstone is not None:
        data = _one_port(load.touchstone)
        return TabulatedLoad(data.frequency_hz, data.impedance_ohm)
    return FixedLoad(load.resistance_ohm, load.reactance_ohm)


def medium_model(request: MatchRequest) -> Medium:
    """The medium the sections are realized in: the request's, or the ideal line of its velocity factor."""
    spec = request.medium
    if spec is None:
        return IdealLine(request.velocity_factor)
    if isinstance(spec, IdealSpec):
        return IdealLine(spec.velocity_factor)
    if isinstance(spec, MicrostripSpec):
        return MicrostripLine(spec.eps_r, spec.height_m, spec.thickness_m, **spec.losses())
    if isinstance(spec, StriplineSpec):
        return StriplineLine(spec.eps_r, spec.ground_spacing_m, spec.thickness_m, **spec.losses())
    if isinstance(spec, CoaxSpec):
        return CoaxLine(spec.eps_r, spec.outer_diameter_m, **spec.losses())
    raise TypeError(f"no model for medium kind {spec.kind!r}")
