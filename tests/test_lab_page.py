"""The lab page in headless Chromium (Debian's package), driven by Playwright against a real server."""

import os
import shutil

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
    assert "greater than" in error.inner_text()
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
