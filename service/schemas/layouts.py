"""Request for the layout files (Gerber X2) of a planar design."""

from __future__ import annotations

from pydantic import Field

from service.schemas.common import StrictModel
from service.schemas.items import DesignItem


class LayoutRequest(StrictModel):
    """Design with `design` (microstrip or stripline), then lay out its copper with a feed line at each end."""

    design: DesignItem
    feed_length_m: float = Field(
        5e-3, gt=0.0, le=0.5, description="Length of the feed line at each end (source and load), metres."
    )
    margin_m: float = Field(2e-3, ge=0.0, le=0.1, description="Board beyond the widest strip on each side, metres.")
