"""The compute estimate prices every dimension a request can vary, and admits what is cheap.

Whether the estimate is within 3x of the real time is measured, not asserted: bench/cost_model.py
prints both over a grid of representative requests (README, Compute estimate). These tests hold
the model's shape: every dimension that costs time raises the price, the sweep's sampled price
is exact on small grids, and the issue's refused-but-cheap requests are admitted.
"""

import itertools

import pytest
from fastapi.testclient import TestClient

from service.api import pricing
from service.app import create_app
from service.pipeline.sweeps import grid_point, sweep_items
from service.schemas.bulk import SweepRequest
from service.schemas.comparison import CompareRequest
from service.schemas.tolerance import YieldRequest
from service.settings import Settings
from tests.conftest import BASE_REQUEST

STEPPED = BASE_REQUEST | {"method": "chebyshev", "sections": 4}
TAPER = BASE_REQUEST | {"method": "taper", "profile": "klopfenstein", "segments": 64}
MICROSTRIP = {"kind": "microstrip", "eps_r": 3.66, "height_m": 0.508e-3, "thickness_m": 35e-6}
LOSSY = MICROSTRIP | {"loss_tangent": 0.004, "conductivity_s_per_m": 5.8e7}
LUMPED = {"circuit": {"kind": "parallel-rc", "resistance_ohm": 120, "capacitance_f": 4e-13}}

# (base item, a change that makes more work): each must raise the price
COSTLIER = [
    (STEPPED, {"sections": 16}),
    (STEPPED, {"points": 10001}),
    (STEPPED, {"medium": MICROSTRIP}),
    (STEPPED | {"medium": MICROSTRIP}, {"medium": LOSSY}),
    (STEPPED, {"medium": {"kind": "stripline", "eps_r": 2.2, "ground_spacing_m": 3.2e-3, "thickness_m": 17e-6}}),
    (STEPPED, {"load": {"resistance_ohm": 30, "reactance_ohm": -40}}),
    (STEPPED, {"load": LUMPED}),
    (STEPPED, {"outside_limits": "refine"}),
    (STEPPED | {"load": LUMPED}, {"sections": None, "max_reflection": 0.05}),
    (BASE_REQUEST | {"method": "quarter-wave"}, {"method": "chebyshev", "sections": 8}),
    (TAPER, {"segments": 1024}),
    (TAPER | {"length_m": 0.05}, {"length_m": 1.0}),
    (TAPER, {"max_reflection": 1e-4}),
    (TAPER, {"load": {"resistance_ohm": 30, "reactance_ohm": -40}}),
    (TAPER, {"medium": MICROSTRIP}),
    (STEPPED, {"band": {"start_hz": 1e9, "stop_hz": 9e9}}),
]


@pytest.mark.parametrize("base, change", COSTLIER, ids=[str(c) for _, c in COSTLIER])
def test_every_costly_dimension_raises_the_price(base, change):
    assert pricing.design_seconds(base | change) > pricing.design_seconds(base)


def test_trials_compare_tapers_and_batch_size_are_priced():
    design = STEPPED | {"medium": MICROSTRIP}
    few, many = ({"design": design, "tolerances": {"width_m": 1e-5}, "trials": n} for n in (100, 10000))
    assert pricing.yield_seconds(YieldRequest.model_validate(many)) > pricing.yield_seconds(
        YieldRequest.model_validate(few)
    )
    plain = {k: v for k, v in BASE_REQUEST.items()}
    short, long = (CompareRequest.model_validate(plain | {"taper_segments": n}) for n in (16, 1024))
    assert pricing.compare_seconds(long) > pricing.compare_seconds(short)
    assert pricing.batch_seconds([STEPPED] * 200) == pytest.approx(100 * pricing.batch_seconds([STEPPED] * 2))


def test_a_sweep_is_priced_by_what_its_axes_hold():
    resistive = SweepRequest.model_validate(
        {"base": STEPPED, "vary": {"load": [{"resistance_ohm": r} for r in (10, 20, 30, 40)]}}
    )
    one_lumped = SweepRequest.model_validate(
        {"base": STEPPED, "vary": {"load": [{"resistance_ohm": r} for r in (10, 20, 30)] + [LUMPED]}}
    )
    # the refined item costs more than the three others together
    assert pricing.sweep_seconds(one_lumped) > 2 * pricing.sweep_seconds(resistive)
    lossy = SweepRequest.model_validate({"base": TAPER | {"segments": 1024}, "vary": {"medium": [MICROSTRIP, LOSSY]}})
    ideal = SweepRequest.model_validate({"base": TAPER | {"segments": 1024}, "vary": {"segments": [1024, 1024]}})
    assert pricing.sweep_seconds(lossy) > 10 * pricing.sweep_seconds(ideal)


def test_small_sweeps_are_priced_point_by_point():
    request = SweepRequest.model_validate(
        {
            "base": STEPPED,
            "vary": {"sections": [1, 4, 9], "load": [{"resistance_ohm": 20}, LUMPED], "points": [21, 2001]},
            "offset": 2,
        }
    )
    items = [item for _, item in itertools.islice(sweep_items(request), 2, None)]
    assert [grid_point(request, 2 + k) for k in range(len(items))] == items
    exact = sum(pricing.design_seconds(item, stacked=True) for item in items)
    assert pricing.sweep_seconds(request) == pytest.approx(exact, rel=1e-12)


def test_values_validation_refuses_price_as_defaults():
    for wild in ({"sections": 10**400}, {"points": 1e300}, {"segments": -5}, {"max_reflection": 5e-324}):
        assert 0 < pricing.design_seconds(TAPER | wild) < 20


def test_cheap_bulk_work_is_admitted():
    # Both were refused by the earlier estimate, though each runs in a few seconds.
    client = TestClient(create_app(Settings()))
    items = [BASE_REQUEST | {"method": "quarter-wave"}] * 10_000
    response = client.post("/v1/batch", json={"requests": items})
    assert response.status_code == 200 and len(response.json()["results"]) == 10_000
    sweep = SweepRequest.model_validate(
        {
            "base": STEPPED | {"theory": "exact", "sections": 1},
            "vary": {"load.resistance_ohm": {"start": 5, "stop": 45, "count": 25_000}, "sections": [1, 2, 3, 4]},
            "output": "ndjson",
        }
    )
    assert pricing.sweep_seconds(sweep) < Settings().compute_budget_s


def test_costly_requests_are_refused_before_they_run():
    client = TestClient(create_app(Settings()))
    loads = [{"circuit": {"kind": "series-rc", "resistance_ohm": 10 + r, "capacitance_f": 2e-12}} for r in range(100)]
    sweep = {"base": STEPPED | {"sections": None, "max_reflection": 0.02}, "vary": {"load": loads}}
    response = client.post("/v1/sweeps", json=sweep)
    assert response.status_code == 422 and response.json()["problems"][0]["field"] == "vary"
    compare = BASE_REQUEST | {"taper_segments": 1024, "points": 10001, "medium": LOSSY}
    response = client.post("/v1/transformers/compare", json=compare)
    assert response.status_code == 422 and "would need about" in response.json()["problems"][0]["message"]


def test_junction_steps_are_priced():
    plain = STEPPED | {"medium": MICROSTRIP}
    included = pricing.design_seconds(plain | {"junction_effects": "include"})
    assert pricing.design_seconds(plain) < included < pricing.design_seconds(plain | {"junction_effects": "compensate"})
