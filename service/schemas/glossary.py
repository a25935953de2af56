"""One description per field name, for every field that does not carry its own.

Field names mean the same thing in every model that has them (the naming rules of DESIGN.md), so
one glossary describes them all; a model's own `Field(description=...)` still wins. The schema
then describes every field where a generated client shows it, not only inside a union branch.
"""

from __future__ import annotations

from typing import Any

from pydantic import BaseModel, ConfigDict

GLOSSARY = {
    "after": "The exact figures after refinement.",
    "before": "The exact figures of the unrefined (theory) design.",
    "band": "The band the match must hold over: start_hz and stop_hz; its arithmetic centre is the design frequency.",
    "base": "One design request, with `method`, that every grid point starts from.",
    "candidates": "The designs made, best first: meets the spec, then shortest, then lowest reflection.",
    "center_hz": "The design frequency: the arithmetic centre of the band, in hertz.",
    "circuit": "A lumped load: a resistor with one inductor or capacitor.",
    "conductivity_s_per_m": "Conductivity of the conductors in siemens per metre (5.8e7 for copper); none: lossless.",
    "count": "How many values the range holds, both ends included.",
    "design": "The design, as a full result.",
    "error": "The error, in the API's error shape, where the item could not be designed.",
    "excluded": "Methods that could not be made for this request, each with the reason.",
    "frequency_hz": "Frequency in hertz.",
    "include_curves": "Give each design's response curve too (larger answers).",
    "index": "The item's position in the request, from 0.",
    "iterations": "Optimizer iterations the refinement took.",
    "junctions": "One step per junction, source to load: its reflection and transmission.",
    "key_required": "Whether the /v1 routes need an API key (Authorization: Bearer <key>).",
    "kind": "Which kind this is.",
    "load": ("The load: exactly one of resistance_ohm (with reactance_ohm), circuit, measured or touchstone."),
    "max_reflection": "Largest allowed |reflection coefficient| over the band (0 to 1).",
    "max_vswr": "Largest allowed VSWR over the band (above 1).",
    "measured": "Measured load impedances, interpolated linearly; they must cover the band.",
    "medium": "The kind of line: ideal, microstrip, stripline or coax.",
    "meets_spec": "Whether the exact cascade's worst reflection is within the spec.",
    "method": "The synthesis method.",
    "min_return_loss_db": "Smallest allowed return loss over the band in dB (-20 log10 |reflection|).",
    "p50": "Median of the trials' worst in-band reflection.",
    "p90": "90th percentile of the trials' worst in-band reflection.",
    "p95": "95th percentile of the trials' worst in-band reflection.",
    "p99": "99th percentile of the trials' worst in-band reflection.",
    "parameters": "The swept field paths, in grid order.",
    "percentiles": "Percentiles of the trials' worst in-band reflection.",
    "predicted": "What the synthesis theory predicts for the design.",
    "problems": "One entry per problem: the field at fault and a plain message.",
    "profile": "The taper profile: klopfenstein, exponential or triangular.",
    "reason": "Why the method could not be made.",
    "reflection_magnitude": "|reflection| at each frequency of the curve.",
    "resistance_ohm": "Resistance in ohm.",
    "response": "The response curve over the band.",
    "results": "One result per design, in order.",
    "section_count": "Number of sections in the design.",
    "sections": "The sections, source side first.",
    "seed": "The random seed the trials used (give it again to repeat them).",
    "spacing": "linear or log spacing of the range's values.",
    "spec_max_reflection": "The spec as |reflection|, whichever form the request gave it in.",
    "start": "First value of the range.",
    "status": "HTTP status of this answer or item.",
    "stop": "Last value of the range.",
    "taper_segments": "Steps each taper in the comparison is cut into.",
    "theory": "The synthesis theory: small-reflection or exact.",
    "title": "A short title of the error.",
    "tolerances": "One standard deviation of each manufacturing variation, in the fields' units.",
    "total": "How many designs the grid holds.",
    "total_length_m": "Physical length of all sections together, in metres.",
    "touchstone": "The text of a one-port Touchstone file (versions 1.x and 2.0; S, Z or Y; RI, MA or DB).",
    "trials": "Number of Monte Carlo trials.",
    "unmatched_max_reflection": "The worst |reflection| over the band of the load connected straight to the source.",
    "vary": "Dotted field paths of `base` mapped to their values: a list, or a range.",
    "verified": "Figures from the exact ABCD cascade over the band.",
    "version": "The service's version.",
    "warnings": "Plain sentences about anything worth a second look.",
    "worst_trial": "The trial with the largest worst in-band reflection, and what it drew.",
    "clipped_draws": "How many random draws were held at a physical floor instead of their drawn value.",
    "min_reflection": "The Bode-Fano bound: the lowest constant in-band |reflection| any lossless network reaches.",
}


def describe_fields(schema: dict[str, Any]) -> None:
    """Give every property without a description the glossary's."""
    for name, body in schema.get("properties", {}).items():
        if "description" not in body and name in GLOSSARY:
            body["description"] = GLOSSARY[name]


class DescribedModel(BaseModel):
    """Base of every wire model: fields without their own description get the glossary's."""

    model_config = ConfigDict(json_schema_extra=describe_fields)
