"""Every request example shipped in openapi_examples/ is in the schema and answers 200."""

import json
from pathlib import Path

import pytest
from fastapi.testclient import TestClient

from service.app import create_app
from service.schemas import bulk, comparison, results, tolerance
from service.settings import PROJECT_ROOT, Settings

RESULT_MODELS = {
    name: getattr(module, name)
    for module in (bulk, comparison, results, tolerance)
    for name in dir(module)
    if hasattr(getattr(module, name), "model_validate_json")
}

EXAMPLES = sorted((PROJECT_ROOT / "openapi_examples").rglob("*.json"))


def endpoint_of(path: Path) -> str:
    return "/v1/" + path.parent.relative_to(PROJECT_ROOT / "openapi_examples").as_posix()


def test_examples_exist_for_every_post_endpoint(client):
    posts = {p for p, ops in client.get("/openapi.json").json()["paths"].items() if "post" in ops}
    assert posts <= {endpoint_of(p) for p in EXAMPLES}


@pytest.mark.parametrize("path", EXAMPLES, ids=lambda p: str(p.relative_to(PROJECT_ROOT)))
def test_example_is_documented_and_works(client, path):
    example = json.loads(path.read_text())
    endpoint = endpoint_of(path)
    schema = client.get("/openapi.json").json()
    documented = schema["paths"][endpoint]["post"]["requestBody"]["content"]["application/json"]["examples"]
    assert documented[path.stem]["value"] == example["value"]
    response = client.post(endpoint, json=example["value"])
    assert response.status_code == 200, response.text
    # Routes send their result's JSON bytes without FastAPI re-checking them against the
    # declared response model, so check here that the answer is an instance of that model.
    declared = schema["paths"][endpoint]["post"]["responses"]["200"]["content"]
    if response.headers["content-type"].startswith("application/json") and "application/json" in declared:
        model_name = declared["application/json"]["schema"]["$ref"].rsplit("/", 1)[1]
        RESULT_MODELS[model_name].model_validate_json(response.content)


def test_health(client):
    body = client.get("/v1/health").json()
    assert body["status"] == "ok" and body["version"]


def test_the_schema_is_valid_openapi_3_and_describes_every_field():
    # openapi-spec-validator checks the document against the OpenAPI 3.1 specification's schema.
    from openapi_spec_validator import validate

    for settings in (Settings(access_log=False), Settings(access_log=False, api_key="bench-key")):
        schema = TestClient(create_app(settings)).get("/openapi.json").json()
        validate(schema)
        undescribed = [
            f"{name}.{field}"
            for name, model in schema["components"]["schemas"].items()
            for field, body in model.get("properties", {}).items()
            if "description" not in body
        ]
        assert undescribed == []
        design = schema["paths"]["/v1/transformers/chebyshev"]["post"]
        assert {"401", "406", "413", "422", "503"} <= set(design["responses"])
        assert ("security" in design) == bool(settings.api_key)
