"""A line of sections in a medium between a source and a load, and stacks of such lines.

The line knows how to evaluate its own cascade (through network.py and the media's line
parameters, never the synthesis code); a stack of lines of equal shape evaluates as one line with
a leading design axis, so that many designs are checked in one NumPy evaluation.
"""

from __future__ import annotations

import functools
from collections.abc import Callable
from dataclasses import astuple, dataclass

import numpy as np

from service.analysis import network
from service.constants import SPEED_OF_LIGHT_M_PER_S
from service.physics.loads import FixedLoad, LoadModel
from service.physics.media import Medium
from service.physics.steps import StepElements, coax_step, inductance_per_m_h, microstrip_step, stripline_step

STACK_DESIGNS = 32  # designs per stacked cascade evaluation
CHUNK_ELEMENTS = 1 << 18  # designs x frequencies x sections evaluated at once (bounds memory)


@dataclass(frozen=True)
class LineCascade:
    """Sections in a medium between a real source and a load, source side first.

    `geometry` is each section's impedance-setting dimension in the medium (the impedance itself
    for the ideal line, the strip width, the inner diameter).
    """

    source_ohm: float
    load: LoadModel
    medium: Medium
    geometry: np.ndarray
    lengths_m: np.ndarray
    # given: the junction steps (feed line to section 1, and between sections) count; an array per trial
    feed_geometry: float | np.ndarray | None = None

    @property
    def with_steps(self) -> bool:
        """Whether the junction discontinuities are part of this line's cascade."""
        return self.feed_geometry is not None

    def abcd(self, frequency_hz: np.ndarray) -> network.Abcd:
        """The cascade's ABCD entries at each frequency, with the medium's dispersion and losses."""
        return network.Abcd(*self._by_frequency_chunks(frequency_hz, lambda f: astuple(self._abcd(f))))

    def _abcd(self, frequency_hz: np.ndarray) -> network.Abcd:
        if self.with_steps:
            return self._abcd_with_steps(frequency_hz)
        if not self.medium.lossy:
            return self._lossless_abcd(frequency_hz).complex()
        f = np.asarray(frequency_hz, dtype=float)[..., None]
        params = self.medium.parameters(self.geometry, f)
        losses = params.attenuation_np_per_m * self.lengths_m
        return network.cascade(params.impedance_ohm, f * self._phase_per_hz(params.eps_eff), losses)

    def step_elements(self, frequency_hz: np.ndarray) -> StepElements:
        """Each junction's step circuit (physics.steps) at each frequency (..., F, S): the first
        between the source's feed line (of feed_geometry) and section 1."""
        f = np.asarray(frequency_hz, dtype=float)[..., None]
        params = self.medium.parameters(self.geometry, f)
        feed = self.medium.parameters(np.asarray(self.feed_geometry), f)
        shape = params.impedance_ohm.shape

        def with_feed_first(values: np.ndarray, feed_value: np.ndarray, shape: tuple[int, ...] = shape) -> np.ndarray:
            """Each junction's source-side value: the feed line's, then each section's but the last."""
            values = np.broadcast_to(values, shape)
            return np.concatenate((np.broadcast_to(feed_value, (*shape[:-1], 1)), values[..., :-1]), -1)

        if self.medium.kind == "coax":  # a static capacitance: evaluated once, not at every frequency
            own = np.shape(self.geometry)
            steps = coax_step(
                with_feed_first(self.geometry, np.asarray(self.feed_geometry), own),
                self.geometry,
                self.medium.outer_diameter_m,
                self.medium.eps_r,
            )
            return StepElements(*(np.broadcast_to(part, shape) for part in astuple(steps)))
        geometry = np.broadcast_to(self.geometry, shape)
        left = with_feed_first(geometry, np.asarray(self.feed_geometry))
        impedance = np.broadcast_to(params.impedance_ohm, shape)
        left_impedance = with_feed_first(impedance, feed.impedance_ohm)
        if self.medium.kind == "stripline":
            return stripline_step(left_impedance, impedance, self.medium.eps_r, self.medium.ground_spacing_m)
        per_m = inductance_per_m_h(impedance, params.eps_eff)
        left_per_m = with_feed_first(per_m, inductance_per_m_h(feed.impedance_ohm, feed.eps_eff))
        return microstrip_step(left, geometry, left_per_m, per_m, self.medium.eps_r, self.medium.height_m)

    def _abcd_with_steps(self, frequency_hz: np.ndarray) -> network.Abcd:
        """The cascade with each junction's step circuit before its section."""
        f = np.asarray(frequency_hz, dtype=float)[..., None]
        params = self.medium.parameters(self.geometry, f)
        losses = 0.0 if params.attenuation_np_per_m is None else params.attenuation_np_per_m * self.lengths_m
        gamma_l = losses + 1j * f * self._phase_per_hz(params.eps_eff)
        steps = self.step_elements(frequency_hz)
        return network.cascade_with_junctions(params.impedance_ohm, gamma_l, steps, 2.0 * np.pi * f)

    def _lossless_abcd(self, frequency_hz: np.ndarray) -> network.LosslessAbcd:
        """The real ABCD parts at each frequency, for a medium without losses."""
        if self.medium.dispersive:
            return network.lossless_cascade(*self._impedances_and_angles(frequency_hz))
        impedance, _ = self._fixed_sections
        return network.lossless_cascade(
            impedance, np.asarray(frequency_hz, dtype=float)[..., None] * self._common_phase
        )

    def electrical_lengths_rad(self, frequency_hz: np.ndarray) -> np.ndarray:
        """beta l of every section at each frequency: (..., F, S) for frequencies (..., F)."""
        return self._impedances_and_angles(frequency_hz)[1]

    def _impedances_and_angles(self, frequency_hz: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """Each section's impedance and beta l at each frequency (cached for non-dispersive media)."""
        f = np.asarray(frequency_hz, dtype=float)[..., None]
        if self.medium.dispersive:
            params = self.medium.parameters(self.geometry, f)
            return params.impedance_ohm, f * self._phase_per_hz(params.eps_eff)
        impedance, phase_per_hz = self._fixed_sections
        return impedance, f * phase_per_hz

    @functools.cached_property
    def _fixed_sections(self) -> tuple[np.ndarray, np.ndarray]:
        """Impedance and phase per hertz of sections that do not disperse: the same at every
        frequency, so taken once (at 1 Hz) rather than at every evaluation."""
        params = self.medium.parameters(self.geometry, np.ones((1, 1)))
        return params.impedance_ohm, self._phase_per_hz(params.eps_eff)

    @functools.cached_property
    def _common_phase(self) -> np.ndarray:
        """The phase per hertz for the cascade: one value per line (last axis of one) where every
        section has the same electrical length, as in most stepped transformers."""
        return network.common_lengths(self._fixed_sections[1])

    def _phase_per_hz(self, eps_eff: np.ndarray) -> np.ndarray:
        """beta l / f of each section: 2 pi sqrt(eps_eff) l / c."""
        return 2.0 * np.pi * np.sqrt(eps_eff) * self.lengths_m / SPEED_OF_LIGHT_M_PER_S

    def reflection(self, frequency_hz: np.ndarray) -> np.ndarray:
        """|reflection| seen from the source line at each frequency."""
        return self.response(frequency_hz, with_losses=False)[0]

    def response(self, frequency_hz: np.ndarray, with_losses: bool) -> tuple[np.ndarray, np.ndarray | None]:
        """|reflection| at each frequency and, if asked, the insertion loss in dB, from one cascade.

        The insertion loss is -10 log10 of the power reaching the load over the power available
        from the source.
        """
        if not with_losses or not (self.medium.lossy or self.with_steps):
            return self._by_frequency_chunks(frequency_hz, lambda f: (self._response(f, False)[0],))[0], None
        return self._by_frequency_chunks(frequency_hz, lambda f: self._response(f, True))

    def _by_frequency_chunks(
        self, frequency_hz: np.ndarray, evaluate: Callable[[np.ndarray], tuple[np.ndarray, ...]]
    ) -> tuple[np.ndarray, ...]:
        """evaluate() over slices of the frequency axis, joined: a dispersive or lossy line builds
        arrays of designs x frequencies x sections, so memory is bounded by evaluating at most
        CHUNK_ELEMENTS of them at a time."""
        f = np.asarray(frequency_hz, dtype=float)
        if f.ndim == 0 or not self._arrays_per_section:
            return evaluate(f)
        step = max(CHUNK_ELEMENTS // (self.geometry.size * max(f.size // f.shape[-1], 1)), 1)
        if f.shape[-1] <= step:
            return evaluate(f)
        parts = [evaluate(f[..., start : start + step]) for start in range(0, f.shape[-1], step)]
        return tuple(np.concatenate(values, axis=-1) for values in zip(*parts, strict=True))

    @functools.cached_property
    def _arrays_per_section(self) -> bool:
        """Whether an evaluation builds frequency x section arrays: in a dispersive or lossy medium,
        or where the sections differ in electrical length (otherwise one row per section at a time)."""
        return self.medium.dispersive or self.medium.lossy or self.with_steps or self._common_phase.shape[-1] > 1

    def _response(self, frequency_hz: np.ndarray, with_losses: bool) -> tuple[np.ndarray, np.ndarray | None]:
        load = self.load.complex_ohm if isinstance(self.load, FixedLoad) else self.load.impedance_ohm(frequency_hz)
        if not self.medium.lossy and not self.with_steps:
            return network.lossless_reflection(self._lossless_abcd(frequency_hz), load, self.source_ohm), None
        abcd = self._abcd(frequency_hz)
        magnitude = np.abs(network.reflection(network.input_impedance(abcd, load), self.source_ohm))
        if not with_losses:
            return magnitude, None
        gain = network.transducer_gain(abcd, self.source_ohm, load)
        return magnitude, -10.0 * np.log10(np.maximum(gain, 1e-30))

    def input_reflection(self, frequency_hz: np.ndarray) -> np.ndarray:
        """The complex reflection coefficient at the source end, referred to the source impedance."""
        load = self.load.impedance_ohm(np.asarray(frequency_hz, dtype=float))
        return network.reflection(network.input_impedance(self.abcd(frequency_hz), load), self.source_ohm)

    def impedances_at(self, frequency_hz: float) -> np.ndarray:
        """Each section's characteristic impedance at one frequency."""
        return self.medium.parameters(self.geometry, np.array([[frequency_hz]])).impedance_ohm[0]

    def eps_eff_at(self, frequency_hz: float) -> np.ndarray:
        """Each section's effective permittivity at one frequency."""
        return self.medium.parameters(self.geometry, np.array([[frequency_hz]])).eps_eff[0]

    def with_sections(self, geometry: np.ndarray, lengths_m: np.ndarray) -> LineCascade:
        """The same source, load and medium with other sections."""
        return LineCascade(self.source_ohm, self.load, self.medium, geometry, lengths_m, self.feed_geometry)


def stack(lines: list[LineCascade]) -> LineCascade:
    """Lines of equal section count in one medium into fixed loads, as one line with a leading design axis.

    The stacked line's source is (D, 1), its load a FixedLoad of (D, 1) arrays, its geometry and
    lengths (D, 1, S): evaluated at frequencies (D, F) it gives every design's response at once.
    """
    return LineCascade(
        np.array([[line.source_ohm] for line in lines]),
        FixedLoad(
            np.array([[line.load.resistance_ohm] for line in lines]),
            np.array([[line.load.reactance_ohm] for line in lines]),
        ),
        lines[0].medium,
        np.array([[line.geometry] for line in lines]),
        np.array([[line.lengths_m] for line in lines]),
    )


def stack_key(line: LineCascade) -> tuple | None:
    """Lines with equal keys can be stacked; None for lines that must be evaluated alone."""
    if not isinstance(line.load, FixedLoad) or line.with_steps:
        return None
    return line.geometry.size, line.medium


def stackable_groups(lines: list[LineCascade]) -> list[list[int]]:
    """Indices of the lines, grouped so that each group can be stacked (or is a single line).

    Groups hold at most STACK_DESIGNS lines: a stack of a few hundred designs makes arrays too
    big for the processor's cache, and the cascade then runs at memory speed (figures: README,
    Measured speed).
    """
    groups: dict[tuple, list[int]] = {}
    singles = []
    for index, line in enumerate(lines):
        key = stack_key(line)
        if key is None:
            singles.append([index])
        else:
            groups.setdefault(key, []).append(index)
    chunks = [group[i : i + STACK_DESIGNS] for group in groups.values() for i in range(0, len(group), STACK_DESIGNS)]
    return chunks + singles


def group_as_line(lines: list[LineCascade], indices: list[int]) -> LineCascade:
    """The lines at these indices as one line: a stack, or the line itself when there is one."""
    return lines[indices[0]] if len(indices) == 1 else stack([lines[i] for i in indices])
