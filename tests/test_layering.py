"""The layers of DESIGN.md, held by reading every module's imports (ast)."""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

SERVICE = Path(__file__).resolve().parent.parent / "service"


def _imports(path: Path) -> set[str]:
    names: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text())):
        if isinstance(node, ast.Import):
            names.update(alias.name for alias in node.names)
        elif isinstance(node, ast.ImportFrom) and node.module:
            names.add(node.module)
            names.update(f"{node.module}.{alias.name}" for alias in node.names)
    return {name for name in names if name == "service" or name.startswith("service.")}


def _modules(package: str) -> list[Path]:
    root = SERVICE / package
    return sorted(root.rglob("*.py")) if root.is_dir() else [SERVICE / f"{package}.py"]


FORBIDDEN = [
    ("synthesis", ("service.analysis",)),
    ("analysis", ("service.synthesis",)),
    ("settings", ("service.",)),
    ("schemas", ("service.pipeline", "service.api")),
]


@pytest.mark.parametrize(("package", "prefixes"), FORBIDDEN)
def test_layer_does_not_import(package: str, prefixes: tuple[str, ...]) -> None:
    allowed = {"service.constants"} if package == "settings" else set()
    for path in _modules(package):
        bad = {name for name in _imports(path) if name.startswith(prefixes) and name not in allowed}
        bad = {name for name in bad if not name.startswith("service.constants")}
        assert not bad, f"{path.relative_to(SERVICE)} imports {sorted(bad)}"


def test_only_the_app_imports_api() -> None:
    for path in sorted(SERVICE.rglob("*.py")):
        if path.name == "app.py" or "api" in path.relative_to(SERVICE).parts[:1]:
            continue
        bad = {name for name in _imports(path) if name.startswith("service.api")}
        assert not bad, f"{path.relative_to(SERVICE)} imports {sorted(bad)}"
