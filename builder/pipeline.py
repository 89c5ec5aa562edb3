"""The build: load → derive → check → link → publish. The only place the stages meet.

``build`` validates every entry (``builder.load``), derives each one
(``builder.derive``), runs the cross-entry checks (``builder.review``) and renders the
site (``builder.publish``) into a fresh folder that replaces ``--out`` only when
complete (``builder.core.output``). ``print_catalog`` builds the site into a temporary
folder and prints its printouts to PDF the same way.
"""
from __future__ import annotations

import tempfile
from dataclasses import dataclass
from pathlib import Path

from builder.core.diagnostics import CatalogError, Diagnostic
from builder.core.model import Catalog
from builder.core.output import guard_target, replace_folder
from builder.derive.catalog import derive_catalog
from builder.derive.entry import Derived
from builder.load.entries import load_catalog
from builder.publish.printing import PAPERS, find_chromium_or_fail, print_pages
from builder.publish.revision import entries_revision
from builder.publish.site import render_site
from builder.review.plausibility import check_catalog


@dataclass(frozen=True)
class BuiltSite:
    catalog: Catalog
    derived: tuple[Derived, ...]
    diagnostics: tuple[Diagnostic, ...]
    pages: tuple[str, ...]


def build(entries_dir: Path, out: Path, waiting_message=None) -> BuiltSite:
    """Build the site for ``entries_dir`` into ``out``; raises ``CatalogError`` on any error.

    ``out`` is checked first (``output.guard_target``: ``OutputRefused`` when it may not be
    replaced) and is replaced whole only when every page is written (``OutputFailed`` when
    the disk refuses).
    """
    guard_target(Path(out), protect=(Path(entries_dir),))
    catalog, diagnostics = load_catalog(entries_dir)
    if catalog is None:
        raise CatalogError(diagnostics)
    derived = derive_catalog(catalog)
    findings = [f for d in derived for f in d.findings] + check_catalog(catalog, derived)
    all_diags = tuple(sorted(diagnostics + findings))
    if any(d.severity == "error" for d in all_diags):
        raise CatalogError(list(all_diags))
    with replace_folder(Path(out), protect=(Path(entries_dir),), waiting_message=waiting_message) as tmp:
        pages = render_site(catalog, derived, tmp, all_diags, entries_revision(Path(entries_dir)))
    return BuiltSite(catalog, derived, all_diags, tuple(pages))


def print_catalog(entries: Path, out: Path, papers=PAPERS, jobs: int = 2) -> list[Path]:
    """Write ``out/<paper>/<page>.pdf`` for every printable page; returns the PDF paths."""
    chromium = find_chromium_or_fail()
    guard_target(out, protect=(Path(entries),))
    with tempfile.TemporaryDirectory(prefix="cohesion-print-") as work:
        work = Path(work)
        site = work / "site"
        build(entries, site)
        with replace_folder(out, protect=(Path(entries),)) as pdf_root:
            print_pages(chromium, work, site, pdf_root, papers, jobs)
    return sorted(Path(out).resolve().rglob("*.pdf"))
