"""Build-time benchmark on generated catalogs (a report, not a test).

Generates N-entry catalogs from the CRC Handbook organic table shipped in the
``chemicals`` package (real structures, stated boiling points, IEC 60079-20-1 flash
points where that table has one) and times ``cohesion build`` as a whole process:

- cold: empty cache, no previous site (wall time, and the CPU time of the build and its workers);
- no-op: the same build again;
- one edit: one entry's boiling point changed;
- add one: one new entry;
- check: ``cohesion check`` with the cache the builds filled;
- floor: read every YAML file, parse each SMILES and write a trivial page (in-process),
  what any builder has to do at the least.

Peak memory is the largest resident set of the build or any process it started. The entries are
spread over one store per ``STORE_SIZE`` of them (at least three; ``--store-size 0``: always three).
Each row also gives a CPU reference, a fixed pure-Python loop timed in the same run, since the
speed of a shared machine varies by half from one hour to the next.

The CRC table holds some 4,700 usable compounds. Larger catalogs continue with structures from
the PubChem identifier table shipped in ``chemicals`` (in its order; the boiling-point model's
domain, at most ``MAX_EXTRA_HEAVY_ATOMS`` heavy atoms, one entry per structure), which state no
boiling point: theirs is estimated, as for an in-house material. They are taken with the CRC
table's spread of molecule sizes (``size_quotas``), so that 10,000 entries cost ten times 1,000
only if the build scales linearly, not more because the molecules got bigger. Python's byte-code is compiled
first (``compileall``), as a normal installation does on first use (this machine's environment
sets ``PYTHONDONTWRITEBYTECODE``, which would make every build compile the builder again).

    python tests/benchmarks/bench_build.py --sizes 250,1000,3000 [--repeat N] [--jobs N] [--store-size N]

Needs the test extra (``pip install -e '.[test]'``) for ``chemicals``.
"""
from __future__ import annotations

import argparse
import json
import os
import re
import resource
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

SOURCES = """\
crc-95:
  title: CRC Handbook of Chemistry and Physics
  kind: handbook
  edition: 95th
  year: 2014
iec-60079-20-1:
  title: "IEC 60079-20-1: Explosive atmospheres, material characteristics for gas and vapour classification"
  kind: standard
  year: 2010
"""
#: materials per store: a generated catalog has one store for each so many entries (at least three),
#: as a multi-site catalog has more stores rather than larger ones; the pairs of materials that must
#: not share a store grow with the square of a store's size
STORE_SIZE = 250
#: the stores' temperature ratings, in turn (None: no rating recorded)
RATINGS = ("30 °C", None, "40 °C")


def store_count(n: int) -> int:
    return max(3, -(-n // STORE_SIZE)) if STORE_SIZE else 3


def locations_text(stores: int) -> str:
    lines = []
    for i in range(stores):
        lines += [f"store-{i + 1:03d}:", f"  name: Bench store {i + 1}"]
        if RATINGS[i % len(RATINGS)]:
            lines.append(f"  max_store_temperature: {RATINGS[i % len(RATINGS)]}")
    return "\n".join(lines) + "\n"

#: a child process reports its own peak memory this way (ru_maxrss is in KiB on Linux)
#: runs the command as ``cohesion`` does (``builder.cli.run``); the peak memory is reported by an exit handler
_RUNNER = ("import atexit, resource, sys; from builder.cli import run; "
           "atexit.register(lambda: print('PEAK_KIB', max(resource.getrusage(resource.RUSAGE_SELF).ru_maxrss, "
           "resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss), file=sys.stderr)); run(sys.argv[1:])")


def _slug(name: str, used: set[str]) -> str:
    base = re.sub(r"[^a-z0-9]+", "-", name.lower()).strip("-")[:48].strip("-") or "compound"
    slug, n = base, 2
    while slug in used:
        slug, n = f"{base}-{n}", n + 1
    used.add(slug)
    return slug


def reference_rows() -> list[dict]:
    """CRC organic compounds with a structure the boiling-point model accepts, in CAS order."""
    from chemicals.safety import T_flash

    from builder.fitting.boiling import load_records

    rows, seen = [], set()
    for rec in load_records():
        if rec.inchikey in seen:  # one structure, one entry (the build refuses duplicates)
            continue
        seen.add(rec.inchikey)
        try:
            flash = T_flash(rec.cas, method="IEC 60079-20-1 (2010)")
        except Exception:  # noqa: BLE001 - the reference lookup raises for unknown methods/CAS
            flash = None
        if flash is not None and flash >= rec.tb_K:  # e.g. formaldehyde: the table's value is for a solution
            flash = None
        rows.append({"cas": rec.cas, "name": rec.name, "smiles": rec.smiles, "tb": rec.tb_K, "flash": flash})
    return rows


#: the largest structures taken from the PubChem identifier table (a store's materials are small molecules)
MAX_EXTRA_HEAVY_ATOMS = 30


def size_quotas(taken: list[dict], needed: int) -> dict[int, int]:
    """How many of ``needed`` extra compounds to take of each heavy-atom count: the shares of ``taken``
    among the sizes that can be taken (at most ``MAX_EXTRA_HEAVY_ATOMS``; largest remainders), so that
    a larger catalog holds molecules of the same sizes and its time per entry measures the build, not
    a change of molecules (3D work grows with the square of the size)."""
    from rdkit import Chem

    sizes: dict[int, int] = {}
    for r in taken:
        h = Chem.MolFromSmiles(r["smiles"]).GetNumHeavyAtoms()
        if h <= MAX_EXTRA_HEAVY_ATOMS:  # larger ones are never taken, so they ask for nothing
            sizes[h] = sizes.get(h, 0) + 1
    if not sizes:
        return {}
    counted = sum(sizes.values())
    exact = {h: needed * c / counted for h, c in sizes.items()}
    quota = {h: int(v) for h, v in exact.items()}
    for h in sorted(exact, key=lambda h: (-(exact[h] - quota[h]), h))[:needed - sum(quota.values())]:
        quota[h] += 1
    return quota


def extra_rows(taken: list[dict], needed: int) -> list[dict]:
    """``needed`` more compounds from the PubChem identifier table of ``chemicals`` (no stated
    boiling point), none with a structure among ``taken``: as many of each heavy-atom count as
    ``size_quotas`` asks while the table has them, then the rest in table order."""
    import chemicals
    from rdkit import Chem, RDLogger

    from builder.chem.boiling import check_structure

    RDLogger.DisableLog("rdApp.*")
    table = Path(chemicals.__file__).parent / "Identifiers" / "chemical identifiers pubchem large.tsv"
    seen = {Chem.MolToInchiKey(Chem.MolFromSmiles(r["smiles"])) for r in taken}
    quota = size_quotas(taken, needed) if taken else None
    chosen, spare = [], []  # (place in the table, row)
    with open(table, encoding="utf-8") as handle:
        for line in handle:
            cells = line.rstrip("\n").split("\t")
            if len(cells) < 9 or "." in cells[4] or cells[6] in seen:
                continue
            mol = Chem.MolFromSmiles(cells[4])
            if mol is None or mol.GetNumHeavyAtoms() > MAX_EXTRA_HEAVY_ATOMS or check_structure(mol) != "OK":
                continue
            seen.add(cells[6])
            row = {"cas": cells[1], "name": cells[7] or cells[8], "smiles": cells[4], "tb": None, "flash": None}
            place, h = len(chosen) + len(spare), mol.GetNumHeavyAtoms()
            if quota is None or quota.get(h, 0) > 0:
                if quota is not None:
                    quota[h] -= 1
                chosen.append((place, row))
                if len(chosen) == needed:
                    break
            else:
                spare.append((place, row))
    chosen += spare[:needed - len(chosen)]
    return [row for _, row in sorted(chosen, key=lambda item: item[0])]


def entry_text(row: dict, index: int, stores: int, tb_shift: float = 0.0) -> str:
    """An entry of the generated catalog; the edit of the benchmark moves its stated boiling point by ``tb_shift``."""
    store = f"store-{index % stores + 1:03d}"
    name = row["name"].replace('"', "'")
    code = f"B-{index:05d}"
    lines = [f'name: "{name}"', f"cas: {row['cas']}", f"smiles: '{row['smiles']}'", "catalog:",
             f"  code: {code}", f"  locations: [{store}]"]
    if row["tb"] is not None or row["flash"]:
        lines.append("properties:")
    if row["tb"] is not None:
        lines.append(f"  boiling_point: {{value: {row['tb'] + tb_shift:.2f} K, source: crc-95}}")
    if row["flash"]:
        lines.append(f"  flash_point: {{value: {row['flash']:.2f} K, source: iec-60079-20-1}}")
    return "\n".join(lines) + "\n"


def write_catalog(folder: Path, rows: list[dict], stores: int | None = None) -> list[Path]:
    """The catalog of ``rows`` in ``folder`` (``stores``: how many stores; by default ``store_count``)."""
    stores = store_count(len(rows)) if stores is None else stores
    folder.mkdir(parents=True)
    (folder / "sources.yaml").write_text(SOURCES, encoding="utf-8")
    (folder / "locations.yaml").write_text(locations_text(stores), encoding="utf-8")
    used: set[str] = set()
    paths = []
    for i, row in enumerate(rows):
        path = folder / f"{_slug(row['name'], used)}.yaml"
        path.write_text(entry_text(row, i, stores), encoding="utf-8")
        paths.append(path)
    return paths


def timed_build(entries: Path, out: Path | None, env: dict, jobs: int | None) -> tuple[float, float, float]:
    """Wall seconds, peak MB and CPU seconds (user and system, of the build and every process it
    started) of ``cohesion build`` (or ``cohesion check`` when ``out`` is None)."""
    cmd = [sys.executable, "-c", _RUNNER, "build", "--entries", str(entries), "--out", str(out)]
    if out is None:
        cmd = [sys.executable, "-c", _RUNNER, "check", "--entries", str(entries)]
    if jobs:
        cmd += ["--jobs", str(jobs)]
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    start = time.perf_counter()
    result = subprocess.run(cmd, cwd=entries.parent, env=env, capture_output=True, text=True)
    wall = time.perf_counter() - start
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = (after.ru_utime + after.ru_stime) - (before.ru_utime + before.ru_stime)
    if result.returncode != 0:
        raise SystemExit(f"build failed ({result.returncode}):\n{result.stderr[-2000:]}")
    peak = max((int(line.split()[1]) for line in result.stderr.splitlines() if line.startswith("PEAK_KIB")),
               default=0)
    return wall, peak / 1024.0, cpu


def floor_seconds(entries: Path, out: Path) -> float:
    """Read each YAML file, parse its SMILES, write a trivial page: the least a build does."""
    import yaml
    from rdkit import Chem, RDLogger

    RDLogger.DisableLog("rdApp.*")
    out.mkdir(parents=True, exist_ok=True)
    start = time.perf_counter()
    for path in sorted(entries.glob("*.yaml")):
        if path.name in ("sources.yaml", "locations.yaml"):
            continue
        data = yaml.safe_load(path.read_text(encoding="utf-8"))
        Chem.MolFromSmiles(data["smiles"])
        (out / f"{path.stem}.html").write_text(f"<!doctype html><title>{data['name']}</title>\n", encoding="utf-8")
    return time.perf_counter() - start


def cpu_reference() -> float:
    """Seconds for a fixed pure-Python loop: the machine's speed at the time (shared machines vary)."""
    start = time.perf_counter()
    total = 0
    for i in range(10_000_000):
        total += i
    return time.perf_counter() - start


def bench(n: int, rows: list[dict], jobs: int | None) -> dict:
    if n + 1 > len(rows):
        rows = rows + extra_rows(rows, n + 1 - len(rows))
        if n + 1 > len(rows):
            raise SystemExit(f"only {len(rows)} compounds; ask for fewer than {len(rows)}")
    with tempfile.TemporaryDirectory(prefix=f"cohesion-bench-{n}-") as work:
        work = Path(work)
        entries = work / "entries"
        paths = write_catalog(entries, rows[:n])
        env = dict(os.environ, COHESION_CACHE_DIR=str(work / "cache"))
        out = work / "site"
        result = {"entries": n}
        result["cold_s"], result["cold_peak_mb"], result["cold_cpu_s"] = timed_build(entries, out, env, jobs)
        result["noop_s"], result["noop_peak_mb"], _ = timed_build(entries, out, env, jobs)
        result["check_s"], result["check_peak_mb"], _ = timed_build(entries, None, env, jobs)
        at = max(i for i in range(n // 2 + 1) if rows[i]["tb"] is not None)  # a CRC compound's boiling point
        paths[at].write_text(entry_text(rows[at], at, store_count(n), tb_shift=1.0), encoding="utf-8")
        result["edit_s"], result["edit_peak_mb"], _ = timed_build(entries, out, env, jobs)
        used = {p.stem for p in paths}
        (entries / f"{_slug(rows[n]['name'], used)}.yaml").write_text(entry_text(rows[n], n, store_count(n)), encoding="utf-8")
        result["add_s"], result["add_peak_mb"], _ = timed_build(entries, out, env, jobs)
        result["floor_s"] = floor_seconds(entries, work / "floor")
        result["cpu_ref_s"] = cpu_reference()
        result["stores"] = store_count(n)
        result["peak_mb"] = max(result[k] for k in result if k.endswith("_peak_mb"))
        return result


def main(argv=None) -> int:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--sizes", default="250,1000", help="comma-separated catalog sizes (default 250,1000)")
    p.add_argument("--jobs", type=int, default=None, help="pass --jobs N to the build")
    p.add_argument("--json", action="store_true", help="print the results as JSON lines too")
    p.add_argument("--repeat", type=int, default=1,
                   help="runs per size, each with a catalog folder and cache of its own (default 1); with "
                        "more than one, a row of the medians follows: a shared machine's speed varies")
    p.add_argument("--store-size", type=int, default=STORE_SIZE,
                   help=f"entries per store (default {STORE_SIZE}; 0: three stores whatever the size)")
    args = p.parse_args(argv)
    globals()["STORE_SIZE"] = args.store_size
    import compileall

    compileall.compile_dir(str(ROOT / "builder"), quiet=1)
    rows = reference_rows()
    print(f"{len(rows)} reference compounds available (CRC organic table in chemicals); larger catalogs "
          "continue with structures from its PubChem identifier table")
    header = (f"{'run':>6} {'entries':>8} {'stores':>7} {'cold s':>8} {'cold CPU s':>10} {'no-op s':>8} "
              f"{'1 edit s':>9} {'add 1 s':>8} {'check s':>8} {'peak MB':>8} {'floor s':>8} {'cpu ref s':>9}")
    print(header)
    for n in (int(s) for s in args.sizes.split(",") if s.strip()):
        runs = []
        for k in range(max(1, args.repeat)):
            r = bench(n, rows, args.jobs)
            runs.append(r)
            print(_row(str(k + 1), r), flush=True)
            if args.json:
                print(json.dumps(r))
        if len(runs) > 1:
            print(_row("median", {key: statistics.median(r[key] for r in runs) for key in runs[0]}), flush=True)
    return 0


def _row(run: str, r: dict) -> str:
    return (f"{run:>6} {r['entries']:>8.0f} {r['stores']:>7.0f} {r['cold_s']:>8.1f} {r['cold_cpu_s']:>10.1f} "
            f"{r['noop_s']:>8.2f} {r['edit_s']:>9.2f} {r['add_s']:>8.2f} {r['check_s']:>8.2f} {r['peak_mb']:>8.0f} "
            f"{r['floor_s']:>8.2f} {r['cpu_ref_s']:>9.2f}")


if __name__ == "__main__":
    sys.exit(main())
