"""Where a request's computation runs: on the event loop when it is short, in a worker process when not.

Handing work elsewhere costs more than a typical small design takes, so short designs run inline.
Anything estimated to take longer runs in a pool of worker processes (pebble's ProcessPool, a
well-kept library chosen because it stops a task at its timeout and replaces the worker, which
the standard library's pool cannot): the event loop stays free for health checks and small
requests, and work past the hard deadline is stopped and answered with a 503. Work whose client
has gone is stopped too: nobody would read its answer.

The workers run at a lower scheduling priority (nice) than the server process, so on a machine
whose cores are all busy computing, the event loop still gets a core at once for health checks.
"""

from __future__ import annotations

import asyncio
import atexit
import multiprocessing
import os
from collections.abc import Callable
from concurrent.futures import Future
from concurrent.futures import TimeoutError as FutureTimeout
from concurrent.futures.process import BrokenProcessPool
from typing import Any, TypeVar

from pebble import ProcessExpired, ProcessPool
from starlette.requests import Request

from service.errors import ClientGoneError, ComputeTimeoutError

INLINE_LIMIT_S = 5e-3
WORKER_NICENESS = 10  # added to the workers' nice value: the server's event loop comes first
DISCONNECT_POLL_S = 0.25  # how often a waiting request checks that its client is still there

Result = TypeVar("Result")
_pool: ProcessPool | None = None


def worker_pool() -> ProcessPool:
    """The process pool, started on first use (one per server process). Workers are forked: they
    start at once with the code already imported, and they only compute (no logging, no I/O), so
    no lock a server thread held at the fork is ever waited on in a worker."""
    global _pool
    if _pool is None or not _pool.active:
        _pool = ProcessPool(
            max_workers=os.cpu_count() or 1, context=multiprocessing.get_context("fork"), initializer=_lower_priority
        )
        atexit.register(_pool.stop)
    return _pool


def _lower_priority() -> None:
    """Run in each new worker: yield the CPU to the server process when both want it."""
    os.nice(WORKER_NICENESS)


async def _client_gone(http: Request) -> None:
    """Return once the client of this request has disconnected."""
    while not await http.is_disconnected():
        await asyncio.sleep(DISCONNECT_POLL_S)


async def run_sized(
    function: Callable[..., Result],
    args: tuple[Any, ...],
    estimated_s: float,
    deadline_s: float,
    http: Request | None = None,
) -> Result:
    """function(*args): inline if its estimated compute is under INLINE_LIMIT_S, else in a worker
    process that is stopped once it runs past deadline_s (ComputeTimeoutError) or once the client
    of `http` disconnects (ClientGoneError). The function and its arguments must be picklable:
    module-level functions, request models, settings."""
    if estimated_s <= INLINE_LIMIT_S:
        return function(*args)
    future = worker_pool().schedule(function, args=args, timeout=deadline_s)
    try:
        return await _result_unless_abandoned(future, http)
    except (FutureTimeout, ProcessExpired, BrokenProcessPool):
        raise ComputeTimeoutError(deadline_s) from None
    except (asyncio.CancelledError, ClientGoneError):  # a shutdown, or nobody left to answer
        future.cancel()  # pebble stops the worker running it and starts a fresh one
        raise


async def _result_unless_abandoned(future: Future, http: Request | None) -> Any:
    """The future's result, or ClientGoneError as soon as the client of `http` disconnects."""
    work = asyncio.wrap_future(future)
    if http is None:
        return await work
    watcher = asyncio.ensure_future(_client_gone(http))
    try:
        done, _ = await asyncio.wait({work, watcher}, return_when=asyncio.FIRST_COMPLETED)
    finally:
        watcher.cancel()
    if work not in done:
        raise ClientGoneError()
    return work.result()
