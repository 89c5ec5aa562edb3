"""The bad-input corpus: every broken entries folder ends as one diagnostic line and exit 1.

Layout of ``tests/corpus/`` (see its README.md):

- ``_base/``: a small valid catalog (sources.yaml, locations.yaml, one entry);
- ``<case>/``: the files that differ from the base (laid over a copy of it; a file of the
  same name replaces the base's), an optional ``make.py`` whose ``make(entries)`` does what
  a folder cannot hold (a named pipe, a symbolic link, a huge file), and ``expected.txt``:
  the first error line, ``entries/<file>:<line>:<col>: error: <message fragment>``.

For each case the base is built once into a site; ``cohesion build`` on the case must exit 1,
print the expected first error, never a traceback, and leave that site untouched;
``cohesion check`` must report the same first error.
"""
from __future__ import annotations

import hashlib
import importlib.util
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from builder.cli import main
from builder.load import entry_format as fmt

CORPUS = Path(__file__).resolve().parent / "corpus"
BASE = CORPUS / "_base"
CASES = sorted(p.name for p in CORPUS.iterdir() if p.is_dir() and not p.name.startswith(("_", ".")))
#: cases also run as a real process, to prove no traceback escapes outside pytest
IN_SUBPROCESS = ("file-fifo", "number-400-digit-yaml-int", "tag-python-object", "control-character-nul",
                 "sources-list", "antoine-b-typo-too-large")
LINE = re.compile(r"^(?P<path>[^\s:][^:]*):(?P<line>\d+):(?P<col>\d+|\*): error: (?P<message>.+)$")
DIAGNOSTIC = re.compile(r"^(?P<path>[^\s:][^:]*):(?P<line>\d+):(?P<col>\d+): error: (?P<message>.*)$")


def _digest(folder: Path) -> str:
    h = hashlib.sha256()
    for path in sorted(folder.rglob("*")):
        h.update(str(path.relative_to(folder)).encode())
        if path.is_file():
            h.update(path.read_bytes())
    return h.hexdigest()


@pytest.fixture(scope="module")
def base_site(tmp_path_factory):
    """The base catalog built once: (site folder, its digest)."""
    work = tmp_path_factory.mktemp("corpus-base")
    shutil.copytree(BASE, work / "entries")
    site = work / "site"
    assert main(["build", "--entries", str(work / "entries"), "--out", str(site)]) == 0
    return site, _digest(site)


def _case_folder(name: str, work: Path) -> Path:
    """entries/ under ``work``: the base with the case's files laid over it, then its make.py run."""
    entries = work / "entries"
    shutil.copytree(BASE, entries)
    case = CORPUS / name
    for path in sorted(case.iterdir()):
        if path.is_file() and path.name not in ("expected.txt", "make.py"):
            shutil.copyfile(path, entries / path.name)
    if (case / "make.py").exists():
        spec = importlib.util.spec_from_file_location(f"corpus_make_{name.replace('-', '_')}", case / "make.py")
        module = importlib.util.module_from_spec(spec)
        spec.loader.exec_module(module)
        module.make(entries)
    return entries


def _expected(name: str) -> re.Match:
    text = (CORPUS / name / "expected.txt").read_text(encoding="utf-8").splitlines()[0]
    match = LINE.match(text)
    assert match, f"{name}/expected.txt: not 'path:line:col: error: message': {text!r}"
    return match


def _first_error(stderr: str) -> re.Match | None:
    return next((m for m in map(DIAGNOSTIC.match, stderr.splitlines()) if m), None)


def _assert_matches(name: str, stderr: str) -> None:
    assert "Traceback" not in stderr, stderr
    want, got = _expected(name), _first_error(stderr)
    assert got is not None, f"no error line in:\n{stderr}"
    where = f"{got.group(0)}\n  expected: {want.group(0)}"
    assert (got["path"], got["line"]) == (want["path"], want["line"]), where
    assert want["col"] == "*" or got["col"] == want["col"], where
    assert want["message"] in got["message"], where


def test_corpus_is_large_enough():
    assert len(CASES) >= 150


@pytest.mark.parametrize("name", CASES)
def test_case(name, base_site, tmp_path, monkeypatch, capsys):
    site, digest = base_site
    _case_folder(name, tmp_path)
    monkeypatch.chdir(tmp_path)
    capsys.readouterr()
    assert main(["build", "--entries", "entries", "--out", str(site)]) == 1
    build_err = capsys.readouterr().err
    _assert_matches(name, build_err)
    assert _digest(site) == digest, "the previous site was changed"
    assert main(["check", "--entries", "entries"]) == 1
    check_err = capsys.readouterr().err
    _assert_matches(name, check_err)
    assert _first_error(check_err).group(0) == _first_error(build_err).group(0)


@pytest.mark.slow
@pytest.mark.parametrize("name", IN_SUBPROCESS)
def test_case_in_a_real_process(name, base_site, tmp_path):
    site, digest = base_site
    _case_folder(name, tmp_path)
    for command in (["build", "--out", str(site)], ["check"]):
        run = subprocess.run([sys.executable, "-m", "builder", *command, "--entries", "entries"], cwd=tmp_path,
                             capture_output=True, text=True, timeout=60, check=False)
        assert run.returncode == 1, run.stderr
        _assert_matches(name, run.stderr)
    assert _digest(site) == digest


def test_reserved_names_cover_every_page_the_site_generates(base_site):
    """An entry id or location key may not take a name the site uses for its own pages."""
    site, _ = base_site
    catalog_keys = {"store-a", "store-b", "ethanol"}
    top = {p.name.split(".")[0] for p in site.iterdir() if not p.name.startswith(".")}
    assert top <= set(fmt.SITE_NAMES), sorted(top - set(fmt.SITE_NAMES))
    for folder in ("cards", "stores"):
        stems = {p.stem for p in (site / folder).iterdir()} - catalog_keys
        assert stems <= set(fmt.SITE_NAMES), (folder, sorted(stems - set(fmt.SITE_NAMES)))
    assert (site / "cards" / "all.html").exists() and "all" in fmt.RESERVED_NAMES
    vapor = [p.name for p in (site / "materials").iterdir() if p.stem.endswith(fmt.CHART_SUFFIX)]
    assert vapor == ["ethanol-vapor.svg"]  # why ids ending in -vapor are checked
