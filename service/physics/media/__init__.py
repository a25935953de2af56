"""Physical realization of line sections: ideal line, microstrip, stripline, coax."""

from service.physics.media.base import LineParameters, Medium, RealizationError
from service.physics.media.coax import CoaxLine
from service.physics.media.ideal import IdealLine
from service.physics.media.microstrip import MicrostripLine
from service.physics.media.stripline import StriplineLine

__all__ = [
    "CoaxLine",
    "IdealLine",
    "LineParameters",
    "Medium",
    "MicrostripLine",
    "RealizationError",
    "StriplineLine",
]
