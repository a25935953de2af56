"""The compute estimate against the real compute, over a grid of representative requests.

Run with:  python -m bench.cost_model   [--quick]

Each request is priced by the same function its route uses (service/api/pricing.py), then run
in this process by the same pipeline function the route hands to a worker, and timed (wall and
CPU). The table prints both and their ratio; the estimate's target is to be within 3x of the
real time either way for every row. --quick skips the rows that take more than a few seconds.
Rows estimated under 50 ms are run once before they are timed, as a running server is warm.
"""

from __future__ import annotations

import sys
import time
from collections.abc import Callable
from typing import Any

from service.api import pricing
from service.pipeline import analyze, compare, yield_analysis
from service.pipeline.items import ITEM_ADAPTER, design_item
from service.pipeline.options import DesignOptions
from service.pipeline.sweeps import batch_result, sweep_results
from service.schemas.bulk import SweepRequest
from service.schemas.comparison import CompareRequest
from service.schemas.networks import AnalyzeRequest
from service.schemas.tolerance import YieldRequest

OPTIONS = DesignOptions()
WARM_UP_BELOW_S = 0.05
BAND = {"start_hz": 2e9, "stop_hz": 4e9}
PLAIN = {"source_ohm": 50, "load": {"resistance_ohm": 20}, "band": BAND}
REACTIVE = PLAIN | {"load": {"resistance_ohm": 30, "reactance_ohm": -40}}
LUMPED = PLAIN | {"load": {"circuit": {"kind": "parallel-rc", "resistance_ohm": 120, "capacitance_f": 4e-13}}}
MEASURED = PLAIN | {
    "load": {
        "measured": [
            {"frequency_hz": 1.9e9, "resistance_ohm": 22, "reactance_ohm": -9},
            {"frequency_hz": 3.0e9, "resistance_ohm": 28, "reactance_ohm": 4},
            {"frequency_hz": 4.1e9, "resistance_ohm": 35, "reactance_ohm": 16},
        ]
    }
}
TOUCHSTONE = PLAIN | {"load": {"touchstone": "# GHz S RI R 50\n1.5 -0.3 0.2\n3.0 -0.2 0.25\n4.5 -0.1 0.3\n"}}
MICROSTRIP = {"kind": "microstrip", "eps_r": 3.66, "height_m": 0.508e-3, "thickness_m": 35e-6}
LOSSY_MICROSTRIP = MICROSTRIP | {"loss_tangent": 0.004, "conductivity_s_per_m": 5.8e7, "roughness_m": 1e-6}
STRIPLINE = {"kind": "stripline", "eps_r": 2.2, "ground_spacing_m": 3.2e-3, "thickness_m": 17e-6}
COAX = {"kind": "coax", "eps_r": 2.1, "outer_diameter_m": 7e-3}
TOLERANCES = {"width_m": 2e-5, "etch_bias_m": 1e-5, "eps_r": 0.05, "height_m": 1e-5}


def _design(item: dict[str, Any]) -> tuple[float, Callable[[], Any]]:
    return pricing.design_seconds(item), lambda: design_item(ITEM_ADAPTER.validate_python(item), OPTIONS)


def _compare(body: dict[str, Any]) -> tuple[float, Callable[[], Any]]:
    request = CompareRequest.model_validate(body)
    return pricing.compare_seconds(request), lambda: compare(request, OPTIONS)


def _analyze(body: dict[str, Any]) -> tuple[float, Callable[[], Any]]:
    request = AnalyzeRequest.model_validate(body)
    return pricing.analyze_seconds(request), lambda: analyze(request, OPTIONS)


def _yield(body: dict[str, Any]) -> tuple[float, Callable[[], Any]]:
    request = YieldRequest.model_validate(body)
    return pricing.yield_seconds(request), lambda: yield_analysis(request, OPTIONS)


def _batch(items: list[dict[str, Any]]) -> tuple[float, Callable[[], Any]]:
    return pricing.batch_seconds(items), lambda: batch_result(items, False, OPTIONS, lambda _: None)


def _sweep(body: dict[str, Any]) -> tuple[float, Callable[[], Any]]:
    request = SweepRequest.model_validate(body)
    return pricing.sweep_seconds(request), lambda: list(sweep_results(request, OPTIONS, lambda _: None))


def _steps(count: int, medium: dict[str, Any] | None = None) -> dict[str, Any]:
    sections = [{"impedance_ohm": 50 - 30 * k / count, "electrical_length_deg": 90} for k in range(count)]
    body = PLAIN | {"sections": sections}
    return body | {"medium": medium} if medium else body


def cases(quick: bool) -> list[tuple[str, Callable[[], tuple[float, Callable[[], Any]]]]]:
    """(name, a function giving (estimate, the work)) for every row of the grid."""
    rows: list[tuple[str, Callable[[], tuple[float, Callable[[], Any]]], bool]] = [
        ("quarter-wave, resistive", lambda: _design(PLAIN | {"method": "quarter-wave"}), False),
        ("quarter-wave, measured load", lambda: _design(MEASURED | {"method": "quarter-wave"}), False),
        ("binomial 4, resistive", lambda: _design(PLAIN | {"method": "binomial", "sections": 4}), False),
        ("binomial by spec 0.01", lambda: _design(PLAIN | {"method": "binomial", "max_reflection": 0.01}), False),
        ("chebyshev exact 8", lambda: _design(PLAIN | {"method": "chebyshev", "theory": "exact", "sections": 8}), 0),
        (
            "chebyshev exact 32, 10001 points",
            lambda: _design(PLAIN | {"method": "chebyshev", "theory": "exact", "sections": 32, "points": 10001}),
            False,
        ),
        (
            "chebyshev by spec, 10:1",
            lambda: _design(PLAIN | {"method": "chebyshev", "load": {"resistance_ohm": 5}, "max_reflection": 0.02}),
            False,
        ),
        (
            "chebyshev 6, lossy microstrip",
            lambda: _design(PLAIN | {"method": "chebyshev", "sections": 6, "medium": LOSSY_MICROSTRIP}),
            False,
        ),
        (
            "binomial 12, stripline, 2001 points",
            lambda: _design(PLAIN | {"method": "binomial", "sections": 12, "medium": STRIPLINE, "points": 2001}),
            False,
        ),
        ("chebyshev 3, coax", lambda: _design(PLAIN | {"method": "chebyshev", "sections": 3, "medium": COAX}), False),
        (
            "klopfenstein 64, fixed length",
            lambda: _design(PLAIN | {"method": "taper", "profile": "klopfenstein", "length_m": 0.1}),
            False,
        ),
        (
            "klopfenstein 64, by spec",
            lambda: _design(PLAIN | {"method": "taper", "profile": "klopfenstein", "max_reflection": 0.05}),
            False,
        ),
        (
            "exponential 256, microstrip, by spec",
            lambda: _design(
                PLAIN | {"method": "taper", "profile": "exponential", "segments": 256, "medium": MICROSTRIP}
            ),
            False,
        ),
        (
            "triangular 1024, lossy microstrip, 10001 points",
            lambda: _design(
                PLAIN
                | {
                    "method": "taper",
                    "profile": "triangular",
                    "segments": 1024,
                    "medium": LOSSY_MICROSTRIP,
                    "points": 10001,
                    "length_m": 0.2,
                }
            ),
            True,
        ),
        (
            "klopfenstein 128, reactive, by spec",
            lambda: _design(REACTIVE | {"method": "taper", "profile": "klopfenstein", "segments": 128}),
            True,
        ),
        ("chebyshev 3, reactive", lambda: _design(REACTIVE | {"method": "chebyshev", "sections": 3}), False),
        (
            "chebyshev by spec, reactive",
            lambda: _design(REACTIVE | {"method": "chebyshev", "max_reflection": 0.02}),
            True,
        ),
        ("binomial by spec, lumped", lambda: _design(LUMPED | {"method": "binomial", "max_reflection": 0.1}), True),
        ("chebyshev 2, touchstone", lambda: _design(TOUCHSTONE | {"method": "chebyshev", "sections": 2}), False),
        (
            "chebyshev 4, reactive, microstrip",
            lambda: _design(REACTIVE | {"method": "chebyshev", "sections": 4, "medium": MICROSTRIP}),
            True,
        ),
        (
            "chebyshev 4, microstrip, steps included",
            lambda: _design(
                PLAIN | {"method": "chebyshev", "sections": 4, "medium": MICROSTRIP, "junction_effects": "include"}
            ),
            False,
        ),
        (
            "chebyshev 4, microstrip, steps compensated",
            lambda: _design(
                PLAIN | {"method": "chebyshev", "sections": 4, "medium": MICROSTRIP, "junction_effects": "compensate"}
            ),
            False,
        ),
        ("compare, resistive", lambda: _compare(PLAIN), False),
        (
            "compare, 1024-step tapers, 10001 points",
            lambda: _compare(PLAIN | {"taper_segments": 1024, "points": 10001}),
            True,
        ),
        (
            "compare, lossy microstrip, 256-step tapers",
            lambda: _compare(PLAIN | {"taper_segments": 256, "medium": LOSSY_MICROSTRIP, "points": 2001}),
            True,
        ),
        ("compare, reactive", lambda: _compare(REACTIVE), True),
        ("analyze 8 sections", lambda: _analyze(_steps(8)), False),
        ("analyze 256 sections, lossy microstrip", lambda: _analyze(_steps(256, LOSSY_MICROSTRIP)), False),
        (
            "yield 2000 trials, chebyshev microstrip",
            lambda: _yield(
                {
                    "design": PLAIN | {"method": "chebyshev", "max_reflection": 0.05, "medium": MICROSTRIP},
                    "tolerances": TOLERANCES,
                    "trials": 2000,
                }
            ),
            False,
        ),
        (
            "yield 256 trials, 1024-step taper",
            lambda: _yield(
                {
                    "design": PLAIN
                    | {"method": "taper", "profile": "klopfenstein", "segments": 1024, "medium": MICROSTRIP},
                    "tolerances": TOLERANCES,
                    "trials": 256,
                }
            ),
            True,
        ),
        (
            "batch of 500 chebyshev",
            lambda: _batch([PLAIN | {"method": "chebyshev", "sections": 3}] * 500),
            False,
        ),
        (
            "batch of 10000 quarter-wave",
            lambda: _batch([PLAIN | {"method": "quarter-wave"}] * 10000),
            True,
        ),
        ("batch of 3 reactive", lambda: _batch([REACTIVE | {"method": "binomial", "sections": 2}] * 3), True),
        (
            "sweep of 5000, load x sections",
            lambda: _sweep(
                {
                    "base": PLAIN | {"method": "chebyshev", "theory": "exact"},
                    "vary": {
                        "load.resistance_ohm": {"start": 5, "stop": 45, "count": 1250},
                        "sections": [1, 2, 3, 4],
                    },
                }
            ),
            True,
        ),
        (
            "sweep over 4 loads, one lumped",
            lambda: _sweep(
                {
                    "base": PLAIN | {"method": "chebyshev", "sections": 2},
                    "vary": {"load": [PLAIN["load"], LUMPED["load"], {"resistance_ohm": 80}, {"resistance_ohm": 12}]},
                }
            ),
            True,
        ),
        (
            "sweep over 3 media, 256-step taper",
            lambda: _sweep(
                {
                    "base": PLAIN | {"method": "taper", "profile": "klopfenstein", "segments": 256, "length_m": 0.1},
                    "vary": {"medium": [MICROSTRIP, STRIPLINE, LOSSY_MICROSTRIP]},
                }
            ),
            True,
        ),
    ]
    return [(name, make) for name, make, slow in rows if not (quick and slow)]


def main() -> None:
    quick = "--quick" in sys.argv
    print(f"{'request':48} {'estimate s':>11} {'wall s':>9} {'cpu s':>9} {'est/wall':>9}")
    ratios = []
    for name, make in cases(quick):
        estimate, work = make()
        if estimate < WARM_UP_BELOW_S:  # a server is warm: first-call costs (imports, caches) are not the request's
            work()
        wall, cpu = time.perf_counter(), time.process_time()
        work()
        wall, cpu = time.perf_counter() - wall, time.process_time() - cpu
        ratios.append(estimate / wall)
        flag = "" if 1 / 3 <= ratios[-1] <= 3 else "  <- outside 3x"
        print(f"{name:48} {estimate:11.4f} {wall:9.4f} {cpu:9.4f} {ratios[-1]:9.2f}{flag}", flush=True)
    inside = sum(1 / 3 <= r <= 3 for r in ratios)
    print(f"\n{inside} of {len(ratios)} within 3x; estimate/real from {min(ratios):.2f} to {max(ratios):.2f}")


if __name__ == "__main__":
    main()
