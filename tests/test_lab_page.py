"""The lab page in headless Chromium (Debian's package), driven by Playwright against a real server."""

import os
import shutil
from pathlib import Path

import httpx
import pytest

from tests.conftest import live_server

CHROMIUM = shutil.which("chromium") or "/usr/bin/chromium"
if not os.path.exists(CHROMIUM):
    pytest.skip("chromium is not installed (apt-get install chromium); .ci/run installs it", allow_module_level=True)
sync_api = pytest.importorskip("playwright.sync_api", reason="the test extra (playwright) is not installed")

BROWSER_ARGS = [
    "--no-sandbox",
    "--disable-gpu",
    "--disable-quic",
    "--no-first-run",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
]


@pytest.fixture(scope="module")
def server_url():
    with live_server() as url:
        yield url


@pytest.fixture(scope="module")
def browser(tmp_path_factory):
    with sync_api.sync_playwright() as playwright:
        launched = playwright.chromium.launch(executable_path=CHROMIUM, args=BROWSER_ARGS)
        yield launched
        launched.close()


def open_page(browser, url):
    # Playwright's waits evaluate scripts, which the page's own policy forbids; the policy itself is
    # checked by test_page_policy_allows_no_outside_resources.
    page = browser.new_page(viewport={"width": 1280, "height": 1400}, bypass_csp=True)
    page.goto(url)
    page.wait_for_selector('body[data-ready="1"]', timeout=20000)
    return page


def first_impedance(page):
    return page.inner_text("#sections-table tbody tr:first-child td:nth-child(2)")


def test_first_visit_shows_a_design(browser, server_url, tmp_path):
    page = open_page(browser, server_url + "/")
    assert page.locator("#sections-table tbody tr").count() >= 1
    assert page.locator("#response-plot path.series").count() == 1
    assert page.locator("#response-plot line.level").count() == 1  # the spec line
    assert page.locator("#response-plot rect.band").count() == 1  # the band
    assert "meets the spec" in page.inner_text("#verdict")
    assert "Cautions" in page.inner_text("footer")
    page.screenshot(path=str(tmp_path / "first-visit.png"), full_page=True)


def test_new_design_bad_value_and_share_link(browser, server_url, tmp_path):
    page = open_page(browser, server_url + "/")
    before_plot = page.get_attribute("#response-plot path.series", "d")
    before = first_impedance(page)
    page.select_option("#method", "binomial")
    page.fill("#load-r", "75")
    page.fill("#sections", "3")
    page.click("#design")
    page.wait_for_function("document.querySelectorAll('#sections-table tbody tr').length === 3")
    assert first_impedance(page) != before
    assert float(first_impedance(page)) > 50.0  # a step up toward 75 ohm
    assert page.get_attribute("#response-plot path.series", "d") != before_plot
    page.screenshot(path=str(tmp_path / "binomial.png"), full_page=True)

    share = page.get_attribute("#share", "href")
    page.fill("#start", "3")
    page.fill("#stop", "2")
    page.click("#design")
    error = page.locator('.field-error[data-for="stop"]')
    error.wait_for(state="visible")
    page.wait_for_function("document.querySelector('.field-error[data-for=\"stop\"]').textContent.length > 0")
    assert "must be above the band start (3 GHz)" in error.inner_text()
    assert "invalid" in page.get_attribute("#stop", "class")

    restored = open_page(browser, server_url + share)
    assert restored.input_value("#load-r") == "75"
    assert restored.input_value("#method") == "binomial"
    assert restored.input_value("#sections") == "3"
    assert restored.locator("#sections-table tbody tr").count() == 3


def test_spec_as_return_loss_reaches_the_api_and_survives_the_link(browser, server_url):
    page = open_page(browser, server_url + "/")
    page.select_option("#spec-form", "min_return_loss_db")
    page.fill("#spec", "26")
    # 26 dB return loss is |reflection| 10^(-26/20) = 0.0501 (definition, IEEE Std 100).
    assert "0.05012" in page.inner_text("#spec-hint")
    page.click("#design")
    page.wait_for_function("document.getElementById('verdict').textContent.includes('0.0501')")
    restored = open_page(browser, server_url + page.get_attribute("#share", "href"))
    assert restored.input_value("#spec-form") == "min_return_loss_db" and restored.input_value("#spec") == "26"


def test_physical_medium_draws_the_layout_and_embed_mode(browser, server_url, tmp_path):
    page = open_page(browser, server_url + "/?medium=microstrip&sections=3&method=chebyshev")
    page.wait_for_function("document.getElementById('layout').naturalWidth > 0")
    assert page.is_visible("#layout")
    assert "Width / diameter" in page.inner_text("#sections-table thead")
    page.screenshot(path=str(tmp_path / "microstrip.png"), full_page=True)
    embedded = open_page(browser, server_url + "/?embed=1")
    assert not embedded.is_visible("#problem")
    assert embedded.is_visible("#response-plot") and embedded.is_visible("#sections-table")


def test_page_policy_allows_no_outside_resources(server_url):
    response = httpx.get(server_url + "/")
    policy = response.headers["content-security-policy"]
    assert "default-src 'self'" in policy and "frame-ancestors 'self'" in policy
    assert "http" not in response.text.split("<footer")[0].replace("http://www.w3.org", "")


def test_results_are_marked_out_of_date_when_the_form_changes_or_a_request_fails(browser, server_url):
    page = open_page(browser, server_url + "/")
    assert "Meets the spec" in page.inner_text("#status")
    page.fill("#load-r", "30")
    assert "stale" in page.get_attribute("#results", "class")
    assert "Out of date" in page.inner_text("#status")
    page.click("#design")
    page.wait_for_function("!document.getElementById('results').classList.contains('stale')")
    page.fill("#stop", "1")
    page.click("#design")
    page.wait_for_function("document.getElementById('status').textContent.includes('Out of date')")
    assert "stale" in page.get_attribute("#results", "class")


def test_a_field_that_is_not_a_number_is_an_error_at_that_field(browser, server_url):
    page = open_page(browser, server_url + "/")
    verdict = page.inner_text("#verdict")
    requests = []
    page.on("request", lambda request: requests.append(request.url) if "/v1/transformers" in request.url else None)
    for text in ("0.o5", "1,8"):
        page.fill("#spec", text)
        page.click("#design")
        error = page.locator('.field-error[data-for="spec"]')
        page.wait_for_function("document.querySelector('.field-error[data-for=\"spec\"]').textContent.length > 0")
        assert f'"{text}" is not a number' in error.inner_text()
        assert page.get_attribute("#spec", "aria-invalid") == "true"
        assert page.get_attribute("#spec", "aria-describedby") == "spec-error"
    assert requests == []  # nothing was sent, nothing silently rewritten
    assert page.inner_text("#verdict") == verdict and "Out of date" in page.inner_text("#status")


def test_two_quick_designs_show_only_the_second(browser, server_url):
    page = open_page(browser, server_url + "/")

    def delayed(route):
        page.wait_for_timeout(1500)  # the first answer arrives after the second
        route.continue_()

    page.route("**/v1/transformers/taper", delayed)
    page.select_option("#method", "taper")
    page.click("#design")
    assert page.get_attribute("body", "data-busy") == "1" and "Designing" in page.inner_text("#status")
    page.select_option("#method", "quarter-wave")
    page.click("#design")
    page.wait_for_function("document.getElementById('legend').textContent.includes('quarter-wave')")
    page.wait_for_timeout(2500)
    assert page.locator("#sections-table tbody tr").count() == 1
    assert "taper" not in page.inner_text("#legend")
    assert "quarter-wave" in page.url


def test_the_page_fits_a_phone_screen(browser, server_url, tmp_path):
    page = browser.new_page(viewport={"width": 360, "height": 800}, bypass_csp=True)
    page.goto(server_url + "/?medium=microstrip&sections=6&method=chebyshev")
    page.wait_for_selector('body[data-ready="1"]', timeout=20000)
    assert page.evaluate("document.documentElement.scrollWidth") <= 360
    page.screenshot(path=str(tmp_path / "phone.png"), full_page=True)


def test_long_tapers_collapse_their_table_and_keep_the_wide_view(browser, server_url):
    page = open_page(browser, server_url + "/?method=taper&segments=1024&medium=microstrip")
    assert page.locator("#sections-table tbody tr").count() == 24
    assert "1024 sections" in page.inner_text("#table-summary")
    # the wide-band view reaches beyond the 1.8-2.6 GHz band on both sides, centred on it
    low, high = page.evaluate("[state.current.curve.frequency_hz[0], state.current.curve.frequency_hz.at(-1)]")
    assert low < 1.8e9 and high > 2.6e9 and (low + high) / 2 == 2.2e9
    page.click("#show-all")
    assert page.locator("#sections-table tbody tr").count() == 1024


def test_a_reactive_load_marks_its_rotating_line(browser, server_url):
    page = open_page(browser, server_url + "/?load-x=-15&sections=3&method=chebyshev")
    assert "3 sections + rotating line" in page.inner_text("#legend")
    assert "(rotating line)" in page.inner_text("#sections-table tbody tr:last-child")
    page.click('input[value="return-loss"]')
    assert "spec |reflection|" not in page.text_content("#response-plot")
    assert "spec 26.02 dB" in page.text_content("#response-plot")  # 0.05 as return loss: -20 log10(0.05)


def test_embed_mode_on_a_keyed_server_asks_for_the_key(browser):
    with live_server(STEPLINE_API_KEY="bench-key") as url:
        page = browser.new_page(bypass_csp=True)
        page.goto(url + "/?embed=1")
        page.wait_for_selector('body[data-ready="1"]', timeout=20000)
        assert page.is_visible("#api-key")
        assert "needs an API key" in page.inner_text("#status")
        page.fill("#api-key", "wrong")
        page.press("#api-key", "Enter")
        page.wait_for_function("document.getElementById('status').textContent.includes('not accepted')")
        page.fill("#api-key", "bench-key")
        page.press("#api-key", "Enter")
        page.wait_for_function("document.getElementById('status').textContent.includes('spec')")
        assert page.locator("#sections-table tbody tr").count() >= 1


def test_every_load_form_reaches_the_api(browser, server_url, tmp_path):
    page = open_page(browser, server_url + "/")
    page.select_option("#load-kind", "circuit")
    page.select_option("#circuit-kind", "parallel-rc")
    page.fill("#circuit-r", "120")
    page.fill("#circuit-c", "0.6")
    page.click("#design")
    page.wait_for_function("state.current && state.current.parts.load.includes('parallel-rc 120 ohm 0.6 pF')")
    assert "rotating line" in page.inner_text("#legend")  # the circuit is complex at the centre
    page.select_option("#load-kind", "measured")
    page.fill("#measured", "1.7, 24, -9\n2.2, 27, -2\n2.7, 31, 6")
    page.click("#design")
    page.wait_for_function("state.current.parts.load === 'load measured (3 points)'")
    assert "design band" in page.inner_text("#plot-note")  # the data end at 2.7 GHz
    page.fill("#measured", "1.7, 24, -9\n2.2; 27\n2.7, 31, 6")
    page.click("#design")
    error = "document.querySelector('.field-error[data-for=\"measured\"]').textContent"
    page.wait_for_function(f"{error}.includes('line 2')")
    # A one-port Touchstone file of our own, chosen from disk (S in RI form, 50 ohm reference).
    file = tmp_path / "feed-antenna.s1p"
    file.write_text("! demo load\n# GHz S RI R 50\n1.5 -0.30 0.20\n2.2 -0.22 0.24\n3.0 -0.15 0.28\n")
    page.select_option("#load-kind", "touchstone")
    page.set_input_files("#touchstone", str(file))
    page.click("#design")
    page.wait_for_function("state.current.parts.load === 'load feed-antenna.s1p'")
    assert page.locator("#smith-plot polyline.in-band").count() == 1


def test_losses_views_smith_chart_cursor_and_markers(browser, server_url):
    page = open_page(browser, server_url + "/?medium=microstrip&method=chebyshev&sections=3&tan-d=0.004&sigma=5.8e7")
    assert page.is_visible("#loss-plot") and page.locator("#loss-plot path.series").count() == 1
    assert page.locator("#response-plot circle.marker").count() == 3  # worst point and both band edges
    assert page.locator("#smith-plot polyline.wide").count() == 1
    page.click('input[value="vswr"]')
    assert "spec VSWR 1.105" in page.text_content("#response-plot")  # (1 + 0.05) / (1 - 0.05)
    page.fill("#y-low", "1")
    page.fill("#y-high", "1.5")
    page.dispatch_event("#y-high", "change")
    assert "1.5" in page.text_content("#response-plot")
    box = page.locator("#response-plot svg").bounding_box()
    page.mouse.move(box["x"] + box["width"] / 2, box["y"] + box["height"] / 2)
    assert "GHz: VSWR" in page.inner_text("#readout")


def test_kept_curves_and_the_view_survive_the_link(browser, server_url):
    page = open_page(browser, server_url + "/")
    page.click("#keep")
    page.fill("#load-r", "35")
    page.click("#design")
    # the kept curve and the current one make two entries at once; wait for the new design itself
    page.wait_for_function("document.getElementById('legend').innerText.includes('load 35')")
    page.click('input[value="return-loss"]')
    restored = open_page(browser, server_url + page.get_attribute("#share", "href"))
    restored.wait_for_function("document.getElementById('legend').children.length === 2")
    legend = restored.inner_text("#legend")
    assert "load 22+j0 ohm" in legend and "load 35+j0 ohm" in legend  # what differs is named
    assert restored.is_checked('input[value="return-loss"]') and restored.input_value("#load-r") == "35"


def test_compare_yield_and_plot_export(browser, server_url):
    page = open_page(browser, server_url + "/?medium=microstrip&method=chebyshev&sections=2")
    page.click("#run-compare")
    page.wait_for_selector("#compare-table:not([hidden]) tbody tr")
    assert page.locator("#compare-table tbody tr").count() >= 5
    page.fill("#trials", "200")
    page.click("#run-yield")
    page.wait_for_function("document.getElementById('yield-summary').textContent.includes('Yield')")
    assert page.locator("#yield-plot path.series").count() == 1
    assert "not a guarantee" in page.inner_text(".tool.medium-physical")
    with page.expect_download() as svg:
        page.click("#export-svg")
    assert svg.value.suggested_filename.endswith("-reflection.svg")
    assert "<svg" in Path(svg.value.path()).read_text()
    with page.expect_download() as png:
        page.click("#export-png")
    assert Path(png.value.path()).read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"


def test_interactive_docs_work_without_the_internet(browser, server_url):
    page = browser.new_page()
    outside = []
    page.route(
        "**/*",
        lambda route: (
            route.continue_()
            if route.request.url.startswith(server_url)
            else (outside.append(route.request.url), route.abort())
        ),
    )
    page.goto(server_url + "/docs")
    page.wait_for_selector(".swagger-ui .info .title", timeout=20000)
    assert "Stepline" in page.inner_text(".swagger-ui .info .title")
    assert outside == []


def test_only_the_chosen_load_forms_fields_show(browser, server_url):
    page = open_page(browser, server_url + "/")
    visible = lambda ids: [i for i in ids if page.is_visible(f"#{i}")]  # noqa: E731
    fields = ["load-r", "load-x", "circuit-r", "circuit-l", "circuit-c", "measured", "touchstone"]
    assert visible(fields) == ["load-r", "load-x"]
    page.select_option("#load-kind", "circuit")
    assert visible(fields) == ["circuit-r", "circuit-l"]
    page.select_option("#circuit-kind", "series-rc")
    assert visible(fields) == ["circuit-r", "circuit-c"]
    page.select_option("#load-kind", "measured")
    assert visible(fields) == ["measured"]


def test_a_microstrip_design_goes_to_gerber_with_steps_compensated_and_power(browser, server_url):
    query = "?medium=microstrip&method=chebyshev&sections=3&junctions=compensate&power=25"
    page = open_page(browser, server_url + "/" + query)
    assert page.is_visible("#junctions") and page.is_visible("#get-gerber")
    assert "junction steps are in the verified figures" in page.inner_text("#warnings")
    assert "Largest peak voltage" in page.inner_text("#power-figures")
    assert "licensed" in page.inner_text("#power-cautions")
    with page.expect_download() as layout:
        page.click("#get-gerber")
    assert layout.value.suggested_filename.endswith("-gerber.zip")
    assert Path(layout.value.path()).read_bytes()[:2] == b"PK"
    page.select_option("#medium", "coax")  # coax has a step model but no board to lay out
    assert page.is_visible("#junctions") and not page.is_visible("#get-gerber")
    page.select_option("#medium", "ideal")
    assert not page.is_visible("#junctions")
