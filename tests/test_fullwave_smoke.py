"""A coarse full-wave smoke run of validation/fullwave_microstrip.py (openEMS under Debian's Python):
the script lays out a design the service returns, simulates it, and prints the comparison.

The figures that matter come from the script's full runs (README, Full-wave check); this run only
proves that the script, the solver and the service still work together. Skipped where Debian's
python3-openems is not installed (.ci/run installs it).
"""

import re
import subprocess
from pathlib import Path

import pytest

from tests.conftest import live_server

DEBIAN_PYTHON = "/usr/bin/python3"
SCRIPT = Path(__file__).resolve().parent.parent / "validation" / "fullwave_microstrip.py"


def _solver_available() -> bool:
    if not Path(DEBIAN_PYTHON).exists():
        return False
    probe = subprocess.run([DEBIAN_PYTHON, "-c", "import openEMS, CSXCAD"], capture_output=True, check=False)
    return probe.returncode == 0


@pytest.mark.skipif(not _solver_available(), reason="Debian's python3-openems is not installed")
def test_a_coarse_full_wave_run_compares_with_the_service(tmp_path):
    with live_server() as url:
        run = subprocess.run(
            [DEBIAN_PYTHON, str(SCRIPT), "--url", url, "--coarse", "--cases", "1"],
            capture_output=True,
            text=True,
            timeout=600,
            cwd=tmp_path,
            check=False,
        )
    assert run.returncode == 0, run.stderr[-2000:]
    worst = re.search(r"worst in band: FDTD ([0-9.]+), ideal ([0-9.]+), steps ([0-9.]+)", run.stdout)
    assert worst, run.stdout[-2000:]
    fdtd, ideal, steps = map(float, worst.groups())
    assert 0.0 < fdtd < 0.3  # a coarse mesh: only a sanity bound (the design's own figure is about 0.02)
    assert 0.0 < ideal < 0.1 and 0.0 < steps < 0.1
