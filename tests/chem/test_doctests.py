"""The examples in the docstrings of builder/chem are run, so they stay true."""
from __future__ import annotations

import doctest
import importlib
from pathlib import Path

import pytest

CHEM = Path(__file__).resolve().parents[2] / "builder" / "chem"
MODULES = sorted(f"builder.chem.{p.stem}" for p in CHEM.glob("*.py") if p.stem != "__init__")


@pytest.mark.parametrize("name", MODULES)
def test_docstring_examples(name):
    module = importlib.import_module(name)
    result = doctest.testmod(module, optionflags=doctest.ELLIPSIS | doctest.NORMALIZE_WHITESPACE)
    assert result.failed == 0, f"{result.failed} of {result.attempted} examples in {name} fail (run with -s to see them)"
