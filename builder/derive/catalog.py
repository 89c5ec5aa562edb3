"""Derive every entry of a catalog: from the cache where the inputs are unchanged, in worker processes otherwise.

``derive_entry`` is a pure function of the entry, the stores it names and the code
version, so its result is cached under the key of exactly those (``builder.core.cache``)
and computed in any order: results are always returned in catalog order, so the output
is the same whatever the number of processes.
"""
from __future__ import annotations

import multiprocessing
import operator
import os
from collections.abc import Mapping
from types import MappingProxyType

from builder.core.cache import (
    Cache,
    code_version,
    collector_paused,
    key_of,
    settings_key,
)
from builder.core.diagnostics import Diagnostic
from builder.core.model import Catalog, Entry
from builder.core.workers import fork_pool
from builder.derive.entry import Derived, derive_entry

#: fewer entries to compute than this are not worth starting processes for
MIN_PARALLEL = 6
#: ... unless at least this many kept results are to be read meanwhile (reading a thousand takes a
#: few tenths of a second, as long as computing one entry)
MIN_OVERLAP = 200


def available_cpus() -> int:
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:  # pragma: no cover - not Linux
        return max(1, os.cpu_count() or 1)


def derive_key(entry: Entry, stores: dict, components: tuple[Entry, ...] = (), settings: str | None = None) -> str:
    """The cache key of ``derive_entry(entry, stores)`` (a mixture: and of its component entries).
    ``settings``: ``settings_key()``, when the caller has it already (it reads the environment)."""
    return key_of("derive", code_version(), settings_key() if settings is None else settings, repr(entry),
                  repr(sorted(stores.items())), *(repr(c) for c in components))


def component_ids(entry: Entry, by_id: dict[str, Entry]) -> list[str]:
    """The entry ids a mixture's derivation reads: its components and a component mixture's components."""
    out: list[str] = []
    for comp in entry.composition:
        if comp.entry_id is None or comp.entry_id not in by_id:
            continue
        inner = by_id[comp.entry_id]
        out += [c.entry_id for c in inner.composition if c.entry_id and c.entry_id in by_id]
        out.append(comp.entry_id)
    return list(dict.fromkeys(out))


#: [catalog, settings, keys] of the last ``entry_keys``: a build asks for them while deriving and again
#: while writing (the same catalog object), and each key hashes the text of a whole entry
_LAST_KEYS: list = [None, None, None]


def entry_keys(catalog: Catalog) -> dict[str, str]:
    """Each entry's derive key, by id: what its derived record is made from."""
    settings = settings_key()
    if _LAST_KEYS[0] is catalog and _LAST_KEYS[1] == settings:
        return dict(_LAST_KEYS[2])
    by_id = {e.id: e for e in catalog.entries}
    keys = {e.id: derive_key(e, {k: catalog.locations[k] for k in e.catalog.locations if k in catalog.locations},
                             tuple(by_id[i] for i in component_ids(e, by_id)), settings) for e in catalog.entries}
    _LAST_KEYS[:] = [catalog, settings, keys]
    return dict(keys)


def stage_of(entry: Entry, by_id: dict[str, Entry]) -> int:
    """0 for a substance, 1 for a mixture of substances, 2 for a mixture holding a mixture."""
    if not entry.composition:
        return 0
    return 2 if any(c.entry_id and by_id.get(c.entry_id) is not None and by_id[c.entry_id].composition
                    for c in entry.composition) else 1


def derive_safely(entry: Entry, stores: dict, components: dict | None = None) -> tuple[Derived, bool]:
    """``(derive_entry(...), True)``; a failure of the builder itself becomes ``(an error on the entry, False)``."""
    try:
        return derive_entry(entry, stores, components), True
    except Exception as exc:  # noqa: BLE001 - any defect of ours must still end as a diagnostic
        line, col = (entry.line_of("smiles") if entry.smiles
                     else entry.line_of("composition") if entry.composition else (1, 1))
        return Derived(entry, None, findings=(Diagnostic(
            entry.path, line, col, "error",
            f"the builder failed while deriving this entry ({type(exc).__name__}: {exc})",
            "this is a defect of cohesion, not of the entry: please report it with the entry file"),)), False


def _derive_pair(pair):
    entry, stores, components = pair
    return derive_safely(entry, stores, components)


def derive_catalog(catalog: Catalog, jobs: int | None = 1, cache: Cache | None = None,
                   progress=None, neighbours: tuple[Entry, ...] = ()) -> tuple[Derived, ...]:
    """Derive every entry, in catalog order.

    ``jobs``: worker processes (None: the CPUs available); ``cache``: where results are
    kept between builds; ``progress(done, total)`` is called as entries complete.
    Substances first, then mixtures of them, then mixtures holding a mixture: a mixture
    is derived from its components' results. ``neighbours``: entries outside ``catalog``
    (when only some files are checked) that its mixtures may name; those named are derived
    too, and not returned.
    """
    cache = cache or Cache(None)
    by_id = {e.id: e for e in (*neighbours, *catalog.entries)}
    own = {e.id for e in catalog.entries}
    needed = {i for e in catalog.entries for i in component_ids(e, by_id)} - own
    todo_entries = [e for e in neighbours if e.id in needed] + list(catalog.entries)
    results: dict[str, Derived] = {}
    total = len(todo_entries)
    state = {"done": 0}
    jobs = available_cpus() if jobs is None else max(1, jobs)
    settings = settings_key()
    own_keys = entry_keys(catalog) if not neighbours else {}  # with neighbours, their ids can be components
    for stage in (0, 1, 2):
        tasks = []
        for entry in todo_entries:
            if stage_of(entry, by_id) != stage:
                continue
            stores = {k: catalog.locations[k] for k in entry.catalog.locations if k in catalog.locations}
            ids = component_ids(entry, by_id)
            components = {i: results[i] for i in ids if i in results}
            key = own_keys.get(entry.id) or derive_key(entry, stores, tuple(by_id[i] for i in ids), settings)
            tasks.append((entry, stores, components, key))
        _run_stage(tasks, results, jobs, cache, state, total, progress)
    return tuple(results[e.id] for e in catalog.entries)


def expected_cost(task) -> int:
    """A rough, cheap measure of how long deriving a task's entry takes: the square of its SMILES's
    length (the conformer ensembles dominate, and their cost grows about with the square of the
    molecule's size); 0 without a SMILES (a mixture is derived from its components' results)."""
    smiles = task[0].smiles
    return len(smiles) ** 2 if smiles else 0


def _run_stage(tasks, results, jobs, cache, state, total, progress) -> None:
    """Derive ``tasks`` (entry, stores, components, key) into ``results``: each from the cache where it
    is kept, else computed. With worker processes, the computing starts first, and the kept results
    are read meanwhile (an edit of a large catalog computes one entry while reading all the others)."""

    def finished(task, derived, ok):
        results[task[0].id] = derived
        if ok:
            cache.put("derive", task[3], derived)
        state["done"] += 1
        if progress:
            progress(state["done"], total)

    def read(kept) -> list:
        """Fill ``results`` from the cache; returns the tasks whose result could not be read after all."""
        unread = []
        with collector_paused():
            for task in kept:
                hit = cache.get("derive", task[3])
                if hit is None:
                    unread.append(task)
                else:
                    results[task[0].id] = hit
        state["done"] += len(kept) - len(unread)
        if progress:
            progress(state["done"], total)
        return unread

    present = [cache.has("derive", t[3]) for t in tasks]
    kept = [t for t, here in zip(tasks, present) if here]
    todo = [t for t, here in zip(tasks, present) if not here]
    worth_it = len(todo) >= MIN_PARALLEL or (todo and len(kept) >= MIN_OVERLAP)
    if jobs > 1 and worth_it and "fork" in multiprocessing.get_all_start_methods():
        # the costliest first, so that no large molecule is left to one worker at the end while the
        # others wait; where each result goes does not depend on the order (``finished``)
        todo = sorted(todo, key=expected_cost, reverse=True)
        with fork_pool(min(jobs, len(todo))) as pool:
            chunk = max(1, min(8, len(todo) // (jobs * 8)))
            computed = pool.map(_derive_pair, [t[:3] for t in todo], chunksize=chunk)  # submitted at once
            unread = read(kept)
            for task, (derived, ok) in zip(todo, computed):
                finished(task, derived, ok)
    else:
        unread = read(kept) + todo
    for task in unread:
        finished(task, *derive_safely(*task[:3]))


def store_members(derived) -> Mapping[str, tuple[Derived, ...]]:
    """The derived results per store key their entries name, each in the order of ``derived``.

    One pass over the catalog rather than one per store: the by-store page, the store sheets and
    cards, the compatibility keys and the store checks each ask about every store, and at 10,000
    entries in 40 stores the passes per store took about 0.5 s each time. The grouping of the last
    catalog asked about is kept (its items compared by identity, so a list changed since is grouped
    again); read-only.
    """
    items = tuple(derived)
    last = _last_members[0]
    # the very same objects (equal ones would hand the caller another build's results)
    if last is None or len(last) != len(items) or not all(map(operator.is_, last, items)):
        _last_members[:] = [items, _group_by_store(items)]
    return _last_members[1]


_last_members: list = [None, None]


def _group_by_store(derived) -> Mapping[str, tuple[Derived, ...]]:
    groups: dict[str, list[Derived]] = {}
    for d in derived:
        for key in dict.fromkeys(d.entry.catalog.locations):  # a store named twice holds it once
            groups.setdefault(key, []).append(d)
    return MappingProxyType({k: tuple(v) for k, v in groups.items()})
