"""Operator settings the pipeline needs, handed down from the app's settings by the api layer."""

from __future__ import annotations

from dataclasses import dataclass

from service.constants import DEFAULT_MIN_FEATURE_M


@dataclass(frozen=True)
class DesignOptions:
    """Operator settings that shape warnings, passed down from the app's settings."""

    min_feature_m: float = DEFAULT_MIN_FEATURE_M
