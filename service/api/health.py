"""Liveness and version."""

from __future__ import annotations

from fastapi import APIRouter
from pydantic import BaseModel

from service import __version__

router = APIRouter(tags=["service"])


class Health(BaseModel):
    """The service is up, and which version answers."""

    status: str
    version: str


@router.get("/v1/health", response_model=Health, summary="Liveness and version")
def health() -> Health:
    """Answers while the service can take requests."""
    return Health(status="ok", version=__version__)
