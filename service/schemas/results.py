"""Response models: a verified design and the blocks it is made of."""

from __future__ import annotations

from pydantic import Field

from service.schemas.glossary import DescribedModel


class SectionResult(DescribedModel):
    """One line section, listed from the source side to the load side."""

    impedance_ohm: float = Field(description="Characteristic impedance of the section at the band centre.")
    electrical_length_deg: float = Field(description="Electrical length at the band centre.")
    length_m: float = Field(description="Physical length in the medium.")
    eps_eff: float = Field(description="Effective permittivity at the band centre (1/v^2 on the ideal line).")
    width_m: float | None = Field(None, description="Strip width, for microstrip and stripline.")
    inner_diameter_m: float | None = Field(None, description="Inner conductor diameter, for coax.")


class JunctionResult(DescribedModel):
    """The step between two consecutive impedances (source, sections ..., load)."""

    reflection: float = Field(description="(Z_next - Z_prev) / (Z_next + Z_prev).")
    transmission: float = Field(description="1 + reflection, the voltage transmission coefficient.")


class PredictedFigures(DescribedModel):
    """What the synthesis theory predicts, before any exact check."""

    max_reflection: float = Field(description="Largest |reflection| over the band by the theory.")
    bandwidth_fraction: float = Field(
        description=(
            "Fractional bandwidth (delta f / f0) by the theory: the equal-ripple band for "
            "Chebyshev, the band within the spec reflection for binomial and quarter-wave. "
            "2.0 means the whole period 0 to 2 f0."
        )
    )
    covers_band: bool = Field(description="Whether the theory keeps the spec over the whole band.")
    departure_fraction: float | None = Field(
        description=(
            "How far the exact cascade's worst reflection departs from this prediction: verified / predicted - 1."
        )
    )


class VerifiedFigures(DescribedModel):
    """Figures from the exact ABCD cascade over the requested band."""

    max_reflection: float
    max_vswr: float | None = Field(
        description="Largest VSWR in the band; null where some frequency reflects everything (unbounded VSWR)."
    )
    min_return_loss_db: float
    worst_frequency_hz: float = Field(description="Where the largest reflection occurs.")
    spec_max_reflection: float = Field(description="The spec the design is judged against.")
    meets_spec: bool
    includes_dispersion: bool = Field(description="Whether the cascade used frequency-dependent line parameters.")
    includes_losses: bool = Field(description="Whether the cascade included conductor and dielectric losses.")
    max_insertion_loss_db: float | None = Field(
        None, description="Largest in-band insertion loss (transducer loss, mismatch included), with losses."
    )


class ResponseCurve(DescribedModel):
    """The exact response at `points` frequencies spread evenly over the band."""

    frequency_hz: list[float]
    reflection_magnitude: list[float]
    return_loss_db: list[float] = Field(description="Capped at 300 dB where the reflection is zero.")
    insertion_loss_db: list[float] | None = Field(
        None, description="Transducer loss from source to load at each frequency, given when losses are modelled."
    )


class StepCircuitResult(DescribedModel):
    """One junction's step circuit: series inductance, shunt capacitance, series inductance (a stripline
    step has only the first, a coax step only the capacitance; the others are zero)."""

    source_side_inductance_h: float = Field(description="Series inductance on the source side of the step.")
    capacitance_f: float = Field(description="Shunt capacitance at the step.")
    load_side_inductance_h: float = Field(description="Series inductance on the load side of the step.")


class JunctionEffects(DescribedModel):
    """The step discontinuities' effect: the verified figures include them; these say by how much."""

    mode: str = Field(description="`include` or `compensate`, as asked.")
    model: str = Field(description="The step model used (named in the README, with its source and range).")
    ideal_max_reflection: float = Field(description="Worst in-band |reflection| of the same sections with ideal steps.")
    with_steps_max_reflection: float = Field(description="Worst in-band |reflection| with the steps (as verified).")
    uncompensated_max_reflection: float | None = Field(
        None, description="With `compensate`: the worst |reflection| with steps before the lengths were adjusted."
    )
    length_changes_m: list[float] | None = Field(
        None, description="With `compensate`: each section's length change (compensated minus ideal), source first."
    )
    steps: list[StepCircuitResult] = Field(description="Each junction, the feed line's first, at the band centre.")


class SectionPower(DescribedModel):
    """What one section carries at the requested power, at its worst frequency in the band."""

    peak_voltage_v: float = Field(description="Largest |V| anywhere along the section, standing wave included.")
    peak_current_a: float = Field(description="Largest |I| anywhere along the section.")
    peak_field_v_per_m: float | None = Field(
        None, description="Coax: the field at the inner conductor's surface, V / (a ln(b/a)), at the peak voltage."
    )
    field_margin: float | None = Field(
        None, description="Coax: dielectric strength over that field (1 is breakdown; below 2 is warned)."
    )


class PowerFigures(DescribedModel):
    """Peak voltages and currents at the requested power, on the exact cascade over the band."""

    input_power_w: float = Field(description="Incident power from a source matched to the source impedance.")
    incident_peak_voltage_v: float = Field(description="The incident wave's peak voltage, sqrt(2 P Z0).")
    sections: list[SectionPower] = Field(description="Each section, source side first.")
    dielectric_strength_v_per_m: float | None = Field(
        None, description="Coax: the breakdown field the margins are taken against."
    )
    narrowest_current_density_a_per_m2: float | None = Field(
        None, description="Microstrip and stripline: peak current over the narrowest strip's cross-section (W t)."
    )
    cautions: str = Field(description="What these figures leave out, and whom to ask.")


class ComplexReflection(DescribedModel):
    """The input reflection coefficient (complex, referred to the source impedance) at the response
    curve's frequencies: what a Smith chart draws."""

    real: list[float] = Field(description="Real part of the reflection coefficient at each frequency.")
    imag: list[float] = Field(description="Imaginary part of the reflection coefficient at each frequency.")


class BodeFanoFigures(DescribedModel):
    """The Bode-Fano limit for an R-C or R-L load, beside what the line achieves."""

    min_reflection: float = Field(
        description="Lowest constant |reflection| any lossless network can hold over the band."
    )
    verified_max_reflection: float = Field(description="The worst reflection this line gives.")
    spec_beats_bound: bool = Field(description="True when the spec asks for less than any network can give.")


class RefinementFigures(DescribedModel):
    """The exact figures before and after the minimax refinement of the sections."""

    before: VerifiedFigures
    after: VerifiedFigures
    iterations: int


class AnalysisResult(DescribedModel):
    """The exact cascade's verdict on a list of sections."""

    center_hz: float
    sections: list[SectionResult]
    total_length_m: float
    junctions: list[JunctionResult]
    verified: VerifiedFigures
    response: ResponseCurve
    power: PowerFigures | None = Field(None, description="Given when the request states `input_power_w`.")
    junction_effects: JunctionEffects | None = Field(
        None, description="Given when the request includes or compensates the junction steps."
    )
    input_reflection: ComplexReflection | None = Field(
        None, description="Complex input reflection at the curve's frequencies (given by the analyze endpoint)."
    )
    velocity_factor: float | None = Field(description="Of the ideal line; null for physical media.")
    medium: str = Field(description="The kind of line: ideal, microstrip, stripline or coax.")
    bode_fano: BodeFanoFigures | None = Field(None, description="Given for lumped R-C and R-L loads.")
    unmatched_max_reflection: float = Field(
        description="The worst |reflection| over the band of the load connected straight to the source line."
    )
    warnings: list[str] = Field(description="Plain sentences about anything worth a second look.")


class TransformerDesign(AnalysisResult):
    """A synthesized transformer with both the theory's prediction and the exact check."""

    method: str
    theory: str
    profile: str | None = Field(None, description="The taper profile, for method 'taper'.")
    rotating_section: bool = Field(
        False,
        description="Whether the last section is the line of source impedance added at a complex load to turn it "
        "real at the band centre (not one of the method's own sections).",
    )
    predicted: PredictedFigures
    refinement: RefinementFigures | None = Field(
        None,
        description=(
            "Given where the sections were refined: for every load that is not a plain resistance, "
            "and for designs refined within the impedance limits."
        ),
    )
