"""Hardening: valid entries never crash the build, per-molecule work is bounded in time, a batch
profile survives bad lines and an ASCII-only terminal, and entry text is safe on every page,
chart and export."""
from __future__ import annotations

import csv
import dataclasses
import io
import json
import os
import re
import subprocess
import sys
import time
from pathlib import Path

import pytest
from conftest import DEMO, ETHANOL, ROOT
from markupsafe import Markup

from builder.chem.forces import force_profile
from builder.chem.identity import MAX_HEAVY_ATOMS, parse_smiles
from builder.chem.structure3d import (
    FULL_ENSEMBLE_ATOMS,
    MAX_3D_ATOMS,
    MAX_3D_ATOMS_VARIABLE,
    MAX_CONFORMERS,
    TOO_LARGE,
    _budget,
    conformer_ensemble,
    max_3d_atoms,
)
from builder.cli import main
from builder.derive.catalog import derive_catalog
from builder.derive.profile import profile
from builder.load.entries import load_catalog
from builder.pipeline import build
from builder.publish.site import render_site
from builder.publish.templating import environment, relative, visible_output
from builder.publish.textsafe import (
    BIDI_CONTROLS,
    MAX_NAME_BYTES,
    csv_text_cell,
    short_path,
    visible,
)

ENV = {**os.environ, "PYTHONPATH": str(ROOT)}


def _run(args, stdin: str = "", env=None, timeout=120) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "builder", *args], input=stdin.encode("utf-8"),
                          capture_output=True, cwd=ROOT, env=env or ENV, timeout=timeout, check=False)


def _site_files(site: Path) -> list[Path]:
    return [p for p in site.rglob("*") if p.is_file()]


# -- 1. check passes, so build must not crash -------------------------------------------------

MIXTURE = """\
name: Thinner blend
type: mixture
catalog:
  locations: [store-a]
properties:
  boiling_point: {value: 60 °C, source: crc-95}
"""
HYDROGEN = """\
name: Hydrogen
smiles: '[H][H]'
properties:
  boiling_point: {value: -252.9 °C, source: crc-95}
"""
MATH_NAME = r"""name: 'Bad $\foo{$ math $x^2$ and a lone $'
smiles: CCCCC
properties:
  boiling_point: {value: 36.1 °C, source: crc-95}
"""


@pytest.mark.parametrize("files", [
    {"blend.yaml": MIXTURE, "ethanol.yaml": ETHANOL},
    {"hydrogen.yaml": HYDROGEN},
    {"pentane.yaml": MATH_NAME, "ethanol.yaml": ETHANOL},
], ids=["mixture-without-smiles", "hydrogen-alone", "math-markup-in-name"])
def test_valid_entries_that_check_accepts_also_build(make_entries, tmp_path, files):
    entries = make_entries(files)
    assert main(["check", "--entries", str(entries)]) == 0
    built = build(entries, tmp_path / "site")
    assert len(built.derived) == len(files)
    assert (tmp_path / "site" / "trends.html").is_file()


def test_math_markup_in_a_name_is_drawn_as_plain_text(make_entries, tmp_path):
    entries = make_entries({"pentane.yaml": MATH_NAME})
    build(entries, tmp_path / "site")
    page = (tmp_path / "site" / "materials" / "pentane.html").read_text(encoding="utf-8")
    assert "Bad $\\foo{$ math $x^2$" in page


def test_an_overlong_id_never_makes_an_overlong_file_name(make_entries, tmp_path):
    """The loader limits ids; publishing must cope with any id on its own."""
    entries = make_entries({"ethanol.yaml": ETHANOL})
    catalog, _ = load_catalog(entries)
    long_id = "ethanol-" + "x" * 300
    catalog = dataclasses.replace(catalog, entries=tuple(dataclasses.replace(e, id=long_id)
                                                         for e in catalog.entries))
    out = tmp_path / "site"
    out.mkdir()
    written = render_site(catalog, derive_catalog(catalog), out)
    for path in _site_files(out):
        assert all(len(part.encode("utf-8")) <= MAX_NAME_BYTES for part in path.relative_to(out).parts), path
    assert all(short_path(w) == w for w in written)
    index = (out / "index.html").read_text(encoding="utf-8")
    links = re.findall(r'href="(materials/[^"#]+)"', index)
    assert links and all((out / link).is_file() for link in links)
    page = next((out / "materials").glob("ethanol-x*.html"))
    for src in re.findall(r'src="([^"]+)"', page.read_text(encoding="utf-8")):
        assert (page.parent / src).is_file(), src
    search = (out / "search-index.js").read_text(encoding="utf-8")
    assert long_id not in search.split('"url"')[1]


def test_short_path_keeps_short_names_and_separates_long_ones():
    assert short_path("materials/ethanol.html") == "materials/ethanol.html"
    a, b = short_path("materials/" + "a" * 200 + ".html"), short_path("materials/" + "a" * 201 + ".html")
    assert a != b and a.endswith(".html") and len(a.split("/")[1]) <= MAX_NAME_BYTES
    assert short_path(a) == a
    assert relative("index.html", "materials/" + "a" * 200 + ".html#x") == a + "#x"


# -- 2. time limits ----------------------------------------------------------------------------

def test_3d_limit_defaults_and_reads_the_environment(monkeypatch):
    monkeypatch.delenv(MAX_3D_ATOMS_VARIABLE, raising=False)
    assert max_3d_atoms() == MAX_3D_ATOMS
    monkeypatch.setenv(MAX_3D_ATOMS_VARIABLE, "12")
    assert max_3d_atoms() == 12
    for bad in ("", "many", "-3", "1.5"):
        monkeypatch.setenv(MAX_3D_ATOMS_VARIABLE, bad)
        assert max_3d_atoms() == MAX_3D_ATOMS


def test_every_demo_entry_is_under_the_default_3d_limit():
    catalog, _ = load_catalog(DEMO)
    heavy = [parse_smiles(e.smiles)[0].GetNumHeavyAtoms() for e in catalog.entries if e.smiles]
    assert heavy and max(heavy) <= FULL_ENSEMBLE_ATOMS < MAX_3D_ATOMS


def test_large_ensembles_shrink_with_size():
    assert _budget(FULL_ENSEMBLE_ATOMS) == (MAX_CONFORMERS, 500)
    assert _budget(FULL_ENSEMBLE_ATOMS + 10)[0] < MAX_CONFORMERS
    most, iters = _budget(MAX_3D_ATOMS)
    assert most == 1 and iters == 200


def test_too_large_molecule_gets_no_3d_and_says_why(monkeypatch):
    monkeypatch.setenv(MAX_3D_ATOMS_VARIABLE, "5")
    start = time.perf_counter()
    ensemble = conformer_ensemble("CCCCCCCCO")
    assert not ensemble.ok and ensemble.status.startswith(TOO_LARGE)
    fp = force_profile("CCCCCCCCO")
    assert fp.dipole_D is None and fp.npr1 is None and fp.shape is None
    assert set(fp.not_computed) == {"dipole_D", "npr1", "npr2"}
    assert any(TOO_LARGE in n for n in fp.notes)
    from builder.derive.forces import force_reasons
    assert any("not computed" in r and "dipole–dipole" in r for r in force_reasons(fp))
    assert "hydrogen-bonding" in fp.present  # what does not need 3D is still classified
    result = profile("CCCCCCCCO")
    assert set(result["forces"]["not_computed"]) == {"dipole_moment", "shape_npr1", "shape_npr2"}
    assert any(TOO_LARGE in n for n in result["forces"]["notes"])
    assert "boiling_point" in result and "flash_point" in result  # estimates not needing 3D stay
    assert time.perf_counter() - start < 5


def test_too_large_is_shown_on_the_page_and_in_profile_text(make_entries, tmp_path, monkeypatch, capsys):
    monkeypatch.setenv(MAX_3D_ATOMS_VARIABLE, "3")
    entries = make_entries({"ethanol.yaml": ETHANOL, "octanol.yaml": ETHANOL.replace("Ethanol", "Octanol").replace(
        "64-17-5", "111-87-5").replace("smiles: CCO", "smiles: CCCCCCCCO").replace("78.3", "195")})
    build(entries, tmp_path / "site")
    page = (tmp_path / "site" / "materials" / "octanol.html").read_text(encoding="utf-8")
    assert re.search(r"Dipole moment</th><td><span class=\"none\">not computed</span></td><td class=\"note-cell\">not computed: too large", page)
    assert main(["profile", "CCCCCCCCO"]) == 0
    out = capsys.readouterr().out
    assert "dipole_moment" in out and TOO_LARGE in out


def test_huge_structures_are_refused_with_a_reason():
    mol, reason = parse_smiles("C" * (MAX_HEAVY_ATOMS + 1))
    assert mol is None and f"at most {MAX_HEAVY_ATOMS}" in reason
    mol, reason = parse_smiles("Q" * 50_000)
    assert mol is None and "characters" in reason


@pytest.mark.parametrize("smiles", [
    "C" * 1000,
    "".join(["C1CCC(CC1)C(C(C)C)N"] * 18) + "C",  # 199 heavy atoms, rings, branches, stereocentres
    "C" * MAX_3D_ATOMS,  # the largest chain still embedded
], ids=["chain-1000", "branched-cyclic-199", "chain-at-3d-limit"])
@pytest.mark.slow
def test_profile_of_a_large_structure_finishes_quickly(smiles):
    start = time.perf_counter()
    result = _run(["profile", smiles, "--json"], timeout=60)
    elapsed = time.perf_counter() - start
    assert result.returncode == 0, result.stderr.decode()
    assert json.loads(result.stdout)["formula"].startswith("C")
    assert elapsed < 20, f"{elapsed:.1f} s"


# -- 3. a batch survives bad lines --------------------------------------------------------------

BATCH_SPECIAL = ["", "   ", "\t", "*", "**", "C*", "[H][H]", "not-a-smiles", "C1CC", "((((", "[Xx]", "C" * 150,
                 "C" * (MAX_HEAVY_ATOMS + 5), "Q" * 40_000, "CC\x1b[31mO", "ÄÖÜ→", "  CCO   ethanol  ",
                 "# a comment", "[Na+].[Cl-]", "c1ccccc1", "[U]", "C" * 3000]
BATCH_SMALL = ["CCO", "CCCC", "CC(=O)C", "c1ccccc1C", "ClCCl", "CCOCC", "O", "CCN(CC)CC", "OCCO", "CC(C)O"]


@pytest.mark.slow
def test_profile_batch_of_2000_lines_reports_bad_lines_and_goes_on():
    """About 8 s on one core (the small molecules repeat, so their 3D work is cached)."""
    lines = [BATCH_SMALL[i % len(BATCH_SMALL)] if i % 10 else BATCH_SPECIAL[(i // 10) % len(BATCH_SPECIAL)]
             for i in range(2000)]
    expected = [ln.split()[0] for ln in lines if ln.strip() and not ln.lstrip().startswith("#")]
    start = time.perf_counter()
    result = _run(["profile", "-", "--json"], stdin="\n".join(lines) + "\n", timeout=60)
    elapsed = time.perf_counter() - start
    stderr = result.stderr.decode("utf-8", "replace")
    assert "Traceback" not in stderr
    assert result.returncode == 1  # some lines failed
    rows = [json.loads(line) for line in result.stdout.decode("utf-8").splitlines()]
    assert [r["input"] for r in rows] == expected
    errors = [r for r in rows if "error" in r]
    assert errors and all(set(r) == {"input", "error"} for r in errors)
    assert any("heavy atoms" in r["error"] for r in errors)
    assert sum("smiles" in r for r in rows) > 1500
    assert elapsed < 60, f"{elapsed:.1f} s"


def test_profile_text_reports_a_bad_line_and_continues(capsys, monkeypatch):
    monkeypatch.setattr("sys.stdin", io.StringIO("CCO\nC1CC\n\n" + "Q" * 30_000 + "\nCCC\n"))
    assert main(["profile", "-"]) == 1
    out = capsys.readouterr().out
    assert "C1CC: error: SMILES does not parse" in out
    assert re.search(r"^Q{80}… \(30000 characters\): error: ", out, re.MULTILINE)
    assert out.count("  →  ") == 2  # CCO and CCC both profiled


def test_an_unexpected_failure_becomes_an_error_row(capsys, monkeypatch):
    def explode(smiles, given=None):
        if smiles == "CCC":
            raise RuntimeError("boom\nsecond line")
        return {"input": smiles, "error": "x"} if smiles == "bad" else profile(smiles, given)

    monkeypatch.setattr("builder.derive.profile.profile", explode)
    assert main(["profile", "CCC", "CO", "--json"]) == 1
    rows = [json.loads(line) for line in capsys.readouterr().out.splitlines()]
    assert rows[0] == {"input": "CCC", "error": "could not derive properties: RuntimeError: boom"}
    assert rows[1]["formula"] == "CH4O"


# -- 4. ASCII-only terminals ----------------------------------------------------------------------

@pytest.mark.parametrize("env", [{"PYTHONIOENCODING": "ascii"},
                                 {"LC_ALL": "C", "LANG": "C", "PYTHONUTF8": "0", "PYTHONCOERCECLOCALE": "0"}],
                         ids=["pythonioencoding-ascii", "c-locale"])
def test_profile_text_survives_an_ascii_only_locale(env):
    base = {k: v for k, v in ENV.items() if k not in ("LC_ALL", "LANG", "PYTHONIOENCODING", "PYTHONUTF8")}
    result = _run(["profile", "CCO", "C1CC", "-"], stdin="CCOCC\nÄ\n", env={**base, **env})
    stderr = result.stderr.decode("ascii", "replace")
    assert "Traceback" not in stderr and "UnicodeEncodeError" not in stderr
    assert result.returncode == 1  # C1CC and Ä do not parse; the rest printed
    out = result.stdout.decode("ascii")
    assert "CCO" in out and "CCOCC" in out and "C1CC: error" in out


# -- 5. entry text is safe everywhere ---------------------------------------------------------------

TRICKY = """\
name: "=HYPERLINK(\\"http://x\\") \\u202eevil\\u2066 name"
synonyms: ["+cmd", "@sum(1)", "\\u200fmark"]
cas: 109-66-0
smiles: CCCCC
notes: "A note \\u202e with a reversal and -1 text."
catalog:
  code: "-HM-1"
  container: "\\tTabbed"
  owner: "\\u061cOwner"
  locations: [store-a]
properties:
  boiling_point: {value: 36.1 °C, source: crc-95}
  flash_point: {value: -49 °C, source: crc-95}
"""


def test_csv_text_cells_cannot_become_formulas_but_numbers_stay_numbers(make_entries, tmp_path):
    entries = make_entries({"pentane.yaml": TRICKY, "ethanol.yaml": ETHANOL})
    build(entries, tmp_path / "site")
    rows = list(csv.DictReader((tmp_path / "site" / "catalog.csv").open(encoding="utf-8")))
    pentane = next(r for r in rows if r["id"] == "pentane")
    assert pentane["name"].startswith("'=HYPERLINK")
    assert pentane["code"] == "'-HM-1"
    assert pentane["flash_point_degC"] == "-49.0"  # a number column keeps its minus sign
    assert float(pentane["flash_point_degC"]) == -49.0
    for row in rows:
        for key, cell in row.items():
            assert not cell.startswith(("=", "+", "@", "\t", "\r")), (key, cell)
            if cell.startswith("-"):
                float(cell)  # only numbers may start with a minus


def test_bidi_controls_never_reach_pages_charts_or_exports_raw(make_entries, tmp_path):
    entries = make_entries({"pentane.yaml": TRICKY, "ethanol.yaml": ETHANOL})
    build(entries, tmp_path / "site")
    site = tmp_path / "site"
    for path in _site_files(site):
        text = path.read_text(encoding="utf-8")
        assert not any(ch in text for ch in BIDI_CONTROLS), path
        # nor as JSON escapes, which a reader of the exports would decode back into the raw character
        assert not re.search(r"\\u(202[a-e]|206[6-9]|200[ef]|061c)", text, re.IGNORECASE), path
    page = (site / "materials" / "pentane.html").read_text(encoding="utf-8")
    assert "[U+202E]evil[U+2066]" in page and "[U+200F]mark" in page and "[U+061C]Owner" in page
    assert "[U+202E] with a reversal" in page
    assert "[U+202E]evil" in (site / "search-index.js").read_text(encoding="utf-8")
    assert "[U+202E]evil" in (site / "catalog.csv").read_text(encoding="utf-8")


def test_visible_marks_every_bidi_control_and_keeps_markup_safe():
    assert visible("plain text") == "plain text"
    assert visible("a\u202eb\u2069c\u200ed") == "a[U+202E]b[U+2069]c[U+200E]d"
    assert all(f"[U+{ord(ch):04X}]" == visible(ch) for ch in BIDI_CONTROLS)
    shown = visible_output(Markup("<b>x\u202e</b>"))
    assert isinstance(shown, Markup) and str(shown) == "<b>x[U+202E]</b>"
    assert visible_output(3) == 3
    env = environment()
    assert env.from_string("{{ name }}").render(name="<\u202e>") == "&lt;[U+202E]&gt;"


def test_csv_text_cell_rule():
    for start in ("=", "+", "-", "@", "\t", "\r"):
        assert csv_text_cell(start + "x") == "'" + start + "x"
    assert csv_text_cell("Toluene") == "Toluene"
    assert csv_text_cell("\u202e=x") == "[U+202E]=x"


def test_the_3d_limit_applies_to_a_molecule_already_asked_about(monkeypatch):
    # the ensembles and canonical SMILES are kept per process: the limit in force still decides
    monkeypatch.delenv(MAX_3D_ATOMS_VARIABLE, raising=False)
    assert conformer_ensemble("CCCCCCCCCO").ok
    monkeypatch.setenv(MAX_3D_ATOMS_VARIABLE, "5")
    assert conformer_ensemble("CCCCCCCCCO").status.startswith(TOO_LARGE)
    monkeypatch.delenv(MAX_3D_ATOMS_VARIABLE)
    assert conformer_ensemble("OCCCCCCCCC").ok
