"""Step discontinuities: the lumped equivalent circuit of a junction between two line widths.

Coax inner-conductor step: a shunt capacitance, in coax_step.py.

Stripline step in width, after Altschuler and Oliner ("Discontinuities in the center conductor of
symmetric strip transmission line", IRE Trans. MTT-8, 1960): a series reactance at the step,

    X / Z1 = (2 D1 / lambda) ln csc(pi D2 / (2 D1)),

with Z1 the wider line's impedance, lambda the wavelength in the dielectric and D1 > D2 the
strips' equivalent parallel-plate widths, D = eta0 b / (4 sqrt(eps_r) Z) (b the ground spacing;
for a thin wide strip D = W + 2 b ln 2 / pi). X grows in proportion to frequency, so it is an
inductance, L = Z1 D1 sqrt(eps_r) ln csc(pi D2 / (2 D1)) / (pi c). It was derived for thin
strips wide enough that their edges do not interact (warned otherwise).

Microstrip step in width, after the closed-form fits collected by Gupta, Garg, Bahl and Bhartia
("Microstrip Lines and Slotlines", 2nd ed., Artech House, 1996, the step-in-width section; the fits
are Garg and Bahl's). The junction is a shunt capacitance C at the step with a series inductance on
each side; with W1 the wider strip and W2 the narrower:

    C / sqrt(W1 W2)  [pF/m] = (10.1 log10 eps_r + 2.33) W1/W2 - 12.6 log10 eps_r - 3.17
                              (eps_r <= 10, 1.5 <= W1/W2 <= 3.5)
                            = 130 log10(W1/W2) - 44        (eps_r = 9.6, 3.5 <= W1/W2 <= 10)
    L / h            [nH/m] = 40.5 (W1/W2 - 1) - 75 log10(W1/W2) + 0.2 (W1/W2 - 1)^2
                              (W1/W2 <= 5, W2/h about 1)

and the inductance is shared between the two sides in proportion to each line's inductance per
unit length, Z sqrt(eps_eff) / c. Below W1/W2 = 1.5 the capacitance fit goes negative before the
ratio reaches 1, where a step vanishes; there it is bridged linearly from zero at W1/W2 = 1 to the
fit's value at 1.5 (our choice, warned as outside the fit's range). The two capacitance fits meet
within 2% at W1/W2 = 3.5 for eps_r = 9.6; the first is used up to W1/W2 = 10 for other
permittivities, warned.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from service.constants import ETA_0_OHM, SPEED_OF_LIGHT_M_PER_S
from service.physics.coax_step import coax_step_capacitance_f, coax_step_notes

MODEL_NAMES = {
    "microstrip": "microstrip step in width (Garg-Bahl fits, as collected by Gupta, Garg, Bahl and Bhartia)",
    "stripline": "stripline step in width (Altschuler and Oliner, 1960)",
    "coax": "coax inner-conductor step (Whinnery-Jamieson parallel-plate step rolled up, with a curvature "
    "ratio from a static field solution)",
}
STRIPLINE_WIDE_STRIP = 0.35  # W / (b - t) from which a strip counts as wide (as in the stripline model's notes)
STRIPLINE_THIN_STRIP = 0.1  # t / b up to which a strip counts as thin
CAPACITANCE_FIT_RANGE = (1.5, 3.5)
WIDE_FIT_EPS_R = 9.6
WIDE_FIT_RANGE = (3.5, 10.0)
INDUCTANCE_FIT_MAX = 5.0
EPS_R_MAX = 10.0


@dataclass(frozen=True)
class StepElements:
    """The equivalent circuit of each junction: series inductance on the left (source) side, shunt
    capacitance, series inductance on the right (load) side; arrays broadcast like the widths."""

    left_inductance_h: np.ndarray
    capacitance_f: np.ndarray
    right_inductance_h: np.ndarray


def _step_capacitance_per_m(ratio: np.ndarray, eps_r: float | np.ndarray) -> np.ndarray:
    """C / sqrt(W1 W2) in F/m for W1/W2 = ratio >= 1."""
    log_eps = np.log10(eps_r)

    def narrow_fit(r: np.ndarray) -> np.ndarray:
        return (10.1 * log_eps + 2.33) * r - 12.6 * log_eps - 3.17

    fitted = narrow_fit(ratio)
    wide_fit = (np.asarray(eps_r) == WIDE_FIT_EPS_R) & (ratio > WIDE_FIT_RANGE[0])
    fitted = np.where(wide_fit, 130.0 * np.log10(ratio) - 44.0, fitted)
    low = CAPACITANCE_FIT_RANGE[0]
    bridged = narrow_fit(low) * (ratio - 1.0) / (low - 1.0)
    return np.where(ratio < low, np.maximum(bridged, 0.0), fitted) * 1e-12


def microstrip_step(
    left_width_m: np.ndarray,
    right_width_m: np.ndarray,
    left_per_m_h: np.ndarray,
    right_per_m_h: np.ndarray,
    eps_r: float,
    height_m: float,
) -> StepElements:
    """The junction between strips of these widths; `*_per_m_h` is each line's inductance per unit
    length (Z sqrt(eps_eff) / c), which sets how the step's inductance is shared."""
    left, right = np.asarray(left_width_m, dtype=float), np.asarray(right_width_m, dtype=float)
    wide, narrow = np.maximum(left, right), np.minimum(left, right)
    ratio = wide / narrow
    capacitance = _step_capacitance_per_m(ratio, eps_r) * np.sqrt(wide * narrow)
    inductance = (40.5 * (ratio - 1.0) - 75.0 * np.log10(ratio) + 0.2 * (ratio - 1.0) ** 2) * 1e-9 * height_m
    inductance = np.maximum(inductance, 0.0)
    share = left_per_m_h / (left_per_m_h + right_per_m_h)
    return StepElements(share * inductance, capacitance, (1.0 - share) * inductance)


def stripline_step(
    left_impedance_ohm: np.ndarray, right_impedance_ohm: np.ndarray, eps_r: float, ground_spacing_m: float
) -> StepElements:
    """The junction between striplines of these impedances: one series inductance at the step."""
    left, right = np.asarray(left_impedance_ohm, dtype=float), np.asarray(right_impedance_ohm, dtype=float)
    wide_ohm = np.minimum(left, right)  # the wider strip has the lower impedance
    scale = ETA_0_OHM * ground_spacing_m / (4.0 * np.sqrt(eps_r))
    wide, narrow = scale / wide_ohm, scale / np.maximum(left, right)
    inductance = wide_ohm * wide * np.sqrt(eps_r) * np.log(1.0 / np.sin(np.pi * narrow / (2.0 * wide)))
    inductance = inductance / (np.pi * SPEED_OF_LIGHT_M_PER_S)
    return StepElements(inductance, np.zeros_like(inductance), np.zeros_like(inductance))


def inductance_per_m_h(impedance_ohm: np.ndarray, eps_eff: np.ndarray) -> np.ndarray:
    """A TEM or quasi-TEM line's inductance per unit length, Z sqrt(eps_eff) / c."""
    return np.asarray(impedance_ohm) * np.sqrt(eps_eff) / SPEED_OF_LIGHT_M_PER_S


def coax_step(
    left_diameter_m: np.ndarray, right_diameter_m: np.ndarray, outer_diameter_m: float, eps_r: float
) -> StepElements:
    """The junction between inner conductors of these diameters: one shunt capacitance (coax_step.py)."""
    capacitance = coax_step_capacitance_f(left_diameter_m, right_diameter_m, outer_diameter_m, eps_r)
    return StepElements(np.zeros_like(capacitance), capacitance, np.zeros_like(capacitance))


def step_notes(medium: object, widths_m: np.ndarray, stop_hz: float) -> list[str]:
    """Where the junctions of this chain of widths (feed line first) leave the model's stated range."""
    if medium.kind == "coax":
        return coax_step_notes(np.asarray(widths_m, dtype=float), medium.outer_diameter_m, medium.eps_r, stop_hz)
    if medium.kind == "stripline":
        return _stripline_notes(np.asarray(widths_m, dtype=float), medium.ground_spacing_m, medium.thickness_m)
    return _microstrip_notes(np.asarray(widths_m, dtype=float), medium.eps_r)


def _stripline_notes(widths: np.ndarray, ground_spacing_m: float, thickness_m: float) -> list[str]:
    notes = []
    if np.min(widths) / (ground_spacing_m - thickness_m) < STRIPLINE_WIDE_STRIP:
        notes.append(
            f"Some strips are narrower than {STRIPLINE_WIDE_STRIP:g} of the ground spacing: the stripline step "
            "model was derived for wide strips, so treat the with-step figures as estimates."
        )
    if thickness_m / ground_spacing_m > STRIPLINE_THIN_STRIP:
        notes.append("The strips are thick for the stripline step model (derived for thin strips).")
    return notes


def _microstrip_notes(widths: np.ndarray, eps_r: float) -> list[str]:
    ratios = np.maximum(widths[:-1], widths[1:]) / np.minimum(widths[:-1], widths[1:])
    notes = []
    wide_limit = WIDE_FIT_RANGE[1] if eps_r == WIDE_FIT_EPS_R else CAPACITANCE_FIT_RANGE[1]
    outside = [i for i, r in enumerate(ratios) if (1.0 + 1e-9 < r < CAPACITANCE_FIT_RANGE[0]) or r > wide_limit]
    if outside:
        listed = ", ".join(f"{i}-{i + 1} ({ratios[i]:.3g}:1)" for i in outside)
        notes.append(
            f"Junctions {listed} (0 is the feed line) have width ratios outside the step model's fitted range "
            f"{CAPACITANCE_FIT_RANGE[0]}-{wide_limit}:1; their step capacitance is extrapolated (bridged to zero "
            "for small steps), so treat the with-step figures there as estimates."
        )
    if np.any(ratios > INDUCTANCE_FIT_MAX):
        notes.append(f"Some junctions exceed the step inductance fit's width ratio of {INDUCTANCE_FIT_MAX:g}:1.")
    if eps_r > EPS_R_MAX:
        notes.append(f"The step model is fitted for eps_r up to {EPS_R_MAX:g}; this board has {eps_r:g}.")
    return notes
