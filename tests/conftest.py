"""Shared fixtures: tiny entry folders written on the fly, and the demo catalog path."""
from __future__ import annotations

import importlib.util
import os
import shutil
import sys
import tempfile
import textwrap
from pathlib import Path

import pytest

# every test session gets a cache of its own (never the user's ~/.cache/cohesion)
os.environ["COHESION_CACHE_DIR"] = tempfile.mkdtemp(prefix="cohesion-test-cache-")

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "entries"

SOURCES = """\
crc-95:
  title: CRC Handbook of Chemistry and Physics
  kind: handbook
  edition: 95th
  year: 2014
lab:
  title: Test lab notebook
  kind: in-house
"""
LOCATIONS = """\
store-a:
  name: Store A
  max_store_temperature: 30 °C
"""
ETHANOL = """\
name: Ethanol
cas: 64-17-5
smiles: CCO
catalog:
  code: T-1
  locations: [store-a]
properties:
  boiling_point:
    value: 78.3 °C
    source: crc-95
"""


def report_volatility():
    """tools/report_volatility.py (the volatility report, whose helpers tests reuse), imported by path."""
    if "report_volatility" not in sys.modules:
        spec = importlib.util.spec_from_file_location("report_volatility", ROOT / "tools" / "report_volatility.py")
        module = importlib.util.module_from_spec(spec)
        sys.modules["report_volatility"] = module
        spec.loader.exec_module(module)
    return sys.modules["report_volatility"]


@pytest.fixture
def make_entries(tmp_path):
    """Write ``{"name.yaml": text}`` into a fresh entries folder (with sources and locations)."""

    def make(files: dict[str, str], sources: str = SOURCES, locations: str = LOCATIONS) -> Path:
        folder = tmp_path / "entries"
        folder.mkdir(exist_ok=True)
        (folder / "sources.yaml").write_text(sources, encoding="utf-8")
        (folder / "locations.yaml").write_text(locations, encoding="utf-8")
        for name, text in files.items():
            (folder / name).write_text(textwrap.dedent(text), encoding="utf-8")
        return folder

    return make


CHROMIUM = shutil.which("chromium") or "/usr/bin/chromium"
BROWSER_REQUIRED = bool(os.environ.get("COHESION_REQUIRE_BROWSER"))


@pytest.fixture(scope="session")
def chromium_command():
    """Chromium for tests that run ``cohesion print``: skips when absent unless COHESION_REQUIRE_BROWSER is set."""
    if not Path(CHROMIUM).exists():
        if BROWSER_REQUIRED:
            pytest.fail(f"{CHROMIUM} not found but COHESION_REQUIRE_BROWSER is set")
        pytest.skip("Debian's chromium is not installed (apt-get install -y chromium)")
    return CHROMIUM


@pytest.fixture(scope="session")
def browser():
    """Debian's Chromium driven by Playwright (never a downloaded browser)."""
    try:
        from playwright.sync_api import sync_playwright
    except ImportError:
        if BROWSER_REQUIRED:
            pytest.fail("playwright is not installed but COHESION_REQUIRE_BROWSER is set")
        pytest.skip("playwright is not installed")
    if not Path(CHROMIUM).exists():
        if BROWSER_REQUIRED:
            pytest.fail(f"{CHROMIUM} not found but COHESION_REQUIRE_BROWSER is set")
        pytest.skip("Debian's chromium is not installed (apt-get install -y chromium)")
    with sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=[
            "--disable-gpu", "--disable-background-networking", "--disable-component-update", "--disable-sync",
            "--no-first-run"])
        yield b
        b.close()
