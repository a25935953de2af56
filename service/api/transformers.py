"""Stepped-transformer synthesis endpoints: thin wrappers around the designer."""

from typing import Annotated

from fastapi import APIRouter, Body

from service import designer
from service.api.documented import error_responses
from service.examples import request_examples
from service.schemas.comparison import CompareRequest, Comparison
from service.schemas.results import TransformerDesign
from service.schemas.tapers import TaperRequest
from service.schemas.transformers import QuarterWaveRequest, TransformerRequest
from service.settings import Settings


def build_router(settings: Settings) -> APIRouter:
    """The /v1/transformers routes, with their request examples."""
    options = settings.design_options()
    router = APIRouter(prefix="/v1/transformers", tags=["transformers"], responses=error_responses())

    quarter_wave_examples = request_examples(settings.examples_dir, "transformers/quarter-wave")
    binomial_examples = request_examples(settings.examples_dir, "transformers/binomial")
    chebyshev_examples = request_examples(settings.examples_dir, "transformers/chebyshev")
    taper_examples = request_examples(settings.examples_dir, "transformers/taper")
    compare_examples = request_examples(settings.examples_dir, "transformers/compare")

    @router.post("/quarter-wave", response_model=TransformerDesign, summary="Quarter-wave transformer")
    def quarter_wave(
        request: Annotated[QuarterWaveRequest, Body(openapi_examples=quarter_wave_examples)],
    ) -> TransformerDesign:
        """One section of impedance sqrt(Z0 RL), a quarter wave long at the band centre."""
        return designer.quarter_wave(request, options)

    @router.post("/binomial", response_model=TransformerDesign, summary="Binomial (maximally flat)")
    def binomial(
        request: Annotated[TransformerRequest, Body(openapi_examples=binomial_examples)],
    ) -> TransformerDesign:
        """Maximally flat multi-section transformer; N given, or the smallest N meeting the spec."""
        return designer.binomial(request, options)

    @router.post("/chebyshev", response_model=TransformerDesign, summary="Chebyshev (equal ripple)")
    def chebyshev(
        request: Annotated[TransformerRequest, Body(openapi_examples=chebyshev_examples)],
    ) -> TransformerDesign:
        """Equal-ripple multi-section transformer; N, ripple, both, or neither (spec 0.1)."""
        return designer.chebyshev(request, options)

    @router.post("/taper", response_model=TransformerDesign, summary="Tapered line")
    def taper(request: Annotated[TaperRequest, Body(openapi_examples=taper_examples)]) -> TransformerDesign:
        """Exponential, triangular or Klopfenstein taper, cut into equal steps and checked exactly."""
        return designer.tapered(request, options)

    @router.post("/compare", response_model=Comparison, summary="Every method side by side")
    def compare(request: Annotated[CompareRequest, Body(openapi_examples=compare_examples)]) -> Comparison:
        """All applicable methods and theories for one request, ranked for meeting the spec shortest."""
        return designer.compare(request, options)

    return router
