"""Derive every entry of a catalog: from the cache where the inputs are unchanged, in worker processes otherwise.

``derive_entry`` is a pure function of the entry, the stores it names and the code
version, so its result is cached under the key of exactly those (``builder.core.cache``)
and computed in any order: results are always returned in catalog order, so the output
is the same whatever the number of processes.
"""
from __future__ import annotations

import multiprocessing
import os
from concurrent.futures import ProcessPoolExecutor

from builder.core.cache import Cache, code_version, key_of, settings_key
from builder.core.diagnostics import Diagnostic
from builder.core.model import Catalog, Entry
from builder.derive.entry import Derived, derive_entry

#: fewer entries to compute than this are not worth starting processes for
MIN_PARALLEL = 6


def available_cpus() -> int:
    try:
        return max(1, len(os.sched_getaffinity(0)))
    except AttributeError:  # pragma: no cover - not Linux
        return max(1, os.cpu_count() or 1)


def derive_key(entry: Entry, stores: dict) -> str:
    """The cache key of ``derive_entry(entry, stores)``."""
    return key_of("derive", code_version(), settings_key(), repr(entry), repr(sorted(stores.items())))


def derive_safely(entry: Entry, stores: dict) -> tuple[Derived, bool]:
    """``(derive_entry(...), True)``; a failure of the builder itself becomes ``(an error on the entry, False)``."""
    try:
        return derive_entry(entry, stores), True
    except Exception as exc:  # noqa: BLE001 - any defect of ours must still end as a diagnostic
        line, col = entry.line_of("smiles") if entry.smiles else (1, 1)
        return Derived(entry, None, findings=(Diagnostic(
            entry.path, line, col, "error",
            f"the builder failed while deriving this entry ({type(exc).__name__}: {exc})",
            "this is a defect of cohesion, not of the entry: please report it with the entry file"),)), False


def _derive_pair(pair):
    entry, stores = pair
    return derive_safely(entry, stores)


def derive_catalog(catalog: Catalog, jobs: int | None = 1, cache: Cache | None = None,
                   progress=None) -> tuple[Derived, ...]:
    """Derive every entry, in catalog order.

    ``jobs``: worker processes (None: the CPUs available); ``cache``: where results are
    kept between builds; ``progress(done, total)`` is called as entries complete.
    """
    cache = cache or Cache(None)
    tasks = []
    for entry in catalog.entries:
        stores = {k: catalog.locations[k] for k in entry.catalog.locations}
        tasks.append((entry, stores, derive_key(entry, stores)))
    results: list[Derived | None] = [cache.get("derive", key) for _, _, key in tasks]
    todo = [i for i, r in enumerate(results) if r is None]
    total, done = len(tasks), len(tasks) - len(todo)
    if progress:
        progress(done, total)
    jobs = available_cpus() if jobs is None else max(1, jobs)
    if jobs > 1 and len(todo) >= MIN_PARALLEL and "fork" in multiprocessing.get_all_start_methods():
        context = multiprocessing.get_context("fork")
        with ProcessPoolExecutor(max_workers=min(jobs, len(todo)), mp_context=context) as pool:
            chunk = max(1, min(8, len(todo) // (jobs * 8)))
            computed = pool.map(_derive_pair, [(tasks[i][0], tasks[i][1]) for i in todo], chunksize=chunk)
            for i, (derived, ok) in zip(todo, computed):
                results[i] = derived
                if ok:
                    cache.put("derive", tasks[i][2], derived)
                done += 1
                if progress:
                    progress(done, total)
    else:
        for i in todo:
            entry, stores, key = tasks[i]
            results[i], ok = derive_safely(entry, stores)
            if ok:
                cache.put("derive", key, results[i])
            done += 1
            if progress:
                progress(done, total)
    return tuple(results)  # type: ignore[arg-type]
