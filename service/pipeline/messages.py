"""Plain-sentence warnings comparing the theory, the exact cascade and the spec."""

from __future__ import annotations

from service.analysis.worst_case import return_loss_db
from service.physics.media import Medium
from service.pipeline.wording import hz_text, percent_text
from service.schemas.results import BodeFanoFigures, PredictedFigures, VerifiedFigures

PREDICTION_TOLERANCE = 0.01  # relative departure of the exact peak worth a warning
PLAUSIBLE_MIN_HZ = 1e3  # a band below this is more likely a unit slip than a design
PLAUSIBLE_MAX_LENGTH_M = 100.0


def spec_warnings(verified: VerifiedFigures, suggest_exact: bool = False) -> list[str]:
    """A plain sentence when the exact cascade misses the spec (with an untried hint where one fits)."""
    if verified.meets_spec:
        return []
    excess = verified.max_reflection / verified.spec_max_reflection - 1.0
    hint = (
        " The exact theory (theory 'exact', not tried here) removes the small-reflection error, "
        "which grows with the impedance ratio."
        if suggest_exact
        else ""
    )
    return [
        f"The exact cascade reaches |reflection| {verified.max_reflection:.4g} "
        f"({float(return_loss_db(verified.max_reflection)):.2f} dB return loss) at "
        f"{hz_text(verified.worst_frequency_hz)}, {percent_text(excess)} above the spec "
        f"{verified.spec_max_reflection:.4g}.{hint}"
    ]


def unmatched_warnings(verified: VerifiedFigures, unmatched: float) -> list[str]:
    """Say so when the design does no better than connecting the load straight to the source."""
    if verified.max_reflection < unmatched:
        return []
    return [
        f"This design's worst reflection {verified.max_reflection:.4g} is no better than the load's "
        f"own {unmatched:.4g} connected straight to the source line: over this band it does not help."
    ]


def total_reflection_warnings(verified: VerifiedFigures) -> list[str]:
    """Explain a null VSWR."""
    if verified.max_vswr is not None:
        return []
    return [
        f"At {hz_text(verified.worst_frequency_hz)} the line reflects everything (|reflection| 1, "
        "return loss 0 dB): the VSWR there is unbounded and is given as null."
    ]


def plausibility_warnings(stop_hz: float, total_length_m: float) -> list[str]:
    """Ask about units when the band or the design is far from anything usually built."""
    if stop_hz >= PLAUSIBLE_MIN_HZ and total_length_m <= PLAUSIBLE_MAX_LENGTH_M:
        return []
    what = (
        f"the band ends at {hz_text(stop_hz)}"
        if stop_hz < PLAUSIBLE_MIN_HZ
        else (f"the design is {total_length_m:.4g} m long")
    )
    return [f"Check the units: {what}. Was the band meant in GHz or MHz (the API takes hertz)?"]


def departure_warnings(
    predicted: PredictedFigures, verified: VerifiedFigures, theory: str, medium: Medium
) -> list[str]:
    """A plain sentence when the exact peak departs noticeably from the theory's, and why it may."""
    if predicted.departure_fraction is None:
        return [
            f"The {theory} theory predicts no reflection in the band; the exact cascade's worst is "
            f"{verified.max_reflection:.4g}."
        ]
    if abs(predicted.departure_fraction) <= PREDICTION_TOLERANCE:
        return []
    effects = [name for name, present in (("dispersion", medium.dispersive), ("losses", medium.lossy)) if present]
    cause = f" The theory assumes an ideal line; the cascade includes {' and '.join(effects)}." if effects else ""
    return [
        f"The exact worst reflection {verified.max_reflection:.4g} differs from the {theory} "
        f"prediction {predicted.max_reflection:.4g} by {percent_text(predicted.departure_fraction)}.{cause}"
    ]


def coverage_warnings(spec: float, requested_fraction: float, predicted: PredictedFigures) -> list[str]:
    """Where a fixed section count or length cannot cover the band at the spec, by the theory."""
    if predicted.covers_band:
        return []
    return [
        f"By the theory this design keeps |reflection| within {spec:.4g} over "
        f"{percent_text(predicted.bandwidth_fraction)} bandwidth only; the requested band spans "
        f"{percent_text(requested_fraction)} and the reflection reaches {predicted.max_reflection:.4g} in it."
    ]


def bode_fano_warnings(figures: BodeFanoFigures | None, spec: float) -> list[str]:
    """Say plainly when the spec asks for more than physics allows."""
    if figures is None or not figures.spec_beats_bound:
        return []
    return [
        f"The spec {spec:.4g} is below the Bode-Fano limit {figures.min_reflection:.4g} for this load "
        "over this band: no lossless matching network of any kind can meet it. Widen the spec or "
        "narrow the band."
    ]
