"""A bounded load test on loopback: a fixed number of design requests at 32-way concurrency.

Run with:  python -m bench.load_test [requests]   (default 2000; needs the test extra)

Starts its own server on 127.0.0.1, sends exactly that many requests (a mix of methods), and
prints the error count, the latency percentiles and the throughput. It never targets any other host.
"""

from __future__ import annotations

import sys
import time
from concurrent.futures import ThreadPoolExecutor

import httpx
import numpy as np

from bench.run import server

CONCURRENCY = 32
BODIES = [
    (
        "/v1/transformers/chebyshev",
        {
            "source_ohm": 50,
            "load": {"resistance_ohm": 20},
            "band": {"start_hz": 2e9, "stop_hz": 4e9},
            "sections": 3,
            "theory": "exact",
        },
    ),
    (
        "/v1/transformers/binomial",
        {
            "source_ohm": 50,
            "load": {"resistance_ohm": 150},
            "band": {"start_hz": 1e9, "stop_hz": 2e9},
            "max_reflection": 0.05,
        },
    ),
    (
        "/v1/transformers/quarter-wave",
        {
            "source_ohm": 75,
            "load": {"resistance_ohm": 30, "reactance_ohm": 12},
            "band": {"start_hz": 4e8, "stop_hz": 5e8},
        },
    ),
    (
        "/v1/transformers/taper",
        {
            "source_ohm": 50,
            "load": {"resistance_ohm": 12},
            "band": {"start_hz": 1e9, "stop_hz": 6e9},
            "max_reflection": 0.05,
            "segments": 48,
        },
    ),
]


def main(count: int) -> None:
    with (
        server() as (base, _),
        httpx.Client(base_url=base, timeout=60, limits=httpx.Limits(max_connections=CONCURRENCY)) as client,
    ):

        def one(index: int) -> tuple[int, float]:
            path, body = BODIES[index % len(BODIES)]
            start = time.perf_counter()
            status = client.post(path, json=body).status_code
            return status, time.perf_counter() - start

        for index in range(20):
            one(index)
        start = time.perf_counter()
        with ThreadPoolExecutor(CONCURRENCY) as pool:
            results = list(pool.map(one, range(count)))
        elapsed = time.perf_counter() - start
    latencies = np.array([seconds for _, seconds in results]) * 1e3
    errors = sum(1 for status, _ in results if status != 200)
    print(f"{count} requests at {CONCURRENCY}-way concurrency in {elapsed:.2f} s ({count / elapsed:.0f} req/s)")
    p50, p99 = np.percentile(latencies, [50, 99])
    print(f"errors {errors}; latency p50 {p50:.1f} ms, p99 {p99:.1f} ms, max {latencies.max():.1f} ms")


if __name__ == "__main__":
    main(int(sys.argv[1]) if len(sys.argv) > 1 else 2000)
