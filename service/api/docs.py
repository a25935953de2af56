"""The interactive API docs, served with the docs viewer's own files from an installed package
(swagger-ui-bundle-v2 on the registry) instead of a CDN, so they work on a lab network with no
internet."""

from fastapi import APIRouter
from fastapi.openapi.docs import get_swagger_ui_html
from fastapi.responses import HTMLResponse
from swagger_ui_bundle import swagger_ui_path

ASSETS_PATH = "/docs-assets"
ASSETS_DIR = swagger_ui_path

router = APIRouter(include_in_schema=False)


@router.get("/docs")
def interactive_docs() -> HTMLResponse:
    """The docs viewer page, loading its script and style from this server."""
    return get_swagger_ui_html(
        openapi_url="/openapi.json",
        title="Stepline API",
        swagger_js_url=f"{ASSETS_PATH}/swagger-ui-bundle.js",
        swagger_css_url=f"{ASSETS_PATH}/swagger-ui.css",
        swagger_favicon_url="data:,",
    )
