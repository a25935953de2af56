"""The lab page: static files served by the app itself, with no outside resources."""

from pathlib import Path

from fastapi import APIRouter
from fastapi.responses import FileResponse

WEB_DIR = Path(__file__).resolve().parent.parent / "web"

router = APIRouter(include_in_schema=False)


@router.api_route("/", methods=["GET", "HEAD"])
def lab_page() -> FileResponse:
    """The page; its scripts and styles come from /static."""
    return FileResponse(WEB_DIR / "index.html", media_type="text/html")
