"""Plain-sentence warnings comparing the theory, the exact cascade and the spec."""

from __future__ import annotations

from service.analysis.worst_case import return_loss_db
from service.physics.media import Medium
from service.pipeline.wording import hz_text, percent_text
from service.schemas.results import BodeFanoFigures, PredictedFigures, VerifiedFigures

PREDICTION_TOLERANCE = 0.01  # relative departure of the exact peak worth a warning


def spec_warnings(verified: VerifiedFigures, suggest_exact: bool = False) -> list[str]:
    """A plain sentence when the exact cascade misses the spec (with a hint for approximate designs)."""
    if verified.meets_spec:
        return []
    excess = verified.max_reflection / verified.spec_max_reflection - 1.0
    hint = " Try theory 'exact', which holds for any impedance ratio." if suggest_exact else ""
    return [
        f"The exact cascade reaches |reflection| {verified.max_reflection:.4g} "
        f"({float(return_loss_db(verified.max_reflection)):.2f} dB return loss) at "
        f"{hz_text(verified.worst_frequency_hz)}, {percent_text(excess)} above the spec "
        f"{verified.spec_max_reflection:.4g}.{hint}"
    ]


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
