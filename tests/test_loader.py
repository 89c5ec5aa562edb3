"""Loading and validation: every problem reported with its file, line and column."""
from __future__ import annotations

import pytest
from conftest import ETHANOL

from builder.load.entries import load_catalog


def _diagnostics(make_entries, text, name="bad.yaml"):
    folder = make_entries({name: text})
    catalog, diagnostics = load_catalog(folder)
    return catalog, [d for d in diagnostics if d.path.endswith(name)]


# (entry text, expected message fragment, expected line, expected column)
BAD_ENTRIES = [
    ("name: A\nsmiles: CCO\nname: B\n", "duplicate key 'name'", 3, 1),
    ("name: A\nsmiles: CCO\ncolour: red\n", "unknown field 'colour'", 3, 1),
    ("name: A\nsmile: CCO\n", "did you mean 'smiles'", 2, 1),
    ("name: A\n", "missing required field 'smiles'", 1, 1),
    ("smiles: CCO\n", "missing required field 'name'", 1, 1),
    ("name: A\nsmiles: C1CC\n", "does not parse", 2, 9),
    ("name: A\nsmiles: CCO\ncas: 64-17-6\n", "fails its check digit", 3, 6),
    ("name: A\nsmiles: CCO\nproperties:\n  boiling_point:\n    value: 78 kPa\n    source: crc-95\n",
     "'kPa' is not a unit of temperature", 5, 12),
    ("name: A\nsmiles: CCO\nproperties:\n  boiling_point:\n    value: 78 blorps\n    source: crc-95\n",
     "unknown unit", 5, 12),
    ("name: A\nsmiles: CCO\nproperties:\n  boiling_point:\n    value: -300 °C\n    source: crc-95\n",
     "below absolute zero", 5, 12),
    ("name: A\nsmiles: CCO\nproperties:\n  boiling_point:\n    value: 78\n    source: crc-95\n",
     "has no unit", 5, 12),
    ("name: A\nsmiles: CCO\nproperties:\n  boiling_point:\n    value: 78 °C\n    source: crc-96\n",
     "unknown source 'crc-96'", 6, 13),
    ("name: A\nsmiles: CCO\nproperties:\n  boiling_point:\n    value: 78 °C\n", "names no source", 5, 5),
    ("name: A\nsmiles: CCO\nproperties:\n  boiling_pt:\n    value: 78 °C\n    source: crc-95\n",
     "did you mean 'boiling_point'", 4, 3),
    ("name: A\nsmiles: CCO\nproperties:\n  vapor_pressure:\n    value: 5.8 kPa\n    source: crc-95\n",
     "needs the temperature", 5, 5),
    ("name: A\nsmiles: CCO\nproperties:\n  density:\n    value: 0.79 g/cm3\n    source: crc-95\n"
     "    provenance: estimated\n", "may state provenance", 7, 17),
    ("name: A\nsmiles: CCO\ncatalog:\n  locations: [store-b]\n", "unknown location 'store-b'", 4, 15),
    ("name: A\nsmiles: CCO\nhazard_statements: [H225, flammable]\n", "not a GHS hazard statement", 3, 27),
    ("name: A\nsmiles: CCO\nsynonyms: {a: 1}\n", "must be a list", 3, 11),
    ("name: 12\nsmiles: CCO\n", "must be text", 1, 7),
    ("name: &n A\nsmiles: CCO\n", "anchors and aliases", 1, 7),
    ("name: [A\nsmiles: CCO\n", "YAML syntax", 2, 7),
    ("name: A\nsmiles: CCO\nproperties:\n  antoine:\n    form: log10\n    A: 1\n    B: 2\n    C: 3\n"
     "    pressure_unit: Pa\n    temperature_unit: K\n    t_min: 300 K\n    t_max: 200 K\n    source: crc-95\n",
     "t_max must be above t_min", 12, 12),
]


@pytest.mark.parametrize("text, message, line, col", BAD_ENTRIES, ids=[b[1][:30] for b in BAD_ENTRIES])
def test_bad_entry_is_reported_at_its_line(make_entries, text, message, line, col):
    catalog, diags = _diagnostics(make_entries, text)
    assert catalog is None
    matching = [d for d in diags if message in str(d)]
    assert matching, f"no diagnostic containing {message!r}: {[str(d) for d in diags]}"
    assert (matching[0].line, matching[0].col) == (line, col), str(matching[0])
    assert str(matching[0]).startswith(f"{matching[0].path}:{line}:{col}: error: ")


def test_all_problems_are_collected_not_just_the_first(make_entries):
    text = "name: A\nsmiles: C1CC\ncas: 64-17-6\ncolour: red\n"
    _, diags = _diagnostics(make_entries, text)
    assert len(diags) == 3, [str(d) for d in diags]


def test_bad_file_name_is_an_error(make_entries):
    _, diags = _diagnostics(make_entries, ETHANOL, name="Ethanol_2.yaml")
    assert any("not a valid entry id" in d.message for d in diags)


def test_unknown_source_kind_in_bibliography(make_entries):
    folder = make_entries({"ethanol.yaml": ETHANOL}, sources="crc-95:\n  title: CRC\n  kind: magazine\n")
    catalog, diags = load_catalog(folder)
    assert catalog is None
    assert any(d.path.endswith("sources.yaml") and d.line == 3 and "unknown source kind" in d.message for d in diags)


def test_good_entry_loads_with_si_values(make_entries):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    catalog, diags = load_catalog(folder)
    assert diags == []
    entry = catalog.entry("ethanol")
    bp = entry.properties["boiling_point"]
    assert bp.unit == "K" and bp.value == pytest.approx(351.45)
    assert bp.provenance.kind == "literature" and bp.provenance.source == "crc-95"
    assert catalog.locations["store-a"].max_store_temperature.value == pytest.approx(303.15)


def test_in_house_source_makes_a_measured_value(make_entries):
    text = "name: A\nsmiles: CCO\nproperties:\n  density:\n    value: 0.79 ± 0.01 g/cm3\n    source: lab\n"
    catalog, _ = load_catalog(make_entries({"a.yaml": text}))
    density = catalog.entry("a").properties["density"]
    assert density.kind == "measured"
    assert (density.value, density.uncertainty) == pytest.approx((790.0, 10.0))


def test_mixture_needs_no_smiles(make_entries):
    catalog, diags = load_catalog(make_entries({"white-spirit.yaml": "name: White spirit\ntype: mixture\n"}))
    assert catalog is not None and catalog.entry("white-spirit").smiles is None


def test_dates_stay_text_and_no_becomes_an_error(make_entries):
    # YAML 1.1 reads an unquoted "no" as false: the type check catches it.
    _, diags = _diagnostics(make_entries, "name: no\nsmiles: CCO\n")
    assert any("must be text" in d.message for d in diags)


# ----------------------------------------------------------------------------- hardening (see also tests/corpus)

def test_unusual_but_possible_values_still_load(make_entries):
    """Only the impossible is an error at load; the unusual is left to the plausibility warnings."""
    text = ("name: A\nsmiles: CCO\ncatalog:\n  max_store_temperature: -196 °C\nproperties:\n"
            "  density: {value: 21 g/cm3, source: crc-95}\n  boiling_point: {value: 5500 K, source: crc-95}\n"
            "  refractive_index: {value: 4.0, source: crc-95}\n")
    catalog, diags = _diagnostics(make_entries, text)
    assert catalog is not None, [str(d) for d in diags]


def test_the_first_of_duplicate_keys_is_the_one_kept(make_entries):
    # the duplicate is an error at its line; the first value is the one any other check sees
    text = "name: A\nsmiles: CCO\nproperties:\n  boiling_point:\n    value: 78 °C\n    value: 1e30 K\n    source: crc-95\n"
    _, diags = _diagnostics(make_entries, text)
    assert [(d.line, d.message) for d in diags] == [(6, "duplicate key 'value'")]


def test_bom_and_crlf_keep_lines_and_columns(make_entries):
    text = "\ufeffname: A\r\nsmiles: CCO\r\ncas: 64-17-6\r\n"
    _, diags = _diagnostics(make_entries, text)
    assert [(d.line, d.col) for d in diags] == [(3, 6)]


def test_symlink_inside_the_folder_is_read_under_its_own_name(make_entries):
    folder = make_entries({})
    (folder / "kept").mkdir()
    (folder / "kept" / "real.txt").write_text(ETHANOL, encoding="utf-8")
    (folder / "ethanol.yaml").symlink_to("kept/real.txt")
    catalog, diags = load_catalog(folder)
    assert [e.id for e in catalog.entries] == ["ethanol"], [str(d) for d in diags]


def test_a_named_pipe_is_never_opened(make_entries):
    import os
    import threading

    folder = make_entries({"ethanol.yaml": ETHANOL})
    os.mkfifo(folder / "pipe.yaml")
    result = {}
    worker = threading.Thread(target=lambda: result.setdefault("out", load_catalog(folder)), daemon=True)
    worker.start()
    worker.join(20)
    assert "out" in result, "load_catalog blocked on a named pipe"
    catalog, diags = result["out"]
    assert catalog is None and [d.message for d in diags] == ["a named pipe (FIFO), not a file; skipped"]


@pytest.mark.parametrize("text, message", [
    (".nan", "not a finite number"), ("1e999 K", "not a finite number"), ("78 ± 1e999 K", "uncertainty"),
    ("78 ± -2 K", "negative"), ("78 delta_degC", "temperature difference"), ("78 Δ°F", "temperature difference"),
    ("78 ± K", "cannot read the uncertainty"), ("7" * 1001 + " K", "too long"),
])
def test_parse_quantity_refuses(text, message):
    from builder.core.units import UnitProblem, parse_quantity

    with pytest.raises(UnitProblem, match=message):
        parse_quantity(text if text != ".nan" else float("nan"), "temperature" if text != ".nan" else "ratio")


def test_antoine_check_accepts_every_demo_equation():
    from conftest import DEMO

    from builder.load.entries import load_catalog as load

    catalog, diags = load(DEMO)
    assert catalog is not None and not [d for d in diags if d.severity == "error"]
    assert sum(e.antoine is not None for e in catalog.entries) >= 5
