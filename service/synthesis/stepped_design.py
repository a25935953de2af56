"""The plain result of stepped-line synthesis, shared by every stepped method."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from numpy.typing import ArrayLike

QUARTER_WAVE_RAD = math.pi / 2


@dataclass(frozen=True)
class SteppedDesign:
    """Section impedances and electrical lengths at the centre frequency (source side first),
    with what the synthesis theory predicts.

    `predicted_max_reflection` is the theory's largest |reflection| over the requested band and
    `predicted_bandwidth_fraction` the theory's fractional bandwidth (see each method).
    """

    impedances_ohm: np.ndarray
    electrical_length_rad: np.ndarray
    predicted_max_reflection: float
    predicted_bandwidth_fraction: float
    notes: tuple[str, ...] = ()

    @classmethod
    def quarter_waves(
        cls, impedances_ohm: np.ndarray, predicted: float, fraction: float, notes: tuple[str, ...] = ()
    ) -> SteppedDesign:
        """A design whose sections are all a quarter wave long at the centre frequency."""
        lengths = np.full(impedances_ohm.shape, QUARTER_WAVE_RAD)
        return cls(impedances_ohm, lengths, predicted, fraction, notes)


def load_reflection(source_ohm: float, load_ohm: float) -> float:
    """Reflection coefficient of the bare load seen from the source line (real impedances)."""
    return (load_ohm - source_ohm) / (load_ohm + source_ohm)


def band_edge_angle_rad(start_hz: float, stop_hz: float) -> float:
    """Electrical length of a centre-frequency quarter wave at the lower band edge.

    The centre is the arithmetic mean, so the upper edge sits symmetrically at pi minus this.
    """
    center_hz = 0.5 * (start_hz + stop_hz)
    return QUARTER_WAVE_RAD * start_hz / center_hz


def fraction_from_edge_angle(edge_angle_rad: float) -> float:
    """Fractional bandwidth (delta f / f0) of the band whose lower edge has this electrical length."""
    return 2.0 - 4.0 * edge_angle_rad / math.pi


def impedances_from_weights(source_ohm: ArrayLike, load_ohm: ArrayLike, weights: np.ndarray) -> np.ndarray:
    """Section impedances from the junction reflection weights, in the logarithmic form.

    ln(Z[n+1]/Z[n]) is proportional to weights[n]; the weights are normalized so the steps add
    up to ln(ZL/Z0) exactly. A symmetric weight sequence therefore gives Z[n] Z[N+1-n] = Z0 ZL.
    Vectorized like the exact theory: sources and loads (...) with weights (..., N+1).
    """
    source, load = np.asarray(source_ohm, dtype=float), np.asarray(load_ohm, dtype=float)
    shares = np.cumsum(weights / np.sum(weights, axis=-1, keepdims=True), axis=-1)[..., :-1]
    return source[..., None] * np.exp(np.log(load / source)[..., None] * shares)
