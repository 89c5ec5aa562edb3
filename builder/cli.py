"""The ``cohesion`` command: build, check, diff, new, schema and profile.

Exit codes: 0 clean, 1 errors in the entries (or a bad SMILES for ``profile``), 2 usage
(including an ``--out`` that may not be replaced), 3 a tool the command needs (headless
Chromium for ``print``) is missing, 4 the output could not be written (disk full,
read-only folder); the previous output is then untouched.
"""
from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

from builder import __version__
from builder.core.diagnostics import CatalogError, Diagnostic, errors
from builder.load.entries import load_catalog

EXIT_OK, EXIT_ENTRIES, EXIT_USAGE, EXIT_TOOL, EXIT_OUTPUT = 0, 1, 2, 3, 4


def _print_diagnostics(diagnostics: list[Diagnostic], stream=None) -> None:
    stream = stream or sys.stderr
    for d in diagnostics:
        print(d, file=stream)


def _say(message: str) -> None:
    print(f"cohesion: {message}", file=sys.stderr)


def cmd_build(args) -> int:
    from builder.core.output import OutputFailed, OutputRefused
    from builder.pipeline import build

    try:
        built = build(Path(args.entries), Path(args.out), waiting_message=_say)
    except OutputRefused as exc:
        print(f"cohesion build: refusing --out: {exc}", file=sys.stderr)
        return EXIT_USAGE
    except OutputFailed as exc:
        print(f"cohesion build: {exc}", file=sys.stderr)
        return EXIT_OUTPUT
    except CatalogError as exc:
        _print_diagnostics(exc.diagnostics)
        print(f"cohesion: build stopped: {exc}; nothing was written to {args.out}", file=sys.stderr)
        return EXIT_ENTRIES
    _print_diagnostics(list(built.diagnostics))
    index = Path(args.out).resolve() / "index.html"
    warnings = sum(d.severity == "warning" for d in built.diagnostics)
    print(f"Built {len(built.derived)} datasheets ({len(built.pages)} files, {warnings} warnings).")
    print(f"Open {index.as_uri()}")
    return EXIT_OK


def cmd_check(args) -> int:
    from builder.derive.catalog import derive_catalog

    files = [Path(f) for f in args.files] if args.files else None
    if files:
        missing = [f for f in files if not f.is_file()]
        if missing:
            print(f"cohesion check: no such file: {missing[0]}", file=sys.stderr)
            return EXIT_USAGE
    catalog, diagnostics = load_catalog(Path(args.entries), only=files)
    if catalog is not None:
        from builder.review.plausibility import check_catalog, check_files

        derived = derive_catalog(catalog)
        plausible = check_files(Path(args.entries), catalog, derived) if files else check_catalog(catalog, derived)
        diagnostics = sorted(diagnostics + [f for d in derived for f in d.findings] + plausible)
    _print_diagnostics(diagnostics)
    n_err = len(errors(diagnostics))
    n_warn = len(diagnostics) - n_err
    checked = len(catalog.entries) if catalog else "the"
    print(f"cohesion check: {checked} entries, {n_err} errors, {n_warn} warnings", file=sys.stderr)
    if n_err or (args.strict and n_warn):
        return EXIT_ENTRIES
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
        path, added = new_entry(Path(args.entries), args.name, args.smiles, args.cas, args.from_reference)
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


def _smiles_inputs(items: list[str]) -> list[str]:
    out = []
    for item in items:
        if item == "-":
            lines = sys.stdin.read().splitlines()
        elif Path(item).is_file():
            lines = Path(item).read_text(encoding="utf-8").splitlines()
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
        pdfs = print_catalog(Path(args.entries), Path(args.out), papers)
    except CatalogError as exc:
        _print_diagnostics(exc.diagnostics)
        print(f"cohesion: print stopped: {exc}; nothing was written to {args.out}", file=sys.stderr)
        return EXIT_ENTRIES
    except PrintError as exc:
        print(f"cohesion print: {exc}", file=sys.stderr)
        return EXIT_TOOL
    except OutputRefused as exc:
        print(f"cohesion print: refusing --out: {exc}", file=sys.stderr)
        return EXIT_USAGE
    except OutputFailed as exc:
        print(f"cohesion print: {exc}", file=sys.stderr)
        return EXIT_OUTPUT
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
    for smiles in _smiles_inputs(args.smiles):
        result = profile(smiles, given)
        if "error" in result:
            status = EXIT_ENTRIES
        if args.json:
            print(json.dumps(result, ensure_ascii=False, sort_keys=False))
        else:
            _print_profile_text(result)
    return status


def _print_profile_text(result: dict) -> None:
    from builder.chem.handling import DISCLAIMER as NOTES_DISCLAIMER

    if "error" in result:
        print(f"{result['input']}: error: {result['error']}")
        return
    print(f"{result['input']}  →  {result['smiles']}  {result['formula']}  {result['inchikey']}")
    rows = [(k, v) for k, v in result.items() if isinstance(v, dict) and "value" in v]
    forces = result.get("forces", {})
    rows += [(k, v) for k, v in forces.items() if isinstance(v, dict) and "value" in v and k not in result]
    for key, val in rows:
        prov = val["provenance"]
        ref = prov.get("source") or prov.get("method")
        unc = f" ± {val['uncertainty']:.3g}" if "uncertainty" in val else ""
        print(f"  {key:<34} {val['value']:.6g}{unc} {val['unit']}  [{prov['kind']}: {ref}]")
    if forces:
        print(f"  dominant force: {forces['dominant']} (present: {', '.join(forces['present'])})")
        for reason in forces["reasons"]:
            print(f"    - {reason}")
    if "flammable_category" in result:
        basis = result.get("flammable_category_basis", {})
        print(f"  flammable category: {basis.get('text', 'not a flammable liquid (no flash point)')}")
    for note in result.get("handling_notes", []):
        print(f"  [{note['severity']}] {note['text']} ({note['id']}; {note['source']})")
    if result.get("handling_notes"):
        print(f"  {NOTES_DISCLAIMER}")
    print()


def parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="cohesion", description="Build and check the materials catalog.")
    p.add_argument("--version", action="version", version=f"cohesion {__version__}")
    sub = p.add_subparsers(dest="command", required=True, metavar="COMMAND")

    b = sub.add_parser("build", help="build the static site")
    b.add_argument("--entries", default="entries", help="folder of entry files (default: entries)")
    b.add_argument("--out", default="site", help="output folder (default: site)")
    b.set_defaults(func=cmd_build)

    c = sub.add_parser("check", help="validate entries without building")
    c.add_argument("files", nargs="*", help="entry files to check (default: the whole entries folder)")
    c.add_argument("--entries", default="entries", help="folder with sources.yaml and locations.yaml")
    c.add_argument("--strict", action="store_true", help="treat warnings as failures")
    c.set_defaults(func=cmd_check)

    pt = sub.add_parser("print", help="write the printouts (datasheets, shelf cards, store sheets) as PDF")
    pt.add_argument("--entries", default="entries", help="folder of entry files (default: entries)")
    pt.add_argument("--out", default="printouts", help="output folder for the PDFs (default: printouts)")
    pt.add_argument("--paper", default="a4,letter", help="a4, letter or a4,letter (default: both)")
    pt.set_defaults(func=cmd_print)

    df = sub.add_parser("diff", help="what a change to the entries does to the catalog (Markdown or JSON)")
    df.add_argument("base", nargs="?", help="git revision to compare from (default: merge base with main)")
    df.add_argument("head", nargs="?", help="git revision to compare to (default: the working tree)")
    df.add_argument("--entries", default="entries", help="entries folder (default: entries)")
    df.add_argument("--json", action="store_true", help="JSON instead of Markdown")
    df.set_defaults(func=cmd_diff)

    nw = sub.add_parser("new", help="start an entry file from a name and a SMILES")
    nw.add_argument("name", help="the material's name; the entry id is made from it")
    nw.add_argument("--smiles", required=True, help="the structure")
    nw.add_argument("--cas", help="CAS Registry Number (check digit validated)")
    nw.add_argument("--entries", default="entries", help="entries folder (default: entries)")
    nw.add_argument("--from-reference", action="store_true",
                    help="fill handbook values from the optional 'chemicals' package's offline data")
    nw.set_defaults(func=cmd_new)

    sc = sub.add_parser("schema", help="write entry.schema.json (JSON Schema for editors) into the entries folder")
    sc.add_argument("--entries", default="entries", help="entries folder (default: entries)")
    sc.set_defaults(func=cmd_schema)

    pr = sub.add_parser("profile", help="derive properties for SMILES strings")
    pr.add_argument("smiles", nargs="+", help="SMILES strings, files with one SMILES a line, or - for stdin")
    pr.add_argument("--json", action="store_true", help="one JSON object a line")
    pr.add_argument("--given", action="append", default=[], metavar='NAME="VALUE UNIT"',
                    help="a known value that takes precedence over estimates, e.g. boiling_point=\"34.6 °C\"")
    pr.set_defaults(func=cmd_profile)
    return p


def main(argv: list[str] | None = None) -> int:
    args = parser().parse_args(argv)
    return args.func(args)


if __name__ == "__main__":
    sys.exit(main())
