"""Yield of a realized design under tolerances: design, rebuild the line, run the trials."""

from __future__ import annotations

import numpy as np

from service.analysis.monte_carlo import Tolerances, monte_carlo
from service.constants import YIELD_GRID_POINTS
from service.errors import UnmeetableRequestError
from service.physics.media import IdealLine
from service.pipeline.exports import design_line
from service.pipeline.items import design_item
from service.pipeline.options import DesignOptions
from service.pipeline.request_models import medium_model
from service.schemas.tolerance import ClippedDraws, Histogram, Percentiles, WorstTrial, YieldRequest, YieldResult

HISTOGRAM_BINS = 40

METHOD_NOTE = (
    "Monte Carlo: each trial draws normal errors (per-section width, board-wide etch bias, "
    "permittivity and substrate height) and is evaluated by the exact cascade at the grid "
    "frequencies; a trial passes when its worst reflection there meets the spec. Draws below a "
    "physical floor (eps_r 1, 1% of a nominal height or width) are held there and counted in "
    "clipped_draws. The standard error is sqrt(p (1 - p) / N)."
)

WITH_STEPS_NOTE = (
    " The junction steps count, as in the nominal design's verified figures: each trial's steps are those of its "
    "own drawn widths and board, the source's feed line taking the board's etch bias."
)


def yield_analysis(request: YieldRequest, options: DesignOptions | None = None) -> YieldResult:
    """The nominal design and the statistics of its perturbed copies."""
    item = request.design
    if isinstance(medium_model(item), IdealLine):
        raise UnmeetableRequestError(
            "design.medium", "a yield analysis needs a physical medium (microstrip, stripline or coax)"
        )
    design = design_item(item, options)
    line = design_line(item, design)
    tolerances = Tolerances(**request.tolerances.model_dump())
    grid = np.linspace(item.band.start_hz, item.band.stop_hz, YIELD_GRID_POINTS)
    figures = monte_carlo(line, grid, item.spec_reflection, tolerances, request.trials, request.seed)
    p50, p90, p95, p99 = np.percentile(figures.worst_reflections, [50, 90, 95, 99])
    counts, edges = np.histogram(figures.worst_reflections, bins=HISTOGRAM_BINS)
    return YieldResult(
        design=design,
        trials=figures.trials,
        seed=request.seed,
        spec_max_reflection=item.spec_reflection,
        yield_fraction=figures.fraction,
        standard_error=figures.standard_error,
        interval_95=figures.interval_95,
        nominal_max_reflection=figures.nominal_worst,
        worst_max_reflection=float(np.max(figures.worst_reflections)),
        worst_trial=WorstTrial(**figures.worst_trial),
        clipped_draws=ClippedDraws(**figures.clipped),
        percentiles=Percentiles(p50=p50, p90=p90, p95=p95, p99=p99),
        histogram=Histogram(edges=edges.tolist(), counts=counts.tolist()),
        grid_points=YIELD_GRID_POINTS,
        method=METHOD_NOTE + (WITH_STEPS_NOTE if item.junction_effects != "ignore" else ""),
    )
