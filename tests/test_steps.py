"""Step discontinuities: the microstrip step model, the cascade with steps, and compensation."""

import math

import numpy as np
import pytest
import skrf
from skrf.media import DefinedGammaZ0

from service.analysis import network
from service.physics.media.stripline import stripline_impedance
from service.physics.steps import StepElements, microstrip_step, stripline_step

C0 = 299_792_458.0
MICROSTRIP = {"kind": "microstrip", "eps_r": 3.66, "height_m": 0.508e-3, "thickness_m": 35e-6}


def test_no_step_has_no_reactance():
    elements = microstrip_step(np.array([1e-3]), np.array([1e-3]), np.array([3e-7]), np.array([3e-7]), 3.66, 0.5e-3)
    assert elements.left_inductance_h[0] == 0 and elements.right_inductance_h[0] == 0
    assert elements.capacitance_f[0] == 0


def test_the_step_is_the_same_seen_from_either_side():
    wide, narrow, per_wide, per_narrow = np.array([3e-3]), np.array([1e-3]), np.array([2e-7]), np.array([4e-7])
    forward = microstrip_step(wide, narrow, per_wide, per_narrow, 4.5, 0.8e-3)
    backward = microstrip_step(narrow, wide, per_narrow, per_wide, 4.5, 0.8e-3)
    assert backward.capacitance_f == pytest.approx(forward.capacitance_f, rel=1e-15)
    assert backward.left_inductance_h == pytest.approx(forward.right_inductance_h, rel=1e-15)
    assert backward.right_inductance_h == pytest.approx(forward.left_inductance_h, rel=1e-15)


def test_the_fits_as_printed():
    # Gupta, Garg, Bahl and Bhartia, Microstrip Lines and Slotlines, 2nd ed., step in width (from memory):
    # C / sqrt(W1 W2) = (10.1 log eps_r + 2.33) W1/W2 - 12.6 log eps_r - 3.17 pF/m,
    # L / h = 40.5 (W1/W2 - 1) - 75 log(W1/W2) + 0.2 (W1/W2 - 1)^2 nH/m. At eps_r 9.6, W1/W2 = 2,
    # W2 = h = 0.635 mm:
    h, narrow, wide = 0.635e-3, 0.635e-3, 1.27e-3
    elements = microstrip_step(np.array([wide]), np.array([narrow]), np.array([1.0]), np.array([1.0]), 9.6, h)
    log_eps = math.log10(9.6)
    c_per_m = (10.1 * log_eps + 2.33) * 2 - 12.6 * log_eps - 3.17  # 8.95 pF/m
    assert elements.capacitance_f[0] == pytest.approx(c_per_m * 1e-12 * math.sqrt(wide * narrow), rel=1e-12)
    l_per_m = 40.5 - 75 * math.log10(2) + 0.2  # 18.12 nH/m
    total = elements.left_inductance_h[0] + elements.right_inductance_h[0]
    assert total == pytest.approx(l_per_m * 1e-9 * h, rel=1e-12)
    # The source's two capacitance fits (the second for eps_r 9.6, W1/W2 3.5-10) meet within 2%
    # at W1/W2 = 3.5: a check of the recalled coefficients against each other.
    first = (10.1 * log_eps + 2.33) * 3.5 - 12.6 * log_eps - 3.17
    second = 130 * math.log10(3.5) - 44
    assert first == pytest.approx(second, rel=0.025)


def test_the_cascade_with_steps_equals_scikit_rf_with_lumped_elements():
    # Reference: scikit-rf's cascade of ideal lines and its lumped series inductors and shunt
    # capacitors (DefinedGammaZ0.inductor, .shunt_capacitor).
    frequency = skrf.Frequency(1.0, 6.0, 51, unit="GHz")
    f = frequency.f
    impedances = np.array([42.0, 31.0, 24.0])
    lengths = np.array([0.012, 0.015, 0.009])
    steps = StepElements(
        np.array([3e-11, 5e-11, 2e-11]), np.array([1e-13, 2.5e-13, 4e-13]), np.array([4e-11, 1e-11, 6e-11])
    )
    beta = 2 * np.pi * f / C0
    ours = network.cascade_with_junctions(
        impedances[None, :], 1j * beta[:, None] * lengths, steps, 2 * np.pi * f[:, None]
    )
    media = DefinedGammaZ0(frequency, z0_port=50.0, z0=50.0, gamma=1j * beta)
    parts = []
    for k, z in enumerate(impedances):
        parts += [
            media.inductor(steps.left_inductance_h[k]),
            media.shunt_capacitor(steps.capacitance_f[k]),
            media.inductor(steps.right_inductance_h[k]),
            DefinedGammaZ0(frequency, z0_port=50.0, z0=z, gamma=1j * beta).line(lengths[k], "m"),
        ]
    reference = skrf.network.cascade_list(parts).a
    for ours_entry, (i, j) in zip((ours.a, ours.b, ours.c, ours.d), ((0, 0), (0, 1), (1, 0), (1, 1)), strict=True):
        assert np.max(np.abs(ours_entry - reference[:, i, j])) < 1e-9 * max(1.0, np.max(np.abs(reference[:, i, j])))


GRID = [(f0, load) for f0 in (2e9, 10e9, 24e9) for load in (20.0, 28.0, 90.0)]


@pytest.mark.parametrize("f0, load", GRID, ids=[f"{f0 / 1e9:g}GHz-{load:g}ohm" for f0, load in GRID])
def test_a_compensated_design_meets_its_spec_with_its_steps(client, f0, load):
    body = {
        "source_ohm": 50.0,
        "load": {"resistance_ohm": load},
        "band": {"start_hz": 0.8 * f0, "stop_hz": 1.2 * f0},
        "theory": "exact",
        "max_reflection": 0.05,
        "medium": MICROSTRIP | {"height_m": 0.254e-3 if f0 > 5e9 else 0.508e-3},
        "points": 101,
    }
    included = client.post("/v1/transformers/chebyshev", json=body | {"junction_effects": "include"}).json()
    compensated = client.post("/v1/transformers/chebyshev", json=body | {"junction_effects": "compensate"}).json()
    assert compensated["verified"]["meets_spec"], compensated["warnings"]
    effects = compensated["junction_effects"]
    assert effects["with_steps_max_reflection"] == compensated["verified"]["max_reflection"]
    assert effects["with_steps_max_reflection"] <= effects["uncompensated_max_reflection"] * (1 + 1e-9)
    assert len(effects["length_changes_m"]) == len(compensated["sections"])
    assert len(effects["steps"]) == len(compensated["sections"])
    assert included["junction_effects"]["length_changes_m"] is None
    assert any("junction steps are in the verified figures" in w for w in compensated["warnings"])
    # the verified figure is the one with steps: the analysis of the returned sections with steps agrees
    sections = [{"impedance_ohm": s["impedance_ohm"], "length_m": s["length_m"]} for s in compensated["sections"]]
    analysis = {k: v for k, v in body.items() if k != "theory"} | {"sections": sections, "junction_effects": "include"}
    checked = client.post("/v1/networks/analyze", json=analysis).json()
    assert checked["verified"]["max_reflection"] == pytest.approx(compensated["verified"]["max_reflection"], rel=1e-6)


def test_steps_need_a_physical_line_and_an_analysis_cannot_compensate(client, base_request):
    refused = client.post("/v1/transformers/chebyshev", json=base_request | {"junction_effects": "include"})
    assert refused.status_code == 422 and "microstrip, stripline or coax" in refused.json()["problems"][0]["message"]
    ideal = base_request | {"medium": {"kind": "ideal", "velocity_factor": 0.7}, "junction_effects": "include"}
    assert client.post("/v1/transformers/chebyshev", json=ideal).status_code == 422
    sections = [{"impedance_ohm": 70.7, "electrical_length_deg": 90}]
    body = base_request | {"medium": MICROSTRIP, "sections": sections, "junction_effects": "compensate"}
    assert client.post("/v1/networks/analyze", json=body).status_code == 422


def test_a_stripline_step_is_one_series_inductance_and_none_without_a_step():
    same = stripline_step(np.array([40.0]), np.array([40.0]), 2.2, 1.6e-3)
    assert same.left_inductance_h[0] == 0 and same.capacitance_f[0] == 0 and same.right_inductance_h[0] == 0
    forward = stripline_step(np.array([30.0]), np.array([60.0]), 2.2, 1.6e-3)
    backward = stripline_step(np.array([60.0]), np.array([30.0]), 2.2, 1.6e-3)
    assert forward.left_inductance_h == pytest.approx(backward.left_inductance_h, rel=1e-15)  # symmetric
    assert forward.capacitance_f[0] == 0


def test_the_stripline_step_as_printed():
    # Altschuler and Oliner, IRE Trans. MTT-8 (1960), step in width (from memory):
    # X / Z1 = (2 D1 / lambda) ln csc(pi D2 / (2 D1)), D the parallel-plate equivalent width.
    eps_r, b, z1, z2 = 2.2, 1.6e-3, 30.0, 60.0
    d1, d2 = 376.730313668 * b / (4 * math.sqrt(eps_r) * np.array([z1, z2]))
    f = 5e9
    wavelength = C0 / (f * math.sqrt(eps_r))
    reactance = z1 * 2 * d1 / wavelength * math.log(1 / math.sin(math.pi * d2 / (2 * d1)))
    inductance = stripline_step(np.array([z1]), np.array([z2]), eps_r, b).left_inductance_h[0]
    assert 2 * math.pi * f * inductance == pytest.approx(reactance, rel=1e-12)
    # The equivalent width of a thin wide strip is W + 2 b ln 2 / pi (the same source, from memory):
    # the impedance model's width agrees with it within 1% at W = b, t = 0.
    z = float(stripline_impedance(np.array([b]), b, 0.0, eps_r)[0])
    assert 376.730313668 * b / (4 * math.sqrt(eps_r) * z) == pytest.approx(b + 2 * b * math.log(2) / math.pi, rel=0.01)


@pytest.mark.parametrize("f0", [2e9, 10e9])
def test_a_compensated_stripline_design_meets_its_spec_with_its_steps(client, f0):
    body = {
        "source_ohm": 50.0,
        "load": {"resistance_ohm": 20.0},
        "band": {"start_hz": 0.8 * f0, "stop_hz": 1.2 * f0},
        "theory": "exact",
        "max_reflection": 0.05,
        "medium": {"kind": "stripline", "eps_r": 2.2, "ground_spacing_m": 1.6e-3, "thickness_m": 17e-6},
        "junction_effects": "compensate",
    }
    design = client.post("/v1/transformers/chebyshev", json=body).json()
    assert design["verified"]["meets_spec"]
    assert design["junction_effects"]["model"].startswith("stripline step")
