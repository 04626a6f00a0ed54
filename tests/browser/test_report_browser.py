"""The HTML report in a real headless browser: Chromium from the operating system's
packages (Debian: ``chromium`` and ``chromium-driver``), driven by Selenium.

The page must load with no console errors, its charts and automaton drawings must render
(non-empty boxes), and the case filters must hide and show rows; a screenshot is saved in
the test's temporary folder. A missing browser fails the test (``.ci/run`` installs it):
this is the only check that the page works where people will open it.
"""

from __future__ import annotations

import json
import shutil
from pathlib import Path

import pytest
from click.testing import CliRunner

from pfuzz.cli import main
from pfuzz.report.page import field_view, write_report

CHROMIUM = Path("/usr/bin/chromium")
CHROMEDRIVER = Path("/usr/bin/chromedriver")
PLATE = r"[A-Z]{2}-[0-9]{4}"


def browser():
    """A headless Chromium with its console log readable."""
    from selenium import webdriver
    from selenium.webdriver.chrome.service import Service

    binary = CHROMIUM if CHROMIUM.exists() else Path(shutil.which("chromium") or CHROMIUM)
    driver_path = CHROMEDRIVER if CHROMEDRIVER.exists() else Path(shutil.which("chromedriver")
                                                                  or CHROMEDRIVER)
    if not binary.exists() or not driver_path.exists():
        pytest.fail("the browser test needs Chromium and its driver: apt-get install chromium "
                    "chromium-driver (.ci/run does this)")
    options = webdriver.ChromeOptions()
    options.binary_location = str(binary)
    for argument in ("--headless=new", "--no-sandbox", "--disable-dev-shm-usage",
                     "--disable-gpu", "--window-size=1280,2000"):
        options.add_argument(argument)
    options.set_capability("goog:loggingOptions", {"browser": "ALL"})
    return webdriver.Chrome(service=Service(str(driver_path)), options=options)


@pytest.fixture(scope="module")
def page(tmp_path_factory) -> Path:
    folder = tmp_path_factory.mktemp("report")
    audit = {"specification": PLATE, "validator": "checks:is_ticket", "agrees": False,
             "evidence": {"basis": "cases", "sentence": "The validator wrongly accepts 1 string."},
             "findings": [{"text": "AA-0000\n", "expected": "reject", "verdict": "accept",
                           "category": "hostile", "kind": "final newline",
                           "reason": "a newline after a valid string", "witness": "AA-0000",
                           "edits": ["insert '\\n' at 7"]}],
             "summary": [{"category": "hostile", "cases": 10, "wrong_accepts": 1,
                          "wrong_rejects": 0}]}
    import pfuzz

    out = folder / "report.html"
    write_report(out, "browser check", [field_view(pfuzz.compile(PLATE), "ticket", PLATE,
                                                   valid=20, rejects=20)], audit)
    result = CliRunner().invoke(main, ["report", "profiles/password-policy.toml",
                                       "--field", "password", "--valid", "5", "--rejects", "5",
                                       "--out", str(folder / "password.html")])
    assert result.exit_code == 0, result.output
    return out


def test_report_renders_and_filters(page):
    from selenium.webdriver.common.by import By
    from selenium.webdriver.support.ui import Select

    driver = browser()
    try:
        driver.get(page.as_uri())
        errors = [e for e in driver.get_log("browser") if e["level"] == "SEVERE"]
        assert errors == [], json.dumps(errors)
        bars = driver.find_elements(By.CSS_SELECTOR, "svg.counts rect.bar")
        assert bars and all(b.size["width"] > 0 for b in bars)
        drawing = driver.find_element(By.CSS_SELECTOR, "svg.automaton")
        assert drawing.size["width"] > 100 and drawing.size["height"] > 50
        assert driver.find_elements(By.CSS_SELECTOR, "svg.automaton g.state")
        rows = driver.find_elements(By.CSS_SELECTOR, "table.cases tbody tr")
        Select(driver.find_element(By.CSS_SELECTOR, ".filter-kind")).select_by_visible_text("boundary")
        shown = [r for r in rows if r.is_displayed()]
        assert 0 < len(shown) < len(rows)
        assert all(r.get_attribute("data-kind") == "boundary" for r in shown)
        Select(driver.find_element(By.CSS_SELECTOR, ".filter-kind")).select_by_visible_text("all")
        box = driver.find_element(By.CSS_SELECTOR, ".filter-text")
        box.send_keys("AA-")
        shown = [r for r in rows if r.is_displayed()]
        assert shown and all("AA-" in r.get_attribute("data-text") for r in shown)
        counter = driver.find_element(By.CSS_SELECTOR, ".filters .shown").text
        assert counter == f"{len(shown)} of {len(rows)} cases shown"
        finding = driver.find_element(By.CSS_SELECTOR, "table.findings td.value")
        assert "↵" in finding.text                 # the newline of the finding made visible
        driver.save_screenshot(str(page.parent / "report.png"))
        assert (page.parent / "report.png").stat().st_size > 10_000
        driver.get((page.parent / "password.html").as_uri())
        assert not [e for e in driver.get_log("browser") if e["level"] == "SEVERE"]
        assert driver.find_element(By.CSS_SELECTOR, ".automaton-summary").is_displayed()
        driver.save_screenshot(str(page.parent / "password.png"))
    finally:
        driver.quit()
