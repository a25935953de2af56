"""Runtime settings, read once from environment variables with the STEPLINE_ prefix.

A leaf of the project: it imports only constants, so any layer may read settings without a cycle.

Each field `name` is read from STEPLINE_<NAME>; lists are comma-separated. Every field has a safe
default for a lab bench.
"""

from __future__ import annotations

import dataclasses
import os
from dataclasses import dataclass, field
from pathlib import Path

from service.constants import DEFAULT_MAX_SWEEP_DESIGNS, DEFAULT_MIN_FEATURE_M, MAX_POINTS, MAX_SEGMENTS, MAX_TRIALS

PROJECT_ROOT = Path(__file__).resolve().parent.parent


@dataclass(frozen=True)
class Settings:
    """Everything an operator may set."""

    examples_dir: Path = PROJECT_ROOT / "openapi_examples"
    cors_allow_origins: list[str] = field(default_factory=list)
    frame_ancestors: list[str] = field(default_factory=list)
    api_key: str = ""  # empty: no key needed (a lab bench); set it for shared deployments
    min_feature_m: float = DEFAULT_MIN_FEATURE_M
    max_body_bytes: int = 4 * 1024 * 1024
    max_points: int = MAX_POINTS  # settings may lower the schema caps, never raise them
    max_segments: int = MAX_SEGMENTS
    max_trials: int = MAX_TRIALS
    max_batch_items: int = 10_000
    max_sweep_designs: int = DEFAULT_MAX_SWEEP_DESIGNS
    max_answer_designs: int = 20_000  # designs in one JSON (not streamed) sweep answer, held in memory whole
    max_answer_curve_points: int = 1_000_000  # response-curve points in one batch or JSON sweep answer
    compute_budget_s: float = 20.0  # estimated compute one request may take, in seconds
    access_log: bool = True  # one JSON line per request on standard output
    deadline_s: float = 40.0  # accepted work still running after this is stopped (503)
    body_timeout_s: float = 10.0  # a request body not received whole by then is refused (408)

    @classmethod
    def from_env(cls, environ: dict[str, str] | None = None) -> Settings:
        """Settings from STEPLINE_* environment variables, defaults elsewhere."""
        environ = os.environ if environ is None else environ
        defaults = cls()
        values = {}
        for setting in dataclasses.fields(cls):
            raw = environ.get(f"STEPLINE_{setting.name.upper()}")
            if raw is None:
                continue
            kind = type(getattr(defaults, setting.name))
            if kind is list:
                values[setting.name] = [v.strip() for v in raw.split(",") if v.strip()]
            elif kind is bool:
                values[setting.name] = raw.strip().lower() in ("1", "true", "yes", "on")
            else:
                values[setting.name] = kind(raw)
        return cls(**values)
