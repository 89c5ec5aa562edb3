"""The ``cohesion`` command: build, check, diff, new, schema and profile.

Exit codes: 0 clean, 1 errors in the entries (or a bad SMILES for ``profile``), 2 usage
(including an ``--out`` that may not be replaced), 3 a tool the command needs (headless
Chromium for ``print``) is missing, 4 the output could not be written (disk full,
read-only folder); the previous output is then untouched.
"""
from __future__ import annotations

import argparse
import atexit
import json
import math
import os
import sys
import threading
from pathlib import Path

from builder import __version__
from builder.core.diagnostics import CatalogError, Diagnostic, errors

EXIT_OK, EXIT_ENTRIES, EXIT_USAGE, EXIT_TOOL, EXIT_OUTPUT = 0, 1, 2, 3, 4


def _print_diagnostics(diagnostics: list[Diagnostic], stream=None) -> None:
    stream = stream or sys.stderr
    for d in diagnostics:
        print(d, file=stream)


def _say(message: str) -> None:
    print(f"cohesion: {message}", file=sys.stderr)


class Progress:
    """A one-line progress report on stderr for a terminal, after the first two seconds; silent otherwise."""

    DELAY_S = 2.0

    def __init__(self, stream=None, enabled: bool | None = None):
        import time

        self.stream = stream or sys.stderr
        self.enabled = self.stream.isatty() if enabled is None else enabled
        self.started = time.monotonic()
        self.shown = False
        self._clock = time.monotonic

    def __call__(self, stage: str, done: int, total: int) -> None:
        if not self.enabled or self._clock() - self.started < self.DELAY_S:
            return
        self.stream.write(f"\r\x1b[Kcohesion: {stage} {done}/{total}")
        self.stream.flush()
        self.shown = True

    def close(self) -> None:
        """Clear the line (once), so what is printed next starts at the left."""
        if self.shown:
            self.stream.write("\r\x1b[K")
            self.stream.flush()
            self.shown = False


def _cache_for(args):
    from builder.core.cache import Cache, default_cache_dir

    if getattr(args, "no_cache", False):
        return Cache(None)
    return Cache(default_cache_dir(), notes=_say if getattr(args, "verbose", False) else None)


def _output_problem(command: str, exc: Exception) -> int:
    """Say why ``--out`` was refused (exit 2) or could not be written (exit 4)."""
    from builder.core.output import OutputRefused

    if isinstance(exc, OutputRefused):
        print(f"cohesion {command}: refusing --out: {exc}", file=sys.stderr)
        return EXIT_USAGE
    print(f"cohesion {command}: {exc}", file=sys.stderr)
    return EXIT_OUTPUT


def cmd_build(args) -> int:
    import time

    from builder.core.output import OutputFailed, OutputRefused
    from builder.pipeline import build

    progress = Progress(enabled=False if args.quiet else None)
    cache = _cache_for(args)
    started = time.monotonic()
    try:
        built = build(Path(args.entries), Path(args.out), waiting_message=_say, jobs=args.jobs, cache=cache,
                      progress=progress)
    except (OutputRefused, OutputFailed) as exc:
        return _output_problem("build", exc)
    except CatalogError as exc:
        progress.close()
        _print_diagnostics(exc.diagnostics)
        print(f"cohesion: build stopped: {exc}; nothing was written to {args.out}", file=sys.stderr)
        return EXIT_ENTRIES
    finally:
        progress.close()
    _print_diagnostics(list(built.diagnostics))
    if args.verbose:
        _say(f"cache {cache.root or 'off'}: {cache.hits} reused, {cache.misses} computed; "
             f"{time.monotonic() - started:.2f} s")
    if args.quiet:
        return EXIT_OK
    index = Path(args.out).resolve() / "index.html"
    warnings = sum(d.severity == "warning" for d in built.diagnostics)
    if built.up_to_date:
        print(f"Up to date: {built.entries} datasheets ({len(built.pages)} files, {warnings} warnings); "
              "nothing changed since the last build.")
    else:
        print(f"Built {built.entries} datasheets ({len(built.pages)} files, {warnings} warnings).")
    print(f"Open {index.as_uri()}")
    return EXIT_OK


def _count(n: int, noun: str, plural: str | None = None) -> str:
    """'1 entry', '2 entries', '0 warnings'."""
    return f"{n} {noun if n == 1 else plural or noun + 's'}"


def cmd_check(args) -> int:
    from builder.core.cache import collector_paused

    files = [Path(f) for f in args.files] if args.files else None
    if files:
        missing = [f for f in files if not f.is_file()]
        if missing:
            print(f"cohesion check: no such file: {missing[0]}", file=sys.stderr)
            return EXIT_USAGE
    cache = _cache_for(args)
    with collector_paused():  # as in a build (builder.pipeline): the results read make no cyclic garbage
        diagnostics, n_entries = _check_diagnostics(args, files, cache)
    _print_diagnostics(diagnostics)
    n_err = len(errors(diagnostics))
    n_warn = len(diagnostics) - n_err
    checked = _count(n_entries, "entry", "entries") if n_entries is not None else "the entries"
    print(f"cohesion check: {checked}, {_count(n_err, 'error')}, {_count(n_warn, 'warning')}", file=sys.stderr)
    if n_err or (args.strict and n_warn):
        return EXIT_ENTRIES
    return EXIT_OK


def _check_diagnostics(args, files, cache) -> tuple[list[Diagnostic], int | None]:
    """The diagnostics of ``cohesion check`` and how many entries were read (None: none could be)."""
    from builder.derive.catalog import derive_catalog
    from builder.load.entries import load_catalog

    catalog, diagnostics = load_catalog(Path(args.entries), only=files, cache=cache)
    if catalog is not None:
        from builder.review.plausibility import check_catalog, check_files

        from builder.review.plausibility import whole_catalog

        neighbours = ()
        if files:  # a checked mixture is derived from its components, checked or not
            named = {e.id for e in catalog.entries}
            neighbours = tuple(e for e in whole_catalog(Path(args.entries), catalog, cache).entries if e.id not in named)
        derived = derive_catalog(catalog, jobs=args.jobs, cache=cache, neighbours=neighbours)
        plausible = check_files(Path(args.entries), catalog, derived, cache) if files else check_catalog(catalog, derived)
        diagnostics = sorted(diagnostics + [f for d in derived for f in d.findings] + plausible)
    return diagnostics, (len(catalog.entries) if catalog else None)


def cmd_substitute(args) -> int:
    from builder.chem.solvency import CAUTION
    from builder.derive.catalog import derive_catalog
    from builder.derive.blends import MOVED, NOT_CHECKED, BlendCheck, one_phase_blends
    from builder.derive.solvency import DEFAULT_MAX_RA, sphere_matches, substitutes_for
    from builder.load.entries import load_catalog

    if args.max_ra is not None and not (math.isfinite(args.max_ra) and args.max_ra > 0):
        print(f"cohesion substitute: --max-ra must be a positive number of MPa½, not {args.max_ra}", file=sys.stderr)
        return EXIT_USAGE
    catalog, diagnostics = load_catalog(Path(args.entries))
    if catalog is None:
        _print_diagnostics(diagnostics)
        return EXIT_ENTRIES
    ids = [e.id for e in catalog.entries]
    if args.id not in ids:
        import difflib
        close = difflib.get_close_matches(args.id, ids, n=1)
        print(f"cohesion substitute: no entry '{args.id}'" + (f" (did you mean '{close[0]}'?)" if close else ""),
              file=sys.stderr)
        return EXIT_USAGE
    derived = derive_catalog(catalog, jobs=args.jobs, cache=_cache_for(args))
    by_id = {d.entry.id: d for d in derived}
    target = by_id[args.id]
    max_ra = DEFAULT_MAX_RA if args.max_ra is None else args.max_ra
    if target.entry.hansen_sphere is not None:
        matches = sphere_matches(target, derived)
        if args.json:
            print(json.dumps({"target": args.id, "sphere": True, "caution": CAUTION, "liquids": [
                {"id": m.id, "ra": round(m.ra, 3), "red": round(m.red, 3), "verdict": m.verdict} for m in matches]},
                ensure_ascii=False, indent=1))
            return EXIT_OK
        print(f"{target.entry.name}: catalog liquids against its solubility sphere (RED = Ra/R0)")
        for m in matches:
            print(f"  {by_id[m.id].entry.name:<32} Ra {m.ra:5.1f} MPa½  RED {m.red:4.2f}  {m.verdict}")
        print(CAUTION)
        return EXIT_OK
    if target.get("hansen_delta_d") is None or target.label("physical_state") is None \
            or target.label("physical_state").code != "liquid":
        print(f"cohesion substitute: '{args.id}' is not a liquid with Hansen parameters", file=sys.stderr)
        return EXIT_ENTRIES
    found = substitutes_for(target, derived, max_ra, blends=args.blends, safer_only=False)
    checks, left_out = [BlendCheck(c) for c in found], 0
    if args.blends:
        from builder.derive.solvency import catalog_solvents

        solvents = catalog_solvents(derived)
        checks, left_out = one_phase_blends(found, solvents[args.id], solvents, by_id, max_ra)

    def side(comparisons):
        return [{"criterion": c.criterion, "candidate": c.candidate, "target": c.target} for c in comparisons]

    if args.json:
        rows = []
        for check in checks:
            c = check.candidate
            row = {"id": c.id} if c.id else {"blend": [[i, round(phi, 4)] for i, phi in c.blend]}
            row.update(ra=round(c.ra, 3), better=side(c.better), worse=side(c.worse))
            if check.mixing is not None:
                row["mixing"] = check.mixing
            if check.optimum is not None:
                row["optimal_fraction"] = round(check.optimum, 4)
            rows.append(row)
        out = {"target": args.id, "max_ra": max_ra, "caution": CAUTION, "candidates": rows}
        if args.blends:
            out["blends_left_out"] = left_out
        print(json.dumps(out, ensure_ascii=False, indent=1))
        return EXIT_OK
    from builder.publish.templating import comparison_text

    print(f"{target.entry.name}: catalog liquids{' and blends' if args.blends else ''} within Ra {max_ra:g} MPa½, "
          "safest first")
    for check in checks:
        c = check.candidate
        name = by_id[c.id].entry.name if c.id else " + ".join(f"{by_id[i].entry.name} {100 * phi:.0f} % v/v"
                                                              for i, phi in c.blend)
        print(f"  {name}  (Ra {c.ra:.1f} MPa½)")
        if c.better:
            print(f"      better: {comparison_text(c.better)}")
        if c.worse:
            print(f"      worse:  {comparison_text(c.worse, worse=True)}")
        if check.mixing == MOVED:
            print(f"      mixing: at the closest match ({100 * check.optimum:.0f} % v/v "
                  f"{by_id[c.blend[0][0]].entry.name}) the parts may separate; moved to where they form "
                  "one liquid (UNIFAC, 25 °C)")
        elif check.mixing == NOT_CHECKED:
            print("      mixing: not checked (no UNIFAC groups or molar volume for a part)")
    if not checks:
        print("  none within that distance")
    if left_out:
        print(f"  {left_out} blend{'s' if left_out != 1 else ''} left out: {'their' if left_out != 1 else 'its'} "
              "parts may separate into two liquid phases at every useful composition (UNIFAC, 25 °C)")
    print(CAUTION)
    return EXIT_OK


def cmd_diff(args) -> int:
    from builder.review.diffreport import GitProblem, change_report, markdown

    try:
        report = change_report(Path(args.entries), args.base, args.head)
    except GitProblem as exc:
        print(f"cohesion diff: {exc}", file=sys.stderr)
        return EXIT_USAGE
    if args.json:
        print(json.dumps(report.as_dict(), ensure_ascii=False, indent=2))
    else:
        print(markdown(report), end="")
    return EXIT_OK


def cmd_new(args) -> int:
    from builder.review.scaffold import ScaffoldError, new_entry

    try:
        if bool(args.smiles) == bool(args.mix):
            print("cohesion new: give --smiles for a substance or --mix components for a mixture", file=sys.stderr)
            return EXIT_USAGE
        path, added = new_entry(Path(args.entries), args.name, args.smiles, args.cas, args.from_reference,
                                mix=args.mix)
    except ScaffoldError as exc:
        print(f"cohesion new: {exc}", file=sys.stderr)
        return exc.code
    print(f"wrote {path}")
    if added:
        print(f"added to {Path(args.entries) / 'sources.yaml'}: {', '.join(added)}")
    print(f"next: fill in the values, then run: cohesion check {path}")
    return EXIT_OK


def cmd_schema(args) -> int:
    from builder.load.schema import write_schema

    folder = Path(args.entries)
    if not folder.is_dir():
        print(f"cohesion schema: entries folder {folder} not found", file=sys.stderr)
        return EXIT_USAGE
    print(f"wrote {write_schema(folder)}")
    return EXIT_OK


def _is_file(item: str) -> bool:
    """Whether a profile argument names a file (a SMILES too long for a path name is not one)."""
    try:
        return Path(item).is_file()
    except (OSError, ValueError):
        return False


def _smiles_inputs(items: list[str]) -> list[str]:
    out = []
    for item in items:
        if item == "-":
            lines = sys.stdin.read().splitlines()
        elif _is_file(item):
            lines = Path(item).read_text(encoding="utf-8", errors="replace").splitlines()
        else:
            out.append(item)
            continue
        out.extend(line.split()[0] for line in lines if line.strip() and not line.lstrip().startswith("#"))
    return out


def cmd_print(args) -> int:
    from builder.core.output import OutputFailed, OutputRefused
    from builder.pipeline import print_catalog
    from builder.publish.printing import PrintError

    papers = [p.strip().lower() for p in args.paper.split(",") if p.strip()]
    if not papers or any(p not in ("a4", "letter") for p in papers):
        print("cohesion print: --paper takes a4, letter or a4,letter", file=sys.stderr)
        return EXIT_USAGE
    try:
        from builder.derive.catalog import available_cpus

        pdfs = print_catalog(Path(args.entries), Path(args.out), papers, jobs=args.jobs or available_cpus())
    except CatalogError as exc:
        _print_diagnostics(exc.diagnostics)
        print(f"cohesion: print stopped: {exc}; nothing was written to {args.out}", file=sys.stderr)
        return EXIT_ENTRIES
    except PrintError as exc:
        print(f"cohesion print: {exc}", file=sys.stderr)
        return EXIT_TOOL
    except (OutputRefused, OutputFailed) as exc:
        return _output_problem("print", exc)
    print(f"Printed {len(pdfs)} PDF files into {Path(args.out).resolve()}")
    return EXIT_OK


def _given_values(items: list[str]) -> dict:
    """``--given boiling_point="34.6 °C"`` → {name: Value}; raises ValueError with the reason."""
    from builder.core.units import (
        DIMENSIONS,
        FRACTION_SCALE,
        UnitProblem,
        parse_quantity,
    )
    from builder.core.values import Provenance, Value
    from builder.load.entry_format import PROPERTIES

    given = {}
    for item in items:
        name, sep, text = item.partition("=")
        name = name.strip()
        if not sep or name not in PROPERTIES:
            raise ValueError(f"--given {item!r}: expected NAME=VALUE with NAME one of {', '.join(PROPERTIES)}")
        spec = PROPERTIES[name]
        if spec.needs_temperature:
            raise ValueError(f"--given {name}: values that need a temperature cannot be given on the command line")
        try:
            value, unc = parse_quantity(text.strip().strip("'\""), spec.dimension)
        except UnitProblem as exc:
            raise ValueError(f"--given {name}: {exc}" + (f" ({exc.hint})" if exc.hint else "")) from exc
        scale = FRACTION_SCALE.get(spec.unit, 1.0)
        given[name] = Value(value * scale, spec.unit or DIMENSIONS[spec.dimension].si_unit,
                            Provenance("measured", source="command-line", note="given with --given"),
                            None if unc is None else unc * scale)
    return given


def cmd_profile(args) -> int:
    from builder.derive.profile import profile

    try:
        given = _given_values(args.given)
    except ValueError as exc:
        print(f"cohesion profile: {exc}", file=sys.stderr)
        return EXIT_USAGE
    status = EXIT_OK
    if args.entry:
        if args.smiles or args.mix or args.given:
            print("cohesion profile: --entry profiles catalog entries as they stand; give it without SMILES, "
                  "--mix or --given", file=sys.stderr)
            return EXIT_USAGE
        return _profile_entries(args)
    if args.mix:
        from builder.derive.profile import profile_mixture

        if args.smiles:
            print("cohesion profile: give either SMILES or --mix components, not both", file=sys.stderr)
            return EXIT_USAGE
        pairs = []
        for item in args.mix:
            smiles, sep, text = item.rpartition("=")
            if not sep or not smiles.strip() or not text.strip():
                print(f"cohesion profile: --mix {item!r}: expected SMILES=FRACTION, e.g. 'CCO=40 % w/w'",
                      file=sys.stderr)
                return EXIT_USAGE
            pairs.append((smiles.strip(), text.strip()))
        from builder.load.composition import FractionProblem, composition_of_pairs

        try:
            result = profile_mixture(composition_of_pairs(pairs))
        except FractionProblem as exc:
            result = {"input": [f"{s}={t}" for s, t in pairs],
                      "error": str(exc) + (f" ({exc.hint})" if exc.hint else "")}
        if args.json:
            print(json.dumps(result, ensure_ascii=False, sort_keys=False))
        else:
            _print_profile_text(result)
        return EXIT_ENTRIES if "error" in result else EXIT_OK
    if not args.smiles:
        print("cohesion profile: give SMILES (or - for standard input), or --mix components", file=sys.stderr)
        return EXIT_USAGE
    for smiles in _smiles_inputs(args.smiles):
        try:
            result = profile(smiles, given)
        except Exception as exc:  # noqa: BLE001 -- one bad input is an error row; the batch goes on
            reason = (str(exc).strip().splitlines() or [""])[0].strip()
            result = {"input": smiles, "error": f"could not derive properties: {type(exc).__name__}"
                                                + (f": {reason}" if reason else "")}
        if "error" in result:
            status = EXIT_ENTRIES
        if args.json:
            print(json.dumps(result, ensure_ascii=False, sort_keys=False))
        else:
            _print_profile_text(result)
    return status


def _profile_entries(args) -> int:
    """``profile --entry ID``: the profile of catalog entries, stated values and estimates as on
    their datasheets (the whole catalog is derived: a mixture needs its components)."""
    from builder.derive.catalog import derive_catalog
    from builder.derive.serialize import profile_json
    from builder.load.entries import load_catalog

    catalog, diagnostics = load_catalog(Path(args.entries))
    if catalog is None:
        _print_diagnostics(diagnostics)
        return EXIT_ENTRIES
    ids = [e.id for e in catalog.entries]
    unknown = [i for i in args.entry if i not in ids]
    if unknown:
        import difflib

        for i in unknown:
            close = difflib.get_close_matches(i, ids, n=1)
            print(f"cohesion profile: no entry '{i}' in {args.entries}" + (f" (did you mean '{close[0]}'?)" if close else ""),
                  file=sys.stderr)
        return EXIT_USAGE
    by_id = {d.entry.id: d for d in derive_catalog(catalog, cache=_cache_for(args))}
    for eid in args.entry:
        result = {"input": eid, "name": by_id[eid].entry.name, **profile_json(by_id[eid])}
        if args.json:
            print(json.dumps(result, ensure_ascii=False, sort_keys=False))
        else:
            _print_profile_text(result)
    return EXIT_OK


def _profile_rows(result: dict, forces: dict) -> list[tuple[str, dict]]:
    """(label, value object) of a profile, each value once: the quantities of
    builder/core/quantities.py in its order, then any other value under its key."""
    from builder.core.quantities import DERIVED_QUANTITIES

    # ``bubble_point`` repeats a mixture's boiling point under the name the JSON promises: shown once
    found = {k: v for k, v in result.items() if isinstance(v, dict) and "value" in v and k != "bubble_point"}
    found.update({k: v for k, v in forces.items() if isinstance(v, dict) and "value" in v and k not in found})
    # the Hansen parameters are nested in the JSON ({"hansen": {"delta_d": ...}}): shown under their own labels
    found.update({f"hansen_{k}": v for k, v in (result.get("hansen") or {}).items() if isinstance(v, dict)})
    order = [k for k in DERIVED_QUANTITIES if k in found] + [k for k in found if k not in DERIVED_QUANTITIES]
    return [(DERIVED_QUANTITIES[k].label if k in DERIVED_QUANTITIES else k, found[k]) for k in order]


#: longest input echoed in full in the text output of ``profile`` (characters)
SHOWN_INPUT = 80


def _shown(text: str) -> str:
    """An input line as the text output echoes it: control characters escaped, long ones cut."""
    cut = text if len(text) <= SHOWN_INPUT else f"{text[:SHOWN_INPUT]}… ({len(text)} characters)"
    return "".join(ch if ch.isprintable() else ch.encode("unicode_escape").decode("ascii") for ch in cut)


def _print_profile_text(result: dict) -> None:
    from builder.core.methods import plain_name
    from builder.core.units import format_value
    from builder.derive.fire import NOTES_DISCLAIMER

    shown_input = " + ".join(result["input"]) if isinstance(result["input"], list) else result["input"]
    if "name" in result:  # a catalog entry (--entry)
        shown_input = f"{result['name']} ({result['input']})"
    if "error" in result:
        print(f"{_shown(shown_input)}: error: {result['error']}")
        return
    if "composition" in result:
        print(f"mixture  {shown_input}")
        for row in result["composition"]:
            cells = [f"{row['name']:<24}", f"stated {row['stated']:<12}"]
            for key, what in (("mass_fraction", "w/w"), ("mole_fraction", "mol/mol"), ("vapor_fraction_20C", "of vapor at 20 °C")):
                if row.get(key):
                    cells.append(f"{format_value(row[key]['value'], '%', None)} {what}")
            print("  " + "  ".join(cells))
        model = result["activity_model"]
        print(f"  activity coefficients: {model['name']}" + (f" ({model['note']})" if model["note"] else ""))
    elif "composition" not in result and "mixture_problem" in result:
        print(f"mixture  {shown_input}: {result['mixture_problem']['text']}")
    else:
        print(f"{shown_input}  →  {result['smiles']}  {result['formula']}  {result['inchikey']}")
    forces = result.get("forces", {})
    for label, val in _profile_rows(result, forces):
        prov = val["provenance"]
        ref = prov.get("source") or plain_name(prov.get("method"))  # the JSON output keeps the method id
        if "unit" in val:
            shown = format_value(val["value"], val["unit"].replace("^", "**"), val.get("uncertainty"))
        else:  # a classification in words (a label), shown as its text
            shown = val.get("text") or str(val["value"])
        print(f"  {label:<46} {shown}  [{prov['kind']}: {ref}]")
    for key, why in forces.get("not_computed", {}).items():
        print(f"  {key:<34} {why}")
    if forces:
        print(f"  dominant force: {forces['dominant']} (present: {', '.join(forces['present'])})")
        for reason in forces["reasons"]:
            print(f"    - {reason}")
        for note in forces.get("notes", []):
            print(f"  note: {note}")
    if "flammable_category" in result:
        basis = result.get("flammable_category_basis", {})
        print(f"  flammable category: {basis.get('text', 'not a flammable liquid (no flash point)')}")
    for cls in result.get("hazard_classes", []):
        if cls["class"] != "flammable-liquid":  # printed just above
            print(f"  {cls['class'].replace('-', ' ')}: {cls['text']} [{cls['provenance']['kind']}]")
    if "boiling_point_missing" in result:
        print(f"  {result['boiling_point_missing']['text']}")
    for note in result.get("handling_notes", []):
        print(f"  [{note['severity']}] {note['text']} ({note['id']}; {note['source']})")
    group = result.get("storage_group")
    if group:
        print(f"  storage group: {group['text']} ({group['provenance'].get('note', '')})")
    for alert in result.get("hazard_alerts", []):
        atoms = f"; atoms {', '.join(map(str, alert['atoms']))}" if alert["atoms"] else ""
        print(f"  alert [{alert['severity']}] {alert['family']}: {alert['text']} ({alert['id']}; {alert['source']}{atoms})")
    if result.get("handling_notes") or result.get("hazard_alerts"):
        print(f"  {NOTES_DISCLAIMER}")
    print()


def _jobs(text: str) -> int:
    try:
        value = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"expected a whole number, got {text!r}") from None
    if value < 1:
        raise argparse.ArgumentTypeError("--jobs takes 1 or more")
    return value


def _add_speed_options(p: argparse.ArgumentParser) -> None:
    p.add_argument("--jobs", type=_jobs, default=None, metavar="N",
                   help="worker processes (default: the CPUs available)")
    p.add_argument("--no-cache", action="store_true",
                   help="compute everything afresh (the cache: $COHESION_CACHE_DIR, else ~/.cache/cohesion)")


def parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="cohesion", description="Build and check the materials catalog.")
    p.add_argument("--version", action="version", version=f"cohesion {__version__}")
    sub = p.add_subparsers(dest="command", required=True, metavar="COMMAND")

    b = sub.add_parser("build", help="build the static site")
    b.add_argument("--entries", default="entries", help="folder of entry files (default: entries)")
    b.add_argument("--out", default="site", help="output folder (default: site)")
    _add_speed_options(b)
    b.add_argument("--quiet", action="store_true", help="print only problems")
    b.add_argument("--verbose", action="store_true", help="also say what the cache reused and how long it took")
    b.set_defaults(func=cmd_build)

    c = sub.add_parser("check", help="validate entries without building")
    c.add_argument("files", nargs="*", help="entry files to check (default: the whole entries folder)")
    c.add_argument("--entries", default="entries", help="folder with sources.yaml and locations.yaml")
    c.add_argument("--strict", action="store_true", help="treat warnings as failures")
    _add_speed_options(c)
    c.add_argument("--verbose", action="store_true", help="say when a cache file is ignored")
    c.set_defaults(func=cmd_check)

    pt = sub.add_parser("print", help="write the printouts (datasheets, shelf cards, store sheets) as PDF")
    pt.add_argument("--entries", default="entries", help="folder of entry files (default: entries)")
    pt.add_argument("--out", default="printouts", help="output folder for the PDFs (default: printouts)")
    pt.add_argument("--paper", default="a4,letter", help="a4, letter or a4,letter (default: both)")
    pt.add_argument("--jobs", type=_jobs, default=None, metavar="N",
                    help="browsers printing at once (default: the CPUs available)")
    pt.set_defaults(func=cmd_print)

    df = sub.add_parser("diff", help="what a change to the entries does to the catalog (Markdown or JSON)")
    df.add_argument("base", nargs="?", help="git revision to compare from (default: merge base with main)")
    df.add_argument("head", nargs="?", help="git revision to compare to (default: the working tree)")
    df.add_argument("--entries", default="entries", help="entries folder (default: entries)")
    df.add_argument("--json", action="store_true", help="JSON instead of Markdown")
    df.set_defaults(func=cmd_diff)

    nw = sub.add_parser("new", help="start an entry file from a name and a SMILES")
    nw.add_argument("name", help="the material's name; the entry id is made from it")
    nw.add_argument("--smiles", help="the structure (a substance)")
    nw.add_argument("--mix", action="append", default=[], metavar="'ID=FRACTION'",
                    help="a component of a mixture: an entry id or a SMILES with its fraction, e.g. "
                         "--mix 'ethanol=40 %% w/w' --mix 'O=balance'")
    nw.add_argument("--cas", help="CAS Registry Number (check digit validated)")
    nw.add_argument("--entries", default="entries", help="entries folder (default: entries)")
    nw.add_argument("--from-reference", action="store_true",
                    help="fill handbook values from the optional 'chemicals' package's offline data")
    nw.set_defaults(func=cmd_new)

    sc = sub.add_parser("schema", help="write entry.schema.json (JSON Schema for editors) into the entries folder")
    sc.add_argument("--entries", default="entries", help="entries folder (default: entries)")
    sc.set_defaults(func=cmd_schema)

    su = sub.add_parser("substitute", help="liquids of similar solvency ranked by safety; for a resin, the "
                                            "liquids inside its solubility sphere")
    su.add_argument("id", help="the entry id of a catalog liquid or resin")
    su.add_argument("--entries", default="entries", help="entries folder (default: entries)")
    su.add_argument("--max-ra", type=float, default=None, metavar="R",
                    help="largest Hansen distance Ra of a candidate, MPa½ (default 6; a resin lists every liquid)")
    su.add_argument("--blends", action="store_true", help="also two-solvent blends at their best volume fraction (not for a resin)")
    su.add_argument("--json", action="store_true", help="the candidates as JSON")
    su.add_argument("--jobs", type=int, default=None, help="worker processes for deriving")
    su.add_argument("--no-cache", action="store_true", help="derive everything afresh")
    su.set_defaults(func=cmd_substitute)

    pr = sub.add_parser("profile", help="derive properties for SMILES strings, a mixture (--mix) or catalog "
                                        "entries (--entry)")
    pr.add_argument("smiles", nargs="*", help="SMILES strings, files with one SMILES a line, or - for stdin")
    pr.add_argument("--mix", action="append", default=[], metavar="'SMILES=FRACTION'",
                    help="a component of one mixture, e.g. --mix 'CCO=40 %% w/w' --mix 'O=balance' (fractions "
                         "as in an entry's composition: %% w/w, %% v/v, mol/mol, a range 10-20 %% w/w, or balance)")
    pr.add_argument("--entry", action="append", default=[], metavar="ID",
                    help="profile a catalog entry as it stands (stated values and estimates); repeatable")
    pr.add_argument("--entries", default="entries", help="entries folder for --entry (default: entries)")
    pr.add_argument("--no-cache", action="store_true", help="derive everything afresh (--entry)")
    pr.add_argument("--json", action="store_true", help="one JSON object a line")
    pr.add_argument("--given", action="append", default=[], metavar='NAME="VALUE UNIT"',
                    help="a known value that takes precedence over estimates, e.g. boiling_point=\"34.6 °C\"")
    pr.set_defaults(func=cmd_profile)
    return p


def _tolerant_streams() -> None:
    """Never fail on a character the terminal's encoding lacks (an ASCII-only locale, say):
    such characters are written as backslash escapes, and undecodable input bytes become U+FFFD."""
    for stream, errors_mode in ((sys.stdout, "backslashreplace"), (sys.stderr, "backslashreplace"),
                                (sys.stdin, "replace")):
        try:
            stream.reconfigure(errors=errors_mode)
        except (AttributeError, ValueError, OSError):
            pass  # not a text stream we can adjust (replaced by a caller, closed)


def main(argv: list[str] | None = None) -> int:
    _tolerant_streams()
    args = parser().parse_args(argv)
    return args.func(args)


def run(argv: list[str] | None = None) -> None:
    """The ``cohesion`` command: ``main``, then an exit that skips freeing every object one by one.

    A build of a large catalog ends with millions of objects alive (the catalog, its derived
    records, per-process memos); the interpreter's own exit frees each of them, 0.1 s at 1,000
    entries. Here the exit handlers run first (they end worker pools and remove temporary
    folders), the output streams are flushed, and the process ends at once with ``main``'s exit
    status. A command that ends with an exception, or leaves a thread running, exits the usual way.
    """
    try:
        code = main(argv)
    except SystemExit as stop:  # argparse's usage errors and --help
        if stop.code is not None and not isinstance(stop.code, int):
            raise
        code = stop.code or 0
    if threading.active_count() > 1 or not hasattr(atexit, "_run_exitfuncs"):
        sys.exit(code)
    atexit._run_exitfuncs()
    try:
        sys.stdout.flush()
        sys.stderr.flush()
    except (OSError, ValueError):  # a closed pipe: let the usual exit report it
        sys.exit(code)
    os._exit(code)


if __name__ == "__main__":
    run()
