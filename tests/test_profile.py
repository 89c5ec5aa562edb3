"""`cohesion profile`: one JSON object a line through the datasheet code path."""
from __future__ import annotations

import io
import json
import re

import chemicals.identifiers as chemicals_ids  # pinned test dependency: import plainly so absence fails
import pytest

from builder.cli import main
from builder.core.values import KINDS


def _lines(capsys):
    return [json.loads(line) for line in capsys.readouterr().out.splitlines() if line.strip()]


def test_profile_json_object(capsys):
    assert main(["profile", "CCO", "--json"]) == 0
    (obj,) = _lines(capsys)
    ref = chemicals_ids.search_chemical("64-17-5")  # chemicals 1.5.2 identifier database
    assert obj["input"] == "CCO" and obj["smiles"] == "CCO"
    assert obj["formula"] == ref.formula and obj["inchikey"] == ref.InChI_key
    assert obj["molar_mass"]["unit"] == "g/mol"
    assert obj["molar_mass"]["value"] == pytest.approx(ref.MW, rel=2e-4)
    assert obj["molar_mass"]["provenance"]["kind"] in KINDS


def test_bad_smiles_gets_an_error_line_and_exit_1_while_others_print(capsys):
    assert main(["profile", "CCO", "C1CC", "c1ccccc1", "--json"]) == 1
    lines = _lines(capsys)
    assert [o["input"] for o in lines] == ["CCO", "C1CC", "c1ccccc1"]
    assert "error" in lines[1] and "ring" in lines[1]["error"]
    assert lines[2]["formula"] == "C6H6"


def test_reads_smiles_from_stdin_and_files(capsys, monkeypatch, tmp_path):
    monkeypatch.setattr("sys.stdin", io.StringIO("CCO ethanol\n# comment\nCC(C)=O\n"))
    assert main(["profile", "-", "--json"]) == 0
    assert [o["formula"] for o in _lines(capsys)] == ["C2H6O", "C3H6O"]
    listing = tmp_path / "list.smi"
    listing.write_text("CCCC\n", encoding="utf-8")
    assert main(["profile", str(listing), "--json"]) == 0
    assert [o["formula"] for o in _lines(capsys)] == ["C4H10"]


def test_profile_text_is_written_for_people(capsys):
    assert main(["profile", "c1ccccc1"]) == 0
    out = capsys.readouterr().out
    lines = {line.split("  ")[1].strip(): line for line in out.splitlines() if line.startswith("  ") and
             len(line.split("  ")) > 2}
    # digits set by the uncertainty, never a raw float: benzene's moment cancels by symmetry
    from rdkit import Chem

    from builder.chem.dipole import standard_uncertainty

    u = standard_uncertainty(Chem.MolFromSmiles("c1ccccc1"))
    assert re.search(rf"0\.0+ ± {u:.2f} D", lines["Dipole moment"]) and not re.search(r"\de-\d", out)
    # temperatures in °C with K in brackets, at the precision the uncertainty allows
    assert re.search(r"Boiling point +\d+ ± \d+ °C \(\d+ K\)", out)
    # units as symbols, counts bare, methods in plain words
    assert "Å³" in lines["Polarizability"] and "Å²" in lines["Surface area"]
    assert re.search(r"Electrons per molecule +42  \[", out) and not re.search(r"\d count", out)
    assert "[estimated: boiling point from structure]" in out and "tb-joback-sb-trees" not in out
    # one capital, each category number once
    assert re.search(r"flammable category: Category \d( or \d)*( or not a flammable liquid)?"
                     r"( \(most likely (\d|not a flammable liquid)\))? —", out), out
    assert "or category" not in out


def test_profile_of_a_catalog_entry_carries_its_stated_values(capsys):
    # the demo's toluene states its boiling point from the CRC Handbook: the entry profile shows
    # that value as literature, and it matches chemicals 1.5.2 (Tb of 108-88-3) within 0.2 K
    from chemicals.phase_change import Tb

    from conftest import DEMO

    assert main(["profile", "--entry", "toluene", "--entries", str(DEMO), "--json"]) == 0
    (obj,) = _lines(capsys)
    assert obj["input"] == "toluene" and obj["name"] == "Toluene"
    assert obj["boiling_point"]["provenance"]["kind"] == "literature"
    assert obj["boiling_point"]["value"] == pytest.approx(Tb("108-88-3"), abs=0.2)
    assert obj["boiling_point_estimate"]["provenance"]["kind"] == "estimated"


def test_profile_of_an_entry_with_only_a_structure_matches_the_smiles_profile(make_entries, capsys):
    folder = make_entries({"hexane.yaml": "name: Hexane\nsmiles: CCCCCC\n"})
    assert main(["profile", "--entry", "hexane", "--entries", str(folder), "--json", "--no-cache"]) == 0
    (entry,) = _lines(capsys)
    assert main(["profile", "CCCCCC", "--json"]) == 0
    (smiles,) = _lines(capsys)
    for key in ("boiling_point", "flash_point", "vapor_pressure_20C", "hansen"):
        assert entry[key] == smiles[key], key


def test_profile_entry_refuses_unknown_ids_and_mixed_inputs(capsys):
    from conftest import DEMO

    assert main(["profile", "--entry", "tolune", "--entries", str(DEMO)]) == 2
    assert "did you mean 'toluene'" in capsys.readouterr().err
    assert main(["profile", "--entry", "toluene", "CCO", "--entries", str(DEMO)]) == 2
    assert "without SMILES" in capsys.readouterr().err
