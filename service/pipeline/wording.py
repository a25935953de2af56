"""Numbers as an engineer reads them in a warning sentence."""

from __future__ import annotations


def hz_text(frequency_hz: float) -> str:
    """1.5e9 -> '1.5 GHz'."""
    for scale, unit in ((1e12, "THz"), (1e9, "GHz"), (1e6, "MHz"), (1e3, "kHz")):
        if abs(frequency_hz) >= scale:
            return f"{frequency_hz / scale:.6g} {unit}"
    return f"{frequency_hz:.6g} Hz"


def percent_text(fraction: float) -> str:
    """0.7132 -> '71.3%'."""
    return f"{100.0 * fraction:.3g}%"


def count_text(count: int, noun: str) -> str:
    """(1, 'section') -> '1 section'; (3, 'section') -> '3 sections'."""
    return f"{count} {noun}" if count == 1 else f"{count} {noun}s"
