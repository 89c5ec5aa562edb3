"""The cache and the worker processes never change what a build writes.

Every check compares a cached, incremental or parallel build with a cold, serial one of the
same entries: they must be byte-identical (our own rule: DEVELOPERS.md, "Speed").
"""
from __future__ import annotations

import hashlib
import io
import subprocess
import sys
from pathlib import Path

import pytest

from builder.cli import Progress, main
from builder.core import cache as cache_module
from builder.core.cache import Cache
from builder.core.output import read_marker
from conftest import ETHANOL, ROOT

TOLUENE = """\
name: Toluene
smiles: Cc1ccccc1
catalog:
  code: T-2
  locations: [store-a]
properties:
  boiling_point:
    value: 110.6 °C
    source: crc-95
"""


def _digest(folder: Path) -> dict[str, str]:
    return {str(p.relative_to(folder)): hashlib.sha256(p.read_bytes()).hexdigest()
            for p in sorted(folder.rglob("*")) if p.is_file()}


def _build(folder: Path, out: Path, *extra: str) -> int:
    return main(["build", "--entries", str(folder), "--out", str(out), *extra])


def _cold(folder: Path, out: Path) -> dict[str, str]:
    assert _build(folder, out, "--no-cache", "--jobs", "1") == 0
    return _digest(out)


@pytest.fixture
def cached(tmp_path, monkeypatch):
    """A cache folder of this test's own."""
    root = tmp_path / "cache"
    monkeypatch.setenv("COHESION_CACHE_DIR", str(root))
    return root


def test_an_unchanged_catalog_is_not_rebuilt(make_entries, tmp_path, cached, capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL, "toluene.yaml": TOLUENE})
    out = tmp_path / "site"
    assert _build(folder, out) == 0
    before = {p: p.stat().st_mtime_ns for p in out.rglob("*") if p.is_file()}
    capsys.readouterr()
    assert _build(folder, out) == 0
    assert "Up to date: 2 datasheets" in capsys.readouterr().out
    assert {p: p.stat().st_mtime_ns for p in out.rglob("*") if p.is_file()} == before


@pytest.mark.parametrize("edit", ["entry", "name", "citation", "store", "source", "model"])
def test_each_kind_of_edit_gives_what_a_cold_build_gives(make_entries, tmp_path, cached, monkeypatch, edit):
    folder = make_entries({"ethanol.yaml": ETHANOL, "toluene.yaml": TOLUENE})
    out = tmp_path / "site"
    assert _build(folder, out) == 0
    first = _digest(out)
    if edit == "entry":
        (folder / "toluene.yaml").write_text(TOLUENE.replace("110.6 °C", "111.0 °C"), encoding="utf-8")
    elif edit == "name":  # shown in every list of uses on the sources and methods pages
        (folder / "toluene.yaml").write_text(TOLUENE.replace("name: Toluene", "name: Methylbenzene"), encoding="utf-8")
    elif edit == "citation":  # the boiling point cites another source: it moves to that source's list
        (folder / "toluene.yaml").write_text(TOLUENE.replace("source: crc-95", "source: lab"), encoding="utf-8")
    elif edit == "store":
        text = (folder / "locations.yaml").read_text(encoding="utf-8")
        (folder / "locations.yaml").write_text(text.replace("30 °C", "45 °C"), encoding="utf-8")
    elif edit == "source":
        text = (folder / "sources.yaml").read_text(encoding="utf-8")
        (folder / "sources.yaml").write_text(text.replace("95th", "96th"), encoding="utf-8")
    else:  # a new model file or code version: every cached result is stale
        monkeypatch.setattr(cache_module, "code_version", lambda: "another code version")
        import builder.derive.catalog as derive_catalog
        import builder.pipeline as pipeline

        monkeypatch.setattr(derive_catalog, "code_version", lambda: "another code version")
        monkeypatch.setattr(pipeline, "code_version", lambda: "another code version")
    assert _build(folder, out) == 0
    incremental = _digest(out)
    cold = _cold(folder, tmp_path / "cold")
    assert incremental == cold
    changed = {k for k in cold if first.get(k) != cold[k]}
    if edit == "entry":
        assert "materials/toluene.html" in changed and "materials/ethanol.html" not in changed
        assert "sources.html" not in changed and "methods.html" not in changed
    elif edit == "name":
        assert {"sources.html", "methods.html"} <= changed
    elif edit == "citation":
        assert "sources.html" in changed
    elif edit == "store":
        assert {"materials/ethanol.html", "stores/store-a.html"} <= changed
    elif edit == "source":
        assert "sources.html" in changed
    else:
        assert changed <= {".cohesion-output"}  # same code in truth: same pages


def test_only_the_edited_entry_is_derived_again(make_entries, cached):
    from builder.derive.catalog import derive_catalog
    from builder.load.entries import load_catalog

    folder = make_entries({"ethanol.yaml": ETHANOL, "toluene.yaml": TOLUENE})
    cache = Cache(cached)
    catalog, _ = load_catalog(folder)
    derive_catalog(catalog, cache=cache)
    assert (cache.hits, cache.misses) == (0, 2)
    (folder / "toluene.yaml").write_text(TOLUENE.replace("T-2", "T-3"), encoding="utf-8")
    catalog, _ = load_catalog(folder)
    derive_catalog(catalog, cache=cache)
    assert (cache.hits, cache.misses) == (1, 3)


def test_only_regular_files_of_the_last_site_are_linked_into_the_next(make_entries, tmp_path, cached):
    # an unchanged page is linked from the site it replaces only when it is a plain file there: one
    # replaced by a symbolic link (to anything) or a folder is written again
    folder = make_entries({"ethanol.yaml": ETHANOL, "toluene.yaml": TOLUENE})
    out = tmp_path / "site"
    assert _build(folder, out) == 0
    outside = tmp_path / "outside.html"
    outside.write_text("not a datasheet", encoding="utf-8")
    sheet, drawing = out / "materials" / "toluene.html", out / "materials" / "toluene.svg"
    made, kept = sheet.read_bytes(), (out / "materials" / "toluene-vapor.svg").stat().st_ino
    sheet.unlink()
    sheet.symlink_to(outside)
    drawing.unlink()
    drawing.mkdir()
    (folder / "ethanol.yaml").write_text(ETHANOL.replace("T-1", "T-9"), encoding="utf-8")  # toluene unchanged
    assert _build(folder, out) == 0
    assert not sheet.is_symlink() and sheet.read_bytes() == made
    assert drawing.is_file() and drawing.read_text(encoding="utf-8").startswith("<?xml")
    assert (out / "materials" / "toluene-vapor.svg").stat().st_ino == kept  # a plain file: linked, not rewritten
    assert outside.read_text(encoding="utf-8") == "not a datasheet"
    assert _digest(out) == _cold(folder, tmp_path / "cold")


def test_a_damaged_cache_file_is_recomputed(make_entries, tmp_path, cached, capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL, "toluene.yaml": TOLUENE})
    assert _build(folder, tmp_path / "site") == 0
    files = sorted((cached / "derive").rglob("*.pickle"))
    assert len(files) == 2
    files[0].write_bytes(b"not a pickle")
    files[1].write_bytes(files[1].read_bytes()[:40])
    capsys.readouterr()
    assert _build(folder, tmp_path / "again", "--verbose") == 0
    err = capsys.readouterr().err
    assert err.count("ignoring unreadable") == 2 and "Traceback" not in err
    assert _digest(tmp_path / "again") == _cold(folder, tmp_path / "cold")


def test_an_unwritable_cache_only_costs_time(make_entries, tmp_path, monkeypatch, capsys):
    blocker = tmp_path / "cache-is-a-file"
    blocker.write_text("x", encoding="utf-8")
    monkeypatch.setenv("COHESION_CACHE_DIR", str(blocker / "sub"))
    folder = make_entries({"ethanol.yaml": ETHANOL})
    assert _build(folder, tmp_path / "site", "--verbose") == 0
    assert "cannot write" in capsys.readouterr().err


@pytest.mark.slow
def test_parallel_and_serial_builds_are_byte_identical(tmp_path):
    demo = ROOT / "entries"
    # separate processes, so no in-memory conformer cache carries over from one build to the other
    for name, jobs in (("serial", "1"), ("parallel", "2")):
        result = subprocess.run([sys.executable, "-m", "builder", "build", "--entries", str(demo), "--out",
                                 str(tmp_path / name), "--no-cache", "--jobs", jobs], cwd=ROOT,
                                capture_output=True, text=True, timeout=600)
        assert result.returncode == 0, result.stderr
    assert _digest(tmp_path / "serial") == _digest(tmp_path / "parallel")
    summary = read_marker(tmp_path / "parallel")
    assert summary["entries"] == len(list(demo.glob("*.yaml"))) - 2  # less sources.yaml, locations.yaml


def test_progress_shows_on_a_terminal_only():
    class Terminal(io.StringIO):
        def isatty(self):
            return True

    tty, pipe = Terminal(), io.StringIO()
    for stream in (tty, pipe):
        progress = Progress(stream)
        progress.started -= Progress.DELAY_S  # a build that has run for a while
        progress("derive", 3, 10)
        progress.close()
    assert "derive 3/10" in tty.getvalue() and tty.getvalue().endswith("\r\x1b[K")
    assert pipe.getvalue() == ""
    quick = Terminal()
    Progress(quick)("derive", 1, 2)  # the first two seconds stay quiet
    assert quick.getvalue() == ""


def test_a_build_to_a_pipe_prints_no_progress(make_entries, tmp_path):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    result = subprocess.run([sys.executable, "-m", "builder", "build", "--entries", str(folder), "--out",
                             str(tmp_path / "site")], cwd=ROOT, capture_output=True, text=True, timeout=300)
    assert result.returncode == 0
    assert "\r" not in result.stderr and "\x1b" not in result.stderr


def test_a_defect_while_deriving_is_an_error_on_the_entry_not_a_traceback(make_entries, tmp_path, monkeypatch,
                                                                          capsys):
    import builder.derive.catalog as derive_catalog

    def broken(entry, stores, components=None):
        raise ZeroDivisionError("float division by zero")

    monkeypatch.setattr(derive_catalog, "derive_entry", broken)
    folder = make_entries({"ethanol.yaml": ETHANOL})
    assert _build(folder, tmp_path / "site", "--no-cache") == 1
    err = capsys.readouterr().err
    assert "ethanol.yaml:3:9: error: the builder failed while deriving this entry (ZeroDivisionError" in err
    assert "Traceback" not in err and not (tmp_path / "site").exists()


def test_loaded_entries_come_from_the_cache_until_their_inputs_change(make_entries, cached):
    """A file's validated entry is reused while its text, the sources, the stores and the code are
    the same; what the cache gives equals what loading afresh gives."""
    from builder.load.entries import load_catalog

    folder = make_entries({"ethanol.yaml": ETHANOL, "toluene.yaml": TOLUENE})
    fresh = load_catalog(folder)
    cache = Cache(cached)
    assert load_catalog(folder, cache=cache) == fresh and (cache.hits, cache.misses) == (0, 2)
    assert load_catalog(folder, cache=cache) == fresh and (cache.hits, cache.misses) == (2, 2)
    (folder / "toluene.yaml").write_text(TOLUENE.replace("T-2", "T-3"), encoding="utf-8")
    edited = load_catalog(folder, cache=cache)
    assert (cache.hits, cache.misses) == (3, 3)
    assert edited == load_catalog(folder) and edited != fresh
    sources = folder / "sources.yaml"
    sources.write_text(sources.read_text(encoding="utf-8").replace("95th", "96th"), encoding="utf-8")
    assert load_catalog(folder, cache=cache) == load_catalog(folder) and (cache.hits, cache.misses) == (3, 5)
    for damaged in (cached / "load").rglob("*.pickle"):
        damaged.write_bytes(b"not a pickle")
    assert load_catalog(folder, cache=cache) == load_catalog(folder) and cache.misses == 7


def test_solvency_relations_are_reused_until_a_liquids_record_changes(tmp_path, cached):
    """The substitutes and sphere matches depend only on the liquids' ranking records and the
    resins' spheres: an edit elsewhere (a solid's note) reuses them; a liquid's flash point does not."""
    import shutil

    from conftest import DEMO

    from builder.derive.catalog import derive_catalog
    from builder.derive.solvency import solvency_relations
    from builder.load.entries import load_catalog

    folder = tmp_path / "entries"
    shutil.copytree(DEMO, folder)
    cache = Cache(cached)

    def relations():
        derived = derive_catalog(load_catalog(folder)[0])
        return solvency_relations(derived, cache), solvency_relations(derived)

    cached_first, fresh = relations()
    # no relations of these records, nor of a last build, are kept yet
    assert cached_first == fresh and fresh.substitutes and fresh.matches and (cache.hits, cache.misses) == (0, 2)
    stearic = folder / "stearic-acid.yaml"
    stearic.write_text(stearic.read_text(encoding="utf-8").replace("notes: >-", "notes: >-\n  Checked again.", 1),
                       encoding="utf-8")
    reused, fresh = relations()
    assert reused == fresh and (cache.hits, cache.misses) == (1, 2)
    toluene = folder / "toluene.yaml"
    toluene.write_text(toluene.read_text(encoding="utf-8").replace("value: 4.0 °C", "value: 30.0 °C"), encoding="utf-8")
    changed, fresh = relations()
    # the records changed: the last build's relations are updated, and equal ranking everything again
    assert changed == fresh and changed != cached_first and (cache.hits, cache.misses) == (2, 3)


def test_rows_of_the_catalog_wide_pages_are_kept_between_builds(tmp_path, cached, monkeypatch):
    """After one entry's boiling point changes, each listing page makes again only the pieces of that
    entry (one row, one card) and takes the rest from the last build; the site equals a cold build,
    also when a file of kept pieces is damaged."""
    import shutil

    from conftest import DEMO

    from builder.derive.catalog import entry_keys
    from builder.load.entries import load_catalog
    from builder.publish import pieces as pieces_module

    folder = tmp_path / "entries"
    shutil.copytree(DEMO, folder)
    made: dict[str, tuple[int, int]] = {}
    original_init, original_save = pieces_module.Pieces.__init__, pieces_module.Pieces.save

    def init(self, cache, base, path):
        original_init(self, cache, base, path)
        self.path = path

    def save(self):
        made[self.path] = (self.made, len(self.used))
        original_save(self)

    monkeypatch.setattr(pieces_module.Pieces, "__init__", init)
    monkeypatch.setattr(pieces_module.Pieces, "save", save)
    out = tmp_path / "site"
    assert _build(folder, out, "--jobs", "1") == 0
    entries = len(list(folder.glob("*.yaml"))) - 2
    assert made["index.html"] == (entries, entries) and made["catalog.csv"] == (entries, entries)
    assert any((cached / "templates").iterdir())  # the compiled templates are kept too
    toluene = folder / "toluene.yaml"
    text = toluene.read_text(encoding="utf-8")
    assert "value: 383.75 K" in text
    before = entry_keys(load_catalog(folder)[0])
    toluene.write_text(text.replace("value: 383.75 K", "value: 384.75 K"), encoding="utf-8")
    after = entry_keys(load_catalog(folder)[0])
    changed = {k for k in after if before.get(k) != after[k]}  # toluene and the blends that contain it
    assert "toluene" in changed and len(changed) < entries // 4
    made.clear()
    assert _build(folder, out, "--jobs", "1") == 0
    for page in ("index.html", "catalog.csv", "categories.html", "cards/all.html"):
        assert made[page][0] == len(changed), page  # the rows (or cards) of those entries only
    assert made["trends.html"][0] == 1  # of those, only toluene is a molecule on the chart
    assert made["index.html"][1] == entries
    assert _digest(out) == _cold(folder, tmp_path / "cold")
    for kept in (cached / pieces_module.KIND).rglob("*.pickle"):
        kept.write_bytes(b"not a pickle")
    toluene.write_text(text, encoding="utf-8")
    made.clear()
    assert _build(folder, out, "--jobs", "1") == 0
    assert made["index.html"][0] == entries
    assert _digest(out) == _cold(folder, tmp_path / "cold-again")


def test_an_edit_writes_again_only_the_shards_of_pieces_that_changed(tmp_path, cached, monkeypatch):
    """The pieces of a catalog-wide file are kept in shards: after one entry's edit a file's pieces are
    written again only in the shards that lost or gained a piece (at most two per changed entry), and a
    build with nothing changed writes none; the site still equals a cold build."""
    import shutil

    from conftest import DEMO

    from builder.derive.catalog import entry_keys
    from builder.load.entries import load_catalog
    from builder.publish import pieces as pieces_module

    folder = tmp_path / "entries"
    shutil.copytree(DEMO, folder)
    out = tmp_path / "site"
    written: dict[str, int] = {}
    original_init, original_put = pieces_module.Pieces.__init__, Cache.put
    shard_of: dict[str, str] = {}

    made: dict[str, int] = {}
    original_save = pieces_module.Pieces.save

    def init(self, cache, base, path):
        original_init(self, cache, base, path)
        shard_of.update({self._shard_key(i): path for i in range(pieces_module.SHARDS)})
        self.path = path

    def save(self):
        made[self.path] = self.made
        original_save(self)

    def put(self, kind, key, value):
        if kind == pieces_module.KIND:
            written[shard_of[key]] = written.get(shard_of[key], 0) + 1
        original_put(self, kind, key, value)

    monkeypatch.setattr(pieces_module.Pieces, "__init__", init)
    monkeypatch.setattr(pieces_module.Pieces, "save", save)
    monkeypatch.setattr(Cache, "put", put)
    assert _build(folder, out, "--jobs", "1") == 0
    assert written["catalog.json"] > 2  # the demo's pieces fill more than two shards
    toluene = folder / "toluene.yaml"
    text = toluene.read_text(encoding="utf-8")
    before = entry_keys(load_catalog(folder)[0])
    toluene.write_text(text.replace("value: 383.75 K", "value: 384.75 K"), encoding="utf-8")
    changed = {k for k, v in entry_keys(load_catalog(folder)[0]).items() if before.get(k) != v}
    written.clear()
    assert _build(folder, out, "--jobs", "1") == 0
    # a row of the index shows only its entry: its pieces changed with the edited entries
    assert 0 < written["index.html"] <= 2 * len(changed) < pieces_module.SHARDS
    # catalog.json's pieces also hold each entry's links, so neighbours of the edited entry change too
    assert all(0 < n <= 2 * made[path] for path, n in written.items()), (written, made)
    assert written["catalog.json"] < pieces_module.SHARDS
    assert _digest(out) == _cold(folder, tmp_path / "cold")
    written.clear()
    (folder / "README.txt").write_text("not an entry, but an input of the site\n", encoding="utf-8")
    assert _build(folder, out, "--jobs", "1") == 0
    assert written == {}


def test_store_compatibility_is_kept_until_a_members_storage_changes(tmp_path, cached):
    """What the cache gives equals working it out afresh; a member's new hazard statement (a new
    storage class) is not answered from the cache."""
    import shutil

    from conftest import DEMO

    from builder.derive.catalog import derive_catalog
    from builder.load.entries import load_catalog
    from builder.publish.stores import KeptCompatibility, compat_counts, store_compatibility

    folder = tmp_path / "entries"
    shutil.copytree(DEMO, folder)
    cache = Cache(cached)

    def both():
        catalog = load_catalog(folder)[0]
        derived = derive_catalog(catalog)
        kept = KeptCompatibility(catalog, derived, cache)
        return ({k: (kept.full(k), kept.counts(k)) for k in catalog.locations},
                {k: (store_compatibility(catalog, derived, k),) * 2 for k in catalog.locations})

    first, fresh = both()
    assert {k: v[0] for k, v in first.items()} == {k: v[0] for k, v in fresh.items()}
    assert all(counts == compat_counts(full) for full, counts in first.values())
    assert any(counts["count"] for _, counts in first.values())  # the demo has conflicts to count
    misses = cache.misses
    again, _ = both()
    assert again == first and cache.misses == misses  # every store answered from the cache
    ether = folder / "diethyl-ether.yaml"
    text = ether.read_text(encoding="utf-8")
    assert "hazard_statements:" in text
    ether.write_text(text.replace("hazard_statements: [", "hazard_statements: [H271, ", 1), encoding="utf-8")
    changed, fresh = both()
    assert {k: v[0] for k, v in changed.items()} == {k: v[0] for k, v in fresh.items()}
    assert changed != first and cache.misses > misses


def test_a_build_leaves_the_garbage_collector_as_it_found_it(make_entries, tmp_path):
    """The build freezes the loaded catalog against the collector while it writes the site, and
    thaws it after, also when the build fails."""
    import gc

    folder = make_entries({"ethanol.yaml": ETHANOL, "toluene.yaml": TOLUENE})
    assert gc.get_freeze_count() == 0
    assert _build(folder, tmp_path / "site", "--no-cache") == 0
    assert gc.get_freeze_count() == 0 and gc.isenabled()
    (folder / "toluene-again.yaml").write_text(TOLUENE.replace("T-2", "T-9"), encoding="utf-8")
    assert _build(folder, tmp_path / "site2", "--no-cache") == 1  # the same structure twice: found after deriving
    assert gc.get_freeze_count() == 0 and gc.isenabled()
