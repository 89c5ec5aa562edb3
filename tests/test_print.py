"""Printouts: every demo datasheet is exactly one page on A4 and on US Letter, shelf-card pages
hold the stated number of cards, and the text carries the caution and the entry revision.

PDFs come from headless Chromium (Debian's package, through Playwright); pages are counted
with pypdf.
"""
from __future__ import annotations

import io
import math
import os
import re
import unicodedata

import pytest
from conftest import DEMO, ETHANOL
from pypdf import PdfReader

from builder.cli import main
from builder.pipeline import build
from builder.publish.revision import entries_revision
from builder.publish.templating import CAUTION, revision_text

pytestmark = pytest.mark.browser

CARDS_PER_PAGE = 8


@pytest.fixture(scope="module")
def site(tmp_path_factory):
    out = tmp_path_factory.mktemp("print") / "site"
    return out, build(DEMO, out)


@pytest.fixture(scope="module")
def printer(browser):
    context = browser.new_context()
    page = context.new_page()

    def pdf(url: str, paper: str) -> PdfReader:
        page.goto(url)
        page.wait_for_load_state("load")
        return PdfReader(io.BytesIO(page.pdf(format=paper, print_background=True)))

    yield pdf
    context.close()


def _text(reader: PdfReader) -> str:
    return re.sub(r"\s+", " ", " ".join(p.extract_text() for p in reader.pages))


def _squeezed(text: str) -> str:
    """Text without any white space and with ligatures undone (the PDF text layer writes "ﬂ"):
    a note broken over lines or columns still matches."""
    return re.sub(r"\s+", "", unicodedata.normalize("NFKC", text))


def _assert_unbroken(reader: PdfReader, where: str) -> None:
    """No value split from its unit, no code split at a hyphen, no separator left dangling."""
    for page in reader.pages:
        raw = page.extract_text()
        assert not re.search(r"\d\n\s*(K\b|°C|kPa|g/mol)", raw), (where, raw)
        assert not re.search(r"HM-(S-)?\n", raw), (where, raw)
        assert not re.search(r"·\s*$", raw, re.MULTILINE), (where, raw)


@pytest.mark.parametrize("paper", ["A4", "Letter"])
def test_every_datasheet_prints_on_one_page(site, printer, paper):
    out, built = site
    revision = entries_revision(DEMO)
    longest = max(built.derived, key=lambda d: len((DEMO / f"{d.entry.id}.yaml").read_text(encoding="utf-8")))
    assert longest.entry.id == "2-butoxyethanol"  # the deliberately long demo entry is among those printed
    for d in built.derived:
        reader = printer((out / "materials" / f"{d.entry.id}.html").as_uri(), paper)
        assert len(reader.pages) == 1, f"{d.entry.id} prints on {len(reader.pages)} pages ({paper})"
        text = _text(reader)
        assert "it is not a safety data sheet" in text and "take precedence" in text, d.entry.id
        assert revision_text(revision, d.entry) in text, d.entry.id
        if d.entry.catalog.code:
            assert d.entry.catalog.code in text
        # no note is cut: every handling note and the entry's own notes, in full, in the text layer
        squeezed = _squeezed(text)
        for note in [n.text for n in d.notes] + ([d.entry.notes] if d.entry.notes else []):
            assert _squeezed(note) in squeezed, (d.entry.id, paper, note[:60])
        _assert_unbroken(reader, d.entry.id)


def test_printed_revision_names_a_commit_or_says_there_is_none(site):
    _, built = site
    for d in built.derived:
        line = revision_text(entries_revision(DEMO), d.entry)
        assert re.fullmatch(r"entry revision [0-9a-f]{7,} \(\d{4}-\d\d-\d\d\)|entry revision: .+", line), line


@pytest.mark.parametrize("paper", ["A4", "Letter"])
def test_shelf_card_pages_hold_eight_cards(site, printer, paper):
    out, built = site
    reader = printer((out / "cards" / "all.html").as_uri(), paper)
    n = len(built.derived)
    assert len(reader.pages) == math.ceil(n / CARDS_PER_PAGE)
    codes = [d.entry.catalog.code for d in built.derived]
    per_page = [sum(code in page.extract_text() for code in codes) for page in reader.pages]
    assert per_page[:-1] == [CARDS_PER_PAGE] * (len(per_page) - 1)
    assert sum(per_page) == n
    # every precaution in its short form and the health H-codes, on every card
    from builder.publish.views import card_notes, health_codes

    squeezed = _squeezed(_text(reader))
    for d in built.derived:
        for _, note in card_notes(d):
            assert _squeezed(note) in squeezed, (d.entry.id, note)
        for code in health_codes(d):
            assert code in squeezed, (d.entry.id, code)
    assert "nonederived" not in squeezed
    _assert_unbroken(reader, "cards")


def test_store_sheets_print_on_one_page_with_their_materials(site, printer):
    out, built = site
    for key in built.catalog.locations:
        reader = printer((out / "stores" / f"{key}.html").as_uri(), "A4")
        assert len(reader.pages) == 1, key
        text = _text(reader)
        for d in built.derived:
            if key in d.entry.catalog.locations:
                assert d.entry.catalog.code in text, (key, d.entry.id)
        assert "not a safety data sheet" in text
        _assert_unbroken(reader, key)


def test_print_command_writes_pdfs(make_entries, tmp_path, capsys, chromium_command, monkeypatch):
    monkeypatch.setenv("COHESION_CHROMIUM", chromium_command)
    folder = make_entries({"ethanol.yaml": ETHANOL})
    out = tmp_path / "pdf"
    assert main(["print", "--entries", str(folder), "--out", str(out), "--paper", "a4"]) == 0
    pdfs = sorted(str(p.relative_to(out)) for p in out.rglob("*.pdf"))
    assert pdfs == ["a4/cards/all.pdf", "a4/cards/store-a.pdf", "a4/materials/ethanol.pdf", "a4/stores/store-a.pdf"]
    assert len(PdfReader(out / "a4" / "materials" / "ethanol.pdf").pages) == 1
    assert CAUTION.split(".")[0] in _text(PdfReader(out / "a4" / "materials" / "ethanol.pdf"))


def test_the_print_command_works_as_a_process_of_its_own(make_entries, tmp_path, chromium_command):
    """``cohesion print`` started the way a shell starts it: only fds 0-2 open (subprocess closes the
    rest), so the browser pipes must be placed on fds 3 and 4 without this process's own 3 and 4
    (in pytest those happen to be open, which hid a failure of the command itself), for both jobs."""
    import subprocess
    import sys

    out = tmp_path / "pdf"
    env = dict(os.environ, COHESION_CHROMIUM=chromium_command, COHESION_CACHE_DIR=str(tmp_path / "cache"))
    # the demo catalog: with it the command's own fds 3 and 4 are closed when the browsers start
    done = subprocess.run([sys.executable, "-m", "builder", "print", "--entries", str(DEMO), "--out", str(out),
                           "--paper", "a4", "--jobs", "2"], env=env, capture_output=True, text=True,
                          stdin=subprocess.DEVNULL, timeout=600)
    assert done.returncode == 0, done.stderr
    pdfs = list(out.rglob("*.pdf"))
    assert len(pdfs) == len(list((out / "a4").rglob("*.pdf"))) > len(list(DEMO.glob("*.yaml"))) - 2
    assert len(PdfReader(out / "a4" / "materials" / "ethanol.pdf").pages) == 1


def test_print_without_chromium_says_so(make_entries, tmp_path, capsys, monkeypatch):
    monkeypatch.setitem(os.environ, "COHESION_CHROMIUM", str(tmp_path / "no-such-chromium"))
    folder = make_entries({"ethanol.yaml": ETHANOL})
    assert main(["print", "--entries", str(folder), "--out", str(tmp_path / "pdf")]) == 3
    assert "headless Chromium was not found" in capsys.readouterr().err
    assert not (tmp_path / "pdf").exists()
