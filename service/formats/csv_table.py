"""The response curve of a design as CSV: one header row, one row per frequency."""

from __future__ import annotations

import csv
import io

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
