"""The loader never fails on bad input: mutated entry texts give diagnostics, never an exception.

Valid entry texts (the corpus base and a few demo entries) are mutated — characters deleted,
duplicated or replaced, values swapped between fields, YAML tags, anchors, odd Unicode and
out-of-range numbers inserted — and handed to ``load_entry``. Whatever comes back, every
diagnostic must have a positive line and column. Only the loader runs (no derive).
"""
from __future__ import annotations

import re
from pathlib import Path

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from builder.core.diagnostics import Diagnostic
from builder.load.entries import load_entry, read_bibliography

ROOT = Path(__file__).resolve().parent.parent
BASE = ROOT / "tests" / "corpus" / "_base"
TEXTS = [(BASE / "ethanol.yaml").read_text(encoding="utf-8")] + [
    (ROOT / "entries" / name).read_text(encoding="utf-8")
    for name in ("acetone.yaml", "toluene.yaml", "water.yaml") if (ROOT / "entries" / name).exists()]
SOURCES, LOCATIONS, _ = read_bibliography(BASE, "entries")

#: fragments a person (or a bad tool) might leave in an entry
TOKENS = ["!!int ", "!!str ", "!!float ", "!x ", "! ", "&a ", "*a", "<<: ", "? ", "~", "null", "yes", "- ", ": ",
          "{}", "[]", "[", "]", "{", "}", "'", '"', "#", "|", ">-", "\t", "\n", "\r\n", "\r", "\x00", "\x07",
          "\x1b", "\x85", "\ufeff", "\u2028", "\u00e9", "\u0394\u00b0C", "\U0001f600", "%TAG ! tag:x,2024:\n---\n",
          "---\n", "...\n", ".nan", ".inf", "-.inf", "1e999", "1.0e+999", "1e-400", "9" * 45, "1" + "0" * 400,
          " \u00b1 -2", " \u00b1 1e999", " +/- ", "delta_degC", " K", " \u00b0C", " Pa", " g/cm3", " %", "-",
          "0", "-273.15 \u00b0C", "6000.1 K", "*", " Cl", "con", "all", "\\", "\u200b", "\udcff"]

_VALUE_LINE = re.compile(r"^(\s*-?\s*[^\s:#][^:]*:\s+)(\S.*)$")


@st.composite
def mutated(draw) -> str:
    text = draw(st.sampled_from(TEXTS))
    for _ in range(draw(st.integers(1, 4))):
        op = draw(st.sampled_from(["delete", "duplicate", "replace", "insert", "insert", "swap"]))
        at = draw(st.integers(0, len(text)))
        if op == "delete":
            text = text[:at] + text[at + draw(st.integers(1, 40)):]
        elif op == "duplicate":
            text = text[:at] + text[at:at + draw(st.integers(1, 80))] + text[at:]
        elif op == "replace":
            text = text[:at] + draw(st.characters(codec="utf-8", exclude_categories=("Cs",))) + text[at + 1:]
        elif op == "insert":
            token = draw(st.one_of(st.sampled_from(TOKENS), st.text(max_size=6)))
            text = text[:at] + token + text[at:]
        else:  # swap the values of two "key: value" lines
            lines = text.split("\n")
            with_values = [i for i, line in enumerate(lines) if _VALUE_LINE.match(line)]
            if len(with_values) >= 2:
                i, j = draw(st.lists(st.sampled_from(with_values), min_size=2, max_size=2, unique=True))
                a, b = _VALUE_LINE.match(lines[i]), _VALUE_LINE.match(lines[j])
                lines[i], lines[j] = a[1] + b[2], b[1] + a[2]
                text = "\n".join(lines)
    return text


@settings(max_examples=1000, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(text=mutated())
def test_mutated_entries_give_diagnostics_not_exceptions(text):
    entry, diagnostics = load_entry("entries/fuzz.yaml", text, SOURCES, LOCATIONS)
    assert entry is not None or any(d.severity == "error" for d in diagnostics)
    for d in diagnostics:
        assert isinstance(d, Diagnostic)
        assert d.line >= 1 and d.col >= 1, str(d)
        assert str(d).startswith(f"entries/fuzz.yaml:{d.line}:{d.col}: {d.severity}: ")
        assert "\n" not in d.message, str(d)
