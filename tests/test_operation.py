"""The server as it is run: a body that never arrives, a client that leaves, a shutdown that runs
out of time, idle keep-alive connections, and the health check while long work runs."""

import json
import os
import re
import signal
import socket
import tempfile
import threading
import time
from pathlib import Path
from urllib.parse import urlparse

import httpx
import pytest

from tests.conftest import BASE_REQUEST, LOSSY_MICROSTRIP, live_process

ROOT = Path(__file__).resolve().parent.parent
# Accepted (priced under the budget) and several seconds of work in a worker process.
LONG_TAPER = BASE_REQUEST | {
    "profile": "triangular",
    "segments": 1024,
    "points": 10001,
    "length_m": 0.2,
    "medium": LOSSY_MICROSTRIP,
}
TAPER = "/v1/transformers/taper"


def _serve_flags() -> list[str]:
    """The uvicorn options of the Dockerfile's command other than the address and port."""
    command = json.loads(re.search(r"^CMD (\[.*\])$", (ROOT / "Dockerfile").read_text(), re.M).group(1))
    flags = command[command.index("service.app:app") + 1 :]
    for name in ("--host", "--port"):
        del flags[flags.index(name) : flags.index(name) + 2]
    return flags


def _children_cpu_s(pid: int) -> float:
    """CPU seconds used so far by the direct children of a process (its compute workers)."""
    total = 0.0
    for stat in Path("/proc").glob("[0-9]*/stat"):
        try:
            fields = stat.read_text().rsplit(")", 1)[1].split()
        except OSError:
            continue
        if int(fields[1]) == pid:  # ppid
            total += (int(fields[11]) + int(fields[12])) / os.sysconf("SC_CLK_TCK")  # utime + stime
    return total


def _exchange(connection: socket.socket, request: bytes) -> bytes:
    """Send one request on an open connection and read its whole answer (by its content-length)."""
    connection.sendall(request)
    answer = b""
    while b"\r\n\r\n" not in answer:
        chunk = connection.recv(4096)
        if not chunk:
            raise ConnectionError("the server closed the connection")
        answer += chunk
    head, body = answer.split(b"\r\n\r\n", 1)
    length = int(re.search(rb"content-length: (\d+)", head, re.I).group(1))
    while len(body) < length:
        body += connection.recv(4096)
    return head


def test_the_readme_and_the_dockerfile_serve_with_the_same_timeouts():
    flags = _serve_flags()
    assert flags[flags.index("--timeout-keep-alive") + 1] == "75"
    readme = (ROOT / "README.md").read_text()
    start = next(line for line in readme.splitlines() if "uvicorn service.app:app" in line)
    assert "--timeout-keep-alive 75" in start and "--timeout-graceful-shutdown 20" in start


def test_an_idle_keep_alive_connection_outlives_the_old_five_second_close():
    # A connection the server closes while the client reuses it is the race a short keep-alive
    # gave under load; with the serving flags the server keeps an idle connection for 75 s.
    with live_process(tuple(_serve_flags())) as (url, _):
        address = urlparse(url)
        request = f"GET /v1/health HTTP/1.1\r\nHost: {address.netloc}\r\n\r\n".encode()
        with socket.create_connection((address.hostname, address.port), timeout=5) as connection:
            assert _exchange(connection, request).startswith(b"HTTP/1.1 200")
            time.sleep(6.0)
            assert _exchange(connection, request).startswith(b"HTTP/1.1 200")


@pytest.fixture(scope="module")
def server():
    with tempfile.TemporaryFile() as log, live_process(log=log, STEPLINE_BODY_TIMEOUT_S="1") as (url, process):
        yield url, process, log


def _access_lines(log) -> list[dict]:
    log.seek(0)
    return [json.loads(line) for line in log.read().decode().splitlines() if line.startswith("{")]


def test_a_body_that_never_arrives_is_refused_in_the_read_time(server):
    url, _, _ = server
    address = urlparse(url)
    with socket.create_connection((address.hostname, address.port), timeout=10) as connection:
        head = (
            f"POST {TAPER} HTTP/1.1\r\nHost: {address.netloc}\r\n"
            "content-type: application/json\r\ncontent-length: 500\r\n\r\n{"
        )
        started = time.monotonic()
        connection.sendall(head.encode())
        answer = connection.recv(65536).decode()
        waited = time.monotonic() - started
    assert answer.startswith("HTTP/1.1 408")
    assert '"field":"body"' in answer.replace(" ", "")
    assert 0.9 < waited < 5.0


def test_a_client_that_leaves_stops_its_work(server):
    url, process, log = server
    with pytest.raises(httpx.ReadTimeout):
        httpx.post(url + TAPER, json=LONG_TAPER, timeout=1.0)
    time.sleep(1.0)  # the disconnect is seen within a poll, the worker is stopped
    before = _children_cpu_s(process.pid)
    time.sleep(2.0)
    assert _children_cpu_s(process.pid) - before < 0.3  # nothing computes for the departed client
    gone = [line for line in _access_lines(log) if line["path"] == TAPER and line["status"] == 499]
    assert gone and gone[-1]["duration_ms"] < 3000


def test_a_json_sweep_stops_when_its_client_leaves(server):
    url, process, log = server
    sweep = {
        "base": LONG_TAPER | {"method": "taper", "segments": 256, "points": 2001},
        "vary": {"length_m": [0.2, 0.21, 0.22, 0.23, 0.24]},
        "output": "json",
    }
    with pytest.raises(httpx.ReadTimeout):
        httpx.post(url + "/v1/sweeps", json=sweep, timeout=1.0)
    time.sleep(1.0)
    before = _children_cpu_s(process.pid)
    time.sleep(2.0)
    assert _children_cpu_s(process.pid) - before < 0.3
    assert any(line["path"] == "/v1/sweeps" and line["status"] == 499 for line in _access_lines(log))


def test_health_answers_quickly_while_long_work_runs(server):
    url, _, _ = server
    threads = [threading.Thread(target=lambda: httpx.post(url + TAPER, json=LONG_TAPER, timeout=60)) for _ in range(2)]
    for thread in threads:
        thread.start()
    time.sleep(1.0)
    latencies = []
    for _ in range(10):
        started = time.perf_counter()
        assert httpx.get(url + "/v1/health", timeout=5).status_code == 200
        latencies.append(time.perf_counter() - started)
        time.sleep(0.1)
    for thread in threads:
        thread.join()
    # Not a speed target (bench/run.py measures that): a check that the event loop is never the
    # one waiting on the computation, which would take seconds here.
    assert max(latencies) < 1.0


def test_a_request_cut_off_by_shutdown_gets_the_error_shape():
    with live_process(("--timeout-graceful-shutdown", "1")) as (url, process):
        answers = []
        client = threading.Thread(target=lambda: answers.append(httpx.post(url + TAPER, json=LONG_TAPER, timeout=30)))
        client.start()
        time.sleep(1.0)
        process.send_signal(signal.SIGTERM)
        client.join(timeout=20)
    assert answers, "no answer came back"
    assert answers[0].status_code == 503
    assert answers[0].json()["title"] == "shutting down"
