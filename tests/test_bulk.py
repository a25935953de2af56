"""Batches and sweeps: equal to single requests, errors at their index, limits, and the formats."""

import csv
import io
import json

import pytest
from fastapi.testclient import TestClient

from service.app import create_app
from service.settings import Settings

MICROSTRIP = {"kind": "microstrip", "eps_r": 3.66, "height_m": 0.508e-3, "thickness_m": 35e-6}
BAND = {"start_hz": 1e9, "stop_hz": 3e9}
ITEMS = [
    {"method": "chebyshev", "source_ohm": 50, "load": {"resistance_ohm": 100}, "band": BAND, "sections": 3},
    {
        "method": "chebyshev",
        "source_ohm": 50,
        "load": {"resistance_ohm": 20},
        "band": BAND,
        "sections": 3,
        "theory": "exact",
    },
    {"method": "binomial", "source_ohm": 75, "load": {"resistance_ohm": 300}, "band": BAND, "max_reflection": 0.05},
    {"method": "quarter-wave", "source_ohm": 50, "load": {"resistance_ohm": 30, "reactance_ohm": 10}, "band": BAND},
    {
        "method": "chebyshev",
        "source_ohm": 50,
        "load": {"resistance_ohm": 25},
        "band": BAND,
        "sections": 2,
        "medium": MICROSTRIP,
    },
    {"method": "taper", "source_ohm": 50, "load": {"resistance_ohm": 150}, "band": BAND, "max_reflection": 0.05},
    {
        "method": "binomial",
        "source_ohm": 50,
        "load": {"circuit": {"kind": "series-rl", "resistance_ohm": 20, "inductance_h": 1e-9}},
        "band": BAND,
        "sections": 2,
    },
    {
        "method": "chebyshev",
        "source_ohm": 50,
        "load": {"resistance_ohm": 12},
        "band": {"start_hz": 2e9, "stop_hz": 2.4e9},
        "sections": 3,
        "points": 11,
    },
]


def single(client, item):
    body = {k: v for k, v in item.items() if k != "method"}
    response = client.post(f"/v1/transformers/{item['method']}", json=body)
    assert response.status_code == 200, response.text
    return response.json()


def test_batch_equals_single_requests_item_by_item(client):
    response = client.post("/v1/batch", json={"requests": ITEMS, "include_curves": True})
    assert response.status_code == 200
    results = response.json()["results"]
    assert [r["index"] for r in results] == list(range(len(ITEMS)))
    for item, result in zip(ITEMS, results, strict=True):
        alone = single(client, item)
        batched = result["design"]
        assert result["status"] == 200
        assert batched["sections"] == alone["sections"]
        assert batched["verified"] == alone["verified"]
        assert batched["predicted"] == alone["predicted"]
        assert batched["warnings"] == alone["warnings"]
        assert batched["response"] == alone["response"]


def test_stacked_designs_of_different_bands_equal_their_single_requests(client):
    # Designs of one section count share a stacked check even when their bands differ; each must
    # still be checked on the grid it would get alone, so that its figures never depend on the
    # other items of the batch (6 sections and 11 curve points make the grid sizes differ).
    items = [
        {
            "method": "chebyshev",
            "source_ohm": 50,
            "load": {"resistance_ohm": 8.0 + 23.0 * k},
            "band": {"start_hz": 1e9 + 0.1e9 * k, "stop_hz": (1e9 + 0.1e9 * k) * (1.1 + 0.6 * k)},
            "sections": 6,
            "points": 11,
            "theory": ("exact", "small-reflection")[k % 2],
        }
        for k in range(12)
    ]
    results = client.post("/v1/batch", json={"requests": items, "include_curves": True}).json()["results"]
    for item, result in zip(items, results, strict=True):
        alone = single(client, item)
        assert result["design"]["verified"] == alone["verified"]
        assert result["design"]["response"] == alone["response"]


def test_summaries_leave_out_curves_by_default(client):
    result = client.post("/v1/batch", json={"requests": ITEMS[:1]}).json()["results"][0]
    assert result["design"]["response"] is None


def test_summaries_without_curves_equal_those_with_them_but_for_the_curve(client):
    # Without curves the batch takes its own path (no curve or junction table is built): the
    # summaries must not differ in anything else, for every kind of item above and for a
    # spec-driven item whose exact check asks for more sections than the theory (a second pass).
    second_pass = {"method": "chebyshev", "source_ohm": 50, "load": {"resistance_ohm": 500}, "band": BAND}
    items = [*ITEMS, second_pass | {"max_reflection": 0.05}]
    with_curves = client.post("/v1/batch", json={"requests": items, "include_curves": True}).json()["results"]
    without = client.post("/v1/batch", json={"requests": items}).json()["results"]
    assert any("the exact cascade needed" in w for w in without[-1]["design"]["warnings"])
    for full, brief in zip(with_curves, without, strict=True):
        assert full["design"]["response"] is not None and brief["design"]["response"] is None
        assert {**full["design"], "response": None} == brief["design"]


def test_a_bad_item_does_not_sink_the_batch(client):
    bad = dict(ITEMS[0], band={"start_hz": 3e9, "stop_hz": 1e9})
    unmeetable = dict(ITEMS[2], band={"start_hz": 1e6, "stop_hz": 3.999e9}, max_reflection=1e-4)
    requests = [ITEMS[0], bad, 42, {"method": "stub"}, unmeetable, ITEMS[1]]
    results = client.post("/v1/batch", json={"requests": requests}).json()["results"]
    assert [r["status"] for r in results] == [200, 422, 422, 422, 422, 200]
    assert results[1]["error"]["problems"][0]["field"] == "band.stop_hz"
    assert results[4]["error"]["problems"][0]["field"] == "max_reflection"
    assert all(r["error"]["status"] == 422 and r["error"]["problems"] for r in results[1:5])


def test_an_item_its_medium_cannot_realize_does_not_sink_the_batch(client):
    # The medium refuses only once the impedances are known, inside the stacked check of all
    # items: the refusal must stay with its item, in the shape of a single request's 422.
    thick = {"kind": "microstrip", "eps_r": 128, "height_m": 0.1, "thickness_m": 0.0}
    unrealizable = dict(ITEMS[0], medium=thick)
    results = client.post("/v1/batch", json={"requests": [ITEMS[0], unrealizable, ITEMS[1]]}).json()["results"]
    assert [r["status"] for r in results] == [200, 422, 200]
    alone = client.post("/v1/transformers/chebyshev", json={k: v for k, v in unrealizable.items() if k != "method"})
    assert alone.status_code == 422 and results[1]["error"] == alone.json()


def test_batch_item_limit_is_a_setting():
    limited = TestClient(create_app(Settings(max_batch_items=3)))
    response = limited.post("/v1/batch", json={"requests": ITEMS[:4]})
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == "requests"
    assert limited.post("/v1/batch", json={"requests": ITEMS[:3]}).status_code == 200


SWEEP = {
    "base": {"method": "chebyshev", "source_ohm": 50, "load": {"resistance_ohm": 10}, "band": BAND, "points": 5},
    "vary": {
        "load.resistance_ohm": {"start": 10, "stop": 40, "count": 4},
        "sections": [1, 2, 3],
        "theory": ["small-reflection", "exact"],
    },
}


def test_sweep_expands_every_combination_in_order(client):
    body = client.post("/v1/sweeps", json=SWEEP).json()
    assert body["total"] == 4 * 3 * 2 and len(body["results"]) == 24
    assert body["parameters"] == ["load.resistance_ohm", "sections", "theory"]
    first, last = body["results"][0], body["results"][-1]
    assert first["parameters"] == {"load.resistance_ohm": 10.0, "sections": 1, "theory": "small-reflection"}
    assert last["parameters"] == {"load.resistance_ohm": 40.0, "sections": 3, "theory": "exact"}
    assert len(last["design"]["sections"]) == 3 and last["design"]["theory"] == "exact"


def test_log_range():
    from service.pipeline.sweeps import sweep_values
    from service.schemas.bulk import ValueRange

    assert sweep_values(ValueRange(start=1, stop=100, count=3, spacing="log")) == pytest.approx([1, 10, 100])


def test_ndjson_streams_a_total_then_one_line_per_design(client):
    response = client.post("/v1/sweeps", json=SWEEP | {"output": "ndjson"})
    assert response.headers["content-type"].startswith("application/x-ndjson")
    lines = [json.loads(line) for line in response.text.splitlines()]
    assert lines[0]["total"] == 24 and len(lines) == 25
    assert [line["index"] for line in lines[1:]] == list(range(24))


def test_csv_sweep_parses(client):
    response = client.post("/v1/sweeps", json=SWEEP | {"output": "csv"})
    rows = list(csv.DictReader(io.StringIO(response.text)))
    assert len(rows) == 24
    assert rows[5]["vary.sections"] == "3" and rows[5]["section_count"] == "3"
    header = response.text.splitlines()[0].split(",")
    assert len(header) == len(set(header))  # unique column names
    assert all(float(r["max_reflection"]) > 0 for r in rows)


def test_a_swept_medium_gets_its_own_column(client):
    media = [{"kind": "ideal", "velocity_factor": 0.7}, {"kind": "coax", "eps_r": 2.1, "outer_diameter_m": 7e-3}]
    response = client.post("/v1/sweeps", json=SWEEP | {"vary": {"medium": media}, "output": "csv"})
    rows = list(csv.DictReader(io.StringIO(response.text)))
    assert [row["medium"] for row in rows] == ["ideal", "coax"]
    assert '"coax"' in rows[1]["vary.medium"]


def test_a_vary_path_that_names_no_field_is_refused_before_any_design(client):
    response = client.post("/v1/sweeps", json=SWEEP | {"vary": {"load.resistnce_ohm": [20, 30]}})
    assert response.status_code == 422
    problem = response.json()["problems"][0]
    assert problem["field"] == "vary.load.resistnce_ohm" and "not a field" in problem["message"]


def test_sweep_with_bad_points_reports_them_in_place(client):
    sweep = SWEEP | {"vary": {"load.resistance_ohm": [20, -5, 30]}}
    results = client.post("/v1/sweeps", json=sweep).json()["results"]
    assert [r["status"] for r in results] == [200, 422, 200]
    assert results[1]["error"]["problems"][0]["field"] == "load.resistance_ohm"


def test_sweep_grid_limit_is_a_setting():
    limited = TestClient(create_app(Settings(max_sweep_designs=10)))
    response = limited.post("/v1/sweeps", json=SWEEP)
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == "vary"


def test_a_sweep_sliced_by_offset_and_limit_equals_the_whole(client):
    whole = client.post("/v1/sweeps", json=SWEEP).json()
    parts = [client.post("/v1/sweeps", json=SWEEP | {"offset": o, "limit": 10}).json() for o in (0, 10, 20)]
    assert all(part["total"] == whole["total"] == 24 for part in parts)
    assert [r for part in parts for r in part["results"]] == whole["results"]
    assert [r["index"] for r in parts[2]["results"]] == [20, 21, 22, 23]
