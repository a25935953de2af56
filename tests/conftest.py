"""Shared fixtures: an in-process client of the app and a baseline request body."""

import copy

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


@pytest.fixture(scope="session")
def client() -> TestClient:
    return TestClient(create_app(Settings()))


@pytest.fixture
def base_request() -> dict:
    return copy.deepcopy(BASE_REQUEST)
