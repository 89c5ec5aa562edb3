"""Cross-links on a small synthetic catalog, export round trip, and inert entry text."""
from __future__ import annotations

import csv
import io
import json

import pytest

from builder.derive.catalog import derive_catalog
from builder.derive.links import ch2_difference, cross_links, homologous_series
from builder.derive.serialize import entry_json
from builder.load.entries import load_catalog
from builder.pipeline import build
from builder.publish.exports import safe_json

LITERATURE_BP = "  boiling_point: {{value: '{bp} °C', source: crc-95}}\n"


def _entry(name, smiles, bp=None):
    text = f"name: {name}\nsmiles: '{smiles}'\n"
    if bp is not None:
        text += "properties:\n" + LITERATURE_BP.format(bp=bp)
    return text


# boiling points from the CRC Handbook, 95th ed. (as shipped in chemicals 1.5.2), rounded
SYNTHETIC = {
    "pentane.yaml": _entry("Pentane", "CCCCC", 36.1),
    "hexane.yaml": _entry("Hexane", "CCCCCC", 68.7),
    "heptane.yaml": _entry("Heptane", "CCCCCCC", 98.4),
    "isopentane.yaml": _entry("2-Methylbutane", "CC(C)CC", 27.8),
    "neopentane.yaml": _entry("2,2-Dimethylpropane", "CC(C)(C)C", 9.5),
    "ethanol.yaml": _entry("Ethanol", "CCO", 78.3),
    "propanol.yaml": _entry("Propan-1-ol", "CCCO", 97.2),
    "dimethyl-ether.yaml": _entry("Dimethyl ether", "COC", -24.8),
    "butanone.yaml": _entry("Butanone", "CCC(C)=O", 79.6),
}


@pytest.fixture
def synthetic(make_entries):
    catalog, diags = load_catalog(make_entries(SYNTHETIC))
    assert catalog is not None, [str(d) for d in diags]
    derived = derive_catalog(catalog)
    return catalog, derived, cross_links(derived)


def _targets(links, relation):
    return {link.target for link in links if link.relation == relation}


def test_isomers_share_a_formula_and_link_both_ways(synthetic):
    _, _, links = synthetic
    assert _targets(links["pentane"], "isomer") == {"isopentane", "neopentane"}
    assert _targets(links["neopentane"], "isomer") == {"pentane", "isopentane"}
    assert _targets(links["ethanol"], "isomer") == {"dimethyl-ether"}
    assert _targets(links["dimethyl-ether"], "isomer") == {"ethanol"}


def test_homologues_are_same_class_and_ch2_apart(synthetic):
    _, derived, links = synthetic
    assert _targets(links["hexane"], "homologue") == {"pentane", "heptane"}
    assert _targets(links["ethanol"], "homologue") == {"propanol"}
    assert _targets(links["propanol"], "homologue") == {"ethanol"}
    # branched isomers are a different structure class from the straight chain
    assert "isopentane" not in _targets(links["hexane"], "homologue")
    series = [[d.entry.id for d in s] for s in homologous_series(derived)]
    assert ["pentane", "hexane", "heptane"] in series


def test_the_structure_class_worked_out_while_deriving_is_the_one_links_would_work_out(synthetic):
    """Derived.series_class saves the links a parse per entry; without it (a Derived made by hand)
    the links work the class out themselves, and come out the same."""
    import dataclasses

    from builder.chem.series import structure_class

    _, derived, links = synthetic
    for d in derived:
        assert d.series_class == structure_class(d.identity.smiles)
    assert structure_class("CCCCCC") == structure_class("CCCCC") != structure_class("CC(C)CC")
    bare = tuple(dataclasses.replace(d, series_class=None) for d in derived)
    assert cross_links(bare) == links
    assert [[d.entry.id for d in s] for s in homologous_series(bare)] == \
        [[d.entry.id for d in s] for s in homologous_series(derived)]


def test_similar_size_different_forces_links_show_both_boiling_points(synthetic):
    _, _, links = synthetic
    # butanone (72.1 g/mol, dipole-dipole) and pentane (72.2 g/mol, dispersion)
    contrast = [l for l in links["butanone"] if l.relation == "contrast"]
    assert "pentane" in {l.target for l in contrast}
    why = next(l.why for l in contrast if l.target == "pentane")
    assert "36 °C" in why and "80 °C" in why
    assert "butanone" in _targets(links["pentane"], "contrast")


def test_nearest_boiling_points(synthetic):
    _, _, links = synthetic
    assert _targets(links["ethanol"], "near-bp") == {"butanone", "hexane", "propanol"}


@pytest.mark.parametrize("a, b, n", [("C5H12", "C6H14", 1), ("C6H14", "C5H12", -1), ("C2H6O", "C4H10O", 2),
                                     ("C5H12", "C5H12", None), ("C2H6O", "C3H6O", None)])
def test_ch2_difference(a, b, n):
    assert ch2_difference(a, b) == n


def test_the_exports_put_together_from_kept_pieces_are_the_bytes_of_one_serialisation(tmp_path, make_entries):
    """catalog.json and data/<id>.json are assembled from per-entry pieces kept between builds; the
    result must be exactly what one json.dumps of the whole file gives (json module as reference)."""
    from builder.publish import exports

    built = build(make_entries(SYNTHETIC), tmp_path / "site")
    links = cross_links(built.derived)
    parts = [exports.entry_part(d, links.get(d.entry.id, ())) for d in built.derived]
    assert len(parts) > 3
    assert exports.catalog_json_from_pieces([exports.catalog_piece(p) for p in parts]) == \
        exports.catalog_json(built.derived, links)
    assert exports.catalog_json_from_pieces([]) == exports.catalog_json((), {})
    for d, part in zip(built.derived, parts):
        assert exports.entry_file_json_from_part(part) == exports.entry_file_json(d, links.get(d.entry.id, ()))


def test_catalog_json_round_trips_the_model(tmp_path, synthetic, make_entries):
    out = tmp_path / "site"
    built = build(make_entries(SYNTHETIC), out)
    data = json.loads((out / "catalog.json").read_text(encoding="utf-8"))
    assert [e["id"] for e in data["entries"]] == [d.entry.id for d in built.derived]
    for exported, d in zip(data["entries"], built.derived):
        for name, value in d.values.items():
            got = exported["values"][name]
            assert got["value"] == pytest.approx(value.value, rel=1e-9)
            assert got["provenance"]["kind"] == value.kind
            assert (got.get("uncertainty") is None) == (value.uncertainty is None)
        per_entry = json.loads((out / "data" / f"{d.entry.id}.json").read_text(encoding="utf-8"))
        assert per_entry["entry"] == exported
    rows = list(csv.DictReader(io.StringIO((out / "catalog.csv").read_text(encoding="utf-8"))))
    assert len(rows) == len(built.derived)
    ethanol = next(r for r in rows if r["id"] == "ethanol")
    assert float(ethanol["boiling_point_degC"]) == pytest.approx(78.3)
    assert ethanol["boiling_point_provenance"] == "literature"
    assert ethanol["dominant_force"] == "hydrogen-bonding"
    # every Hansen parameter and density in the CSV says where it came from, as in the JSON
    by_id = {d.entry.id: d for d in built.derived}
    checked = 0
    for r in rows:
        for key, column in (("hansen_delta_d", "hansen_delta_d"), ("hansen_delta_p", "hansen_delta_p"),
                            ("hansen_delta_h", "hansen_delta_h"), ("density", "density")):
            value = by_id[r["id"]].get(key)
            assert r[f"{column}_provenance"] == (value.kind if value is not None else ""), (r["id"], key)
            checked += value is not None
    assert checked


def test_entry_text_cannot_inject_markup_or_script(make_entries, tmp_path):
    hostile = "Evil </script><script>alert(1)</script> & <b>bold</b>"
    folder = make_entries({"evil.yaml": f"name: '{hostile}'\nsmiles: CCO\nsynonyms: ['</script><img src=x>']\n"
                                        "notes: '<iframe src=x></iframe>'\n"})
    out = tmp_path / "site"
    build(folder, out)
    page = (out / "materials" / "evil.html").read_text(encoding="utf-8")
    assert "<script>alert(1)" not in page and "<iframe" not in page and "<b>bold" not in page
    assert "&lt;script&gt;alert(1)" in page
    index_js = (out / "search-index.js").read_text(encoding="utf-8")
    assert "</script>" not in index_js and "<" not in index_js
    assert json.loads(index_js.split("=", 1)[1].rstrip().rstrip(";"))[0]["name"] == hostile
    # the JSON-LD block in the head cannot be closed early either
    head = page.split("</head>")[0]
    assert head.count("</script>") == 1


def test_safe_json_escapes_html_specials():
    assert safe_json({"a": "</script>&"}) == '{"a": "\\u003c/script\\u003e\\u0026"}'


def test_entry_json_has_every_value_with_provenance(synthetic):
    _, derived, links = synthetic
    d = next(x for x in derived if x.entry.id == "ethanol")
    data = entry_json(d, links["ethanol"])
    assert data["forces"]["dominant"] == "hydrogen-bonding"
    assert all("provenance" in v for v in data["values"].values())
    assert {l["relation"] for l in data["links"]} >= {"isomer", "homologue", "near-bp"}


@pytest.mark.parametrize("count", [1, 2])
def test_contrasts_are_the_nearest_in_molar_mass_with_another_force(count, monkeypatch):
    """The contrast links of every demo molecule against comparing every pair by hand: of the
    molecules within 10 % in molar mass held together mainly by another force, the nearest
    ``count`` (ties by id); small counts make the cut-off bite on the demo catalog."""
    from builder.derive import links as links_module
    from conftest import DEMO

    monkeypatch.setattr(links_module, "CONTRAST_COUNT", count)
    catalog, _ = load_catalog(DEMO)
    derived = derive_catalog(catalog)
    links = cross_links(derived)
    ratio = links_module.CONTRAST_MASS_RATIO
    molecules = [d for d in derived if d.identity is not None and d.identity.fragments == 1]
    force = {d.entry.id: (d.label("dominant_force").code if d.label("dominant_force") else None) for d in molecules}
    cut = 0
    for a in molecules:
        ma = a.identity.molar_mass
        by_hand = sorted(
            (abs(ma - b.identity.molar_mass), b.entry.id) for b in molecules
            if b is not a and force[a.entry.id] and force[b.entry.id] and force[b.entry.id] != force[a.entry.id]
            and abs(ma - b.identity.molar_mass) <= ratio * max(ma, b.identity.molar_mass))
        assert _targets(links[a.entry.id], "contrast") == {oid for _, oid in by_hand[:count]}, a.entry.id
        cut += len(by_hand) > count
    assert cut >= 1  # the cut-off was exercised


@pytest.mark.parametrize("a, b, n", [("C2H6O", "C3H8S", None), ("C2H6", "C3H8O", None), ("C3H8O", "C2H6", None),
                                     ("CH4", "C2H6", 1), ("C2H4Cl2", "C4H8Cl2", 2), ("C2H4Cl2", "C3H6Cl", None),
                                     ("C6H6", "C7H8", 1), ("C2H6O", "C3H10O", None)])
def test_ch2_difference_needs_every_other_element_unchanged(a, b, n):
    # a homologue differs by whole CH2 units and nothing else (common practice)
    assert ch2_difference(a, b) == n
