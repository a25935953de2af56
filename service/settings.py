"""Runtime settings, read once from environment variables with the STEPLINE_ prefix."""

from __future__ import annotations

import os
from dataclasses import dataclass, field
from pathlib import Path

from service.designer.lines import DesignOptions
from service.schemas.bulk import DEFAULT_MAX_BATCH_ITEMS, DEFAULT_MAX_SWEEP_DESIGNS

PROJECT_ROOT = Path(__file__).resolve().parent.parent


def _origins(raw: str) -> list[str]:
    return [origin.strip() for origin in raw.split(",") if origin.strip()]


@dataclass(frozen=True)
class Settings:
    """Everything an operator may set; every field has a safe default for a lab bench."""

    examples_dir: Path = PROJECT_ROOT / "openapi_examples"
    cors_allow_origins: list[str] = field(default_factory=list)
    frame_ancestors: list[str] = field(default_factory=list)
    min_feature_m: float = 1e-4
    max_batch_items: int = DEFAULT_MAX_BATCH_ITEMS
    max_sweep_designs: int = DEFAULT_MAX_SWEEP_DESIGNS

    def design_options(self) -> DesignOptions:
        """The settings the designer needs."""
        return DesignOptions(min_feature_m=self.min_feature_m)

    @classmethod
    def from_env(cls) -> Settings:
        """Settings from STEPLINE_* environment variables, defaults elsewhere."""
        defaults = cls()
        return cls(
            examples_dir=Path(os.environ.get("STEPLINE_EXAMPLES_DIR", defaults.examples_dir)),
            cors_allow_origins=_origins(os.environ.get("STEPLINE_CORS_ALLOW_ORIGINS", "")),
            frame_ancestors=_origins(os.environ.get("STEPLINE_FRAME_ANCESTORS", "")),
            min_feature_m=float(os.environ.get("STEPLINE_MIN_FEATURE_M", defaults.min_feature_m)),
            max_batch_items=int(os.environ.get("STEPLINE_MAX_BATCH_ITEMS", defaults.max_batch_items)),
            max_sweep_designs=int(os.environ.get("STEPLINE_MAX_SWEEP_DESIGNS", defaults.max_sweep_designs)),
        )
