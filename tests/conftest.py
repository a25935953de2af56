"""Shared fixtures: an in-process client of the app, a live server, and a baseline request body."""

import contextlib
import copy
import os
import socket
import subprocess
import sys
import time
from collections.abc import Iterator
from typing import IO

import httpx
import pytest
from fastapi.testclient import TestClient

from service.app import create_app
from service.settings import Settings

# A scenario of our own: a 50 ohm line into a 100 ohm load over 1-3 GHz (centre 2 GHz).
BASE_REQUEST = {
    "source_ohm": 50.0,
    "load": {"resistance_ohm": 100.0},
    "band": {"start_hz": 1.0e9, "stop_hz": 3.0e9},
    "points": 41,
}
# A lossy board of our own: 0.508 mm, eps_r 3.66, loss tangent 0.004, copper strips 35 um thick.
LOSSY_MICROSTRIP = {
    "kind": "microstrip",
    "eps_r": 3.66,
    "height_m": 0.508e-3,
    "thickness_m": 35e-6,
    "loss_tangent": 0.004,
    "conductivity_s_per_m": 5.8e7,
}


@pytest.fixture(scope="session")
def client() -> TestClient:
    return TestClient(create_app(Settings()))


@pytest.fixture
def base_request() -> dict:
    return copy.deepcopy(BASE_REQUEST)


@contextlib.contextmanager
def live_process(
    arguments: tuple[str, ...] = (), log: IO | None = None, **environment: str
) -> Iterator[tuple[str, subprocess.Popen]]:
    """A uvicorn server of the app on a free loopback port, with extra command-line arguments and
    environment, its standard output (the access log) to `log`; yields its URL and process."""
    with socket.socket() as probe:
        probe.bind(("127.0.0.1", 0))
        port = probe.getsockname()[1]
    process = subprocess.Popen(
        [sys.executable, "-m", "uvicorn", "service.app:app", "--host", "127.0.0.1", "--port", str(port), *arguments],
        stdout=log or subprocess.DEVNULL,
        stderr=subprocess.DEVNULL,
        env={**os.environ, **environment},
    )
    url = f"http://127.0.0.1:{port}"
    for _ in range(100):
        try:
            if httpx.get(url + "/v1/health", timeout=1).status_code == 200:
                break
        except httpx.HTTPError:
            time.sleep(0.1)
    try:
        yield url, process
    finally:
        process.terminate()
        process.wait(timeout=10)


@contextlib.contextmanager
def live_server(**environment: str) -> Iterator[str]:
    """A uvicorn server of the app on a free loopback port, with extra environment; yields its URL."""
    with live_process(**environment) as (url, _):
        yield url
