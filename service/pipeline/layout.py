"""A planar design's copper and board outline as Gerber X2 files, with a feed line at each end."""

from __future__ import annotations

import numpy as np

from service.errors import UnmeetableRequestError
from service.formats.gerber import Strip, copper_layer, profile_layer
from service.pipeline.items import design_item
from service.pipeline.options import DesignOptions
from service.pipeline.realize import geometry_for
from service.pipeline.request_models import medium_model
from service.schemas.layouts import LayoutRequest
from service.schemas.results import TransformerDesign
from service.schemas.transformers import MatchRequest

COPPER_LAYERS = {"microstrip": "L1,Top", "stripline": "L2,Inr"}  # a stripline's strip is the middle layer


def feed_widths(item: MatchRequest) -> tuple[float, float]:
    """Widths of the feed lines: the source's at the source impedance; the load's at the load's
    resistance where the load is a plain resistance, else at the source impedance (a line to a connector)."""
    load = item.load
    resistive = load.resistance_ohm is not None and not load.reactance_ohm
    load_ohm = load.resistance_ohm if resistive else item.source_ohm
    source, at_load = geometry_for(item, np.array([item.source_ohm, load_ohm]))
    return float(source), float(at_load)


def layout_strips(request: LayoutRequest, design: TransformerDesign) -> list[Strip]:
    """The feed lines and sections along x, source side first (feed_widths says which width each feed has)."""
    source_width, load_width = feed_widths(request.design)
    strips = [Strip(0.0, request.feed_length_m, source_width, "source feed line")]
    position = request.feed_length_m
    for number, section in enumerate(design.sections, start=1):
        strips.append(Strip(position, section.length_m, section.width_m, f"section {number}"))
        position += section.length_m
    strips.append(Strip(position, request.feed_length_m, load_width, "load feed line"))
    return strips


def layout_files(request: LayoutRequest, options: DesignOptions | None = None) -> dict[str, str]:
    """{file name: Gerber X2 text} of the copper layer and the board profile."""
    item = request.design
    kind = medium_model(item).kind
    if kind not in COPPER_LAYERS:
        raise UnmeetableRequestError("design.medium", "layout files are made for microstrip and stripline designs")
    design = design_item(item, options)
    strips = layout_strips(request, design)
    length = strips[-1].start_m + strips[-1].length_m
    half_height = max(strip.width_m for strip in strips) / 2.0 + request.margin_m
    name = f"stepline-{item.method}-{kind}"
    return {
        f"{name}-copper.gbr": copper_layer(strips, COPPER_LAYERS[kind]),
        f"{name}-profile.gbr": profile_layer(length, half_height),
    }
