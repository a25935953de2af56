"""Admission: size limits and the per-request compute budget, applied before any work.

The prices come from the cost model in pricing.py; this module only compares them with the
operator's limits and says what to change when a request is refused.
"""

from __future__ import annotations

from typing import Any

from service.api import pricing
from service.errors import UnmeetableRequestError
from service.pipeline.options import DesignOptions
from service.pipeline.sweeps import sweep_slice_size
from service.schemas.bulk import SweepRequest
from service.schemas.tolerance import YieldRequest
from service.settings import Settings


def design_options(settings: Settings) -> DesignOptions:
    """The operator settings the pipeline needs."""
    return DesignOptions(min_feature_m=settings.min_feature_m)


def admit_budget(seconds: float, settings: Settings, field: str) -> None:
    """Refuse a request whose estimated compute exceeds the per-request budget."""
    if seconds > settings.compute_budget_s:
        raise UnmeetableRequestError(
            field,
            f"this request would need about {seconds:.3g} s of computation; the limit per request is "
            f"{settings.compute_budget_s:g} s. Split it into smaller requests.",
        )


def admit_sizes(item: dict[str, Any], settings: Settings, prefix: str = "") -> None:
    """Refuse curve points, taper segments or trials beyond the operator's limits."""
    for name, limit in (("points", settings.max_points), ("segments", settings.max_segments)):
        value = item.get(name)
        if isinstance(value, int) and value > limit:
            raise UnmeetableRequestError(f"{prefix}{name}", f"at most {limit} allowed on this server; got {value}")


def admit_priced(item: dict[str, Any], seconds: float, settings: Settings) -> float:
    """Sizes of a request given as a dict of its fields, and its price against the budget; the price."""
    admit_sizes(item, settings)
    admit_budget(seconds, settings, "body")
    return seconds


def admit_design(item: dict[str, Any], settings: Settings) -> float:
    """Sizes and budget of a request for one design; its estimated seconds."""
    return admit_priced(item, pricing.design_seconds(item), settings)


def admit_yield(request: YieldRequest, settings: Settings) -> float:
    """Sizes, trial count and budget of a yield analysis; its estimated seconds."""
    admit_sizes(request.design.model_dump(), settings, "design.")
    if request.trials > settings.max_trials:
        raise UnmeetableRequestError("trials", f"at most {settings.max_trials} allowed on this server")
    seconds = pricing.yield_seconds(request)
    admit_budget(seconds, settings, "trials")
    return seconds


def admit_curve_points(points: float, settings: Settings, field: str) -> None:
    """Refuse an answer holding more response-curve points than the operator allows (memory)."""
    if points > settings.max_answer_curve_points:
        raise UnmeetableRequestError(
            field,
            f"the answer would hold {points:.0f} response-curve points; at most {settings.max_answer_curve_points} "
            "in one answer. Ask without include_curves, for fewer points, or stream a sweep (ndjson or csv).",
        )


def admit_batch(items: list[Any], include_curves: bool, settings: Settings) -> float:
    """Item count, curve size and budget of a batch; its estimated seconds (items that are not objects
    cost nothing)."""
    if len(items) > settings.max_batch_items:
        raise UnmeetableRequestError(
            "requests", f"at most {settings.max_batch_items} items per batch; this one has {len(items)}"
        )
    if include_curves:
        points = sum(pricing.curve_points(item) for item in items if isinstance(item, dict))
        admit_curve_points(points, settings, "include_curves")
    seconds = pricing.batch_seconds(items)
    admit_budget(seconds, settings, "requests")
    return seconds


def admit_sweep(request: SweepRequest, settings: Settings) -> float:
    """Size and budget of a sweep's slice; its estimated seconds."""
    total = sweep_slice_size(request)
    if total > settings.max_sweep_designs:
        raise UnmeetableRequestError(
            "vary",
            f"the sweep asks for {total} designs; at most {settings.max_sweep_designs} "
            "(give offset and limit to slice it)",
        )
    if request.output == "json":  # held whole in memory, unlike the streamed outputs
        if total > settings.max_answer_designs:
            raise UnmeetableRequestError(
                "output",
                f"a JSON answer holds at most {settings.max_answer_designs} designs; this slice has {total}. "
                "Stream it (output ndjson or csv) or give offset and limit.",
            )
        admit_curve_points(pricing.sweep_curve_points(request), settings, "include_curves")
    seconds = pricing.sweep_seconds(request)
    admit_budget(seconds, settings, "vary")
    return seconds
