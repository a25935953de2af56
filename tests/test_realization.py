"""Drawings of realized designs and their Monte Carlo yield."""

import copy
import json
import xml.etree.ElementTree as ET

import numpy as np
import pytest
import scipy.stats
import skrf
from skrf.media import MLine

from service.settings import PROJECT_ROOT

SVG = "{http://www.w3.org/2000/svg}"
MICROSTRIP = {"kind": "microstrip", "eps_r": 3.66, "height_m": 0.508e-3, "thickness_m": 35e-6}
ITEM = {
    "method": "chebyshev",
    "source_ohm": 50.0,
    "load": {"resistance_ohm": 20.0},
    "band": {"start_hz": 2e9, "stop_hz": 4e9},
    "max_reflection": 0.05,
    "theory": "exact",
    "medium": MICROSTRIP,
}


@pytest.mark.parametrize(
    "item",
    [
        ITEM,
        ITEM | {"method": "taper", "profile": "klopfenstein", "segments": 40, "theory": None},
        ITEM
        | {"method": "binomial", "sections": 2, "medium": {"kind": "coax", "eps_r": 2.1, "outer_diameter_m": 7e-3}},
        ITEM | {"method": "quarter-wave", "medium": None, "theory": None},
        ITEM | {"load": {"resistance_ohm": 20.0, "reactance_ohm": 12.0}},
    ],
)
def test_drawing_is_valid_svg_with_one_shape_per_section(client, item):
    item = {k: v for k, v in item.items() if v is not None}
    design = client.post("/v1/batch", json={"requests": [item]}).json()["results"][0]["design"]
    response = client.post("/v1/drawings", json=item)
    assert response.status_code == 200, response.text
    assert response.headers["content-type"].startswith("image/svg+xml")
    root = ET.fromstring(response.text)
    assert root.tag == f"{SVG}svg"
    shapes = [r for r in root.iter(f"{SVG}rect") if r.get("class") == "section"]
    assert len(shapes) == len(design["sections"])
    assert [int(r.get("data-index")) for r in shapes] == list(range(1, len(shapes) + 1))
    labels = " ".join(t.text or "" for t in root.iter(f"{SVG}text"))
    first = design["sections"][0]
    size = first.get("width_m") or first.get("inner_diameter_m")
    size_label = f"{size * 1e3:.3f} mm" if size else f"{first['impedance_ohm']:.2f} ohm"
    assert size_label in labels and f"L {first['length_m'] * 1e3:.3f} mm" in labels
    total = sum(section["length_m"] for section in design["sections"])
    assert f"total length {total * 1e3:.3f} mm" in labels
    widths = [float(r.get("width")) for r in shapes]
    assert min(widths) > 0


def yield_of(client, tolerances, trials=400, seed=11, item=ITEM):
    body = {"design": item, "tolerances": tolerances, "trials": trials, "seed": seed}
    response = client.post("/v1/yield", json=body)
    assert response.status_code == 200, response.text
    return response.json()


def test_zero_tolerances_yield_everything(client):
    result = yield_of(client, {})
    assert result["design"]["verified"]["meets_spec"]
    assert result["yield_fraction"] == 1.0 and result["standard_error"] == 0.0
    assert result["worst_max_reflection"] == pytest.approx(result["nominal_max_reflection"], rel=1e-12)


def test_wider_tolerances_lower_the_yield(client):
    fractions = []
    for scale in (0.0, 1.0, 2.0, 4.0, 8.0):
        tolerances = {
            "width_m": 15e-6 * scale,
            "etch_bias_m": 10e-6 * scale,
            "eps_r": 0.04 * scale,
            "height_m": 8e-6 * scale,
        }
        fractions.append(yield_of(client, tolerances)["yield_fraction"])
    assert fractions == sorted(fractions, reverse=True)
    assert fractions[0] == 1.0 and fractions[-1] < 0.9


def test_same_seed_same_result_and_sampling_error(client):
    tolerances = {"width_m": 60e-6, "eps_r": 0.15}
    first, again = yield_of(client, tolerances), yield_of(client, tolerances)
    assert first == again
    other = yield_of(client, tolerances, seed=12)
    assert other["yield_fraction"] != first["yield_fraction"] or other["percentiles"] != first["percentiles"]
    p, n = first["yield_fraction"], first["trials"]
    # Binomial standard error sqrt(p (1 - p) / N) (textbook statistics).
    assert first["standard_error"] == pytest.approx((p * (1 - p) / n) ** 0.5)
    # Wilson score interval, against SciPy's binomtest(...).proportion_ci(method="wilson").
    reference = scipy.stats.binomtest(round(p * n), n).proportion_ci(confidence_level=0.95, method="wilson")
    assert first["interval_95"] == pytest.approx([reference.low, reference.high], rel=1e-9)


def test_yield_needs_a_physical_medium(client):
    item = {k: v for k, v in ITEM.items() if k != "medium"}
    response = client.post("/v1/yield", json={"design": item, "tolerances": {}})
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == "design.medium"


@pytest.mark.parametrize(
    "change, field",
    [
        ({"trials": 0}, "trials"),
        ({"trials": 10**6}, "trials"),
        ({"tolerances": {"width_m": -1e-6}}, "tolerances.width_m"),
        ({"design": ITEM | {"method": "stub"}}, "design"),
    ],
)
def test_bad_yield_requests(client, change, field):
    body = {"design": ITEM, "tolerances": {}} | change
    response = client.post("/v1/yield", json=body)
    assert response.status_code == 422
    assert field in [p["field"] for p in response.json()["problems"]]


def test_shipped_yield_example_runs(client):
    example = json.loads((PROJECT_ROOT / "openapi_examples/yield/microstrip-board.json").read_text())
    result = yield_of(
        client,
        **{k: copy.deepcopy(v) for k, v in example["value"].items() if k != "design"},
        item=example["value"]["design"],
    )
    assert 0.0 < result["yield_fraction"] <= 1.0


def test_worst_trial_is_reported_with_what_it_drew(client):
    result = yield_of(client, {"width_m": 60e-6, "eps_r": 0.15}, trials=300)
    worst = result["worst_trial"]
    assert worst["max_reflection"] == result["worst_max_reflection"]
    assert len(worst["section_geometry_m"]) == len(result["design"]["sections"])
    assert 0 <= worst["index"] < 300
    assert result["clipped_draws"] == {"eps_r": 0, "height_m": 0, "geometry": 0}
    # Rebuilt from what it drew with scikit-rf's MLine (Hammerstad-Jensen, Kirschning-Jansen; the
    # models this service follows), the worst trial reflects what the report says.
    board = ITEM["medium"]
    frequency = skrf.Frequency(2.0, 4.0, 201, unit="GHz")
    lines = [
        MLine(
            frequency=frequency,
            z0_port=50,
            w=w,
            h=worst["height_m"],
            t=board["thickness_m"],
            ep_r=worst["eps_r"],
            model="hammerstadjensen",
            disp="kirschningjansen",
            diel="frequencyinvariant",
            tand=0,
            rough=0,
        ).line(section["length_m"], "m")
        for w, section in zip(worst["section_geometry_m"], result["design"]["sections"], strict=True)
    ]
    a = skrf.network.cascade_list(lines).a
    load = ITEM["load"]["resistance_ohm"]
    z_in = (a[:, 0, 0] * load + a[:, 0, 1]) / (a[:, 1, 0] * load + a[:, 1, 1])
    assert np.max(np.abs((z_in - 50) / (z_in + 50))) == pytest.approx(worst["max_reflection"], rel=0.02)


def test_draws_held_at_a_physical_floor_are_counted(client):
    # eps_r 3.66 with a sigma of 2: about 9% of draws fall below 1 (normal tail, P(Z < -1.33)).
    result = yield_of(client, {"eps_r": 2.0}, trials=2000)
    clipped = result["clipped_draws"]["eps_r"]
    assert 0.07 * 2000 < clipped < 0.11 * 2000
    assert "clipped_draws" in result["method"]


def test_a_long_taper_yield_stays_within_its_memory_bound():
    # tracemalloc sees NumPy's allocations (NumPy reports them to it), so the peak is measured,
    # not estimated: a 1024-step microstrip taper, 64 trials (one unchunked array would be 210 MB).
    import tracemalloc

    from service.analysis.line_cascade import LineCascade
    from service.analysis.monte_carlo import Tolerances, monte_carlo
    from service.physics.loads import FixedLoad
    from service.physics.media import MicrostripLine

    medium = MicrostripLine(3.66, 0.508e-3, 35e-6)
    widths = np.geomspace(1.1e-3, 0.3e-3, 1024)
    line = LineCascade(50.0, FixedLoad(100.0), medium, widths, np.full(1024, 1e-4))
    tracemalloc.start()
    figures = monte_carlo(line, np.linspace(2e9, 4e9, 201), 0.1, Tolerances(width_m=10e-6, eps_r=0.05), 64, seed=3)
    _, peak = tracemalloc.get_traced_memory()
    tracemalloc.stop()
    assert figures.trials == 64
    assert peak < 512 * 2**20  # the documented bound per request


def test_the_histogram_counts_every_trial_where_its_worst_reflection_falls(client):
    result = yield_of(client, {"width_m": 30e-6, "eps_r": 0.08})
    edges, counts = result["histogram"]["edges"], result["histogram"]["counts"]
    assert len(edges) == len(counts) + 1 and sum(counts) == result["trials"]
    assert edges[0] <= result["percentiles"]["p50"] <= edges[-1]
    assert edges[-1] == pytest.approx(result["worst_max_reflection"], rel=1e-12)
    # The share of trials in bins wholly below the median is at most a half (definition of the median).
    below = sum(c for c, high in zip(counts, edges[1:], strict=True) if high <= result["percentiles"]["p50"])
    assert below <= result["trials"] / 2


def test_planar_drawings_show_both_feed_lines_and_stay_legible_at_32_sections(client):
    item = ITEM | {"method": "binomial", "sections": 32, "theory": "exact"}
    item = {k: v for k, v in item.items() if v is not None and k != "max_reflection"}
    response = client.post("/v1/drawings", json=item)
    assert response.status_code == 200, response.text
    root = ET.fromstring(response.text)
    feeds = [r for r in root.iter(f"{SVG}rect") if r.get("class") == "feed"]
    assert len(feeds) == 2
    labels = [t for t in root.iter(f"{SVG}text") if t.get("transform", "").startswith("rotate")]
    assert len(labels) <= 25  # every k-th section labelled, the last always; each keeps its tooltip
    assert all(float(t.get("font-size", "11")) >= 8 for t in labels)


@pytest.mark.parametrize(
    "medium",
    [ITEM["medium"], {"kind": "coax", "eps_r": 2.1, "outer_diameter_m": 4.1e-3}],
    ids=["microstrip", "coax"],
)
def test_yield_trials_count_the_junction_steps_when_the_design_does(client, medium):
    item = ITEM | {"medium": medium, "junction_effects": "compensate"}
    nominal = yield_of(client, {}, trials=50, item=item)
    # the nominal line is the compensated design with its steps, on the yield grid (201 points):
    # the analysis of its sections with steps on the same grid gives the same worst reflection
    sections = [{"length_m": s["length_m"], "impedance_ohm": s["impedance_ohm"]} for s in nominal["design"]["sections"]]
    analysis = {k: v for k, v in item.items() if k not in ("method", "theory", "sections")}
    analysis |= {"sections": sections, "junction_effects": "include", "points": 201}
    checked = client.post("/v1/networks/analyze", json=analysis).json()
    grid_worst = max(checked["response"]["reflection_magnitude"])
    assert nominal["nominal_max_reflection"] == pytest.approx(grid_worst, rel=1e-9)
    assert nominal["worst_max_reflection"] == pytest.approx(grid_worst, rel=1e-9)  # no tolerance, no spread
    ideal = client.post("/v1/networks/analyze", json=analysis | {"junction_effects": "ignore"}).json()
    assert max(ideal["response"]["reflection_magnitude"]) != pytest.approx(grid_worst, rel=1e-3)
    assert "each trial's steps are those of its own drawn widths" in nominal["method"]
    spread = yield_of(client, {"width_m": 20e-6, "eps_r": 0.05, "etch_bias_m": 10e-6}, trials=200, item=item)
    assert spread["worst_max_reflection"] > grid_worst
