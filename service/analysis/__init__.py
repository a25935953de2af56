"""The independent exact check: ABCD cascades of realized lines, worst-case search, section
and junction tables, Monte Carlo. Never imports synthesis/, so it stays a check of it."""
