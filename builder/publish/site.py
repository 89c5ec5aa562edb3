"""Render the derived catalog into a folder: every page, chart and export of the site.

``render_site`` writes into the (fresh, temporary) folder it is given; the pipeline
swaps that folder into place.
"""
from __future__ import annotations

import multiprocessing
from pathlib import Path

from builder.chem.forces import n_alkane_boiling_point
from builder.chem.identity import depict_svg, formula_counts
from builder.core.cache import Cache, code_version, key_of, settings_key
from builder.core.model import Catalog
from builder.core.workers import fork_pool
from builder.derive.catalog import entry_keys as derive_keys
from builder.derive.catalog import store_members
from builder.derive.entry import Derived
from builder.derive.forces import FORCE_WORDS
from builder.derive.links import Link, cross_links, homologous_series, links_text
from builder.derive.solvency import params_of, solvency_relations, solvent_of
from builder.publish import exports, solvency_chart, svgchart
from builder.publish.pieces import Pieces
from builder.publish.revision import Revision
from builder.publish.stores import KeptCompatibility, store_sheet
from builder.publish.templating import (
    FLAMMABLE_CATEGORIES,
    TEMPLATES,
    Writer,
    environment,
    revision_text,
    txy_path,
)
from builder.publish.textsafe import short_path


def _entry_uses(d: Derived) -> tuple[list, list]:
    """The (source key, value name) and (method id, value name) pairs of one entry's values."""
    sources, methods = [], []
    items = list(d.values.items()) + list(d.labels.items())
    if d.forces is not None:
        items += list(d.forces.numbers.items())
    for name, value in items:
        prov = value.provenance
        if prov.source:
            sources.append((prov.source, name))
        if prov.method:
            methods.append((prov.method, name))
    if d.entry.antoine:
        sources.append((d.entry.antoine.source, "antoine"))
    return sources, methods


def _uses(catalog: Catalog, derived) -> tuple[dict, dict]:
    """Back-links: source key → [(derived, value name)], method id → [(derived, value name)], each
    list in order of entry id, then value name, without repeats (one pass over the entries in id
    order: a pair can repeat only within one entry)."""
    by_source: dict[str, list] = {k: [] for k in catalog.sources}
    by_method: dict[str, list] = {}
    for d in sorted(derived, key=lambda d: d.entry.id):
        sources, methods = _entry_uses(d)
        for source, name in sorted(set(sources)):
            if source in by_source:
                by_source[source].append((d, name))
        for method, name in sorted(set(methods)):
            by_method.setdefault(method, []).append((d, name))
    return by_source, by_method


def _groups(catalog: Catalog, derived) -> dict:
    """Entries grouped for the index pages: by dominant force, by store, by possible category."""
    forces: dict[str, list] = {k: [] for k in FORCE_WORDS}
    stores: dict[str, list] = {k: [] for k in catalog.locations}
    categories: dict[str, list] = {"none" if c is None else str(c): [] for c in FLAMMABLE_CATEGORIES}
    for d in derived:
        force = d.label("dominant_force")
        if force is not None:
            forces[force.code].append(d)
        for key in d.entry.catalog.locations:
            stores[key].append(d)
        rng = d.label("flammable_category_range")
        for key in (["none" if c is None else str(c) for c in rng.code] if rng else ["none"]):
            categories[key].append(d)
    forces = {k: sorted(v, key=lambda d: d.get("molar_mass").value) for k, v in forces.items()}
    return {"forces": forces, "stores": stores, "categories": categories,
            "unstored": [d for d in derived if not d.entry.catalog.locations]}


def _catalog_charts(derived, tasks: list, base: str) -> list:
    """Add to ``tasks`` the writing of the catalog-wide charts, each made again only when the data it
    plots changes; returns the homologous series charts as (file name, title, members) for the trends page."""
    points = []
    for d in derived:
        bp, mm = d.get("boiling_point"), d.get("molar_mass")
        if bp is not None and mm is not None:
            force = d.label("dominant_force").code if d.label("dominant_force") else None
            points.append((d.entry.name, mm.value, bp.value, force, bp.kind == "estimated"))
    masses = [p[1] for p in points] or [100.0]
    top = max(min(max(masses) * 1.1, 366.0), 30.0)  # the n-alkane table starts at methane (16 g/mol)
    alkane = [(m, n_alkane_boiling_point(m)) for m in [16.05 + i * (top - 16.05) / 60 for i in range(61)]]
    tasks.append(lambda w: w.made("charts/boiling-vs-mass.svg", key_of(base, "chart", repr(points), repr(alkane)),
                                  lambda: svgchart.boiling_vs_mass_svg(points, alkane)))
    series_charts = []
    for i, series in enumerate(homologous_series(derived)):
        pts = [(d.entry.name, formula_counts(d.identity.formula)[0]["C"], d.get("boiling_point").value)
               for d in series if d.get("boiling_point") is not None]
        title = " → ".join(d.entry.name for d in series)
        name = f"series-{i + 1}.svg"
        tasks.append(lambda w, name=name, title=title, pts=pts: w.made(
            f"charts/{name}", key_of(base, "series", title, repr(pts)), lambda: svgchart.series_svg(title, pts)))
        series_charts.append((name, title, series))
    return series_charts


def render_site(catalog: Catalog, derived: tuple[Derived, ...], out: Path, diagnostics=(),
                revision: Revision | None = None, progress=None, previous: Path | None = None,
                previous_keys: dict | None = None, keys: dict | None = None, cache: Cache | None = None,
                jobs: int = 1) -> list[str]:
    """Write every page of the site into the (empty) folder ``out``; returns the site paths written.

    Every file is made from a key of what it shows (see ``Writer``): with the site it replaces
    (``previous``, and the keys that site was made from, ``previous_keys``) unchanged files
    are linked, not made again. ``keys`` (a dict) receives this build's keys.
    ``progress(done, total)`` is called per datasheet. ``cache`` keeps, between builds, the
    solvency relations, the store compatibility, the compiled templates and the pieces of the
    catalog-wide files (``builder.publish.pieces``: their rows, cards, CSV rows and each entry's
    JSON text in catalog.json). ``jobs``: processes that write
    the datasheets (each writes its own files; the result does not depend on their number).
    """
    cache = cache or Cache(None)
    env = environment(compiled=cache.folder("templates"))
    revision = revision or Revision(None, None, False, {})
    stamp = (f"catalog data of {revision.date[:10]} ({revision.commit[:7]}{', uncommitted changes' if revision.dirty else ''})"
             if revision.commit else "catalog data not under version control")
    env.globals["revision_line"] = lambda entry: (
        f"{revision_text(revision, entry)} · {stamp} · cohesion {env.globals['version']}")
    writer = Writer(env, out, previous, previous_keys)
    base = key_of("site", code_version(), settings_key(), stamp)
    entry_keys = derive_keys(catalog)
    for asset in sorted((TEMPLATES / "assets").iterdir()):
        if asset.is_file():
            writer.copy(f"assets/{asset.name}", asset)
    links: dict[str, tuple[Link, ...]] = cross_links(derived)
    relations = solvency_relations(derived, cache)
    by_id = {d.entry.id: d for d in derived}
    # what every catalog-wide page is made from: each entry as derived, its links, the stores and sources
    link_text = {eid: links_text(own) for eid, own in links.items()}  # each entry's links as a key, made once
    whole = key_of(base, "whole", *(f"{k}={v}" for k, v in sorted(entry_keys.items())),
                   *(f"{k}:{link_text[k]}" for k in sorted(links)),
                   repr(catalog.locations), repr(catalog.sources), repr(tuple(diagnostics)))
    # every catalog-wide file is a task of its own (a function of a writer), run beside the datasheets
    wide: list = []
    series_charts = _catalog_charts(derived, wide, base)
    wide.append(lambda w: w.made("search-index.js", whole, lambda: exports.search_index_js(derived)))
    # each entry's JSON text is made from its entry and its links; catalog.json keeps them as pieces
    parts = {d.entry.id: key_of(base, "json", entry_keys[d.entry.id], link_text.get(d.entry.id, ""))
             for d in derived}

    def json_files(w):
        """Each entry's ``data/<id>.json`` and ``catalog.json``, one task: both hold the entry's JSON
        text, made at most once per build."""
        made: dict[str, str] = {}

        def part(d: Derived) -> str:
            eid = d.entry.id
            if eid not in made:
                made[eid] = exports.entry_part(d, links.get(eid, ()))
            return made[eid]

        for d in derived:
            w.made(f"data/{d.entry.id}.json", parts[d.entry.id],
                   lambda d=d: exports.entry_file_json_from_part(part(d)))
        w.made("catalog.json", whole, lambda: _with_pieces(
            cache, base, "catalog.json", lambda pieces: exports.catalog_json_from_pieces(
                [pieces.get((parts[d.entry.id], "nested"), lambda d=d: exports.catalog_piece(part(d)))
                 for d in derived])))

    wide.append(json_files)
    wide.append(lambda w: w.made("catalog.csv", whole, lambda: _with_pieces(
        cache, base, "catalog.csv", lambda pieces: exports.catalog_csv(derived, pieces, entry_keys))))
    common = dict(catalog=catalog, derived=derived, by_id=by_id, groups=_groups(catalog, derived))
    compat = KeptCompatibility(catalog, derived, cache)

    def listing(w, path, template, key, **context):
        """A catalog-wide page made of pieces (templates/pieces.html), each kept between builds."""
        if not w.reuse(short_path(path), key):
            _with_pieces(cache, base, short_path(path), lambda pieces: w.page(
                path, template, pieces=pieces, entry_keys=entry_keys, **context, **common))

    for path, template in (("index.html", "index.html"), ("forces.html", "by_force.html"),
                           ("stores.html", "by_store.html"), ("categories.html", "by_category.html")):
        wide.append(lambda w, path=path, template=template: listing(w, path, template, whole, compat_counts=compat.counts))
    wide.append(lambda w: listing(w, "trends.html", "trends.html", whole, series_charts=series_charts))
    solvents, resins = solvency_table(derived), spheres(derived)
    # made again only when what it plots changes: names, parameters, dominant forces, spheres
    plotted = repr([(d.entry.id, d.entry.name, p, d.label("dominant_force").code if d.label("dominant_force") else None)
                    for d, p in solvents]) + repr([(d.entry.name, sph) for d, sph in resins])
    wide.append(lambda w: w.made("charts/solvency-map.svg", key_of(base, "solvency-map", plotted),
                                 lambda: solvency_chart.solvency_map_svg(solvents, resins)))
    wide.append(lambda w: listing(w, "solvency.html", "solvency.html", whole, solvents=solvents, spheres=resins,
                                  relations=relations))

    def sources_and_methods(w):
        """Which values cite each source and use each method, worked out once by the worker that
        writes both pages."""
        # each page shows the sources or methods and, per item, which values of which materials use
        # it: the pages' keys are made of each material's id, name and uses, kept under its derive key
        marks = Pieces(cache, base, "uses")
        shown = [marks.get((entry_keys[d.entry.id], "uses"), lambda d=d: repr((d.entry.id, d.entry.name, _entry_uses(d))))
                 for d in derived]
        marks.save()
        sources_key = key_of(base, "sources", repr(catalog.sources), *shown)
        methods_key = key_of(base, "methods", *shown)
        kept = {path: w.reuse(path, key) for path, key in (("sources.html", sources_key), ("methods.html", methods_key))}
        if all(kept.values()):
            return
        by_source, by_method = _uses(catalog, derived)
        if not kept["sources.html"]:
            listing(w, "sources.html", "sources.html", sources_key, sources_used=by_source)
        if not kept["methods.html"]:
            listing(w, "methods.html", "methods.html", methods_key, methods_used=by_method)

    wide.append(sources_and_methods)
    wide.append(lambda w: w.page("build.html", "build.html", key=key_of(whole, repr(revision)),
                                 diagnostics=diagnostics, revision=revision, **common))
    cards_per_page = 8
    wide.append(lambda w: listing(w, "cards/all.html", "cards.html", whole, title="whole catalog", cards=derived,
                                  per_page=cards_per_page))
    by_store = store_members(derived)
    for key, loc in catalog.locations.items():
        members = list(by_store.get(key, ()))
        members_key = key_of(base, "store", repr(loc), *(entry_keys[d.entry.id] for d in members))

        def store_files(w, key=key, loc=loc, members=members, members_key=members_key):
            listing(w, f"cards/{key}.html", "cards.html", members_key, title=loc.name, cards=members,
                    per_page=cards_per_page)
            sheet_key = key_of(members_key, "sheet")  # a store sheet shows only the store and its members
            if not w.reuse(short_path(f"stores/{key}.html"), sheet_key):
                w.page(f"stores/{key}.html", "store_sheet.html", stamp=stamp,
                       **store_sheet(catalog, derived, key, compat.full(key)), **common)
        wide.append(store_files)
    job = _EntryFiles(catalog, by_id, links, link_text, entry_keys, base, revision, common, relations, wide)
    chunks = [list(range(i, min(i + _CHUNK, len(derived)))) for i in range(0, len(derived), _CHUNK)]
    # the catalog-wide tasks first (the big pages take longest), then the datasheets in chunks
    tasks = [("wide", i) for i in range(len(wide))] + [("entries", c) for c in chunks]
    done = 0
    for (kind, what), (written, made_keys, reused) in zip(tasks, _run_tasks(job, writer, tasks, jobs), strict=True):
        writer.written.extend(written)
        writer.keys.update(made_keys)
        writer.reused += reused
        if kind == "entries":
            done = min(done + len(what), len(derived))
            if progress:
                progress(done, len(derived))
    if progress:
        progress(len(derived), len(derived))
    if keys is not None:
        keys.update(writer.keys)
    return writer.written


def _with_pieces(cache: Cache, base: str, path: str, make):
    """``make(pieces)`` with the kept pieces of the site file ``path``, kept again afterwards."""
    pieces = Pieces(cache, base, path)
    result = make(pieces)
    pieces.save()
    return result


def _vapor_chart(d: Derived) -> str:
    store = d.get("store_temperature")
    points = []
    vp = d.entry.properties.get("vapor_pressure")
    if vp is not None:
        points.append(("stated value", dict(vp.conditions)["at"], vp.value))
    return svgchart.vapor_curve_svg([(s.kind, s.temperatures, s.pressures) for s in d.curve], points,
                                    store.value if store else None)


def solvency_table(derived) -> list:
    """(Derived, (δD, δP, δH)) of every catalog liquid with Hansen parameters, by id."""
    return [(d, params_of(d)) for d in derived if solvent_of(d) is not None]


def spheres(derived) -> list:
    """(Derived, sphere) of every entry with a stated solubility sphere."""
    return [(d, d.entry.hansen_sphere) for d in derived if d.entry.hansen_sphere is not None]


def _charts():
    """The matplotlib charts (the T-x-y diagrams of binary mixtures), imported only when one is drawn:
    importing matplotlib takes about half a second, and most incremental builds draw none."""
    from builder.publish import charts

    return charts


def _txy_chart(d: Derived) -> str:
    rows, (xs, bubble, dew) = d.mixture.rows, d.mixture.txy
    return _charts().txy_svg(rows[0].name, rows[1].name, xs, bubble, dew, d.mixture.activity_model.split(" (")[0])


#: entries per task when datasheets are written by several processes
_CHUNK = 16
#: (job, Jinja environment) of the running build, for worker processes started by fork (they inherit it)
_FORKED: tuple | None = None


class _EntryFiles:
    """Everything needed to write one entry's files (drawing, vapor chart, datasheet), and
    the catalog-wide files as functions of a writer (``wide``), for the tasks of ``_run_tasks``."""

    def __init__(self, catalog, by_id, links, link_text, entry_keys, base, revision, common, relations, wide=()):
        self.catalog, self.by_id, self.links, self.link_text = catalog, by_id, links, link_text
        self.wide = list(wide)  # the catalog-wide files, each a function of a writer
        self.relations = relations
        self.entry_keys, self.base, self.revision, self.common = entry_keys, base, revision, common
        self.derived = common["derived"]

    def write(self, writer: Writer, d: Derived) -> None:
        catalog, by_id, base = self.catalog, self.by_id, self.base
        eid = d.entry.id
        own = self.entry_keys[eid]
        if d.identity is not None:
            smiles = d.identity.smiles
            highlight = tuple(sorted({i for a in d.hazard_alerts for i in a.atoms}))
            # keyed by what it draws alone: an edited value leaves the drawing as it was
            writer.made(f"materials/{eid}.svg", key_of(base, "drawing", smiles, repr(highlight)),
                        lambda: depict_svg(smiles, highlight=highlight))
        if d.curve:
            writer.made(f"materials/{eid}-vapor.svg", key_of(base, "vapor", own), lambda: _vapor_chart(d))
        if d.mixture is not None and d.mixture.txy is not None:
            writer.made(txy_path(eid), key_of(base, "txy", own), lambda: _txy_chart(d))
        mine = self.links.get(eid, ())
        used = sorted({v.provenance.source for v in d.values.values() if v.provenance.source}
                      | ({d.entry.antoine.source} if d.entry.antoine else set()))
        sources = [catalog.sources[k] for k in used if k in catalog.sources]
        substitutes = self.relations.substitutes.get(eid, ())
        matches = self.relations.matches.get(eid, ())
        sheet_key = key_of(base, "datasheet", own, revision_text(self.revision, d.entry),
                           self.link_text.get(eid, ""),
                           repr([(link.target, by_id[link.target].entry.name) for link in mine if link.target in by_id]),
                           repr([catalog.locations.get(k) for k in d.entry.catalog.locations]), repr(sources),
                           repr(substitutes), repr(matches),
                           repr(sorted({c for s in substitutes for c in ([s.id] if s.id else [p for p, _ in s.blend])}
                                       | {m.id for m in matches})))
        if not writer.reuse(short_path(f"materials/{eid}.html"), sheet_key):
            writer.page(f"materials/{eid}.html", "datasheet.html", d=d, links=mine, sources=sources,
                        substitutes=substitutes, sphere_matches=matches,
                        json_ld=exports.json_ld(d), **self.common)


def _run_tasks(job: _EntryFiles, writer: Writer, tasks: list, jobs: int):
    """(written, keys, reused) per task, in task order, from ``jobs`` processes or this one.

    A task is ``("wide", i)`` (the catalog-wide file ``job.wide[i]``) or ``("entries", indices)``.
    """
    global _FORKED
    if jobs > 1 and len(tasks) > 1 and "fork" in multiprocessing.get_all_start_methods():
        # the workers inherit the job and the last build's keys (thousands of them) rather than
        # receive them with every task
        _FORKED = (job, writer.env, writer.out, writer.previous, writer.previous_keys)
        try:
            with fork_pool(min(jobs, len(tasks))) as pool:
                yield from pool.map(_write_task, tasks)
        finally:
            _FORKED = None
    else:
        for t in tasks:
            yield _do_task(job, Writer(writer.env, writer.out, writer.previous, writer.previous_keys), t)


def _do_task(job: _EntryFiles, writer: Writer, task) -> tuple[list[str], dict, int]:
    kind, what = task
    if kind == "wide":
        job.wide[what](writer)
    else:
        for i in what:
            job.write(writer, job.derived[i])
    return writer.written, writer.keys, writer.reused


def _write_task(task) -> tuple[list[str], dict, int]:
    """In a forked worker: do one task (``_run_tasks``) with a writer of its own."""
    job, env, out, previous, previous_keys = _FORKED
    return _do_task(job, Writer(env, out, previous, previous_keys), task)
