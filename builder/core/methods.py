"""Every method and rule that produces a value, with its reference.

The methods are data: ``builder/data/methods.yaml`` (id, name, kind, summary, reference,
equation, applicability, measured error, and for estimators the key of the
``builder/chem`` routine whose results carry the id).  Each published work is cited once,
in that file's ``references``; a method's reference names it as ``{key}``, expanded here.

A ``computed``, ``estimated``, ``rule`` or ``assumed`` value names one of these ids in
its provenance; the site's methods page lists them and links each value's tag here.
"""
from __future__ import annotations

import re
from dataclasses import dataclass
from pathlib import Path

from builder.core.values import KINDS

METHODS_PATH = Path(__file__).resolve().parents[1] / "data" / "methods.yaml"
_FIELDS = ("id", "name", "plain", "kind", "summary", "reference", "equation", "applicability", "error", "estimator")
_REQUIRED = ("id", "name", "plain", "kind", "summary", "reference")
_CITE = re.compile(r"\{([a-z0-9-]+)\}")


def _load_yaml(text: str):
    """methods.yaml as data, read with libyaml's parser when PyYAML has it (``builder.chem.datafile.load_yaml``
    does the same for the chemistry's data files; core may not import chem)."""
    import yaml

    return yaml.load(text, Loader=getattr(yaml, "CSafeLoader", yaml.SafeLoader))


@dataclass(frozen=True)
class Method:
    id: str
    name: str
    #: a few plain words shown to readers beside a value ("boiling point from structure"); the id
    #: stays in links and exports
    plain: str
    kind: str  # the provenance kind of the values it gives
    summary: str
    reference: str  # with every {key} expanded to the citation
    equation: str | None = None
    applicability: str | None = None
    error: str | None = None
    #: key of the builder/chem estimator (and of its stored validation table) behind this id
    estimator: str | None = None


class MethodsFileError(ValueError):
    """methods.yaml breaks one of its rules (checked when the builder is imported)."""


def read_methods(path: Path = METHODS_PATH) -> tuple[dict[str, str], dict[str, Method]]:
    """The references (key → citation) and the methods (id → ``Method``) of ``path``, validated."""
    data = _load_yaml(path.read_text(encoding="utf-8"))
    if not isinstance(data, dict) or set(data) != {"references", "methods"}:
        raise MethodsFileError(f"{path}: expected exactly the keys 'references' and 'methods'")
    references = data["references"]
    problems, methods, cited = [], {}, set()

    def expand(match):
        cited.add(match[1])
        if match[1] not in references:
            problems.append(f"unknown reference {{{match[1]}}}")
            return match[0]
        return references[match[1]]

    for raw in data["methods"]:
        where = raw.get("id", "?")
        unknown = set(raw) - set(_FIELDS)
        missing = [k for k in _REQUIRED if not raw.get(k)]
        if unknown or missing:
            problems.append(f"{where}: unknown fields {sorted(unknown)}, missing {missing}")
            continue
        if raw["kind"] not in KINDS or raw["kind"] in ("measured", "literature", "supplier"):
            problems.append(f"{where}: kind {raw['kind']!r} is not a derived kind")
        if where in methods:
            problems.append(f"{where}: listed twice")
        texts = {k: raw.get(k) for k in _FIELDS}
        for key in ("summary", "equation", "applicability", "error"):
            if texts[key] and _CITE.search(texts[key]):
                problems.append(f"{where}: {key} cites a reference; only 'reference' may")
        texts["reference"] = _CITE.sub(expand, raw["reference"])
        methods[where] = Method(**texts)
    unused = sorted(set(references) - cited)
    if unused:
        problems.append(f"references never cited: {', '.join(unused)}")
    estimators = [m.estimator for m in methods.values() if m.estimator]
    if len(estimators) != len(set(estimators)):
        problems.append("an estimator key is given to two methods")
    if problems:
        raise MethodsFileError(f"{path}: " + "; ".join(problems))
    return dict(references), methods


REFERENCES, METHODS = read_methods()


def plain_name(method_id: str) -> str:
    """What a reader sees for a method id: its plain words (the id itself when it is unknown)."""
    method = METHODS.get(method_id)
    return method.plain if method else method_id


def method_for_estimator(key: str) -> str:
    """The method id whose ``estimator`` is ``key`` (a builder/chem routine's own name for itself)."""
    for method in METHODS.values():
        if method.estimator == key:
            return method.id
    raise KeyError(f"no method in {METHODS_PATH.name} has estimator {key!r}")
