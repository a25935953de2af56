"""Transformer synthesis endpoints: thin wrappers around the designer."""

from collections.abc import Callable
from typing import Annotated

from fastapi import APIRouter, Body, Request
from fastapi.responses import Response

from service import pipeline
from service.api import pricing
from service.api.delivery import FormatQuery, deliver, export_responses, json_response, output_format
from service.api.documented import error_responses
from service.api.examples import request_examples
from service.api.limits import admit_design, admit_priced, design_options
from service.api.scheduling import run_sized
from service.schemas.comparison import CompareRequest, Comparison
from service.schemas.results import TransformerDesign
from service.schemas.tapers import TaperRequest
from service.schemas.transformers import MatchRequest, QuarterWaveRequest, TransformerRequest
from service.settings import Settings

DesignFunction = Callable[..., TransformerDesign]

# (path, request model, designer function, summary, description) of each design route
DESIGN_ROUTES: list[tuple[str, type[MatchRequest], DesignFunction, str, str]] = [
    (
        "quarter-wave",
        QuarterWaveRequest,
        pipeline.quarter_wave,
        "Quarter-wave transformer",
        "One section of impedance sqrt(Z0 RL), a quarter wave long at the band centre.",
    ),
    (
        "binomial",
        TransformerRequest,
        pipeline.binomial,
        "Binomial (maximally flat)",
        "Maximally flat multi-section transformer; N given, or the smallest N meeting the spec.",
    ),
    (
        "chebyshev",
        TransformerRequest,
        pipeline.chebyshev,
        "Chebyshev (equal ripple)",
        "Equal-ripple multi-section transformer; N, ripple, both, or neither (spec 0.1).",
    ),
    (
        "taper",
        TaperRequest,
        pipeline.tapered,
        "Tapered line",
        "Exponential, triangular or Klopfenstein taper, cut into equal steps and checked exactly.",
    ),
]


def build_router(settings: Settings) -> APIRouter:
    """The /v1/transformers routes, with their request examples."""
    options = design_options(settings)
    router = APIRouter(prefix="/v1/transformers", tags=["transformers"], responses=error_responses())

    def add_design_route(path: str, model: type[MatchRequest], design: DesignFunction, summary: str, text: str) -> None:
        examples = request_examples(settings.examples_dir, f"transformers/{path}")

        async def endpoint(
            request: Annotated[model, Body(openapi_examples=examples)], http: Request, format: FormatQuery = None
        ) -> Response:
            seconds = admit_design(request.model_dump() | {"method": path}, settings)
            name = f"{request.profile}-taper" if path == "taper" else path
            result = await run_sized(design, (request, options), seconds, settings.deadline_s, http)
            return deliver(request, result, output_format(format, http), name)

        router.add_api_route(
            f"/{path}",
            endpoint,
            methods=["POST"],
            response_model=TransformerDesign,
            summary=summary,
            description=text,
            responses=export_responses(),
            name=path,
        )

    for route in DESIGN_ROUTES:
        add_design_route(*route)

    compare_examples = request_examples(settings.examples_dir, "transformers/compare")

    @router.post("/compare", response_model=Comparison, summary="Every method side by side")
    async def compare(
        request: Annotated[CompareRequest, Body(openapi_examples=compare_examples)], http: Request
    ) -> Response:
        """All applicable methods and theories for one request, ranked for meeting the spec shortest."""
        sizes = request.model_dump() | {"segments": request.taper_segments}
        seconds = admit_priced(sizes, pricing.compare_seconds(request), settings)
        comparison = await run_sized(pipeline.compare, (request, options), seconds, settings.deadline_s, http)
        return json_response(comparison)

    return router
