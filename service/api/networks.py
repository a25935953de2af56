"""Exact analysis of a user's own sections."""

from typing import Annotated

from fastapi import APIRouter, Body, Request
from fastapi.responses import Response

from service import pipeline
from service.api import pricing
from service.api.delivery import FormatQuery, deliver, export_responses, output_format
from service.api.documented import error_responses
from service.api.examples import request_examples
from service.api.limits import admit_priced, design_options
from service.api.scheduling import run_sized
from service.schemas.networks import AnalyzeRequest
from service.schemas.results import AnalysisResult
from service.settings import Settings


def build_router(settings: Settings) -> APIRouter:
    """The /v1/networks routes."""
    options = design_options(settings)
    router = APIRouter(prefix="/v1/networks", tags=["networks"], responses=error_responses())
    examples = request_examples(settings.examples_dir, "networks/analyze")

    @router.post(
        "/analyze", response_model=AnalysisResult, summary="Check your own sections", responses=export_responses()
    )
    async def analyze(
        request: Annotated[AnalyzeRequest, Body(openapi_examples=examples)],
        http: Request,
        format: FormatQuery = None,
    ) -> Response:
        """Verify a list of sections (e.g. a design rounded to buildable impedances) by the exact cascade."""
        seconds = admit_priced(request.model_dump(), pricing.analyze_seconds(request), settings)
        result = await run_sized(pipeline.analyze, (request, options), seconds, settings.deadline_s, http)
        return deliver(request, result, output_format(format, http), "analysis")

    return router
