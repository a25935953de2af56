"""Run a sweep against a Stepline server and write the designs to a CSV file.

Usage:  python examples/sweep_client.py [http://127.0.0.1:8000] [designs.csv]

The scenario (our own): a 50 ohm feed for a family of patch antennas whose edge resistance
ranges from 120 to 240 ohm, designed as exact Chebyshev transformers of 1 to 3 sections over
5.6-6.0 GHz. The NDJSON stream is read line by line, so memory stays flat for any sweep size.
"""

from __future__ import annotations

import csv
import json
import sys

import httpx

SWEEP = {
    "base": {
        "method": "chebyshev",
        "theory": "exact",
        "source_ohm": 50,
        "load": {"resistance_ohm": 120},
        "band": {"start_hz": 5.6e9, "stop_hz": 6.0e9},
        "max_reflection": 0.1,
    },
    "vary": {"load.resistance_ohm": {"start": 120, "stop": 240, "count": 13}, "sections": [1, 2, 3]},
    "output": "ndjson",
}


def main(base_url: str, path: str) -> None:
    with httpx.Client(base_url=base_url, timeout=300) as client, open(path, "w", newline="") as handle:
        writer = csv.writer(handle)
        writer.writerow(["load_ohm", "sections", "max_reflection", "meets_spec", "impedances_ohm", "error"])
        with client.stream("POST", "/v1/sweeps", json=SWEEP) as response:
            response.raise_for_status()
            lines = response.iter_lines()
            total = json.loads(next(lines))["total"]
            for done, line in enumerate(lines, start=1):
                result = json.loads(line)
                parameters = result["parameters"]
                design = result.get("design")
                if design:
                    impedances = " ".join(f"{s['impedance_ohm']:.2f}" for s in design["sections"])
                    row = [design["verified"]["max_reflection"], design["verified"]["meets_spec"], impedances, ""]
                else:
                    row = ["", "", "", json.dumps(result["error"]["problems"])]
                writer.writerow([parameters["load.resistance_ohm"], parameters["sections"], *row])
                print(f"\r{done}/{total} designs", end="", file=sys.stderr)
    print(f"\nwrote {path}", file=sys.stderr)


if __name__ == "__main__":
    main(
        sys.argv[1] if len(sys.argv) > 1 else "http://127.0.0.1:8000",
        sys.argv[2] if len(sys.argv) > 2 else "designs.csv",
    )
