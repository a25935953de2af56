"""Batches and sweeps of designs."""

import functools
import json
from collections.abc import Iterator
from typing import Annotated

from fastapi import APIRouter, Body, Request
from fastapi.responses import Response, StreamingResponse

from service.api.delivery import NDJSON_TYPE, json_response
from service.api.documented import error_responses
from service.api.examples import request_examples
from service.api.limits import admit_batch, admit_sizes, admit_sweep, design_options
from service.api.scheduling import run_sized
from service.errors import InvalidFieldError
from service.formats.csv_table import sweep_csv_lines
from service.pipeline.sweeps import (
    batch_result,
    sweep_result,
    sweep_results,
    sweep_size,
    unknown_axes,
)
from service.schemas.bulk import BatchRequest, BatchResult, SweepRequest, SweepResult
from service.settings import Settings


def build_router(settings: Settings) -> APIRouter:
    """The /v1/batch and /v1/sweeps routes."""
    options = design_options(settings)

    admit = functools.partial(admit_sizes, settings=settings)  # picklable, for the worker processes

    router = APIRouter(prefix="/v1", tags=["bulk"], responses=error_responses())
    batch_examples = request_examples(settings.examples_dir, "batch")
    sweep_examples = request_examples(settings.examples_dir, "sweeps")

    @router.post("/batch", response_model=BatchResult, summary="Many designs in one request")
    async def batch(request: Annotated[BatchRequest, Body(openapi_examples=batch_examples)], http: Request) -> Response:
        """Each item is validated and designed on its own; results come back in order, errors at their index."""
        seconds = admit_batch(request.requests, request.include_curves, settings)
        arguments = (request.requests, request.include_curves, options, admit)
        return json_response(await run_sized(batch_result, arguments, seconds, settings.deadline_s, http))

    @router.post(
        "/sweeps",
        response_model=SweepResult,
        summary="A grid of designs",
        responses={200: {"content": {"text/csv": {}, NDJSON_TYPE: {}}, "description": "The sweep's designs."}},
    )
    async def sweep(request: Annotated[SweepRequest, Body(openapi_examples=sweep_examples)], http: Request) -> Response:
        """Expand the grid on the server and design every point, as JSON, CSV or streamed NDJSON.
        JSON is computed whole (in a worker process when long, stopped if the client leaves);
        CSV and NDJSON stream a chunk at a time and stop when the client leaves."""
        unknown = unknown_axes(request)
        if unknown:
            raise InvalidFieldError(unknown[0].field, unknown[0].message)
        total = sweep_size(request)
        seconds = admit_sweep(request, settings)
        parameters = list(request.vary)
        if request.output == "json":
            arguments = (request, options, admit)
            return json_response(await run_sized(sweep_result, arguments, seconds, settings.deadline_s, http))
        if request.output == "csv":
            lines = sweep_csv_lines(parameters, sweep_results(request, options, admit))
            return StreamingResponse(lines, media_type="text/csv")
        return StreamingResponse(_ndjson(total, parameters, request), media_type=NDJSON_TYPE)

    def _ndjson(total: int, parameters: list[str], request: SweepRequest) -> Iterator[str]:
        yield json.dumps({"total": total, "parameters": parameters}) + "\n"
        for result in sweep_results(request, options, admit):
            yield result.model_dump_json(exclude_none=True) + "\n"

    return router
