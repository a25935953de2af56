"""Exact synthesis from the insertion-loss function, checked on an independent ABCD cascade."""

import math

import numpy as np
import pytest
from scipy.optimize import minimize_scalar
from scipy.signal import argrelmax

from service.analysis import network
from service.synthesis import (
    EXACT,
    SMALL_REFLECTION,
    band_edge_angle_rad,
    binomial,
    chebyshev,
    stepped_many,
)
from service.synthesis.exact import _spectral_factor
from service.synthesis.multisection import chebyshev_weights


def reflection_of(impedances, source, load, theta):
    """|Gamma| of quarter-wave (at theta = pi/2) sections, by service.analysis.network alone."""
    theta = np.atleast_1d(theta)
    abcd = network.cascade(impedances, np.outer(theta, np.ones(len(impedances))))
    return np.abs(network.reflection(network.input_impedance(abcd, load), source))


def in_band_peaks(impedances, source, load, edge):
    """Every local maximum of |Gamma| strictly inside the band, each refined by SciPy."""
    theta = np.linspace(edge, math.pi - edge, 40001)
    values = reflection_of(impedances, source, load, theta)
    peaks = []
    for index in argrelmax(values)[0]:
        found = minimize_scalar(
            lambda t: -reflection_of(impedances, source, load, t)[0],
            bounds=(theta[index - 1], theta[index + 1]),
            method="bounded",
            options={"xatol": 1e-12},
        )
        peaks.append(-found.fun)
    return np.array(peaks), values


def loss_to_reflection(measure):
    return measure / math.sqrt(1 + measure**2)


@pytest.mark.parametrize("sections", [2, 3, 4, 6, 8, 11, 16])
@pytest.mark.parametrize("ratio", [1.5, 4.0, 20.0, 100.0])
def test_exact_chebyshev_has_equal_ripple_and_edges_on_the_band(sections, ratio):
    # Collin (1955), Riblet (1957): with |Gamma|^2/(1-|Gamma|^2) = k^2 T_N^2(cos theta / cos theta_m)
    # the cascade's in-band peaks all equal the ripple and the band edges sit at theta_m.
    source, load = 50.0, 50.0 * ratio
    edge = band_edge_angle_rad(1.0, 3.0 if ratio < 50 else 2.2)
    design = chebyshev(source, load, sections, edge, None, EXACT).stepped()
    rho = (load - source) / (load + source)
    ripple = loss_to_reflection(rho / math.sqrt(1 - rho**2) / math.cosh(sections * math.acosh(1 / math.cos(edge))))
    peaks, values = in_band_peaks(design.impedances_ohm, source, load, edge)
    assert len(peaks) == sections - 1
    assert np.max(np.abs(peaks / ripple - 1)) < 1e-6
    assert values[0] == pytest.approx(ripple, rel=1e-6) and values[-1] == pytest.approx(ripple, rel=1e-6)
    assert design.predicted_max_reflection == pytest.approx(ripple, rel=1e-12)
    z = design.impedances_ohm
    # Antimetry Z_n Z_{N+1-n} = Z0 ZL holds for exact Chebyshev transformers too (Riblet 1957).
    assert z * z[::-1] == pytest.approx(np.full(sections, source * load), rel=1e-8)


@pytest.mark.parametrize("sections", [1, 2, 4, 8, 16])
@pytest.mark.parametrize("ratio", [2.0, 10.0, 100.0])
def test_exact_maximally_flat(sections, ratio):
    # |Gamma|^2/(1-|Gamma|^2) = k^2 cos^{2N} theta: zero reflection at the centre and the
    # band-edge value given by the formula, on the independent cascade.
    source, load = 50.0, 50.0 / ratio
    edge = band_edge_angle_rad(1.0, 3.0)
    design = binomial(source, load, sections, edge, 0.05, EXACT).stepped()
    rho = (load - source) / (load + source)
    kappa = abs(rho) / math.sqrt(1 - rho**2)
    theta = np.array([edge, math.pi / 2, math.pi - edge])
    values = reflection_of(design.impedances_ohm, source, load, theta)
    expected_edge = loss_to_reflection(kappa * math.cos(edge) ** sections)
    assert values[1] < 1e-9
    assert values[0] == pytest.approx(expected_edge, rel=1e-8)
    assert values[2] == pytest.approx(expected_edge, rel=1e-8)
    assert design.predicted_max_reflection == pytest.approx(expected_edge, rel=1e-12)


def test_one_section_exact_is_the_quarter_wave():
    # N = 1: both exact designs reduce to Z1 = sqrt(Z0 ZL) (textbook quarter-wave result).
    edge = band_edge_angle_rad(1.0, 3.0)
    for design in (
        binomial(50, 200, 1, edge, 0.1, EXACT).stepped(),
        chebyshev(50, 200, 1, edge, None, EXACT).stepped(),
    ):
        assert design.impedances_ohm == pytest.approx([100.0], rel=1e-12)


@pytest.mark.parametrize("method", ["binomial", "chebyshev"])
def test_theories_converge_for_small_ratios(method):
    # As ZL/Z0 -> 1 the small-reflection and exact theories agree (their difference is of third
    # order in the reflection; Collin 1955).
    edge = band_edge_angle_rad(1.0, 3.0)
    previous = None
    for ratio in (1.5, 1.1, 1.02):
        if method == "binomial":
            approx, exact = (
                binomial(50, 50 * ratio, 4, edge, 0.1, t).stepped().impedances_ohm for t in (SMALL_REFLECTION, EXACT)
            )
        else:
            approx, exact = (
                chebyshev(50, 50 * ratio, 4, edge, None, t).stepped().impedances_ohm for t in (SMALL_REFLECTION, EXACT)
            )
        difference = np.max(np.abs(np.log(exact / approx)))
        assert previous is None or difference < previous / 10
        previous = difference
    assert previous < 1e-5


def test_exact_api_meets_spec_where_small_reflection_misses(client, base_request):
    # 50 -> 2000 ohm, 6 sections with a 0.1 ripple: the equal-ripple band covers 1-3 GHz.
    body = base_request | {"load": {"resistance_ohm": 2000.0}, "sections": 6, "max_reflection": 0.1}
    approx = client.post("/v1/transformers/chebyshev", json=body).json()
    exact = client.post("/v1/transformers/chebyshev", json=body | {"theory": "exact"}).json()
    assert exact["theory"] == "exact" and exact["predicted"]["covers_band"]
    assert exact["verified"]["max_reflection"] == pytest.approx(0.1, rel=1e-6)
    assert abs(exact["predicted"]["departure_fraction"]) < 1e-6
    assert exact["verified"]["meets_spec"]
    assert approx["verified"]["max_reflection"] > 0.1
    assert any("theory 'exact', not tried here" in warning for warning in approx["warnings"])


def test_exact_spec_driven_is_smallest(client, base_request):
    body = base_request | {"load": {"resistance_ohm": 2000.0}, "max_reflection": 0.05, "theory": "exact"}
    result = client.post("/v1/transformers/chebyshev", json=body).json()
    count = len(result["sections"])
    assert result["verified"]["meets_spec"] and not result["warnings"]
    fewer = client.post("/v1/transformers/chebyshev", json=body | {"sections": count - 1}).json()
    assert not fewer["verified"]["meets_spec"]


def test_designs_synthesized_together_equal_designs_made_alone():
    # Mixed theories, section counts and loads in one call: each group is one stacked
    # factorization; every design must come out as when it is synthesized on its own.
    edge = band_edge_angle_rad(1e9, 3e9)
    rng = np.random.default_rng(8)
    weighted = []
    for _ in range(40):
        theory = EXACT if rng.random() < 0.6 else SMALL_REFLECTION
        sections, load = int(rng.integers(1, 9)), float(rng.uniform(2.0, 2000.0))
        if rng.random() < 0.5:
            weighted.append(chebyshev(50.0, load, sections, edge, None, theory))
        else:
            weighted.append(binomial(50.0, load, sections, edge, 0.05, theory))
    together = stepped_many(weighted)
    for design, alone in zip(together, (w.stepped() for w in weighted), strict=True):
        np.testing.assert_allclose(design.impedances_ohm, alone.impedances_ohm, rtol=1e-12)
        assert design.predicted_max_reflection == alone.predicted_max_reflection


@pytest.mark.parametrize("sections", [2, 5, 12])
def test_stacked_spectral_factor_has_numpys_roots(sections):
    # Reference: numpy.roots on the same polynomial (general-purpose library); A's zeros are the
    # ones outside the unit circle.
    numerators = np.stack([k * chebyshev_weights(sections, 1.3) for k in (0.05, 0.3, 2.0)])
    factors = _spectral_factor(numerators)
    for numerator, factor in zip(numerators, factors, strict=True):
        product = np.convolve(numerator, numerator[::-1])
        product[sections] += 1.0
        roots = np.roots(product[::-1])
        expected = np.sort_complex(roots[np.abs(roots) > 1.0])
        np.testing.assert_allclose(np.sort_complex(np.roots(factor[::-1])), expected, rtol=1e-8)
        # |A|^2 = 1 + |B|^2 on the unit circle
        z = np.exp(-1j * np.linspace(0, np.pi, 7))
        a, b = np.polyval(factor[::-1], z), np.polyval(numerator[::-1], z)
        np.testing.assert_allclose(np.abs(a) ** 2, 1 + np.abs(b) ** 2, rtol=1e-10)
