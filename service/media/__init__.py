"""Physical realization of line sections: ideal line, microstrip, stripline, coax."""

from service.media.base import LineParameters, Medium, RealizationError
from service.media.coax import CoaxLine
from service.media.ideal import IdealLine
from service.media.microstrip import MicrostripLine
from service.media.stripline import StriplineLine

__all__ = [
    "CoaxLine",
    "IdealLine",
    "LineParameters",
    "Medium",
    "MicrostripLine",
    "RealizationError",
    "StriplineLine",
]
