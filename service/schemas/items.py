"""A design request that names its method, for endpoints that take any method (yield, drawings, batches)."""

from __future__ import annotations

from typing import Annotated, Literal

from pydantic import Field

from service.schemas.tapers import TaperRequest
from service.schemas.transformers import QuarterWaveRequest, TransformerRequest


class QuarterWaveItem(QuarterWaveRequest):
    method: Literal["quarter-wave"]


class BinomialItem(TransformerRequest):
    method: Literal["binomial"]


class ChebyshevItem(TransformerRequest):
    method: Literal["chebyshev"]


class TaperItem(TaperRequest):
    method: Literal["taper"]


DesignItem = Annotated[QuarterWaveItem | BinomialItem | ChebyshevItem | TaperItem, Field(discriminator="method")]
