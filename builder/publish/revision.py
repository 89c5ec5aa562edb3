"""Which revision of the entries a build was made from (git), for the build page and printouts.

Read-only ``git`` calls; when the folder is not in a git work tree (or git is absent)
every answer is None and the pages say so.
"""
from __future__ import annotations

import subprocess
from dataclasses import dataclass
from pathlib import Path


@dataclass(frozen=True)
class Revision:
    commit: str | None  # full hash of the last commit touching the entries folder
    date: str | None  # its commit date, ISO 8601
    dirty: bool  # uncommitted changes in the entries folder
    per_file: dict  # file name -> (short hash, ISO date) of its last commit


def _git(folder: Path, *args: str) -> str | None:
    try:
        result = subprocess.run(["git", "-C", str(folder), *args], capture_output=True, text=True, timeout=30)
    except (OSError, subprocess.SubprocessError):
        return None
    return result.stdout if result.returncode == 0 else None


def entries_revision(folder: Path) -> Revision:
    folder = Path(folder).resolve()
    head = _git(folder, "log", "-1", "--format=%H %cI", "--", ".")
    if not head or not head.strip():
        return Revision(None, None, False, {})
    commit, date = head.split()
    status = _git(folder, "status", "--porcelain", "--", ".") or ""
    per_file: dict = {}
    log = _git(folder, "log", "--format=@%h %cI", "--name-only", "--relative", "--", ".") or ""
    current = None
    for line in log.splitlines():
        if line.startswith("@"):
            current = tuple(line[1:].split())
        elif line.strip() and current and line not in per_file:
            per_file[line] = current
    return Revision(commit, date, bool(status.strip()), per_file)
