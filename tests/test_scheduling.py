"""Short work runs on the event loop's thread; long work is handed to a worker thread."""

import asyncio
import threading

from service.api.scheduling import INLINE_LIMIT_S, run_sized


def test_short_work_inline_long_work_in_a_thread():
    async def threads() -> tuple[int, int, int]:
        loop_thread = threading.get_ident()
        short = await run_sized(threading.get_ident, INLINE_LIMIT_S / 2)
        long = await run_sized(threading.get_ident, INLINE_LIMIT_S * 2)
        return loop_thread, short, long

    loop_thread, short, long = asyncio.run(threads())
    assert short == loop_thread
    assert long != loop_thread
