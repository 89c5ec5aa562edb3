"""Render the derived catalog into a folder: every page, chart and export of the site.

``render_site`` writes into the (fresh, temporary) folder it is given; the pipeline
swaps that folder into place.
"""
from __future__ import annotations

from pathlib import Path

from builder.chem.forces import n_alkane_boiling_point
from builder.chem.identity import depict_svg, formula_counts
from builder.core.model import Catalog
from builder.derive.entry import Derived
from builder.derive.forces import FORCE_WORDS
from builder.derive.links import Link, cross_links, homologous_series
from builder.publish import charts, exports, svgchart
from builder.publish.revision import Revision
from builder.publish.stores import store_sheet
from builder.publish.templating import TEMPLATES, Writer, environment, revision_text


def _uses(catalog: Catalog, derived) -> tuple[dict, dict]:
    """Back-links: source key → [(derived, value name)], method id → [(derived, value name)]."""
    by_source: dict[str, list] = {k: [] for k in catalog.sources}
    by_method: dict[str, list] = {}
    for d in derived:
        items = list(d.values.items()) + list(d.labels.items())
        if d.forces is not None:
            items += list(d.forces.numbers.items())
        for name, value in items:
            prov = value.provenance
            if prov.source and prov.source in by_source:
                by_source[prov.source].append((d, name))
            if prov.method:
                by_method.setdefault(prov.method, []).append((d, name))
        if d.entry.antoine:
            by_source[d.entry.antoine.source].append((d, "antoine"))
    dedup = lambda pairs: sorted(set((d.entry.id, n) for d, n in pairs))  # noqa: E731
    index = {d.entry.id: d for d in derived}
    return ({k: [(index[i], n) for i, n in dedup(v)] for k, v in by_source.items()},
            {k: [(index[i], n) for i, n in dedup(v)] for k, v in by_method.items()})


def _groups(catalog: Catalog, derived) -> dict:
    """Entries grouped for the index pages: by dominant force, by store, by possible category."""
    forces: dict[str, list] = {k: [] for k in FORCE_WORDS}
    stores: dict[str, list] = {k: [] for k in catalog.locations}
    categories: dict[str, list] = {k: [] for k in ("1", "2", "3", "4", "none")}
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


def _catalog_charts(derived) -> tuple[str, list]:
    points = []
    for d in derived:
        bp, mm = d.get("boiling_point"), d.get("molar_mass")
        if bp is not None and mm is not None:
            force = d.label("dominant_force").code if d.label("dominant_force") else None
            points.append((d.entry.name, mm.value, bp.value, force, bp.kind == "estimated"))
    masses = [p[1] for p in points] or [100.0]
    top = max(min(max(masses) * 1.1, 366.0), 30.0)  # the n-alkane table starts at methane (16 g/mol)
    alkane = [(m, n_alkane_boiling_point(m)) for m in [16.05 + i * (top - 16.05) / 60 for i in range(61)]]
    main_chart = charts.boiling_vs_mass_svg(points, alkane)
    series_charts = []
    for i, series in enumerate(homologous_series(derived)):
        pts = [(d.entry.name, formula_counts(d.identity.formula)[0]["C"], d.get("boiling_point").value)
               for d in series if d.get("boiling_point") is not None]
        title = " → ".join(d.entry.name for d in series)
        series_charts.append((f"series-{i + 1}.svg", title, series, charts.series_svg(title, pts)))
    return main_chart, series_charts


def render_site(catalog: Catalog, derived: tuple[Derived, ...], out: Path, diagnostics=(),
                revision: Revision | None = None, progress=None) -> list[str]:
    """Write every page of the site into the (empty) folder ``out``; ``progress(done, total)`` per datasheet."""
    env = environment()
    revision = revision or Revision(None, None, False, {})
    stamp = (f"catalog data of {revision.date[:10]} ({revision.commit[:7]}{', uncommitted changes' if revision.dirty else ''})"
             if revision.commit else "catalog data not under version control")
    env.globals["revision_line"] = lambda entry: (
        f"{revision_text(revision, entry)} · {stamp} · cohesion {env.globals['version']}")
    writer = Writer(env, out)
    for asset in sorted((TEMPLATES / "assets").iterdir()):
        if asset.is_file():
            writer.copy(f"assets/{asset.name}", asset)
    links: dict[str, tuple[Link, ...]] = cross_links(derived)
    by_source, by_method = _uses(catalog, derived)
    by_id = {d.entry.id: d for d in derived}
    main_chart, series_charts = _catalog_charts(derived)
    writer.text("charts/boiling-vs-mass.svg", main_chart)
    for name, _, _, svg in series_charts:
        writer.text(f"charts/{name}", svg)
    writer.text("search-index.js", exports.search_index_js(derived))
    writer.text("catalog.json", exports.catalog_json(derived, links))
    writer.text("catalog.csv", exports.catalog_csv(derived))
    common = dict(catalog=catalog, derived=derived, by_id=by_id, groups=_groups(catalog, derived))
    writer.page("index.html", "index.html", **common)
    writer.page("forces.html", "by_force.html", **common)
    writer.page("stores.html", "by_store.html", **common)
    writer.page("categories.html", "by_category.html", **common)
    writer.page("trends.html", "trends.html", series_charts=series_charts, **common)
    writer.page("sources.html", "sources.html", sources_used=by_source, **common)
    writer.page("methods.html", "methods.html", methods_used=by_method, **common)
    writer.page("build.html", "build.html", diagnostics=diagnostics, revision=revision, **common)
    cards_per_page = 8
    writer.page("cards/all.html", "cards.html", title="whole catalog", cards=derived, per_page=cards_per_page, **common)
    for key, loc in catalog.locations.items():
        members = [d for d in derived if key in d.entry.catalog.locations]
        writer.page(f"cards/{key}.html", "cards.html", title=loc.name, cards=members, per_page=cards_per_page,
                    **common)
        writer.page(f"stores/{key}.html", "store_sheet.html", stamp=stamp, **store_sheet(catalog, derived, key),
                    **common)
    for done, d in enumerate(derived):
        if progress:
            progress(done, len(derived))
        eid = d.entry.id
        if d.identity is not None:
            writer.text(f"materials/{eid}.svg", depict_svg(d.identity.smiles))
        if d.curve:
            store = d.get("store_temperature")
            points = []
            vp = d.entry.properties.get("vapor_pressure")
            if vp is not None:
                points.append(("stated value", dict(vp.conditions)["at"], vp.value))
            writer.text(f"materials/{eid}-vapor.svg", svgchart.vapor_curve_svg(
                [(s.kind, s.temperatures, s.pressures) for s in d.curve], points, store.value if store else None))
        writer.text(f"data/{eid}.json", exports.entry_file_json(d, links.get(eid, ())))
        used = sorted({v.provenance.source for v in d.values.values() if v.provenance.source}
                      | ({d.entry.antoine.source} if d.entry.antoine else set()))
        writer.page(f"materials/{eid}.html", "datasheet.html", d=d, links=links.get(eid, ()),
                    sources=[catalog.sources[k] for k in used if k in catalog.sources],
                    json_ld=exports.json_ld(d), **common)
    if progress:
        progress(len(derived), len(derived))
    return writer.written
