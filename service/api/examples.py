"""Request examples for the OpenAPI docs, read from openapi_examples/<path after /v1/>/*.json.

Each file holds {"summary": ..., "description": ..., "value": {...request body...}}; the same
files are POSTed by the test suite, so every documented example is known to work.
"""

from __future__ import annotations

import json
from pathlib import Path
from typing import Any


def request_examples(examples_dir: Path, endpoint: str) -> dict[str, dict[str, Any]]:
    """OpenAPI examples for one endpoint, keyed by file stem; empty when none are shipped."""
    folder = examples_dir / endpoint
    if not folder.is_dir():
        return {}
    return {path.stem: json.loads(path.read_text()) for path in sorted(folder.glob("*.json"))}
