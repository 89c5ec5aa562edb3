"""Safe YAML reading that remembers where every key and value stood.

``read_yaml(path, text)`` returns a ``Document``: the plain data (dicts, lists, str,
int, float, bool, None) and a ``where(path)`` lookup giving the 1-based line and
column of any key path, so later validation can report ``file:line:col``.

Refused, each as a diagnostic with its position (line and column as an editor counts
them: a line ends at LF, CR LF or CR):

- characters YAML forbids or an editor hides: control characters, DEL and the C1 range,
  U+FEFF after the start, the unusual line separators U+0085, U+2028, U+2029;
- YAML syntax errors; duplicate keys at any level (PyYAML silently keeps the last);
- anchors and aliases (they allow "billion laughs" expansion and are never needed in an
  entry), merge keys (``<<``), and every explicit tag (``!!int 5``, ``!name``): a tag
  would force a type the field does not hold;
- keys that YAML reads as something other than text (``1:``, ``yes:``, ``~:``);
- integers of more than ``MAX_INT_DIGITS`` digits (no measurement has them, and Python
  refuses to convert very long ones), nesting deeper than ``MAX_DEPTH``, and files over
  ``MAX_BYTES``.

A byte order mark at the very start is accepted and ignored.  Dates stay strings
(YAML 1.1 would turn ``2024-01-05`` into a date).
"""
from __future__ import annotations

import re
from dataclasses import dataclass, field

import yaml

from builder.core.diagnostics import Diagnostic

MAX_BYTES = 256 * 1024
MAX_DEPTH = 20  # an entry needs 4 levels (properties.boiling_point.conditions.at)
MAX_INT_DIGITS = 30
MAX_CHARACTER_PROBLEMS = 10  # per file; the rest are summarised in one line
_BASE = getattr(yaml, "CSafeLoader", yaml.SafeLoader)


class _Loader(_BASE):  # type: ignore[misc, valid-type]
    pass


_Loader.add_constructor("tag:yaml.org,2002:timestamp", lambda loader, node: loader.construct_scalar(node))


def _first_of_duplicates(loader, node):
    """A mapping keeping the first of duplicate keys (the one whose position is reported), not the last."""
    seen, pairs = set(), []
    for key_node, value_node in node.value:
        if isinstance(key_node, yaml.ScalarNode):
            if (key_node.tag, key_node.value) in seen:
                continue
            seen.add((key_node.tag, key_node.value))
        pairs.append((key_node, value_node))
    node.value = pairs
    return loader.construct_yaml_map(node)


_Loader.add_constructor("tag:yaml.org,2002:map", _first_of_duplicates)

KeyPath = tuple  # tuple[str | int, ...]

#: characters refused anywhere in a file, with the reason shown
_BAD_CHARACTER = re.compile("[\x00-\x08\x0b\x0c\x0e-\x1f\x7f-\x9f\ud800-\udfff\ufeff\u2028\u2029\ufffe\uffff]")
_LINE_BREAK = re.compile(r"\r\n|\r|\n")
_INTEGER = re.compile(r"^[-+]?(?:0b[01_]+|0x[0-9a-fA-F_]+|[0-9][0-9_:]*)$")


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


def line_col(text: str, offset: int) -> tuple[int, int]:
    """1-based line and column of character ``offset`` in ``text`` (LF, CR LF and CR end a line)."""
    line, start = 1, 0
    for brk in _LINE_BREAK.finditer(text, 0, offset):
        line, start = line + 1, brk.end()
    return line, offset - start + 1


def _character_name(ch: str) -> str:
    code = f"U+{ord(ch):04X}"
    names = {"\x00": "NUL", "\x09": "tab", "\x1b": "escape", "\x7f": "DEL", "\ufeff": "byte order mark",
             "\u0085": "next-line separator", "\u2028": "line separator", "\u2029": "paragraph separator"}
    if ch in names:
        return f"{code} ({names[ch]})"
    return f"{code} (a control character)" if ord(ch) < 0xA0 else code


def character_problems(path: str, text: str) -> list[Diagnostic]:
    """A diagnostic for each character a YAML entry may not hold, at its real line and column."""
    problems = []
    found = list(_BAD_CHARACTER.finditer(text))
    for match in found[:MAX_CHARACTER_PROBLEMS]:
        line, col = line_col(text, match.start())
        problems.append(Diagnostic(path, line, col, "error", f"character {_character_name(match.group())} "
                                   "is not allowed", "delete it; it is invisible in most editors"))
    if len(found) > MAX_CHARACTER_PROBLEMS:
        line, col = line_col(text, found[MAX_CHARACTER_PROBLEMS].start())
        problems.append(Diagnostic(path, line, col, "error",
                                   f"{len(found) - MAX_CHARACTER_PROBLEMS} more characters that are not allowed"))
    return problems


_KEY_KINDS = {"tag:yaml.org,2002:int": "a number", "tag:yaml.org,2002:float": "a number",
              "tag:yaml.org,2002:bool": "true/false", "tag:yaml.org,2002:null": "nothing"}


def _key_problem(key_node) -> tuple[str, str]:
    if key_node.tag == "tag:yaml.org,2002:merge":
        return "merge keys (<<) are not allowed", "write the keys out in full"
    if isinstance(key_node, yaml.ScalarNode):
        kind = _KEY_KINDS.get(key_node.tag, "something other than text")
        return (f"key {key_node.value!r} is read by YAML as {kind}, not as a name",
                f"write it in quotes: '{key_node.value}'")
    kind = "a list" if isinstance(key_node, yaml.SequenceNode) else "a mapping"
    return f"a key must be a name, not {kind}", "write the key as plain text"


def _index(node, keypath, doc: Document, problems: list[Diagnostic]) -> None:
    doc.positions[keypath] = _mark(node)
    if isinstance(node, yaml.MappingNode):
        seen: dict[str, tuple[int, int]] = {}
        for key_node, value_node in node.value:
            if not isinstance(key_node, yaml.ScalarNode) or key_node.tag != "tag:yaml.org,2002:str":
                line, col = _mark(key_node)
                message, hint = _key_problem(key_node)
                problems.append(Diagnostic(doc.path, line, col, "error", message, hint))
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


def _event_problems(path: str, text: str) -> list[Diagnostic]:
    """Anchors, aliases, tags, over-long integers and deep nesting, found in the event stream."""
    problems = []

    def add(event, message, hint):
        line, col = _mark(event)
        problems.append(Diagnostic(path, line, col, "error", message, hint))

    depth = 0
    for event in yaml.parse(text, Loader=_BASE):
        if isinstance(event, yaml.AliasEvent) or getattr(event, "anchor", None):
            add(event, "anchors and aliases (& and *) are not allowed", "write the value out in full")
        if getattr(event, "tag", None) is not None:
            add(event, f"YAML tag '{event.tag.replace('tag:yaml.org,2002:', '!!')}' is not allowed",
                "remove the tag; write text in quotes and numbers plain")
        if isinstance(event, yaml.ScalarEvent) and not event.style and len(event.value) > MAX_INT_DIGITS \
                and _INTEGER.match(event.value):
            add(event, f"a number with {len(event.value)} digits is too long to be a value",
                "check the value; write large numbers with an exponent, e.g. 1.5e+6")
        if isinstance(event, (yaml.MappingStartEvent, yaml.SequenceStartEvent)):
            depth += 1
            if depth > MAX_DEPTH:
                add(event, f"nested more than {MAX_DEPTH} levels deep", "an entry needs at most 4 levels")
                break
        elif isinstance(event, (yaml.MappingEndEvent, yaml.SequenceEndEvent)):
            depth -= 1
    return problems


def read_yaml(path: str, text: str) -> tuple[Document | None, list[Diagnostic]]:
    """Parse ``text`` (the contents of ``path``); return the document and any problems.

    The document is None when the text cannot be read safely; the problems then say why.
    """
    if len(text.encode("utf-8", "surrogatepass")) > MAX_BYTES:
        return None, [Diagnostic(path, 1, 1, "error", f"file is larger than {MAX_BYTES // 1024} KiB")]
    text = text.removeprefix("\ufeff")  # a byte order mark at the start: harmless, and many editors write one
    problems = character_problems(path, text)
    if problems:
        return None, problems
    try:
        problems = _event_problems(path, text)
        if problems:
            return None, problems
        loader = _Loader(text)
        try:
            root = loader.get_single_node()
            doc = Document(path, None)
            if root is not None:
                _index(root, (), doc, problems)
                try:
                    doc.data = loader.construct_document(root)
                except (yaml.YAMLError, ValueError, OverflowError, TypeError, RecursionError):
                    if problems:  # e.g. a key that is a list: already reported where it stands
                        return None, problems
                    raise
        finally:
            loader.dispose()
    except yaml.MarkedYAMLError as exc:
        mark = exc.problem_mark or exc.context_mark
        line, col = (mark.line + 1, mark.column + 1) if mark else (1, 1)
        return None, [Diagnostic(path, line, col, "error", f"YAML syntax: {exc.problem or exc}")]
    except yaml.YAMLError as exc:
        return None, [Diagnostic(path, 1, 1, "error", f"YAML: {exc}")]
    except (ValueError, OverflowError, TypeError, RecursionError) as exc:
        return None, [Diagnostic(path, 1, 1, "error", f"YAML: cannot read a value ({exc})")]
    return doc, problems
