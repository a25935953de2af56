"""Reactive, lumped, measured and Touchstone loads; refinement; the Bode-Fano limit."""

import math
import os
import tempfile

import numpy as np
import pytest
import skrf

from service.analysis import network
from service.formats.touchstone import TouchstoneError, read_one_port
from service.synthesis.bode_fano import bode_fano_min_reflection
from service.synthesis.reactive import rotating_section


def design(client, method: str, body: dict) -> dict:
    response = client.post(f"/v1/transformers/{method}", json=body)
    assert response.status_code == 200, response.text
    return response.json()


@pytest.mark.parametrize("load", [complex(30, 40), complex(120, -60), complex(10, 5), complex(200, 300)])
def test_rotating_section_makes_the_load_real(load):
    # A length of Z0 line turns the load to the nearer voltage maximum or minimum, where the
    # impedance is real: Z0 * VSWR or Z0 / VSWR (standard textbook result, Pozar ch. 2).
    rotation = rotating_section(50.0, load)
    abcd = network.cascade(np.array([50.0]), np.array([[rotation.electrical_length_rad]]))
    seen = network.input_impedance(abcd, load)[0]
    assert abs(seen.imag) < 1e-9 * abs(seen)
    assert seen.real == pytest.approx(rotation.resistance_ohm, rel=1e-9)
    assert 0.0 <= rotation.electrical_length_rad <= math.pi / 2 + 1e-12
    gamma = abs((load - 50) / (load + 50))
    assert rotation.resistance_ohm in (
        pytest.approx(50 * (1 + gamma) / (1 - gamma)),
        pytest.approx(50 * (1 - gamma) / (1 + gamma)),
    )


def test_reactive_load_design_is_matched_at_the_centre(client, base_request):
    body = base_request | {
        "load": {"resistance_ohm": 35.0, "reactance_ohm": -20.0},
        "sections": 3,
        "points": 41,
    }
    result = design(client, "chebyshev", body | {"theory": "exact"})
    # The start (the exact design into the rotated load, behind a rotating section of 50 ohm line)
    # is refined over the band: never worse than the start, and far better than the bare load.
    refinement = result["refinement"]
    assert refinement["after"]["max_reflection"] <= refinement["before"]["max_reflection"]
    assert result["verified"] == refinement["after"]
    assert result["verified"]["max_reflection"] < 0.5 * result["unmatched_max_reflection"]
    assert any("turned real by a last section of 50 ohm line" in w for w in result["warnings"])


@pytest.mark.parametrize("parameter", ["S", "Z", "Y"])
@pytest.mark.parametrize("form", ["ri", "ma", "db"])
@pytest.mark.parametrize("version", ["1.0", "2.0"])
def test_touchstone_round_trip_with_scikit_rf(parameter, form, version):
    # scikit-rf writes the file (Network.write_touchstone), our reader reads it back.
    frequency = skrf.Frequency(0.8, 1.2, 21, unit="GHz")
    z = (40 + 15 * np.linspace(-1, 1, 21)) + 1j * (25 * np.linspace(-1, 1, 21) ** 3 - 10)
    written = skrf.Network(frequency=frequency, z=z.reshape(-1, 1, 1), z0=75)
    folder = tempfile.mkdtemp()
    written.write_touchstone(os.path.join(folder, "load"), form=form, parameter=parameter, version=version)
    (name,) = os.listdir(folder)
    with open(os.path.join(folder, name)) as handle:
        data = read_one_port(handle.read())
    assert data.frequency_hz == pytest.approx(frequency.f, rel=1e-12)
    assert np.max(np.abs(data.impedance_ohm - z)) < 1e-9 * np.max(np.abs(z))


@pytest.mark.parametrize(
    "text",
    [
        "# GHz S RI R 50\n1.0 0.1\n",
        "# GHz Q RI R 50\n1.0 0.1 0.2\n",
        "# GHz S RI R 50\n2.0 0.1 0.2\n1.0 0.1 0.2\n",
        "# GHz S RI R 50\n1.0 0.1 abc\n",
        "[Version] 2.0\n# GHz S RI R 50\n[Number of Ports] 2\n[Network Data]\n1 0 0 0 0 0 0 0 0\n[End]\n",
        "# GHz S RI R 50\n1.0 1.0 0.0\n",
        "",
    ],
)
def test_malformed_touchstone_is_refused(client, base_request, text):
    with pytest.raises(TouchstoneError):
        read_one_port(text)
    response = client.post("/v1/transformers/binomial", json=base_request | {"load": {"touchstone": text}})
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == "load.touchstone"


def test_touchstone_load_is_designed_and_refined(client, base_request):
    # A one-port file of our own: a 20 ohm resistor with 2 nH in series, 1-3 GHz, written by
    # hand in version 1 MA form from the circuit formula.
    f = np.linspace(1e9, 3e9, 21)
    z = 20 + 2j * np.pi * f * 2e-9
    s = (z - 50) / (z + 50)
    lines = ["! our own test load", "# Hz S MA R 50"]
    lines += [f"{fk:.1f} {abs(sk):.15g} {np.degrees(np.angle(sk)):.15g}" for fk, sk in zip(f, s, strict=True)]
    body = base_request | {"load": {"touchstone": "\n".join(lines)}, "sections": 2}
    from_file = design(client, "binomial", body)
    from_circuit = design(
        client,
        "binomial",
        body | {"load": {"circuit": {"kind": "series-rl", "resistance_ohm": 20, "inductance_h": 2e-9}}},
    )
    assert from_file["refinement"]["after"]["max_reflection"] < from_file["refinement"]["before"]["max_reflection"]
    # Linear interpolation of the table against the exact circuit: close but not identical.
    assert from_file["refinement"]["before"]["max_reflection"] == pytest.approx(
        from_circuit["refinement"]["before"]["max_reflection"], rel=1e-3
    )


def test_measured_table_must_cover_the_band(client, base_request):
    points = [
        {"frequency_hz": 1.5e9, "resistance_ohm": 30, "reactance_ohm": 5},
        {"frequency_hz": 2.5e9, "resistance_ohm": 35, "reactance_ohm": 15},
    ]
    response = client.post("/v1/transformers/binomial", json=base_request | {"load": {"measured": points}})
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == "band"
    inside = base_request | {"band": {"start_hz": 1.6e9, "stop_hz": 2.4e9}, "load": {"measured": points}}
    assert design(client, "binomial", inside)["refinement"] is not None


@pytest.mark.parametrize(
    "load, field, words",
    [
        ({"circuit": {"kind": "series-rl", "resistance_ohm": 20}}, "load.circuit", "inductance_h"),
        (
            {"circuit": {"kind": "parallel-rc", "resistance_ohm": 20, "inductance_h": 1e-9}},
            "load.circuit",
            "capacitance_f",
        ),
        (
            {"circuit": {"kind": "series-lc", "resistance_ohm": 20, "inductance_h": 1e-9}},
            "load.circuit.kind",
            "",
        ),
        ({"resistance_ohm": -20, "reactance_ohm": 10}, "load.resistance_ohm", ""),
        ({"reactance_ohm": 10}, "load", "exactly one"),
        (
            {
                "resistance_ohm": 20,
                "circuit": {"kind": "series-rl", "resistance_ohm": 20, "inductance_h": 1e-9},
            },
            "load",
            "exactly one",
        ),
        (
            {
                "measured": [
                    {"frequency_hz": 2e9, "resistance_ohm": 1, "reactance_ohm": 0},
                    {"frequency_hz": 1e9, "resistance_ohm": 1, "reactance_ohm": 0},
                ]
            },
            "load.measured",
            "increasing",
        ),
    ],
)
def test_bad_loads_name_the_field(client, base_request, load, field, words):
    response = client.post("/v1/transformers/chebyshev", json=base_request | {"load": load})
    assert response.status_code == 422
    problems = {p["field"]: p["message"] for p in response.json()["problems"]}
    assert field in problems and words in problems[field]


def test_bode_fano_formula_for_a_parallel_rc_load():
    # Fano (1950), as given in Pozar, Microwave Engineering, sec. 5.9 (from memory): for a
    # parallel R-C load, integral ln(1/|Gamma|) d omega <= pi/(R C), so a constant in-band
    # reflection over delta omega cannot be below exp(-pi / (R C delta omega)).
    # R = 100 ohm, C = 5 pF, 1.8-2.2 GHz: R C delta omega = 100 * 5e-12 * 2 pi * 0.4e9 = 0.4 pi,
    # so the bound is exp(-2.5) = 0.0821.
    assert bode_fano_min_reflection("parallel-rc", 100.0, 5e-12, 1.8e9, 2.2e9) == pytest.approx(math.exp(-2.5))
    # Series R-L: pi R / L; R = 10 ohm, L = 5 nH over 0.4 GHz -> exp(-pi 10 / (5e-9 * 0.8 pi e9)) = exp(-2.5).
    assert bode_fano_min_reflection("series-rl", 10.0, 5e-9, 1.8e9, 2.2e9) == pytest.approx(math.exp(-2.5))


def test_designs_approach_but_never_beat_the_bode_fano_limit(client, base_request):
    load = {"circuit": {"kind": "parallel-rc", "resistance_ohm": 100.0, "capacitance_f": 5e-12}}
    body = base_request | {
        "load": load,
        "band": {"start_hz": 1.8e9, "stop_hz": 2.2e9},
        "max_reflection": 0.05,
    }
    for sections in (1, 2, 4):
        result = design(client, "chebyshev", body | {"sections": sections})
        bound = result["bode_fano"]["min_reflection"]
        assert bound == pytest.approx(math.exp(-2.5))
        assert result["bode_fano"]["spec_beats_bound"] is True
        assert result["verified"]["max_reflection"] >= bound
        assert not result["verified"]["meets_spec"]
        assert any("Bode-Fano" in w for w in result["warnings"])
        # The Fano integral over the band (a part of the whole axis) stays below pi/(RC).
        z = [s["impedance_ohm"] for s in result["sections"]]
        lengths = [s["length_m"] for s in result["sections"]]
        f = np.linspace(1.8e9, 2.2e9, 4001)
        abcd = network.cascade(np.array(z), network.electrical_length_rad(np.array(lengths), f, 1.0))
        zl = 100.0 / (1 + 1j * 2 * np.pi * f * 100.0 * 5e-12)
        gamma = np.abs(network.reflection(network.input_impedance(abcd, zl), 50.0))
        assert np.trapezoid(np.log(1 / gamma), 2 * np.pi * f) <= math.pi / (100.0 * 5e-12)


@pytest.mark.parametrize(
    "load, rotating",
    [
        ({"resistance_ohm": 30.0}, False),
        ({"resistance_ohm": 30.0, "reactance_ohm": -20.0}, True),
        ({"circuit": {"kind": "parallel-rc", "resistance_ohm": 120.0, "capacitance_f": 6e-13}}, True),
    ],
)
def test_the_rotating_section_is_said_and_comes_on_top_of_the_asked_count(client, load, rotating):
    body = {"source_ohm": 50.0, "load": load, "band": {"start_hz": 1e9, "stop_hz": 3e9}, "sections": 2}
    design = client.post("/v1/transformers/chebyshev", json=body).json()
    assert design["rotating_section"] is rotating
    assert len(design["sections"]) == 2 + rotating
