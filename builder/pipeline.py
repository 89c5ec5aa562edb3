"""The build: load → derive → check → link → publish. The only place the stages meet.

``build`` validates every entry (``builder.load``), derives each one
(``builder.derive``), runs the cross-entry checks (``builder.review``) and renders the
site (``builder.publish``) into a fresh folder that replaces ``--out`` only when
complete (``builder.core.output``). ``print_catalog`` builds the site into a temporary
folder and prints its printouts to PDF the same way.
"""
from __future__ import annotations

import gc
import os
import tempfile
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from builder.core.cache import Cache, code_version, collector_paused, key_of, settings_key
from builder.core.diagnostics import CatalogError, Diagnostic
from builder.core.output import (
    guard_target,
    read_marker,
    replace_folder,
    tidy,
    write_marker,
)
from builder.publish.revision import Revision, entries_revision

if TYPE_CHECKING:  # the stages themselves are imported when needed: an up-to-date site needs none of them
    from builder.core.model import Catalog
    from builder.derive.entry import Derived


@dataclass(frozen=True)
class BuiltSite:
    """What a build did. ``catalog`` and ``derived`` are None when the site was already up to date."""

    catalog: Catalog | None
    derived: tuple[Derived, ...] | None
    diagnostics: tuple[Diagnostic, ...]
    pages: tuple[str, ...]
    entries: int = 0
    up_to_date: bool = False


def _quiet(stage: str, done: int, total: int) -> None:
    pass


def inputs_key(entries_dir: Path, revision: Revision) -> str:
    """Everything a site is made from: the code, the settings, every file of the entries folder, git's dates."""
    parts = [code_version(), settings_key(), repr(revision)]
    for path in sorted(Path(entries_dir).iterdir()):
        if path.is_file() and not path.is_symlink():
            parts += [path.name, path.read_bytes()]
        elif path.is_symlink():
            parts += [path.name, "link:" + os.readlink(path)]
        else:  # a folder or a named pipe named like an entry is an error the loader must report
            parts += [path.name, "not a regular file"]
    return key_of("site", *parts)


def build(entries_dir: Path, out: Path, waiting_message=None, jobs: int | None = 1, cache: Cache | None = None,
          progress=None) -> BuiltSite:
    """Build the site for ``entries_dir`` into ``out``; raises ``CatalogError`` on any error.

    ``out`` is checked first (``output.guard_target``: ``OutputRefused`` when it may not be
    replaced) and is replaced whole only when every page is written (``OutputFailed`` when
    the disk refuses). With a ``cache``, derived results are reused where their inputs are
    unchanged, and a site whose inputs are all unchanged is left as it is. ``jobs``: worker
    processes for deriving (None: the CPUs available). ``progress(stage, done, total)``.
    """
    progress = progress or _quiet
    entries_dir = Path(entries_dir)
    guard_target(Path(out), protect=(entries_dir,))
    revision = entries_revision(entries_dir)
    key = inputs_key(entries_dir, revision) if entries_dir.is_dir() else None
    caching = cache is not None and cache.root is not None
    summary = read_marker(Path(out)) if caching else None
    if key is not None and summary:
        if summary.get("inputs") == key:
            tidy(Path(out), waiting_message)
            diags = tuple(Diagnostic(**d) for d in summary.get("diagnostics", []))
            return BuiltSite(None, None, diags, tuple(summary.get("files", ())), summary.get("entries", 0), True)
    from builder.derive.catalog import derive_catalog
    from builder.load.entries import load_catalog

    progress("load", 0, 1)
    # reading (mostly from the cache) and deriving make millions of objects that live until the build
    # ends, and no cyclic garbage (checked on the CRC catalog): the collector is paused meanwhile, then
    # the catalog is set aside from it (gc.freeze) so it is not scanned again and again while the site
    # is made, nor its memory pages touched by the forked writers; worker processes collect as usual
    with collector_paused():
        catalog, diagnostics = load_catalog(entries_dir, cache=cache)
        if catalog is None:
            raise CatalogError(diagnostics)
        derived = derive_catalog(catalog, jobs=jobs, cache=cache, progress=lambda d, t: progress("derive", d, t))
        gc.freeze()
    try:
        return _check_and_publish(entries_dir, out, key, summary, revision, catalog, diagnostics, derived,
                                  waiting_message, jobs, cache, progress)
    finally:
        gc.unfreeze()


def _check_and_publish(entries_dir, out, key, summary, revision, catalog, diagnostics, derived, waiting_message,
                       jobs, cache, progress) -> BuiltSite:
    from builder.derive.catalog import available_cpus
    from builder.publish.site import render_site
    from builder.review.plausibility import check_catalog

    progress("check", 0, 1)
    findings = [f for d in derived for f in d.findings] + check_catalog(catalog, derived)
    all_diags = tuple(sorted(diagnostics + findings))
    if any(d.severity == "error" for d in all_diags):
        raise CatalogError(list(all_diags))
    with replace_folder(Path(out), protect=(entries_dir,), waiting_message=waiting_message) as tmp:
        keys: dict[str, str] = {}
        previous_keys = summary.get("pages") if summary and isinstance(summary.get("pages"), dict) else None
        pages = render_site(catalog, derived, tmp, all_diags, revision,
                            progress=lambda d, t: progress("render", d, t),
                            previous=Path(out).resolve() if previous_keys else None, previous_keys=previous_keys,
                            keys=keys, cache=cache, jobs=available_cpus() if jobs is None else jobs)
        write_marker(tmp, {"inputs": key, "entries": len(derived), "files": sorted(pages),
                           "diagnostics": [d.as_dict() for d in all_diags], "pages": keys})
    return BuiltSite(catalog, derived, all_diags, tuple(pages), len(derived))


def print_catalog(entries: Path, out: Path, papers=None, jobs: int = 2) -> list[Path]:
    """Write ``out/<paper>/<page>.pdf`` for every printable page; returns the PDF paths."""
    from builder.publish.printing import PAPERS, find_chromium_or_fail, print_pages

    papers = papers or PAPERS
    chromium = find_chromium_or_fail()
    guard_target(out, protect=(Path(entries),))
    with tempfile.TemporaryDirectory(prefix="cohesion-print-") as work:
        work = Path(work)
        site = work / "site"
        build(entries, site)
        with replace_folder(out, protect=(Path(entries),)) as pdf_root:
            print_pages(chromium, work, site, pdf_root, papers, jobs)
    return sorted(Path(out).resolve().rglob("*.pdf"))
