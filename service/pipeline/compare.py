"""Every applicable method and theory for one request, ranked."""

from __future__ import annotations

from collections.abc import Callable
from typing import Any

from service.constants import EXACT, SMALL_REFLECTION
from service.errors import UnmeetableRequestError
from service.pipeline.options import DesignOptions
from service.pipeline.stepped_flow import binomial, chebyshev, quarter_wave
from service.pipeline.taper_flow import tapered
from service.schemas.comparison import Candidate, CompareRequest, Comparison, Excluded
from service.schemas.results import TransformerDesign
from service.schemas.tapers import TaperRequest
from service.schemas.transformers import QuarterWaveRequest, TransformerRequest

THEORY_NAMES = (SMALL_REFLECTION, EXACT)
TAPER_PROFILES = ("klopfenstein", "exponential", "triangular")

Run = tuple[str, str, str | None, Callable[[], TransformerDesign]]


def compare(request: CompareRequest, options: DesignOptions | None = None) -> Comparison:
    """Design with each method, then rank: meets the spec, shortest total length, lowest reflection."""
    designs: list[TransformerDesign] = []
    excluded: list[Excluded] = []
    for method, theory, profile, run in _runs(request, options):
        try:
            designs.append(run())
        except UnmeetableRequestError as exc:
            excluded.append(Excluded(method=method, theory=theory, profile=profile, reason=exc.message))
    designs.sort(key=lambda d: (not d.verified.meets_spec, d.total_length_m, d.verified.max_reflection))
    candidates = [
        Candidate(
            rank=index + 1,
            method=d.method,
            theory=d.theory,
            profile=d.profile,
            section_count=len(d.sections),
            total_length_m=d.total_length_m,
            meets_spec=d.verified.meets_spec,
            verified=d.verified,
            design=d,
        )
        for index, d in enumerate(designs)
    ]
    return Comparison(spec_max_reflection=request.spec_reflection, candidates=candidates, excluded=excluded)


def _runs(request: CompareRequest, options: DesignOptions | None) -> list[Run]:
    """The designs that apply to this request, each as a deferred call."""
    common: dict[str, Any] = request.model_dump(
        exclude_unset=True, exclude={"sections", "include_tapers", "taper_segments"}
    )
    runs: list[Run] = []
    if request.sections in (None, 1):
        runs.append(
            ("quarter-wave", SMALL_REFLECTION, None, lambda: quarter_wave(QuarterWaveRequest(**common), options))
        )
    for method, function in (("binomial", binomial), ("chebyshev", chebyshev)):
        for theory in THEORY_NAMES:
            stepped = TransformerRequest(**common, sections=request.sections, theory=theory)
            runs.append((method, theory, None, lambda f=function, r=stepped: f(r, options)))
    if request.include_tapers:
        for profile in TAPER_PROFILES:
            taper = TaperRequest(**common, profile=profile, segments=request.taper_segments)
            runs.append(("taper", SMALL_REFLECTION, profile, lambda r=taper: tapered(r, options)))
    return runs
