"""Schemathesis fuzzes every operation of the app's own OpenAPI schema: no input may give a 5xx.

The app under test has tight limits (small budget, few points and trials) so that a bounded number
of generated examples per operation finishes quickly; the limits themselves must then answer 4xx.
"""

import schemathesis
from hypothesis import HealthCheck, settings

from service.app import create_app
from service.settings import Settings

APP = create_app(
    Settings(
        compute_budget_s=0.5, max_points=401, max_segments=64, max_trials=200, max_batch_items=20, max_sweep_designs=40
    )
)
schema = schemathesis.openapi.from_asgi("/openapi.json", APP)


@schema.parametrize()
@settings(max_examples=20, deadline=None, suppress_health_check=list(HealthCheck))
def test_no_input_gives_a_server_error(case):
    response = case.call()
    assert response.status_code < 500, f"{case.method} {case.path} -> {response.status_code}: {response.text[:300]}"
    if response.status_code >= 400 and "json" in response.headers.get("content-type", ""):
        body = response.json()
        assert body["problems"] and all(problem["message"] for problem in body["problems"])
