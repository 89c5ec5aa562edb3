"""The change report (builder/diffreport.py) on a temporary git repository holding the demo entries."""
from __future__ import annotations

import json
import shutil
import subprocess

import pytest
from conftest import DEMO

from builder.cli import main
from builder.review.diffreport import change_report, default_base, markdown

pytestmark = pytest.mark.skipif(shutil.which("git") is None, reason="needs git")


def _git(repo, *args):
    return subprocess.run(["git", "-C", str(repo), "-c", "user.name=Test", "-c", "user.email=test@example.invalid",
                           *args], check=True, capture_output=True, text=True).stdout


def _edit(path, old, new):
    text = path.read_text(encoding="utf-8")
    assert old in text, (path, old)
    path.write_text(text.replace(old, new, 1), encoding="utf-8")


@pytest.fixture(scope="module")
def repo(tmp_path_factory):
    """main: the demo entries; branch 'edits': three edits committed; working tree: a broken entry more."""
    root = tmp_path_factory.mktemp("repo")
    shutil.copytree(DEMO, root / "entries", ignore=shutil.ignore_patterns("*.json"))
    _git(root, "init", "-q", "-b", "main")
    _git(root, "add", "entries")
    _git(root, "commit", "-q", "-m", "demo entries")
    _git(root, "checkout", "-q", "-b", "edits")
    entries = root / "entries"
    _edit(entries / "toluene.yaml", "value: 383.75 K", "value: 383.75 °C")  # a unit slip
    _edit(entries / "n-hexane.yaml", "smiles: 'CCCCCC'", "smiles: 'CCCCCO'")  # wrong structure
    _edit(entries / "ethanol.yaml", "value: 12.0 °C", "value: 30.0 °C")  # flash point
    _git(root, "commit", "-q", "-am", "edits")
    (entries / "broken.yaml").write_text("name: Broken\nsmiles: CCO\nproperties:\n  boiling_point:\n"
                                         "    value: 78 kPa\n    source: crc-95\n", encoding="utf-8")
    return root


@pytest.fixture(scope="module")
def report(repo):
    return change_report(repo / "entries")  # merge base with main → working tree


def _rows(report, entry_id):
    return {key: (old, new) for key, old, new in report.changed[entry_id]}


def test_default_base_is_the_merge_base_with_main(repo):
    assert default_base(repo) == _git(repo, "rev-parse", "main").strip()


def test_unit_slip_moves_the_chosen_boiling_point_and_the_band(report):
    rows = _rows(report, "toluene")
    old, new = rows["stated:boiling_point"]
    assert "110.6 °C" in old and "383.8 °C" in new
    old, new = rows["boiling_point"]
    assert "110.6 °C" in old and "383.8 °C" in new and "(literature)" in new
    old, new = rows["volatility_band"]  # COSHH: bp 50-150 °C medium, above 150 °C low
    assert old.startswith("medium") and new.startswith("low")


def test_structure_change_moves_the_force_class_and_the_estimate(report):
    rows = _rows(report, "n-hexane")
    assert rows["smiles"] == ("CCCCCC", "CCCCCO")
    assert rows["dominant_force"] == ("London dispersion", "hydrogen bonding")
    assert rows["formula"] == ("C6H14", "C5H12O")
    old, new = rows["boiling_point_estimate"]
    assert old != new and "(estimated)" in new


def test_flash_point_change_moves_the_category(report):
    rows = _rows(report, "ethanol")
    assert set(rows) >= {"stated:flash_point", "flash_point", "flammable_category"}
    old, new = rows["flammable_category"]  # GHS 2.6: FP < 23 °C and IBP > 35 °C → 2; 23-60 °C → 3
    assert old.startswith("Category 2") and new.startswith("Category 3")


def test_unchanged_entries_are_not_listed_and_broken_ones_are_reported(report):
    assert "acetone" not in report.changed and "dichloromethane" not in report.changed
    assert report.not_compared == {"broken": "does not load at working tree:entries"}
    assert any("'kPa' is not a unit of temperature" in d.message for d in report.problems["working tree:entries"])
    text = markdown(report)
    assert "| dominant force | London dispersion | hydrogen bonding |" in text
    assert "#### `ethanol` — Ethanol" in text and "`broken`: does not load" in text


def test_cli_json_between_two_revisions(repo, capsys, monkeypatch):
    monkeypatch.chdir(repo)
    assert main(["diff", "main", "edits", "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    changed = {c["id"]: {x["field"]: x for x in c["changes"]} for c in data["changed"]}
    assert {"ethanol", "n-hexane", "toluene"} <= set(changed)
    # the others move only through their cross-links (toluene now boils far from its old neighbours)
    assert all(set(rows) == {"links"} for eid, rows in changed.items() if eid not in ("ethanol", "n-hexane", "toluene"))
    assert any("near-bp toluene" in rows["links"]["old"] and "near-bp toluene" not in rows["links"]["new"]
               for rows in changed.values() if "links" in rows and rows["links"]["old"] and rows["links"]["new"])
    assert data["added"] == [] and data["removed"] == [] and data["not_compared"] == []
    hexane = changed["n-hexane"]
    assert hexane["dominant_force"]["old"] == "London dispersion"
    assert main(["diff", "no-such-revision", "--json"]) == 2


@pytest.fixture(scope="module")
def added_repo(tmp_path_factory):
    """main: the demo entries; working tree: one new entry (propanal, a duplicate-free structure)
    with a boiling point in the wrong unit, so `cohesion check` has something to say about it."""
    root = tmp_path_factory.mktemp("added")
    shutil.copytree(DEMO, root / "entries", ignore=shutil.ignore_patterns("*.json"))
    _git(root, "init", "-q", "-b", "main")
    _git(root, "add", "entries")
    _git(root, "commit", "-q", "-m", "demo entries")
    # propanal boils at 48 °C and melts at −80 °C (CRC Handbook); the melting point without its sign
    (root / "entries" / "propanal.yaml").write_text(
        "name: Propanal\nsmiles: CCC=O\nproperties:\n  boiling_point: {value: 48.0 °C, source: crc-95}\n"
        "  melting_point: {value: 80 °C, source: crc-95}\n", encoding="utf-8")
    return root


def test_an_added_entry_shows_its_derived_summary_and_its_check_findings(added_repo):
    report = change_report(added_repo / "entries")
    assert report.added == [("propanal", "Propanal")]
    summary = {k: text for k, _, text in report.added_summary["propanal"]}
    assert {"dominant_force", "boiling_point", "volatility_band"} <= set(summary)
    assert "48.0 °C" in summary["boiling_point"]
    assert any(d.severity == "error" and "melting point" in d.message for d in report.findings["propanal"])
    text = markdown(report)
    assert "#### Added: `propanal` — Propanal" in text and "- dominant force: " in text
    assert "propanal.yaml:5:26: error: melting point" in text and "findings" in text
    # one entry: singular; other entries whose links moved get one line each
    from builder.review.diffreport import Report

    assert text.splitlines()[2].startswith(f"{1 + len(report.changed)} entries: 1 added")
    assert "1 entry: 1 added, 0 removed, 0 changed." in markdown(Report("a", "b", added=[("x", "X")]))
    for eid in report.links_only:
        assert f"#### `{eid}`" not in text
        assert sum(line.startswith(f"- `{eid}` ") for line in text.splitlines()) == 1


def test_cross_link_only_changes_collapse_to_one_line(report):
    assert report.links_only and all({k for k, _, _ in report.changed[e]} == {"links"} for e in report.links_only)
    text = markdown(report)
    assert "**Cross-links only:**" in text
    for eid in report.links_only:
        assert f"#### `{eid}`" not in text
    assert "#### `toluene`" in text  # a real change keeps its table


def test_antoine_coefficient_c_is_not_read_as_celsius(repo):
    from builder.review.diffreport import snapshot
    from builder.derive.catalog import derive_catalog
    from builder.load.entries import load_catalog

    catalog, _ = load_catalog(DEMO)
    d = next(x for x in derive_catalog(catalog) if x.entry.id == "toluene")
    text = snapshot(d)["stated:antoine"]
    assert "C = −55.525" in text.replace("-", "−") and "T in K" in text


def test_check_counts_are_worded_in_the_singular_for_one(make_entries, capsys):
    folder = make_entries({"ethanol.yaml": "name: Ethanol\nsmiles: CCO\n"},
                          sources="crc-95:\n  title: CRC Handbook\n  kind: handbook\n")
    # Exactly one warning: the bibliography's only source (crc-95) is cited by no entry.
    main(["check", "--entries", str(folder)])
    err = capsys.readouterr().err
    assert err.count("warning: ") == 1 and "'crc-95' is cited by no entry" in err, err
    assert "1 entry, 0 errors, 1 warning" in err and "1 warnings" not in err, err
    assert "1 entries" not in err, err
