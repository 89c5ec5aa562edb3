"""Render the derived catalog into a folder of static pages (Jinja2).

Autoescaping is on for every template and undefined names are errors.  Each page
gets a ``url()`` that turns a site path into a link relative to that page, so the
site works from a web server and straight from disk (file://).
"""
from __future__ import annotations

import posixpath
from pathlib import Path

import jinja2
from markupsafe import Markup

from . import __version__
from .entry_format import PROPERTIES
from .methods import METHODS
from .units import format_value
from .values import KINDS, Value

TEMPLATES = Path(__file__).resolve().parent.parent / "templates"

#: compact marks for provenance kinds, explained in the legend of every page
KIND_MARKS = {"measured": "M", "literature": "L", "supplier": "S", "computed": "C",
              "estimated": "E", "rule": "R", "assumed": "A"}
CAUTION = ("For internal reference only. This catalog summarises properties of materials held on site; "
           "it is not a safety data sheet. The supplier's safety data sheet (SDS), local regulations and "
           "the site's safety rules take precedence.")


def environment(templates: Path = TEMPLATES) -> jinja2.Environment:
    if not (templates / "base.html").exists():
        raise FileNotFoundError(f"templates not found in {templates}: install the project with 'pip install -e .'")
    env = jinja2.Environment(
        loader=jinja2.FileSystemLoader(str(templates)),
        autoescape=jinja2.select_autoescape(["html", "xml", "j2", "svg"], default=True, default_for_string=True),
        undefined=jinja2.StrictUndefined,
        trim_blocks=True,
        lstrip_blocks=True,
        keep_trailing_newline=True,
    )
    env.filters["formula"] = formula_markup
    env.globals.update(KIND_MARKS=KIND_MARKS, KINDS=KINDS, CAUTION=CAUTION, METHODS=METHODS,
                       version=__version__, property_label=property_label, condition_text=condition_text,
                       temperature_text=temperature_text)
    return env


def property_label(name: str) -> str:
    spec = PROPERTIES.get(name)
    return spec.label if spec else name.replace("_", " ").capitalize()


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


def relative(page: str, target: str) -> str:
    """Link from site path ``page`` to site path ``target`` (both posix, relative to the site root)."""
    anchor = ""
    if "#" in target:
        target, anchor = target.split("#", 1)
        anchor = "#" + anchor
    if not target:
        return anchor
    return posixpath.relpath(target, posixpath.dirname(page) or ".") + anchor


def value_link(value: Value) -> str:
    """Site path of the source or method a value's tag links to."""
    prov = value.provenance
    if prov.source:
        return f"sources.html#src-{prov.source}"
    return f"methods.html#m-{prov.method}"


class Writer:
    """Renders pages into ``out`` and remembers what was written."""

    def __init__(self, env: jinja2.Environment, out: Path):
        self.env = env
        self.out = out
        self.written: list[str] = []

    def page(self, path: str, template: str, **context) -> None:
        def url(target: str) -> str:
            return relative(path, target)

        text = self.env.get_template(template).render(url=url, value_link=value_link, page_path=path, **context)
        self.text(path, text)

    def text(self, path: str, text: str) -> None:
        target = self.out / path
        target.parent.mkdir(parents=True, exist_ok=True)
        with open(target, "w", encoding="utf-8", newline="\n") as fh:
            fh.write(text)
        self.written.append(path)

    def copy(self, path: str, source: Path) -> None:
        target = self.out / path
        target.parent.mkdir(parents=True, exist_ok=True)
        target.write_bytes(source.read_bytes())
        self.written.append(path)
