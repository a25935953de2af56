"""Every applicable method and theory for one request, ranked."""

from __future__ import annotations

from typing import Any

from service.constants import EXACT, SMALL_REFLECTION
from service.errors import UnmeetableRequestError
from service.pipeline.items import ITEM_ADAPTER, design_item
from service.pipeline.options import DesignOptions
from service.pipeline.target import target_for
from service.schemas.comparison import Candidate, CompareRequest, Comparison, Excluded
from service.schemas.results import TransformerDesign
from service.schemas.transformers import MatchRequest

THEORY_NAMES = (SMALL_REFLECTION, EXACT)
TAPER_PROFILES = ("klopfenstein", "exponential", "triangular")


def compare(request: CompareRequest, options: DesignOptions | None = None) -> Comparison:
    """Design with each method, then rank: meets the spec, shortest total length, lowest reflection."""
    designs: list[TransformerDesign] = []
    excluded: list[Excluded] = []
    for raw in compare_items(request):
        try:
            designs.append(design_item(ITEM_ADAPTER.validate_python(raw), options))
        except UnmeetableRequestError as exc:
            theory, profile = raw.get("theory", SMALL_REFLECTION), raw.get("profile")
            excluded.append(Excluded(method=raw["method"], theory=theory, profile=profile, reason=exc.message))
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


def stepped_variants(request: MatchRequest) -> list[tuple[str, str]]:
    """(method, theory) of the stepped designs to make. For a plain resistance every method in both
    theories; for any other load the refinement decides the sections, and from either method or
    theory it reaches the same design, so one start (exact Chebyshev) is made."""
    if target_for(request).resistive:
        return [(method, theory) for method in ("binomial", "chebyshev") for theory in THEORY_NAMES]
    return [("chebyshev", EXACT)]


def compare_items(request: CompareRequest) -> list[dict[str, Any]]:
    """Each design the comparison makes, as a request item naming its method: what is designed,
    and what the compute estimate prices."""
    common = request.model_dump(exclude_unset=True, exclude={"sections", "include_tapers", "taper_segments"})
    items = [common | {"method": "quarter-wave", "sections": 1}] if request.sections in (None, 1) else []
    stepped = common if request.sections is None else common | {"sections": request.sections}
    items += [stepped | {"method": method, "theory": theory} for method, theory in stepped_variants(request)]
    if request.include_tapers:
        taper = common | {"method": "taper", "segments": request.taper_segments}
        items += [taper | {"profile": profile} for profile in TAPER_PROFILES]
    return items
