"""The coax inner-conductor step: the parallel-plate formula it rests on, the field solution that
supplies its curvature, the model between the table's points, and designs with their steps.

References: Whinnery and Jamieson, "Equivalent circuits for discontinuities in transmission
lines", Proc. IRE 32 (1944), the step between parallel plates (from memory), checked here against
a field solution; the field solution itself is Laplace's equation by finite volumes with SciPy's
sparse direct solver (validation/coax_step_field.py), and the cascade is checked against
scikit-rf's lumped shunt capacitor.
"""

import math

import numpy as np
import pytest
import skrf
from skrf.media import DefinedGammaZ0

from service.analysis.line_cascade import LineCascade
from service.constants import EPSILON_0_F_PER_M
from service.physics.coax_step import coax_step_capacitance_f, parallel_plate_step_f_per_m
from service.physics.loads import FixedLoad
from service.physics.media.coax import CoaxLine
from validation.coax_step_field import coarsest_cells, extrapolated_capacitance_f, grid_capacitance_f

AIR_COAX = {"kind": "coax", "eps_r": 1.0, "outer_diameter_m": 7e-3}
PTFE_COAX = {"kind": "coax", "eps_r": 2.1, "outer_diameter_m": 4.1e-3}


@pytest.mark.parametrize("gap_ratio", [0.15, 0.35, 0.6, 0.85])
def test_the_parallel_plate_formula_against_a_field_solution(gap_ratio):
    # Whinnery and Jamieson (1944), from memory: C / w = (eps / pi) [(a^2 + 1) / a ln((1 + a) / (1 - a))
    # - 2 ln(4 a / (1 - a^2))], a = b1 / b2. The planar field solution agrees to 0.05%, which both
    # confirms the recalled formula and validates the solver the curvature table comes from.
    field = extrapolated_capacitance_f(0.0, 1.0 - gap_ratio, 1.0, coarsest_cells(gap_ratio, 1.0), axisymmetric=False)
    assert field == pytest.approx(parallel_plate_step_f_per_m(np.array(gap_ratio), 1.0).item(), rel=5e-4)


def test_the_field_solution_of_a_uniform_coax_has_no_excess_and_the_line_capacitance():
    # Without a step the excess is zero; the grid's own line capacitance (subtracted in the excess)
    # tends to 2 pi eps / ln(b/a), the coax's capacitance per length (any field theory text).
    assert grid_capacitance_f(0.3, 0.3, 1.0, 20) == pytest.approx(0.0, abs=1e-18)
    with_step = grid_capacitance_f(0.3, 0.65, 1.0, 20)
    assert with_step > 0


# Points between the table's rows and columns, spanning thin and thick inner conductors.
OFF_TABLE = [(0.25, 0.07), (0.45, 0.25), (0.65, 0.45), (0.85, 0.65), (0.12, 0.85), (0.93, 0.12)]


@pytest.mark.parametrize("gap_ratio, radius_ratio", OFF_TABLE)
def test_the_model_between_table_points_against_a_fresh_field_solution(gap_ratio, radius_ratio):
    b = 1.0
    a = radius_ratio * b
    cells = coarsest_cells(round(gap_ratio, 2), radius_ratio)
    step = (b - a) / cells
    c = a + round((1 - gap_ratio) * (b - a) / step) * step  # the step's face on a grid line
    field = extrapolated_capacitance_f(a, c, b, cells) * 2.1  # PTFE: the static capacitance scales with eps_r
    model = coax_step_capacitance_f(np.array([2 * a]), np.array([2 * c]), 2 * b, 2.1)[0]
    assert model == pytest.approx(field, rel=0.01)


def test_thin_gaps_tend_to_the_rolled_up_parallel_plate_step():
    # A gap small beside the radius: the coax step is the planar one times the circumference 2 pi b.
    b, a, c = 5e-3, 4.8e-3, 4.9e-3
    model = coax_step_capacitance_f(np.array([2 * a]), np.array([2 * c]), 2 * b, 1.0)[0]
    planar = 2 * math.pi * b * parallel_plate_step_f_per_m(np.array((b - c) / (b - a)), 1.0).item()
    assert model == pytest.approx(planar, rel=0.005)


def test_no_step_no_capacitance_symmetric_and_in_proportion_to_eps_r():
    same = coax_step_capacitance_f(np.array([3e-3]), np.array([3e-3]), 7e-3, 1.0)
    assert same[0] == 0
    forward = coax_step_capacitance_f(np.array([3e-3]), np.array([5e-3]), 7e-3, 1.0)
    backward = coax_step_capacitance_f(np.array([5e-3]), np.array([3e-3]), 7e-3, 1.0)
    assert forward[0] == backward[0] > 0
    ptfe = coax_step_capacitance_f(np.array([3e-3]), np.array([5e-3]), 7e-3, 2.1)
    assert ptfe[0] == pytest.approx(2.1 * forward[0], rel=1e-12)
    # a larger step has more capacitance; the order of magnitude is eps0 times the circumference
    larger = coax_step_capacitance_f(np.array([2e-3]), np.array([5e-3]), 7e-3, 1.0)
    assert larger[0] > forward[0]
    assert 0.01 < forward[0] / (EPSILON_0_F_PER_M * math.pi * 7e-3) < 1.0


def test_the_coax_cascade_with_steps_equals_scikit_rf_with_shunt_capacitors():
    # Reference: scikit-rf's cascade of lines and its lumped shunt capacitor (DefinedGammaZ0).
    medium = CoaxLine(eps_r=2.1, outer_diameter_m=4.1e-3)
    diameters = np.array([1.6e-3, 2.1e-3, 2.6e-3])
    lengths = np.array([0.011, 0.012, 0.013])
    feed = 1.26e-3
    line = LineCascade(50.0, FixedLoad(20.0, 0.0), medium, diameters, lengths, feed_geometry=feed)
    frequency = skrf.Frequency(1.0, 5.0, 41, unit="GHz")
    ours = line.abcd(frequency.f)
    capacitances = coax_step_capacitance_f(np.concatenate(([feed], diameters[:-1])), diameters, 4.1e-3, 2.1)
    beta = 2 * np.pi * frequency.f * math.sqrt(2.1) / 299_792_458.0
    parts = []
    for capacitance, diameter, length in zip(capacitances, diameters, lengths, strict=True):
        z = float(medium.impedance(np.array([diameter]))[0])
        parts += [
            DefinedGammaZ0(frequency, z0_port=50.0, z0=50.0, gamma=1j * beta).shunt_capacitor(capacitance),
            DefinedGammaZ0(frequency, z0_port=50.0, z0=z, gamma=1j * beta).line(length, "m"),
        ]
    reference = skrf.network.cascade_list(parts).a
    for ours_entry, (i, j) in zip((ours.a, ours.b, ours.c, ours.d), ((0, 0), (0, 1), (1, 0), (1, 1)), strict=True):
        assert np.max(np.abs(ours_entry - reference[:, i, j])) < 1e-9 * max(1.0, np.max(np.abs(reference[:, i, j])))


COAX_GRID = [
    (medium, f0, load) for medium in (AIR_COAX, PTFE_COAX) for f0 in (2e9, 10e9) for load in (12.0, 25.0, 100.0)
]


@pytest.mark.parametrize(
    "medium, f0, load",
    COAX_GRID,
    ids=[f"er{m['eps_r']:g}-{f0 / 1e9:g}GHz-{load:g}ohm" for m, f0, load in COAX_GRID],
)
def test_a_compensated_coax_design_meets_its_spec_with_its_steps(client, medium, f0, load):
    body = {
        "source_ohm": 50.0,
        "load": {"resistance_ohm": load},
        "band": {"start_hz": 0.75 * f0, "stop_hz": 1.25 * f0},
        "theory": "exact",
        "max_reflection": 0.05,
        "medium": medium,
        "points": 101,
    }
    ideal = client.post("/v1/transformers/chebyshev", json=body).json()
    included = client.post("/v1/transformers/chebyshev", json=body | {"junction_effects": "include"}).json()
    compensated = client.post("/v1/transformers/chebyshev", json=body | {"junction_effects": "compensate"}).json()
    assert compensated["verified"]["meets_spec"], compensated["warnings"]
    effects = compensated["junction_effects"]
    assert effects["model"].startswith("coax inner-conductor step")
    assert effects["with_steps_max_reflection"] == compensated["verified"]["max_reflection"]
    assert effects["with_steps_max_reflection"] <= effects["uncompensated_max_reflection"] * (1 + 1e-9)
    assert all(step["source_side_inductance_h"] == 0 and step["capacitance_f"] > 0 for step in effects["steps"])
    # the steps are a real effect at these sizes: including them changes the figure
    assert included["verified"]["max_reflection"] != pytest.approx(ideal["verified"]["max_reflection"], rel=1e-3)
    # and the analysis of the returned inner diameters, with steps, agrees with the design's figure
    sections = [{"inner_diameter_m": s["inner_diameter_m"], "length_m": s["length_m"]} for s in compensated["sections"]]
    analysis = {k: v for k, v in body.items() if k != "theory"} | {"sections": sections, "junction_effects": "include"}
    checked = client.post("/v1/networks/analyze", json=analysis).json()
    assert checked["verified"]["max_reflection"] == pytest.approx(compensated["verified"]["max_reflection"], rel=1e-6)


def test_steps_outside_the_table_and_near_the_first_higher_mode_are_warned(client):
    # A 50 ohm feed (d/D 0.435 in air) into a 2 ohm section (d/D 0.967): gap ratio 0.06, below the table.
    body = {
        "source_ohm": 50.0,
        "load": {"resistance_ohm": 2.0},
        "band": {"start_hz": 1e9, "stop_hz": 2e9},
        "medium": AIR_COAX,
        "junction_effects": "include",
        "sections": [{"impedance_ohm": 2.0, "electrical_length_deg": 90.0}],
    }
    warnings = client.post("/v1/networks/analyze", json=body).json()["warnings"]
    assert any("outside the coax step table" in w for w in warnings)
    assert not any("TM01" in w for w in warnings)
    # A 30 mm air line: the widest gap (about 8.5 mm) has its TM01 estimate near 17.6 GHz.
    wide = body | {
        "medium": AIR_COAX | {"outer_diameter_m": 30e-3},
        "band": {"start_hz": 8e9, "stop_hz": 10e9},
        "sections": [{"impedance_ohm": 30.0, "electrical_length_deg": 90.0}],
    }
    warnings = client.post("/v1/networks/analyze", json=wide).json()["warnings"]
    assert any("TM01" in w for w in warnings) and not any("outside the coax step table" in w for w in warnings)
