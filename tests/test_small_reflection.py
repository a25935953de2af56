"""Small-reflection synthesis (service.synthesis) against textbook examples and SciPy."""

import math

import numpy as np
import pytest
from scipy.special import comb, eval_chebyt

from service.synthesis import (
    band_edge_angle_rad,
    binomial,
    binomial_sections_for,
    chebyshev,
    chebyshev_sections_for,
    quarter_wave,
)
from service.synthesis.multisection import chebyshev_peak_ratio, chebyshev_weights


def test_binomial_three_sections_textbook_example():
    # Pozar, Microwave Engineering, 3rd/4th ed., Example 5.6 (from memory): 100 ohm line to a
    # 50 ohm load, N = 3, binomial: 91.7, 70.7, 54.5 ohm; bandwidth at |Gamma| = 0.05 about 70%.
    design = binomial(100.0, 50.0, 3, band_edge_angle_rad(1.0, 3.0), 0.05).stepped()
    assert design.impedances_ohm == pytest.approx([91.7, 70.7, 54.5], abs=0.05)
    assert design.predicted_bandwidth_fraction == pytest.approx(0.70, abs=0.02)


def test_chebyshev_three_sections_textbook_example():
    # Pozar, Microwave Engineering, 3rd/4th ed., Example 5.7 (from memory): 50 ohm line to a
    # 100 ohm load, N = 3, ripple 0.05: about 57.5, 70.7, 87.0 ohm, bandwidth about 101%.
    design = chebyshev(50.0, 100.0, 3, band_edge_angle_rad(1.0, 3.0), ripple=0.05).stepped()
    assert design.impedances_ohm == pytest.approx([57.5, 70.7, 87.0], rel=0.005)
    assert design.predicted_bandwidth_fraction == pytest.approx(1.01, abs=0.01)
    assert design.predicted_max_reflection == pytest.approx(0.05, rel=1e-12)


@pytest.mark.parametrize("sections", [1, 2, 3, 4, 7, 12, 19, 32])
@pytest.mark.parametrize("scale", [1.0, 1.3, 2.5])
def test_chebyshev_weights_rebuild_the_chebyshev_polynomial(sections, scale):
    # The junction weights, summed as sum_n w_n exp(-2jn theta), must equal
    # exp(-jN theta) T_N(scale cos theta) / T_N(scale); T_N from SciPy's eval_chebyt as the reference.
    weights = chebyshev_weights(sections, scale)
    theta = np.linspace(0.0, math.pi, 97)
    series = np.exp(-2j * np.outer(theta, np.arange(sections + 1))) @ weights
    expected = np.exp(-1j * sections * theta) * eval_chebyt(sections, scale * np.cos(theta))
    expected /= eval_chebyt(sections, scale)
    assert np.max(np.abs(series - expected)) <= 1e-9 * max(1.0, np.max(np.abs(expected)))


def test_chebyshev_weights_stay_finite_for_very_narrow_bands():
    # 32 sections over a 1e-12 fractional band: T_32(sec theta_edge) overflows a double, but the
    # normalized weights do not; they approach the binomial shape C(N, n) / 2^N (the limit of
    # T_N(s cos theta) / T_N(s) as s grows is cos^N theta).
    edge = band_edge_angle_rad(1.0, 1.0 + 1e-12)
    weights = chebyshev_weights(32, 1.0 / math.cos(edge))
    assert np.all(np.isfinite(weights))
    assert weights / weights.sum() == pytest.approx(comb(32, np.arange(33)) / 2**32, abs=1e-9)


@pytest.mark.parametrize("sections, argument", [(3, 0.2), (3, 0.6), (4, 0.1), (5, 0.9), (6, 1.4)])
def test_chebyshev_peak_matches_a_dense_scan(sections, argument):
    # Largest |T_N(y)| over |y| <= argument, checked against a dense SciPy evaluation.
    y = np.linspace(-argument, argument, 200001)
    assert chebyshev_peak_ratio(sections, argument, 1.0) == pytest.approx(
        np.max(np.abs(eval_chebyt(sections, y))), rel=1e-6
    )


@pytest.mark.parametrize("sections", [2, 3, 5, 8, 16, 32])
@pytest.mark.parametrize("method", ["binomial", "chebyshev"])
def test_designs_are_symmetric_and_monotone(method, sections):
    # Standard property of both designs: Z_n Z_{N+1-n} = Z0 ZL, impedances step monotonically.
    edge = band_edge_angle_rad(2.0e9, 4.0e9)
    if method == "binomial":
        design = binomial(50.0, 12.5, sections, edge, 0.05).stepped()
    else:
        design = chebyshev(50.0, 12.5, sections, edge).stepped()
    z = design.impedances_ohm
    assert z * z[::-1] == pytest.approx(np.full(sections, 50.0 * 12.5), rel=1e-12)
    assert np.all(np.diff(z) < 0) and z[0] < 50.0 and z[-1] > 12.5


def test_quarter_wave_impedance_is_geometric_mean():
    # Textbook result (Pozar ch. 5): Z1 = sqrt(Z0 RL).
    design = quarter_wave(50.0, 200.0, band_edge_angle_rad(0.9e9, 1.1e9), 0.1)
    assert design.impedances_ohm == pytest.approx([100.0], rel=1e-15)


def test_binomial_spec_driven_count():
    # From |Gamma| = |rho| cos^N(theta_edge) (small-reflection theory): 50 -> 100 ohm, band
    # 1-3 GHz (theta_edge = 45 deg), spec 0.05 -> N >= ln(0.05/(1/3)) / ln(cos 45 deg) = 5.47 -> 6.
    assert binomial_sections_for(50.0, 100.0, band_edge_angle_rad(1.0, 3.0), 0.05) == 6


def test_chebyshev_spec_driven_count():
    # From T_N(sec theta_edge) >= |rho| / Gamma_m: acosh(6.667) / acosh(sqrt 2) = 2.93 -> N = 3.
    assert chebyshev_sections_for(50.0, 100.0, band_edge_angle_rad(1.0, 3.0), 0.05) == 3


def test_close_load_gives_one_section():
    # A load already within the spec needs no more than one section (common practice, no source).
    edge = band_edge_angle_rad(1.0, 3.0)
    assert chebyshev_sections_for(50.0, 52.0, edge, 0.05) == 1
    assert binomial_sections_for(50.0, 52.0, edge, 0.05) == 1
    degenerate = chebyshev(50.0, 52.0, 4, edge, ripple=0.05).stepped()
    assert degenerate.notes and degenerate.predicted_max_reflection <= 0.05
