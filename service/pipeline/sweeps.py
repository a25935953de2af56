"""Batches and sweeps: validate items one by one, design them in stacked groups, report each."""

from __future__ import annotations

import copy
import itertools
import math
from collections.abc import Callable, Iterator
from typing import Any

import numpy as np
from pydantic import ValidationError

from service.constants import DEFAULT_POINTS, MAX_POINTS
from service.errors import UnmeetableRequestError, validation_problems
from service.pipeline.batch import design_batch
from service.pipeline.items import ITEM_ADAPTER
from service.pipeline.options import DesignOptions
from service.schemas.bulk import BatchResult, DesignSummary, ItemResult, SweepRequest, SweepResult, ValueRange
from service.schemas.errors import ErrorBody, Problem
from service.schemas.results import TransformerDesign

Admission = Callable[[dict[str, Any]], None]  # refuses a raw item beyond the operator's limits (UnmeetableRequestError)
CHUNK_ITEMS = 256
CHUNK_CURVE_POINTS = 250_000  # response-curve points in one chunk of a sweep with curves


def summary(design: TransformerDesign | DesignSummary, include_curves: bool) -> DesignSummary:
    """The table-sized view of a design (a summary already is one)."""
    return design if isinstance(design, DesignSummary) else DesignSummary.picked(dict(design), include_curves)


def design_items(
    raw_items: list[Any], include_curves: bool, options: DesignOptions, admit: Admission, offset: int = 0
) -> list[ItemResult]:
    """Validate and design each raw item; errors stay with their item."""
    results: list[ItemResult | None] = [None] * len(raw_items)
    valid, positions = [], []
    for position, raw in enumerate(raw_items):
        try:
            item = ITEM_ADAPTER.validate_python(raw)
            admit(raw)
            valid.append(item)
            positions.append(position)
        except ValidationError as exc:
            error = ErrorBody(status=422, title="invalid request", problems=validation_problems(exc.errors()))
            results[position] = ItemResult(index=offset + position, status=422, error=error)
        except UnmeetableRequestError as exc:
            results[position] = _unmeetable(offset + position, exc)
    for position, outcome in zip(positions, design_batch(valid, options, summaries=not include_curves), strict=True):
        if isinstance(outcome, UnmeetableRequestError):
            results[position] = _unmeetable(offset + position, outcome)
        else:
            results[position] = ItemResult(index=offset + position, status=200, design=summary(outcome, include_curves))
    return results


def batch_result(raw_items: list[Any], include_curves: bool, options: DesignOptions, admit: Admission) -> BatchResult:
    """The whole batch's answer (a module-level function, so a worker process can run it)."""
    return BatchResult(results=design_items(raw_items, include_curves, options, admit))


def _unmeetable(index: int, exc: UnmeetableRequestError) -> ItemResult:
    problem = Problem(field=exc.field, message=exc.message)
    return ItemResult(index=index, status=422, error=ErrorBody(status=422, title=exc.title, problems=[problem]))


def sweep_values(values: list[Any] | ValueRange) -> list[Any]:
    """The values of one swept parameter."""
    if isinstance(values, list):
        return values
    if values.count == 1:
        return [values.start]
    if values.spacing == "log":
        return np.geomspace(values.start, values.stop, values.count).tolist()
    return np.linspace(values.start, values.stop, values.count).tolist()


def sweep_size(request: SweepRequest) -> int:
    """How many designs the grid holds."""
    return math.prod(len(sweep_values(v)) if isinstance(v, list) else v.count for v in request.vary.values())


def _with_value(base: dict[str, Any], path: str, value: Any) -> dict[str, Any]:
    target = base
    keys = path.split(".")
    for key in keys[:-1]:
        child = target.get(key)
        if not isinstance(child, dict):
            child = {}
            target[key] = child
        target = child
    target[keys[-1]] = copy.deepcopy(value)
    return base


def _grid_item(request: SweepRequest, keys: list[str], combination: tuple[Any, ...]) -> tuple[dict, dict]:
    """(parameters, raw item) of one grid point: the base with each swept value put in place."""
    item = copy.deepcopy(request.base)
    parameters = dict(zip(keys, combination, strict=True))
    for key, value in parameters.items():
        item = _with_value(item, key, value)
    return parameters, item


def sweep_items(request: SweepRequest) -> Iterator[tuple[dict[str, Any], dict[str, Any]]]:
    """(parameters, raw item) for every grid point, lazily, in order."""
    keys = list(request.vary)
    for combination in itertools.product(*(sweep_values(request.vary[key]) for key in keys)):
        yield _grid_item(request, keys, combination)


def grid_point(request: SweepRequest, index: int) -> dict[str, Any]:
    """The raw item at one index of the whole grid (the order of sweep_items: the last axis fastest)."""
    keys = list(request.vary)
    axes = [sweep_values(request.vary[key]) for key in keys]
    combination = []
    for values in reversed(axes):
        index, position = divmod(index, len(values))
        combination.append(values[position])
    return _grid_item(request, keys, tuple(reversed(combination)))[1]


def unknown_axes(request: SweepRequest) -> list[Problem]:
    """The `vary` paths that name no field of the request they change, found on the grid's first
    point before any design is made (a typo would otherwise make every item a 422)."""
    _, first = next(sweep_items(request))
    try:
        ITEM_ADAPTER.validate_python(first)
    except ValidationError as exc:
        unknown = {error["loc"] for error in exc.errors() if error.get("type") == "extra_forbidden"}
        fields = {problem.field for problem in validation_problems([{"loc": loc} for loc in unknown])}
        return [
            Problem(field=f"vary.{path}", message=f"'{path}' is not a field of a {first.get('method')} request")
            for path in request.vary
            if path in fields
        ]
    return []


def sweep_slice_size(request: SweepRequest) -> int:
    """How many grid points the request's slice (offset, limit) holds."""
    remaining = max(sweep_size(request) - request.offset, 0)
    return remaining if request.limit is None else min(request.limit, remaining)


def sweep_result(request: SweepRequest, options: DesignOptions, admit: Admission) -> SweepResult:
    """The whole sweep's slice as one answer (a module-level function, so a worker process can run it)."""
    results = list(sweep_results(request, options, admit))
    return SweepResult(total=sweep_size(request), parameters=list(request.vary), results=results)


def _chunks(grid: Iterator[tuple[dict, dict]], include_curves: bool) -> Iterator[list[tuple[dict, dict]]]:
    """Grid points in chunks of CHUNK_ITEMS, smaller where their curves would hold more than
    CHUNK_CURVE_POINTS points: a chunk's results are in memory together."""
    chunk: list[tuple[dict, dict]] = []
    points = 0
    for point in grid:
        chunk.append(point)
        given = point[1].get("points")
        points += given if isinstance(given, int) and 0 < given <= MAX_POINTS else DEFAULT_POINTS
        if len(chunk) == CHUNK_ITEMS or (include_curves and points >= CHUNK_CURVE_POINTS):
            yield chunk
            chunk, points = [], 0
    if chunk:
        yield chunk


def sweep_results(request: SweepRequest, options: DesignOptions, admit: Admission) -> Iterator[ItemResult]:
    """Every design of the sweep's slice, in order (indices count from the whole grid's start),
    computed a chunk at a time so memory stays flat."""
    offset = request.offset
    grid = itertools.islice(sweep_items(request), offset, offset + sweep_slice_size(request))
    for chunk in _chunks(grid, request.include_curves):
        results = design_items([item for _, item in chunk], request.include_curves, options, admit, offset)
        for (parameters, _), result in zip(chunk, results, strict=True):
            yield result.model_copy(update={"parameters": parameters})
        offset += len(chunk)
