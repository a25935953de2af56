"""Stepline benchmarks: every figure is a ratio or a measurement taken side by side in this run.

Run with:  python bench/run.py   (needs the test extra: pip install -e '.[test]')

1. The exact cascade against scikit-rf's network cascade: 8 ideal sections, 1001 points.
2. A design endpoint against the trivial health endpoint of the same server, same load, in alternating rounds.
3. One batch of 500 designs against 500 single requests (wall time and server CPU, alternating rounds).
4. A streamed NDJSON sweep of 1,000 and of 10,000 designs: wall time and the server's peak memory.

Servers are started on 127.0.0.1 only, and every load loop is bounded in count.
"""

from __future__ import annotations

import concurrent.futures
import os
import platform
import socket
import subprocess
import sys
import time
import timeit
from concurrent.futures import ThreadPoolExecutor
from contextlib import contextmanager

import httpx
import numpy as np

C0 = 299_792_458.0  # m/s, exact by the SI definition
DESIGN_BODY = {
    "source_ohm": 50,
    "load": {"resistance_ohm": 20},
    "band": {"start_hz": 2e9, "stop_hz": 4e9},
    "sections": 3,
    "theory": "exact",
    "points": 101,
}


def cascade_against_scikit_rf() -> None:
    import skrf
    from skrf.media import DefinedGammaZ0

    from service.analysis import network

    rng = np.random.default_rng(5)
    impedances, lengths = rng.uniform(20, 120, 8), rng.uniform(0.01, 0.05, 8)
    frequency = skrf.Frequency(1, 3, 1001, unit="GHz")
    beta = 2 * np.pi * frequency.f / C0

    def ours() -> np.ndarray:
        abcd = network.cascade(impedances, network.electrical_length_rad(lengths, frequency.f, 1.0))
        return network.s_parameters(abcd, 50.0, 50.0)[0]

    def theirs() -> np.ndarray:
        lines = [
            DefinedGammaZ0(frequency, z0_port=50, z0=z, gamma=1j * beta).line(d, "m")
            for z, d in zip(impedances, lengths, strict=True)
        ]
        return skrf.network.cascade_list(lines).s[:, 0, 0]

    ours_s = min(timeit.repeat(ours, number=20, repeat=5)) / 20
    theirs_s = min(timeit.repeat(theirs, number=3, repeat=3)) / 3
    ours_s11, theirs_s11 = ours(), theirs()
    every = 10  # the 40-digit reference at every 10th frequency keeps it to about a second
    exact = high_precision_s11(impedances, lengths, frequency.f[::every], 50.0)
    print("1. cascade, 8 ideal sections x 1001 points")
    print(
        f"   ours {ours_s * 1e6:.1f} us, scikit-rf {theirs_s * 1e6:.1f} us: "
        f"{theirs_s / ours_s:.1f}x faster (target >= 50x)"
    )
    print(f"   largest |S11| difference, ours against scikit-rf: {np.max(np.abs(ours_s11 - theirs_s11)):.2e}")
    print(
        f"   against 40-digit arithmetic (mpmath) at {exact.size} of the points: ours "
        f"{np.max(np.abs(ours_s11[::every] - exact)):.2e}, scikit-rf {np.max(np.abs(theirs_s11[::every] - exact)):.2e}"
        " (target 1e-12)"
    )


def high_precision_s11(impedances: np.ndarray, lengths: np.ndarray, frequencies: np.ndarray, port_ohm: float):
    """S11 of the same lossless cascade with 40 significant digits, the exact reference."""
    import mpmath

    mpmath.mp.dps = 40
    values = []
    for f in frequencies:
        product = mpmath.eye(2)
        for z, d in zip(impedances, lengths, strict=True):
            theta = 2 * mpmath.pi * mpmath.mpf(f) * mpmath.mpf(d) / C0
            z = mpmath.mpf(z)
            cos, sin = mpmath.cos(theta), mpmath.sin(theta)
            product = product * mpmath.matrix([[cos, 1j * z * sin], [1j * sin / z, cos]])
        (a, b), (c, d) = (product[0, 0], product[0, 1]), (product[1, 0], product[1, 1])
        r = port_ohm
        values.append(complex((a * r + b - c * r * r - d * r) / (a * r + b + c * r * r + d * r)))
    return np.array(values)


def free_port() -> int:
    with socket.socket() as probe:
        probe.bind(("127.0.0.1", 0))
        return probe.getsockname()[1]


@contextmanager
def server():
    port = free_port()
    process = subprocess.Popen(
        [
            sys.executable,
            "-m",
            "uvicorn",
            "service.app:app",
            "--host",
            "127.0.0.1",
            "--port",
            str(port),
            "--log-level",
            "warning",
        ],
        stdout=subprocess.DEVNULL,
    )
    base = f"http://127.0.0.1:{port}"
    deadline = time.monotonic() + 30
    while time.monotonic() < deadline:
        try:
            if httpx.get(base + "/v1/health", timeout=1).status_code == 200:
                break
        except httpx.HTTPError:
            time.sleep(0.1)
    try:
        yield base, process.pid
    finally:
        process.terminate()
        process.wait(timeout=10)


def peak_memory_mib(pid: int) -> float:
    with open(f"/proc/{pid}/status") as status:
        for line in status:
            if line.startswith("VmHWM:"):
                return int(line.split()[1]) / 1024
    return float("nan")


def throughput(base: str, method: str, path: str, body: dict | None, requests: int, concurrency: int) -> float:
    with httpx.Client(base_url=base, timeout=30) as client:

        def one(_: int) -> int:
            response = client.request(method, path, json=body)
            return response.status_code

        start = time.perf_counter()
        with ThreadPoolExecutor(concurrency) as pool:
            codes = list(pool.map(one, range(requests)))
        elapsed = time.perf_counter() - start
    assert all(code == 200 for code in codes), set(codes)
    return requests / elapsed


def endpoints_side_by_side(rounds: int = 7, per_round: int = 300) -> None:
    """Alternating rounds, so that the machine's drift over the run affects both endpoints alike."""
    ratios, trivial_rates, design_rates = [], [], []
    with server() as (base, _):
        throughput(base, "GET", "/v1/health", None, 100, 8)  # warm up
        throughput(base, "POST", "/v1/transformers/chebyshev", DESIGN_BODY, 100, 8)
        for _ in range(rounds):
            trivial_rates.append(throughput(base, "GET", "/v1/health", None, per_round, 8))
            design_rates.append(throughput(base, "POST", "/v1/transformers/chebyshev", DESIGN_BODY, per_round, 8))
            ratios.append(design_rates[-1] / trivial_rates[-1])
    print(f"2. design endpoint against the health endpoint: {rounds} alternating rounds of {per_round} requests each,")
    print("   8-way concurrency, one server process")
    print(
        f"   health {np.median(trivial_rates):.0f} req/s, chebyshev design {np.median(design_rates):.0f} req/s "
        f"(medians); ratio median {np.median(ratios):.2f}, range {min(ratios):.2f}-{max(ratios):.2f} (target >= 0.7)"
    )


def cpu_seconds(pid: int) -> float:
    """User plus system CPU time the process and its live children (the compute workers) have used."""
    with open(f"/proc/{pid}/stat") as stat:
        fields = stat.read().rsplit(")", 1)[1].split()
    own = (int(fields[11]) + int(fields[12])) / os.sysconf("SC_CLK_TCK")
    try:
        with open(f"/proc/{pid}/task/{pid}/children") as listing:
            children = [int(child) for child in listing.read().split()]
    except OSError:
        children = []
    return own + sum(cpu_seconds(child) for child in children)


def batch_against_singles(rounds: int = 3) -> None:
    """Alternating rounds of 500 sequential singles and one batch of the same 500 designs.

    Wall time is what a script waits; the server's CPU time is what the designs cost the service.
    """
    items = [DESIGN_BODY | {"method": "chebyshev", "load": {"resistance_ohm": 10 + 0.1 * i}} for i in range(500)]
    bodies = [{k: v for k, v in item.items() if k != "method"} for item in items]
    walls, cpus = [], []
    with server() as (base, pid), httpx.Client(base_url=base, timeout=120) as client:
        client.post("/v1/batch", json={"requests": items[:10]})
        for _ in range(rounds):
            start, cpu = time.perf_counter(), cpu_seconds(pid)
            for body in bodies:
                assert client.post("/v1/transformers/chebyshev", json=body).status_code == 200
            singles, singles_cpu = time.perf_counter() - start, cpu_seconds(pid) - cpu
            start, cpu = time.perf_counter(), cpu_seconds(pid)
            assert client.post("/v1/batch", json={"requests": items}).status_code == 200
            batch, batch_cpu = time.perf_counter() - start, cpu_seconds(pid) - cpu
            walls.append((singles, batch))
            cpus.append((singles_cpu, batch_cpu))
    wall_ratios = [singles / batch for singles, batch in walls]
    cpu_ratios = [singles / max(batch, 1e-9) for singles, batch in cpus]
    middle = int(np.argsort(wall_ratios)[len(wall_ratios) // 2])
    singles, batch = walls[middle]
    print(f"3. 500 designs: one batch against 500 sequential single requests, {rounds} alternating rounds")
    print(
        f"   wall: singles {singles:.2f} s, batch {batch:.2f} s (median round): batch {wall_ratios[middle]:.1f}x "
        f"cheaper, range {min(wall_ratios):.1f}-{max(wall_ratios):.1f}x (target >= 10x)"
    )
    print(
        f"   server CPU: singles {np.median([c[0] for c in cpus]):.2f} s, batch {np.median([c[1] for c in cpus]):.2f} s"
        f" (medians): {np.median(cpu_ratios):.1f}x (CPU time is counted in 10 ms ticks)"
    )


def streamed_sweeps() -> None:
    print("4. streamed NDJSON sweeps (a fresh server each)")
    for count in (1000, 10000):
        sweep = {
            "base": DESIGN_BODY | {"method": "chebyshev", "points": 21},
            "vary": {"load.resistance_ohm": {"start": 5, "stop": 45, "count": count // 4}, "sections": [1, 2, 3, 4]},
            "output": "ndjson",
        }
        with server() as (base, pid), httpx.Client(base_url=base, timeout=600) as client:
            before = peak_memory_mib(pid)
            start = time.perf_counter()
            lines = 0
            with client.stream("POST", "/v1/sweeps", json=sweep) as response:
                for _ in response.iter_lines():
                    lines += 1
            elapsed = time.perf_counter() - start
            peak = peak_memory_mib(pid)
        assert lines == count + 1
        print(
            f"   {count:>6} designs: {elapsed:.2f} s ({count / elapsed:.0f} designs/s), "
            f"server peak RSS {peak:.0f} MiB (idle {before:.0f} MiB)"
        )


LONG_BODY = {  # a refined spec-driven search into a reactive load: seconds of work
    "source_ohm": 50,
    "load": {"resistance_ohm": 30, "reactance_ohm": -40},
    "band": {"start_hz": 2.2e9, "stop_hz": 2.7e9},
    "max_reflection": 0.001,
}


def health_while_busy(probes: int = 40) -> None:
    """Health-check latency while long designs run: the event loop must stay free (target 100 ms)."""
    with server() as (base, _), concurrent.futures.ThreadPoolExecutor(max_workers=4) as pool:
        busy = [
            pool.submit(httpx.post, base + "/v1/transformers/chebyshev", json=LONG_BODY, timeout=120) for _ in range(3)
        ]
        time.sleep(0.5)
        latencies = []
        for _ in range(probes):
            start = time.perf_counter()
            httpx.get(base + "/v1/health", timeout=30)
            latencies.append((time.perf_counter() - start) * 1e3)
            time.sleep(0.05)
        statuses = [future.result().status_code for future in busy]
    print(f"5. /v1/health while 3 long designs run (statuses {statuses}): {probes} probes")
    print(f"   latency median {np.median(latencies):.1f} ms, max {max(latencies):.1f} ms (target: within 100 ms)")


def main() -> None:
    print(
        f"Stepline benchmark on {platform.processor() or platform.machine()}, {os.cpu_count()} cores, "
        f"Python {platform.python_version()}"
    )
    cascade_against_scikit_rf()
    endpoints_side_by_side()
    batch_against_singles()
    streamed_sweeps()
    health_while_busy()


if __name__ == "__main__":
    main()
