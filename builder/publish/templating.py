"""Render the derived catalog into a folder of static pages (Jinja2).

Autoescaping is on for every template and undefined names are errors.  Each page
gets a ``url()`` that turns a site path into a link relative to that page, so the
site works from a web server and straight from disk (file://).
"""
from __future__ import annotations

import functools
import json
import os
import posixpath
import shutil
import stat
import weakref
from pathlib import Path

import jinja2
from markupsafe import Markup

from builder import __version__
from builder.chem.storage import OUTCOME_TEXT
from builder.chem.ghs import HAZARD_STATEMENTS
from builder.core.methods import METHODS, plain_name
from builder.core.quantities import DERIVED_QUANTITIES
from builder.core.quantities import STATED_PROPERTIES as PROPERTIES
from builder.core.units import format_value
from builder.core.values import KINDS, Label, Value, computed
from builder.derive.fire import NOTES_DISCLAIMER
from builder.chem.solvency import CAUTION as SOLVENCY_CAUTION
from builder.derive.forces import FORCE_WORDS
from builder.publish.textsafe import short_path, visible
from builder.publish.views import bands_in_numeric_order, card_notes, card_rows, health_codes, table_rows

TEMPLATES = Path(__file__).resolve().parents[2] / "templates"

#: the GHS flammable-liquid categories (chem/ghs.py), then None for 'not classified'
FLAMMABLE_CATEGORIES = (*sorted(HAZARD_STATEMENTS), None)

#: compact marks for provenance kinds, explained in the legend of every page
KIND_MARKS = {"measured": "M", "literature": "L", "supplier": "S", "computed": "C",
              "estimated": "E", "rule": "R", "assumed": "A"}
CAUTION = ("For internal reference only. This catalog summarises properties of materials held on site; "
           "it is not a safety data sheet. The supplier's safety data sheet (SDS), local regulations and "
           "the site's safety rules take precedence.")


#: stored validation results, keyed by each method's ``estimator`` (builder/data/methods.yaml)
VALIDATION_PATH = Path(__file__).resolve().parents[1] / "data" / "boiling_validation.json"


def _boiling_validation() -> dict | None:
    """The stored results of ``python -m builder.fitting.boiling`` (not typed in by hand)."""
    if not VALIDATION_PATH.exists():
        return None
    return bands_in_numeric_order(json.loads(VALIDATION_PATH.read_text(encoding="utf-8")))


def _stored_validation(name: str) -> dict | None:
    """A stored validation table of builder/data (melting_validation.json, boiling_small_validation.json,
    flammability_validation.json, hansen_validation.json), written by the fitting and report commands,
    never by hand."""
    path = VALIDATION_PATH.parent / name
    if not path.exists():
        return None
    data = json.loads(path.read_text(encoding="utf-8"))
    return bands_in_numeric_order(data) if "bands" in data else data


#: how the substitution ranking's criteria read on a page
_CRITERIA = {"flammable_category": "flammable category", "flash_point_K": "flash point",
             "volatility_band": "volatility", "health_h_codes": "health H-codes", "alert_ids": "alerts"}
#: criteria compared as sets of codes
_SET_CRITERIA = ("health_h_codes", "alert_ids")


def _criterion_value(criterion: str, value) -> str:
    """One side of a comparison on a single value (the set criteria are written by ``comparison_text``)."""
    if value is None:
        return "none"
    if criterion == "flash_point_K":
        return temperature_text(value)
    return str(value)


def comparison_text(comparisons, worse: bool = False) -> str:
    """"flash point 22 °C (this material: −4 °C); ..." for the better (or, with ``worse``, the worse)
    list of a substitute. For hazard statements and alerts, the codes the candidate is without
    (better) or adds (worse) against this material: "health H-codes without H336 H351"."""
    parts = []
    for c in comparisons:
        label = _CRITERIA.get(c.criterion, c.criterion)
        if c.criterion == "miscibility":
            parts.append(f"mixing: {c.candidate}")
        elif c.criterion in _SET_CRITERIA:
            cand, targ = set(c.candidate or ()), set(c.target or ())
            codes = sorted(cand - targ) if worse else sorted(targ - cand)
            parts.append(f"{label} {'adds' if worse else 'without'} {' '.join(codes)}")
        else:
            parts.append(f"{label} {_criterion_value(c.criterion, c.candidate)} "
                         f"(this material: {_criterion_value(c.criterion, c.target)})")
    return "; ".join(parts)


def distance_value(x: float, unit: str = "MPa**0.5") -> Value:
    """A Hansen distance Ra (or, with ``unit="dimensionless"``, a RED) as a computed value with its method."""
    return computed(x, unit, "hansen-distance")


def txy_path(entry_id: str) -> str:
    """Where a binary mixture's T–x–y diagram is written (a folder no entry file can reach)."""
    return f"charts/mixture-{entry_id}-txy.svg"


def environment(templates: Path = TEMPLATES, compiled: Path | None = None) -> jinja2.Environment:
    """The Jinja environment of the site; ``compiled``: a folder (of the build cache) that keeps each
    template's compiled code, checked against the template's text, so a process need not compile
    the templates again (a tenth of a second or more per process)."""
    if not (templates / "base.html").exists():
        raise FileNotFoundError(f"templates not found in {templates}: install the project with 'pip install -e .'")
    bytecode = jinja2.FileSystemBytecodeCache(str(compiled)) if compiled is not None else None
    env = jinja2.Environment(
        loader=jinja2.FileSystemLoader(str(templates)),
        bytecode_cache=bytecode,
        autoescape=jinja2.select_autoescape(["html", "xml", "j2", "svg"], default=True, default_for_string=True),
        undefined=jinja2.StrictUndefined,
        trim_blocks=True,
        lstrip_blocks=True,
        keep_trailing_newline=True,
        finalize=visible_output,
    )
    env.filters["formula"] = formula_markup
    env.globals.update(use_list=use_list, FLAMMABLE_CATEGORIES=FLAMMABLE_CATEGORIES, KIND_MARKS=KIND_MARKS, KINDS=KINDS, CAUTION=CAUTION, METHODS=METHODS,
                       version=__version__, property_label=property_label, txy_path=txy_path,
                       comparison_text=comparison_text, SOLVENCY_CAUTION=SOLVENCY_CAUTION,
                       distance_value=distance_value, condition_text=condition_text,
                       temperature_text=temperature_text, FORCE_WORDS=FORCE_WORDS, first_sentence=first_sentence,
                       NOTES_DISCLAIMER=NOTES_DISCLAIMER,
                       table_rows=table_rows, card_rows=card_rows, plain_name=plain_name,
                       card_notes=card_notes, health_codes=health_codes,
                       OUTCOME_TEXT=OUTCOME_TEXT,
                       boiling_validation=_boiling_validation(),
                       show=show_markup, word=word_markup, rows=rows_markup, tag=tag_markup, value_or=value_or_markup,
                       material_link=material_link_markup, piece=piece_markup, substitute_names=substitute_names,
                       melting_validation=_stored_validation("melting_validation.json"),
                       small_validation=_stored_validation("boiling_small_validation.json"),
                       limits_validation=_stored_validation("flammability_validation.json"),
                       hansen_validation=_stored_validation("hansen_validation.json"),
                       HANSEN_NAMES={"delta_d": "δD", "delta_p": "δP", "delta_h": "δH"})
    return env


#: how derived values are named on the pages (from builder/core/quantities.py)
def value_label(name: str) -> str | None:
    q = DERIVED_QUANTITIES.get(name)
    return q.label if q else None


def use_list(uses, url, labels: bool = True) -> Markup:
    """'Name (what it is used for); …' for the (derived, value name) pairs of a source or a method.

    Written here rather than with a macro per item: these lists hold a link per value that uses a
    source or method, tens of thousands of them at a thousand materials, and every material in
    many lists of one page. So each material's link is made once per page (``_anchors``, kept for
    the page's ``url`` function) and each value name's wording once per build (``_use_words``).
    """
    anchors = _anchors.setdefault(url, {})
    out = []
    for d, name in uses:
        eid = d.entry.id
        link = anchors.get(eid)
        if link is None:
            href = Markup.escape(url(short_path(f"materials/{eid}.html")))
            link = anchors[eid] = f'<a href="{href}">{Markup.escape(visible(d.entry.name))}</a>'
        out.append(f"{link} ({_use_words(name, labels)})")
    return Markup("; ".join(out))


#: page ``url`` function -> {entry id: that material's link on the page}; gone with the page
_anchors: weakref.WeakKeyDictionary = weakref.WeakKeyDictionary()


@functools.lru_cache(maxsize=1024)
def _use_words(name: str, labels: bool) -> str:
    """How ``use_list`` names a value: its label in lower case, or its name in words (escaped)."""
    return str(Markup.escape(property_label(name).lower() if labels else name.replace("_", " ")))


def property_label(name: str) -> str:
    spec = PROPERTIES.get(name)
    if spec:
        return spec.label
    return value_label(name) or name.replace("_", " ").capitalize()


def temperature_text(kelvin: float) -> str:
    return format_value(kelvin, "K")


def condition_text(key: str, si_value: float) -> str:
    if key == "at":
        return f"at {format_value(si_value, 'K')}"
    return f"at {si_value / 1000.0:.6g} kPa"


def formula_markup(formula: str) -> Markup:
    """C2H6O → C<sub>2</sub>H<sub>6</sub>O, escaping everything else."""
    out = []
    for ch in formula:
        out.append(f"<sub>{ch}</sub>" if ch.isdigit() else str(Markup.escape(ch)))
    return Markup("".join(out).replace("</sub><sub>", ""))


def _out(value) -> str:
    """What ``{{ value }}`` writes on a page: bidi controls shown (``visible_output``), then escaped
    as markupsafe escapes (the same five characters, the same entities; a test compares)."""
    if isinstance(value, Markup):
        return str(visible_output(value))
    if hasattr(value, "__html__"):
        return str(Markup.escape(value))
    text = visible(value) if isinstance(value, str) else str(value)
    return (text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace("'", "&#39;")
            .replace('"', "&#34;"))


# The value marks and the rows of values tables, which every page shows by the thousand, written in
# Python rather than as Jinja macros (a macro call costs about ten times as much); each writes exactly
# what its macro wrote.

@jinja2.pass_context
def tag_markup(context, v) -> Markup:
    """The provenance tag after a value or a label: its kind's letter, linked to its source or method."""
    prov = v.provenance
    ref = prov.source or plain_name(prov.method)
    note = f" — {_out(prov.note)}" if prov.note else ""
    kind = _out(v.kind)
    return Markup(f'<a class="tag tag-{kind}" href="{_out(context["url"](value_link(v)))}" title="{kind}: '
                  f'{_out(ref)}{note}">{_out(KIND_MARKS[v.kind])}<span class="tag-ref">{_out(ref)}</span></a>')


@jinja2.pass_context
def show_markup(context, v) -> Markup:
    """A value with its provenance: the number (and what follows it in brackets), then its tag."""
    parts = v.text().split(" (", 1)
    rest = f' <span class="nb">({_out(parts[1])}</span>' if len(parts) > 1 else ""
    return Markup(f'<span class="value" data-provenance="{_out(v.kind)}"><span class="nb">{_out(parts[0])}</span>'
                  f'{rest}</span>{tag_markup(context, v)}')


@jinja2.pass_context
def word_markup(context, lab) -> Markup:
    """A classification in words (a ``Label``), shown and tagged like a value."""
    return Markup(f'<span class="value label" data-provenance="{_out(lab.kind)}">{_out(lab.text)}</span>'
                  f'{tag_markup(context, lab)}')


@jinja2.pass_context
def value_or_markup(context, v, missing="—", marked=False) -> Markup:
    """A Value or a Label with its tag, or ``missing`` when there is none (in a span of class
    "none" when ``marked``)."""
    if v is None:
        return Markup(f'<span class="none">{_out(missing)}</span>' if marked else _out(missing))
    return word_markup(context, v) if isinstance(v, Label) else show_markup(context, v)


@jinja2.pass_context
def rows_markup(context, items) -> Markup:
    """The rows of a values table (label, value with its tag, note) for (name, Value or Label) pairs."""
    out = []
    for name, v in items:
        out.append(f'<tr>\n  <th scope="row">{_out(property_label(name))}</th>\n')
        note = _out(v.provenance.note or "")
        if isinstance(v, Label):
            out.append(f'  <td>{_out(word_markup(context, v))}</td>\n  <td class="note-cell">{note}</td>\n')
        else:
            at = _out(condition_text(*v.conditions[0])) if v.conditions else ""
            between = "; " if v.conditions and v.provenance.note else ""
            out.append(f'  <td>{_out(show_markup(context, v))}</td>\n'
                       f'  <td class="note-cell">{at}{between}{note}</td>\n')
        out.append("</tr>\n")
    return Markup("".join(out))


@jinja2.pass_context
def piece_markup(context, macro: str, d, *extra) -> Markup:
    """The piece ``macro`` of templates/pieces.html for material ``d`` (and ``extra``, its other
    inputs), kept between builds under the entry's derive key (``context["pieces"]``, a
    ``builder.publish.pieces.Pieces`` of this page; ``context["entry_keys"]``: derive keys by id)."""
    pieces = context["pieces"]

    def make() -> str:
        if pieces.module is None:
            pieces.module = context.environment.get_template("pieces.html").make_module(vars=context.get_all())
        return str(getattr(pieces.module, macro)(d, *extra))

    return Markup(pieces.get((macro, context["entry_keys"][d.entry.id], *extra), make))


def substitute_names(subs, by_id) -> dict[str, str]:
    """The name of every catalog material that a list of substitutes names (alone or in a blend), by id."""
    ids = [i for c in subs for i in ([c.id] if c.id else [part for part, _ in c.blend])]
    return {i: by_id[i].entry.name for i in ids}


@jinja2.pass_context
def material_link_markup(context, d) -> Markup:
    """A link to a material's datasheet, by its name."""
    return Markup(f'<a href="{_out(context["url"]("materials/" + d.entry.id + ".html"))}">{_out(d.entry.name)}</a>')


def visible_output(value):
    """Jinja ``finalize``: every ``{{ ... }}`` on every page shows bidi controls as ``[U+XXXX]``."""
    if isinstance(value, Markup):
        shown = visible(str(value))
        return value if shown == value else Markup(shown)
    return visible(value) if isinstance(value, str) else value


@functools.lru_cache(maxsize=65536)
def relative(page: str, target: str) -> str:
    """Link from site path ``page`` to site path ``target`` (both posix, relative to the site root).

    Both go through ``short_path``, as the files do when written, so links always match.
    """
    anchor = ""
    if "#" in target:
        target, anchor = target.split("#", 1)
        anchor = "#" + anchor
    if not target:
        return anchor
    return _relpath(short_path(target), posixpath.dirname(short_path(page))) + anchor


def _relpath(path: str, start: str) -> str:
    """``posixpath.relpath(path, start or ".")`` for plain site paths (no ".", "..", empty or
    leading "/" parts), without its two calls to ``abspath``; anything else goes to relpath."""
    parts, base = path.split("/"), start.split("/") if start else []
    if any(x in ("", ".", "..") for x in parts + base):
        return posixpath.relpath(path, start or ".")
    common = 0
    while common < min(len(parts), len(base)) and parts[common] == base[common]:
        common += 1
    return "/".join([".."] * (len(base) - common) + parts[common:]) or "."


def value_link(value) -> str:
    """Site path of the source or method a value's tag links to."""
    prov = value.provenance
    if prov.source:
        return f"sources.html#src-{prov.source}"
    return f"methods.html#m-{prov.method}"


def revision_text(revision, entry) -> str:
    """'entry revision 1a2b3c4 (2026-11-30)' from git, or a plain statement that there is none."""
    if revision is None or revision.commit is None:
        return "entry revision: not in a git repository"
    name = entry.path.rsplit("/", 1)[-1]
    found = revision.per_file.get(name)
    if not found:
        return "entry revision: not yet committed"
    short, date = found
    return f"entry revision {short} ({date[:10]})"


def first_sentence(text: str) -> str:
    """The first sentence of a note, for the small space of a shelf card."""
    head, sep, _ = text.partition(". ")
    return head + "." if sep else text


class Writer:
    """Renders pages into ``out`` and remembers what was written.

    With ``previous`` (the site being replaced) and its ``previous_keys`` (site path → key of
    what the file was made from), a file whose key is unchanged is not made again: the old
    file is linked into the new folder (the same file, not rewritten). ``keys`` collects the
    keys of this build, for the next one.
    """

    def __init__(self, env: jinja2.Environment, out: Path, previous: Path | None = None,
                 previous_keys: dict | None = None):
        self.env = env
        self.out = out
        self.previous = previous
        self.previous_keys = previous_keys or {}
        self.written: list[str] = []
        self.keys: dict[str, str] = {}
        self.reused = 0
        # plain strings and the folders made so far: a rebuild links thousands of files, and the
        # path objects and a mkdir per file took longer than the links themselves
        self._previous = os.fspath(previous) if previous is not None else None
        self._out = os.fspath(out)
        self._folders: set[str] = set()

    def _folder_for(self, target: str) -> None:
        folder = os.path.dirname(target)
        if folder not in self._folders:
            os.makedirs(folder, exist_ok=True)
            self._folders.add(folder)

    def reuse(self, path: str, key: str | None) -> bool:
        """Link the last build's file at ``path`` if it was made from ``key``; True when it did."""
        if key is None:
            return False
        self.keys[path] = key
        if self.previous is None or self.previous_keys.get(path) != key:
            return False
        old = os.path.join(self._previous, path)
        try:
            if not stat.S_ISREG(os.lstat(old).st_mode):  # a link, a folder, ...: made again
                return False
        except OSError:
            return False
        target = os.path.join(self._out, path)
        self._folder_for(target)
        try:
            os.link(old, target)
        except OSError:
            shutil.copyfile(old, target)
        self.written.append(path)
        self.reused += 1
        return True

    def page(self, path: str, template: str, key: str | None = None, **context) -> None:
        """Render ``template`` to ``path``; with a ``key``, only when the key differs from the last build's."""
        path = short_path(path)
        if self.reuse(path, key):
            return

        def url(target: str) -> str:
            return relative(path, target)

        root = relative(path, "index.html")[: -len("index.html")]
        text = self.env.get_template(template).render(url=url, value_link=value_link, page_path=path, root=root,
                                                      **context)
        self._write(path, text)

    def made(self, path: str, key: str, make) -> None:
        """Write ``make()`` to ``path`` unless the last build made it from the same ``key``."""
        path = short_path(path)
        if not self.reuse(path, key):
            self._write(path, make())

    def _write(self, path: str, text: str) -> None:
        target = os.path.join(self._out, path)
        self._folder_for(target)
        with open(target, "w", encoding="utf-8", newline="\n") as fh:
            fh.write(text)
        self.written.append(path)

    def copy(self, path: str, source: Path) -> None:
        path = short_path(path)
        target = self.out / path
        target.parent.mkdir(parents=True, exist_ok=True)
        target.write_bytes(source.read_bytes())
        self.written.append(path)
