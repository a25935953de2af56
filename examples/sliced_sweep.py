"""Spread one large sweep over several servers (or workers behind a load balancer) by slicing it.

Usage:  python examples/sliced_sweep.py [http://127.0.0.1:8000 ...]

The scenario (our own): quarter-wave and Chebyshev feeds for a bank of 600 loads between 10 and
300 ohm over 2.3-2.5 GHz. The grid is cut into slices of 100 points (`offset`, `limit`); the
slices are posted concurrently, round-robin over the servers given, and put back in grid order
by their `index`.
"""

from __future__ import annotations

import asyncio
import sys

import httpx

SWEEP = {
    "base": {
        "method": "chebyshev",
        "source_ohm": 50,
        "load": {"resistance_ohm": 10},
        "band": {"start_hz": 2.3e9, "stop_hz": 2.5e9},
        "max_reflection": 0.05,
        "points": 11,
    },
    "vary": {"load.resistance_ohm": {"start": 10, "stop": 300, "count": 300}, "method": ["quarter-wave", "chebyshev"]},
}
SLICE = 100


async def sweep(servers: list[str]) -> list[dict]:
    async with httpx.AsyncClient(timeout=300) as client:
        first = await client.post(f"{servers[0]}/v1/sweeps", json=SWEEP | {"limit": 1})
        first.raise_for_status()
        total = first.json()["total"]
        slices = [
            client.post(f"{servers[n % len(servers)]}/v1/sweeps", json=SWEEP | {"offset": offset, "limit": SLICE})
            for n, offset in enumerate(range(0, total, SLICE))
        ]
        answers = await asyncio.gather(*slices)
    results = [result for answer in answers for result in answer.raise_for_status().json()["results"]]
    return sorted(results, key=lambda result: result["index"])


if __name__ == "__main__":
    designs = asyncio.run(sweep(sys.argv[1:] or ["http://127.0.0.1:8000"]))
    met = sum(1 for d in designs if d["status"] == 200 and d["design"]["verified"]["meets_spec"])
    print(f"{len(designs)} designs, {met} meet the spec")
