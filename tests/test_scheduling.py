"""Short work runs on the event loop's thread; long work runs in a worker process with a deadline."""

import asyncio
import os
import threading
import time

import pytest

from service.api.scheduling import INLINE_LIMIT_S, run_sized
from service.app import create_app
from service.errors import ComputeTimeoutError
from service.settings import Settings
from tests.conftest import BASE_REQUEST


def test_short_work_inline_long_work_in_a_worker_process():
    async def where() -> tuple[int, int, int, int]:
        loop_thread = threading.get_ident()
        short_thread = await run_sized(threading.get_ident, (), INLINE_LIMIT_S / 2, 10.0)
        short_process = await run_sized(os.getpid, (), INLINE_LIMIT_S / 2, 10.0)
        long_process = await run_sized(os.getpid, (), INLINE_LIMIT_S * 2, 10.0)
        return loop_thread, short_thread, short_process, long_process

    loop_thread, short_thread, short_process, long_process = asyncio.run(where())
    assert short_thread == loop_thread and short_process == os.getpid()
    assert long_process != os.getpid()


def test_work_past_the_deadline_is_stopped():
    async def too_long() -> None:
        await run_sized(time.sleep, (5.0,), INLINE_LIMIT_S * 2, 0.3)

    with pytest.raises(ComputeTimeoutError):
        asyncio.run(too_long())


def test_a_stopped_request_is_a_503_and_the_next_one_is_served():
    from fastapi.testclient import TestClient

    client = TestClient(create_app(Settings(access_log=False, deadline_s=0.1)))
    reactive = BASE_REQUEST | {"load": {"resistance_ohm": 30.0, "reactance_ohm": -40.0}, "max_reflection": 0.001}
    stopped = client.post("/v1/transformers/chebyshev", json=reactive)  # a refined search: seconds of work
    assert stopped.status_code == 503
    assert stopped.json()["problems"][0]["field"] == "request" and "0.1 s" in stopped.json()["problems"][0]["message"]
    served = client.post("/v1/transformers/chebyshev", json=BASE_REQUEST | {"sections": 3})
    assert served.status_code == 200
    # The stopped worker was replaced: long work runs again in the same pool.
    patient = TestClient(create_app(Settings(access_log=False)))
    refined = patient.post("/v1/transformers/chebyshev", json=reactive | {"max_reflection": 0.05, "sections": 2})
    assert refined.status_code == 200 and refined.json()["refinement"] is not None
