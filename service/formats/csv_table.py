"""The response curve of a design as CSV: one header row, one row per frequency."""

from __future__ import annotations

import csv
import io
import json
from collections.abc import Iterable, Iterator

from service.schemas.bulk import ItemResult
from service.schemas.results import ResponseCurve


def response_csv(curve: ResponseCurve) -> str:
    """Columns frequency_hz, reflection_magnitude, return_loss_db (and insertion_loss_db with losses)."""
    columns = {
        "frequency_hz": curve.frequency_hz,
        "reflection_magnitude": curve.reflection_magnitude,
        "return_loss_db": curve.return_loss_db,
    }
    if curve.insertion_loss_db is not None:
        columns["insertion_loss_db"] = curve.insertion_loss_db
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(columns)
    writer.writerows(zip(*(map(repr, values) for values in columns.values()), strict=True))
    return buffer.getvalue()


SWEEP_COLUMNS = [
    "status",
    "method",
    "theory",
    "profile",
    "medium",
    "section_count",
    "total_length_m",
    "max_reflection",
    "min_return_loss_db",
    "max_vswr",
    "worst_frequency_hz",
    "meets_spec",
    "error",
]


def sweep_csv_lines(parameters: list[str], results: Iterable[ItemResult]) -> Iterator[str]:
    """A header line, then one line per design: its swept values (JSON for objects) and its figures.

    A swept value's column is named by its path with a `vary.` prefix (`vary.medium`), so no
    column name repeats when a swept field is also one of the design's figures (`medium`)."""
    yield _csv_line(["index", *(f"vary.{name}" for name in parameters), *SWEEP_COLUMNS])
    for result in results:
        values = [_cell(result.parameters.get(name)) for name in parameters]
        design, error = result.design, result.error
        if design is not None:
            figures = design.verified
            row = [
                result.status,
                design.method,
                design.theory,
                design.profile or "",
                design.medium,
                len(design.sections),
                repr(design.total_length_m),
                repr(figures.max_reflection),
                repr(figures.min_return_loss_db),
                "" if figures.max_vswr is None else repr(figures.max_vswr),
                repr(figures.worst_frequency_hz),
                figures.meets_spec,
                "",
            ]
        else:
            message = "; ".join(f"{p.field}: {p.message}" for p in error.problems)
            row = [result.status, *[""] * (len(SWEEP_COLUMNS) - 2), message]
        yield _csv_line([result.index, *values, *row])


def _cell(value: object) -> str:
    return json.dumps(value) if isinstance(value, dict | list) else str(value)


def _csv_line(values: list[object]) -> str:
    buffer = io.StringIO()
    csv.writer(buffer, lineterminator="\n").writerow(values)
    return buffer.getvalue()
