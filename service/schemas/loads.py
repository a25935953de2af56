"""The load in a request: a fixed impedance, a lumped circuit, measured points or Touchstone text."""

from __future__ import annotations

from itertools import pairwise
from typing import Annotated, Literal

from pydantic import Field, field_validator, model_validator

from service.constants import MAX_POINTS
from service.schemas.common import MAX_IMPEDANCE_OHM, FrequencyHz, ImpedanceOhm, StrictModel

MAX_TOUCHSTONE_CHARS = 2_000_000
Reactance = Annotated[float, Field(ge=-MAX_IMPEDANCE_OHM, le=MAX_IMPEDANCE_OHM, description="Reactance in ohm.")]
ElementValue = Annotated[float, Field(gt=0.0, le=1.0)]


class CircuitSpec(StrictModel):
    """A resistor with one inductor or capacitor; give the element the kind names."""

    kind: Literal["series-rl", "series-rc", "parallel-rc", "parallel-rl"]
    resistance_ohm: ImpedanceOhm
    inductance_h: ElementValue | None = Field(None, description="Inductance in henry (the -rl kinds).")
    capacitance_f: ElementValue | None = Field(None, description="Capacitance in farad (the -rc kinds).")

    @model_validator(mode="after")
    def _element_matches_kind(self) -> CircuitSpec:
        wanted, unwanted = (
            ("inductance_h", "capacitance_f")
            if self.kind.endswith("rl")
            else (
                "capacitance_f",
                "inductance_h",
            )
        )
        if getattr(self, wanted) is None:
            raise ValueError(f"a {self.kind} circuit needs {wanted}")
        if getattr(self, unwanted) is not None:
            raise ValueError(f"a {self.kind} circuit has no {unwanted}")
        return self

    @property
    def element_value(self) -> float:
        """The inductance or capacitance, whichever the kind has."""
        return self.inductance_h if self.kind.endswith("rl") else self.capacitance_f


class MeasuredPoint(StrictModel):
    """One measured load impedance."""

    frequency_hz: FrequencyHz
    resistance_ohm: float = Field(ge=0.0, le=MAX_IMPEDANCE_OHM)
    reactance_ohm: Reactance


class Load(StrictModel):
    """The impedance to be matched. Give exactly one form:

    `resistance_ohm` (with `reactance_ohm`, default 0) for a fixed impedance; `circuit` for a
    lumped R-L or R-C model; `measured` for a table of points; `touchstone` for the text of a
    one-port Touchstone file (versions 1.x or 2.0, S, Z or Y data).
    """

    resistance_ohm: ImpedanceOhm | None = None
    reactance_ohm: Reactance = 0.0
    circuit: CircuitSpec | None = None
    measured: Annotated[list[MeasuredPoint], Field(min_length=2, max_length=MAX_POINTS)] | None = None
    touchstone: Annotated[str, Field(max_length=MAX_TOUCHSTONE_CHARS)] | None = None

    @field_validator("measured")
    @classmethod
    def _increasing(cls, points: list[MeasuredPoint] | None) -> list[MeasuredPoint] | None:
        if points is not None and any(b.frequency_hz <= a.frequency_hz for a, b in pairwise(points)):
            raise ValueError("frequencies must be strictly increasing")
        return points

    @model_validator(mode="after")
    def _one_form(self) -> Load:
        given = [
            name for name in ("resistance_ohm", "circuit", "measured", "touchstone") if getattr(self, name) is not None
        ]
        if len(given) != 1:
            raise ValueError("give exactly one of resistance_ohm, circuit, measured or touchstone")
        if self.reactance_ohm != 0.0 and self.resistance_ohm is None:
            raise ValueError("reactance_ohm goes with resistance_ohm")
        return self
