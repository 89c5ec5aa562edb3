"""``cohesion new`` (builder/scaffold.py): the new file validates, and reference values match their source.

Reference data: chemicals 1.5.2 (CRC Handbook 95th ed. via ``chemicals.phase_change.Tb/Tm``
with method CRC_ORG, IEC 60079-20-1 (2010) via ``chemicals.safety.T_flash``, Poling et al.
via ``chemicals.vapor_pressure.Psat_data_AntoinePoling``, identifiers via
``chemicals.identifiers.search_chemical``).
"""
from __future__ import annotations

import sys

import pytest

from builder.cli import main
from builder.load.entries import load_catalog
from builder.load.schema import MODELINE
from builder.review.scaffold import slugify

CRC_ONLY = "crc-95:\n  title: CRC Handbook of Chemistry and Physics\n  kind: handbook\n"


def test_slugify():
    assert slugify("Ethyl acetate") == "ethyl-acetate"
    assert slugify("  2,2,4-Trimethylpentane ") == "2-2-4-trimethylpentane"
    assert slugify("α-Pinene (+)") == "alpha-pinene"
    assert slugify("Ångström's résine") == "angstrom-s-resine"


def test_new_then_check_passes(make_entries, capsys):
    folder = make_entries({}, sources=CRC_ONLY)
    assert main(["new", "Benzyl alcohol", "--smiles", "OCc1ccccc1", "--cas", "100-51-6",
                 "--entries", str(folder)]) == 0
    path = folder / "benzyl-alcohol.yaml"
    text = path.read_text(encoding="utf-8")
    assert text.splitlines()[0] == MODELINE
    assert "# InChIKey WVDDGKGOMKODPV-UHFFFAOYSA-N" in text  # InChIKey of benzyl alcohol (PubChem CID 244)
    capsys.readouterr()
    assert main(["check", "--entries", str(folder), str(path)]) == 0
    err = capsys.readouterr().err
    assert "0 errors" in err and "benzyl-alcohol.yaml:" not in err  # (crc-95 is not cited yet: a warning there)
    catalog, _ = load_catalog(folder)
    entry = catalog.entry("benzyl-alcohol")
    assert entry.declared_formula == "C7H8O" and entry.properties == {}
    from chemicals import (
        identifiers,  # pinned test dependency: import plainly so absence fails
    )
    ref = identifiers.search_chemical("100-51-6")
    assert entry.declared_formula == ref.formula and entry.declared_molar_mass == pytest.approx(ref.MW, abs=0.01)


def test_new_refuses_to_overwrite_and_bad_input(make_entries, capsys):
    folder = make_entries({"ethanol.yaml": "name: Ethanol\nsmiles: CCO\n"})
    before = (folder / "ethanol.yaml").read_text()
    assert main(["new", "Ethanol", "--smiles", "CCO", "--entries", str(folder)]) == 1
    assert "already exists" in capsys.readouterr().err and (folder / "ethanol.yaml").read_text() == before
    assert main(["new", "Toluene", "--smiles", "Cc1ccccc1", "--cas", "108-88-4", "--entries", str(folder)]) == 1
    assert "fails its check digit (expected 3, got 4)" in capsys.readouterr().err
    assert main(["new", "Toluene", "--smiles", "Cc1ccccc", "--entries", str(folder)]) == 1
    assert "does not parse" in capsys.readouterr().err
    assert not (folder / "toluene.yaml").exists()


def test_from_reference_without_chemicals_exits_2(make_entries, capsys, monkeypatch):
    folder = make_entries({})
    monkeypatch.setitem(sys.modules, "chemicals", None)  # import chemicals → ImportError
    assert main(["new", "Ethanol", "--smiles", "CCO", "--cas", "64-17-5", "--entries", str(folder),
                 "--from-reference"]) == 2
    assert "needs the optional package 'chemicals'" in capsys.readouterr().err
    assert not (folder / "ethanol.yaml").exists()


def test_from_reference_fills_handbook_values_that_check_cleanly(make_entries, capsys):
    from chemicals import (
        phase_change,  # pinned test dependency: import plainly so absence fails
    )
    from chemicals.safety import T_flash
    from chemicals.vapor_pressure import Psat_data_AntoinePoling

    folder = make_entries({}, sources=CRC_ONLY)
    assert main(["new", "Ethanol", "--smiles", "CCO", "--cas", "64-17-5", "--entries", str(folder),
                 "--from-reference"]) == 0
    out = capsys.readouterr().out
    assert "iec-60079-20-1, poling-2001" in out  # appended; crc-95 reused
    assert main(["check", "--entries", str(folder), "--strict"]) == 0, capsys.readouterr().err
    catalog, _ = load_catalog(folder)
    e = catalog.entry("ethanol")
    assert e.properties["boiling_point"].value == pytest.approx(phase_change.Tb("64-17-5", method="CRC_ORG"))
    assert e.properties["melting_point"].value == pytest.approx(phase_change.Tm("64-17-5", method="CRC_ORG"))
    assert e.properties["flash_point"].value == pytest.approx(T_flash("64-17-5", method="IEC 60079-20-1 (2010)"))
    assert e.properties["flash_point"].provenance.source == "iec-60079-20-1"
    assert "chemicals 1.5" in e.properties["boiling_point"].provenance.note
    row = Psat_data_AntoinePoling.loc["64-17-5"]
    assert (e.antoine.A, e.antoine.B, e.antoine.C) == (row.A, row.B, row.C)
    assert e.antoine.source == "poling-2001" and catalog.sources["poling-2001"].kind == "handbook"
    # a second material reuses the appended sources instead of adding them again
    assert main(["new", "Methanol", "--smiles", "CO", "--cas", "67-56-1", "--entries", str(folder),
                 "--from-reference"]) == 0
    assert "added to" not in capsys.readouterr().out
    assert (folder / "sources.yaml").read_text().count("poling-2001:") == 1
