"""End to end: build the demo catalog, parse every page, check provenance and links."""
from __future__ import annotations

import hashlib
import json
import subprocess
import sys
from html.parser import HTMLParser
from pathlib import Path
from urllib.parse import urldefrag

import pytest
from conftest import DEMO, ETHANOL, ROOT

from builder.cli import main
from builder.core.values import KINDS
from builder.pipeline import build


class _Page(HTMLParser):
    def __init__(self):
        super().__init__()
        self.ids: set[str] = set()
        self.links: list[str] = []
        self.values: list[dict] = []
        self._in_value = 0
        self._last_value = None
        self.value_tags: list[tuple[dict, str | None]] = []

    def handle_starttag(self, tag, attrs):
        attrs = dict(attrs)
        if "id" in attrs:
            self.ids.add(attrs["id"])
        for key in ("href", "src"):
            if key in attrs:
                self.links.append(attrs[key])
        classes = (attrs.get("class") or "").split()
        if "value" in classes:
            self.values.append(attrs)
            self._last_value = attrs
        elif tag == "a" and "tag" in classes and self._last_value is not None:
            self.value_tags.append((self._last_value, attrs.get("href")))
            self._last_value = None


def _parse(path: Path) -> _Page:
    page = _Page()
    page.feed(path.read_text(encoding="utf-8"))
    return page


@pytest.fixture(scope="module")
def demo_site(tmp_path_factory):
    out = tmp_path_factory.mktemp("demo") / "site"
    built = build(DEMO, out)
    return out, built


def _digest(folder: Path) -> dict[str, str]:
    return {str(p.relative_to(folder)): hashlib.sha256(p.read_bytes()).hexdigest()
            for p in sorted(folder.rglob("*")) if p.is_file()}


@pytest.mark.slow
def test_every_value_carries_a_provenance_kind_and_a_resolving_tag(demo_site):
    out, built = demo_site
    pages = sorted(out.rglob("*.html"))
    assert len(pages) >= len(built.derived) + 3
    parsed = {p: _parse(p) for p in pages}
    total = 0
    for path, page in parsed.items():
        for attrs in page.values:
            assert attrs.get("data-provenance") in KINDS, (path, attrs)
            total += 1
        # every value is followed by its tag, linking to a source or method anchor that exists
        assert len(page.value_tags) == len(page.values), path
        for _, href in page.value_tags:
            target, anchor = urldefrag(href)
            target_path = (path.parent / target).resolve()
            assert target_path.exists(), (path, href)
            assert anchor in parsed[target_path].ids, (path, href)
    assert total > 100


@pytest.mark.slow
def test_no_broken_internal_links_and_no_external_requests(demo_site):
    out, _ = demo_site
    for path in sorted(out.rglob("*.html")):
        page = _parse(path)
        for link in page.links:
            assert "://" not in link and not link.startswith("/"), (path, link)
            target, anchor = urldefrag(link)
            target_path = (path.parent / target).resolve() if target else path
            assert target_path.is_file(), (path, link)
            if anchor:
                assert anchor in _parse(target_path).ids, (path, link)


@pytest.mark.slow
def test_every_entry_has_a_datasheet_with_its_caution(demo_site):
    out, built = demo_site
    for d in built.derived:
        html = (out / "materials" / f"{d.entry.id}.html").read_text(encoding="utf-8")
        assert "not a safety data sheet" in html
        assert d.entry.name.split()[0] in html


@pytest.mark.slow
def test_two_builds_are_byte_identical(demo_site, tmp_path):
    # The second build runs in a fresh interpreter (no shared in-memory conformer cache,
    # another hash seed) and without the on-disk cache, so nothing is reused.
    out, _ = demo_site
    again = tmp_path / "again"
    subprocess.run([sys.executable, "-m", "builder", "build", "--no-cache", "--jobs", "1", "--quiet",
                    "--entries", str(DEMO), "--out", str(again)], cwd=ROOT, check=True,
                   capture_output=True, text=True)
    first, second = _digest(out), _digest(again)
    differing = sorted(k for k in first.keys() | second.keys() if first.get(k) != second.get(k))
    assert not differing, differing


def test_failed_build_leaves_the_previous_site_untouched(make_entries, tmp_path, capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    out = tmp_path / "site"
    assert main(["build", "--entries", str(folder), "--out", str(out)]) == 0
    before = _digest(out)
    (folder / "broken.yaml").write_text("name: Broken\nsmiles: C1CC\n", encoding="utf-8")
    assert main(["build", "--entries", str(folder), "--out", str(out)]) == 1
    err = capsys.readouterr().err
    assert "broken.yaml:2:9: error: SMILES 'C1CC' does not parse" in err
    assert _digest(out) == before
    assert not [p for p in out.parent.iterdir() if p.name.startswith(".site.")]


def test_check_reports_and_exits_1_without_touching_site(make_entries, tmp_path, capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL.replace("78.3 °C", "78.3 kPa")})
    assert main(["check", "--entries", str(folder)]) == 1
    err = capsys.readouterr().err
    assert "ethanol.yaml:9:12: error: boiling_point: 'kPa' is not a unit of temperature" in err
    assert not (tmp_path / "site").exists()


def test_check_named_files_only(make_entries, capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL, "broken.yaml": "name: B\n"})
    assert main(["check", "--entries", str(folder), str(folder / "ethanol.yaml")]) == 0
    assert main(["check", "--entries", str(folder)]) == 1


def test_usage_errors_exit_2():
    with pytest.raises(SystemExit) as info:
        main(["frobnicate"])
    assert info.value.code == 2


def test_demo_catalog_is_clean_under_strict_check_but_for_its_planted_store_conflict(capsys):
    # the demo keeps an oxidiser in the solvent bunker on purpose (issue 12): that one store warning
    # is the only finding, so --strict fails on it and on nothing else
    assert main(["check", "--entries", str(DEMO), "--strict"]) == 1
    err = capsys.readouterr().err
    findings = [line for line in err.splitlines() if ": warning: " in line or ": error: " in line]
    assert len(findings) == 1, findings
    assert findings[0].startswith("entries/potassium-persulfate.yaml:") or "potassium-persulfate.yaml:" in findings[0]
    assert "store 'solvent-bunker'" in findings[0] and "keep separate" in findings[0]


def test_console_script_and_module_entry_point(tmp_path):
    # `python -m builder` runs the same command line as the `cohesion` console script
    result = subprocess.run([sys.executable, "-m", "builder", "profile", "CCO", "--json"], cwd=ROOT,
                            capture_output=True, text=True, check=True)
    assert json.loads(result.stdout)["formula"] == "C2H6O"


def test_the_command_exits_with_mains_status_and_flushed_output(tmp_path):
    """The command ends without freeing its objects one by one (``builder.cli.run``): its exit status
    is still ``main``'s, buffered output piped to another program is complete, and exit handlers ran
    (here: one registered through ``atexit``, which writes a file)."""
    import tomllib

    script = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))["project"]["scripts"]
    assert script["cohesion"] == "builder.cli:run"
    marker = tmp_path / "handler-ran"
    code = ("import atexit, pathlib, sys; from builder.cli import run; "
            f"atexit.register(pathlib.Path({str(marker)!r}).write_text, 'yes'); run(sys.argv[1:])")
    many = [f"C{'C' * (i % 7)}O" for i in range(40)]
    ok = subprocess.run([sys.executable, "-c", code, "profile", *many, "--json"], cwd=ROOT,
                        capture_output=True, text=True)
    assert ok.returncode == 0
    lines = ok.stdout.splitlines()  # one JSON object per structure, the last one complete
    assert len(lines) == 40 and [json.loads(line)["input"] for line in lines] == many
    assert marker.read_text() == "yes"
    bad = tmp_path / "entries"
    bad.mkdir()
    (bad / "broken.yaml").write_text("name: [unclosed\n", encoding="utf-8")
    failed = subprocess.run([sys.executable, "-c", code, "check", "--entries", str(bad)], cwd=ROOT,
                            capture_output=True, text=True)
    assert failed.returncode == 1 and "broken.yaml:2:1: error: YAML syntax" in failed.stderr
    usage = subprocess.run([sys.executable, "-c", code, "no-such-command"], cwd=ROOT, capture_output=True, text=True)
    assert usage.returncode == 2 and "usage:" in usage.stderr
