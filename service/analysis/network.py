"""Exact analysis of cascaded transmission-line sections by ABCD matrices.

Independent of the synthesis code on purpose: it is the check of every design. All functions
are vectorized over frequency (and over any leading batch axes) by NumPy broadcasting.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Protocol

import numpy as np

from service.constants import SPEED_OF_LIGHT_M_PER_S


@dataclass(frozen=True)
class Abcd:
    """The four ABCD entries of a two-port, each an array over frequency (and batch axes)."""

    a: np.ndarray
    b: np.ndarray
    c: np.ndarray
    d: np.ndarray


def electrical_length_rad(length_m: np.ndarray, frequency_hz: np.ndarray, velocity_factor: float) -> np.ndarray:
    """beta * l of each section at each frequency: shape (..., frequencies, sections)."""
    wavenumber = 2.0 * np.pi * np.asarray(frequency_hz)[..., None] / (velocity_factor * SPEED_OF_LIGHT_M_PER_S)
    return wavenumber * np.asarray(length_m)[..., None, :]


def cascade(
    impedances_ohm: np.ndarray, electrical_lengths_rad: np.ndarray, losses_np: np.ndarray | None = None
) -> Abcd:
    """Product of line ABCD matrices, source side first.

    The last axis is the section; the others broadcast (e.g. impedances (sections,) or
    (frequencies, sections) against lengths (frequencies, sections), with leading batch axes).
    With `losses_np` (alpha * l of each section, nepers) the lines are lossy: cosh and sinh of
    gamma l = alpha l + j beta l replace cos and j sin; the impedances stay real (low-loss lines).
    """
    impedances = np.asarray(impedances_ohm, dtype=float)
    lengths = np.asarray(electrical_lengths_rad, dtype=float)
    if losses_np is None:
        return lossless_cascade(impedances, lengths).complex()
    shape = np.broadcast_shapes(impedances.shape, lengths.shape)
    impedances = np.broadcast_to(impedances, shape)
    gamma_l = np.broadcast_to(np.asarray(losses_np) + 1j * lengths, shape)
    cosines, sines = np.cosh(gamma_l), np.sinh(gamma_l)
    a = np.ones(shape[:-1], dtype=complex)
    b = np.zeros(shape[:-1], dtype=complex)
    c = np.zeros(shape[:-1], dtype=complex)
    d = np.ones(shape[:-1], dtype=complex)
    entries = (a, b, c, d)
    for index in range(shape[-1]):
        entries = _times_line(entries, cosines[..., index], sines[..., index], impedances[..., index])
    return Abcd(*entries)


Entries = tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray]


def _times_line(entries: Entries, cos_t: np.ndarray, sin_t: np.ndarray, z: np.ndarray) -> Entries:
    """[[a, b], [c, d]] times a line's [[cosh, Z sinh], [sinh / Z, cosh]]."""
    a, b, c, d = entries
    return a * cos_t + b * sin_t / z, a * sin_t * z + b * cos_t, c * cos_t + d * sin_t / z, c * sin_t * z + d * cos_t


def cascade_with_junctions(
    impedances_ohm: np.ndarray, gamma_l: np.ndarray, junctions: StepCircuit, omega: np.ndarray
) -> Abcd:
    """Product of lines (cosh, sinh of the complex gamma l) with a junction circuit before each:
    series inductance, shunt capacitance, series inductance (arrays over (..., F, S) like the lines)."""
    shape = np.broadcast_shapes(np.shape(impedances_ohm), np.shape(gamma_l))
    z = np.broadcast_to(impedances_ohm, shape)
    cosines, sines = np.cosh(np.broadcast_to(gamma_l, shape)), np.sinh(np.broadcast_to(gamma_l, shape))
    w = np.broadcast_to(omega, shape)
    left = 1j * w * np.broadcast_to(junctions.left_inductance_h, shape)
    shunt = 1j * w * np.broadcast_to(junctions.capacitance_f, shape)
    right = 1j * w * np.broadcast_to(junctions.right_inductance_h, shape)
    a, b, c, d = (np.full(shape[:-1], value, dtype=complex) for value in (1.0, 0.0, 0.0, 1.0))
    for index in range(shape[-1]):
        b, d = a * left[..., index] + b, c * left[..., index] + d  # series [[1, Z], [0, 1]]
        a, c = a + b * shunt[..., index], c + d * shunt[..., index]  # shunt [[1, 0], [Y, 1]]
        b, d = a * right[..., index] + b, c * right[..., index] + d
        a, b, c, d = _times_line((a, b, c, d), cosines[..., index], sines[..., index], z[..., index])
    return Abcd(a, b, c, d)


class StepCircuit(Protocol):
    """A junction's series-shunt-series circuit (physics.steps.StepElements has this shape)."""

    left_inductance_h: np.ndarray
    capacitance_f: np.ndarray
    right_inductance_h: np.ndarray


@dataclass(frozen=True)
class LosslessAbcd:
    """A lossless two-port's ABCD entries as real numbers: A = a, B = j b, C = j c, D = d."""

    a: np.ndarray
    b: np.ndarray
    c: np.ndarray
    d: np.ndarray

    def complex(self) -> Abcd:
        """The same entries as complex numbers."""
        return Abcd(self.a + 0j, 1j * self.b, 1j * self.c, self.d + 0j)


def lossless_cascade(impedances_ohm: np.ndarray, electrical_lengths_rad: np.ndarray) -> LosslessAbcd:
    """The lossless product in real arithmetic (arguments broadcast as in `cascade`).

    A lossless line's matrix is [[cos, j Z sin], [j sin / Z, cos]]; products of such matrices keep
    A and D real and B and C imaginary, so only the real numbers a, b/j, c/j, d are carried.
    The first section's matrix starts the product (every line has at least one section). Where
    every section has the same electrical length (the usual stepped transformer) the cosines and
    sines are taken once: they are most of the cost. Lengths with a last axis of one mean that
    length for every section.
    """
    impedances = np.asarray(impedances_ohm, dtype=float)
    lengths = np.asarray(electrical_lengths_rad, dtype=float)
    angles = common_lengths(lengths)
    commensurate = angles.shape[-1] == 1
    cosines, sines = np.cos(angles), np.sin(angles)
    sections = max(impedances.shape[-1], lengths.shape[-1])

    def section(index: int) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """cos, Z sin and sin / Z of one section: per-section slices, so that every product runs
        over whole frequency rows rather than broadcasting over the short section axis."""
        at = 0 if commensurate else index
        z = impedances[..., index if impedances.shape[-1] > 1 else 0]
        return cosines[..., at], sines[..., at] * z, sines[..., at] / z

    a, b, c = section(0)
    if a.shape != b.shape:  # a common length with more impedances (or designs) than lengths
        a = np.broadcast_to(a, b.shape)
    d = a
    for index in range(1, sections):
        cos_t, z_sin, sin_over_z = section(index)
        a, b, c, d = (
            a * cos_t - b * sin_over_z,
            a * z_sin + b * cos_t,
            c * cos_t + d * sin_over_z,
            d * cos_t - c * z_sin,
        )
    return LosslessAbcd(a, b, c, d)


def common_lengths(lengths: np.ndarray) -> np.ndarray:
    """The lengths with a last axis of one where every section's is the same (a commensurate line),
    else the lengths themselves."""
    if lengths.shape[-1] == 1:
        return lengths
    return lengths[..., :1] if (lengths == lengths[..., :1]).all() else lengths


def lossless_reflection(network: LosslessAbcd, load_ohm: np.ndarray, reference_ohm: float) -> np.ndarray:
    """|reflection| against a real reference looking into port 1, port 2 into the load.

    The same quantity as |reflection(input_impedance(...))| in real arithmetic: with Z_L = R + jX,
    A Z_L + B = aR + j(aX + b) and C Z_L + D = (d - cX) + j cR, and the reflection is
    (num - Z0 den) / (num + Z0 den).
    """
    load = np.asarray(load_ohm)
    r, x = load.real, load.imag
    p, q = network.a * r, network.a * x + network.b
    u, v = reference_ohm * (network.d - network.c * x), reference_ohm * (network.c * r)
    re_minus, im_minus, re_plus, im_plus = p - u, q - v, p + u, q + v
    # one square root of the ratio: np.hypot twice costs several times more on large stacks
    return np.sqrt((re_minus * re_minus + im_minus * im_minus) / (re_plus * re_plus + im_plus * im_plus))


def transducer_gain(network: Abcd, source_ohm: float, load_ohm: np.ndarray) -> np.ndarray:
    """Power delivered to the load over the power available from the source.

    V_load / V_source = Z_L / (A Z_L + B + R_S (C Z_L + D)), so G = 4 R_S R_L / |A Z_L + B + R_S (C Z_L + D)|^2.
    """
    load = np.asarray(load_ohm)
    denominator = network.a * load + network.b + source_ohm * (network.c * load + network.d)
    return 4.0 * source_ohm * np.real(load) / np.abs(denominator) ** 2


def input_impedance(network: Abcd, load_ohm: complex | np.ndarray) -> np.ndarray:
    """Impedance looking into port 1 with port 2 terminated in the load."""
    return (network.a * load_ohm + network.b) / (network.c * load_ohm + network.d)


def reflection(impedance_ohm: np.ndarray, reference_ohm: float) -> np.ndarray:
    """Reflection coefficient of an impedance against a real reference."""
    return (impedance_ohm - reference_ohm) / (impedance_ohm + reference_ohm)


def s_parameters(network: Abcd, source_ohm: float, load_ohm: float) -> tuple[np.ndarray, np.ndarray]:
    """S11 and S21 with port 1 referenced to the source and port 2 to the (real) load."""
    r1, r2 = source_ohm, load_ohm
    denominator = network.a * r2 + network.b + network.c * r1 * r2 + network.d * r1
    s11 = (network.a * r2 + network.b - network.c * r1 * r2 - network.d * r1) / denominator
    s21 = 2.0 * np.sqrt(r1 * r2) / denominator
    return s11, s21


def junction_reflections(impedances_ohm: np.ndarray) -> np.ndarray:
    """Reflection at each step between consecutive impedances (source, sections..., load), along the last axis."""
    z = np.asarray(impedances_ohm, dtype=float)
    return (z[..., 1:] - z[..., :-1]) / (z[..., 1:] + z[..., :-1])
