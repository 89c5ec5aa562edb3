"""Shared fixtures for the chemistry tests.

Reference dipole moments come from the ``chemicals`` package (1.5.2); the loader lives
in ``tests/benchmarks/bench_profile.py`` so that the benchmark and the tests use the same set.
"""

from __future__ import annotations

import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
for path in (ROOT, ROOT / "tests"):  # allow plain `pytest` without an installed package
    if str(path) not in sys.path:
        sys.path.insert(0, str(path))

import bench_profile


@pytest.fixture(scope="session")
def reference_rows():
    """Neutral molecules with a clear reference dipole (see bench_profile.reference_dipoles)."""
    return bench_profile.reference_dipoles()
