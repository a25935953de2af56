"""The static excess capacitance of a step in a coax's inner conductor, by a field solution.

Laplace's equation in the axisymmetric (r, z) plane, div(r grad phi) = 0, is solved by finite
volumes on a square grid (SciPy's sparse direct solver): the inner conductor (radius a for z < 0,
c for z >= 0) at 1 V, the outer (radius b) at 0 V, the field left radial (TEM) at z = +-3 gaps.
The capacitance is the field energy, 2 W / V^2; the excess is what remains after the two uniform
lines' capacitance per length (of the same grid) times their lengths. The re-entrant corner at
r = c makes the error fall as h^(4/3), so three grids are Richardson-extrapolated.

Run as a script (`python -m validation.coax_step_field`) it writes the table that
service/physics/coax_step.py interpolates: the ratio of the field solution to the Whinnery-Jamieson
parallel-plate step scaled by the outer circumference, over the step's gap ratio and a/b.
"""

from __future__ import annotations

import json
import math
import sys
from concurrent.futures import ProcessPoolExecutor

import numpy as np
import scipy.sparse
import scipy.sparse.linalg

from service.constants import EPSILON_0_F_PER_M
from service.physics.coax_step import GAP_RATIOS, RADIUS_RATIOS, TABLE_PATH, parallel_plate_step_f_per_m

FEED_GAPS = 3.0  # each uniform line's length, in gaps b - a: higher modes decay as exp(-pi z / gap)
ORDER = 4.0 / 3.0  # the grid error's order at a 270-degree corner


def grid_capacitance_f(a_m: float, c_m: float, b_m: float, cells: int, axisymmetric: bool = True) -> float:
    """The excess capacitance (F; per metre of width when planar) on a grid of `cells` across b - a.

    c - a must be a whole number of cells. Planar (r weights of one) it is the parallel-plate step
    of spacings b - a and b - c, one plate flat, which Whinnery and Jamieson solved exactly.
    """
    step = (b_m - a_m) / cells
    corner = round((c_m - a_m) / step)
    if abs(corner * step - (c_m - a_m)) > 1e-9 * b_m:
        raise ValueError("c - a must be a whole number of grid steps")
    half = round(FEED_GAPS * cells)
    columns = 2 * half + 1
    i, j = np.meshgrid(np.arange(cells + 1), np.arange(columns), indexing="ij")

    def weight(radius: np.ndarray) -> np.ndarray:
        return radius if axisymmetric else np.ones_like(radius)

    node = i * columns + j
    # radial links (i, j)-(i+1, j), faces of width one step (half at the two ends)
    radial_w = weight(a_m + (i[:-1] + 0.5) * step) * np.where((j[:-1] == 0) | (j[:-1] == columns - 1), 0.5, 1.0)
    axial_w = weight(a_m + i[:, :-1] * step) * np.where((i[:, :-1] == 0) | (i[:, :-1] == cells), 0.5, 1.0)
    first = np.concatenate([node[:-1].ravel(), node[:, :-1].ravel()])
    second = np.concatenate([node[1:].ravel(), node[:, 1:].ravel()])
    weights = np.concatenate([radial_w.ravel(), axial_w.ravel()])

    size = node.size
    conductor = ((i == 0) | ((j >= half) & (i <= corner))).ravel()
    fixed = conductor | (i == cells).ravel()
    potential = np.where(conductor, 1.0, 0.0)
    laplacian = scipy.sparse.coo_matrix(
        (
            np.concatenate([weights, weights, -weights, -weights]),
            (np.concatenate([first, second, first, second]), np.concatenate([first, second, second, first])),
        ),
        shape=(size, size),
    ).tocsr()
    free = ~fixed
    system = laplacian[free][:, free].tocsc()
    potential[free] = scipy.sparse.linalg.spsolve(system, -laplacian[free][:, fixed] @ potential[fixed])
    scale = (2.0 * math.pi if axisymmetric else 1.0) * EPSILON_0_F_PER_M
    total = scale * float(np.sum(weights * (potential[first] - potential[second]) ** 2))

    def per_length(inner_m: float) -> float:
        midpoints = inner_m + (np.arange(round((b_m - inner_m) / step)) + 0.5) * step
        return scale / float(np.sum(step / weight(midpoints)))

    length = half * step
    return total - length * (per_length(a_m) + per_length(c_m))


def extrapolated_capacitance_f(a_m: float, c_m: float, b_m: float, coarsest: int, axisymmetric: bool = True) -> float:
    """Richardson's extrapolation of three grids (coarsest, twice and four times as fine)."""
    values = [grid_capacitance_f(a_m, c_m, b_m, coarsest * k, axisymmetric) for k in (1, 2, 4)]
    gain = 2.0**ORDER
    return values[2] + (values[2] - values[1]) / (gain - 1.0)


def coarsest_cells(gap_ratio: float, radius_ratio: float) -> int:
    """Cells across b - a on the coarsest grid: at least eight across the narrow gap, four across the
    step and forty for a thin inner conductor (a/b < 0.1), with c - a a whole number of cells."""
    cells = 40 if radius_ratio < 0.1 else 20
    while (
        cells * gap_ratio < 8
        or cells * (1 - gap_ratio) < 4
        or abs(cells * (1 - gap_ratio) - round(cells * (1 - gap_ratio))) > 1e-9
    ):
        cells += 20
    return cells


def table_ratio(gap_ratio: float, radius_ratio: float) -> float:
    """The field solution over the outer circumference times the parallel-plate step, for b = 1 m."""
    b_m, a_m = 1.0, radius_ratio
    c_m = b_m - gap_ratio * (b_m - a_m)
    field = extrapolated_capacitance_f(a_m, c_m, b_m, coarsest_cells(gap_ratio, radius_ratio))
    return field / (2.0 * math.pi * b_m * parallel_plate_step_f_per_m(np.array(gap_ratio), 1.0).item())


def main() -> None:
    """Compute the table (a few minutes on two cores) and write it beside the model."""
    cases = [(g, s) for g in GAP_RATIOS for s in RADIUS_RATIOS]
    with ProcessPoolExecutor() as pool:
        ratios = list(pool.map(table_ratio, *zip(*cases, strict=True)))
    table = np.array(ratios).reshape(len(GAP_RATIOS), len(RADIUS_RATIOS))
    TABLE_PATH.write_text(
        json.dumps(
            {
                "about": "coax inner-step capacitance / (2 pi b x Whinnery-Jamieson parallel-plate step); "
                "rows: gap ratio (b-c)/(b-a), columns: a/b; written by validation/coax_step_field.py",
                "gap_ratios": list(GAP_RATIOS),
                "radius_ratios": list(RADIUS_RATIOS),
                "ratio": [[round(v, 6) for v in row] for row in table],
            },
            indent=1,
        )
        + "\n"
    )
    print(f"wrote {TABLE_PATH} ({table.size} field solutions)", file=sys.stderr)


if __name__ == "__main__":
    main()
