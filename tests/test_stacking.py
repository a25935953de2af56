"""Stacked checks (designs x frequencies x sections in one cascade) equal checking each line alone.

Reference: the same module's one-line path, which the exact-cascade tests tie to scikit-rf and
to high-precision arithmetic; stacking must not change a single figure.
"""

import numpy as np
import pytest

from service.analysis.line_cascade import STACK_DESIGNS, LineCascade, stackable_groups
from service.analysis.section_tables import section_tables
from service.analysis.worst_case import check, check_many
from service.physics.loads import FixedLoad
from service.physics.media.ideal import IdealLine
from service.physics.media.microstrip import MicrostripLine

MEDIA = {
    "ideal": (IdealLine(velocity_factor=0.7), (20.0, 120.0)),
    "lossy microstrip": (
        MicrostripLine(
            eps_r=3.66, height_m=0.508e-3, thickness_m=35e-6, loss_tangent=0.004, conductivity_s_per_m=5.8e7
        ),
        (0.2e-3, 3e-3),
    ),
}


def random_lines(medium, geometry_range, count: int, seed: int) -> list[LineCascade]:
    rng = np.random.default_rng(seed)
    return [
        LineCascade(
            50.0,
            FixedLoad(float(rng.uniform(5, 200)), float(rng.uniform(-30, 30))),
            medium,
            rng.uniform(*geometry_range, 4),
            rng.uniform(0.005, 0.06, 4),
        )
        for _ in range(count)
    ]


@pytest.mark.parametrize("name", MEDIA)
def test_stacked_check_equals_one_line_at_a_time(name):
    medium, geometry_range = MEDIA[name]
    lines = random_lines(medium, geometry_range, 6, seed=11)
    starts, stops = np.full(6, 1e9), np.linspace(2e9, 4e9, 6)
    specs, points = np.full(6, 0.1), np.full(6, 41)
    stacked = check_many(lines, starts, stops, specs, points)
    for line, start, stop, (figures, curve) in zip(lines, starts, stops, stacked, strict=True):
        alone_figures, alone_curve = check(line, start, stop, 0.1, 41)
        # Each design is checked on the grid it would get alone, so stacking changes nothing.
        assert figures == alone_figures
        assert curve == alone_curve
        assert (curve.insertion_loss_db is None) == (name == "ideal")


def test_large_stacks_are_cut_into_cache_sized_chunks():
    lines = random_lines(IdealLine(), (20.0, 120.0), 2 * STACK_DESIGNS + 6, seed=5)
    groups = stackable_groups(lines)
    assert [len(group) for group in groups] == [STACK_DESIGNS, STACK_DESIGNS, 6]
    assert sorted(index for group in groups for index in group) == list(range(len(lines)))


@pytest.mark.parametrize("name", MEDIA)
def test_stacked_section_tables_equal_one_line_at_a_time(name):
    medium, geometry_range = MEDIA[name]
    lines = random_lines(medium, geometry_range, 5, seed=9)  # reactive loads: no step into the load
    lines.append(LineCascade(50.0, FixedLoad(75.0), medium, lines[0].geometry, lines[0].lengths_m))
    centers = np.linspace(1e9, 3e9, len(lines))
    together = section_tables(lines, centers)
    for line, center, table in zip(lines, centers, together, strict=True):
        alone = section_tables([line], np.array([center]))[0]
        assert table == alone
        assert len(table.sections) == line.geometry.size
        resistive = line.load.reactance_ohm == 0.0
        assert len(table.junctions) == line.geometry.size + (1 if resistive else 0)
    # The step into the resistive load: (75 - Z_last) / (75 + Z_last), from the section's impedance
    last = together[-1]
    z_last = last.sections[-1].impedance_ohm
    assert last.junctions[-1].reflection == pytest.approx((75.0 - z_last) / (75.0 + z_last), rel=1e-15)
