"""Where a request's computation runs: on the event loop when it is short, in a worker process when not.

Handing work elsewhere costs more than a typical small design takes, so short designs run inline.
Anything estimated to take longer runs in a pool of worker processes (pebble's ProcessPool, a
well-kept library chosen because it stops a task at its timeout and replaces the worker, which
the standard library's pool cannot): the event loop stays free for health checks and small
requests, and work past the hard deadline is stopped and answered with a 503.
"""

from __future__ import annotations

import asyncio
import atexit
import multiprocessing
import os
from collections.abc import Callable
from concurrent.futures import TimeoutError as FutureTimeout
from concurrent.futures.process import BrokenProcessPool
from typing import Any, TypeVar

from pebble import ProcessExpired, ProcessPool

from service.errors import ComputeTimeoutError

INLINE_LIMIT_S = 5e-3

Result = TypeVar("Result")
_pool: ProcessPool | None = None


def worker_pool() -> ProcessPool:
    """The process pool, started on first use (one per server process). Workers are forked: they
    start at once with the code already imported, and they only compute (no logging, no I/O), so
    no lock a server thread held at the fork is ever waited on in a worker."""
    global _pool
    if _pool is None or not _pool.active:
        _pool = ProcessPool(max_workers=os.cpu_count() or 1, context=multiprocessing.get_context("fork"))
        atexit.register(_pool.stop)
    return _pool


async def run_sized(
    function: Callable[..., Result], args: tuple[Any, ...], estimated_s: float, deadline_s: float
) -> Result:
    """function(*args): inline if its estimated compute is under INLINE_LIMIT_S, else in a worker
    process that is stopped (ComputeTimeoutError) once it runs past deadline_s. The function and
    its arguments must be picklable: module-level functions, request models, settings."""
    if estimated_s <= INLINE_LIMIT_S:
        return function(*args)
    future = worker_pool().schedule(function, args=args, timeout=deadline_s)
    try:
        return await asyncio.wrap_future(future)
    except (FutureTimeout, ProcessExpired, BrokenProcessPool):
        raise ComputeTimeoutError(deadline_s) from None
