"""POST /v1/networks/analyze: the exact check of a user's own sections."""

import math

import pytest


def analyze(client, body: dict):
    return client.post("/v1/networks/analyze", json=body)


def test_analysis_equals_the_synthesized_design(client, base_request):
    design = client.post("/v1/transformers/chebyshev", json=base_request | {"sections": 3}).json()
    sections = [{"impedance_ohm": s["impedance_ohm"], "length_m": s["length_m"]} for s in design["sections"]]
    result = analyze(client, base_request | {"sections": sections})
    assert result.status_code == 200
    body = result.json()
    assert body["verified"]["max_reflection"] == pytest.approx(design["verified"]["max_reflection"], rel=1e-12)
    assert body["response"] == design["response"]


def test_electrical_length_at_a_reference_frequency(client, base_request):
    # A 90 deg line at 1 GHz is 180 deg at the 2 GHz centre (electrical length grows with f).
    sections = [{"impedance_ohm": 70.7, "electrical_length_deg": 90.0, "reference_hz": 1e9}]
    body = analyze(client, base_request | {"sections": sections}).json()
    assert body["sections"][0]["electrical_length_deg"] == pytest.approx(180.0)
    assert body["sections"][0]["length_m"] == pytest.approx(299792458.0 / 1e9 / 4)


def test_rounded_quarter_wave_figures(client, base_request):
    # A 70 ohm quarter-wave (rounded from 70.7) between 50 and 100 ohm: at the centre
    # Zin = 70^2 / 100 = 49 ohm, so |Gamma| >= |49 - 50| / 99 (textbook quarter-wave inversion).
    narrow = base_request | {"band": {"start_hz": 1.99e9, "stop_hz": 2.01e9}, "points": 3}
    body = analyze(client, narrow | {"sections": [{"impedance_ohm": 70.0, "electrical_length_deg": 90.0}]}).json()
    assert body["response"]["reflection_magnitude"][1] == pytest.approx(1 / 99, rel=1e-12)
    assert body["verified"]["max_reflection"] >= 1 / 99
    assert math.isclose(body["center_hz"], 2e9)


@pytest.mark.parametrize(
    "section, field",
    [
        ({"impedance_ohm": 70.0}, "sections[0]"),
        ({"impedance_ohm": 70.0, "length_m": 0.1, "electrical_length_deg": 90.0}, "sections[0]"),
        ({"impedance_ohm": -70.0, "length_m": 0.1}, "sections[0].impedance_ohm"),
        ({"impedance_ohm": 70.0, "length_m": 0.0}, "sections[0].length_m"),
        ({"impedance_ohm": 70.0, "length_m": 0.1, "reference_hz": 1e9}, "sections[0]"),
    ],
)
def test_bad_sections_are_named(client, base_request, section, field):
    response = analyze(client, base_request | {"sections": [section]})
    assert response.status_code == 422
    assert field in [p["field"] for p in response.json()["problems"]]


def test_empty_section_list_is_refused(client, base_request):
    response = analyze(client, base_request | {"sections": []})
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == "sections"


def test_the_complex_input_reflection_equals_scikit_rf_into_a_complex_load(client, base_request):
    import numpy as np
    import skrf
    from skrf.media import DefinedGammaZ0

    sections = [{"impedance_ohm": z, "length_m": d} for z, d in ((42.0, 0.031), (31.0, 0.047), (24.0, 0.02))]
    load = {"resistance_ohm": 18.0, "reactance_ohm": -11.0}
    body = analyze(client, base_request | {"sections": sections, "load": load, "points": 31}).json()
    ours = np.array(body["input_reflection"]["real"]) + 1j * np.array(body["input_reflection"]["imag"])
    # Reference: scikit-rf's cascade of ideal lines (DefinedGammaZ0.line) terminated in the load
    # (DefinedGammaZ0.load), its S11 referred to the 50 ohm source.
    frequency = skrf.Frequency.from_f(body["response"]["frequency_hz"], unit="Hz")
    beta = 2 * np.pi * frequency.f / 299_792_458.0
    lines = [
        DefinedGammaZ0(frequency, z0_port=50.0, z0=s["impedance_ohm"], gamma=1j * beta).line(s["length_m"], "m")
        for s in sections
    ]
    terminal = DefinedGammaZ0(frequency, z0_port=50.0, z0=50.0, gamma=1j * beta).load(
        (complex(18.0, -11.0) - 50.0) / (complex(18.0, -11.0) + 50.0)
    )
    reference = skrf.network.cascade_list([*lines, terminal]).s[:, 0, 0]
    assert np.max(np.abs(ours - reference)) < 1e-9
    assert np.allclose(np.abs(ours), body["response"]["reflection_magnitude"], rtol=1e-9)


def test_any_design_the_service_makes_can_be_analyzed(client, base_request):
    taper = client.post("/v1/transformers/taper", json=base_request | {"segments": 1024}).json()
    sections = [{"impedance_ohm": s["impedance_ohm"], "length_m": s["length_m"]} for s in taper["sections"]]
    result = analyze(client, base_request | {"sections": sections})
    assert result.status_code == 200
    assert result.json()["verified"]["max_reflection"] == pytest.approx(taper["verified"]["max_reflection"], rel=1e-9)


@pytest.mark.parametrize("load", [{"resistance_ohm": 20.0}, {"resistance_ohm": 30.0, "reactance_ohm": -25.0}])
def test_a_physical_design_analyzed_over_a_band_of_the_same_centre_is_the_same_line(client, load):
    # The lab page's wide-band view: widths are set at the band centre, so a band widened on both
    # sides by the same amount realizes the same strips, and the curves agree inside the band.
    microstrip = {"kind": "microstrip", "eps_r": 3.66, "height_m": 0.508e-3, "thickness_m": 35e-6}
    request = {"source_ohm": 50.0, "load": load, "band": {"start_hz": 2e9, "stop_hz": 4e9}, "points": 201}
    design = client.post("/v1/transformers/chebyshev", json=request | {"sections": 3, "medium": microstrip}).json()
    sections = [{"impedance_ohm": s["impedance_ohm"], "length_m": s["length_m"]} for s in design["sections"]]
    wide = {"start_hz": 1.3e9, "stop_hz": 4.7e9}
    body = analyze(client, request | {"band": wide, "points": 341, "medium": microstrip, "sections": sections}).json()
    widths = [s["width_m"] for s in design["sections"]]
    assert [s["width_m"] for s in body["sections"]] == pytest.approx(widths, rel=1e-9)
    inside = body["response"]["reflection_magnitude"][70:271]
    assert inside == pytest.approx(design["response"]["reflection_magnitude"], rel=1e-6, abs=1e-9)


def test_measured_data_are_never_extrapolated_by_the_analysis(client, base_request):
    points = [{"frequency_hz": f, "resistance_ohm": 30.0, "reactance_ohm": 5.0} for f in (1.2e9, 2.0e9, 2.8e9)]
    body = base_request | {"load": {"measured": points}, "sections": [{"impedance_ohm": 40, "length_m": 0.03}]}
    refused = analyze(client, body)  # the band is 1-3 GHz, the data 1.2-2.8 GHz
    assert refused.status_code == 422 and refused.json()["problems"][0]["field"] == "band"
    assert analyze(client, body | {"band": {"start_hz": 1.2e9, "stop_hz": 2.8e9}}).status_code == 200


MEDIA_BY_DIMENSION = [
    ({"kind": "microstrip", "eps_r": 3.66, "height_m": 0.508e-3, "thickness_m": 35e-6}, "width_m"),
    ({"kind": "stripline", "eps_r": 2.2, "ground_spacing_m": 1.6e-3, "thickness_m": 17e-6}, "width_m"),
    ({"kind": "coax", "eps_r": 2.1, "outer_diameter_m": 7e-3}, "inner_diameter_m"),
]


@pytest.mark.parametrize("medium, dimension", MEDIA_BY_DIMENSION, ids=[m["kind"] for m, _ in MEDIA_BY_DIMENSION])
def test_analysis_by_dimensions_equals_analysis_by_impedance(client, base_request, medium, dimension):
    by_impedance = [
        {"impedance_ohm": 61.0, "electrical_length_deg": 90},
        {"impedance_ohm": 78.0, "length_m": 0.021},
        {"impedance_ohm": 90.0, "electrical_length_deg": 80, "reference_hz": 1.5e9},
    ]
    first = analyze(client, base_request | {"medium": medium, "sections": by_impedance}).json()
    by_size = [
        {k: v for k, v in given.items() if k != "impedance_ohm"} | {dimension: realized[dimension]}
        for given, realized in zip(by_impedance, first["sections"], strict=True)
    ]
    second = analyze(client, base_request | {"medium": medium, "sections": by_size}).json()
    assert second["verified"]["max_reflection"] == pytest.approx(first["verified"]["max_reflection"], rel=1e-9)
    assert second["response"]["reflection_magnitude"] == pytest.approx(
        first["response"]["reflection_magnitude"], rel=1e-9, abs=1e-12
    )
    assert [s["length_m"] for s in second["sections"]] == pytest.approx([s["length_m"] for s in first["sections"]])


def test_a_dimension_must_fit_the_medium(client, base_request):
    sections = [{"width_m": 1e-3, "electrical_length_deg": 90}]
    refused = analyze(client, base_request | {"sections": sections})
    assert refused.status_code == 422 and "microstrip or stripline" in refused.json()["problems"][0]["message"]
    both = [{"width_m": 1e-3, "impedance_ohm": 50, "electrical_length_deg": 90}]
    assert analyze(client, base_request | {"sections": both}).status_code == 422


def test_peak_voltage_on_a_matched_line_is_that_of_the_incident_wave(client, base_request):
    # A line of the source impedance into a matched load carries no standing wave: |V| = sqrt(2 P Z0)
    # everywhere (definition of the incident power P = |V+|^2 / (2 Z0)).
    body = base_request | {"load": {"resistance_ohm": 50.0}, "input_power_w": 100.0}
    body["sections"] = [
        {"impedance_ohm": 50.0, "length_m": 0.037},
        {"impedance_ohm": 50.0, "electrical_length_deg": 120},
    ]
    power = analyze(client, body).json()["power"]
    expected = math.sqrt(2 * 100.0 * 50.0)
    assert power["incident_peak_voltage_v"] == pytest.approx(expected, rel=1e-12)
    for section in power["sections"]:
        assert section["peak_voltage_v"] == pytest.approx(expected, rel=1e-9)
        assert section["peak_current_a"] == pytest.approx(expected / 50.0, rel=1e-9)
    assert "licensed" in power["cautions"]


@pytest.mark.parametrize("load_ohm", [12.0, 30.0, 75.0, 200.0])
def test_peak_voltage_on_a_mismatched_line_lies_within_the_standing_wave_bounds(client, base_request, load_ohm):
    body = base_request | {"load": {"resistance_ohm": load_ohm}, "input_power_w": 10.0}
    body["sections"] = [{"impedance_ohm": 50.0, "electrical_length_deg": 150}]
    result = analyze(client, body).json()
    incident = math.sqrt(2 * 10.0 * 50.0)
    reflection = abs(load_ohm - 50.0) / (load_ohm + 50.0)
    peak = result["power"]["sections"][0]["peak_voltage_v"]
    assert (1 - reflection) * incident * (1 - 1e-9) <= peak <= (1 + reflection) * incident * (1 + 1e-9)
    # 150 degrees at the band centre spans a voltage maximum: the peak is the standing wave's top
    assert peak == pytest.approx((1 + reflection) * incident, rel=1e-3)


def test_coax_field_margin_against_the_default_ptfe_strength(client, base_request):
    coax = {"kind": "coax", "eps_r": 2.1, "outer_diameter_m": 7e-3}
    body = base_request | {"medium": coax, "input_power_w": 5e4, "load": {"resistance_ohm": 50.0}}
    body["sections"] = [{"impedance_ohm": 50.0, "electrical_length_deg": 90}]
    result = analyze(client, body).json()
    section, inner = result["power"]["sections"][0], result["sections"][0]["inner_diameter_m"] / 2
    # E at the inner conductor of a coax line: V / (a ln(b/a)) (electrostatics of coaxial cylinders)
    expected = section["peak_voltage_v"] / (inner * math.log(3.5e-3 / inner))
    assert section["peak_field_v_per_m"] == pytest.approx(expected, rel=1e-12)
    assert result["power"]["dielectric_strength_v_per_m"] == 6e7
    assert section["field_margin"] == pytest.approx(6e7 / expected, rel=1e-12)
    small = body | {"medium": coax | {"outer_diameter_m": 2e-3}, "input_power_w": 5e6}
    thin = client.post("/v1/networks/analyze", json=small).json()
    assert thin["power"]["sections"][0]["field_margin"] < 2
    assert any("breakdown" in w for w in thin["warnings"])
