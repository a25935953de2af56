"""Request building blocks shared by every endpoint: strict models, loads and bands."""

from __future__ import annotations

from typing import Annotated

from pydantic import ConfigDict, Field, ValidationInfo, field_validator

from service.constants import MAX_POINTS
from service.schemas.glossary import DescribedModel, describe_fields

MIN_IMPEDANCE_OHM = 1e-3
MAX_IMPEDANCE_OHM = 1e5
MIN_FREQUENCY_HZ = 1.0
MAX_FREQUENCY_HZ = 1e12

ImpedanceOhm = Annotated[
    float,
    Field(
        ge=MIN_IMPEDANCE_OHM,
        le=MAX_IMPEDANCE_OHM,
        description=f"Real impedance in ohm, {MIN_IMPEDANCE_OHM:g} to {MAX_IMPEDANCE_OHM:g}.",
    ),
]
FrequencyHz = Annotated[
    float,
    Field(
        ge=MIN_FREQUENCY_HZ,
        le=MAX_FREQUENCY_HZ,
        description=f"Frequency in hertz, {MIN_FREQUENCY_HZ:g} to {MAX_FREQUENCY_HZ:g}.",
    ),
]
Points = Annotated[
    int,
    Field(
        ge=2,
        le=MAX_POINTS,
        description="Number of frequencies in the returned response curve, both band limits included.",
    ),
]
VelocityFactor = Annotated[
    float,
    Field(
        ge=0.01,
        le=1.0,
        description="Phase velocity of the ideal TEM line as a fraction of the speed of light (0.01 to 1).",
    ),
]
MaxReflection = Annotated[
    float,
    Field(gt=0.0, lt=1.0, description="Largest allowed |reflection coefficient| over the band."),
]
MinReturnLossDb = Annotated[
    float,
    Field(
        gt=0.0,
        le=200.0,
        description="Smallest allowed return loss over the band, in dB (-20 log10 |reflection|); 20 dB is 0.1.",
    ),
]
MaxVswr = Annotated[
    float,
    Field(gt=1.0, le=1e6, description="Largest allowed VSWR over the band; 1.22 is |reflection| 0.1."),
]


class StrictModel(DescribedModel):
    """Base for every request: no type coercion, no NaN or infinity, no unknown fields."""

    model_config = ConfigDict(strict=True, allow_inf_nan=False, extra="forbid", json_schema_extra=describe_fields)


class Band(StrictModel):
    """The frequency band to be matched; its arithmetic centre is the design frequency."""

    start_hz: FrequencyHz
    stop_hz: FrequencyHz

    @field_validator("stop_hz")
    @classmethod
    def _above_start(cls, value: float, info: ValidationInfo) -> float:
        start = info.data.get("start_hz")
        if start is not None and value <= start:
            raise ValueError(f"must be greater than band.start_hz ({start:g} Hz)")
        return value

    @property
    def center_hz(self) -> float:
        """Arithmetic centre of the band, the design frequency."""
        return 0.5 * (self.start_hz + self.stop_hz)
