"""What a reader sees on the built pages (issue: honest numbers, readable output, complete
printouts): values with plain method names, the stated Antoine range, numeric size bands,
notes printed in full, shelf cards with every precaution and the health H-codes."""
from __future__ import annotations

import json
import re
from html import unescape

import pytest
from conftest import DEMO

from builder.core.methods import METHODS
from builder.fitting.hansen import VALIDATION_PATH as HANSEN_VALIDATION
from builder.core.units import format_value, uncertainty_decimals
from builder.pipeline import build
from builder.publish.views import CARD_NOTES_PATH, card_notes, health_codes


@pytest.fixture(scope="module")
def site(tmp_path_factory):
    out = tmp_path_factory.mktemp("readable") / "site"
    return out, build(DEMO, out)


def _page(out, path):
    return (out / path).read_text(encoding="utf-8")


def _text(html: str) -> str:
    return re.sub(r"\s+", " ", unescape(re.sub(r"<[^>]+>", " ", html)))


# --- numbers set by their uncertainty (GUM, JCGM 100:2008, 7.2.6; PDG rounding rule)


@pytest.mark.parametrize(("args", "expected"), [
    ((1.81496e-07, "D", 0.57), "0.0 ± 0.6 D"),
    ((2.783, "D", 0.71), "2.8 ± 0.7 D"),
    ((1234.0, "Pa", 12.0), "1.234 ± 0.012 kPa"),
    ((8400.0, "Pa", 10300.0), "8 ± 10 kPa"),
    ((308.3, "K", 22.0), "35 ± 22 °C (308 K)"),
    ((351.55, "K", 0.4), "78.4 ± 0.4 °C (351.6 K)"),
    ((-30.9, "K delta", 22.0), "−31 ± 22 K"),
    ((576600.0, "ppm", 480000.0), "600\u2009000 ± 500\u2009000 ppm"),
    ((4.7e-7, "D", 5.1e-7), "(5 ± 5) × 10^−7 D"),
    ((13.01, "A**3", None), "13.01 Å³"),
    ((42, "count", None), "42"),
])
def test_digits_follow_the_uncertainty(args, expected):
    assert format_value(*args) == expected


def test_uncertainty_keeps_one_or_two_digits():
    assert [uncertainty_decimals(u) for u in (0.354, 0.355, 0.96, 1.2, 4.0, 35.0)] == [2, 1, 1, 1, 0, 0]


# --- pages


def test_method_ids_shown_to_readers_have_plain_names(site):
    out, _ = site
    html = _page(out, "materials/toluene.html")
    refs = re.findall(r'<span class="tag-ref">([^<]*)</span>', html)
    ids = set(METHODS)
    assert refs and not [r for r in refs if r in ids], sorted({r for r in refs if r in ids})
    assert "boiling point from structure" in _page(out, "materials/hm-7-hydroxy-ester.html")
    assert 'href="../methods.html#m-tb-joback-sb-trees"' in _page(out, "materials/hm-7-hydroxy-ester.html")
    assert all(m.plain and m.plain != m.id for m in METHODS.values())


def test_methods_page_lists_size_bands_in_numeric_order(site):
    out, _ = site
    html = _page(out, "methods.html")
    tables = [t for t in re.findall(r'<table class="compact accuracy">.*?</table>', html, re.S)
              if "by heavy atoms" in t]
    assert tables
    for table in tables:
        bands = re.findall(r'<tr><th scope="row">([^<]+)</th>', table)
        assert bands[-1] == "all"
        starts = [int(re.search(r"\d+", unescape(b))[0]) for b in bands[:-1]]
        assert starts == sorted(starts), bands


def test_methods_page_shows_the_hansen_held_out_table(site):
    out, _ = site
    html = _page(out, "methods.html")
    section = html[html.index('id="m-hansen-mathieu-trees"'):]
    table = re.search(r'<table class="compact accuracy hansen-accuracy">.*?</table>', section, re.S)[0]
    stored = json.loads(HANSEN_VALIDATION.read_text(encoding="utf-8"))
    rows = [[unescape(c) for c in re.findall(r"<t[hd][^>]*>([^<]*)</t[hd]>", r)]
            for r in re.findall(r"<tr>(.*?)</tr>", table.split("<tbody>")[1], re.S)]
    assert len(rows) == 9
    for symbol, key in (("δD", "delta_d"), ("δP", "delta_p"), ("δH", "delta_h")):
        t = stored["components"][key]
        ours = next(r for r in rows if r[:2] == [symbol, "this estimator, all"])
        group = next(r for r in rows if r[:2] == [symbol, "group method alone"])
        assert float(ours[3]) == pytest.approx(t["model_all"]["mae"], abs=0.005)
        assert float(group[3]) == pytest.approx(t["group_method_alone"]["mae"], abs=0.005)
        assert int(group[2]) == t["group_method_alone"]["n"]
        target = stored["targets_mae"][key]
        assert ours[8] == f"≤ {target:.2f} ({'met' if t['model_all']['mae'] <= target else 'not met'})"


def test_solvency_page_says_what_each_substitute_is_better_and_worse_at(site):
    out, _ = site
    html = _page(out, "solvency.html")
    items = re.findall(r'<ul class="substitutes">(.*?)</ul>', html, re.S)
    assert items
    for block in items:
        for li in re.findall(r"<li>(.*?)</li>", block, re.S):
            assert '<span class="better">better: ' in li, li
    # the same words as the datasheet's table for the same pair: toluene's list names p-xylene
    # as lacking toluene's reproductive-toxicity statement (both entries: CLP Annex VI)
    row = html[html.index(">Toluene</a>"):]
    row = row[:row.index("</tr>")]
    assert "p-Xylene" in row and "without" in row and "H361d" in _text(row)


def test_chart_caption_gives_the_stated_antoine_range(site):
    out, _ = site
    text = _text(_page(out, "materials/toluene.html"))
    # toluene, Poling et al. (5th ed.) Antoine table: valid 286.44 to 409.61 K, as the entry states
    assert "stated valid range, 13.3 °C (286.4 K) to 136.5 °C (409.6 K)" in text


def test_hazard_statements_are_tagged_with_their_source(site):
    out, _ = site
    html = _page(out, "materials/toluene.html")
    assert re.search(r'H225, H304, H315, H336, H361d, H373</span><a class="tag tag-literature" '
                     r'href="../sources.html#src-clp-annex-vi"', html)


def test_catalog_code_and_force_are_separated_by_spaced_dots(site):
    out, _ = site
    text = _text(_page(out, "materials/toluene.html"))
    assert "Catalog code HM-S-007 · held together mainly by" in text


def test_print_sheet_holds_every_note_in_full(site):
    out, built = site
    for d in built.derived:
        html = _page(out, f"materials/{d.entry.id}.html")
        sheet = _text(html.split('class="print-sheet', 1)[1].split("</section>", 1)[0])
        for note in [n.text for n in d.notes] + ([d.entry.notes] if d.entry.notes else []):
            assert re.sub(r"\s+", " ", note) in sheet, (d.entry.id, note[:50])
        assert "…" not in sheet and "more note" not in sheet


def test_shelf_cards_keep_every_precaution_and_the_health_codes(site):
    out, built = site
    text = _text(_page(out, "cards/all.html"))
    for d in built.derived:
        for _, note in card_notes(d):
            assert note in text, (d.entry.id, note)
        for code in health_codes(d):
            assert code in text
    toluene = next(d for d in built.derived if d.entry.id == "toluene")
    assert health_codes(toluene) == ["H304", "H315", "H336", "H361d", "H373"]
    assert "none derived" not in text


def test_every_handling_rule_has_a_short_form_for_cards():
    import yaml

    from builder.chem.handling import load_rules

    short = yaml.safe_load(CARD_NOTES_PATH.read_text(encoding="utf-8"))
    ids = {r.id for r in load_rules()}
    assert ids <= set(short), sorted(ids - set(short))


def test_store_sheet_has_no_trailing_separator_in_print(site):
    out, built = site
    for key in built.catalog.locations:
        html = _page(out, f"stores/{key}.html")
        line = re.search(r"<p>Rated up to:.*?</p>", html, re.S)[0]
        printed = re.sub(r'<span class="screen-only">.*?</span>', "", line, flags=re.S)
        assert not re.search(r"·\s*</p>$", printed), printed


def test_high_severity_marker_carries_more_ink_than_medium():
    from pathlib import Path

    css = (Path(__file__).resolve().parents[1] / "templates" / "assets" / "style.css").read_text(encoding="utf-8")

    def ink(rule):
        width, style = re.search(rf"{rule} \{{ border-left: ([\d.]+)(?:px|mm) (\w+)", css).groups()
        return float(width) * (2 / 3 if style == "double" else 1.0)

    for prefix in ("", r"\.ps-notes "):
        assert ink(prefix + r"\.note-high") > ink(prefix + r"\.note-medium") > 0


def test_value_marks_escape_as_the_templates_do():
    # builder/publish/templating._out writes what ``{{ x }}`` writes in an autoescaped template
    # (markupsafe, the reference): same entities, bidi controls shown
    from markupsafe import Markup, escape

    from builder.publish.templating import _out, visible_output

    for value in ("plain", "a < b & c > d", "it's \"quoted\"", "\u202eevil", 3, 2.5, None, Markup("<b>x</b>"),
                  "&amp; already", "Ω µ — ±"):
        expected = str(escape(visible_output(value)))
        assert _out(value) == expected, value


def test_page_relative_links_match_posixpath():
    # templating._relpath is posixpath.relpath (the reference) for the site's own paths
    import itertools
    import posixpath

    from builder.publish.templating import _relpath

    paths = ["index.html", "materials/toluene.html", "materials/toluene.svg", "cards/all.html", "materials",
             "charts/series-1.svg", "data/toluene.json", "a/b/c.html", "a/b", "a", "materials/x/y.html"]
    dirs = ["", "materials", "cards", "a", "a/b", "materials/x", "zzz"]
    for path, start in itertools.product(paths, dirs):
        assert _relpath(path, start) == posixpath.relpath(path, start or "."), (path, start)


#: the Jinja macro that wrote the rows of the datasheets' values tables before ``rows_markup``
#: replaced it (templates/macros.html, until December 2026), kept here as the reference
_ROWS_MACRO = """{% macro rows(items) -%}
{% for name, v in items %}
<tr>
  <th scope="row">{{ property_label(name) }}</th>
  {% if is_label(v) %}
  <td>{{ word(v) }}</td>
  <td class="note-cell">{{ v.provenance.note or '' }}</td>
  {% else %}
  <td>{{ show(v) }}</td>
  <td class="note-cell">{{ ([] if not v.conditions else [condition_text(*v.conditions[0])]) | join('') }}{% if v.conditions and v.provenance.note %}; {% endif %}{{ v.provenance.note or '' }}</td>
  {% endif %}
</tr>
{% endfor %}
{%- endmacro %}{{ rows(items) }}"""


def test_value_rows_write_what_the_jinja_macro_wrote():
    # every values table of every demo datasheet (notes, conditions, labels, bidi-free and not),
    # plus a row whose note holds markup and a bidi control: the Python rows are the macro's bytes
    from dataclasses import replace

    from builder.core.values import Label, Provenance, Value
    from builder.derive.catalog import derive_catalog
    from builder.load.entries import load_catalog
    from builder.publish.templating import environment, relative, value_link
    from builder.publish.views import SHEET_TABLES, table_rows
    from conftest import DEMO

    env = environment()
    macro = env.from_string(_ROWS_MACRO)
    python = env.from_string("{{ rows(items) }}")
    catalog, _ = load_catalog(DEMO)
    tables = []
    for d in derive_catalog(catalog):
        tables += [table_rows(d, t) for t in SHEET_TABLES]
        if d.forces is not None:
            tables.append(list(d.forces.numbers.items()))
    odd = Value(351.4, "K", Provenance("measured", source="crc-95", note="<b>boiled</b> \u202e & 'so'"),
                conditions=(("pressure", 101325.0),))
    tables.append([("boiling_point", odd), ("vapor_pressure", replace(odd, unit="Pa", conditions=()))])
    assert sum(map(len, tables)) > 200
    for items in tables:
        context = dict(items=items, url=lambda target: relative("materials/x.html", target), value_link=value_link,
                       is_label=lambda v: isinstance(v, Label))  # a global of the templates then
        assert python.render(**context) == macro.render(**context), items
