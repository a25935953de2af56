"""Hypothesis property tests: random valid requests give physically consistent, truthful answers;
random invalid ones give 422."""

import math

import numpy as np
import scipy.constants
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from service.analysis import network

PROPERTY_SETTINGS = settings(
    max_examples=60, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture]
)


@st.composite
def design_requests(draw):
    source = draw(st.floats(10.0, 200.0))
    ratio = draw(st.floats(1.01, 40.0))
    load = source * ratio if draw(st.booleans()) else source / ratio
    center = draw(st.floats(1e8, 2e10))
    fraction = draw(st.floats(0.05, 1.6))
    body = {
        "source_ohm": source,
        "load": {"resistance_ohm": load},
        "band": {"start_hz": center * (1 - fraction / 2), "stop_hz": center * (1 + fraction / 2)},
        "sections": draw(st.integers(1, 10)),
        "theory": draw(st.sampled_from(["small-reflection", "exact"])),
        "points": draw(st.integers(2, 60)),
    }
    if draw(st.booleans()):
        body["max_reflection"] = draw(st.floats(0.01, 0.5))
    return draw(st.sampled_from(["binomial", "chebyshev"])), body


def independent_worst(result, body):
    """The worst reflection on a dense grid by the textbook input-impedance formula of a lossless
    line, Zin = Z (ZL + jZ tan(beta l)) / (Z + jZL tan(beta l)) (Pozar, Microwave Engineering,
    eq. 2.44), applied section by section from the load: none of the project's cascade code."""
    f = np.linspace(body["band"]["start_hz"], body["band"]["stop_hz"], 20001)
    impedance = np.full(f.size, float(body["load"]["resistance_ohm"]), dtype=complex)
    for section in reversed(result["sections"]):
        z, tangent = section["impedance_ohm"], np.tan(2 * np.pi * f * section["length_m"] / scipy.constants.c)
        impedance = z * (impedance + 1j * z * tangent) / (z + 1j * impedance * tangent)
    return float(np.max(np.abs((impedance - body["source_ohm"]) / (impedance + body["source_ohm"]))))


@PROPERTY_SETTINGS
@given(request=design_requests())
def test_random_designs_are_consistent_and_truthful(client, request):
    method, body = request
    response = client.post(f"/v1/transformers/{method}", json=body)
    assert response.status_code == 200, response.text
    result = response.json()
    verified, source, load = result["verified"], body["source_ohm"], body["load"]["resistance_ohm"]
    z = [s["impedance_ohm"] for s in result["sections"]]
    # Physically consistent: |Gamma| <= 1, impedances step monotonically from source to load.
    assert 0.0 <= verified["max_reflection"] < 1.0
    assert all(0.0 <= g <= 1.0 for g in result["response"]["reflection_magnitude"])
    chain = [source, *z, load]
    steps = np.diff(chain)
    assert np.all(steps * np.sign(load - source) >= -1e-9 * max(chain))
    # Symmetric where theory says so (binomial and Chebyshev, both theories): Z_n Z_{N+1-n} = Z0 ZL.
    assert np.allclose(np.array(z) * np.array(z[::-1]), source * load, rtol=1e-6)
    # Truthful: meets_spec says what the figure says (away from a tie), and the figure is the cascade's.
    worst, spec = verified["max_reflection"], verified["spec_max_reflection"]
    if abs(worst - spec) > 1e-9 * spec:
        assert verified["meets_spec"] == (worst < spec)
    dense = independent_worst(result, body)
    assert verified["max_reflection"] >= dense * (1 - 1e-6) - 1e-12
    assert verified["max_reflection"] <= dense * (1 + 1e-3) + 1e-12
    if not verified["meets_spec"]:
        assert any("above the spec" in w for w in result["warnings"])
    # Return loss by its definition, -20 log10 |Gamma| (IEEE Std 100), wherever |Gamma| is not ~0.
    if worst > 1e-12:
        assert math.isclose(verified["min_return_loss_db"], -20 * math.log10(worst), rel_tol=1e-9)
    else:
        assert verified["min_return_loss_db"] >= 200.0


@PROPERTY_SETTINGS
@given(
    impedances=st.lists(st.floats(5.0, 300.0), min_size=1, max_size=12),
    lengths=st.lists(st.floats(1e-4, 0.3), min_size=12, max_size=12),
    references=st.tuples(st.floats(5.0, 300.0), st.floats(5.0, 300.0)),
)
def test_lossless_cascades_conserve_power(impedances, lengths, references):
    # |S11|^2 + |S21|^2 = 1 for any lossless cascade between real references (textbook result).
    f = np.linspace(1e8, 1e10, 64)
    abcd = network.cascade(
        np.array(impedances), network.electrical_length_rad(np.array(lengths[: len(impedances)]), f, 1.0)
    )
    s11, s21 = network.s_parameters(abcd, *references)
    assert np.allclose(np.abs(s11) ** 2 + np.abs(s21) ** 2, 1.0, atol=1e-9)
    assert np.all(np.abs(s11) <= 1 + 1e-12)


INVALID_CHANGES = st.sampled_from(
    [
        ("source_ohm", st.floats(-1e6, 0.0)),
        ("source_ohm", st.floats(1e5 + 1, 1e300)),
        ("points", st.integers(-10, 1)),
        ("points", st.integers(10002, 10**9)),
        ("sections", st.integers(33, 10**6)),
        ("sections", st.integers(-100, 0)),
        ("max_reflection", st.floats(1.0, 1e9)),
        ("velocity_factor", st.floats(1.0001, 100.0)),
        ("source_ohm", st.text(max_size=5)),
        ("theory", st.text(max_size=8).filter(lambda t: t not in ("exact", "small-reflection"))),
    ]
)


@PROPERTY_SETTINGS
@given(data=st.data(), change=INVALID_CHANGES)
def test_random_invalid_requests_are_422(client, base_request, data, change):
    field, values = change
    body = base_request | {field: data.draw(values)}
    response = client.post("/v1/transformers/chebyshev", json=body)
    assert response.status_code == 422
    assert field in [p["field"] for p in response.json()["problems"]]
