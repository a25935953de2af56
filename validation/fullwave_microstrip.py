"""Full-wave check of microstrip designs: the service's predictions beside an FDTD simulation.

Runs under Debian's Python with Debian's FDTD solver (`apt-get install python3-openems`):

    uvicorn service.app:app --port 8000 &          # the service, with the project's Python
    /usr/bin/python3 validation/fullwave_microstrip.py [--url http://127.0.0.1:8000] [--coarse] [--finer]

For each design it asks the service for the design (with its junction steps included), lays the
strips out as zero-thickness sheets on the substrate with an 18 mm feed line at each end, drives
the source feed line with a band-limited pulse, lets the load feed line run into an absorbing
boundary, and prints |S11| at the first step beside the service's ideal-step and with-step
predictions. The simulated lines are not exactly the nominal ones (the mesh shifts a narrow
strip's impedance by a few per cent), so a thru run (every strip the source width, on the design's
own mesh) gives the simulated source line's impedance, and |S11| is printed both in the nominal
source impedance and in that simulated feed line; the with-step prediction is also repeated with
the load line's simulated impedance (from the passive port's voltages and currents). |S11| needs
no de-embedding of the feed line: a lossless feed only turns its phase. --coarse is the smoke run
(a few seconds a design); --finer refines the mesh 1.5x to show convergence. Not a unit test:
it needs the solver and minutes of CPU.
"""

from __future__ import annotations

import argparse
import json
import os
import tempfile
import time
import urllib.request

import numpy as np

for alias, builtin in (("int", int), ("float", float), ("complex", complex)):
    if alias not in np.__dict__:  # Debian's port helpers still use np.int and np.float, which NumPy 1.24 removed
        setattr(np, alias, builtin)

from CSXCAD import ContinuousStructure  # noqa: E402
from openEMS import openEMS  # noqa: E402

FEED_MM = 18.0
CASES = [
    {
        "name": "3-section Chebyshev, 50 to 20 ohm, 2-4 GHz, eps_r 3.66, h 0.508 mm",
        "design": {
            "method": "chebyshev",
            "theory": "exact",
            "sections": 3,
            "source_ohm": 50,
            "load": {"resistance_ohm": 20},
            "band": {"start_hz": 2e9, "stop_hz": 4e9},
            "medium": {"kind": "microstrip", "eps_r": 3.66, "height_m": 0.508e-3, "thickness_m": 0.0},
        },
    },
    {
        "name": "2-section binomial, 50 to 25 ohm, 8-12 GHz, eps_r 3.0, h 0.254 mm",
        "design": {
            "method": "binomial",
            "theory": "exact",
            "sections": 2,
            "source_ohm": 50,
            "load": {"resistance_ohm": 25},
            "band": {"start_hz": 8e9, "stop_hz": 12e9},
            "medium": {"kind": "microstrip", "eps_r": 3.0, "height_m": 0.254e-3, "thickness_m": 0.0},
        },
    },
]


def post(url: str, path: str, body: dict) -> dict:
    request = urllib.request.Request(
        url + path, data=json.dumps(body).encode(), headers={"content-type": "application/json"}
    )
    with urllib.request.urlopen(request, timeout=120) as answer:
        return json.load(answer)


def predictions(url: str, design_body: dict, frequencies: np.ndarray) -> dict:
    """The design and the service's |S11| at the given frequencies: ideal steps and with steps."""
    design = post(
        url,
        "/v1/transformers/" + design_body["method"],
        {**{k: v for k, v in design_body.items() if k != "method"}, "junction_effects": "include"},
    )
    sections = [{"width_m": s["width_m"], "length_m": s["length_m"]} for s in design["sections"]]
    analysis = {k: v for k, v in design_body.items() if k not in ("method", "theory", "sections")}
    analysis |= {
        "sections": sections,
        "band": {"start_hz": float(frequencies[0]), "stop_hz": float(frequencies[-1])},
        "points": len(frequencies),
    }
    ideal = post(url, "/v1/networks/analyze", analysis)
    steps = post(url, "/v1/networks/analyze", analysis | {"junction_effects": "include"})
    source = post(
        url,
        "/v1/networks/analyze",
        analysis | {"sections": [{"impedance_ohm": design_body["source_ohm"], "length_m": 0.01}]},
    )
    load = post(
        url,
        "/v1/networks/analyze",
        analysis | {"sections": [{"impedance_ohm": design_body["load"]["resistance_ohm"], "length_m": 0.01}]},
    )
    return {
        "design": design,
        "analysis": analysis,
        "ideal": np.array(ideal["response"]["reflection_magnitude"]),
        "steps": np.array(steps["response"]["reflection_magnitude"]),
        "source_line": source["sections"][0],
        "load_line": load["sections"][0],
    }


def layout(predicted: dict) -> tuple[list[float], list[float]]:
    """Strip widths and lengths in mm, source feed line first and load feed line last."""
    sections = predicted["design"]["sections"]
    widths = [predicted["source_line"]["width_m"], *(s["width_m"] for s in sections), predicted["load_line"]["width_m"]]
    lengths = [FEED_MM, *(s["length_m"] * 1e3 for s in sections), FEED_MM]
    return [w * 1e3 for w in widths], lengths


def simulate(
    medium: dict,
    strip_widths: list[float],
    lengths: list[float],
    mesh_widths: list[float],
    frequencies: np.ndarray,
    resolution_factor: float,
    coarse: bool,
) -> dict:
    """One FDTD run of the strips (mm) on a mesh laid for mesh_widths: the total voltage and current
    in the source feed line at its measurement plane, and the load feed line's simulated impedance
    and eps_eff.

    The mesh depends only on mesh_widths and lengths, so a thru line (every strip the source width)
    meshed for the design's widths sees the same cells as the design: its load-line impedance is the
    simulated source line's impedance on that mesh.
    """
    h = medium["height_m"] * 1e3
    edges = np.concatenate(([0.0], np.cumsum(lengths)))
    total = edges[-1]
    f_start, f_stop = frequencies[0], frequencies[-1]
    f0, fc = (f_start + f_stop) / 2, (f_stop - f_start) / 2 * 1.3

    fdtd = openEMS(NrTS=6000 if coarse else 60000, EndCriteria=1e-3 if coarse else 1e-4)
    fdtd.SetGaussExcite(f0, fc)  # band-limited: no DC charge left on the strips
    fdtd.SetBoundaryCond(["PML_8", "PML_8", "MUR", "MUR", "PEC", "MUR"])
    csx = ContinuousStructure()
    fdtd.SetCSX(csx)
    mesh = csx.GetGrid()
    mesh.SetDeltaUnit(1e-3)
    wavelength = 299792458.0 / f_stop / np.sqrt(medium["eps_r"]) * 1e3
    resolution = min(wavelength / (12 if coarse else 30), min(mesh_widths) / (2 if coarse else 4)) / resolution_factor
    half_width = max(mesh_widths) / 2 + 6 * h + 2
    y_lines = [0.0, -half_width, half_width] + [s * w / 2 for w in mesh_widths for s in (-1, 1)]
    if not coarse:  # the third/two-thirds rule at every strip edge
        y_lines += [
            s * (w / 2 + d) for w in mesh_widths for s in (-1, 1) for d in (-resolution / 3, 2 * resolution / 3)
        ]
    mesh.AddLine("x", list(edges))
    mesh.AddLine("y", y_lines)
    mesh.AddLine("z", [*np.linspace(0, h, 3 if coarse else 5), 9 * h])
    mesh.SmoothMeshLines("x", resolution, 1.4)
    mesh.SmoothMeshLines("y", resolution, 1.4)
    mesh.SmoothMeshLines("z", h / 2, 1.4)

    substrate = csx.AddMaterial("substrate", epsilon=medium["eps_r"])
    substrate.AddBox([0, -half_width, 0], [total, half_width, h])
    metal = csx.AddMetal("strips")
    for start, stop, width in zip(edges[1:-2], edges[2:-1], strip_widths[1:-1], strict=True):
        metal.AddBox([start, -width / 2, h], [stop, width / 2, h], priority=10)
    source_port = fdtd.AddMSLPort(
        1,
        metal,
        [0, -strip_widths[0] / 2, h],
        [FEED_MM, strip_widths[0] / 2, 0],
        "x",
        "z",
        excite=-1,
        FeedShift=10 * resolution,
        MeasPlaneShift=FEED_MM / 2,
        priority=10,
    )
    load_port = fdtd.AddMSLPort(
        2,
        metal,
        [total, -strip_widths[-1] / 2, h],
        [total - FEED_MM, strip_widths[-1] / 2, 0],
        "x",
        "z",
        MeasPlaneShift=FEED_MM / 2,
        priority=10,
    )
    cells = len(mesh.GetLines("x")) * len(mesh.GetLines("y")) * len(mesh.GetLines("z"))
    path = tempfile.mkdtemp(prefix="stepline-fdtd-")
    started = time.monotonic()
    fdtd.Run(path, verbose=0, cleanup=True, numThreads=os.cpu_count())
    seconds = time.monotonic() - started
    source_port.CalcPort(path, frequencies)
    load_port.CalcPort(path, frequencies)
    return {
        "source_voltage": source_port.uf_tot,
        "source_current": source_port.if_tot,
        "load_impedance": load_port.Z_ref,
        "load_eps_eff": (load_port.beta * 299792458.0 / (2 * np.pi * frequencies)).real ** 2,
        "cells": cells,
        "seconds": seconds,
    }


def reflection(run: dict, reference_impedance: np.ndarray | float) -> np.ndarray:
    """|S11| in the source feed line: its total voltage and current split into waves on a line of
    the given impedance (the split openEMS's port does with its ref_impedance)."""
    voltage, current = run["source_voltage"], run["source_current"]
    return np.abs((voltage - reference_impedance * current) / (voltage + reference_impedance * current))


def measured_load(frequencies: np.ndarray, impedance: np.ndarray) -> dict:
    """A simulated line impedance as the service's measured load."""
    points = [
        {"frequency_hz": float(f), "resistance_ohm": float(z.real), "reactance_ohm": float(z.imag)}
        for f, z in zip(frequencies, impedance, strict=True)
    ]
    return {"measured": points}


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--url", default="http://127.0.0.1:8000")
    parser.add_argument("--coarse", action="store_true", help="smoke run: a coarse mesh and a short run")
    parser.add_argument("--finer", action="store_true", help="also run a 1.5x finer mesh (convergence)")
    parser.add_argument("--cases", type=int, default=len(CASES))
    arguments = parser.parse_args()
    for case in CASES[: arguments.cases]:
        band = case["design"]["band"]
        medium = case["design"]["medium"]
        frequencies = np.linspace(band["start_hz"], band["stop_hz"], 21)
        predicted = predictions(arguments.url, case["design"], frequencies)
        widths, lengths = layout(predicted)
        factors = [1.0, 1.5] if arguments.finer else [1.0]
        print(f"\n{case['name']}")
        for factor in factors:
            mesh = {"mesh_widths": widths, "frequencies": frequencies, "resolution_factor": factor}
            thru = simulate(medium, [widths[0]] * len(widths), lengths, coarse=arguments.coarse, **mesh)
            run = simulate(medium, widths, lengths, coarse=arguments.coarse, **mesh)
            source_line = thru["load_impedance"]
            raw = reflection(run, case["design"]["source_ohm"])
            in_feed = reflection(run, source_line)
            with_load = np.array(
                post(
                    arguments.url,
                    "/v1/networks/analyze",
                    predicted["analysis"]
                    | {"load": measured_load(frequencies, run["load_impedance"]), "junction_effects": "include"},
                )["response"]["reflection_magnitude"]
            )
            centre = len(frequencies) // 2
            print(
                f"  mesh x{factor:g}: {run['cells']} cells, {run['seconds']:.0f} s (thru line {thru['seconds']:.0f} s)"
            )
            for name, nominal, simulated, eps_eff, service in (
                ("source", case["design"]["source_ohm"], source_line, thru["load_eps_eff"], predicted["source_line"]),
                (
                    "load",
                    case["design"]["load"]["resistance_ohm"],
                    run["load_impedance"],
                    run["load_eps_eff"],
                    predicted["load_line"],
                ),
            ):
                print(
                    f"  simulated {name} feed line {np.mean(simulated.real):.2f}{np.mean(simulated.imag):+.2f}j ohm "
                    f"(nominal {nominal}), eps_eff at the band centre {eps_eff[centre]:.4f} "
                    f"(service {service['eps_eff']:.4f})"
                )
            print("  GHz    FDTD in 50 ohm  in its feed   ideal   steps  steps+simulated load")
            for k in range(0, len(frequencies), 2):
                print(
                    f"  {frequencies[k] / 1e9:5.2f}  {raw[k]:12.4f}  {in_feed[k]:11.4f}  {predicted['ideal'][k]:6.4f}  "
                    f"{predicted['steps'][k]:6.4f}  {with_load[k]:.4f}"
                )
            print(
                f"  worst in band: FDTD {raw.max():.4f}, ideal {predicted['ideal'].max():.4f}, "
                f"steps {predicted['steps'].max():.4f}, steps+simulated load {with_load.max():.4f}, "
                f"FDTD in its simulated feed line {in_feed.max():.4f}"
            )


if __name__ == "__main__":
    main()
