"""Transformer synthesis endpoints: thin wrappers around the designer."""

from typing import Annotated

from fastapi import APIRouter, Body, Depends
from fastapi.responses import Response

from service import designer
from service.api.delivery import OutputFormat, deliver, export_responses, output_format
from service.api.documented import error_responses
from service.designer.budget import check_budget, check_sizes, design_seconds
from service.examples import request_examples
from service.schemas.comparison import CompareRequest, Comparison
from service.schemas.results import TransformerDesign
from service.schemas.tapers import TaperRequest
from service.schemas.transformers import MatchRequest, QuarterWaveRequest, TransformerRequest
from service.settings import Settings

Format = Annotated[OutputFormat, Depends(output_format)]


def build_router(settings: Settings) -> APIRouter:
    """The /v1/transformers routes, with their request examples."""
    options = settings.design_options()
    router = APIRouter(prefix="/v1/transformers", tags=["transformers"], responses=error_responses())

    def examples(name: str) -> dict:
        return request_examples(settings.examples_dir, f"transformers/{name}")

    quarter_wave_examples = examples("quarter-wave")
    binomial_examples = examples("binomial")
    chebyshev_examples = examples("chebyshev")
    taper_examples = examples("taper")
    compare_examples = examples("compare")
    exports = export_responses()

    def guarded(request: MatchRequest, count: int = 1) -> None:
        raw = request.model_dump()
        check_sizes(raw, settings)
        check_budget(count * design_seconds(raw), settings, "body")

    @router.post(
        "/quarter-wave", response_model=TransformerDesign, summary="Quarter-wave transformer", responses=exports
    )
    def quarter_wave(
        request: Annotated[QuarterWaveRequest, Body(openapi_examples=quarter_wave_examples)], fmt: Format
    ) -> TransformerDesign | Response:
        """One section of impedance sqrt(Z0 RL), a quarter wave long at the band centre."""
        guarded(request)
        return deliver(request, designer.quarter_wave(request, options), fmt, "quarter-wave")

    @router.post("/binomial", response_model=TransformerDesign, summary="Binomial (maximally flat)", responses=exports)
    def binomial(
        request: Annotated[TransformerRequest, Body(openapi_examples=binomial_examples)], fmt: Format
    ) -> TransformerDesign | Response:
        """Maximally flat multi-section transformer; N given, or the smallest N meeting the spec."""
        guarded(request)
        return deliver(request, designer.binomial(request, options), fmt, "binomial")

    @router.post("/chebyshev", response_model=TransformerDesign, summary="Chebyshev (equal ripple)", responses=exports)
    def chebyshev(
        request: Annotated[TransformerRequest, Body(openapi_examples=chebyshev_examples)], fmt: Format
    ) -> TransformerDesign | Response:
        """Equal-ripple multi-section transformer; N, ripple, both, or neither (spec 0.1)."""
        guarded(request)
        return deliver(request, designer.chebyshev(request, options), fmt, "chebyshev")

    @router.post("/taper", response_model=TransformerDesign, summary="Tapered line", responses=exports)
    def taper(
        request: Annotated[TaperRequest, Body(openapi_examples=taper_examples)], fmt: Format
    ) -> TransformerDesign | Response:
        """Exponential, triangular or Klopfenstein taper, cut into equal steps and checked exactly."""
        guarded(request)
        return deliver(request, designer.tapered(request, options), fmt, f"{request.profile}-taper")

    @router.post("/compare", response_model=Comparison, summary="Every method side by side")
    def compare(request: Annotated[CompareRequest, Body(openapi_examples=compare_examples)]) -> Comparison:
        """All applicable methods and theories for one request, ranked for meeting the spec shortest."""
        guarded(request, count=8)
        return designer.compare(request, options)

    return router
