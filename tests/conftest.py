"""Shared fixtures: tiny entry folders written on the fly, and the demo catalog path."""
from __future__ import annotations

import textwrap
from pathlib import Path

import pytest

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
