"""Design responses as JSON, Touchstone or CSV, chosen by ?format= or the Accept header."""

from typing import Annotated, Any, Literal

from fastapi import Query, Request
from fastapi.responses import Response
from pydantic import BaseModel

from service.formats.csv_table import response_csv
from service.formats.touchstone import write_two_port
from service.pipeline.exports import two_port
from service.schemas.results import AnalysisResult
from service.schemas.transformers import MatchRequest

TOUCHSTONE_TYPE = "application/x-touchstone"
CSV_TYPE = "text/csv"
NDJSON_TYPE = "application/x-ndjson"
OutputFormat = Literal["json", "touchstone", "csv"]


# The ?format= parameter of the routes that can export. Routes take it and the Request directly
# rather than through a dependency: FastAPI's dependency solving costs more than a small design.
FormatQuery = Annotated[
    OutputFormat | None,
    Query(description="json (default), touchstone (a two-port file) or csv (the response curve)."),
]


def output_format(format: OutputFormat | None, request: Request) -> OutputFormat:
    """The format asked for: the query parameter wins, then the Accept header, then JSON."""
    if format is not None:
        return format
    accepted = request.headers.get("accept", "").lower()
    if TOUCHSTONE_TYPE in accepted:
        return "touchstone"
    if CSV_TYPE in accepted:
        return "csv"
    return "json"


def export_responses() -> dict[int | str, dict[str, Any]]:
    """OpenAPI note of the other formats a design endpoint can answer in."""
    return {
        200: {
            "content": {
                TOUCHSTONE_TYPE: {"schema": {"type": "string"}},
                CSV_TYPE: {"schema": {"type": "string"}},
            },
            "description": "The design; as a Touchstone 2.0 two-port or a CSV response curve on request.",
        }
    }


def json_response(result: BaseModel) -> Response:
    """A result serialized straight to JSON bytes.

    Routes still declare their response model for the schema; returning the bytes skips FastAPI's
    re-validation of a result that the model already validated when it was built.
    """
    return Response(result.model_dump_json(), media_type="application/json")


def deliver(request: MatchRequest, design: AnalysisResult, fmt: OutputFormat, name: str) -> Response:
    """The design in the chosen format."""
    if fmt == "csv":
        return Response(
            response_csv(design.response),
            media_type=CSV_TYPE,
            headers={"Content-Disposition": f'attachment; filename="{name}.csv"'},
        )
    if fmt == "touchstone":
        frequencies, matrices, references = two_port(request, design)
        comments = [
            f"Stepline {name} design: port 1 referenced to the source ({references[0]:g} ohm), "
            f"port 2 to the load resistance ({references[1]:g} ohm)",
        ]
        return Response(
            write_two_port(frequencies, matrices, references, comments),
            media_type=TOUCHSTONE_TYPE,
            headers={"Content-Disposition": f'attachment; filename="{name}.s2p"'},
        )
    return json_response(design)
