"""Structural hazard alerts: substructure patterns and declared hazard statements, read as data.

Contents
--------
- :data:`FAMILIES`: the alert families (our own ids), :data:`PEROXIDE_CLASSES`.
- :func:`load_alerts`: read and validate ``builder/data/hazard_alerts.yaml`` (or another file);
  every problem is reported at once in an :class:`AlertsError`.
- :func:`find_alerts`: an RDKit molecule and hazard statements -> tuple of :class:`Alert`.

File format
-----------
``version: 1`` and ``alerts:``, a list of mappings with the keys

- ``id``: lower-case words joined by hyphens, unique;
- ``family``: one of :data:`FAMILIES`;
- ``smarts``: a list of SMARTS patterns (any one matching raises the alert), and/or
  ``h_statements``: a list of hazard-statement codes (any one declared raises it);
- ``min_matches`` (optional, default 1): distinct matches needed over all the patterns
  (2 for "two or more nitro groups");
- ``hazard_class`` (peroxide formers only): one of :data:`PEROXIDE_CLASSES`;
- ``text``: short wording of our own; ``severity``: one of :data:`SEVERITIES`;
- ``source``: a published list or guide with its edition, or "common practice"; lists recalled
  rather than re-read say "from memory";
- ``cite`` (optional): the source in a few words for shelf cards and store sheets ("Kelly 1996").

An alert raised by a pattern carries the atoms it matched (indices into the molecule given,
sorted, every match of every pattern of the alert), so the drawing can highlight them; an alert
raised only by a hazard statement has no atoms.  Alerts are prompts, never clearances: a
structure that raises none may still be hazardous.

Severity levels are the handling notes' display priorities (``high``, ``medium``, ``info``).
"""
from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Any, Iterable

import yaml
from rdkit import Chem, rdBase

from builder.chem.datafile import ID_RE, DataFileError, load_yaml

ALERTS_PATH = Path(__file__).resolve().parents[1] / "data" / "hazard_alerts.yaml"

FAMILIES = ("peroxide-former", "polymerizable", "water-reactive", "air-reactive", "oxidizer", "energetic",
            "acid", "base", "toxic-gas")
#: the peroxide-former classes of the alert file (see its header for their published lists)
PEROXIDE_CLASSES = {
    "storage": "forms peroxides in storage",
    "concentration": "hazardous on concentration",
    "polymerization": "initiates polymerisation",
}
SEVERITIES = ("high", "medium", "info")
ALERT_KEYS = ("id", "family", "smarts", "h_statements", "min_matches", "hazard_class", "text", "severity",
              "source", "cite")
REQUIRED = ("id", "family", "text", "severity", "source")
_ID_RE = ID_RE
_H_RE = re.compile(r"^(EU)?H\d{3}[A-Za-z]{0,2}$")


class AlertsError(DataFileError):
    """The alerts file is invalid; ``problems`` lists every issue found."""



@dataclass(frozen=True)
class AlertRule:
    """One validated alert of the file, its SMARTS compiled."""

    id: str
    family: str
    text: str
    severity: str
    source: str
    smarts: tuple[str, ...] = ()
    h_statements: tuple[str, ...] = ()
    min_matches: int = 1
    hazard_class: str | None = None
    patterns: tuple = ()
    cite: str | None = None


@dataclass(frozen=True)
class Alert:
    """An alert raised for one structure: what the rule says and the atoms it matched."""

    id: str
    family: str
    text: str
    severity: str
    source: str
    atoms: tuple[int, ...] = ()
    hazard_class: str | None = None
    #: the declared hazard statements that raised it (empty when a pattern did)
    h_statements: tuple[str, ...] = ()
    #: the source in a few words (cards, store sheets); the full ``source`` is on the datasheet
    cite: str | None = None

    @property
    def hazard_class_text(self) -> str | None:
        return PEROXIDE_CLASSES.get(self.hazard_class) if self.hazard_class else None

    def as_dict(self) -> dict:
        out = {"id": self.id, "family": self.family, "text": self.text, "severity": self.severity,
               "source": self.source, "atoms": list(self.atoms)}
        if self.hazard_class:
            out["hazard_class"] = self.hazard_class
        if self.h_statements:
            out["h_statements"] = list(self.h_statements)
        return out


def validate_alerts(data: Any, path: str = "<alerts>") -> tuple[AlertRule, ...]:
    """Validate parsed YAML and return the rules; raise AlertsError listing all problems."""
    if not isinstance(data, dict) or set(data) != {"version", "alerts"}:
        raise AlertsError(path, ["top level must have exactly 'version' and 'alerts'"])
    problems: list[str] = []
    if data["version"] != 1:
        problems.append(f"version: unsupported {data['version']!r} (expected 1)")
    if not isinstance(data["alerts"], list):
        raise AlertsError(path, problems + ["alerts: expected a list"])
    rules, seen = [], set()
    for i, raw in enumerate(data["alerts"]):
        where = f"alerts[{i}]"
        if not isinstance(raw, dict):
            problems.append(f"{where}: expected a mapping")
            continue
        unknown = sorted(set(raw) - set(ALERT_KEYS))
        missing = [k for k in REQUIRED if k not in raw]
        if unknown:
            problems.append(f"{where}: unknown field(s) {unknown} (allowed: {', '.join(ALERT_KEYS)})")
        if missing:
            problems.append(f"{where}: missing field(s) {missing}")
            continue
        where = f"alerts[{i}] ({raw['id']})"
        if not isinstance(raw["id"], str) or not _ID_RE.match(raw["id"]):
            problems.append(f"{where}.id: use lower-case words joined by hyphens")
        elif raw["id"] in seen:
            problems.append(f"{where}.id: duplicate id")
        seen.add(raw["id"])
        if raw["family"] not in FAMILIES:
            problems.append(f"{where}.family: {raw['family']!r} not in {FAMILIES}")
        if raw["severity"] not in SEVERITIES:
            problems.append(f"{where}.severity: {raw['severity']!r} not in {SEVERITIES}")
        for key in ("text", "source"):
            if not isinstance(raw[key], str) or not raw[key].strip():
                problems.append(f"{where}.{key}: expected non-empty text")
        hc = raw.get("hazard_class")
        if hc is not None and (raw["family"] != "peroxide-former" or hc not in PEROXIDE_CLASSES):
            problems.append(f"{where}.hazard_class: only for peroxide-former, one of {sorted(PEROXIDE_CLASSES)}")
        smarts = raw.get("smarts", [])
        hs = raw.get("h_statements", [])
        if not smarts and not hs:
            problems.append(f"{where}: needs 'smarts' or 'h_statements'")
        patterns = []
        if not isinstance(smarts, list) or not all(isinstance(s, str) for s in smarts):
            problems.append(f"{where}.smarts: expected a list of SMARTS strings")
            smarts = []
        for s in smarts:
            with rdBase.BlockLogs():
                pattern = Chem.MolFromSmarts(s)
            if pattern is None:
                problems.append(f"{where}.smarts: RDKit cannot read {s!r}")
            patterns.append(pattern)
        if not isinstance(hs, list) or not all(isinstance(h, str) and _H_RE.match(h) for h in hs):
            problems.append(f"{where}.h_statements: expected a list of codes such as H272 or EUH014")
            hs = []
        n = raw.get("min_matches", 1)
        if not isinstance(n, int) or isinstance(n, bool) or n < 1:
            problems.append(f"{where}.min_matches: expected a whole number of at least 1")
            n = 1
        cite = raw.get("cite")
        if cite is not None and (not isinstance(cite, str) or not cite.strip()):
            problems.append(f"{where}.cite: expected non-empty text")
            cite = None
        rules.append(AlertRule(raw["id"], raw["family"], " ".join(str(raw["text"]).split()), raw["severity"],
                               str(raw["source"]).strip(), tuple(smarts), tuple(hs), n, hc, tuple(patterns), cite))
    if problems:
        raise AlertsError(path, problems)
    return tuple(rules)


def load_alerts(path: Path | str = ALERTS_PATH) -> tuple[AlertRule, ...]:
    """Read and validate an alerts file."""
    with open(path, encoding="utf-8") as fh:
        try:
            data = load_yaml(fh)
        except yaml.YAMLError as exc:
            raise AlertsError(str(path), [f"not valid YAML: {exc}"]) from exc
    return validate_alerts(data, str(path))


@lru_cache(maxsize=1)
def default_alerts() -> tuple[AlertRule, ...]:
    return load_alerts(ALERTS_PATH)


def find_alerts(mol: Chem.Mol | None, hazard_statements: Iterable[str] = (),
                rules: tuple[AlertRule, ...] | None = None) -> tuple[Alert, ...]:
    """The alerts ``mol`` and its declared hazard statements raise, most severe first, then in file order.

    >>> [a.id for a in find_alerts(Chem.MolFromSmiles("C1CCOC1"))]
    ['peroxide-ether']
    >>> find_alerts(Chem.MolFromSmiles("CCOCC"))[0].atoms
    (1, 2, 3)
    """
    rules = default_alerts() if rules is None else rules
    declared = {h.strip().upper() for h in hazard_statements}
    found = []
    for rule in rules:
        atoms: set[int] = set()
        matches: set[tuple[int, ...]] = set()
        if mol is not None:
            for pattern in rule.patterns:
                for match in mol.GetSubstructMatches(pattern, uniquify=True, maxMatches=1000):
                    matches.add(tuple(sorted(match)))
                    atoms.update(match)
        by_structure = len(matches) >= rule.min_matches
        by_statement = tuple(h for h in rule.h_statements if h.upper() in declared)
        if by_structure or by_statement:
            found.append(Alert(rule.id, rule.family, rule.text, rule.severity, rule.source,
                               tuple(sorted(atoms)) if by_structure else (), rule.hazard_class, by_statement,
                               rule.cite))
    found.sort(key=lambda a: SEVERITIES.index(a.severity))
    return tuple(found)


def families(alerts: Iterable[Alert]) -> tuple[str, ...]:
    """The families raised, in :data:`FAMILIES` order."""
    raised = {a.family for a in alerts}
    return tuple(f for f in FAMILIES if f in raised)


def highlight_atoms(alerts: Iterable[Alert]) -> tuple[int, ...]:
    """Every atom some alert matched, sorted (for the structure drawing)."""
    return tuple(sorted({i for a in alerts for i in a.atoms}))
