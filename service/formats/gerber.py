"""Gerber X2 (the open, published Gerber Layout Format, with X2 file attributes) of a planar design:
the copper of the strips as regions, and the board outline as a profile.

Units are millimetres, coordinates in the 4.6 format (1 nm resolution). The strip runs along x
from the board's left edge, centred on y = 0: the source feed line, the sections source side
first, then the load feed line. Each file says what it is in its attributes (FileFunction,
FilePolarity, and AperFunction on every object), so a board house's tools read the layer's role
from the file itself.
"""

from __future__ import annotations

from dataclasses import dataclass

from service import __version__

UNITS_PER_MM = 1_000_000  # the 4.6 format: six decimals of a millimetre
OUTLINE_APERTURE_MM = 0.1


@dataclass(frozen=True)
class Strip:
    """One rectangle of copper along the line: where it starts along x, its length and width (metres)."""

    start_m: float
    length_m: float
    width_m: float
    name: str


def _coordinate(metres: float) -> int:
    return round(metres * 1e3 * UNITS_PER_MM)


def _header(function: str, polarity: str = "Positive") -> list[str]:
    return [
        f"%TF.GenerationSoftware,Stepline,stepline,{__version__}*%",
        f"%TF.FileFunction,{function}*%",
        f"%TF.FilePolarity,{polarity}*%",
        "%FSLAX46Y46*%",
        "%MOMM*%",
        "%LPD*%",
    ]


def copper_layer(strips: list[Strip], layer: str) -> str:
    """The strips as copper regions on one layer (`Copper,L1,Top` for microstrip, `Copper,L2,Inr` for
    a stripline's inner strip)."""
    lines = [*_header(f"Copper,{layer}"), "%TA.AperFunction,Conductor*%"]
    for strip in strips:
        x0, x1 = _coordinate(strip.start_m), _coordinate(strip.start_m + strip.length_m)
        y0, y1 = _coordinate(-strip.width_m / 2.0), _coordinate(strip.width_m / 2.0)
        lines += [
            f"G04 {strip.name}*",
            "G36*",
            f"X{x0}Y{y0}D02*",
            "G01*",
            f"X{x1}Y{y0}D01*",
            f"X{x1}Y{y1}D01*",
            f"X{x0}Y{y1}D01*",
            f"X{x0}Y{y0}D01*",
            "G37*",
        ]
    lines += ["%TD*%", "M02*"]
    return "\n".join(lines) + "\n"


def profile_layer(length_m: float, half_height_m: float) -> str:
    """The board outline: a rectangle from x = 0 to the line's length, +-half_height about the strip."""
    x1, y0, y1 = _coordinate(length_m), _coordinate(-half_height_m), _coordinate(half_height_m)
    lines = [
        *_header("Profile,NP", "Positive"),
        "%TA.AperFunction,Profile*%",
        f"%ADD10C,{OUTLINE_APERTURE_MM:.6f}*%",
        "%TD*%",
        "D10*",
        "G01*",
        f"X0Y{y0}D02*",
        f"X{x1}Y{y0}D01*",
        f"X{x1}Y{y1}D01*",
        f"X0Y{y1}D01*",
        f"X0Y{y0}D01*",
        "M02*",
    ]
    return "\n".join(lines) + "\n"
