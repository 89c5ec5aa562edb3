"""The build: load → derive → render into a temporary folder → swap it into place.

Nothing is written to the output folder unless the whole build succeeds; on any
failure the previous site stays exactly as it was.
"""
from __future__ import annotations

import os
import shutil
import tempfile
from dataclasses import dataclass
from pathlib import Path

from .derive import Derived, derive_entry
from .diagnostics import CatalogError, Diagnostic
from .entries import load_catalog
from .model import Catalog
from .render import TEMPLATES, Writer, environment
from .structure import depict_svg


@dataclass(frozen=True)
class BuiltSite:
    catalog: Catalog
    derived: tuple[Derived, ...]
    diagnostics: tuple[Diagnostic, ...]
    pages: tuple[str, ...]


def derive_catalog(catalog: Catalog) -> tuple[Derived, ...]:
    """Derive every entry (each a pure function of its entry and the stores it names)."""
    out = []
    for entry in catalog.entries:
        stores = {k: catalog.locations[k] for k in entry.catalog.locations}
        out.append(derive_entry(entry, stores))
    return tuple(out)


def render_site(catalog: Catalog, derived: tuple[Derived, ...], out: Path, diagnostics=()) -> list[str]:
    """Write every page of the site into the (empty) folder ``out``."""
    env = environment()
    writer = Writer(env, out)
    for asset in sorted((TEMPLATES / "assets").iterdir()):
        if asset.is_file():
            writer.copy(f"assets/{asset.name}", asset)
    sources_used: dict[str, list[tuple[Derived, str]]] = {k: [] for k in catalog.sources}
    for d in derived:
        for name, value in d.values.items():
            if value.provenance.source:
                sources_used[value.provenance.source].append((d, name))
        if d.entry.antoine:
            sources_used[d.entry.antoine.source].append((d, "antoine"))
    common = dict(catalog=catalog, derived=derived)
    writer.page("index.html", "index.html", **common)
    writer.page("sources.html", "sources.html", sources_used=sources_used, **common)
    writer.page("methods.html", "methods.html", **common)
    for d in derived:
        if d.identity is not None:
            writer.text(f"materials/{d.entry.id}.svg", depict_svg(d.identity.smiles))
        used = sorted({v.provenance.source for v in d.values.values() if v.provenance.source}
                      | ({d.entry.antoine.source} if d.entry.antoine else set()))
        writer.page(f"materials/{d.entry.id}.html", "datasheet.html", d=d, sources=[catalog.sources[k] for k in used],
                    **common)
    return writer.written


def build(entries_dir: Path, out: Path) -> BuiltSite:
    """Build the site for ``entries_dir`` into ``out``; raises ``CatalogError`` on any error."""
    catalog, diagnostics = load_catalog(entries_dir)
    if catalog is None:
        raise CatalogError(diagnostics)
    derived = derive_catalog(catalog)
    findings = [f for d in derived for f in d.findings]
    all_diags = tuple(sorted(diagnostics + findings))
    out = Path(out).resolve()
    out.parent.mkdir(parents=True, exist_ok=True)
    tmp = Path(tempfile.mkdtemp(dir=out.parent, prefix=f".{out.name}.tmp-"))
    try:
        pages = render_site(catalog, derived, tmp, all_diags)
        _swap(tmp, out)
    except BaseException:
        shutil.rmtree(tmp, ignore_errors=True)
        raise
    return BuiltSite(catalog, derived, all_diags, tuple(pages))


def _swap(tmp: Path, out: Path) -> None:
    """Put ``tmp`` where ``out`` is, keeping the old one until the new one is in place."""
    os.chmod(tmp, 0o755)
    if out.exists():
        old = Path(tempfile.mkdtemp(dir=out.parent, prefix=f".{out.name}.old-"))
        os.rmdir(old)
        os.replace(out, old)
        os.replace(tmp, out)
        shutil.rmtree(old, ignore_errors=True)
    else:
        os.replace(tmp, out)
