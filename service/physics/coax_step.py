"""The step in a coax's inner conductor (outer diameter held): a shunt capacitance at the step.

Whinnery and Jamieson (Proc. IRE 32, 1944) solved the step between parallel plates of spacings
b1 < b2 exactly by conformal mapping; with alpha = b1 / b2 the excess capacitance per unit width is

    C / w = (eps / pi) [ (alpha^2 + 1) / alpha  ln((1 + alpha) / (1 - alpha)) - 2 ln(4 alpha / (1 - alpha^2)) ],

and a coax step whose gaps b - a and b - c (a < c the inner radii, b the outer) are small beside
its radii is that step rolled up, w = 2 pi b. Where the gap is not small the curvature matters
(up to a factor 1.5 at a/b = 0.02); Somlo (IEEE Trans. MTT-15, 1967) fitted a closed form to his
mode-matching results for it, which we could not confirm from a source at hand. We take the
curvature instead from our own static field solution (validation/coax_step_field.py: finite
volumes on the axisymmetric Laplace equation, Richardson-extrapolated; its planar limit
reproduces the formula above to 0.02%), tabulated as the ratio q(alpha, a/b) of the field
solution to the rolled-up formula, so that C = 2 pi b (eps / pi) [...] q.

Static: valid while the gap is small beside the wavelength (the capacitance rises as the first
higher-order mode nears cutoff; noted). Outside the table (alpha < 0.1, a/b beyond 0.02-0.95) the
ratio is held at the table's edge and the figures are said to be estimates.
"""

from __future__ import annotations

import functools
import json
import math
from pathlib import Path

import numpy as np
from scipy.interpolate import RectBivariateSpline

from service.constants import EPSILON_0_F_PER_M, SPEED_OF_LIGHT_M_PER_S

TABLE_PATH = Path(__file__).with_name("coax_step_table.json")
GAP_RATIOS = (0.1, 0.15, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 0.95)
RADIUS_RATIOS = (0.02, 0.05, 0.1, 0.15, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 0.95)
STATIC_LIMIT = 0.5  # of the TM01 cutoff estimate c / (2 (b - a) sqrt(eps_r)): common practice, no source


def parallel_plate_step_f_per_m(gap_ratio: np.ndarray, eps_r: float | np.ndarray) -> np.ndarray:
    """Whinnery and Jamieson's excess capacitance per unit width of a step of spacings b1/b2 = gap_ratio."""
    alpha = np.clip(np.asarray(gap_ratio, dtype=float), 1e-12, 1.0 - 1e-12)
    bracket = (alpha**2 + 1.0) / alpha * np.log((1.0 + alpha) / (1.0 - alpha)) - 2.0 * np.log(
        4.0 * alpha / (1.0 - alpha**2)
    )
    return EPSILON_0_F_PER_M * np.asarray(eps_r) / math.pi * np.maximum(bracket, 0.0)


@functools.cache
def _curvature_ratio() -> RectBivariateSpline:
    """q(alpha, a/b) from the field-solution table, by an interpolating bicubic spline."""
    table = json.loads(TABLE_PATH.read_text())
    return RectBivariateSpline(table["gap_ratios"], table["radius_ratios"], np.array(table["ratio"]), s=0)


def step_geometry(left_diameter_m: np.ndarray, right_diameter_m: np.ndarray, outer_diameter_m: float):
    """The gap ratio (b - c) / (b - a) and a/b of each junction (a, c the smaller and larger inner radii)."""
    left, right = np.asarray(left_diameter_m, dtype=float), np.asarray(right_diameter_m, dtype=float)
    small, large = np.minimum(left, right), np.maximum(left, right)
    gap_ratio = (outer_diameter_m - large) / (outer_diameter_m - small)
    return gap_ratio, small / outer_diameter_m


def coax_step_capacitance_f(
    left_diameter_m: np.ndarray, right_diameter_m: np.ndarray, outer_diameter_m: float, eps_r: float | np.ndarray
) -> np.ndarray:
    """The shunt capacitance of each junction between inner conductors of these diameters."""
    gap_ratio, radius_ratio = step_geometry(left_diameter_m, right_diameter_m, outer_diameter_m)
    ratio = _curvature_ratio().ev(
        np.clip(gap_ratio, GAP_RATIOS[0], GAP_RATIOS[-1]), np.clip(radius_ratio, RADIUS_RATIOS[0], RADIUS_RATIOS[-1])
    )
    rolled_up = math.pi * outer_diameter_m * parallel_plate_step_f_per_m(gap_ratio, eps_r)
    return np.where(gap_ratio >= 1.0, 0.0, rolled_up * ratio)


def coax_step_notes(diameters_m: np.ndarray, outer_diameter_m: float, eps_r: float, stop_hz: float) -> list[str]:
    """Where the junctions of this chain of inner diameters (feed line first) leave the model's range."""
    gap_ratio, radius_ratio = step_geometry(diameters_m[:-1], diameters_m[1:], outer_diameter_m)
    notes = []
    outside = (gap_ratio < GAP_RATIOS[0]) | (radius_ratio < RADIUS_RATIOS[0]) | (radius_ratio > RADIUS_RATIOS[-1])
    if np.any(outside & (gap_ratio < 1.0)):
        listed = ", ".join(f"{k}-{k + 1}" for k in np.flatnonzero(outside & (gap_ratio < 1.0)))
        notes.append(
            f"Junctions {listed} (0 is the feed line) lie outside the coax step table (gap ratio (D-d2)/(D-d1) "
            f"from {GAP_RATIOS[0]:g}, d/D {RADIUS_RATIOS[0]:g}-{RADIUS_RATIOS[-1]:g}); their step capacitance is "
            "taken at the table's edge, so treat the with-step figures there as estimates."
        )
    widest_gap_m = (outer_diameter_m - float(np.min(diameters_m))) / 2.0
    cutoff_hz = SPEED_OF_LIGHT_M_PER_S / (2.0 * widest_gap_m * math.sqrt(eps_r))
    if stop_hz > STATIC_LIMIT * cutoff_hz:
        notes.append(
            f"The coax step capacitance is the static value, and the band reaches {stop_hz / cutoff_hz:.2g} of the "
            f"estimated TM01 cutoff ({cutoff_hz / 1e9:.4g} GHz), where it rises: treat the with-step figures as "
            "estimates."
        )
    return notes
