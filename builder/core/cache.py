"""A content-addressed cache of derived results, safe to delete at any time.

A result is stored under the SHA-256 of everything it depends on: the inputs (the
entry as loaded, the stores it names), the code version (every source, data and
template file of the installed builder) and the settings that change results
(``COHESION_*`` environment variables). Nothing is ever looked up by name or date, so
an edited entry, store, model file or code change simply misses.

Where: ``$COHESION_CACHE_DIR``, else ``$XDG_CACHE_HOME/cohesion``, else
``~/.cache/cohesion``. Files are pickles, written atomically (a temporary file renamed
into place, so a reader finds the old file, the new one or none, never half of one); one
that cannot be read is ignored and recomputed (said with ``--verbose``).
Pickles run code when read, so the cache folder is created private to the user
(mode 0700) and must not be shared.
"""
from __future__ import annotations

import contextlib
import functools
import gc
import hashlib
import os
import pickle
import tempfile
from pathlib import Path

PACKAGE = Path(__file__).resolve().parents[1]
TEMPLATES = PACKAGE.parent / "templates"
#: environment variables that never change a result (where things go, how tests run)
_NEUTRAL_SETTINGS = {"COHESION_CACHE_DIR", "COHESION_FAULT_POINT", "COHESION_REQUIRE_BROWSER", "COHESION_CHROMIUM"}


@contextlib.contextmanager
def collector_paused():
    """Python's cyclic garbage collector paused while a batch of cached results is read: reading
    makes many objects at once, and each time enough have been made the collector scans the whole,
    growing heap again (reading 2,000 results took 2.5 times as long with it running)."""
    collecting = gc.isenabled()
    gc.disable()
    try:
        yield
    finally:
        if collecting:
            gc.enable()


def default_cache_dir() -> Path:
    if os.environ.get("COHESION_CACHE_DIR"):
        return Path(os.environ["COHESION_CACHE_DIR"])
    base = os.environ.get("XDG_CACHE_HOME") or str(Path.home() / ".cache")
    return Path(base) / "cohesion"


@functools.lru_cache(maxsize=1)
def code_version() -> str:
    """SHA-256 over the builder's source, data and template files (path and bytes), in path order."""
    digest = hashlib.sha256()
    files = [p for p in PACKAGE.rglob("*") if p.is_file() and "__pycache__" not in p.parts]
    if TEMPLATES.is_dir():
        files += [p for p in TEMPLATES.rglob("*") if p.is_file()]
    for path in sorted(files, key=lambda p: p.as_posix()):
        digest.update(path.relative_to(PACKAGE.parent).as_posix().encode())
        digest.update(b"\0")
        digest.update(path.read_bytes())
        digest.update(b"\0")
    return digest.hexdigest()


def settings_key() -> str:
    """The ``COHESION_*`` settings that can change a result, as one line."""
    return ";".join(f"{k}={v}" for k, v in sorted(os.environ.items())
                    if k.startswith("COHESION_") and k not in _NEUTRAL_SETTINGS)


def key_of(*parts: str | bytes) -> str:
    """One hex key for several parts (each length-prefixed, so parts cannot run together)."""
    digest = hashlib.sha256()
    for part in parts:
        data = part.encode("utf-8") if isinstance(part, str) else part
        digest.update(str(len(data)).encode() + b":" + data)
    return digest.hexdigest()


class Cache:
    """Results by key under one folder; ``Cache(None)`` stores nothing and finds nothing."""

    def __init__(self, root: Path | None, notes=None):
        self.root = Path(root) if root is not None else None
        self._root = os.fspath(self.root) if root is not None else None  # plain strings: thousands of files a build
        self.notes = notes  # called with a message when a cache file is ignored
        self.hits = 0
        self.misses = 0

    def folder(self, kind: str) -> Path | None:
        """A folder of the cache for files kept by another library (Jinja's compiled templates),
        made private like the cache itself; None without a cache or when it cannot be made."""
        if self.root is None:
            return None
        try:
            if not self.root.exists():
                self.root.mkdir(parents=True, mode=0o700)
            (self.root / kind).mkdir(exist_ok=True)
        except OSError:
            return None
        return self.root / kind

    def _path(self, kind: str, key: str) -> str:
        return os.path.join(self._root, kind, key[:2], key + ".pickle")

    def has(self, kind: str, key: str) -> bool:
        """Whether a result is kept under ``key`` (it may still turn out unreadable: ``get`` says);
        one that is not counts as a miss."""
        found = self.root is not None and os.path.isfile(self._path(kind, key))
        if not found:
            self.misses += 1
        return found

    def get(self, kind: str, key: str):
        if self.root is None:
            self.misses += 1
            return None
        path = self._path(kind, key)
        try:
            with open(path, "rb") as fh, collector_paused():
                value = pickle.load(fh)
        except FileNotFoundError:
            self.misses += 1
            return None
        except Exception as exc:  # noqa: BLE001 - a damaged file of any kind is only a miss
            self.misses += 1
            if self.notes:
                self.notes(f"cache: ignoring unreadable {path} ({type(exc).__name__}); recomputing")
            return None
        self.hits += 1
        return value

    def put(self, kind: str, key: str, value) -> None:
        if self.root is None:
            return
        path = self._path(kind, key)
        try:
            if not self.root.exists():
                self.root.mkdir(parents=True, mode=0o700)
            folder = os.path.dirname(path)
            os.makedirs(folder, exist_ok=True)
            fd, tmp = tempfile.mkstemp(dir=folder, prefix=".tmp-")
            with os.fdopen(fd, "wb") as fh:
                pickle.dump(value, fh, protocol=pickle.HIGHEST_PROTOCOL)
            # the old file goes first: renaming over an existing file makes ext4 write the new one out
            # to disk at once (its guard for programs that do not sync), 7 ms for a 14 MB file, up to
            # 20 ms while the build writes the site; a reader in between finds nothing, which is a miss
            with contextlib.suppress(FileNotFoundError):
                os.unlink(path)
            os.replace(tmp, path)
        except OSError as exc:  # a full or read-only cache only costs time
            if self.notes:
                self.notes(f"cache: cannot write {path} ({exc.strerror}); continuing without it")
            try:
                os.unlink(tmp)  # type: ignore[possibly-undefined]
            except (OSError, NameError):
                pass
