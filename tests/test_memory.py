"""Memory is bounded by array size: the largest requests the limits accept stay under 512 MiB.

Peaks are measured with the standard library's tracemalloc (NumPy reports its arrays to it), on
the pipeline functions the routes run. The yield's own bound is in test_realization.py.
"""

import tracemalloc

from service.pipeline import analyze, tapered
from service.pipeline.options import DesignOptions
from service.pipeline.sweeps import batch_result, sweep_result
from service.schemas.bulk import SweepRequest
from service.schemas.networks import AnalyzeRequest
from service.schemas.tapers import TaperRequest
from service.settings import Settings
from tests.conftest import BASE_REQUEST, LOSSY_MICROSTRIP

DOCUMENTED_PEAK_MIB = 512  # README, Limits


def _peak_mib(work) -> float:
    tracemalloc.start()
    try:
        work()
        return tracemalloc.get_traced_memory()[1] / 2**20
    finally:
        tracemalloc.stop()


def test_a_long_lossy_line_is_evaluated_in_bounded_slices():
    # 256 lossy microstrip sections at 10001 points: a whole cascade would hold several
    # designs x frequencies x sections complex arrays of 40 MiB each.
    sections = [{"impedance_ohm": 50 - 30 * k / 256, "electrical_length_deg": 90} for k in range(256)]
    request = AnalyzeRequest.model_validate(
        BASE_REQUEST | {"sections": sections, "medium": LOSSY_MICROSTRIP, "points": 10001}
    )
    assert _peak_mib(lambda: analyze(request, DesignOptions())) < 64


def test_a_1024_step_lossy_taper_at_10001_points_stays_small():
    coax = {"kind": "coax", "eps_r": 2.1, "outer_diameter_m": 7e-3, "loss_tangent": 3e-4, "conductivity_s_per_m": 5.8e7}
    request = TaperRequest.model_validate(
        BASE_REQUEST | {"profile": "triangular", "segments": 1024, "points": 10001, "length_m": 0.5, "medium": coax}
    )
    assert _peak_mib(lambda: tapered(request, DesignOptions())) < 64


def test_a_batch_with_curves_at_its_point_limit():
    limit = Settings().max_answer_curve_points
    items = [BASE_REQUEST | {"method": "chebyshev", "sections": 3, "points": 10001}] * (limit // 10001)
    assert _peak_mib(lambda: batch_result(items, True, DesignOptions(), lambda _: None)) < DOCUMENTED_PEAK_MIB


def test_a_json_sweep_at_its_design_limit_by_its_measured_cost_per_design():
    # 2,000 designs measured; the answer grows linearly with its designs (one summary each).
    request = SweepRequest.model_validate(
        {
            "base": BASE_REQUEST | {"method": "chebyshev", "theory": "exact"},
            "vary": {"load.resistance_ohm": {"start": 5, "stop": 45, "count": 500}, "sections": [1, 2, 3, 4]},
        }
    )
    per_design = _peak_mib(lambda: sweep_result(request, DesignOptions(), lambda _: None)) / 2000
    assert per_design * Settings().max_answer_designs < DOCUMENTED_PEAK_MIB
