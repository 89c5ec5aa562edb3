"""Safe output folders: what a build may replace, and how it swaps a finished folder into place.

A folder the builder writes (the site, the printouts) carries a marker file, ``MARKER``.
``guard_target`` decides, before anything is touched, whether ``--out`` may be replaced:
only a missing folder, an empty one, or one that carries the marker; never the entries
folder, the project that holds it, the working folder, the home folder or a folder above
any of them, and never a file.

``replace_folder`` (a context manager) locks the folder that holds the target so that
concurrent builds into it run one after the other, clears folders left by killed builds,
hands out a fresh temporary folder next to the target and, when the body finishes,
puts it in place:

- on Linux the two folders are exchanged in one step (``renameat2`` with
  ``RENAME_EXCHANGE``), so a complete site stands at the output path at every instant;
- elsewhere the old folder is renamed aside and the new one renamed in; a build killed
  between the two renames leaves the old site aside, and the next build puts it back
  before it starts.

If the body raises, the temporary folder is removed and the target is untouched.
"""
from __future__ import annotations

import contextlib
import ctypes
import ctypes.util
import errno
import os
import shutil
import sys
import tempfile
from pathlib import Path

#: name of the marker file written into every folder the builder makes
MARKER = ".cohesion-output"
MARKER_TEXT = ("This folder was written by cohesion. The next build may replace it whole: "
               "keep nothing else in it.\n")


def write_marker(folder: Path, summary: dict) -> None:
    """The marker of a finished output folder, with what the build records about it (JSON after the text)."""
    import json

    text = MARKER_TEXT + json.dumps(summary, ensure_ascii=False, sort_keys=True) + "\n"
    (folder / MARKER).write_text(text, encoding="utf-8")


def read_marker(folder: Path) -> dict | None:
    """What ``write_marker`` recorded in ``folder``, or None (no marker, an older or damaged one)."""
    import json

    try:
        lines = (folder / MARKER).read_text(encoding="utf-8").splitlines()
        summary = json.loads(lines[1]) if len(lines) > 1 else None
    except (OSError, ValueError, UnicodeDecodeError):
        return None
    return summary if isinstance(summary, dict) else None


class OutputRefused(Exception):
    """``--out`` names a folder the builder must not replace; the message says why."""


class OutputFailed(Exception):
    """The output could not be written (disk full, read-only, ...); the old folder is untouched."""


def _within(inner: Path, outer: Path) -> bool:
    """True when ``inner`` is ``outer`` or lies below it (both resolved)."""
    return inner == outer or outer in inner.parents


def project_root(folder: Path) -> Path | None:
    """The nearest folder at or above ``folder`` that holds a project (``.git`` or ``pyproject.toml``)."""
    for candidate in (folder, *folder.parents):
        if (candidate / ".git").exists() or (candidate / "pyproject.toml").exists():
            return candidate
    return None


def guard_target(out: Path, protect: tuple[Path, ...] = ()) -> Path:
    """The resolved output folder, or ``OutputRefused`` if replacing it could lose data.

    ``protect``: folders that must survive (the entries folder); the project holding each,
    the working folder and the home folder are protected too.
    """
    out = Path(out).expanduser().resolve()
    if out.exists() and not out.is_dir():
        raise OutputRefused(f"{out} is a file, not a folder; give --out a folder name")
    guarded: list[tuple[Path, str]] = []
    for folder in protect:
        folder = Path(folder).resolve()
        root = project_root(folder)
        if root is not None and root != folder:
            guarded.append((root, "the project folder"))
        guarded.append((folder, "the entries folder"))
    guarded.append((Path.cwd().resolve(), "the current folder"))
    with contextlib.suppress(RuntimeError, KeyError):
        guarded.append((Path.home().resolve(), "the home folder"))
    for folder, what in guarded:
        if _within(folder, out):
            which = f"is {what}" if folder == out else f"contains {what} ({folder})"
            raise OutputRefused(f"{out} {which}; the build replaces --out whole, "
                                f"so give it a folder of its own, e.g. --out site")
    if out.parent == out:
        raise OutputRefused(f"{out} is the root of the file system")
    if out.is_dir() and not (out / MARKER).is_file():
        try:
            empty = next(out.iterdir(), None) is None
        except OSError as exc:
            raise OutputRefused(f"{out} cannot be read: {exc.strerror}") from exc
        if not empty:
            raise OutputRefused(f"{out} is not empty and was not made by cohesion (it has no {MARKER} file); "
                                f"refusing to replace it: move it away or choose another --out")
    return out


def _leftover_prefixes(out: Path) -> tuple[str, str]:
    return f".{out.name}.tmp-", f".{out.name}.old-"


def _ours(folder: Path) -> bool:
    """A leftover we may delete: it carries the marker, or it is empty."""
    if folder.is_symlink() or not folder.is_dir():
        return False
    if (folder / MARKER).is_file():
        return True
    try:
        return next(folder.iterdir(), None) is None
    except OSError:
        return False


def clean_leftovers(out: Path) -> list[Path]:
    """Restore a site left aside by a killed swap, then delete leftovers of killed builds."""
    tmp_prefix, old_prefix = _leftover_prefixes(out)
    if not out.parent.is_dir():
        return []
    found = sorted(p for p in out.parent.iterdir() if p.name.startswith((tmp_prefix, old_prefix)) and _ours(p))
    if not out.exists():
        aside = [p for p in found if p.name.startswith(old_prefix) and (p / MARKER).is_file()]
        if aside:
            os.replace(aside[-1], out)
            found.remove(aside[-1])
    for folder in found:
        shutil.rmtree(folder, ignore_errors=True)
    return found


# ----------------------------------------------------------------------------- the lock


@contextlib.contextmanager
def _lock(out: Path, waiting_message=None):
    """Hold a lock on the folder that holds ``out`` for the block; wait (saying so) if another build has it.

    The lock is taken on the parent folder itself, so it leaves no file behind.
    """
    try:
        import fcntl
    except ImportError:  # pragma: no cover - not a POSIX system: no lock
        yield
        return
    fd = os.open(out.parent, os.O_RDONLY)
    try:
        try:
            fcntl.flock(fd, fcntl.LOCK_EX | fcntl.LOCK_NB)
        except BlockingIOError:
            if waiting_message:
                waiting_message(f"another build is writing into {out.parent}; waiting for it to finish")
            fcntl.flock(fd, fcntl.LOCK_EX)
        try:
            yield
        finally:
            fcntl.flock(fd, fcntl.LOCK_UN)
    finally:
        os.close(fd)


# ----------------------------------------------------------------------------- the swap

_RENAME_EXCHANGE = 2
_AT_FDCWD = -100


def _renameat2():
    if not sys.platform.startswith("linux"):
        return None
    try:
        libc = ctypes.CDLL(ctypes.util.find_library("c") or "libc.so.6", use_errno=True)
        fn = libc.renameat2
    except (OSError, AttributeError):
        return None
    fn.argtypes = [ctypes.c_int, ctypes.c_char_p, ctypes.c_int, ctypes.c_char_p, ctypes.c_uint]
    fn.restype = ctypes.c_int
    return fn


def exchange(a: Path, b: Path) -> bool:
    """Swap the folders at ``a`` and ``b`` in one step; False where the platform cannot."""
    fn = _renameat2()
    if fn is None:
        return False
    if fn(_AT_FDCWD, os.fsencode(a), _AT_FDCWD, os.fsencode(b), _RENAME_EXCHANGE) == 0:
        return True
    err = ctypes.get_errno()
    if err in (errno.EINVAL, errno.ENOSYS, errno.EOPNOTSUPP):  # file system or kernel without it
        return False
    raise OSError(err, os.strerror(err), str(b))


def fault_point(name: str) -> None:
    """Tests only: ``COHESION_FAULT_POINT=name`` kills the process here, as a power cut would."""
    if os.environ.get("COHESION_FAULT_POINT") == name:
        import signal

        os.kill(os.getpid(), signal.SIGKILL)


def swap_in(tmp: Path, out: Path) -> None:
    """Put the finished folder ``tmp`` at ``out``; the old one (if any) is deleted afterwards."""
    os.chmod(tmp, 0o755)
    if not out.exists():
        os.replace(tmp, out)
        return
    if exchange(tmp, out):
        fault_point("after-exchange")
        shutil.rmtree(tmp, ignore_errors=True)  # tmp now holds the old site
        return
    old = Path(tempfile.mkdtemp(dir=out.parent, prefix=_leftover_prefixes(out)[1]))
    os.rmdir(old)
    os.replace(out, old)
    fault_point("between-renames")
    os.replace(tmp, out)
    shutil.rmtree(old, ignore_errors=True)


def tidy(out: Path, waiting_message=None) -> None:
    """Clear leftovers of killed builds beside ``out`` (under the lock) when nothing else is to be written."""
    out = Path(out).resolve()
    if out.parent.is_dir():
        with _lock(out, waiting_message):
            clean_leftovers(out)


@contextlib.contextmanager
def replace_folder(out: Path, protect: tuple[Path, ...] = (), waiting_message=None):
    """Yield a fresh folder to fill; on success it replaces ``out`` whole (see the module docstring)."""
    out = guard_target(out, protect)
    try:
        out.parent.mkdir(parents=True, exist_ok=True)
        with _lock(out, waiting_message):
            clean_leftovers(out)
            guard_target(out, protect)  # again, now that no other build is running
            tmp = Path(tempfile.mkdtemp(dir=out.parent, prefix=_leftover_prefixes(out)[0]))
            try:
                (tmp / MARKER).write_text(MARKER_TEXT, encoding="utf-8")
                yield tmp
                fault_point("before-swap")
                swap_in(tmp, out)
            except BaseException:
                shutil.rmtree(tmp, ignore_errors=True)
                raise
    except OSError as exc:
        where = exc.filename or out
        raise OutputFailed(f"cannot write {where}: {exc.strerror or exc}; "
                           f"the previous contents of {out} are untouched") from exc
