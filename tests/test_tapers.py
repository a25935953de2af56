"""Tapers: the discretized cascade against the closed-form responses, lengths, and the endpoint."""

import math

import numpy as np
import pytest
import scipy.constants

from service.analysis import network
from service.synthesis.tapers import klopfenstein_phi, length_for_spec, log_profile, taper_reflection

PROFILES = ["exponential", "triangular", "klopfenstein"]


@pytest.mark.parametrize("a", [0.3, 1.0, 2.5, 6.0, 12.0])
def test_klopfenstein_phi_end_value(a):
    # phi(1, A) = (cosh A - 1) / A^2, from integrating I1 (Klopfenstein 1956; the identity
    # follows from d/dA of I0 and is checked here against the closed form).
    assert klopfenstein_phi(np.array([1.0]), a)[0] == pytest.approx((math.cosh(a) - 1) / a**2, rel=1e-9)
    assert klopfenstein_phi(np.array([0.0]), a)[0] == pytest.approx(0.0, abs=1e-12)


def test_klopfenstein_profile_steps_at_the_ends():
    # Pozar ch. 5 (from memory): the Klopfenstein impedance has steps at both ends; with
    # phi(+-1, A) the profile ends at ln Z = ln ZL - Gamma_m and ln Z0 + Gamma_m.
    ln_ratio, a = math.log(2.0), 2.0
    ends = log_profile("klopfenstein", np.array([0.0, 1.0]), ln_ratio, a)
    gamma_m = 0.5 * ln_ratio / math.cosh(a)
    assert ends == pytest.approx([gamma_m, ln_ratio - gamma_m], rel=1e-9)


@pytest.mark.parametrize("profile", PROFILES)
def test_discretized_cascade_follows_the_closed_form(profile):
    # Closed-form taper responses (Pozar, Microwave Engineering, sec. 5.8-5.9): for a small
    # ratio (60/50 ohm) the exact cascade of 256 steps agrees within 0.5% of Gamma0.
    segments, ln_ratio, a = 256, math.log(60 / 50), 2.0
    positions = (np.arange(segments) + 0.5) / segments
    z = 50 * np.exp(log_profile(profile, positions, ln_ratio, a))
    x = np.linspace(0.5, 20.0, 400)
    abcd = network.cascade(z, np.outer(x / segments, np.ones(segments)))
    exact = np.abs(network.reflection(network.input_impedance(abcd, 60.0), 50.0))
    closed = taper_reflection(profile, x, ln_ratio, a)
    assert np.max(np.abs(exact - closed)) < 0.005 * 0.5 * ln_ratio


def test_lengths_for_a_spec():
    # Klopfenstein: A = acosh(Gamma0 / Gamma_m), passband from beta L = A (Klopfenstein 1956).
    ln_ratio = math.log(2.0)
    beta_l, a = length_for_spec("klopfenstein", ln_ratio, 0.02)
    assert a == pytest.approx(math.acosh(0.5 * ln_ratio / 0.02)) and beta_l == a
    # Exponential: first beta L beyond which Gamma0 |sin x / x| never exceeds the spec again.
    beta_l, _ = length_for_spec("exponential", ln_ratio, 0.02)
    tail = np.linspace(beta_l, beta_l + 200, 400001)
    assert 0.5 * ln_ratio * np.max(np.abs(np.sinc(tail / np.pi))) <= 0.02 * (1 + 1e-9)
    assert 0.5 * ln_ratio * abs(math.sin(beta_l) / beta_l) == pytest.approx(0.02, rel=1e-9)
    # Klopfenstein is the shortest of the three for the same spec (Klopfenstein 1956).
    lengths = {p: length_for_spec(p, ln_ratio, 0.02)[0] for p in PROFILES}
    assert lengths["klopfenstein"] < min(lengths["exponential"], lengths["triangular"])


def post_taper(client, base_request, **fields):
    response = client.post("/v1/transformers/taper", json=base_request | fields)
    assert response.status_code == 200, response.text
    return response.json()


@pytest.mark.parametrize("profile", PROFILES)
def test_spec_driven_taper_meets_the_spec_on_the_cascade(client, base_request, profile):
    result = post_taper(client, base_request, profile=profile, max_reflection=0.05, segments=48)
    assert result["method"] == "taper" and result["profile"] == profile
    assert len(result["sections"]) == 48
    assert result["verified"]["meets_spec"]
    assert result["verified"]["max_reflection"] <= 0.05


def test_given_length_reports_the_achieved_reflection(client, base_request):
    # Klopfenstein with the passband edge on 1 GHz: Gamma_m = Gamma0 / cosh(beta L).
    length = 0.08
    result = post_taper(client, base_request, profile="klopfenstein", length_m=length, max_reflection=0.05)
    beta_l = 2 * math.pi * 1e9 / scipy.constants.c * length  # c from SciPy (CODATA)
    assert result["total_length_m"] == pytest.approx(length)
    assert result["predicted"]["max_reflection"] == pytest.approx(0.5 * math.log(2) / math.cosh(beta_l), rel=1e-9)
    short = post_taper(client, base_request, profile="exponential", length_m=0.02)
    assert short["predicted"]["covers_band"] is False and not short["verified"]["meets_spec"]


@pytest.mark.parametrize(
    "fields, field",
    [
        ({"segments": 1}, "segments"),
        ({"segments": 5000}, "segments"),
        ({"profile": "cosine"}, "profile"),
        ({"length_m": -0.1}, "length_m"),
        ({"max_reflection": 0.5}, "max_reflection"),
    ],
)
def test_bad_taper_requests(client, base_request, fields, field):
    response = client.post("/v1/transformers/taper", json=base_request | fields)
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == field


@pytest.mark.parametrize(
    "medium",
    [
        {"kind": "coax", "eps_r": 2.1, "outer_diameter_m": 7e-3},
        {"kind": "microstrip", "eps_r": 4.4, "height_m": 1.6e-3, "thickness_m": 35e-6},
        {"kind": "stripline", "eps_r": 2.2, "ground_spacing_m": 3.2e-3, "thickness_m": 17e-6},
    ],
)
def test_fixed_length_taper_has_that_length_in_every_medium(client, base_request, medium):
    # The request states a physical length; the drawing the layout person gets must have it.
    result = post_taper(client, base_request, profile="klopfenstein", length_m=0.1, medium=medium)
    assert result["total_length_m"] == pytest.approx(0.1, rel=1e-9)
    assert sum(s["length_m"] for s in result["sections"]) == pytest.approx(0.1, rel=1e-9)
