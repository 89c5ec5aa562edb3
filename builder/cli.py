"""The ``cohesion`` command: build, check and profile.

Exit codes: 0 clean, 1 errors in the entries (or a bad SMILES for ``profile``), 2 usage.
"""
from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

from . import __version__
from .diagnostics import CatalogError, Diagnostic, errors
from .entries import load_catalog

EXIT_OK, EXIT_ENTRIES, EXIT_USAGE = 0, 1, 2


def _print_diagnostics(diagnostics: list[Diagnostic], stream=None) -> None:
    stream = stream or sys.stderr
    for d in diagnostics:
        print(d, file=stream)


def cmd_build(args) -> int:
    from .site import build

    try:
        built = build(Path(args.entries), Path(args.out))
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
    from .site import derive_catalog

    files = [Path(f) for f in args.files] if args.files else None
    if files:
        missing = [f for f in files if not f.is_file()]
        if missing:
            print(f"cohesion check: no such file: {missing[0]}", file=sys.stderr)
            return EXIT_USAGE
    catalog, diagnostics = load_catalog(Path(args.entries), only=files)
    if catalog is not None:
        diagnostics = sorted(diagnostics + [f for d in derive_catalog(catalog) for f in d.findings])
    _print_diagnostics(diagnostics)
    n_err = len(errors(diagnostics))
    n_warn = len(diagnostics) - n_err
    checked = len(catalog.entries) if catalog else "the"
    print(f"cohesion check: {checked} entries, {n_err} errors, {n_warn} warnings", file=sys.stderr)
    if n_err or (args.strict and n_warn):
        return EXIT_ENTRIES
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


def cmd_profile(args) -> int:
    from .profile import profile

    status = EXIT_OK
    for smiles in _smiles_inputs(args.smiles):
        result = profile(smiles)
        if "error" in result:
            status = EXIT_ENTRIES
        if args.json:
            print(json.dumps(result, ensure_ascii=False, sort_keys=False))
        else:
            _print_profile_text(result)
    return status


def _print_profile_text(result: dict) -> None:
    if "error" in result:
        print(f"{result['input']}: error: {result['error']}")
        return
    print(f"{result['input']}  →  {result['smiles']}  {result['formula']}  {result['inchikey']}")
    for key, val in result.items():
        if isinstance(val, dict) and "value" in val:
            prov = val["provenance"]
            ref = prov.get("source") or prov.get("method")
            unc = f" ± {val['uncertainty']:.3g}" if "uncertainty" in val else ""
            print(f"  {key:<24} {val['value']:.6g}{unc} {val['unit']}  [{prov['kind']}: {ref}]")
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

    pr = sub.add_parser("profile", help="derive properties for SMILES strings")
    pr.add_argument("smiles", nargs="+", help="SMILES strings, files with one SMILES a line, or - for stdin")
    pr.add_argument("--json", action="store_true", help="one JSON object a line")
    pr.set_defaults(func=cmd_profile)
    return p


def main(argv: list[str] | None = None) -> int:
    args = parser().parse_args(argv)
    return args.func(args)


if __name__ == "__main__":
    sys.exit(main())
