"""A client generated from /openapi.json alone (openapi-python-client, from the registry) runs a
design, a batch and a streamed sweep against a live server: the contract is enough to write a
tool against.

Reference for the figures: the same requests sent as plain JSON with httpx.
"""

import importlib
import json
import subprocess
import sys

import httpx
import pytest

from tests.conftest import live_server

pytest.importorskip("openapi_python_client", reason="the test extra (openapi-python-client) is not installed")

DESIGN = {
    "source_ohm": 50.0,
    "load": {"resistance_ohm": 22.0},
    "band": {"start_hz": 1.7e9, "stop_hz": 2.7e9},
    "max_reflection": 0.05,
    "points": 5,
}


@pytest.fixture(scope="module")
def server_url():
    with live_server(STEPLINE_ACCESS_LOG="false") as url:
        yield url


@pytest.fixture(scope="module")
def generated(server_url, tmp_path_factory):
    folder = tmp_path_factory.mktemp("generated")
    (folder / "openapi.json").write_text(httpx.get(server_url + "/openapi.json").text)
    command = [sys.executable, "-c", "from openapi_python_client.cli import app; app()"]
    subprocess.run(
        [*command, "generate", "--path", "openapi.json", "--meta", "none", "--output-path", "stepline_client"],
        cwd=folder,
        check=True,
        capture_output=True,
    )
    sys.path.insert(0, str(folder))
    yield lambda name: importlib.import_module(f"stepline_client.{name}")
    sys.path.remove(str(folder))


def test_a_design_through_the_generated_client(server_url, generated):
    client = generated("client").Client(base_url=server_url)
    endpoint = generated("api.transformers.chebyshev_v1_transformers_chebyshev_post")
    request = generated("models").TransformerRequest.from_dict(DESIGN)
    design = endpoint.sync(client=client, body=request)
    plain = httpx.post(server_url + "/v1/transformers/chebyshev", json=DESIGN).json()
    assert design.verified.max_reflection == plain["verified"]["max_reflection"]
    assert [s.impedance_ohm for s in design.sections] == [s["impedance_ohm"] for s in plain["sections"]]
    assert design.verified.meets_spec is True


def test_a_batch_through_the_generated_client(server_url, generated):
    client = generated("client").Client(base_url=server_url)
    endpoint = generated("api.bulk.batch_v1_batch_post")
    items = [DESIGN | {"method": "binomial", "sections": 2}, DESIGN | {"method": "quarter-wave", "source_ohm": -1}]
    result = endpoint.sync(client=client, body=generated("models").BatchRequest.from_dict({"requests": items}))
    assert [r.status for r in result.results] == [200, 422]
    assert result.results[1].error.problems[0].field == "source_ohm"


def test_a_streamed_sweep_through_the_generated_client(server_url, generated):
    # The generated parser reads one JSON document; a stream is read line by line through the
    # generated client's own request builder and HTTP client.
    client = generated("client").Client(base_url=server_url)
    endpoint = generated("api.bulk.sweep_v1_sweeps_post")
    body = {"base": DESIGN | {"method": "binomial"}, "vary": {"sections": [1, 2, 3]}, "output": "ndjson"}
    request = endpoint._get_kwargs(body=generated("models").SweepRequest.from_dict(body))
    with client.get_httpx_client().stream(**request) as response:
        lines = [json.loads(line) for line in response.iter_lines() if line]
    assert lines[0]["total"] == 3
    assert [len(line["design"]["sections"]) for line in lines[1:]] == [1, 2, 3]
