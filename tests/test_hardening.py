"""Limits, access control, request ids and headers."""

import json
import logging

import pytest
from fastapi.testclient import TestClient

from service.app import create_app
from service.settings import Settings
from tests.conftest import BASE_REQUEST

DESIGN = "/v1/transformers/chebyshev"


def client_with(**settings) -> TestClient:
    return TestClient(create_app(Settings(**settings)), raise_server_exceptions=False)


def test_declared_body_over_the_limit_is_413():
    client = client_with(max_body_bytes=2000)
    body = json.dumps(BASE_REQUEST | {"padding": "x" * 3000})
    response = client.post(DESIGN, content=body, headers={"content-type": "application/json"})
    assert response.status_code == 413
    assert response.json()["problems"][0]["field"] == "body"


def test_streamed_body_over_the_limit_is_413():
    client = client_with(max_body_bytes=2000)

    def chunks():
        yield b'{"source_ohm": 50, "padding": "'
        for _ in range(10):
            yield b"x" * 500
        yield b'"}'

    response = client.post(DESIGN, content=chunks(), headers={"content-type": "application/json"})
    assert response.status_code == 413


@pytest.mark.parametrize(
    "settings, body, field",
    [
        ({"max_points": 100}, BASE_REQUEST | {"points": 101}, "points"),
        ({"compute_budget_s": 0.0001}, BASE_REQUEST | {"sections": 3}, "body"),
    ],
)
def test_limits_are_settings(settings, body, field):
    response = client_with(**settings).post(DESIGN, json=body)
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == field


def test_taper_segment_and_trial_limits():
    client = client_with(max_segments=16, max_trials=100)
    taper = client.post("/v1/transformers/taper", json=BASE_REQUEST | {"segments": 32})
    assert taper.status_code == 422 and taper.json()["problems"][0]["field"] == "segments"
    item = BASE_REQUEST | {
        "method": "chebyshev",
        "sections": 2,
        "medium": {"kind": "coax", "eps_r": 2.1, "outer_diameter_m": 7e-3},
    }
    trials = client.post("/v1/yield", json={"design": item, "tolerances": {}, "trials": 101})
    assert trials.status_code == 422 and trials.json()["problems"][0]["field"] == "trials"


def test_only_refined_loads_are_charged_the_refinement_time():
    # A validated request lists every load field, unset ones as None; only a set one may count.
    budget = {"compute_budget_s": 0.05}
    plain = client_with(**budget).post(DESIGN, json=BASE_REQUEST | {"sections": 3})
    assert plain.status_code == 200
    circuit = {"circuit": {"kind": "series-rl", "resistance_ohm": 20, "inductance_h": 1e-9}}
    refined = client_with(**budget).post(DESIGN, json=BASE_REQUEST | {"sections": 3, "load": circuit})
    assert refined.status_code == 422 and refined.json()["problems"][0]["field"] == "body"


def test_sweep_and_batch_budgets():
    client = client_with(compute_budget_s=0.01)
    sweep = {
        "base": BASE_REQUEST | {"method": "binomial", "sections": 4},
        "vary": {"load.resistance_ohm": {"start": 10, "stop": 90, "count": 200}},
    }
    response = client.post("/v1/sweeps", json=sweep)
    assert response.status_code == 422 and response.json()["problems"][0]["field"] == "vary"
    batch = client.post("/v1/batch", json={"requests": [BASE_REQUEST | {"method": "binomial", "sections": 4}] * 200})
    assert batch.status_code == 422 and batch.json()["problems"][0]["field"] == "requests"


def test_api_key_when_set():
    client = client_with(api_key="lab-bench-key")
    refused = client.post(DESIGN, json=BASE_REQUEST)
    assert refused.status_code == 401
    assert refused.json()["problems"][0]["field"] == "authorization"
    wrong = client.post(DESIGN, json=BASE_REQUEST, headers={"Authorization": "Bearer nope"})
    assert wrong.status_code == 401
    allowed = client.post(DESIGN, json=BASE_REQUEST, headers={"Authorization": "Bearer lab-bench-key"})
    assert allowed.status_code == 200
    health = client.get("/v1/health")
    assert health.status_code == 200 and health.json()["key_required"] is True
    assert client.get("/").status_code == 200


def test_no_key_needed_by_default(client):
    assert client.get("/v1/health").json()["key_required"] is False
    assert client.post(DESIGN, json=BASE_REQUEST).status_code == 200


def test_request_id_and_access_log_without_bodies(client, caplog):
    with caplog.at_level(logging.INFO, logger="stepline.access"):
        given = client.post(DESIGN, json=BASE_REQUEST | {"source_ohm": 49.123456}, headers={"X-Request-ID": "bench-7"})
        made = client.get("/v1/health")
    assert given.headers["x-request-id"] == "bench-7"
    assert len(made.headers["x-request-id"]) == 32
    records = [json.loads(r.getMessage()) for r in caplog.records if r.name == "stepline.access"]
    assert {r["request_id"] for r in records} >= {"bench-7", made.headers["x-request-id"]}
    assert all(set(r) == {"request_id", "method", "path", "status", "duration_ms", "client"} for r in records)
    assert "49.123456" not in caplog.text


def test_cors_allowlist():
    client = client_with(cors_allow_origins=["http://lab-portal.example"])
    allowed = client.options(
        DESIGN, headers={"Origin": "http://lab-portal.example", "Access-Control-Request-Method": "POST"}
    )
    assert allowed.headers.get("access-control-allow-origin") == "http://lab-portal.example"
    other = client.post(DESIGN, json=BASE_REQUEST, headers={"Origin": "http://elsewhere.example"})
    assert "access-control-allow-origin" not in other.headers


def test_cors_preflight_and_refusals_carry_the_headers_with_a_key_set():
    # The Fetch standard's CORS protocol: a preflight never carries credentials, so it must be
    # answered without the key; refusals need the CORS headers for the page to read them.
    origin = "http://lab-portal.example"
    client = client_with(api_key="lab-bench-key", cors_allow_origins=[origin], max_body_bytes=4096)
    preflight = client.options(
        DESIGN,
        headers={
            "Origin": origin,
            "Access-Control-Request-Method": "POST",
            "Access-Control-Request-Headers": "authorization",
        },
    )
    assert preflight.status_code == 200 and preflight.headers["access-control-allow-origin"] == origin
    refused = client.post(DESIGN, json=BASE_REQUEST, headers={"Origin": origin})
    too_big = client.post(
        DESIGN,
        content=b"{" + b" " * 8000 + b"}",
        headers={"Origin": origin, "Authorization": "Bearer lab-bench-key", "Content-Type": "application/json"},
    )
    for answer, status in ((refused, 401), (too_big, 413)):
        assert answer.status_code == status
        assert answer.headers["access-control-allow-origin"] == origin
        assert answer.headers["x-content-type-options"] == "nosniff"


def test_page_headers_and_framing_setting():
    page = client_with(frame_ancestors=["http://lab-portal.example"]).get("/")
    assert page.headers["x-content-type-options"] == "nosniff"
    assert "frame-ancestors 'self' http://lab-portal.example" in page.headers["content-security-policy"]


@pytest.mark.parametrize(
    "content",
    [b"[" * 100000, b'{"a":' * 50000, b"\xff\xfe\xfd", b"\x00", b'{"source_ohm": 1e999999}', b"[]", b"3"],
)
def test_hostile_bodies_are_4xx(content):
    response = client_with().post(DESIGN, content=content, headers={"content-type": "application/json"})
    assert 400 <= response.status_code < 500
    assert response.json()["problems"]


@pytest.mark.parametrize(
    "method, change",
    [
        ("chebyshev", {"sections": 32, "theory": "exact", "band": {"start_hz": 1e9, "stop_hz": 1e9 * (1 + 1e-12)}}),
        ("chebyshev", {"sections": 32, "theory": "exact", "load": {"resistance_ohm": 1e5}, "source_ohm": 1e-3}),
        ("binomial", {"sections": 32, "load": {"resistance_ohm": 1e-3}, "max_reflection": 1e-6}),
        ("taper", {"load": {"resistance_ohm": 1e5}, "source_ohm": 1e-3, "max_reflection": 0.9, "segments": 16}),
        ("quarter-wave", {"load": {"resistance_ohm": 1e-3, "reactance_ohm": 1e5}}),
    ],
)
def test_extreme_valid_requests_answer_without_server_errors(method, change):
    # Regression cases from fuzzing at larger example counts: corners of the valid input space.
    response = client_with().post(f"/v1/transformers/{method}", json=BASE_REQUEST | change)
    assert response.status_code in (200, 422), response.text
    assert "NaN" not in response.text and "Infinity" not in response.text


HUGE_ITEMS = [
    {"sections": 10**400},  # float() of this JSON integer overflows
    {"sections": 1e308, "points": 10**12},
    {"sections": 2.5},
    {"points": -(10**30)},
]


@pytest.mark.parametrize("bad", HUGE_ITEMS)
def test_an_invalid_item_is_refused_in_place_and_never_prices_the_batch(client, base_request, bad):
    items = [base_request | {"method": "binomial"} | bad, base_request | {"method": "binomial", "sections": 3}]
    response = client.post("/v1/batch", json={"requests": items})
    assert response.status_code == 200, response.text
    assert [result["status"] for result in response.json()["results"]] == [422, 200]


@pytest.mark.parametrize("values", [[2, 10**400], [2, 1e9], [2, -(10**20)]])
def test_an_invalid_swept_value_is_refused_in_place(client, base_request, values):
    body = {"base": base_request | {"method": "binomial"}, "vary": {"sections": values}}
    response = client.post("/v1/sweeps", json=body)
    assert response.status_code == 200, response.text
    assert [result["status"] for result in response.json()["results"]] == [200, 422]


def test_access_log_is_on_by_default_and_can_be_turned_off(capsys):
    from service.api.middleware import access_log

    assert Settings.from_env({}).access_log is True
    quiet = Settings.from_env({"STEPLINE_ACCESS_LOG": "false"})
    assert quiet.access_log is False
    TestClient(create_app(quiet)).get("/v1/health")
    assert not access_log.isEnabledFor(logging.INFO)
    loud = TestClient(create_app(Settings()))
    capsys.readouterr()
    loud.get("/v1/health", headers={"X-Request-ID": "log-check-1"})
    line = [json.loads(x) for x in capsys.readouterr().out.splitlines() if "log-check-1" in x]
    assert line and line[0]["path"] == "/v1/health" and line[0]["status"] == 200


@pytest.mark.parametrize(
    "path, query, accept, field",
    [
        ("/v1/transformers/compare", "?format=csv", None, "format"),
        ("/v1/transformers/compare", "", "text/csv", "accept"),
        ("/v1/batch", "?format=touchstone", None, "format"),
        ("/v1/transformers/binomial", "", "application/xml", "accept"),
        ("/v1/sweeps", "?format=csv", None, "format"),
    ],
)
def test_formats_a_route_lacks_are_refused_with_406(client, path, query, accept, field):
    # RFC 9110 sec. 15.5.7: 406 when the route cannot answer in any format the request accepts.
    headers = {"accept": accept} if accept else {}
    body = BASE_REQUEST | {"method": "binomial"}
    if path == "/v1/batch":
        body = {"requests": [body]}
    if path == "/v1/sweeps":
        body = {"base": body, "vary": {"sections": [1, 2]}}
    response = client.post(path + query, json=body, headers=headers)
    assert response.status_code == 406
    problem = response.json()["problems"][0]
    assert problem["field"] == field and "json" in problem["message"]


def test_formats_a_route_has_are_honoured(client):
    assert client.post("/v1/transformers/compare?format=json", json=BASE_REQUEST).status_code == 200
    browser = "text/html,application/xhtml+xml,application/xml;q=0.9,*/*;q=0.8"
    assert client.post(DESIGN, json=BASE_REQUEST, headers={"accept": browser}).status_code == 200
    csv_answer = client.post(DESIGN, json=BASE_REQUEST, headers={"accept": "text/csv"})
    assert csv_answer.headers["content-type"].startswith("text/csv")


def test_a_body_without_the_json_header_is_told_to_send_it(client):
    response = client.post(DESIGN, content=json.dumps(BASE_REQUEST), headers={"content-type": "text/plain"})
    assert response.status_code == 422
    assert "content-type: application/json" in response.json()["problems"][0]["message"]


def test_a_two_port_file_as_a_load_is_named_for_what_it_is(client):
    two_port = "# GHz S MA R 50\n1 0.1 0 0.9 0 0.9 0 0.1 0\n2 0.1 0 0.9 0 0.9 0 0.1 0\n"
    response = client.post(DESIGN, json=BASE_REQUEST | {"load": {"touchstone": two_port}})
    assert response.status_code == 422
    problem = response.json()["problems"][0]
    assert problem["field"] == "load.touchstone" and "two-port" in problem["message"] and ".s1p" in problem["message"]


def test_answers_held_in_memory_are_bounded():
    client = client_with(max_answer_curve_points=1000, max_answer_designs=10)
    item = BASE_REQUEST | {"method": "binomial", "sections": 2, "points": 400}
    batch = client.post("/v1/batch", json={"requests": [item] * 3, "include_curves": True})
    assert batch.status_code == 422 and batch.json()["problems"][0]["field"] == "include_curves"
    assert client.post("/v1/batch", json={"requests": [item] * 3}).status_code == 200
    sweep = {"base": item, "vary": {"load.resistance_ohm": {"start": 10, "stop": 90, "count": 11}}}
    refused = client.post("/v1/sweeps", json=sweep)
    assert refused.status_code == 422 and refused.json()["problems"][0]["field"] == "output"
    streamed = client.post("/v1/sweeps", json=sweep | {"output": "ndjson"})
    assert streamed.status_code == 200 and len(streamed.text.splitlines()) == 12
