"""Touchstone and CSV exports of designs, read back with scikit-rf and the csv module."""

import csv
import io
import os
import tempfile

import numpy as np
import pytest
import skrf

from tests.conftest import LOSSY_MICROSTRIP


def read_with_scikit_rf(text: str) -> skrf.Network:
    folder = tempfile.mkdtemp()
    path = os.path.join(folder, "design.s2p")
    with open(path, "w") as handle:
        handle.write(text)
    return skrf.Network(path)


@pytest.mark.parametrize("medium", [None, LOSSY_MICROSTRIP])
@pytest.mark.parametrize("endpoint", ["chebyshev", "taper"])
def test_touchstone_reads_back_with_scikit_rf(client, base_request, medium, endpoint):
    body = base_request | {"sections": 3} if endpoint == "chebyshev" else base_request | {"max_reflection": 0.05}
    if medium:
        body["medium"] = medium
    path = f"/v1/transformers/{endpoint}"
    design = client.post(path, json=body).json()
    exported = client.post(path + "?format=touchstone", json=body)
    assert exported.status_code == 200
    assert exported.headers["content-type"].startswith("application/x-touchstone")
    network = read_with_scikit_rf(exported.text)
    assert network.f == pytest.approx(design["response"]["frequency_hz"], rel=1e-15)
    assert np.real(network.z0[0]) == pytest.approx([50.0, 100.0])
    assert np.max(np.abs(np.abs(network.s[:, 0, 0]) - design["response"]["reflection_magnitude"])) < 1e-9
    assert np.allclose(network.s[:, 0, 1], network.s[:, 1, 0], atol=1e-12)  # reciprocal
    if medium is None:
        # Lossless: |S11|^2 + |S21|^2 = 1 (standard textbook result).
        assert np.allclose(np.abs(network.s[:, 0, 0]) ** 2 + np.abs(network.s[:, 1, 0]) ** 2, 1.0, atol=1e-12)
    else:
        loss = -20 * np.log10(np.abs(network.s[:, 1, 0]))
        assert np.max(np.abs(loss - design["response"]["insertion_loss_db"])) < 1e-9


def test_accept_header_chooses_csv(client, base_request):
    body = base_request | {"sections": 2, "points": 11}
    design = client.post("/v1/transformers/binomial", json=body).json()
    exported = client.post("/v1/transformers/binomial", json=body, headers={"Accept": "text/csv"})
    assert exported.headers["content-type"].startswith("text/csv")
    rows = list(csv.DictReader(io.StringIO(exported.text)))
    assert len(rows) == 11
    assert [float(r["frequency_hz"]) for r in rows] == design["response"]["frequency_hz"]
    assert [float(r["reflection_magnitude"]) for r in rows] == design["response"]["reflection_magnitude"]


def test_analysis_exports_too(client, base_request):
    sections = [{"impedance_ohm": 70.7, "electrical_length_deg": 90.0}]
    response = client.post("/v1/networks/analyze?format=csv", json=base_request | {"sections": sections})
    assert response.status_code == 200 and response.text.startswith("frequency_hz,")


def test_unknown_format_is_refused(client, base_request):
    response = client.post("/v1/transformers/binomial?format=pdf", json=base_request)
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == "query.format"


def test_two_port_data_order_keyword_matches_the_columns():
    # A non-reciprocal two-port (S21 != S12) written and read back by scikit-rf, which follows the
    # Touchstone 2.0 specification's [Two-Port Data Order] keyword: S12 and S21 must not swap.
    from service.formats.touchstone import write_two_port

    frequency = np.array([1e9, 2e9])
    s = np.array([[[0.1 + 0.0j, 0.02 + 0.01j], [0.9 - 0.1j, 0.2j]], [[0.15j, 0.03 + 0.0j], [0.8 + 0.2j, -0.1 + 0.0j]]])
    network = read_with_scikit_rf(write_two_port(frequency, s, (50.0, 50.0), ["non-reciprocal check"]))
    np.testing.assert_allclose(network.s, s, atol=1e-15)


STEPPED_MEDIA = [
    {"kind": "microstrip", "eps_r": 3.66, "height_m": 0.508e-3, "thickness_m": 35e-6},
    {"kind": "stripline", "eps_r": 2.2, "ground_spacing_m": 1.6e-3, "thickness_m": 17e-6},
    {"kind": "coax", "eps_r": 1.0, "outer_diameter_m": 7e-3},
]


@pytest.mark.parametrize("mode", ["include", "compensate"])
@pytest.mark.parametrize("medium", STEPPED_MEDIA, ids=[m["kind"] for m in STEPPED_MEDIA])
def test_the_touchstone_file_of_a_design_with_steps_is_the_design_with_its_steps(client, mode, medium):
    # The file describes the design whose figures the response gives: with steps where they count.
    body = {
        "source_ohm": 50.0,
        "load": {"resistance_ohm": 18.0},
        "band": {"start_hz": 6e9, "stop_hz": 10e9},
        "sections": 3,
        "theory": "exact",
        "medium": medium,
        "junction_effects": mode,
        "points": 41,
    }
    design = client.post("/v1/transformers/chebyshev", json=body).json()
    network = read_with_scikit_rf(client.post("/v1/transformers/chebyshev?format=touchstone", json=body).text)
    assert np.max(np.abs(np.abs(network.s[:, 0, 0]) - design["response"]["reflection_magnitude"])) < 1e-9
    ideal = client.post("/v1/transformers/chebyshev?format=touchstone", json=body | {"junction_effects": "ignore"})
    assert np.max(np.abs(read_with_scikit_rf(ideal.text).s[:, 0, 0] - network.s[:, 0, 0])) > 1e-4
