"""The synthesis endpoints: semantics of sections and spec, and the exact verification."""

import math

import numpy as np
import pytest

from service.analysis.network import SPEED_OF_LIGHT_M_PER_S


def post(client, method: str, body: dict) -> dict:
    response = client.post(f"/v1/transformers/{method}", json=body)
    assert response.status_code == 200, response.text
    return response.json()


def impedances(result: dict) -> list[float]:
    return [s["impedance_ohm"] for s in result["sections"]]


def test_quarter_wave_bandwidth_formula_matches_the_cascade(client, base_request):
    # Pozar, Microwave Engineering, ch. 5 (from memory): delta f / f0 = 2 - (4/pi) acos(
    # Gamma_m / sqrt(1 - Gamma_m^2) * 2 sqrt(Z0 ZL) / |ZL - Z0|), exact for one TEM section.
    gamma_m = 0.1
    expected = 2 - 4 / math.pi * math.acos(gamma_m / math.sqrt(1 - gamma_m**2) * 2 * math.sqrt(5000) / 50)
    result = post(client, "quarter-wave", base_request | {"max_reflection": gamma_m})
    assert result["predicted"]["bandwidth_fraction"] == pytest.approx(expected, rel=1e-12)
    edge_hz = 2e9 * (1 - expected / 2)
    band = {"start_hz": edge_hz, "stop_hz": 4e9 - edge_hz}
    checked = post(client, "quarter-wave", base_request | {"band": band, "max_reflection": gamma_m})
    assert checked["verified"]["max_reflection"] == pytest.approx(gamma_m, rel=1e-9)
    assert impedances(checked) == pytest.approx([math.sqrt(5000)])


def test_response_covers_the_band_with_both_limits(client, base_request):
    result = post(client, "binomial", base_request | {"sections": 3, "points": 17})
    curve = result["response"]
    assert len(curve["frequency_hz"]) == 17
    assert curve["frequency_hz"][0] == 1e9 and curve["frequency_hz"][-1] == 3e9
    assert max(curve["reflection_magnitude"]) <= result["verified"]["max_reflection"]
    rl = -20 * np.log10(curve["reflection_magnitude"][0])
    assert curve["return_loss_db"][0] == pytest.approx(rl)


def test_junctions_follow_the_sections(client, base_request):
    result = post(client, "chebyshev", base_request | {"sections": 4})
    chain = [50.0, *impedances(result), 100.0]
    assert len(result["junctions"]) == 5
    for junction, z0, z1 in zip(result["junctions"], chain, chain[1:], strict=False):
        # Textbook junction: T = 1 + Gamma = 2 Z1 / (Z1 + Z0).
        assert junction["reflection"] == pytest.approx((z1 - z0) / (z1 + z0))
        assert junction["transmission"] == pytest.approx(2 * z1 / (z1 + z0))


def test_lengths_follow_the_velocity_factor(client, base_request):
    result = post(client, "binomial", base_request | {"sections": 2, "velocity_factor": 0.66})
    quarter = 0.66 * SPEED_OF_LIGHT_M_PER_S / 2e9 / 4
    for section in result["sections"]:
        assert section["electrical_length_deg"] == pytest.approx(90.0)
        assert section["length_m"] == pytest.approx(quarter, rel=1e-12)
    assert result["total_length_m"] == pytest.approx(2 * quarter)


def test_binomial_by_sections_reports_bandwidth_at_default_spec(client, base_request):
    result = post(client, "binomial", base_request | {"sections": 3})
    assert len(result["sections"]) == 3
    assert result["verified"]["spec_max_reflection"] == 0.1
    # |Gamma| = |rho| cos^3 theta <= 0.1 with rho = 1/3 (small-reflection theory).
    theta_m = math.acos((0.1 * 3) ** (1 / 3))
    assert result["predicted"]["bandwidth_fraction"] == pytest.approx(2 - 4 * theta_m / math.pi)


def test_binomial_by_spec_is_the_smallest_count_the_cascade_accepts(client, base_request):
    result = post(client, "binomial", base_request | {"max_reflection": 0.05})
    count = len(result["sections"])
    assert result["verified"]["meets_spec"] and result["verified"]["max_reflection"] <= 0.05
    fewer = post(client, "binomial", base_request | {"max_reflection": 0.05, "sections": count - 1})
    assert not fewer["verified"]["meets_spec"]
    assert fewer["warnings"]


def test_chebyshev_by_sections_puts_the_ripple_edges_on_the_band(client, base_request):
    # Small-reflection Chebyshev in the textbook form (Pozar, Microwave Engineering, sec. 5.7, from
    # memory): ripple = |ln(ZL/Z0)| / 2 / T_N(sec theta_edge), here N=3, theta_edge=45 deg:
    # T_3(sqrt 2) = 4 (2 sqrt 2) - 3 sqrt 2 = 5 sqrt 2 (direct evaluation of the polynomial).
    result = post(client, "chebyshev", base_request | {"sections": 3})
    assert result["predicted"]["max_reflection"] == pytest.approx(math.log(2.0) / 2.0 / (5 * math.sqrt(2)))
    assert result["predicted"]["bandwidth_fraction"] == pytest.approx(1.0)
    curve = result["response"]["reflection_magnitude"]
    assert curve[0] == pytest.approx(curve[-1], rel=1e-9)
    # The exact peak departs from the theory by a few percent at a 2:1 ratio (and says so).
    assert result["verified"]["max_reflection"] == pytest.approx(result["predicted"]["max_reflection"], rel=0.1)


def test_chebyshev_with_sections_and_spec_reports_coverage(client, base_request):
    narrow = post(client, "chebyshev", base_request | {"sections": 2, "max_reflection": 0.02})
    assert narrow["predicted"]["max_reflection"] > 0.02
    assert narrow["predicted"]["covers_band"] is False
    assert any("bandwidth only" in w for w in narrow["warnings"])
    # Pozar, Microwave Engineering, Example 5.7 (from memory): 50 -> 100 ohm, N = 3, ripple 0.05:
    # theta_m = 44.7 deg, Gamma_0 = 0.0698, Gamma_1 = 0.1037 (half-log steps, worked from sec theta_m
    # rounded to 1.408, hence the 1.5e-4 tolerance), bandwidth about 101%.
    wide = post(client, "chebyshev", base_request | {"sections": 3, "max_reflection": 0.05})
    fraction = wide["predicted"]["bandwidth_fraction"]
    assert fraction == pytest.approx(1.01, abs=0.005)
    assert math.degrees((2.0 - fraction) * math.pi / 4.0) == pytest.approx(44.7, abs=0.05)
    z = [50.0, *(s["impedance_ohm"] for s in wide["sections"]), 100.0]
    half_logs = [0.5 * math.log(z[n + 1] / z[n]) for n in range(len(z) - 1)]
    assert half_logs == pytest.approx([0.0698, 0.1037, 0.1037, 0.0698], abs=1.5e-4)
    assert wide["predicted"]["covers_band"] is True


def test_chebyshev_by_spec_meets_it_by_the_cascade(client, base_request):
    result = post(client, "chebyshev", base_request | {"max_reflection": 0.05})
    assert result["verified"]["meets_spec"]
    assert result["verified"]["max_reflection"] <= 0.05


@pytest.mark.parametrize("method", ["binomial", "chebyshev"])
def test_default_when_neither_is_given(client, base_request, method):
    result = post(client, method, base_request)
    assert result["verified"]["spec_max_reflection"] == 0.1
    assert result["verified"]["meets_spec"]


@pytest.mark.parametrize("method", ["binomial", "chebyshev", "quarter-wave"])
@pytest.mark.parametrize("spec", [None, 0.05, 0.3])
def test_load_close_to_source_gives_a_sound_answer(client, base_request, method, spec):
    body = base_request | {"load": {"resistance_ohm": 51.0}}
    if spec is not None:
        body["max_reflection"] = spec
    if method == "chebyshev":
        body["sections"] = 4
    result = post(client, method, body)
    assert result["verified"]["max_reflection"] <= 1.0 / 101.0 + 1e-9
    assert result["verified"]["meets_spec"]
    assert all(50.0 <= z <= 51.0 for z in impedances(result))


def test_matched_load_needs_nothing(client, base_request):
    result = post(client, "chebyshev", base_request | {"load": {"resistance_ohm": 50.0}, "sections": 3})
    assert impedances(result) == pytest.approx([50.0] * 3)
    assert result["verified"]["max_reflection"] < 1e-12


def test_small_ratio_theory_agrees_with_the_cascade(client, base_request):
    # Small-reflection theory converges on the exact answer as ZL/Z0 -> 1 (Pozar ch. 5).
    for load, tolerance in ((55.0, 0.01), (50.5, 0.001)):
        result = post(client, "chebyshev", base_request | {"load": {"resistance_ohm": load}, "sections": 3})
        assert result["verified"]["max_reflection"] == pytest.approx(
            result["predicted"]["max_reflection"], rel=tolerance
        )


def test_step_down_load_is_mirrored(client, base_request):
    up = post(client, "binomial", base_request | {"sections": 4})
    down = post(
        client,
        "binomial",
        base_request | {"source_ohm": 100.0, "load": {"resistance_ohm": 50.0}, "sections": 4},
    )
    assert impedances(down) == pytest.approx(impedances(up)[::-1])
    assert down["verified"]["max_reflection"] == pytest.approx(up["verified"]["max_reflection"], rel=1e-9)


def test_unmeetable_spec_names_max_reflection(client, base_request):
    body = base_request | {"band": {"start_hz": 1e6, "stop_hz": 3.999e9}, "max_reflection": 1e-4}
    response = client.post("/v1/transformers/binomial", json=body)
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == "max_reflection"


def test_a_design_at_power_reports_the_narrowest_strip_current_density(client, base_request):
    microstrip = {"kind": "microstrip", "eps_r": 3.66, "height_m": 0.508e-3, "thickness_m": 35e-6}
    body = base_request | {"sections": 3, "medium": microstrip, "input_power_w": 20.0}
    design = client.post("/v1/transformers/chebyshev", json=body).json()
    power = design["power"]
    assert len(power["sections"]) == 3 and power["input_power_w"] == 20.0
    narrowest = min(range(3), key=lambda k: design["sections"][k]["width_m"])
    cross_section = design["sections"][narrowest]["width_m"] * 35e-6
    expected = power["sections"][narrowest]["peak_current_a"] / cross_section
    assert power["narrowest_current_density_a_per_m2"] == pytest.approx(expected, rel=1e-12)
    assert any("power.cautions" in w for w in design["warnings"])
    assert "power" not in client.post("/v1/transformers/chebyshev", json=base_request).json() or (
        client.post("/v1/transformers/chebyshev", json=base_request).json()["power"] is None
    )
