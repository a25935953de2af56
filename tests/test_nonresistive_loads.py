"""Loads that are not a plain resistance: the best design the service can find, said truthfully.

References: SciPy's differential_evolution (a global optimizer) over the same section count and
impedance range, with the lossless-line input-impedance formula Zin = Z (ZL + jZ t) / (Z + jZL t),
t = tan(beta l) (Pozar, Microwave Engineering, eq. 2.44) as the objective: none of the project's
code. The Bode-Fano bound for a series R-C load is in its own test.
"""

import math
import re

import numpy as np
import pytest
from scipy.optimize import differential_evolution

BAND_NARROW = {"start_hz": 2.2e9, "stop_hz": 2.7e9}
BAND_WIDE = {"start_hz": 1.0e9, "stop_hz": 2.0e9}
LOADS = {
    "fixed 30-j40": {"resistance_ohm": 30.0, "reactance_ohm": -40.0},
    "fixed 100+j50": {"resistance_ohm": 100.0, "reactance_ohm": 50.0},
    "series R-C": {"circuit": {"kind": "series-rc", "resistance_ohm": 25.0, "capacitance_f": 3e-12}},
    "parallel R-C": {"circuit": {"kind": "parallel-rc", "resistance_ohm": 150.0, "capacitance_f": 0.5e-12}},
    "series R-L": {"circuit": {"kind": "series-rl", "resistance_ohm": 20.0, "inductance_h": 2e-9}},
    "measured": {
        "measured": [
            {"frequency_hz": 0.9e9, "resistance_ohm": 22.0, "reactance_ohm": -35.0},
            {"frequency_hz": 1.5e9, "resistance_ohm": 28.0, "reactance_ohm": -12.0},
            {"frequency_hz": 2.1e9, "resistance_ohm": 41.0, "reactance_ohm": 9.0},
        ]
    },
}


def load_impedance(load: dict, f: np.ndarray) -> np.ndarray:
    """The load model written out from its textbook definition (not the project's code)."""
    w = 2 * np.pi * f
    if "circuit" in load:
        c = load["circuit"]
        r = c["resistance_ohm"]
        element = 1j * w * c["inductance_h"] if "inductance_h" in c else 1 / (1j * w * c["capacitance_f"])
        return r + element if c["kind"].startswith("series") else r * element / (r + element)
    if "measured" in load:
        points = load["measured"]
        fp = [p["frequency_hz"] for p in points]
        real = np.interp(f, fp, [p["resistance_ohm"] for p in points])
        return real + 1j * np.interp(f, fp, [p["reactance_ohm"] for p in points])
    return np.full(f.shape, complex(load["resistance_ohm"], load.get("reactance_ohm", 0.0)))


def worst(impedances, angles_at_centre, load, band, points=801, source=50.0):
    """Worst |reflection| of ideal (v = c) sections over the band, by the input-impedance formula."""
    f = np.linspace(band["start_hz"], band["stop_hz"], points)
    f0 = 0.5 * (band["start_hz"] + band["stop_hz"])
    zin = load_impedance(load, f)
    for z, theta in zip(impedances[::-1], angles_at_centre[::-1], strict=True):
        t = np.tan(theta * f / f0)
        zin = z * (zin + 1j * z * t) / (z + 1j * zin * t)
    return float(np.max(np.abs((zin - source) / (zin + source))))


def design(client, method, body):
    response = client.post(f"/v1/transformers/{method}", json=body)
    assert response.status_code == 200, response.text
    return response.json()


def body_for(load, band, **fields):
    return {"source_ohm": 50.0, "load": load, "band": band, "points": 41} | fields


def sections_of(result):
    return (
        [s["impedance_ohm"] for s in result["sections"]],
        [math.radians(s["electrical_length_deg"]) for s in result["sections"]],
    )


GLOBAL_CASES = [
    ("fixed 30-j40", BAND_NARROW, 1),
    ("fixed 100+j50", BAND_WIDE, 2),
    ("series R-C", BAND_WIDE, 2),
    ("series R-L", {"start_hz": 2e9, "stop_hz": 3e9}, 1),
    ("measured", {"start_hz": 1.0e9, "stop_hz": 2.0e9}, 2),
]


@pytest.mark.parametrize("name, band, sections", GLOBAL_CASES)
def test_refined_design_is_within_a_few_percent_of_the_global_optimum(client, name, band, sections):
    load = LOADS[name]
    result = design(client, "chebyshev", body_for(load, band, sections=sections, theory="exact"))
    count = len(result["sections"])
    ours = worst(*sections_of(result), load, band)
    assert ours == pytest.approx(result["verified"]["max_reflection"], rel=2e-3)  # the figure is true
    # Global search over the same count, default impedance range (10-200 ohm here) and lengths 0-180 deg.
    bounds = [(math.log(10.0), math.log(200.0))] * count + [(0.0, math.pi)] * count
    found = differential_evolution(
        lambda x: worst(np.exp(x[:count]), x[count:], load, band, points=201),
        bounds,
        seed=7,
        popsize=25,
        maxiter=400,
        tol=1e-9,
        polish=True,
    )
    best = worst(np.exp(found.x[:count]), found.x[count:], load, band)
    assert ours <= best * 1.03 + 1e-4, (ours, best)


@pytest.mark.parametrize("name", list(LOADS))
@pytest.mark.parametrize("method", ["quarter-wave", "binomial", "chebyshev"])
def test_refined_is_never_worse_than_the_start_and_beats_the_bare_load(client, name, method):
    band = BAND_NARROW if name.startswith("fixed") else {"start_hz": 1.2e9, "stop_hz": 1.8e9}
    extra = {} if method == "quarter-wave" else {"sections": 2}
    result = design(client, method, body_for(LOADS[name], band, **extra))
    refinement = result["refinement"]
    assert refinement is not None
    assert refinement["after"]["max_reflection"] <= refinement["before"]["max_reflection"]
    assert result["verified"]["max_reflection"] < result["unmatched_max_reflection"]
    unmatched = np.max(
        np.abs(load_impedance(LOADS[name], np.linspace(band["start_hz"], band["stop_hz"], 2001)) - 50)
        / np.abs(load_impedance(LOADS[name], np.linspace(band["start_hz"], band["stop_hz"], 2001)) + 50)
    )
    assert result["unmatched_max_reflection"] == pytest.approx(unmatched, rel=1e-6)


SEARCH_CASES = [
    ("fixed 30-j40", BAND_NARROW, 0.002),
    ("series R-C", BAND_WIDE, 0.05),
    ("parallel R-C", BAND_WIDE, 0.02),
    ("fixed 100+j50", BAND_WIDE, 0.03),
]


@pytest.mark.parametrize("name, band, spec", SEARCH_CASES)
def test_spec_driven_search_stops_at_the_shortest_best(client, name, band, spec):
    load = LOADS[name]
    result = design(client, "chebyshev", body_for(load, band, max_reflection=spec))
    count = len(result["sections"])
    rotated = any("turned real by a last section" in w for w in result["warnings"])
    transformer = count - 1 if rotated else count  # the sections a request by count asks for
    assert count <= 9  # the refined search stops at 8 transformer sections at most
    if result["verified"]["meets_spec"]:
        return
    # Not met: one more section must gain under 2% (the stated rule), and the text says so truthfully.
    more = design(client, "chebyshev", body_for(load, band, sections=transformer + 1))
    assert more["verified"]["max_reflection"] > result["verified"]["max_reflection"] * 0.98
    assert any(
        f"reaches is {result['verified']['max_reflection']:.4g} with {count} sections" in w for w in result["warnings"]
    )


def test_warnings_only_name_sections_and_counts_the_design_has(client):
    for name, load in LOADS.items():
        for method, extra in (("binomial", {"sections": 2}), ("chebyshev", {"max_reflection": 0.05}), ("taper", {})):
            result = design(client, method, body_for(load, BAND_WIDE if "fixed" not in name else BAND_NARROW, **extra))
            count = len(result["sections"])
            text = " ".join(result["warnings"])
            for index in re.findall(r"Section (\d+)", text):
                assert 1 <= int(index) <= count
            for claimed in re.findall(r"with (\d+) sections?", text):
                assert int(claimed) == count
            assert "Try theory" not in text  # no untested advice for refined designs


@pytest.mark.parametrize(
    "load",
    [
        {"circuit": {"kind": "series-rl", "resistance_ohm": 1e-3, "inductance_h": 1e-2}},
        {"touchstone": "# GHz S MA R 50\n1 1.0 30\n2 1.0 40\n3 1.0 50\n"},
        {
            "measured": [
                {"frequency_hz": 1e9, "resistance_ohm": 0.0, "reactance_ohm": 10.0},
                {"frequency_hz": 3e9, "resistance_ohm": 0.0, "reactance_ohm": 20.0},
            ]
        },
    ],
)
@pytest.mark.parametrize("path", ["quarter-wave", "chebyshev", "taper", "compare"])
def test_lossless_loads_are_refused_in_the_error_shape(client, load, path):
    # A load that absorbs nothing cannot be matched by any passive lossless network (energy
    # conservation; common practice, no source).
    body = {"source_ohm": 50.0, "load": load, "band": {"start_hz": 1e9, "stop_hz": 3e9}}
    response = client.post(f"/v1/transformers/{path}", json=body)
    assert response.status_code == 422
    problem = response.json()["problems"][0]
    assert problem["field"] == "load" and "no passive lossless network" in problem["message"]


@pytest.mark.parametrize(
    "form, reflection",
    # Return loss -20 log10 |Gamma| and VSWR (1 + |Gamma|) / (1 - |Gamma|) (IEEE Std 100 definitions).
    [({"min_return_loss_db": 20.0}, 0.1), ({"max_vswr": 1.5}, 0.2), ({"min_return_loss_db": 26.0}, 10 ** (-1.3))],
)
def test_spec_forms_give_the_same_design_as_the_reflection(client, form, reflection):
    base = body_for({"resistance_ohm": 120.0}, BAND_WIDE)
    by_form = design(client, "chebyshev", base | form)
    by_reflection = design(client, "chebyshev", base | {"max_reflection": reflection})
    assert by_form["verified"]["spec_max_reflection"] == pytest.approx(reflection, rel=1e-12)
    assert by_form["sections"] == by_reflection["sections"]


def test_two_spec_forms_are_refused(client):
    body = body_for({"resistance_ohm": 120.0}, BAND_WIDE, max_reflection=0.1, max_vswr=1.2)
    response = client.post("/v1/transformers/chebyshev", json=body)
    assert response.status_code == 422
    assert "give the spec once" in response.text


def test_user_limits_refuse_or_refine(client):
    base = body_for({"resistance_ohm": 100.0}, {"start_hz": 1e9, "stop_hz": 3e9}, max_reflection=0.05, sections=3)
    refused = client.post("/v1/transformers/chebyshev", json=base | {"max_impedance_ohm": 65.0})
    assert refused.status_code == 422
    problem = refused.json()["problems"][0]
    assert problem["field"] == "max_impedance_ohm" and "section 2" in problem["message"]
    held = design(client, "chebyshev", base | {"max_impedance_ohm": 65.0, "outside_limits": "refine"})
    assert max(s["impedance_ohm"] for s in held["sections"]) <= 65.0 * (1 + 1e-9)
    assert held["refinement"] is not None
    # The default limits never refuse a resistive design, even far outside 10-200 ohm.
    assert design(client, "chebyshev", base | {"load": {"resistance_ohm": 1500.0}})["refinement"] is None


def test_refined_sections_stay_within_the_default_limits(client):
    result = design(client, "chebyshev", body_for(LOADS["series R-C"], BAND_WIDE, sections=3))
    impedances = [s["impedance_ohm"] for s in result["sections"]]
    assert min(impedances) >= 10.0 * (1 - 1e-9) and max(impedances) <= 200.0 * (1 + 1e-9)


def test_bode_fano_bound_is_never_beaten_and_nearly_reached(client):
    # Series R-C, Bode-Fano (Fano 1950; Pozar, Microwave Engineering, sec. 5.9, from memory): the
    # integral of ln(1/|Gamma|) / omega^2 d omega is at most pi R C, so over omega1..omega2 the best
    # flat |Gamma| is exp(-pi R C / (1/omega1 - 1/omega2)).
    r, c = 25.0, 3e-12
    load = {"circuit": {"kind": "series-rc", "resistance_ohm": r, "capacitance_f": c}}
    for band in (BAND_WIDE, {"start_hz": 1.4e9, "stop_hz": 1.8e9}):
        w1, w2 = 2 * math.pi * band["start_hz"], 2 * math.pi * band["stop_hz"]
        bound = math.exp(-math.pi * r * c / (1 / w1 - 1 / w2))
        result = design(client, "chebyshev", body_for(load, band, sections=4))
        assert result["bode_fano"]["min_reflection"] == pytest.approx(bound, rel=1e-9)
        assert result["verified"]["max_reflection"] >= bound
    # Over the octave, where the bound is large enough for a few sections to approach it, four
    # sections come within a factor of 3.5 of it (the factor we state; measured 2.9 while writing).
    wide = design(client, "chebyshev", body_for(load, BAND_WIDE, sections=4))
    assert wide["verified"]["max_reflection"] <= 3.5 * wide["bode_fano"]["min_reflection"]


def test_total_reflection_gives_null_vswr_and_zero_return_loss(client):
    # An analysed line ending in a near-open: |Gamma| rounds to 1 at every frequency.
    body = {
        "source_ohm": 50.0,
        "load": {"resistance_ohm": 1e5},
        "band": {"start_hz": 1e9, "stop_hz": 2e9},
        "sections": [{"impedance_ohm": 1e-3, "electrical_length_deg": 90}],
        "points": 5,
    }
    response = client.post("/v1/networks/analyze", json=body)
    assert response.status_code == 200, response.text
    verified = response.json()["verified"]
    assert verified["max_vswr"] is None and verified["min_return_loss_db"] == pytest.approx(0.0, abs=1e-6)


def test_a_band_in_the_wrong_unit_is_questioned(client):
    result = design(client, "binomial", body_for({"resistance_ohm": 75.0}, {"start_hz": 1.0, "stop_hz": 3.0}))
    assert any("meant in GHz or MHz" in w for w in result["warnings"])
