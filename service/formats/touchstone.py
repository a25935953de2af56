"""Reading one-port Touchstone text (the open Touchstone format, versions 1.x and 2.0).

Supports S, Z and Y data in RI, MA and DB form, the option line defaults (GHz S MA R 50), the
version 2.0 keywords a one-port file uses, and comments. Version 1.x Z and Y data are normalized
to the reference resistance; version 2.0 data are not.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import lru_cache

import numpy as np

FREQUENCY_UNITS = {"hz": 1.0, "khz": 1e3, "mhz": 1e6, "ghz": 1e9}
PARAMETERS = {"s", "y", "z", "h", "g"}
FORMATS = {"ri", "ma", "db"}
IGNORED_KEYWORDS = {"[number of frequencies]", "[matrix format]", "[end]", "[network data]"}


class TouchstoneError(ValueError):
    """The text is not a one-port Touchstone file we can read; the message says where and why."""


@dataclass(frozen=True)
class OnePort:
    """Impedance against frequency read from a one-port file."""

    frequency_hz: np.ndarray
    impedance_ohm: np.ndarray


@dataclass
class _Options:
    unit: float = 1e9
    parameter: str = "s"
    form: str = "ma"
    reference_ohm: float = 50.0
    version: str = "1"


def _parse_option_line(tokens: list[str], options: _Options, line_number: int) -> None:
    """Apply the tokens after '#' to the options."""
    index = 0
    while index < len(tokens):
        token = tokens[index].lower()
        if token in FREQUENCY_UNITS:
            options.unit = FREQUENCY_UNITS[token]
        elif token in PARAMETERS:
            options.parameter = token
        elif token in FORMATS:
            options.form = token
        elif token == "r" and index + 1 < len(tokens):
            options.reference_ohm = _positive_number(tokens[index + 1], line_number, "reference resistance")
            index += 1
        else:
            raise TouchstoneError(f"line {line_number}: unknown option '{tokens[index]}'")
        index += 1


def _positive_number(text: str, line_number: int, what: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise TouchstoneError(f"line {line_number}: {what} '{text}' is not a number") from None
    if not np.isfinite(value) or value <= 0.0:
        raise TouchstoneError(f"line {line_number}: {what} must be a positive number")
    return value


def _keyword(line: str, options: _Options, line_number: int) -> None:
    """Handle one [Keyword] line of a version 2.0 file."""
    name, _, rest = line.partition("]")
    name = name.lower() + "]"
    value = rest.split()
    if name == "[version]":
        options.version = value[0] if value else ""
        if not options.version.startswith("2"):
            raise TouchstoneError(f"line {line_number}: unsupported version '{options.version}'")
    elif name == "[number of ports]":
        if value != ["1"]:
            raise TouchstoneError(f"line {line_number}: only one-port data can describe a load")
    elif name == "[reference]":
        if len(value) != 1:
            raise TouchstoneError(f"line {line_number}: a one-port file has one reference impedance")
        options.reference_ohm = _positive_number(value[0], line_number, "reference impedance")
    elif name not in IGNORED_KEYWORDS:
        raise TouchstoneError(f"line {line_number}: unsupported keyword {name}")


def _complex_values(first: np.ndarray, second: np.ndarray, form: str) -> np.ndarray:
    if form == "ri":
        return first + 1j * second
    magnitude = first if form == "ma" else 10.0 ** (first / 20.0)
    return magnitude * np.exp(1j * np.deg2rad(second))


def _to_impedance(values: np.ndarray, options: _Options) -> np.ndarray:
    r = options.reference_ohm
    normalized = options.version == "1"
    with np.errstate(divide="ignore", invalid="ignore"):
        if options.parameter == "s":
            return r * (1.0 + values) / (1.0 - values)
        if options.parameter == "z":
            return values * r if normalized else values
        if options.parameter == "y":
            return r / values if normalized else 1.0 / values
    raise TouchstoneError(f"{options.parameter.upper()}-parameters do not describe a one-port load")


def _refuse_multiport_line(tokens: int, line_number: int) -> None:
    """A one-port data line holds a frequency and one complex value; more numbers on a line (9 on
    each line of a two-port file) mean a multi-port file: say so instead of misreading it."""
    if tokens > 3:
        kind = "a two-port file (a frequency and four parameters)" if tokens == 9 else "a multi-port file"
        raise TouchstoneError(
            f"line {line_number} holds {tokens} numbers, as in {kind}; a load needs a one-port file (.s1p), "
            "whose lines hold a frequency and one value"
        )


@lru_cache(maxsize=16)
def read_one_port(text: str) -> OnePort:
    """Parse one-port Touchstone text; raises TouchstoneError naming the line at fault."""
    options = _Options()
    seen_option_line = False
    numbers: list[float] = []
    for line_number, raw in enumerate(text.splitlines(), start=1):
        line = raw.split("!", 1)[0].strip()
        if not line:
            continue
        if line.startswith("["):
            _keyword(line, options, line_number)
        elif line.startswith("#"):
            if not seen_option_line:
                _parse_option_line(line[1:].split(), options, line_number)
                seen_option_line = True
        else:
            tokens = line.split()
            _refuse_multiport_line(len(tokens), line_number)
            for token in tokens:
                try:
                    numbers.append(float(token))
                except ValueError:
                    raise TouchstoneError(f"line {line_number}: '{token}' is not a number") from None
    if len(numbers) % 3 or not numbers:
        raise TouchstoneError("one-port data needs a frequency and two values on each line")
    table = np.array(numbers).reshape(-1, 3)
    if not np.all(np.isfinite(table)):
        raise TouchstoneError("the data hold a non-finite number")
    frequency = table[:, 0] * options.unit
    if frequency[0] <= 0.0 or np.any(np.diff(frequency) <= 0.0):
        raise TouchstoneError("frequencies must be positive and strictly increasing")
    impedance = _to_impedance(_complex_values(table[:, 1], table[:, 2], options.form), options)
    if not np.all(np.isfinite(impedance)):
        raise TouchstoneError("a data point gives an infinite impedance (|S| = 1 at S = 1, or Y = 0)")
    return OnePort(frequency, impedance)


def write_two_port(
    frequency_hz: np.ndarray, s: np.ndarray, references_ohm: tuple[float, float], comments: list[str]
) -> str:
    """Touchstone 2.0 text of a two-port in RI form, one reference impedance per port.

    Version 2.0 is used because it states a reference per port ([Reference]). Each line holds
    N11 N21 N12 N22 (the version 1 order), which version 2.0 names 21_12 in [Two-Port Data Order].
    """
    lines = [f"! {comment}" for comment in comments]
    lines += [
        "[Version] 2.0",
        "# Hz S RI R 50",
        "[Number of Ports] 2",
        "[Two-Port Data Order] 21_12",
        f"[Number of Frequencies] {len(frequency_hz)}",
        f"[Reference] {references_ohm[0]:.17g} {references_ohm[1]:.17g}",
        "[Network Data]",
    ]
    for f, matrix in zip(frequency_hz, s, strict=True):
        values = (matrix[0, 0], matrix[1, 0], matrix[0, 1], matrix[1, 1])
        lines.append(f"{f:.17g} " + " ".join(f"{v.real:.17g} {v.imag:.17g}" for v in values))
    lines.append("[End]")
    return "\n".join(lines) + "\n"
