"""One declaration per quantity and per method: the registries drive every output."""
from __future__ import annotations

import csv
import dataclasses
import io
import json
import re
from pathlib import Path

import pytest
from conftest import DEMO, ETHANOL

from builder.core import quantities
from builder.core.methods import METHODS, METHODS_PATH, REFERENCES
from builder.core.model import frozen_map
from builder.core.quantities import CsvColumn, DerivedQuantity
from builder.core.values import Provenance, Value
from builder.derive.catalog import derive_catalog
from builder.load.entries import load_catalog

PACKAGE = Path(__file__).resolve().parent.parent / "builder"


def _with_new_value(d):
    """``d`` with one more derived value, of a quantity only the (patched) registry knows."""
    extra = Value(1234.5, "Pa", Provenance("estimated", method="myrdal-yalkowsky"), 12.0)
    return dataclasses.replace(d, values=frozen_map({**d.values, "test_quantity": extra}))


@pytest.fixture
def new_quantity(monkeypatch):
    registry = dict(quantities.DERIVED_QUANTITIES)
    registry["test_quantity"] = DerivedQuantity(
        "test_quantity", "Test pressure of the registry", "Pa", "vapor",
        CsvColumn("test_pressure_kPa", "kPa", 3, provenance="test_pressure_provenance"),
        review="test pressure", profile=True)
    monkeypatch.setattr(quantities, "DERIVED_QUANTITIES", registry)
    for module in ("builder.publish.templating", "builder.publish.views", "builder.publish.exports",
                   "builder.derive.serialize", "builder.review.diffreport"):
        monkeypatch.setattr(f"{module}.DERIVED_QUANTITIES", registry)
    return registry["test_quantity"]


def test_a_new_registry_entry_reaches_every_output(new_quantity, make_entries, tmp_path):
    from builder.derive.serialize import entry_json, profile_json
    from builder.publish import exports
    from builder.publish.site import render_site
    from builder.review.diffreport import Revision, compare, markdown, snapshot

    catalog, diags = load_catalog(make_entries({"ethanol.yaml": ETHANOL}))
    assert catalog is not None, diags
    before = derive_catalog(catalog)
    after = tuple(_with_new_value(d) for d in before)

    out = tmp_path / "site"
    out.mkdir()
    render_site(catalog, after, out)
    page = (out / "materials" / "ethanol.html").read_text(encoding="utf-8")
    assert "Test pressure of the registry" in page and "1.234 ± 0.012 kPa" in page

    assert entry_json(after[0])["values"]["test_quantity"]["value"] == 1234.5
    assert profile_json(after[0])["test_quantity"]["unit"] == "Pa"
    data = json.loads((out / "catalog.json").read_text(encoding="utf-8"))
    assert data["entries"][0]["values"]["test_quantity"]["uncertainty"] == 12.0

    (row,) = csv.DictReader(io.StringIO(exports.catalog_csv(after)))
    assert row["test_pressure_kPa"] == "1.234" and row["test_pressure_provenance"] == "estimated"

    rev = lambda label, ds: Revision(label, {d.entry.id: snapshot(d) for d in ds},  # noqa: E731
                                     {d.entry.id: d.entry.name for d in ds}, set(), [])
    report = compare(rev("base", before), rev("head", after))
    (change,) = report.as_dict()["changed"][0]["changes"]
    assert change["field"] == "test_quantity" and change["label"] == "test pressure"
    assert change["old"] is None and change["new"].startswith("1.234 ± 0.012 kPa")
    assert "| test pressure | — | 1.234" in markdown(report)


def test_every_datasheet_label_comes_from_a_registry():
    from builder.publish.templating import property_label

    for key, q in quantities.DERIVED_QUANTITIES.items():
        assert q.key == key
        assert property_label(key) == q.label
    for key, spec in quantities.STATED_PROPERTIES.items():
        assert property_label(key) == spec.label


# --- methods as data


def test_every_published_work_is_cited_once_with_one_doi():
    text = METHODS_PATH.read_text(encoding="utf-8")
    dois = re.findall(r"doi:(\S+?)[\",]", text)
    assert dois and len(dois) == len(set(dois)), dois
    for key, citation in REFERENCES.items():
        assert text.count(citation) == 1, key
        # the journal, volume and year of a work appear only in its one citation
        locator = re.search(r"[A-Z][^,]*\d+ \(\d{4}\)", citation)
        if locator:
            assert text.count(locator[0]) == 1, (key, locator[0])
    for method in METHODS.values():
        assert "{" not in method.reference, method.id


def test_every_method_id_the_demo_catalog_uses_is_described():
    catalog, diags = load_catalog(DEMO)
    assert catalog is not None, diags
    used = set()
    for d in derive_catalog(catalog):
        things = list(d.values.values()) + list(d.labels.values())
        if d.forces is not None:
            things += list(d.forces.numbers.values()) + [d.forces.dominant]
        used |= {t.provenance.method for t in things if t.provenance.method and t.kind not in
                 ("measured", "literature", "supplier")}
    assert used and used <= set(METHODS), sorted(used - set(METHODS))


def test_no_method_is_recognised_by_a_prefix_of_its_name():
    offenders = []
    for path in sorted(PACKAGE.rglob("*.py")) + sorted((PACKAGE.parent / "templates").glob("*.html")):
        for n, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
            if re.search(r"method\w*\.startswith\(|startswith\(['\"](tb-|MMFF|Catoire|Joback)", line):
                offenders.append(f"{path.name}:{n}")
    assert not offenders, offenders


def test_the_methods_file_is_package_data():
    text = (PACKAGE.parent / "pyproject.toml").read_text(encoding="utf-8")
    assert '"data/*.yaml"' in text and METHODS_PATH.parent == PACKAGE / "data"


# --- one place for 0 °C


def test_zero_celsius_is_written_only_in_the_two_constant_modules():
    from builder.chem.constants import T_ZERO_CELSIUS
    from builder.core.units import ZERO_CELSIUS_K

    found = sorted(str(p.relative_to(PACKAGE)) for p in PACKAGE.rglob("*.py") if "273.15" in p.read_text("utf-8"))
    assert found == ["chem/constants.py", "core/units.py"], found
    assert T_ZERO_CELSIUS == ZERO_CELSIUS_K == 273.15  # SI Brochure, 9th ed. (2019), section 2.3.1


def test_the_one_celsius_formatter_writes_a_true_minus():
    from builder.core.units import celsius_text, format_value

    assert celsius_text(253.15, 0) == "\u221220 °C"
    assert celsius_text(351.55) == "78.4 °C"
    assert format_value(351.55, "K").startswith(celsius_text(351.55, 1, unit=False))
