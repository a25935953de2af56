"""Liveness and version."""

from __future__ import annotations

from fastapi import APIRouter

from service import __version__
from service.schemas.glossary import DescribedModel
from service.settings import Settings


class Health(DescribedModel):
    """The service is up, which version answers, and whether the API needs a key."""

    status: str
    version: str
    key_required: bool


def build_router(settings: Settings) -> APIRouter:
    """The health route."""
    router = APIRouter(tags=["service"])

    @router.get("/v1/health", response_model=Health, summary="Liveness and version")
    def health() -> Health:
        """Answers while the service can take requests."""
        return Health(status="ok", version=__version__, key_required=bool(settings.api_key))

    return router
