"""POST /v1/layouts: Gerber X2 files read back by gerbonara (a general-purpose Gerber library)."""

import io
import itertools
import json
import zipfile
from pathlib import Path

import pytest
from gerbonara import GerberFile
from gerbonara.graphic_objects import Region

EXAMPLE = json.loads((Path(__file__).parent.parent / "openapi_examples/layouts/sensor-board.json").read_text())["value"]
MICROSTRIP = EXAMPLE["design"]["medium"]
STRIPLINE = {"kind": "stripline", "eps_r": 2.2, "ground_spacing_m": 1.6e-3, "thickness_m": 17e-6}


def _files(client, body) -> dict[str, str]:
    response = client.post("/v1/layouts", json=body)
    assert response.status_code == 200, response.text
    assert response.headers["content-type"] == "application/zip"
    bundle = zipfile.ZipFile(io.BytesIO(response.content))
    return {name: bundle.read(name).decode() for name in bundle.namelist()}


def _rectangles_mm(text: str) -> list[tuple[float, float, float, float]]:
    """(x0, x1, y0, y1) of every region, as gerbonara reads them, in millimetres."""
    layer = GerberFile.from_string(text)
    boxes = []
    for item in layer.objects:
        assert isinstance(item, Region)
        xs, ys = [p[0] for p in item.outline], [p[1] for p in item.outline]
        boxes.append((min(xs), max(xs), min(ys), max(ys)))
    return boxes


CASES = [
    ("chebyshev compensated, microstrip", EXAMPLE),
    (
        "binomial, 32 sections, stripline",
        EXAMPLE
        | {
            "design": EXAMPLE["design"]
            | {"method": "binomial", "sections": 32, "medium": STRIPLINE, "junction_effects": "ignore"}
        },
    ),
    (
        "taper, 256 steps, microstrip",
        EXAMPLE
        | {
            "design": {k: v for k, v in EXAMPLE["design"].items() if k != "theory"}
            | {"method": "taper", "segments": 256, "junction_effects": "ignore"}
        },
    ),
]


@pytest.mark.parametrize("name, body", CASES, ids=[c[0] for c in CASES])
def test_every_width_and_length_reads_back_to_one_micron(client, name, body):
    files = _files(client, body)
    copper = next(text for file, text in files.items() if file.endswith("-copper.gbr"))
    profile = next(text for file, text in files.items() if file.endswith("-profile.gbr"))
    design = client.post("/v1/batch", json={"requests": [body["design"]], "include_curves": False}).json()
    sections = design["results"][0]["design"]["sections"]
    boxes = _rectangles_mm(copper)
    assert len(boxes) == len(sections) + 2  # the two feed lines
    feed = body["feed_length_m"] * 1e3
    assert boxes[0][1] - boxes[0][0] == pytest.approx(feed, abs=1e-3)
    assert boxes[-1][1] - boxes[-1][0] == pytest.approx(feed, abs=1e-3)
    for (x0, x1, y0, y1), section in zip(boxes[1:-1], sections, strict=True):
        assert x1 - x0 == pytest.approx(section["length_m"] * 1e3, abs=1e-3)
        assert y1 - y0 == pytest.approx(section["width_m"] * 1e3, abs=1e-3)
        assert y0 == pytest.approx(-y1, abs=1e-6)  # centred on the line's axis
    for left, right in itertools.pairwise(boxes):
        assert right[0] == pytest.approx(left[1], abs=1e-6)  # each strip starts where the last ends
    assert "%TF.FileFunction,Copper," in copper and "%TA.AperFunction,Conductor*%" in copper
    assert "%TF.FileFunction,Profile,NP*%" in profile and "%MOMM*%" in copper and "%MOMM*%" in profile
    outline = GerberFile.from_string(profile).bounding_box()
    assert outline[1][0] == pytest.approx(boxes[-1][1], abs=0.1)  # the board is as long as the copper


def test_the_source_feed_line_has_the_source_impedance(client):
    files = _files(client, EXAMPLE)
    copper = next(text for file, text in files.items() if file.endswith("-copper.gbr"))
    first = _rectangles_mm(copper)[0]
    sections = [{"impedance_ohm": 50.0, "length_m": 0.01}]
    analysis = {k: v for k, v in EXAMPLE["design"].items() if k not in ("method", "theory", "junction_effects")}
    width = client.post("/v1/networks/analyze", json=analysis | {"sections": sections}).json()["sections"][0]["width_m"]
    assert first[3] - first[2] == pytest.approx(width * 1e3, abs=1e-3)


def test_only_planar_lines_have_layouts(client):
    coax = EXAMPLE | {
        "design": EXAMPLE["design"]
        | {"medium": {"kind": "coax", "eps_r": 2.1, "outer_diameter_m": 7e-3}, "junction_effects": "ignore"}
    }
    response = client.post("/v1/layouts", json=coax)
    assert response.status_code == 422 and response.json()["problems"][0]["field"] == "design.medium"
