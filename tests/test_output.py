"""What ``--out`` may replace, and that a build killed or failing at any point leaves a complete site.

The rules checked here are our own (DEVELOPERS.md, "Output folders"); the kill points are
the steps of ``builder.core.output.replace_folder``.
"""
from __future__ import annotations

import errno
import hashlib
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest
from conftest import ETHANOL, ROOT

from builder.cli import main
from builder.core import output


def _digest(folder: Path) -> dict[str, str]:
    return {str(p.relative_to(folder)): hashlib.sha256(p.read_bytes()).hexdigest()
            for p in sorted(folder.rglob("*")) if p.is_file()}


def _tree(folder: Path) -> dict[str, bytes]:
    return {str(p.relative_to(folder)): p.read_bytes() for p in sorted(folder.rglob("*")) if p.is_file()}


def _leftovers(parent: Path, name: str = "site") -> list[str]:
    return sorted(p.name for p in parent.iterdir() if p.name.startswith(f".{name}."))


def _build(folder: Path, out: Path) -> int:
    """An in-process build that always writes (no cache, so an unchanged catalog is built again)."""
    return main(["build", "--entries", str(folder), "--out", str(out), "--no-cache"])


# ----------------------------------------------------------------------------- what --out may replace


def test_out_at_the_entries_folder_is_refused_and_nothing_is_deleted(make_entries, capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    before = _tree(folder)
    assert _build(folder, folder) == 2
    assert "is the entries folder" in capsys.readouterr().err
    assert _tree(folder) == before


def test_out_above_the_entries_folder_is_refused(make_entries, capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    before = _tree(folder.parent)
    assert _build(folder, folder.parent) == 2
    assert "contains the entries folder" in capsys.readouterr().err
    assert _tree(folder.parent) == before


def test_out_at_the_project_holding_the_entries_is_refused(tmp_path, make_entries, capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    (tmp_path / "pyproject.toml").write_text("[project]\nname = 'x'\n", encoding="utf-8")
    (tmp_path / "elsewhere").mkdir()
    assert _build(folder, tmp_path) == 2
    assert "project folder" in capsys.readouterr().err
    assert (tmp_path / "pyproject.toml").exists()


def test_out_at_the_current_folder_or_home_is_refused(make_entries, tmp_path, monkeypatch, capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    work = tmp_path / "work"
    work.mkdir()
    (work / "keep.txt").write_text("mine", encoding="utf-8")
    monkeypatch.chdir(work)
    assert _build(folder, Path(".")) == 2
    assert "the current folder" in capsys.readouterr().err
    home = tmp_path / "home"
    home.mkdir()
    monkeypatch.setenv("HOME", str(home))
    assert _build(folder, home) == 2
    assert "the home folder" in capsys.readouterr().err
    assert (work / "keep.txt").read_text(encoding="utf-8") == "mine"


def test_out_naming_a_file_is_refused(make_entries, tmp_path, capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    target = tmp_path / "notes.txt"
    target.write_text("mine", encoding="utf-8")
    assert _build(folder, target) == 2
    assert "is a file" in capsys.readouterr().err
    assert target.read_text(encoding="utf-8") == "mine"


def test_a_foreign_folder_is_refused_but_empty_missing_and_marked_ones_are_replaced(make_entries, tmp_path,
                                                                                      capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    foreign = tmp_path / "photos"
    foreign.mkdir()
    (foreign / "a.jpg").write_bytes(b"\xff\xd8")
    assert _build(folder, foreign) == 2
    assert "not made by cohesion" in capsys.readouterr().err
    assert (foreign / "a.jpg").read_bytes() == b"\xff\xd8"

    empty = tmp_path / "empty"
    empty.mkdir()
    assert _build(folder, empty) == 0
    assert (empty / output.MARKER).is_file() and (empty / "index.html").is_file()
    assert _build(folder, empty) == 0  # marked now: replaced
    assert _build(folder, tmp_path / "new" / "site") == 0


def test_a_symlink_out_builds_into_its_target(make_entries, tmp_path):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    real = tmp_path / "real-site"
    link = tmp_path / "site-link"
    link.symlink_to(real, target_is_directory=True)
    assert _build(folder, real) == 0
    assert _build(folder, link) == 0
    assert link.is_symlink() and (real / "index.html").is_file()


# ----------------------------------------------------------------------------- leftovers, failures


def test_leftovers_of_killed_builds_are_cleaned_but_foreign_folders_kept(make_entries, tmp_path):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    out = tmp_path / "site"
    assert _build(folder, out) == 0
    for name in (".site.tmp-abc123", ".site.old-def456"):
        (tmp_path / name).mkdir()
        (tmp_path / name / output.MARKER).write_text(output.MARKER_TEXT, encoding="utf-8")
    (tmp_path / ".site.tmp-empty").mkdir()
    foreign = tmp_path / ".site.tmp-someone-elses"
    foreign.mkdir()
    (foreign / "data.txt").write_text("keep", encoding="utf-8")
    assert _build(folder, out) == 0
    assert _leftovers(tmp_path) == [".site.tmp-someone-elses"]


def test_a_site_left_aside_by_a_kill_between_renames_is_put_back(make_entries, tmp_path):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    out = tmp_path / "site"
    assert _build(folder, out) == 0
    before = _digest(out)
    os.replace(out, tmp_path / ".site.old-k1ll3d")  # what the two-rename swap leaves after a kill
    assert output.clean_leftovers(out.resolve()) == []
    assert _digest(out) == before and _leftovers(tmp_path) == []


def test_disk_errors_end_in_a_message_and_leave_the_site(make_entries, tmp_path, monkeypatch, capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    out = tmp_path / "site"
    assert _build(folder, out) == 0
    before = _digest(out)
    from builder.publish import templating as render

    def full(self, path, text):
        raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC), str(self.out / path))

    monkeypatch.setattr(render.Writer, "_write", full)
    assert _build(folder, out) == 4
    err = capsys.readouterr().err
    assert "No space left on device" in err and "untouched" in err and "Traceback" not in err
    assert _digest(out) == before and _leftovers(tmp_path) == []


def test_a_read_only_parent_ends_in_a_message(make_entries, tmp_path, monkeypatch, capsys):
    folder = make_entries({"ethanol.yaml": ETHANOL})

    def read_only(*args, **kwargs):
        raise OSError(errno.EROFS, os.strerror(errno.EROFS), str(tmp_path))

    monkeypatch.setattr(output.tempfile, "mkdtemp", read_only)
    assert _build(folder, tmp_path / "site") == 4
    assert "Read-only file system" in capsys.readouterr().err
    assert not (tmp_path / "site").exists()


# ----------------------------------------------------------------------------- kills and races (subprocesses)

_RUN = [sys.executable, "-m", "builder", "build"]


def _env(**extra) -> dict:
    env = dict(os.environ)
    env.update(extra)
    return env


def _run(folder: Path, out: Path, **env) -> subprocess.CompletedProcess:
    return subprocess.run(_RUN + ["--entries", str(folder), "--out", str(out)], cwd=ROOT, env=_env(**env),
                          capture_output=True, text=True, timeout=300)


@pytest.fixture
def two_versions(make_entries, tmp_path):
    """An entries folder, its site built once (old), and the digest a build of the edited folder gives (new)."""
    folder = make_entries({"ethanol.yaml": ETHANOL})
    out = tmp_path / "site"
    assert _run(folder, out).returncode == 0
    old = _digest(out)
    (folder / "ethanol.yaml").write_text(ETHANOL.replace("T-1", "T-2"), encoding="utf-8")
    fresh = tmp_path / "fresh"
    assert _run(folder, fresh).returncode == 0
    new = _digest(fresh)
    assert old != new
    return folder, out, old, new


@pytest.mark.slow
@pytest.mark.parametrize("point", ["before-swap", "after-exchange"])
def test_a_build_killed_at_each_step_leaves_a_complete_site(two_versions, tmp_path, point):
    folder, out, old, new = two_versions
    killed = _run(folder, out, COHESION_FAULT_POINT=point)
    assert killed.returncode == -signal.SIGKILL
    assert _digest(out) in (old, new)
    assert _run(folder, out).returncode == 0
    assert _digest(out) == new and _leftovers(tmp_path) == []


@pytest.mark.slow
def test_a_kill_between_the_two_renames_is_healed_by_the_next_build(two_versions, tmp_path):
    folder, out, old, new = two_versions
    script = ("import sys; from builder.core import output; output.exchange = lambda a, b: False; "
              "from builder.cli import main; sys.exit(main(sys.argv[1:]))")
    killed = subprocess.run([sys.executable, "-c", script, "build", "--entries", str(folder), "--out", str(out)],
                            cwd=ROOT, env=_env(COHESION_FAULT_POINT="between-renames"), capture_output=True,
                            timeout=300)
    assert killed.returncode == -signal.SIGKILL
    assert not out.exists()  # the one window the fallback swap cannot close
    assert _run(folder, out).returncode == 0
    assert _digest(out) == new and _leftovers(tmp_path) == []


@pytest.mark.slow
def test_kills_at_random_moments_leave_the_old_or_the_new_site(two_versions, tmp_path):
    folder, out, old, new = two_versions
    for delay in (0.5, 1.5, 2.5, 3.5):
        proc = subprocess.Popen(_RUN + ["--entries", str(folder), "--out", str(out)], cwd=ROOT,
                                stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        time.sleep(delay)
        proc.send_signal(signal.SIGKILL)
        proc.wait(timeout=60)
        assert _digest(out) in (old, new), delay
    assert _run(folder, out).returncode == 0
    assert _digest(out) == new and _leftovers(tmp_path) == []


@pytest.mark.slow
def test_concurrent_builds_into_one_folder_both_succeed(make_entries, tmp_path):
    folder = make_entries({"ethanol.yaml": ETHANOL})
    out = tmp_path / "site"
    procs = [subprocess.Popen(_RUN + ["--entries", str(folder), "--out", str(out)], cwd=ROOT,
                              stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True) for _ in range(3)]
    results = [p.communicate(timeout=300) for p in procs]
    assert [p.returncode for p in procs] == [0, 0, 0], results
    assert (out / "index.html").is_file() and _leftovers(tmp_path) == []


def test_workers_end_with_a_killed_build(tmp_path):
    """A killed build leaves no worker behind (an orphan would keep the output folder's lock, and
    the next build would wait for it for ever)."""
    script = tmp_path / "pool.py"
    script.write_text(
        "import os, sys, time\n"
        "from builder.core.workers import fork_pool\n"
        "pool = fork_pool(2)\n"
        "pids = set()\n"
        "futures = [pool.submit(time.sleep, 60) for _ in range(2)]\n"
        "time.sleep(1.0)\n"
        "print(' '.join(str(p) for p in pool._processes), flush=True)\n"
        "time.sleep(60)\n", encoding="utf-8")
    proc = subprocess.Popen([sys.executable, str(script)], cwd=ROOT, stdout=subprocess.PIPE, text=True)
    workers = [int(p) for p in proc.stdout.readline().split()]
    assert len(workers) == 2
    proc.send_signal(signal.SIGKILL)
    proc.wait(timeout=30)
    deadline = time.monotonic() + 10
    alive = workers
    while alive and time.monotonic() < deadline:
        time.sleep(0.1)
        alive = [p for p in workers if _alive(p)]
    assert alive == []


def _alive(pid: int) -> bool:
    try:
        with open(f"/proc/{pid}/stat", encoding="ascii") as fh:
            return fh.read().split(") ", 1)[1][0] != "Z"  # a zombie has ended
    except FileNotFoundError:
        return False
