"""The compute estimate: what a request will cost, in seconds, before any of it runs.

A cost model of the work the pipeline really does, with unit costs measured on the benchmark
machine (bench/cost_model.py prints the estimate beside the real time over a grid of
representative requests; README "Compute estimate" has the figures):

- a fixed cost per design (synthesis, response models), smaller for a design in a stacked batch;
- realizing each section in a medium (the microstrip and stripline widths are found by a
  numerical inversion that costs about a millisecond a section);
- the exact check: sections x frequencies x a unit cost that depends on the medium (a dispersive
  or lossy medium evaluates its line model at every frequency), on the grid the check really
  uses (it grows with the line's electrical length, and contains the response curve);
- the passes a spec-driven search makes, refinement (bounded by its own time limit), the
  candidates a taper into a reactive load tries, Monte Carlo trials, and every design a
  comparison, batch or sweep makes.

Prices are computed from plain dicts of request fields (valid or not: values validation would
refuse price as defaults, so they never sink a request that holds them).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from typing import Any

from service.analysis.standing_waves import SAMPLES_PER_SECTION
from service.analysis.worst_case import CHECK_POINTS_PER_LOBE, MAX_CHECK_POINTS, MIN_CHECK_POINTS, PEAKS_REFINED
from service.analysis.worst_case import REFINE_POINTS as PEAK_POINTS
from service.constants import (
    DEFAULT_POINTS,
    DEFAULT_SEGMENTS,
    MAX_POINTS,
    MAX_SECTIONS,
    MAX_SEGMENTS,
    SPEED_OF_LIGHT_M_PER_S,
    YIELD_GRID_POINTS,
)
from service.pipeline.compare import compare_items
from service.pipeline.power import POWER_POINTS
from service.pipeline.refine import MAX_SECONDS as REFINE_LIMIT_S
from service.pipeline.sweeps import grid_point, sweep_slice_size
from service.schemas.bulk import SweepRequest
from service.schemas.comparison import CompareRequest
from service.schemas.networks import AnalyzeRequest
from service.schemas.tolerance import YieldRequest

DESIGN_S = 6e-4  # one design on its own: synthesis, result models, section table
TAPER_DESIGN_S = 3e-3  # one taper synthesis (the profile's integral, cut into steps) and its result
STACKED_DESIGN_S = 1.2e-4  # one stepped design inside a batch or sweep, checked in a stack
PER_SECTION_POINT_S = {"plain": 1e-8, "dispersive": 1.5e-7, "lossy": 1.8e-7}  # one section at one frequency
PER_SECTION_GEOMETRY_S = {"microstrip": 1.5e-3, "stripline": 4e-4}  # width inversion, per section
REFINE_SCALE_S = 0.025  # a refinement on the ideal line takes about this x (free sections ^ REFINE_GROWTH)
REFINE_GROWTH = 1.4
REFINE_MEDIUM_FACTOR = {"plain": 1.0, "dispersive": 2.2, "lossy": 3.5}
SPEC_PASSES = 1.3  # exact checks a spec-driven stepped design makes, on average
SEARCHED_REFINEMENTS = 2.5  # section counts a spec-driven refined design tries, on average
TAPER_SPEC_PASSES = 2.0  # lengths a spec-driven taper tries, on average
REACTIVE_TAPER_CANDIDATES = 3  # into the rotated load, its centre resistance and its magnitude
GUESSED_SECTIONS = 4  # a spec-driven stepped design's section count, before synthesis says
GUESSED_RATIO = 4.0  # impedance ratio of a load that is not a plain resistance
PEAK_CHECK_POINTS = PEAKS_REFINED * (PEAK_POINTS + 1)  # a fine grid and a vertex per refined peak
SWEEP_SAMPLES = 256  # grid points priced one by one; a larger sweep is priced from evenly spread ones
MAX_PRICED = 1e15  # any larger number in a body is refused by validation before it costs anything


def _number(value: Any, default: float, high: float = MAX_PRICED) -> float:
    """A field's value for pricing: the default where it is missing, not a number, or beyond what
    validation accepts (such an item is refused on its own, so it must not price the request)."""
    if not isinstance(value, int | float) or isinstance(value, bool):
        return default
    if isinstance(value, int) and abs(value) > high:  # float() of a huge JSON integer overflows
        return default
    number = float(value)
    return number if math.isfinite(number) and 0.0 < number <= high else default


def _dict(value: Any) -> dict[str, Any]:
    return value if isinstance(value, dict) else {}


def medium_class(item: dict[str, Any]) -> str:
    """How costly the item's medium is to evaluate: plain (ideal, coax, stripline without losses),
    dispersive (microstrip) or lossy (any medium with a loss figure)."""
    medium = _dict(item.get("medium"))
    if any(_number(medium.get(name), 0.0) > 0 for name in ("loss_tangent", "conductivity_s_per_m", "roughness_m")):
        return "lossy"
    return "dispersive" if medium.get("kind") == "microstrip" else "plain"


def _geometry_s(item: dict[str, Any]) -> float:
    return PER_SECTION_GEOMETRY_S.get(_dict(item.get("medium")).get("kind"), 0.0)


def _slowness(item: dict[str, Any]) -> float:
    """sqrt(eps_eff) of the line, taken at its largest (eps_r), or 1 / velocity factor."""
    medium = _dict(item.get("medium"))
    if medium.get("kind") in ("microstrip", "stripline", "coax"):
        return math.sqrt(_number(medium.get("eps_r"), 4.0, 1e4))
    return 1.0 / _number(item.get("velocity_factor"), 1.0, 1.0)


def _band(item: dict[str, Any]) -> tuple[float, float]:
    band = _dict(item.get("band"))
    start, stop = _number(band.get("start_hz"), 1e9), _number(band.get("stop_hz"), 3e9)
    return (start, stop) if stop > start else (start, 3.0 * start)


def refined(item: dict[str, Any]) -> bool:
    """Whether the design will be refined: any load but a plain resistance, or limits to refine within."""
    load = _dict(item.get("load"))
    if item.get("outside_limits") == "refine":
        return True
    reactance = load.get("reactance_ohm")
    reactive = isinstance(reactance, int | float) and not isinstance(reactance, bool) and reactance != 0
    return reactive or any(load.get(k) is not None for k in ("circuit", "measured", "touchstone"))


def _ratio(item: dict[str, Any]) -> float:
    """The impedance ratio the transformer spans (a guess for loads that are not a plain resistance)."""
    resistance = _number(_dict(item.get("load")).get("resistance_ohm"), 0.0)
    source = _number(item.get("source_ohm"), 50.0)
    if refined(item) or resistance <= 0:
        return GUESSED_RATIO
    return max(resistance / source, source / resistance, 1.0 + 1e-9)


def _spec(item: dict[str, Any]) -> float:
    """The spec as a reflection magnitude (whichever form the item gives it in)."""
    if item.get("max_reflection") is not None:
        return min(_number(item.get("max_reflection"), 0.1), 0.99)
    if item.get("min_return_loss_db") is not None:
        return 10.0 ** (-_number(item.get("min_return_loss_db"), 20.0, 1e3) / 20.0)
    if item.get("max_vswr") is not None:
        vswr = max(_number(item.get("max_vswr"), 1.22), 1.0 + 1e-9)
        return (vswr - 1.0) / (vswr + 1.0)
    return 0.1


def _taper_start_angle(item: dict[str, Any]) -> float:
    """beta L at the lower band edge of a spec-driven taper: the length its profile needs to bring
    ln(ratio)/2 down to the spec (Klopfenstein: acosh; exponential: the sinc envelope; triangular:
    the squared one)."""
    shortfall = max(math.log(_ratio(item)) / 2.0 / max(_spec(item), 1e-12), 1.0)
    profile = item.get("profile")
    if profile == "exponential":
        return shortfall
    if profile == "triangular":
        return 2.0 * math.sqrt(shortfall)
    return max(math.acosh(shortfall), 1.0)


def _total_angle(item: dict[str, Any], sections: float, taper: bool) -> float:
    """The line's total electrical length at the upper band edge, in radians."""
    start, stop = _band(item)
    if taper:
        length = _number(item.get("length_m"), 0.0, 1e6)
        if length > 0:
            return 2.0 * math.pi * stop * _slowness(item) * length / SPEED_OF_LIGHT_M_PER_S
        return _taper_start_angle(item) * stop / start
    return sections * math.pi / 2.0 * 2.0 * stop / (start + stop)


def checked_points(item: dict[str, Any], total_angle_rad: float) -> float:
    """Frequencies one exact check evaluates: the check grid (enough for every lobe of a line that
    long, and containing the response curve's points), and the refined peaks."""
    lobes = math.ceil(2.0 * min(total_angle_rad, MAX_CHECK_POINTS) / math.pi) + 1.0  # the grid is capped anyway
    grid = min(max(CHECK_POINTS_PER_LOBE * lobes + 1.0, MIN_CHECK_POINTS), MAX_CHECK_POINTS)
    steps = _number(item.get("points"), DEFAULT_POINTS, MAX_POINTS) - 1.0
    aligned = steps * math.ceil((grid - 1.0) / steps) + 1.0 if steps >= 1 else grid
    return aligned + PEAK_CHECK_POINTS


def check_seconds(item: dict[str, Any], sections: float, total_angle_rad: float, cost: str | None = None) -> float:
    """One exact check of a line of `sections` sections and that electrical length (`cost`: the
    line's cost class, the item's medium_class by default)."""
    points = checked_points(item, total_angle_rad)
    return sections * points * PER_SECTION_POINT_S[cost or medium_class(item)]


def refinement_seconds(
    item: dict[str, Any], free_sections: float, line_sections: float, cost: str | None = None
) -> float:
    """One refinement: its optimizer's work grows with the free sections and the line's length,
    and stops at its own time limit; then one check of its result."""
    cost = cost or medium_class(item)
    scale = REFINE_MEDIUM_FACTOR[cost] * max(line_sections / 16.0, 1.0)
    optimizer = min(REFINE_SCALE_S * free_sections**REFINE_GROWTH * scale, REFINE_LIMIT_S)
    return optimizer + check_seconds(item, line_sections, line_sections * math.pi, cost)


def _stepped_seconds(item: dict[str, Any], stacked: bool) -> float:
    given = item.get("sections")
    sections = _number(given, GUESSED_SECTIONS, MAX_SECTIONS) if item.get("method") != "quarter-wave" else 1.0
    spec_driven = given is None and item.get("method") != "quarter-wave"
    line = sections + (1.0 if refined(item) else 0.0)  # a complex load's rotating section
    one = check_seconds(item, line, _total_angle(item, line, False)) + _geometry_s(item) * line
    seconds = (STACKED_DESIGN_S if stacked else DESIGN_S) + one * (SPEC_PASSES if spec_driven else 1.0)
    if refined(item):
        searched = SEARCHED_REFINEMENTS if spec_driven else 1.0
        seconds += searched * (DESIGN_S + one + refinement_seconds(item, line, line))
    return seconds + _junction_seconds(item, line, spec_driven)


def _junction_seconds(item: dict[str, Any], sections: float, spec_driven: bool) -> float:
    """Junction steps: checks on the complex path with the step circuits; compensation refines the lengths."""
    mode = item.get("junction_effects")
    if mode not in ("include", "compensate"):
        return 0.0
    # a line with its step circuits is evaluated in complex arithmetic, like a lossy one
    one = check_seconds(item, sections, _total_angle(item, sections, False), "lossy")
    checks = (2.0 if mode == "compensate" else 1.0) * one
    compensation = refinement_seconds(item, sections, sections, "lossy") if mode == "compensate" else 0.0
    return (checks + compensation) * (SPEC_PASSES if spec_driven else 1.0)


def _taper_seconds(item: dict[str, Any]) -> float:
    segments = _number(item.get("segments"), DEFAULT_SEGMENTS, MAX_SEGMENTS)
    by_spec = _number(item.get("length_m"), 0.0, 1e6) <= 0
    one = TAPER_DESIGN_S + check_seconds(item, segments, _total_angle(item, segments, True))
    one += _geometry_s(item) * segments * (1.0 if by_spec else 2.0)  # a fixed length: eps_eff first, then the line
    if refined(item):  # every pass refines the last section; also tried without the rotating section
        one = REACTIVE_TAPER_CANDIDATES * (one + refinement_seconds(item, 2.0, segments))
    return one * (TAPER_SPEC_PASSES if by_spec else 1.0)


def power_seconds(item: dict[str, Any], sections: float) -> float:
    """The standing waves along every section at the power frequencies, where power is asked for."""
    if item.get("input_power_w") is None:
        return 0.0
    return sections * POWER_POINTS * SAMPLES_PER_SECTION * PER_SECTION_POINT_S["lossy"]


def design_seconds(item: dict[str, Any], stacked: bool = False) -> float:
    """Estimated compute of one design (`stacked`: as a stepped item of a batch or sweep)."""
    if item.get("method") == "taper" or "profile" in item:
        segments = _number(item.get("segments"), DEFAULT_SEGMENTS, MAX_SEGMENTS)
        return _taper_seconds(item) + power_seconds(item, segments)
    sections = _number(item.get("sections"), GUESSED_SECTIONS, MAX_SECTIONS)
    return _stepped_seconds(item, stacked) + power_seconds(item, sections)


def compare_seconds(request: CompareRequest) -> float:
    """Every design a comparison makes."""
    return sum(design_seconds(item) for item in compare_items(request))


def analyze_seconds(request: AnalyzeRequest) -> float:
    """A check of the given sections (each realized in the medium first)."""
    item = request.model_dump()
    centre = request.band.center_hz
    slowness = _slowness(item)
    angle = sum(
        math.radians(s.electrical_length_deg) * centre / (s.reference_hz or centre)
        if s.electrical_length_deg is not None
        else 2.0 * math.pi * centre * slowness * (s.length_m or 0.0) / SPEED_OF_LIGHT_M_PER_S
        for s in request.sections
    )
    count = float(len(request.sections))
    total = angle * request.band.stop_hz / centre
    return DESIGN_S + check_seconds(item, count, total) + _geometry_s(item) * count + power_seconds(item, count)


def yield_seconds(request: YieldRequest) -> float:
    """The design, then every trial's line on the yield grid (perturbed, so always evaluated per
    frequency like a dispersive line; with junction steps, in complex arithmetic like a lossy one)."""
    design = request.design.model_dump()
    taper = design.get("method") == "taper"
    sections = _number(design.get("segments" if taper else "sections"), GUESSED_SECTIONS, MAX_SEGMENTS)
    floor = "lossy" if design.get("junction_effects") in ("include", "compensate") else "dispersive"
    unit = max(PER_SECTION_POINT_S[medium_class(design)], PER_SECTION_POINT_S[floor])
    return design_seconds(design) + request.trials * sections * YIELD_GRID_POINTS * unit


def batch_seconds(items: list[Any]) -> float:
    """Every item of a batch (stepped items checked in stacks; items that are not objects cost nothing)."""
    return sum(design_seconds(item, stacked=True) for item in items if isinstance(item, dict))


def curve_points(item: dict[str, Any]) -> float:
    """Points in the item's response curve."""
    return _number(item.get("points"), DEFAULT_POINTS, MAX_POINTS)


def _sweep_total(request: SweepRequest, measure: Callable[[dict[str, Any]], float]) -> float:
    """measure() summed over the sweep's slice: point by point where there are few, else the mean
    of evenly spread points times their count (a product grid's points spread evenly take each
    axis's values in proportion)."""
    count = sweep_slice_size(request)
    if count == 0:
        return 0.0
    samples = min(count, SWEEP_SAMPLES)
    indices = [request.offset + (k * count) // samples for k in range(samples)]
    return sum(measure(grid_point(request, index)) for index in indices) / samples * count


def sweep_seconds(request: SweepRequest) -> float:
    """Every design of the sweep's slice, each as a stacked item."""
    return _sweep_total(request, lambda item: design_seconds(item, stacked=True))


def sweep_curve_points(request: SweepRequest) -> float:
    """Curve points in the sweep slice's answer (none without curves)."""
    return _sweep_total(request, curve_points) if request.include_curves else 0.0
