"""Bad input: every case is a 422 (or 4xx for unparseable bodies) naming the field; never a 500."""

import copy

import pytest

from tests.conftest import BASE_REQUEST

ENDPOINTS = ["/v1/transformers/quarter-wave", "/v1/transformers/binomial", "/v1/transformers/chebyshev"]


def with_change(path: tuple, value) -> dict:
    body = copy.deepcopy(BASE_REQUEST)
    target = body
    for key in path[:-1]:
        target = target[key]
    if value is KeyError:
        del target[path[-1]]
    else:
        target[path[-1]] = value
    return body


BAD_FIELDS = [
    (("source_ohm",), 0, "source_ohm"),
    (("source_ohm",), -50, "source_ohm"),
    (("source_ohm",), 1e9, "source_ohm"),
    (("source_ohm",), "50", "source_ohm"),
    (("source_ohm",), None, "source_ohm"),
    (("source_ohm",), True, "source_ohm"),
    (("source_ohm",), KeyError, "source_ohm"),
    (("load", "resistance_ohm"), 0.0, "load.resistance_ohm"),
    (("load", "resistance_ohm"), -10.0, "load.resistance_ohm"),
    (("load", "resistance_ohm"), 10**400, "load.resistance_ohm"),
    (("load", "reactance_ohm"), 1e9, "load.reactance_ohm"),
    (("load", "reactance_ohm"), "j25", "load.reactance_ohm"),
    (("load",), KeyError, "load"),
    (("load",), 100, "load"),
    (("band", "stop_hz"), 1e9, "band.stop_hz"),
    (("band", "stop_hz"), 0.5e9, "band.stop_hz"),
    (("band", "start_hz"), 0.0, "band.start_hz"),
    (("band", "start_hz"), -1e9, "band.start_hz"),
    (("band", "stop_hz"), 1e15, "band.stop_hz"),
    (("band", "start_hz"), "1 GHz", "band.start_hz"),
    (("sections",), 0, "sections"),
    (("sections",), 33, "sections"),
    (("sections",), 2.5, "sections"),
    (("sections",), "3", "sections"),
    (("max_reflection",), 0.0, "max_reflection"),
    (("max_reflection",), 1.0, "max_reflection"),
    (("points",), 1, "points"),
    (("points",), 10002, "points"),
    (("velocity_factor",), 0.0, "velocity_factor"),
    (("velocity_factor",), 1e-200, "velocity_factor"),
    (("velocity_factor",), 1.5, "velocity_factor"),
    (("unknown_field",), 1, "unknown_field"),
]


@pytest.mark.parametrize("endpoint", ENDPOINTS)
@pytest.mark.parametrize("path, value, field", BAD_FIELDS)
def test_bad_field_is_named(client, endpoint, path, value, field):
    response = client.post(endpoint, json=with_change(path, value))
    assert response.status_code == 422, response.text
    body = response.json()
    assert body["status"] == 422
    assert field in [problem["field"] for problem in body["problems"]]
    assert all(problem["message"] for problem in body["problems"])


def test_quarter_wave_refuses_more_sections(client):
    response = client.post(ENDPOINTS[0], json=with_change(("sections",), 2))
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == "sections"


@pytest.mark.parametrize("token", ["NaN", "Infinity", "-Infinity"])
@pytest.mark.parametrize("field", ["source_ohm", "max_reflection", "velocity_factor"])
def test_non_finite_numbers_are_refused(client, token, field):
    values = {"source_ohm": "50", "max_reflection": "0.1", "velocity_factor": "1"} | {field: token}
    body = (
        f'{{"source_ohm": {values["source_ohm"]}, "load": {{"resistance_ohm": 100}}, '
        f'"band": {{"start_hz": 1e9, "stop_hz": 3e9}}, "max_reflection": {values["max_reflection"]}, '
        f'"velocity_factor": {values["velocity_factor"]}}}'
    )
    response = client.post(ENDPOINTS[1], content=body, headers={"content-type": "application/json"})
    assert response.status_code == 422
    assert field in [problem["field"] for problem in response.json()["problems"]]


@pytest.mark.parametrize(
    "content",
    [b"", b"{", b"not json", b"[1, 2]", b'"text"', b"null", b"\xff\xfe\x00", b'{"source_ohm": 50,}'],
)
def test_unparseable_bodies_are_4xx(client, content):
    response = client.post(ENDPOINTS[2], content=content, headers={"content-type": "application/json"})
    assert 400 <= response.status_code < 500
    assert response.json()["problems"]


def test_wrong_content_type_is_4xx(client):
    response = client.post(ENDPOINTS[1], content=b"source_ohm=50", headers={"content-type": "text/plain"})
    assert 400 <= response.status_code < 500


def test_unknown_path_uses_the_error_shape(client):
    response = client.get("/v1/nothing-here")
    assert response.status_code == 404
    assert response.json()["problems"][0]["field"] == "request"
