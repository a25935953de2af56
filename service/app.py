"""The ASGI application: routers, middleware and error handling."""

from __future__ import annotations

import gc
from collections.abc import AsyncIterator
from contextlib import asynccontextmanager

from fastapi import FastAPI
from fastapi.middleware.cors import CORSMiddleware
from fastapi.staticfiles import StaticFiles

from service import __version__
from service.api import bulk, docs, health, networks, realization, transformers, web
from service.api.documented import add_key_scheme
from service.api.middleware import AccessLog, ApiKey, BodyLimit, ShutdownAnswer, configure_access_log
from service.api.negotiation import FormatNegotiation
from service.api.security import SecurityHeaders
from service.errors import install_error_handlers
from service.settings import Settings

DESCRIPTION = (
    "Synthesizes impedance-matching transformers (quarter-wave; binomial and Chebyshev stepped "
    "lines in small-reflection or exact theory; Klopfenstein, exponential and triangular tapers) "
    "into resistive, reactive, lumped, measured or Touchstone loads, on an ideal line, microstrip, "
    "stripline or coax, and verifies every design by an exact ABCD cascade. Also: side-by-side "
    "comparison of every method, batches and parameter sweeps, analysis of given sections, "
    "layout drawings, Touchstone and CSV exports, and Monte Carlo manufacturing yield. SI units "
    "throughout; sections are listed from the source side to the load side."
)


YOUNG_COLLECTION_THRESHOLD = 10_000  # allocations between young-generation collections (Python's default: 700)


@asynccontextmanager
async def _freeze_startup_heap(_: FastAPI) -> AsyncIterator[None]:
    """Move everything alive at start-up (libraries, schemas, routes) out of the cycle collector's
    reach: those objects live as long as the process, and scanning them made every full collection
    during a large batch cost tens of milliseconds. A batch's results all stay alive until it is
    answered, so the young generation is collected less often too (figures: README, Measured speed)."""
    gc.freeze()
    _, middle, old = gc.get_threshold()
    gc.set_threshold(YOUNG_COLLECTION_THRESHOLD, middle, old)
    yield


def create_app(settings: Settings | None = None) -> FastAPI:
    """Build the app from settings (from the environment when none are given)."""
    settings = settings or Settings.from_env()
    app = FastAPI(
        title="Stepline",
        version=__version__,
        description=DESCRIPTION,
        lifespan=_freeze_startup_heap,
        docs_url=None,  # served by api/docs.py from local files
        redoc_url=None,
    )
    install_error_handlers(app)
    configure_access_log(settings.access_log)
    app.include_router(health.build_router(settings))
    app.include_router(transformers.build_router(settings))
    app.include_router(networks.build_router(settings))
    app.include_router(realization.build_router(settings))
    app.include_router(bulk.build_router(settings))
    app.include_router(web.router)
    app.include_router(docs.router)
    app.mount(docs.ASSETS_PATH, StaticFiles(directory=docs.ASSETS_DIR), name="docs-assets")
    app.mount("/static", StaticFiles(directory=web.WEB_DIR), name="static")
    # The last added runs first. The key and body checks sit inside the headers and CORS layers,
    # so that their 401 and 413 answers carry the same headers as every other answer, and a
    # browser's CORS preflight (which never carries the key) is answered before the key check.
    app.add_middleware(FormatNegotiation)
    app.add_middleware(ApiKey, key=settings.api_key)
    app.add_middleware(BodyLimit, max_bytes=settings.max_body_bytes, read_timeout_s=settings.body_timeout_s)
    app.add_middleware(SecurityHeaders, frame_ancestors=settings.frame_ancestors)
    if settings.cors_allow_origins:
        app.add_middleware(
            CORSMiddleware,
            allow_origins=settings.cors_allow_origins,
            allow_methods=["GET", "POST"],
            allow_headers=["Content-Type", "Authorization"],
        )
    app.add_middleware(ShutdownAnswer)
    app.add_middleware(AccessLog)
    if settings.api_key:
        _declare_key(app)
    return app


def _declare_key(app: FastAPI) -> None:
    """Make the app's OpenAPI document state the bearer key its /v1 routes need."""
    build = app.openapi

    def openapi() -> dict:
        if app.openapi_schema is None:
            app.openapi_schema = add_key_scheme(build())
        return app.openapi_schema

    app.openapi = openapi


app = create_app()
