"""File formats: Touchstone reading and writing, CSV tables, SVG drawings."""
