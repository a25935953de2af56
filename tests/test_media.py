"""Physical media: microstrip against scikit-rf, stripline and coax against textbook values."""

import math

import numpy as np
import pytest
import scipy.constants
import skrf
from skrf.media import MLine

from service.physics.media import CoaxLine, MicrostripLine, StriplineLine
from service.physics.media.microstrip import dispersive_line, static_line

SUBSTRATES = [  # (eps_r, height, thickness): FR-4-like, a ceramic-filled laminate, a PTFE board
    (4.4, 1.6e-3, 35e-6),
    (10.2, 0.635e-3, 17e-6),
    (2.2, 0.508e-3, 0.0),
]


def reference_line(frequency, width, eps_r, height, thickness):
    """scikit-rf's microstrip with the same published models: Hammerstad-Jensen, Kirschning-Jansen."""
    return MLine(
        frequency=frequency,
        z0_port=50,
        w=width,
        h=height,
        t=thickness or None,
        ep_r=eps_r,
        model="hammerstadjensen",
        disp="kirschningjansen",
        diel="frequencyinvariant",
        tand=0,
        rough=0,
    )


@pytest.mark.parametrize("eps_r, height, thickness", SUBSTRATES)
@pytest.mark.parametrize("impedance", [25.0, 50.0, 90.0])
def test_microstrip_width_and_permittivity_against_scikit_rf(eps_r, height, thickness, impedance):
    frequency = skrf.Frequency(0.5, 12.0, 7, unit="GHz")
    medium = MicrostripLine(eps_r, height, thickness)
    width = float(medium.geometry_for(np.array([impedance]), 3e9)[0])
    reference = reference_line(frequency, width, eps_r, height, thickness)
    ours = medium.parameters(np.array([width]), frequency.f[:, None])
    assert ours.impedance_ohm[:, 0] == pytest.approx(np.real(reference.z0_characteristic), rel=0.01)
    assert ours.eps_eff[:, 0] == pytest.approx(np.real(reference.ep_reff_f), rel=0.01)
    static_z, static_eps = static_line(np.array([width / height]), eps_r, thickness / height)
    assert static_z[0] == pytest.approx(float(np.real(reference.zl_eff)), rel=1e-6)
    assert static_eps[0] == pytest.approx(float(np.real(reference.ep_reff)), rel=1e-6)


def test_fifty_ohm_on_fr4_is_about_three_millimetres():
    # A 50 ohm microstrip on 1.6 mm FR-4 (eps_r about 4.4) is about 3 mm wide (common practice, no source).
    width = MicrostripLine(4.4, 1.6e-3, 35e-6).geometry_for(np.array([50.0]), 1e9)[0]
    assert width == pytest.approx(3.0e-3, rel=0.05)


def test_dispersion_raises_eps_eff_toward_eps_r():
    # Kirschning and Jansen (1982): eps_eff rises monotonically with frequency toward eps_r.
    f = np.linspace(0.1e9, 60e9, 200)
    _, eps = dispersive_line(np.array([1.9]), 4.4, 0.02, 1.6e-3, f[:, None])
    assert np.all(np.diff(eps[:, 0]) > 0)
    assert eps[0, 0] < eps[-1, 0] < 4.4


def test_coax_air_line_ratio():
    # Z = (eta0 / (2 pi sqrt(eps_r))) ln(b/a): a 50 ohm air line has b/a = e^(50/60) = 2.30
    # (from the formula, with eta0 / 2 pi taken as 60 ohm).
    inner = CoaxLine(1.0, 7.0e-3).geometry_for(np.array([50.0]), 1e9)[0]
    assert 7.0e-3 / inner == pytest.approx(math.exp(50 / 60), rel=1e-3)


def test_stripline_textbook_example():
    # Pozar, Microwave Engineering, 3rd/4th ed., Example 3.5 (from memory): a 50 ohm stripline with
    # b = 0.32 cm and eps_r = 2.20 (zero thickness) has W = 0.266 cm.
    width = StriplineLine(2.2, 3.2e-3, 0.0).geometry_for(np.array([50.0]), 10e9)[0]
    assert width == pytest.approx(2.66e-3, rel=0.005)


def test_thick_strips_are_narrower_for_the_same_impedance():
    # A thicker strip has more fringing capacitance, so the same impedance needs less width (Cohn 1955).
    thin = StriplineLine(3.0, 2e-3, 0.0).geometry_for(np.array([50.0]), 1e9)[0]
    thick = StriplineLine(3.0, 2e-3, 0.1e-3).geometry_for(np.array([50.0]), 1e9)[0]
    assert thick < thin


MICROSTRIP = {"kind": "microstrip", "eps_r": 4.4, "height_m": 1.6e-3, "thickness_m": 35e-6}


def post(client, body):
    response = client.post("/v1/transformers/chebyshev", json=body)
    assert response.status_code == 200, response.text
    return response.json()


def test_sections_carry_geometry_and_quarter_waves_at_the_design_frequency(client, base_request):
    result = post(client, base_request | {"sections": 3, "medium": MICROSTRIP, "theory": "exact"})
    assert result["medium"] == "microstrip" and result["velocity_factor"] is None
    assert result["verified"]["includes_dispersion"] and not result["verified"]["includes_losses"]
    centre = skrf.Frequency(2.0, 2.0, 1, unit="GHz")
    for section in result["sections"]:
        assert section["width_m"] > 0 and section["inner_diameter_m"] is None
        assert section["electrical_length_deg"] == pytest.approx(90.0, rel=1e-9)
        # A quarter of the guided wavelength that scikit-rf's MLine gives the returned width at the
        # band centre (its thick-strip correction differs from ours by about 2e-4 in eps_eff).
        reference = reference_line(centre, section["width_m"], 4.4, 1.6e-3, 35e-6)
        guided = scipy.constants.c / (2e9 * math.sqrt(float(np.real(reference.ep_reff_f[0]))))
        assert section["length_m"] == pytest.approx(guided / 4, rel=3e-4)


def test_quarter_waves_shrink_with_dispersion(client, base_request):
    # eps_eff grows with frequency, so a quarter wave at a higher design frequency is shorter than
    # the inverse frequency ratio alone would make it (Kirschning and Jansen 1982).
    low = post(client, base_request | {"sections": 1, "medium": MICROSTRIP})
    high_band = {"start_hz": 10e9, "stop_hz": 30e9}
    high = post(client, base_request | {"sections": 1, "medium": MICROSTRIP, "band": high_band})
    assert high["sections"][0]["eps_eff"] > low["sections"][0]["eps_eff"]
    assert high["sections"][0]["length_m"] * 20e9 < low["sections"][0]["length_m"] * 2e9


def test_losses_add_insertion_loss(client, base_request):
    lossy = MICROSTRIP | {"loss_tangent": 0.02, "conductivity_s_per_m": 5.8e7, "roughness_m": 1e-6}
    result = post(client, base_request | {"sections": 3, "medium": lossy})
    assert result["verified"]["includes_losses"]
    losses = result["response"]["insertion_loss_db"]
    assert len(losses) == base_request["points"] and min(losses) > 0
    worse = post(client, base_request | {"sections": 3, "medium": lossy | {"loss_tangent": 0.04}})
    assert worse["verified"]["max_insertion_loss_db"] > result["verified"]["max_insertion_loss_db"]


def test_coax_sections_get_inner_diameters(client, base_request):
    coax = {"kind": "coax", "eps_r": 2.1, "outer_diameter_m": 3.5e-3}
    result = post(client, base_request | {"sections": 2, "medium": coax})
    for section in result["sections"]:
        # Z = (eta0 / (2 pi sqrt(eps_r))) ln(b/a) (Pozar, Microwave Engineering, Table 2.1, from
        # memory), eta0 = mu0 c from SciPy's CODATA constants.
        eta0 = scipy.constants.mu_0 * scipy.constants.c
        expected = 3.5e-3 / math.exp(section["impedance_ohm"] * 2 * math.pi * math.sqrt(2.1) / eta0)
        assert section["inner_diameter_m"] == pytest.approx(expected, rel=1e-9)


def test_narrow_strip_is_flagged(client, base_request):
    thin = {"kind": "microstrip", "eps_r": 10.2, "height_m": 0.1e-3, "thickness_m": 5e-6}
    result = post(client, base_request | {"load": {"resistance_ohm": 120}, "sections": 2, "medium": thin})
    assert any("manufacturable minimum" in w for w in result["warnings"])


@pytest.mark.parametrize(
    "medium, field",
    [
        (MICROSTRIP | {"eps_r": 0.5}, "medium.eps_r"),
        (MICROSTRIP | {"height_m": 0.0}, "medium.height_m"),
        (MICROSTRIP | {"thickness_m": -1e-6}, "medium.thickness_m"),
        ({"kind": "coax", "eps_r": 2.1, "outer_diameter_m": -1.0}, "medium.outer_diameter_m"),
        ({"kind": "stripline", "eps_r": 2.2, "ground_spacing_m": 1e-3, "thickness_m": 0.6e-3}, "medium"),
        ({"kind": "waveguide", "eps_r": 1.0}, "medium"),
    ],
)
def test_bad_media_name_the_field(client, base_request, medium, field):
    response = client.post("/v1/transformers/binomial", json=base_request | {"medium": medium})
    assert response.status_code == 422
    assert field in [p["field"] for p in response.json()["problems"]]


def test_unrealizable_impedance_is_refused(client, base_request):
    body = base_request | {"load": {"resistance_ohm": 1e5}, "sections": 1, "medium": MICROSTRIP}
    response = client.post("/v1/transformers/quarter-wave", json=body)
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == "medium"


def test_velocity_factor_and_medium_together_are_refused(client, base_request):
    body = base_request | {"velocity_factor": 0.7, "medium": MICROSTRIP}
    response = client.post("/v1/transformers/binomial", json=body)
    assert response.status_code == 422


def test_a_substrate_too_thick_for_the_frequency_is_refused_in_plain_words(client, base_request):
    # 0.1 m of eps_r 128 at 1.5 GHz is far outside the dispersion model's f h range: the answer
    # must be a 422 on the medium that says why, not a realizable range of "nan to nan ohm".
    thick = {"kind": "microstrip", "eps_r": 128, "height_m": 0.1, "thickness_m": 0.0}
    response = client.post("/v1/transformers/chebyshev", json=base_request | {"sections": 2, "medium": thick})
    assert response.status_code == 422
    problem = response.json()["problems"][0]
    assert problem["field"] == "medium"
    assert "nan" not in problem["message"] and "too large for that frequency" in problem["message"]


LOSS_GRID = [(eps_r, h) for eps_r in (2.2, 4.4, 10.2) for h in (0.25e-3, 0.8e-3, 1.6e-3)]


@pytest.mark.filterwarnings("ignore::RuntimeWarning")  # scikit-rf warns where t < 3 skin depths
@pytest.mark.parametrize("eps_r, height", LOSS_GRID)
@pytest.mark.parametrize("impedance", [20.0, 50.0, 120.0])
def test_microstrip_losses_against_scikit_rf(eps_r, height, impedance):
    # scikit-rf's MLine: conductor loss by Hammerstad and Jensen with the current distribution
    # factor and Hammerstad's roughness factor, dielectric loss by the filling factor.
    conductivity, roughness, tand, thickness = 5.8e7, 0.5e-6, 0.003, 35e-6
    top = min(30.0, 25.0 / (height * 1e3))  # Kirschning-Jansen validity: f h <= 25 GHz mm
    frequency = skrf.Frequency(1.0, top, 6, unit="GHz")
    medium = MicrostripLine(
        eps_r, height, thickness, loss_tangent=tand, conductivity_s_per_m=conductivity, roughness_m=roughness
    )
    width = float(medium.geometry_for(np.array([impedance]), 3e9)[0])
    reference = MLine(
        frequency=frequency,
        z0_port=50,
        w=width,
        h=height,
        t=thickness,
        ep_r=eps_r,
        model="hammerstadjensen",
        disp="kirschningjansen",
        diel="frequencyinvariant",
        tand=tand,
        rho=1 / conductivity,
        rough=roughness,
    )
    ours = medium.parameters(np.array([width]), frequency.f[:, None]).attenuation_np_per_m[:, 0]
    expected = reference.alpha_conductor + reference.alpha_dielectric
    np.testing.assert_allclose(ours, expected, rtol=0.02)  # measured: within 1.3% over this grid


def test_wide_stripline_conductor_loss_tends_to_the_parallel_plate_limit():
    # Two parallel-plate halves: the strip's two faces and the two grounds each carry the current
    # over width W, so alpha_c -> Rs / (2 W Z0) as W / b grows (plane-wave skin-effect loss, Pozar
    # ch. 2, from memory); Pozar's eq. 3.199 approaches it from above.
    b, t, conductivity, f = 1.6e-3, 17e-6, 5.8e7, 2e9
    medium = StriplineLine(2.2, b, t, conductivity_s_per_m=conductivity)
    rs = math.sqrt(math.pi * f * scipy.constants.mu_0 / conductivity)
    ratios = []
    for width in (10 * b, 40 * b, 160 * b):
        params = medium.parameters(np.array([width]), np.array([[f]]))
        limit = rs / (2 * width * params.impedance_ohm[0, 0])
        ratios.append(params.attenuation_np_per_m[0, 0] / limit)
    assert ratios == sorted(ratios, reverse=True) and 1.0 < ratios[-1] < 1.05


@pytest.mark.parametrize("impedance", [20.0, 50.0, 90.0, 120.0])
def test_stripline_conductor_loss_is_the_published_formula(impedance):
    # Pozar, Microwave Engineering, eq. 3.199-3.200 (from memory), written out here from the book:
    # sqrt(eps_r) Z0 < 120: alpha_c = 2.7e-3 Rs eps_r Z0 / (30 pi (b - t)) A,
    #   A = 1 + 2W/(b - t) + (b + t) / (pi (b - t)) ln((2b - t) / t);
    # otherwise alpha_c = 0.16 Rs / (Z0 b) B, B = 1 + b / (0.5W + 0.7t) (0.5 + 0.414 t/W + ln(4 pi W / t) / (2 pi)).
    eps_r, b, t, conductivity, f = 2.2, 3.2e-3, 35e-6, 5.8e7, 5e9
    medium = StriplineLine(eps_r, b, t, conductivity_s_per_m=conductivity)
    w = float(medium.geometry_for(np.array([impedance]), f)[0])
    z = float(medium.parameters(np.array([w]), np.array([[f]])).impedance_ohm[0, 0])
    rs = math.sqrt(math.pi * f * scipy.constants.mu_0 / conductivity)
    if math.sqrt(eps_r) * z < 120:
        a = 1 + 2 * w / (b - t) + (b + t) / (math.pi * (b - t)) * math.log((2 * b - t) / t)
        expected = 2.7e-3 * rs * eps_r * z / (30 * math.pi * (b - t)) * a
    else:
        bb = 1 + b / (0.5 * w + 0.7 * t) * (0.5 + 0.414 * t / w + math.log(4 * math.pi * w / t) / (2 * math.pi))
        expected = 0.16 * rs / (z * b) * bb
    ours = medium.parameters(np.array([w]), np.array([[f]])).attenuation_np_per_m[0, 0]
    assert ours == pytest.approx(expected, rel=1e-9)  # mu0: the project's 4 pi 1e-7 vs CODATA's


def test_stripline_conductor_loss_needs_a_thickness(client, base_request):
    medium = {
        "kind": "stripline",
        "eps_r": 2.2,
        "ground_spacing_m": 3.2e-3,
        "thickness_m": 0.0,
        "conductivity_s_per_m": 5.8e7,
    }
    response = client.post("/v1/transformers/binomial", json=base_request | {"medium": medium})
    assert response.status_code == 422 and "thickness_m > 0" in response.text
