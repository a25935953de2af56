"""Admission: size limits and the per-request compute budget, applied to a raw body before any work.

The compute estimate is a simple cost model calibrated on this project's benchmark machine: a
fixed cost per design, plus the cascade's cost per line section and frequency, with factors for
physical media, spec-driven searches, refinement and Monte Carlo trials. It is deliberately
rough and on the safe side; its only job is to refuse requests that would hold a worker for long.
"""

from __future__ import annotations

import math
from typing import Any

from service.analysis.worst_case import CHECK_POINTS_PER_LOBE, MAX_CHECK_POINTS, MIN_CHECK_POINTS, PEAKS_REFINED
from service.analysis.worst_case import REFINE_POINTS as VERIFY_REFINE_POINTS
from service.constants import (
    DEFAULT_POINTS,
    DEFAULT_SEGMENTS,
    MAX_POINTS,
    MAX_SECTIONS,
    MAX_SEGMENTS,
    YIELD_GRID_POINTS,
)
from service.errors import UnmeetableRequestError
from service.pipeline.options import DesignOptions
from service.pipeline.refine import MAX_SECONDS as REFINE_SECONDS
from service.settings import Settings

PER_DESIGN_S = 1.5e-3
PER_SECTION_POINT_S = 4e-8
CHECK_POINTS_RANGE = (MIN_CHECK_POINTS, MAX_CHECK_POINTS)
REFINE_POINTS = PEAKS_REFINED * (VERIFY_REFINE_POINTS + 1)  # a fine grid and a vertex per peak
PHYSICAL_MEDIUM_FACTOR = 3.0
SPEC_DRIVEN_FACTOR = 2.0
TAPER_FACTOR = 4.0
REFINEMENT_S = REFINE_SECONDS + 0.2  # the refinement's own time limit, and a little to check its result
SEARCHED_REFINEMENTS = 3.0  # section counts a spec-driven search for a refined load typically tries
GUESSED_SECTIONS = 8
MAX_PRICED = 1e15  # any larger number in a body is refused by validation before it costs anything


def _number(value: Any, default: float, high: float = MAX_PRICED) -> float:
    """A field's value for pricing: the default where it is missing, not a number, or beyond what
    validation accepts (such an item is refused on its own, so it must not price the request)."""
    if not isinstance(value, int | float) or isinstance(value, bool):
        return default
    if isinstance(value, int) and abs(value) > high:  # float() of a huge JSON integer overflows
        return default
    number = float(value)
    return number if math.isfinite(number) and 0.0 <= number <= high else default


def design_seconds(item: dict[str, Any]) -> float:
    """Estimated compute of one design request given as a plain dict (valid or not)."""
    method = item.get("method")
    taper = method == "taper" or "profile" in item
    sections = (
        _number(item.get("segments"), DEFAULT_SEGMENTS, MAX_SEGMENTS)
        if taper
        else _number(item.get("sections"), GUESSED_SECTIONS, MAX_SECTIONS)
    )
    band = item.get("band") if isinstance(item.get("band"), dict) else {}
    start, stop = _number(band.get("start_hz"), 1.0), _number(band.get("stop_hz"), 3.0)
    ratio = 2.0 * stop / (start + stop) if start + stop > 0 else 2.0
    grid = min(
        max(CHECK_POINTS_PER_LOBE * (sections * ratio + 1.0) + 1.0, CHECK_POINTS_RANGE[0]), CHECK_POINTS_RANGE[1]
    )
    points = _number(item.get("points"), DEFAULT_POINTS, MAX_POINTS)
    medium = item.get("medium")
    factor = PHYSICAL_MEDIUM_FACTOR if isinstance(medium, dict) and medium.get("kind") != "ideal" else 1.0
    seconds = PER_DESIGN_S + PER_SECTION_POINT_S * sections * (grid + REFINE_POINTS + points) * factor
    if taper:
        seconds *= TAPER_FACTOR
    elif item.get("sections") is None:
        seconds *= SPEC_DRIVEN_FACTOR
    if _refined(item):
        searched = item.get("sections") is None and not taper
        seconds += REFINEMENT_S * (SEARCHED_REFINEMENTS if searched else 1.0)
    return seconds


def _refined(item: dict[str, Any]) -> bool:
    """Whether the design will be refined: any load but a plain resistance, or limits to refine within."""
    load = item.get("load")
    if item.get("outside_limits") == "refine":
        return True
    if not isinstance(load, dict):
        return False
    reactance = load.get("reactance_ohm")
    reactive = isinstance(reactance, int | float) and not isinstance(reactance, bool) and reactance != 0
    return reactive or any(load.get(k) is not None for k in ("circuit", "measured", "touchstone"))


def yield_seconds(design: dict[str, Any], trials: int) -> float:
    """Estimated compute of a yield analysis: the design, then every trial on the yield grid."""
    sections = _number(design.get("sections"), GUESSED_SECTIONS, MAX_SECTIONS)
    trial = PER_SECTION_POINT_S * YIELD_GRID_POINTS * sections * PHYSICAL_MEDIUM_FACTOR
    return design_seconds(design) + trials * trial


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


def admit_design(item: dict[str, Any], settings: Settings, count: int = 1) -> float:
    """Sizes and budget of a request that makes `count` designs like `item`; its estimated seconds."""
    admit_sizes(item, settings)
    seconds = count * design_seconds(item)
    admit_budget(seconds, settings, "body")
    return seconds


def admit_designs(items: list[dict[str, Any]], settings: Settings) -> float:
    """Sizes and budget of a request that makes these designs together; its estimated seconds."""
    admit_sizes(items[0], settings)
    seconds = sum(design_seconds(item) for item in items)
    admit_budget(seconds, settings, "body")
    return seconds


def admit_yield(design: dict[str, Any], trials: int, settings: Settings) -> float:
    """Sizes, trial count and budget of a yield analysis; its estimated seconds."""
    admit_sizes(design, settings, "design.")
    if trials > settings.max_trials:
        raise UnmeetableRequestError("trials", f"at most {settings.max_trials} allowed on this server")
    seconds = yield_seconds(design, trials)
    admit_budget(seconds, settings, "trials")
    return seconds


def admit_batch(items: list[Any], settings: Settings) -> float:
    """Item count and budget of a batch; its estimated seconds (items that are not objects cost nothing)."""
    if len(items) > settings.max_batch_items:
        raise UnmeetableRequestError(
            "requests", f"at most {settings.max_batch_items} items per batch; this one has {len(items)}"
        )
    seconds = sum(design_seconds(item) for item in items if isinstance(item, dict))
    admit_budget(seconds, settings, "requests")
    return seconds


def admit_sweep(total: int, worst_item: dict[str, Any], settings: Settings) -> None:
    """Size and budget of a sweep (or its slice) of `total` designs, none costlier than `worst_item`."""
    if total > settings.max_sweep_designs:
        raise UnmeetableRequestError(
            "vary",
            f"the sweep asks for {total} designs; at most {settings.max_sweep_designs} "
            "(give offset and limit to slice it)",
        )
    admit_budget(total * design_seconds(worst_item), settings, "vary")
