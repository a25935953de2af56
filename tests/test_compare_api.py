"""POST /v1/transformers/compare: every applicable design, ranked."""

import pytest


def compare(client, body):
    response = client.post("/v1/transformers/compare", json=body)
    assert response.status_code == 200, response.text
    return response.json()


def test_ranking_puts_designs_meeting_the_spec_first_then_the_shortest(client, base_request):
    result = compare(client, base_request | {"load": {"resistance_ohm": 200.0}, "max_reflection": 0.05})
    candidates = result["candidates"]
    assert [c["rank"] for c in candidates] == list(range(1, len(candidates) + 1))
    keys = [(not c["meets_spec"], c["total_length_m"]) for c in candidates]
    assert keys == sorted(keys)
    kinds = {(c["method"], c["theory"], c["profile"]) for c in candidates}
    assert ("chebyshev", "exact", None) in kinds and ("taper", "small-reflection", "klopfenstein") in kinds
    assert len(kinds) == 8
    for candidate in candidates:
        assert candidate["verified"] == candidate["design"]["verified"]
        assert candidate["section_count"] == len(candidate["design"]["sections"])


def test_equal_ripple_beats_maximally_flat_for_the_same_spec(client, base_request):
    # For the same spec and band a Chebyshev transformer needs no more sections than a binomial
    # one (Pozar ch. 5: the equal-ripple response trades flatness for bandwidth).
    result = compare(client, base_request | {"load": {"resistance_ohm": 300.0}, "max_reflection": 0.02})
    counts = {(c["method"], c["theory"]): c["section_count"] for c in result["candidates"] if c["profile"] is None}
    assert counts[("chebyshev", "exact")] <= counts[("binomial", "exact")]


def test_fixed_section_count_drops_the_quarter_wave(client, base_request):
    result = compare(client, base_request | {"sections": 3, "include_tapers": False})
    methods = {c["method"] for c in result["candidates"]}
    assert methods == {"binomial", "chebyshev"}
    assert all(c["section_count"] == 3 for c in result["candidates"])


def test_methods_that_cannot_apply_are_listed_with_a_reason(client, base_request):
    # 50 -> 52 ohm already meets 0.05: tapers have nothing to do and say so.
    result = compare(client, base_request | {"load": {"resistance_ohm": 52.0}, "max_reflection": 0.05})
    excluded = {e["profile"]: e["reason"] for e in result["excluded"]}
    assert set(excluded) == {"klopfenstein", "exponential", "triangular"}
    assert all("no taper is needed" in reason for reason in excluded.values())
    assert all(c["meets_spec"] for c in result["candidates"])


@pytest.mark.parametrize("field, value", [("sections", 0), ("taper_segments", 1), ("theory", "exact")])
def test_bad_compare_fields(client, base_request, field, value):
    response = client.post("/v1/transformers/compare", json=base_request | {field: value})
    assert response.status_code == 422
    assert response.json()["problems"][0]["field"] == field
