"""Store compatibility end to end: `cohesion check`, store limits in locations.yaml, the pages,
the profile JSON and the exports (issue 12)."""
from __future__ import annotations

import json

from builder.cli import main
from builder.derive.catalog import derive_catalog
from builder.load.entries import load_catalog

SOURCES = """\
crc-95:
  title: CRC Handbook of Chemistry and Physics
  kind: handbook
  edition: 95th
  year: 2014
clp:
  title: Regulation (EC) No 1272/2008, Annex VI
  kind: standard
  year: 2008
"""
LOCATIONS = """\
store-a:
  name: Store A
  max_store_temperature: 30 °C
store-b:
  name: Store B
  allowed_groups: [acid, base]
  max_flammable_liquid_volume: 30 L
"""
# Real compounds; boiling points from the CRC Handbook (95th ed.), hazard statements as recorded from
# memory of the CLP Annex VI entries (the demo catalog's sources)
ETHANOL = """\
name: Ethanol
smiles: CCO
hazard_statements: [H225, H319]
hazard_source: clp
catalog:
  locations: [store-a]
properties:
  boiling_point:
    value: 78.3 °C
    source: crc-95
"""
PERSULFATE = """\
name: Potassium persulfate
smiles: '[K+].[K+].[O-]S(=O)(=O)OOS(=O)(=O)[O-]'
hazard_statements: [H272, H302]
hazard_source: clp
catalog:
  locations: [store-a]
"""
TOLUENE = """\
name: Toluene
smiles: Cc1ccccc1
hazard_statements: [H225, H304]
hazard_source: clp
catalog:
  locations: [store-b]
  container: 2 x 20 L steel cans
properties:
  boiling_point:
    value: 110.6 °C
    source: crc-95
"""


def _folder(make_entries, files, locations=LOCATIONS):
    return make_entries(files, sources=SOURCES, locations=locations)


def test_an_oxidiser_with_a_flammable_liquid_fails_the_strict_check_until_it_is_moved(make_entries, capsys):
    folder = _folder(make_entries, {"ethanol.yaml": ETHANOL, "potassium-persulfate.yaml": PERSULFATE})
    assert main(["check", "--entries", str(folder), "--strict"]) == 1
    err = capsys.readouterr().err
    line = next(ln for ln in err.splitlines() if "store 'store-a'" in ln)
    # at the locations line (6) of the oxidiser (most partners; on a tie, the earlier group of the table),
    # naming both and the reason
    assert line.startswith(f"{folder}/potassium-persulfate.yaml:6:")
    assert "'potassium-persulfate'" in line and "'ethanol'" in line
    assert "oxidiser can start or intensify a fire" in line and "keep separate" in line
    # checking only the flammable liquid's file gives the warning at its own locations line
    assert main(["check", "--entries", str(folder), str(folder / "ethanol.yaml"), "--strict"]) == 1
    err = capsys.readouterr().err
    assert "ethanol.yaml:6:" in err and "'potassium-persulfate'" in err
    # the oxidiser moved out: clean
    (folder / "potassium-persulfate.yaml").unlink()
    assert main(["check", "--entries", str(folder), "--strict"]) == 0, capsys.readouterr().err


def test_store_limits_warn(make_entries, capsys):
    folder = _folder(make_entries, {"toluene.yaml": TOLUENE})
    assert main(["check", "--entries", str(folder)]) == 0
    err = capsys.readouterr().err
    # toluene (flammable) is not one of store-b's allowed groups: at its locations line
    assert "toluene.yaml:6:" in err and "meant for storage groups acid, base" in err
    # 2 x 20 L = 40 L against a 30 L limit: at the limit's line (7) of locations.yaml
    assert "locations.yaml:7:1: warning: store 'store-b' holds at least 40 L of flammable liquid" in err
    assert "limit of 30 L" in err


def test_unknown_storage_group_is_a_load_error(make_entries, capsys):
    folder = _folder(make_entries, {"ethanol.yaml": ETHANOL},
                     locations="store-a:\n  name: Store A\n  allowed_groups: [acids]\n")
    assert main(["check", "--entries", str(folder)]) == 1
    err = capsys.readouterr().err
    assert "locations.yaml:3" in err and "unknown storage group 'acids'" in err and "did you mean 'acid'" in err


def test_pages_show_conflicts_groups_and_alerts(make_entries, tmp_path):
    folder = _folder(make_entries, {"ethanol.yaml": ETHANOL, "potassium-persulfate.yaml": PERSULFATE,
                                    "toluene.yaml": TOLUENE})
    out = tmp_path / "site"
    assert main(["build", "--entries", str(folder), "--out", str(out), "--quiet"]) == 0
    sheet = (out / "stores" / "store-a.html").read_text(encoding="utf-8")
    top = sheet.index("Storage conflicts")
    assert top < sheet.index("<h2>Materials</h2>")
    conflict = sheet[top:sheet.index("</section>", top)]
    assert "Keep separate" in conflict and "Potassium persulfate" in conflict and "Ethanol" in conflict
    assert "Oxidiser" in sheet and "Flammable" in sheet  # each material's storage group
    assert "oxidizer, high [GHS Rev. 10]" in sheet  # the alerts, each with its source in short
    by_store = (out / "stores.html").read_text(encoding="utf-8")
    assert "Storage conflicts: 1</strong>" in by_store and "Storage conflicts: 1</strong>" in by_store
    page = (out / "materials" / "potassium-persulfate.html").read_text(encoding="utf-8")
    assert "Hazard alerts from the structure" in page and "UN GHS Rev. 10" in page
    assert "not a safety data sheet" in page  # the caution stays
    cards = (out / "cards" / "store-a.html").read_text(encoding="utf-8")
    assert "Store as" in cards and "oxidizer" in cards
    data = json.loads((out / "data" / "potassium-persulfate.json").read_text(encoding="utf-8"))
    alerts = data["entry"]["hazard_alerts"]
    assert {a["id"] for a in alerts} >= {"oxidizer-h-statement", "oxidizer-inorganic-peroxide"}
    for a in alerts:
        assert set(a) >= {"id", "family", "text", "severity", "source", "atoms", "provenance"}
    assert data["entry"]["storage_group"]["code"] == "oxidizer"
    svg = (out / "materials" / "potassium-persulfate.svg").read_text(encoding="utf-8")
    assert "#FFC659" in svg  # the matched peroxide atoms are shaded


def test_profile_json_carries_the_alerts(capsys):
    assert main(["profile", "C=CC(=O)OC", "--json"]) == 0
    result = json.loads(capsys.readouterr().out)
    alerts = {a["id"]: a for a in result["hazard_alerts"]}
    acrylic = alerts["polymerizable-acrylic"]
    assert acrylic["family"] == "polymerizable" and acrylic["atoms"] and "oxygen" in acrylic["text"]
    assert alerts["peroxide-vinyl-monomer"]["hazard_class"] == "polymerization"


def test_demo_has_one_real_conflict_and_a_clean_store():
    from builder.publish.stores import store_compatibility

    catalog, _ = load_catalog(__import__("conftest").DEMO)
    derived = derive_catalog(catalog)
    bunker = store_compatibility(catalog, derived, "solvent-bunker")
    assert bunker["count"] >= 1
    assert all("potassium-persulfate" in (c.first, c.second) for c in bunker["separate"])
    # keep-apart is listed kind by kind (fewer lines than pairs); the lines cover exactly the pairs
    from builder.chem.storage import store_conflicts

    pairs = store_conflicts([(d.entry.id, d.storage) for d in derived
                             if "solvent-bunker" in d.entry.catalog.locations and d.storage is not None])
    apart = {(c.first, c.second) for c in pairs if c.outcome == "keep-apart"}
    listed = {tuple(sorted((a, b))) for k in bunker["apart"] for a in k.first for b in (k.second or k.first) if a != b}
    assert listed == apart and bunker["apart_pairs"] == len(apart) and len(bunker["apart"]) < len(apart)
    assert store_compatibility(catalog, derived, "acids-cabinet")["count"] == 0


def test_highlighted_drawing_is_deterministic():
    from builder.chem.identity import depict_svg

    first = depict_svg("CCOCC", highlight=(1, 2, 3))
    depict_svg.cache_clear()
    assert depict_svg("CCOCC", highlight=(1, 2, 3)) == first
    assert "#FFC659" in first and "#FFC659" not in depict_svg("CCOCC")
    assert depict_svg("CCOCC", highlight=(99,)) == depict_svg("CCOCC")  # indices outside the molecule are ignored


def test_store_members_are_each_stores_materials_in_catalog_order():
    """One pass per catalog gives what filtering the whole catalog store by store gives (the
    reference here), a store named twice by one entry holding it once."""
    from types import SimpleNamespace

    from builder.derive.catalog import store_members

    def item(eid, *stores):
        return SimpleNamespace(entry=SimpleNamespace(id=eid, catalog=SimpleNamespace(locations=stores)))

    derived = (item("b", "s1", "s2"), item("a", "s2"), item("c"), item("d", "s1", "s1"), item("e", "s3"))
    grouped = store_members(derived)
    for key in ("s1", "s2", "s3"):
        assert grouped[key] == tuple(d for d in derived if key in d.entry.catalog.locations)
    assert set(grouped) == {"s1", "s2", "s3"}
    assert store_members(list(derived)) is grouped  # the same materials: grouped once
    changed = list(derived)
    changed[0] = item("b", "s3")
    assert store_members(changed)["s3"] == (changed[0], derived[4])  # other materials: grouped again
    twin = [item(d.entry.id, *d.entry.catalog.locations) for d in derived]  # equal, not the same
    assert all(a is b for a, b in zip(store_members(twin)["s1"], (twin[0], twin[3])))
