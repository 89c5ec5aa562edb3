"""``cohesion diff``: what a change to the entries does to the catalog, for a reviewer.

``change_report(entries_dir, base, head)`` loads and derives the entries folder at two git
revisions (``head=None``: the working tree) and compares them entry by entry: added,
removed and changed entries, and for each changed entry every stated and derived value
that moves (force class, boiling point chosen and estimated, flash point, category and
its range, volatility band, vapor pressures, handling notes, cross-links), old → new.
Values are compared as a person reads them (the text of the datasheet), so a change
below the shown precision is not reported.

An added entry is shown with its derived summary (force, boiling and flash point, category,
band, handling notes); entries whose only change is their cross-links get one line each; the
``cohesion check`` findings of every added or changed entry (at the head revision) are listed.

``markdown(report)`` renders it for a pull request; ``report.as_dict()`` is the JSON form.
Entries that fail to load at a revision are listed with their diagnostics, not compared.
Read-only git calls (``git show``, ``git ls-tree``, ``git merge-base``); nothing is written
outside a temporary folder.
"""
from __future__ import annotations

import subprocess
import tempfile
from dataclasses import dataclass, field
from pathlib import Path

from builder.core.diagnostics import Diagnostic
from builder.core.model import Catalog, frozen_map
from builder.core.quantities import DERIVED_QUANTITIES
from builder.core.units import celsius_text
from builder.derive.entry import Derived
from builder.derive.links import cross_links
from builder.load.entries import entry_files, read_bibliography, read_entries

MAIN_BRANCHES = ("main", "master")
#: what the report shows of an added entry (snapshot keys, in this order)
ADDED_SUMMARY = ("dominant_force", "boiling_point", "flash_point", "flammable_category", "volatility_band",
                 "handling_notes")

_IDENTITY_FIELDS = {
    "name": "name", "cas": "CAS RN", "smiles": "SMILES (as entered)", "formula": "formula",
    "inchikey": "InChIKey", "hazard_statements": "hazard statements", "locations": "locations",
}


def compared() -> list:
    """The derived quantities the report compares: those with a ``review`` label in
    builder/core/quantities.py, in its order (read at each call)."""
    return [q for q in DERIVED_QUANTITIES.values() if q.review]


def fields() -> dict[str, str]:
    """Compared fields in report order: key → label.  ``stated:*`` rows come from the entry file."""
    return {**_IDENTITY_FIELDS, **{q.key: q.review for q in compared()},
            "handling_notes": "handling notes", "hazard_alerts": "hazard alerts", "links": "cross-links"}


class GitProblem(Exception):
    """A git call failed (not a repository, unknown revision)."""


def _git(cwd: Path, *args: str, binary: bool = False):
    try:
        result = subprocess.run(["git", "-C", str(cwd), *args], capture_output=True, timeout=60)
    except (OSError, subprocess.SubprocessError) as exc:
        raise GitProblem(f"git {' '.join(args)}: {exc}") from exc
    if result.returncode != 0:
        raise GitProblem(f"git {' '.join(args)}: {result.stderr.decode(errors='replace').strip()}")
    return result.stdout if binary else result.stdout.decode()


def default_base(repo: Path) -> str:
    """The merge base of HEAD with the main branch (``main``, else ``master``), else HEAD."""
    for branch in MAIN_BRANCHES:
        try:
            _git(repo, "rev-parse", "--verify", "--quiet", f"{branch}^{{commit}}")
        except GitProblem:
            continue
        return _git(repo, "merge-base", "HEAD", branch).strip()
    return _git(repo, "rev-parse", "HEAD").strip()


def _materialize(repo: Path, rev: str, prefix: str, into: Path) -> None:
    """Write the files directly inside ``prefix`` at ``rev`` into ``into``."""
    into.mkdir(parents=True, exist_ok=True)
    spec = f"{rev}:{prefix}" if prefix else f"{rev}:"
    listing = _git(repo, "ls-tree", "-z", "--name-only", spec)
    for name in filter(None, listing.split("\0")):
        if not (name.endswith(".yaml") or name.endswith(".yml")):
            continue
        path = f"{prefix}/{name}" if prefix else name
        (into / name).write_bytes(_git(repo, "show", f"{rev}:{path}", binary=True))


def load_tolerant(entries_dir: Path, shown_root: str) -> tuple[Catalog, list[Diagnostic], set[str]]:
    """Every entry that loads (others skipped), all diagnostics, and the ids that failed."""
    sources, locations, diags = read_bibliography(entries_dir, shown_root)
    entries, more, failed = read_entries(entry_files(entries_dir), sources, locations,
                                         shown=lambda path: f"{shown_root}/{path.name}")
    catalog = Catalog(tuple(entries[k] for k in sorted(entries)), frozen_map(sorted(sources.items())),
                      frozen_map(sorted(locations.items())), shown_root)
    return catalog, sorted(diags + more), failed


def snapshot(d: Derived, links=()) -> dict[str, str]:
    """What a reviewer compares for one entry: field → text as shown."""
    e = d.entry
    out = {"name": e.name, "cas": e.cas or "", "smiles": e.smiles or "",
           "formula": d.identity.formula if d.identity else "", "inchikey": d.identity.inchikey if d.identity else "",
           "hazard_statements": ", ".join(e.hazard_statements), "locations": ", ".join(e.catalog.locations)}
    if e.composition:
        out["composition"] = "; ".join(f"{c.entry_id or c.smiles} {c.fraction.text}" for c in e.composition)
    if getattr(d, "mixture", None) is not None:
        out["activity_model"] = d.mixture.activity_model + (f" ({d.mixture.activity_note})"
                                                           if d.mixture.activity_note else "")
    for name, value in e.properties.items():
        cond = ", ".join(f"{k} {celsius_text(v, 1)}" if k == "at" else f"{k} {v / 1000:g} kPa"
                         for k, v in value.conditions)
        out[f"stated:{name}"] = f"{value.text()} [{value.provenance.source}]" + (f" ({cond})" if cond else "")
    if e.antoine is not None:
        a = e.antoine
        # "A = …" so that the coefficient C is not read as degrees Celsius
        out["stated:antoine"] = (f"{a.form}, A = {a.A:g}, B = {a.B:g}, C = {a.C:g} (P in {a.pressure_unit}, "
                                 f"T in {a.temperature_unit}),"
                                 f" {celsius_text(a.t_min, 1, unit=False)} to {celsius_text(a.t_max, 1)} [{a.source}]")
    for q in compared():
        if q.is_label:
            if d.label(q.key) is not None:
                out[q.key] = d.label(q.key).text
        elif d.get(q.key) is not None:
            out[q.key] = f"{d.get(q.key).text()} ({d.get(q.key).kind})"
    out["handling_notes"] = ", ".join(sorted(n.id for n in d.notes))
    out["hazard_alerts"] = ", ".join(sorted(a.id for a in getattr(d, "hazard_alerts", ())))
    out["links"] = ", ".join(f"{link.relation} {link.target}" for link in links)
    return {k: v for k, v in out.items() if v}


def _label(key: str) -> str:
    if key.startswith("stated:"):
        return f"{key[7:].replace('_', ' ')} (stated)"
    return fields().get(key, key.replace("_", " "))


_IDENTITY = tuple(_IDENTITY_FIELDS)


def _order(key: str) -> tuple:
    """Identity first, then stated values, then derived values in ``fields()`` order."""
    keys = list(fields())
    if key.startswith("stated:"):
        return (1, 0, key)
    if key in _IDENTITY:
        return (0, keys.index(key), key)
    return (2, keys.index(key) if key in keys else len(keys), key)


@dataclass
class Revision:
    label: str
    snapshots: dict[str, dict[str, str]]
    names: dict[str, str]
    failed: set[str]
    diagnostics: list[Diagnostic]
    #: entry id → what ``cohesion check`` finds for it at this revision (plausibility and derive findings)
    findings: dict[str, list[Diagnostic]] = field(default_factory=dict)


@dataclass
class Report:
    base: str
    head: str
    added: list[tuple[str, str]] = field(default_factory=list)  # (id, name)
    removed: list[tuple[str, str]] = field(default_factory=list)
    changed: dict[str, list[tuple[str, str | None, str | None]]] = field(default_factory=dict)  # id → rows
    names: dict[str, str] = field(default_factory=dict)
    not_compared: dict[str, str] = field(default_factory=dict)  # id → why
    problems: dict[str, list[Diagnostic]] = field(default_factory=dict)  # revision label → diagnostics
    added_summary: dict[str, list[tuple[str, str, str]]] = field(default_factory=dict)  # id → (key, label, text)
    links_only: list[str] = field(default_factory=list)  # changed ids whose only change is the cross-links
    findings: dict[str, list[Diagnostic]] = field(default_factory=dict)  # id → check findings at head

    def as_dict(self) -> dict:
        return {
            "base": self.base, "head": self.head,
            "added": [{"id": i, "name": n, "summary": [{"field": k, "label": label, "value": text}
                                                      for k, label, text in self.added_summary.get(i, [])]}
                      for i, n in self.added],
            "removed": [{"id": i, "name": n} for i, n in self.removed],
            "changed": [{"id": i, "name": self.names.get(i, i),
                         "changes": [{"field": k, "label": _label(k), "old": old, "new": new} for k, old, new in rows]}
                        for i, rows in self.changed.items()],
            "links_only": list(self.links_only),
            "findings": {i: [d.as_dict() for d in diags] for i, diags in sorted(self.findings.items())},
            "not_compared": [{"id": i, "why": why} for i, why in sorted(self.not_compared.items())],
            "problems": {rev: [d.as_dict() for d in diags] for rev, diags in self.problems.items()},
        }


def _revision(entries_dir: Path, label: str) -> Revision:
    from builder.derive.catalog import derive_catalog
    from builder.review.plausibility import check_catalog

    catalog, diags, failed = load_tolerant(entries_dir, label)
    derived = derive_catalog(catalog)
    links = cross_links(derived)
    snaps = {d.entry.id: snapshot(d, links.get(d.entry.id, ())) for d in derived}
    by_path = {e.path: e.id for e in catalog.entries}
    findings: dict[str, list[Diagnostic]] = {}
    for diag in sorted(check_catalog(catalog, derived) + [f for d in derived for f in d.findings]):
        if diag.path in by_path:
            findings.setdefault(by_path[diag.path], []).append(diag)
    return Revision(label, snaps, {e.id: e.name for e in catalog.entries}, failed, diags, findings)


def compare(base: Revision, head: Revision) -> Report:
    report = Report(base.label, head.label)
    report.names = {**base.names, **head.names}
    for rev in (base, head):
        if rev.diagnostics:
            report.problems[rev.label] = rev.diagnostics
    ids = sorted(set(base.snapshots) | set(head.snapshots) | base.failed | head.failed)
    for eid in ids:
        if eid in base.failed or eid in head.failed:
            where = " and ".join(r.label for r in (base, head) if eid in r.failed)
            report.not_compared[eid] = f"does not load at {where}"
            continue
        old, new = base.snapshots.get(eid), head.snapshots.get(eid)
        if old is None:
            report.added.append((eid, head.names[eid]))
            report.added_summary[eid] = [(k, _label(k), new[k]) for k in ADDED_SUMMARY if k in new]
            if head.findings.get(eid):
                report.findings[eid] = head.findings[eid]
        elif new is None:
            report.removed.append((eid, base.names[eid]))
        else:
            rows = [(k, old.get(k), new.get(k)) for k in sorted(set(old) | set(new), key=_order)
                    if old.get(k) != new.get(k)]
            if rows:
                report.changed[eid] = rows
                if {k for k, _, _ in rows} == {"links"}:
                    report.links_only.append(eid)
                if head.findings.get(eid):
                    report.findings[eid] = head.findings[eid]
    return report


def change_report(entries_dir: Path, base: str | None = None, head: str | None = None) -> Report:
    """Compare the entries folder at ``base`` (default: merge base with main) and ``head``
    (default: the working tree).  Raises ``GitProblem`` outside a git repository."""
    entries_dir = Path(entries_dir).resolve()
    if not entries_dir.is_dir() and head is None:
        raise GitProblem(f"entries folder {entries_dir} not found")
    probe = entries_dir if entries_dir.is_dir() else entries_dir.parent
    repo = Path(_git(probe, "rev-parse", "--show-toplevel").strip()).resolve()
    prefix = entries_dir.relative_to(repo).as_posix() if entries_dir != repo else ""
    base = base or default_base(repo)
    shown = prefix or "."
    with tempfile.TemporaryDirectory(prefix="cohesion-diff-") as tmp:
        base_dir = Path(tmp) / "base"
        _materialize(repo, base, prefix, base_dir)
        base_label = f"{_short(repo, base)}:{shown}"
        if head is None:
            head_dir, head_label = entries_dir, f"working tree:{shown}"
        else:
            head_dir = Path(tmp) / "head"
            _materialize(repo, head, prefix, head_dir)
            head_label = f"{_short(repo, head)}:{shown}"
        return compare(_revision(base_dir, base_label), _revision(head_dir, head_label))


def _short(repo: Path, rev: str) -> str:
    try:
        sha = _git(repo, "rev-parse", "--short", f"{rev}^{{commit}}").strip()
    except GitProblem:
        return rev
    return sha if rev.startswith(sha) or sha.startswith(rev) else f"{rev} ({sha})"


def _cell(text: str | None) -> str:
    return "—" if text is None else text.replace("|", "\\|")


def _entries(n: int) -> str:
    return f"{n} entry" if n == 1 else f"{n} entries"


def _link_change(old: str | None, new: str | None) -> str:
    """A cross-link change in one line: what was added and what was dropped."""
    before = set(filter(None, (old or "").split(", ")))
    after = set(filter(None, (new or "").split(", ")))
    parts = []
    if after - before:
        parts.append("added " + "; ".join(sorted(after - before)))
    if before - after:
        parts.append("dropped " + "; ".join(sorted(before - after)))
    return ", ".join(parts) or "reordered"


def markdown(report: Report) -> str:
    """The report as Markdown for a pull request description."""
    n = len(report.added) + len(report.removed) + len(report.changed)
    lines = [f"### Catalog changes: {report.base} → {report.head}", ""]
    if not n and not report.not_compared:
        lines.append("No entry changes what the catalog shows.")
    summary = [f"{len(report.added)} added", f"{len(report.removed)} removed", f"{len(report.changed)} changed"]
    if report.links_only:
        summary[-1] += f" ({len(report.links_only)} in cross-links only)"
    if report.not_compared:
        summary.append(f"{len(report.not_compared)} not compared")
    if n or report.not_compared:
        lines += [f"{_entries(n + len(report.not_compared))}: " + ", ".join(summary) + ".", ""]
    for eid, name in report.added:
        lines += [f"#### Added: `{eid}` — {name}", ""]
        lines += [f"- {label}: {_cell(text)}" for _, label, text in report.added_summary.get(eid, [])]
        lines.append("")
    if report.removed:
        lines += ["**Removed:** " + ", ".join(f"`{i}` ({name})" for i, name in report.removed), ""]
    for eid, rows in report.changed.items():
        if eid in report.links_only:
            continue
        lines += [f"#### `{eid}` — {report.names.get(eid, eid)}", "", "| | before | after |", "|---|---|---|"]
        lines += [f"| {_label(k)} | {_cell(old)} | {_cell(new)} |" for k, old, new in rows]
        lines.append("")
    if report.links_only:
        lines += ["**Cross-links only:**", ""]
        lines += [f"- `{eid}` ({report.names.get(eid, eid)}): {_link_change(rows[0][1], rows[0][2])}"
                  for eid, rows in report.changed.items() if eid in report.links_only]
        lines.append("")
    if report.findings:
        n_findings = sum(len(v) for v in report.findings.values())
        lines += [f"**`cohesion check` findings** for the added and changed entries ({n_findings}):", "", "```"]
        lines += [str(d) for eid in sorted(report.findings) for d in report.findings[eid]]
        lines += ["```", ""]
    if report.not_compared:
        lines += ["**Not compared** (fix the entry, then run again):", ""]
        lines += [f"- `{i}`: {why}" for i, why in sorted(report.not_compared.items())]
        lines.append("")
    for rev, diags in report.problems.items():
        lines += [f"<details><summary>Problems at {rev} ({len(diags)})</summary>", "", "```"]
        lines += [str(d) for d in diags] + ["```", "", "</details>", ""]
    return "\n".join(lines).rstrip() + "\n"
