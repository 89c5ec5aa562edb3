"""Safe YAML reading that remembers where every key and value stood.

``read_yaml(path, text)`` returns a ``Document``: the plain data (dicts, lists, str,
int, float, bool, None) and a ``where(path)`` lookup giving the 1-based line and
column of any key path, so later validation can report ``file:line:col``.

Refused, each as a diagnostic with its position: YAML syntax errors, duplicate keys
(PyYAML silently keeps the last), aliases and anchors (they allow "billion laughs"
expansion and are never needed in an entry), non-string keys, and files over
``MAX_BYTES``.  Dates stay strings (YAML 1.1 would turn ``2024-01-05`` into a date).
"""
from __future__ import annotations

from dataclasses import dataclass, field

import yaml

from builder.core.diagnostics import Diagnostic

MAX_BYTES = 256 * 1024
_BASE = getattr(yaml, "CSafeLoader", yaml.SafeLoader)


class _Loader(_BASE):  # type: ignore[misc, valid-type]
    pass


_Loader.add_constructor("tag:yaml.org,2002:timestamp", lambda loader, node: loader.construct_scalar(node))

KeyPath = tuple  # tuple[str | int, ...]


@dataclass
class Document:
    """Data of one YAML file with the position of every key path."""

    path: str
    data: object
    positions: dict = field(default_factory=dict)  # KeyPath -> (line, col) of the value
    key_positions: dict = field(default_factory=dict)  # KeyPath -> (line, col) of the key

    def where(self, keypath: KeyPath, at_key: bool = False) -> tuple[int, int]:
        """Position of ``keypath``; falls back to the nearest known parent."""
        keypath = tuple(keypath)
        table = self.key_positions if at_key else self.positions
        while keypath:
            if keypath in table:
                return table[keypath]
            if keypath in self.positions:
                return self.positions[keypath]
            keypath = keypath[:-1]
        return self.positions.get((), (1, 1))

    def diag(self, keypath: KeyPath, message: str, hint: str | None = None,
             severity: str = "error", at_key: bool = False) -> Diagnostic:
        line, col = self.where(keypath, at_key)
        return Diagnostic(self.path, line, col, severity, message, hint)


def _mark(node) -> tuple[int, int]:
    return node.start_mark.line + 1, node.start_mark.column + 1


def _index(node, keypath, doc: Document, problems: list[Diagnostic]) -> None:
    doc.positions[keypath] = _mark(node)
    if isinstance(node, yaml.MappingNode):
        seen: dict[str, tuple[int, int]] = {}
        for key_node, value_node in node.value:
            if not isinstance(key_node, yaml.ScalarNode) or key_node.tag != "tag:yaml.org,2002:str":
                line, col = _mark(key_node)
                problems.append(Diagnostic(doc.path, line, col, "error",
                                           f"key {key_node.value!r} must be a plain name",
                                           "write the key as text, e.g. in quotes"))
                continue
            key = key_node.value
            if key in seen:
                line, col = _mark(key_node)
                problems.append(Diagnostic(doc.path, line, col, "error", f"duplicate key '{key}'",
                                           f"first given at line {seen[key][0]}"))
                continue
            seen[key] = _mark(key_node)
            doc.key_positions[keypath + (key,)] = _mark(key_node)
            _index(value_node, keypath + (key,), doc, problems)
    elif isinstance(node, yaml.SequenceNode):
        for i, item in enumerate(node.value):
            _index(item, keypath + (i,), doc, problems)


def read_yaml(path: str, text: str) -> tuple[Document | None, list[Diagnostic]]:
    """Parse ``text`` (the contents of ``path``); return the document and any problems."""
    problems: list[Diagnostic] = []
    if len(text.encode("utf-8")) > MAX_BYTES:
        return None, [Diagnostic(path, 1, 1, "error", f"file is larger than {MAX_BYTES // 1024} KiB")]
    try:
        for event in yaml.parse(text, Loader=_BASE):
            if isinstance(event, yaml.AliasEvent) or getattr(event, "anchor", None):
                line, col = _mark(event)
                return None, [Diagnostic(path, line, col, "error", "anchors and aliases (& and *) are not allowed",
                                         "write the value out in full")]
        loader = _Loader(text)
        try:
            root = loader.get_single_node()
            doc = Document(path, None)
            if root is not None:
                _index(root, (), doc, problems)
                doc.data = loader.construct_document(root)
        finally:
            loader.dispose()
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        line, col = (mark.line + 1, mark.column + 1) if mark else (1, 1)
        return None, [Diagnostic(path, line, col, "error", f"YAML syntax: {exc.problem or exc}")]
    except yaml.YAMLError as exc:
        return None, [Diagnostic(path, 1, 1, "error", f"YAML: {exc}")]
    return doc, problems
