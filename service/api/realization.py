"""Drawings, layout files and tolerance yield of realized designs."""

import io
import zipfile
from typing import Annotated

from fastapi import APIRouter, Body, Request
from fastapi.responses import Response

from service import pipeline
from service.api.delivery import json_response
from service.api.documented import error_responses
from service.api.examples import request_examples
from service.api.limits import admit_design, admit_yield, design_options
from service.api.scheduling import run_sized
from service.formats.svg import transformer_svg
from service.pipeline.items import Item
from service.pipeline.layout import feed_widths
from service.pipeline.options import DesignOptions
from service.pipeline.wording import count_text
from service.schemas.items import DesignItem
from service.schemas.layouts import LayoutRequest
from service.schemas.tolerance import YieldRequest, YieldResult
from service.settings import Settings

SVG_TYPE = "image/svg+xml"
ZIP_TYPE = "application/zip"


def layout_zip(request: LayoutRequest, options: DesignOptions) -> bytes:
    """The layout files in one zip archive (module level, so a worker process can run it)."""
    archive = io.BytesIO()
    with zipfile.ZipFile(archive, "w", zipfile.ZIP_DEFLATED) as bundle:
        for name, text in pipeline.layout_files(request, options).items():
            bundle.writestr(name, text)
    return archive.getvalue()


def drawing_svg(item: Item, options: DesignOptions) -> str:
    """The SVG drawing of the item's design (module level, so a worker process can run it)."""
    design = pipeline.design_item(item, options)
    outer = getattr(item.medium, "outer_diameter_m", None)
    feeds = feed_widths(item) if design.medium in ("microstrip", "stripline") else None
    title = f"Stepline {item.method} transformer, {design.medium}, {count_text(len(design.sections), 'section')}"
    return transformer_svg(design, title, outer, feeds)


def build_router(settings: Settings) -> APIRouter:
    """The /v1/drawings and /v1/yield routes."""
    options = design_options(settings)
    router = APIRouter(prefix="/v1", tags=["realization"], responses=error_responses())
    drawing_examples = request_examples(settings.examples_dir, "drawings")
    yield_examples = request_examples(settings.examples_dir, "yield")

    @router.post(
        "/drawings",
        summary="Drawing of the realized transformer",
        response_class=Response,
        responses={200: {"content": {SVG_TYPE: {"schema": {"type": "string"}}}, "description": "An SVG drawing."}},
    )
    async def drawing(item: Annotated[DesignItem, Body(openapi_examples=drawing_examples)], http: Request) -> Response:
        """Design with the named method and draw it: strip steps from above, or the coax in cut-away."""
        seconds = admit_design(item.model_dump(), settings)
        svg = await run_sized(drawing_svg, (item, options), seconds, settings.deadline_s, http)
        return Response(svg, media_type=SVG_TYPE)

    layout_examples = request_examples(settings.examples_dir, "layouts")

    @router.post(
        "/layouts",
        summary="Layout files (Gerber X2) of a planar design",
        response_class=Response,
        responses={
            200: {
                "content": {ZIP_TYPE: {"schema": {"type": "string", "format": "binary"}}},
                "description": "A zip of the copper layer and the board profile, Gerber X2, millimetres.",
            }
        },
    )
    async def layout(
        request: Annotated[LayoutRequest, Body(openapi_examples=layout_examples)], http: Request
    ) -> Response:
        """Design (microstrip or stripline); lay out its copper with a feed line at each end, and the board outline."""
        seconds = admit_design(request.design.model_dump(), settings)
        archive = await run_sized(layout_zip, (request, options), seconds, settings.deadline_s, http)
        name = f"stepline-{request.design.method}-layout.zip"
        return Response(archive, media_type=ZIP_TYPE, headers={"content-disposition": f'attachment; filename="{name}"'})

    @router.post("/yield", response_model=YieldResult, summary="Monte Carlo yield under tolerances")
    async def tolerance_yield(
        request: Annotated[YieldRequest, Body(openapi_examples=yield_examples)], http: Request
    ) -> Response:
        """Design, then perturb widths, etch, permittivity and height over seeded trials."""
        seconds = admit_yield(request, settings)
        analysis = await run_sized(pipeline.yield_analysis, (request, options), seconds, settings.deadline_s, http)
        return json_response(analysis)

    return router
