"""When a longer design is worth it: the one stop rule of every spec-driven search.

A search adds a section (or lengthens a taper) only while the step lowers the verified worst
reflection by at least MIN_GAIN; past that it returns the shortest design that reached the best
value, so no answer is longer than the figure it reports justifies.
"""

from __future__ import annotations

from typing import TypeVar

from pydantic import BaseModel

MIN_GAIN = 0.02  # a longer design must lower the worst reflection by this fraction


def gains_enough(candidate_reflection: float, best_reflection: float) -> bool:
    """Whether the longer design's worst reflection improves on the best by at least MIN_GAIN."""
    return candidate_reflection <= best_reflection * (1.0 - MIN_GAIN)


Result = TypeVar("Result", bound=BaseModel)


def with_note(result: Result, note: str) -> Result:
    """The result with a note leading its warnings (what the search did, said first)."""
    return result.model_copy(update={"warnings": [note, *result.warnings]})
