"""Stepline: an HTTP service that synthesizes and verifies impedance-matching transformers."""

__version__ = "0.1.0"
