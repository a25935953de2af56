"""The `medium` of a design request: the kind of line the sections are built in."""

from __future__ import annotations

from typing import Annotated, Literal

from pydantic import Field, model_validator

from service.schemas.common import StrictModel, VelocityFactor

Permittivity = Annotated[float, Field(ge=1.0, le=128.0, description="Relative permittivity of the dielectric.")]
Dimension = Annotated[float, Field(gt=0.0, le=1.0, description="A dimension in metres.")]
LossTangent = Annotated[float, Field(ge=0.0, le=0.1, description="Dielectric loss tangent.")]
Conductivity = Annotated[float, Field(gt=0.0, le=1e9, description="Conductor conductivity in S/m (copper 5.8e7).")]
Roughness = Annotated[float, Field(ge=0.0, le=1e-4, description="RMS conductor surface roughness in metres.")]


class LossFields(StrictModel):
    """Optional loss data of a physical line."""

    loss_tangent: LossTangent = 0.0
    conductivity_s_per_m: Conductivity | None = None
    roughness_m: Roughness = 0.0

    def losses(self) -> dict[str, float | None]:
        """The loss fields as keyword arguments of a media model."""
        return {
            "loss_tangent": self.loss_tangent,
            "conductivity_s_per_m": self.conductivity_s_per_m,
            "roughness_m": self.roughness_m,
        }


class IdealSpec(StrictModel):
    """The ideal lossless TEM line of the core design."""

    kind: Literal["ideal"]
    velocity_factor: VelocityFactor = 1.0


class MicrostripSpec(LossFields):
    """A microstrip on a substrate of height `height_m`; sections get a `width_m`."""

    kind: Literal["microstrip"]
    eps_r: Permittivity
    height_m: Dimension
    thickness_m: Annotated[float, Field(ge=0.0, le=1e-3, description="Strip thickness in metres.")]


class StriplineSpec(LossFields):
    """A symmetric stripline between ground planes `ground_spacing_m` apart."""

    kind: Literal["stripline"]
    eps_r: Permittivity
    ground_spacing_m: Dimension
    thickness_m: Annotated[float, Field(ge=0.0, le=1e-3, description="Strip thickness in metres.")]

    @model_validator(mode="after")
    def _strip_fits(self) -> StriplineSpec:
        if self.thickness_m >= 0.5 * self.ground_spacing_m:
            raise ValueError("thickness_m must be less than half of ground_spacing_m")
        if self.conductivity_s_per_m is not None and self.thickness_m == 0.0:
            raise ValueError(
                "stripline conductor loss needs thickness_m > 0: its published formula diverges at zero thickness"
            )
        return self


class CoaxSpec(LossFields):
    """A coaxial line of outer (shield inner) diameter `outer_diameter_m`; sections get an `inner_diameter_m`."""

    kind: Literal["coax"]
    eps_r: Permittivity
    outer_diameter_m: Dimension


MediumSpec = Annotated[IdealSpec | MicrostripSpec | StriplineSpec | CoaxSpec, Field(discriminator="kind")]
