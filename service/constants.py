"""Physical constants and the limits shared by several layers, each defined once.

A leaf module: it imports nothing from the project, so settings, schemas, synthesis, physics
and analysis can all take their numbers from here without an import cycle.
"""

from __future__ import annotations

import math

SPEED_OF_LIGHT_M_PER_S = 299_792_458.0  # c0, exact by the SI definition of the metre
MU_0_H_PER_M = 4e-7 * math.pi  # the pre-2019 SI value; the 2019 value differs by 1e-10, far below what matters here
ETA_0_OHM = 376.730313668  # impedance of free space, mu0 c0 (CODATA 2018)
EPSILON_0_F_PER_M = 1.0 / (ETA_0_OHM * SPEED_OF_LIGHT_M_PER_S)  # permittivity of free space, 1 / (eta0 c0)

SMALL_REFLECTION = "small-reflection"  # the name of the approximate theory on the wire
EXACT = "exact"  # the name of the exact theory on the wire

MAX_SECTIONS = 32  # the most quarter-wave sections a stepped design may have
DEFAULT_POINTS = 201  # frequencies in a response curve unless the request says otherwise
MAX_POINTS = 10001
DEFAULT_SEGMENTS = 64  # equal steps a taper is cut into unless the request says otherwise
MAX_SEGMENTS = 1024
MAX_TRIALS = 20000  # Monte Carlo trials one yield request may ask for
YIELD_GRID_POINTS = 201  # frequencies each yield trial is checked at
DEFAULT_MAX_SWEEP_DESIGNS = 100_000
DEFAULT_MIN_FEATURE_M = 1e-4  # narrowest strip or gap a board shop is assumed to make
