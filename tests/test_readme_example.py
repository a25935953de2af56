"""The README's worked example, run as written: the numbers it quotes are the service's.

The example is our own scenario; the check is that the text stays true of the code.
"""

import json
import re

import pytest

from service.settings import PROJECT_ROOT

README = (PROJECT_ROOT / "README.md").read_text()
EXAMPLE = README[README.index("## A worked example") : README.index("## Endpoints")]


def test_the_worked_example_says_what_the_service_answers(client):
    body = json.loads(re.search(r"-d '(\{.*?\})'", EXAMPLE, re.S).group(1))
    path = re.search(r"http://127\.0\.0\.1:8000(\S+)", EXAMPLE).group(1)
    result = client.post(path, json=body).json()
    impedances = [float(x) for x in re.findall(r"([\d.]+) ohm(?: and|,)", EXAMPLE.split("The answer")[1])[:2]]
    assert [s["impedance_ohm"] for s in result["sections"]] == pytest.approx(impedances, abs=0.005)
    assert all(f"{s['length_m'] * 1e3:.2f} mm" in EXAMPLE for s in result["sections"])
    verified = result["verified"]
    assert f"worst reflection of {verified['max_reflection']:.4f}" in EXAMPLE
    assert f"({verified['min_return_loss_db']:.1f} dB return loss)" in EXAMPLE
    assert f"at {verified['worst_frequency_hz'] / 1e9:.1f} GHz" in EXAMPLE
    assert verified["meets_spec"] and "`meets_spec` is true" in EXAMPLE
    assert f"against {result['unmatched_max_reflection']:.3f}" in EXAMPLE
    assert f"predicted {result['predicted']['max_reflection']:.4f}" in EXAMPLE
