"""Identity from structure, checked against the identifier database of the `chemicals` package
(chemicals 1.5.2, `chemicals.identifiers.search_chemical`: molecular weight, formula, InChIKey
as compiled from PubChem)."""
from __future__ import annotations

import pytest
from chemicals import (
    identifiers,  # pinned test dependency: import plainly so absence fails
)

from builder.chem.identity import depict_svg, identify, parse_smiles
from builder.load.cas import cas_problem

CAS_NUMBERS = [
    "64-17-5", "67-56-1", "71-23-8", "71-36-3", "67-63-0", "67-64-1", "78-93-3", "108-88-3", "106-42-3",
    "110-54-3", "142-82-5", "111-65-9", "110-82-7", "141-78-6", "60-29-7", "75-09-2", "64-19-7", "121-44-8",
    "80-62-6", "109-99-9", "156-60-5", "156-59-2", "7732-18-5", "56-23-5", "71-43-2", "124-38-9", "58-08-2",
    "50-00-0", "7647-14-5", "100-41-4",
]


def _hill(formula: str) -> str:
    return formula.replace(" ", "")


@pytest.mark.parametrize("cas", CAS_NUMBERS)
def test_identity_matches_reference_database(cas):
    ref = identifiers.search_chemical(cas)
    ident = identify(ref.smiles)
    assert ident.molar_mass == pytest.approx(ref.MW, rel=2e-4)
    assert _hill(ident.formula) == _hill(ref.formula)
    assert ident.inchikey == ref.InChI_key


@pytest.mark.parametrize("cas", CAS_NUMBERS)
def test_reference_cas_numbers_pass_the_check_digit(cas):
    assert cas_problem(cas) is None


@pytest.mark.parametrize("cas", ["64-17-6", "108-88-4", "7732-18-0"])
def test_corrupted_check_digit_is_refused(cas):
    assert "check digit" in cas_problem(cas)


def test_electron_count_counts_hydrogens_and_charge():
    # common practice: ethanol has 2×6 + 6×1 + 8 = 26 electrons; Na+ and Cl- have 10 and 18
    assert identify("CCO").electron_count == 26
    assert identify("[Na+].[Cl-]").electron_count == 28


def test_bad_smiles_reason_comes_from_rdkit():
    mol, reason = parse_smiles("C(C)(C)(C)(C)C")
    assert mol is None and "valence" in reason.lower()


def test_depiction_is_deterministic_svg():
    first = depict_svg.__wrapped__("Cc1ccccc1")
    second = depict_svg.__wrapped__("Cc1ccccc1")
    assert first == second and first.lstrip().startswith("<?xml") and "<svg" in first


def test_structure_drawings_are_black():
    # shelf cards and sheets print in black: no atom colour (O red, N blue, Cl green) in the drawing
    import re

    svg = depict_svg.__wrapped__("OCC(Cl)N")
    colours = {c.upper() for c in re.findall(r"#[0-9A-Fa-f]{6}\b", svg)}
    assert colours <= {"#000000", "#FFFFFF"}, colours
