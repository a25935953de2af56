"""Request and response of the Monte Carlo yield analysis."""

from __future__ import annotations

from typing import Annotated

from pydantic import Field

from service.constants import MAX_TRIALS
from service.schemas.common import StrictModel
from service.schemas.glossary import DescribedModel
from service.schemas.items import DesignItem
from service.schemas.results import TransformerDesign

Sigma = Annotated[float, Field(ge=0.0, le=0.01, description="One standard deviation, in metres.")]


class ToleranceSpec(StrictModel):
    """One-sigma manufacturing errors of a normal distribution each."""

    width_m: Sigma = Field(0.0, description="Independent error of each strip width (or inner diameter), metres.")
    eps_r: float = Field(0.0, ge=0.0, le=5.0, description="Error of the board's relative permittivity.")
    height_m: Sigma = Field(0.0, description="Error of the substrate height (stripline: ground spacing), metres.")
    etch_bias_m: Sigma = Field(0.0, description="Error common to all widths of a board (over- or under-etch), metres.")


class YieldRequest(StrictModel):
    """Design with `design` (any method, in a physical medium), then run `trials` perturbed copies."""

    design: DesignItem
    tolerances: ToleranceSpec
    trials: int = Field(1000, ge=1, le=MAX_TRIALS)
    seed: int = Field(0, ge=0, le=2**63 - 1, description="Seed of the random draws; the same seed repeats the result.")


class Percentiles(DescribedModel):
    """Percentiles of the trials' worst in-band reflection."""

    p50: float
    p90: float
    p95: float
    p99: float


class Histogram(DescribedModel):
    """How the trials' worst in-band reflection is distributed."""

    edges: list[float] = Field(description="Bin edges of |reflection|, one more than the counts, evenly spaced.")
    counts: list[int] = Field(description="Trials whose worst in-band |reflection| falls in each bin.")


class ClippedDraws(DescribedModel):
    """How many random draws were held at a physical floor instead of their drawn value."""

    eps_r: int = Field(description="Permittivities drawn below 1 (vacuum), held at 1.")
    height_m: int = Field(description="Substrate heights drawn below 1% of nominal, held there.")
    geometry: int = Field(description="Section widths or diameters drawn below 1% of nominal, held there.")


class WorstTrial(DescribedModel):
    """The trial with the largest worst in-band reflection, and what it drew."""

    index: int = Field(description="Its position among the trials, from 0 (repeatable with the seed).")
    max_reflection: float = Field(description="Its worst in-band |reflection|.")
    eps_r: float = Field(description="Its board permittivity.")
    height_m: float = Field(description="Its substrate height (stripline: ground spacing; unused in coax).")
    etch_bias_m: float = Field(description="Its etch bias, common to all sections.")
    section_geometry_m: list[float] = Field(
        description="Each section's width (inner diameter in coax) in that trial, source side first."
    )


class YieldResult(DescribedModel):
    """The nominal design and how its copies fared."""

    design: TransformerDesign
    trials: int
    seed: int
    spec_max_reflection: float
    yield_fraction: float = Field(description="Fraction of trials whose worst in-band reflection meets the spec.")
    standard_error: float = Field(description="Binomial sampling error sqrt(p (1 - p) / N) of the yield.")
    interval_95: tuple[float, float] = Field(description="Wilson 95% interval of the yield.")
    nominal_max_reflection: float = Field(description="The nominal design's worst reflection on the same grid.")
    worst_max_reflection: float = Field(description="The worst trial's worst in-band reflection.")
    worst_trial: WorstTrial
    clipped_draws: ClippedDraws
    percentiles: Percentiles
    histogram: Histogram = Field(description="The trials' worst in-band reflection, counted in even bins.")
    grid_points: int = Field(description="Frequencies over the band at which each trial is evaluated.")
    method: str = Field(description="How the yield was estimated, in words.")
