"""Where a request's computation runs: on the event loop when it is short, in a worker thread when not.

Handing work to the thread pool costs a few hundred microseconds of thread switching, more than a
typical small design takes, so short designs run inline. Anything estimated to take longer goes to
the pool, so that a long request never holds up health checks and other small requests.
"""

from collections.abc import Callable
from typing import TypeVar

from starlette.concurrency import run_in_threadpool

INLINE_LIMIT_S = 5e-3

Result = TypeVar("Result")


async def run_sized(work: Callable[[], Result], estimated_s: float) -> Result:
    """The result of `work`, run inline if its estimated compute is under INLINE_LIMIT_S, else in a thread."""
    if estimated_s <= INLINE_LIMIT_S:
        return work()
    return await run_in_threadpool(work)
