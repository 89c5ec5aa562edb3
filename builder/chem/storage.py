"""Storage groups and which groups may share a store, read from ``builder/data/storage_compatibility.yaml``.

Contents
--------
- :func:`load_table` / :func:`default_table`: the validated file (a :class:`StorageTable`).
- :func:`assign_group`: declared hazard statements, alert families, GHS flammable-liquid category
  and physical state -> :class:`Assignment` (the group, why, and every class the material carries).
- :func:`compatibility`: two assignments -> (outcome, reason).
- :func:`store_conflicts` (pair by pair), :func:`kind_conflicts` (kind by kind: a kind is a group
  and a class set) and :func:`grouped_conflicts` / :func:`hubs` (pairs gathered per material).
- :data:`OUTCOMES`, mildest first.

File format
-----------
``version: 1``, ``source`` (the table's source), ``groups`` (in precedence order: a material
gets the first group whose condition holds), ``table`` (``[group, group, outcome, reason?]``,
either order; a pair not listed is compatible) and ``class_rules`` (``[class, class, outcome,
reason]``, tested over every class both materials carry: the groups they meet and the alert
families they raise).  A group's ``when`` holds when any of its parts holds:
``h_statements`` (any declared; with ``needs_both: true`` and ``families``, both a statement and
a family are needed), ``families`` (any alert of the family raised), ``families_high`` (an alert
of the family with severity high), ``flammable_category`` (GHS category in the list),
``state`` (physical state in the list).  An empty ``when`` always holds.  ``same_as`` files a
second condition under an earlier group (a later place in the order).
"""
from __future__ import annotations

import heapq
import re
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path
from typing import Any, Iterable

from builder.chem.datafile import DataFileError, load_yaml

TABLE_PATH = Path(__file__).resolve().parents[1] / "data" / "storage_compatibility.yaml"

OUTCOMES = ("compatible", "keep-apart", "keep-separate")
#: the outcomes in words, for pages
OUTCOME_TEXT = {
    "compatible": "compatible",
    "keep-apart": "keep apart (separate shelf, tray or cabinet)",
    "keep-separate": "keep separate (separate store or fire-rated cabinet)",
}
_WHEN_KEYS = ("h_statements", "families", "families_high", "flammable_category", "state", "needs_both")


class TableError(DataFileError):
    """The storage table is invalid; ``problems`` lists every issue found."""


@dataclass(frozen=True)
class Group:
    id: str
    name: str
    when: dict


@dataclass(frozen=True)
class StorageTable:
    source: str
    #: in precedence order; several entries may share an id (``same_as``)
    order: tuple[Group, ...]
    names: dict
    pairs: dict
    class_rules: tuple[tuple[str, str, str, str], ...]

    @property
    def group_ids(self) -> tuple[str, ...]:
        return tuple(self.names)


@dataclass(frozen=True)
class Assignment:
    """A material's storage group, the reason in words and every class it carries."""

    group: str
    name: str
    reason: str
    classes: tuple[str, ...]


def validate_table(data: Any, path: str = "<table>") -> StorageTable:
    if not isinstance(data, dict) or set(data) != {"version", "source", "groups", "table", "class_rules"}:
        raise TableError(path, ["top level must have exactly version, source, groups, table, class_rules"])
    problems: list[str] = []
    order, names = [], {}
    for i, g in enumerate(data["groups"] or []):
        gid = g.get("id") if isinstance(g, dict) else None
        if not isinstance(gid, str):
            problems.append(f"groups[{i}]: needs an id")
            continue
        when = g.get("when", {})
        if not isinstance(when, dict) or set(when) - set(_WHEN_KEYS):
            problems.append(f"groups[{i}] ({gid}).when: keys must be among {_WHEN_KEYS}")
            when = {}
        if "same_as" in g:
            if g["same_as"] not in names:
                problems.append(f"groups[{i}] ({gid}).same_as: {g['same_as']!r} is not an earlier group")
                continue
            order.append(Group(g["same_as"], names[g["same_as"]], when))
            continue
        if gid in names:
            problems.append(f"groups[{i}]: duplicate id {gid!r}")
        names[gid] = str(g.get("name") or gid)
        order.append(Group(gid, names[gid], when))
    if not order or order[-1].when:
        problems.append("groups: the last group must have an empty 'when' (the general group)")
    pairs = {}
    for i, row in enumerate(data["table"] or []):
        if not isinstance(row, list) or len(row) not in (3, 4) or row[0] not in names or row[1] not in names \
                or row[2] not in OUTCOMES:
            problems.append(f"table[{i}]: expected [group, group, outcome, reason?] with known groups and outcome")
            continue
        key = frozenset((row[0], row[1]))
        if key in pairs:
            problems.append(f"table[{i}]: pair {row[0]}/{row[1]} listed twice")
        pairs[key] = (row[2], row[3] if len(row) == 4 else None)
    rules = []
    for i, row in enumerate(data["class_rules"] or []):
        if not isinstance(row, list) or len(row) != 4 or row[2] not in OUTCOMES:
            problems.append(f"class_rules[{i}]: expected [class, class, outcome, reason]")
            continue
        rules.append(tuple(str(x) for x in row))
    if problems:
        raise TableError(path, problems)
    return StorageTable(" ".join(str(data["source"]).split()), tuple(order), names, pairs, tuple(rules))


def load_table(path: Path | str = TABLE_PATH) -> StorageTable:
    with open(path, encoding="utf-8") as fh:
        return validate_table(load_yaml(fh), str(path))


@lru_cache(maxsize=1)
def default_table() -> StorageTable:
    return load_table(TABLE_PATH)


def _meets(when: dict, declared: set[str], raised: set[str], raised_high: set[str],
           category: int | None, state: str | None) -> str | None:
    """Why ``when`` holds (in words), or None."""
    if not when:
        return "no hazard that sets another group"
    hs = sorted(declared & set(when.get("h_statements", ())))
    fams = sorted(raised & set(when.get("families", ())))
    if when.get("needs_both"):
        return f"{', '.join(hs)} declared and {', '.join(fams)} alert" if hs and fams else None
    if hs:
        return f"{', '.join(hs)} declared"
    if fams:
        return f"{', '.join(fams)} alert"
    high = sorted(raised_high & set(when.get("families_high", ())))
    if high:
        return f"{', '.join(high)} alert (high)"
    if category is not None and category in when.get("flammable_category", ()):
        return f"GHS flammable liquid category {category}"
    if state is not None and state in when.get("state", ()):
        return f"a {state} at room temperature"
    return None


def assign_group(hazard_statements: Iterable[str] = (), alerts: Iterable = (), flammable_category: int | None = None,
                 state: str | None = None, table: StorageTable | None = None) -> Assignment:
    """The storage group of a material (first group of the file's order whose condition holds)."""
    table = table or default_table()
    alerts = tuple(alerts)
    declared = {h.strip().upper() for h in hazard_statements}
    raised = {a.family for a in alerts}
    raised_high = {a.family for a in alerts if a.severity == "high"}
    met: list[tuple[Group, str]] = []
    for group in table.order:
        why = _meets(group.when, declared, raised, raised_high, flammable_category, state)
        if why is not None:
            met.append((group, why))
    first, reason = met[0]
    classes = {g.id for g, _ in met if g.when} | raised
    if first.id == "corrosive":  # acid or base not known: carries both, so both sides' rules apply
        classes |= {"acid", "base"}
    return Assignment(first.id, first.name, reason, tuple(sorted(classes)))


def group_outcome(a: str, b: str, table: StorageTable | None = None) -> tuple[str, str | None]:
    """The table's outcome between two groups (compatible when the pair is not listed)."""
    table = table or default_table()
    return table.pairs.get(frozenset((a, b)), ("compatible", None))


def compatibility(a: Assignment, b: Assignment, table: StorageTable | None = None) -> tuple[str, str]:
    """The stricter of the group table and the class rules for two materials, with the reason."""
    table = table or default_table()
    outcome, reason = group_outcome(a.group, b.group, table)
    reason = reason or f"{table.names[a.group].lower()} with {table.names[b.group].lower()}"
    for x, y, rule_outcome, why in table.class_rules:
        if (x in a.classes and y in b.classes) or (y in a.classes and x in b.classes):
            if OUTCOMES.index(rule_outcome) > OUTCOMES.index(outcome):
                outcome, reason = rule_outcome, why
    return outcome, reason


@dataclass(frozen=True)
class Conflict:
    """Two materials of one store that the table says not to keep together."""

    first: str  # material ids, first < second
    second: str
    outcome: str
    reason: str

    @property
    def outcome_text(self) -> str:
        return OUTCOME_TEXT[self.outcome]


def store_conflicts(members: Iterable[tuple[str, Assignment]], table: StorageTable | None = None,
                    worst_only: bool = False) -> tuple[Conflict, ...]:
    """Every pair of ``members`` (id, assignment) of one store that is not compatible, sorted:
    keep-separate first, then by ids.  ``worst_only``: only the keep-separate pairs.

    The outcome depends only on the two groups and class sets, so members are gathered by those
    and each pair of kinds is looked up once; only the pairs of kinds that conflict are expanded
    member by member (a store of a thousand materials has a few dozen kinds).
    """
    table = table or default_table()
    kinds: dict[tuple[str, tuple[str, ...]], list[tuple[str, Assignment]]] = {}
    for member in sorted(members, key=lambda m: m[0]):
        kinds.setdefault((member[1].group, member[1].classes), []).append(member)
    keys = sorted(kinds)
    out = []
    for i, ka in enumerate(keys):
        for kb in keys[i:]:
            # the first of a pair is the smaller id, so the reason may be worded either way round
            ways = {}
            for first, second in ((ka, kb), (kb, ka)):
                outcome, reason = compatibility(kinds[first][0][1], kinds[second][0][1], table)
                if not (outcome == "compatible" or (worst_only and outcome != "keep-separate")):
                    ways[first, second] = (outcome, reason)
            if not ways:
                continue
            if ka == kb:
                group = kinds[ka]
                pairs = ((a, b) for j, a in enumerate(group) for b in group[j + 1:])
            else:
                pairs = ((a, b) if a[0] < b[0] else (b, a) for a in kinds[ka] for b in kinds[kb])
            for (a_id, a), (b_id, b) in pairs:
                found = ways.get(((a.group, a.classes), (b.group, b.classes)))
                if found is not None:
                    out.append(Conflict(a_id, b_id, *found))
    out.sort(key=lambda c: (-OUTCOMES.index(c.outcome), c.first, c.second))
    return tuple(out)


@dataclass(frozen=True)
class KindConflict:
    """The materials of two storage kinds (a group and a class set) of one store that the table says
    not to keep together: each material of ``first`` with each of ``second``, or, when ``second`` is
    empty, the materials of ``first`` with one another.  ``reason`` is worded ``first`` to ``second``."""

    first: tuple[str, ...]  # material ids, sorted
    second: tuple[str, ...]
    outcome: str
    reason: str

    @property
    def pairs(self) -> int:
        n = len(self.first)
        return n * len(self.second) if self.second else n * (n - 1) // 2


def kind_conflicts(members: Iterable[tuple[str, Assignment]], table: StorageTable | None = None,
                   worst_only: bool = False) -> tuple[KindConflict, ...]:
    """The conflicts of ``members`` (id, assignment) of one store kind by kind: one
    :class:`KindConflict` per pair of kinds that is not compatible (those with the same outcome and
    reason towards the same materials joined), so a large store is reported in as many lines as it
    has conflicting kinds, not pairs (a store of 3,333 materials had about 320,000 pairs to keep apart
    and two dozen kinds).  Sorted: keep-separate first, then by ids.

    The outcome depends only on the two kinds, as in :func:`store_conflicts`; the reason is the one
    worded from the kind that sorts first (group id, then classes).
    """
    table = table or default_table()
    kinds: dict[tuple[str, tuple[str, ...]], list[str]] = {}
    assignment: dict[tuple[str, tuple[str, ...]], Assignment] = {}
    for mid, a in sorted(members, key=lambda m: m[0]):
        kinds.setdefault((a.group, a.classes), []).append(mid)
        assignment.setdefault((a.group, a.classes), a)
    keys = sorted(kinds)
    out = []
    for i, ka in enumerate(keys):
        for kb in keys[i:]:
            if ka == kb and len(kinds[ka]) < 2:
                continue
            outcome, reason = compatibility(assignment[ka], assignment[kb], table)
            if outcome == "compatible" or (worst_only and outcome != "keep-separate"):
                continue
            out.append(KindConflict(tuple(kinds[ka]), () if ka == kb else tuple(kinds[kb]), outcome, reason))
    for side in ("first", "second"):  # kinds met with the same outcome and reason by the same others: one line
        out = _merged(out, side)
    out.sort(key=lambda c: (-OUTCOMES.index(c.outcome), c.first, c.second))
    return tuple(out)


def _merged(conflicts: list[KindConflict], side: str) -> list[KindConflict]:
    """Join the kind conflicts that differ only in ``side`` (its materials united): ``a × c`` and
    ``b × c`` are ``(a ∪ b) × c``.  Conflicts within one kind stay as they are."""
    other = "second" if side == "first" else "first"
    joined: dict[tuple, list[str]] = {}
    alone = []
    for c in conflicts:
        if not c.second:
            alone.append(c)
            continue
        joined.setdefault((c.outcome, c.reason, getattr(c, other)), []).extend(getattr(c, side))
    out = list(alone)
    for (outcome, reason, fixed), ids in joined.items():
        united = tuple(sorted(ids))
        first, second = (united, fixed) if side == "first" else (fixed, united)
        out.append(KindConflict(first, second, outcome, reason))
    return out


def hubs(pairs: list[tuple[str, str]], tiebreak=lambda mid: (), preferred: set[str] | None = None
         ) -> list[tuple[str, list[int]]]:
    """Gather ``pairs`` (two material ids each) per material, greedily: the material in most of the
    pairs not yet taken takes them all, then the next (ties: the smaller ``tiebreak(id)``, then the
    smaller id; materials of ``preferred``, while any of them is left in a pair, before the others).
    Returns ``(material, indices of its pairs in pairs' order)`` in the order taken.

    A heap of counts, updated as pairs are taken, so the cost grows with the number of pairs (times
    a logarithm), not with pairs times materials.

    >>> hubs([("a", "b"), ("a", "c"), ("b", "c"), ("c", "d")])
    [('c', [1, 2, 3]), ('a', [0])]
    """
    incident: dict[str, list[int]] = {}
    for k, (a, b) in enumerate(pairs):
        if a == b:
            raise ValueError(f"a pair of one material with itself: {a!r}")
        incident.setdefault(a, []).append(k)
        incident.setdefault(b, []).append(k)
    count = {mid: len(ks) for mid, ks in incident.items()}
    heaps: tuple[list, list] = ([], [])  # the preferred materials, everyone
    for mid, n in count.items():
        item = (-n, tiebreak(mid), mid)
        heaps[1].append(item)
        if preferred is not None and mid in preferred:
            heaps[0].append(item)
    for heap in heaps:
        heapq.heapify(heap)
    taken = [False] * len(pairs)
    left, out = len(pairs), []
    while left:
        at = None
        for heap in heaps:
            while heap and (count[heap[0][2]] == 0 or -heap[0][0] != count[heap[0][2]]):
                heapq.heappop(heap)  # an old count: the material has lost pairs since
            if heap:
                at = heap[0][2]
                break
        mine = [k for k in incident[at] if not taken[k]]
        for k in mine:
            taken[k] = True
            a, b = pairs[k]
            other = b if a == at else a
            count[other] -= 1
            if count[other]:
                item = (-count[other], tiebreak(other), other)
                heapq.heappush(heaps[1], item)
                if preferred is not None and other in preferred:
                    heapq.heappush(heaps[0], item)
        count[at] = 0
        left -= len(mine)
        out.append((at, mine))
    return out


_VOLUME = {"ml": 1e-3, "l": 1.0, "m3": 1000.0, "m³": 1000.0}
_CONTAINER = re.compile(r"(?:(\d+)\s*[x×]\s*)?(\d+(?:[.,]\d+)?)\s*(mL|ml|L|l|m3|m³)(?![A-Za-z])")


def container_volume_litres(text: str | None) -> float | None:
    """The liquid volume a container description states, in litres: every ``N L`` / ``N mL`` / ``N m3``
    in the text, each times an ``K x`` / ``K ×`` count before it, added up (so "25 L can; 1 L bottle"
    counts 26 L in every store the material names: the conservative reading).  None when no volume
    is stated.

    >>> container_volume_litres("25 L steel can with bung; 1 L amber glass in the pilot bay")
    26.0
    >>> container_volume_litres("4 x 2.5 L glass bottles"), container_volume_litres("500 mL")
    (10.0, 0.5)
    >>> container_volume_litres("steel drum") is None
    True
    """
    if not text:
        return None
    total, found = 0.0, False
    for count, number, unit in _CONTAINER.findall(text):
        found = True
        total += int(count or 1) * float(number.replace(",", ".")) * _VOLUME[unit.lower()]
    return round(total, 6) if found else None


def flammable_volume(members: Iterable[tuple[str, Assignment, str | None]]) -> tuple[float, tuple, tuple]:
    """Flammable liquid in a store from (id, assignment, container text) of its materials: the total in
    litres, the (id, litres) counted and the ids of flammable materials with no stated volume."""
    counted, uncounted = [], []
    for mid, assignment, container in sorted(members, key=lambda m: m[0]):
        if "flammable" not in assignment.classes:
            continue
        volume = container_volume_litres(container)
        if volume is None:
            uncounted.append(mid)
        else:
            counted.append((mid, volume))
    return round(sum(v for _, v in counted), 6), tuple(counted), tuple(uncounted)


def grouped_conflicts(conflicts: Iterable[Conflict]) -> tuple[tuple[str, tuple[str, ...], str, str], ...]:
    """The pairs gathered for reporting: ``(material, partners, outcome, reason)``, each material in
    turn taking every remaining pair it is in, the one with most pairs first (ties: by id; see
    :func:`hubs`)."""
    pending = list(conflicts)
    out = []
    for at, mine in hubs([(c.first, c.second) for c in pending]):
        by_reason: dict[tuple[str, str], list[str]] = {}
        for c in (pending[k] for k in mine):
            by_reason.setdefault((c.outcome, c.reason), []).append(c.second if c.first == at else c.first)
        for (outcome, reason), partners in sorted(by_reason.items(), key=lambda kv: (-OUTCOMES.index(kv[0][0]), kv[0][1])):
            out.append((at, tuple(sorted(partners)), outcome, reason))
    return tuple(out)
