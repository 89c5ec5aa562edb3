"""Identity from structure with RDKit: canonical SMILES, formula, molar mass, InChI, depiction.

Everything here is exact from the structure (provenance ``computed``).  Molar masses
use RDKit's average atomic weights (IUPAC standard atomic weights as tabulated by
RDKit's periodic table).

Contents: ``parse_smiles`` (a molecule or RDKit's reason for refusing it),
``identify`` (the ``Identity`` of a SMILES, cached), ``depict_svg``.
"""
from __future__ import annotations

import logging
import re
from collections import Counter
from dataclasses import dataclass
from functools import lru_cache

from rdkit import Chem, rdBase
from rdkit.Chem import rdMolDescriptors

from builder.chem.molar_mass import molar_mass
from builder.chem.shape import electron_count

rdBase.LogToPythonLogger()
_RDKIT_LOG = logging.getLogger("rdkit")
_RDKIT_LOG.propagate = False
# RDKit's complaints are reported through our diagnostics, not printed to stderr.
_RDKIT_LOG.handlers.clear()
_RDKIT_LOG.addHandler(logging.NullHandler())
_STAMP = re.compile(r"^\[\d\d:\d\d:\d\d\]\s*")


class _Capture(logging.Handler):
    def __init__(self):
        super().__init__(logging.DEBUG)
        self.lines: list[str] = []

    def emit(self, record):
        for line in record.getMessage().splitlines():
            line = _STAMP.sub("", line).strip()
            if line:
                self.lines.append(line)


def _syntax_reason(smiles: str) -> str:
    """RDKit's own words for a SMILES it cannot read (its error log, switched on for the call)."""
    was_enabled = "rdApp.error:enabled" in rdBase.LogStatus()
    rdBase.EnableLog("rdApp.error")
    capture = _Capture()
    _RDKIT_LOG.addHandler(capture)
    try:
        Chem.MolFromSmiles(smiles, sanitize=False)
    finally:
        _RDKIT_LOG.removeHandler(capture)
        if not was_enabled:
            rdBase.DisableLog("rdApp.error")
    reason = capture.lines[0] if capture.lines else "not a valid SMILES string"
    return reason.replace("SMILES Parse Error: ", "")


#: longest SMILES read at all (characters): longer text is refused before RDKit sees it
MAX_SMILES_LENGTH = 20_000
#: largest structure the catalog derives anything for (heavy atoms); drawing and the
#: boiling-point descriptors grow faster than linearly, so beyond this nothing is bounded
MAX_HEAVY_ATOMS = 1000


def parse_smiles(smiles: str):
    """Return ``(mol, None)`` or ``(None, reason)`` with RDKit's own first complaint.

    Structures above :data:`MAX_HEAVY_ATOMS` heavy atoms (or SMILES longer than
    :data:`MAX_SMILES_LENGTH` characters) are refused with a reason saying so.
    """
    if len(smiles) > MAX_SMILES_LENGTH:
        return None, (f"the SMILES is {len(smiles)} characters long; "
                      f"at most {MAX_SMILES_LENGTH} are read")
    with rdBase.BlockLogs():
        raw = Chem.MolFromSmiles(smiles, sanitize=False)
    if raw is None:
        return None, _syntax_reason(smiles)
    if raw.GetNumAtoms() == 0:
        return None, "the SMILES holds no atoms"
    heavy = sum(1 for atom in raw.GetAtoms() if atom.GetAtomicNum() != 1)
    if heavy > MAX_HEAVY_ATOMS:
        return None, (f"the structure has {heavy} heavy atoms; properties are derived "
                      f"for at most {MAX_HEAVY_ATOMS}")
    problems = Chem.DetectChemistryProblems(raw)
    if problems:
        return None, problems[0].Message()
    with rdBase.BlockLogs():
        mol = Chem.MolFromSmiles(smiles)
    if mol is None:
        return None, "RDKit could not sanitize the structure"
    return mol, None


@dataclass(frozen=True)
class Identity:
    """What the structure alone fixes."""

    smiles: str
    formula: str
    molar_mass: float  # g/mol
    inchi: str
    inchikey: str
    electron_count: int
    heavy_atoms: int
    charge: int
    fragments: int
    elements: tuple[str, ...]


@lru_cache(maxsize=4096)
def identify(smiles: str) -> Identity:
    """Identity of ``smiles``; raises ``ValueError`` with RDKit's reason when it does not parse.

    Ethanol: formula C2H6O and molar mass 46.068 g/mol (CRC Handbook, as shipped
    in ``chemicals`` 1.5.2); 26 electrons (6 + 6 + 8 + 6 x 1):

    >>> ethanol = identify("OCC")
    >>> ethanol.formula, ethanol.electron_count, ethanol.smiles
    ('C2H6O', 26, 'CCO')
    >>> abs(ethanol.molar_mass - 46.068) < 0.01
    True
    """
    mol, reason = parse_smiles(smiles)
    if mol is None:
        raise ValueError(reason)
    molh = Chem.AddHs(mol)
    return Identity(
        smiles=Chem.MolToSmiles(mol),
        formula=rdMolDescriptors.CalcMolFormula(mol),
        molar_mass=molar_mass(mol),
        inchi=Chem.MolToInchi(mol),
        inchikey=Chem.MolToInchiKey(mol),
        electron_count=electron_count(mol),
        heavy_atoms=mol.GetNumHeavyAtoms(),
        charge=Chem.GetFormalCharge(mol),
        fragments=len(Chem.GetMolFrags(mol)),
        elements=tuple(sorted({a.GetSymbol() for a in molh.GetAtoms()})),
    )


_FORMULA_ELEMENT = re.compile(r"([A-Z][a-z]?)(\d*)")
_FORMULA_CHARGE = re.compile(r"([+-])(\d*)$")


def formula_counts(formula: str) -> tuple[Counter, int]:
    """Element counts and net charge of a formula such as ``C2H6O`` or ``C2H3O2-``.

    >>> counts, charge = formula_counts("C2H3O2-")  # acetate anion
    >>> sorted(counts.items()), charge
    ([('C', 2), ('H', 3), ('O', 2)], -1)
    """
    charge = 0
    match = _FORMULA_CHARGE.search(formula)
    if match:
        charge = int(match[2] or 1) * (1 if match[1] == "+" else -1)
        formula = formula[:match.start()]
    counts: Counter = Counter()
    for element, n in _FORMULA_ELEMENT.findall(formula):
        counts[element] += int(n or 1)
    return counts, charge



#: fill of atoms and bonds a hazard alert matched (a light amber that stays visible in greyscale print)
HIGHLIGHT_COLOUR = (1.0, 0.78, 0.35)


@lru_cache(maxsize=1024)
def depict_svg(smiles: str, size: int = 260, highlight: tuple[int, ...] = ()) -> str:
    """A deterministic SVG drawing (same SMILES, highlight and RDKit version, same bytes).

    ``highlight``: atom indices of ``smiles`` as parsed (the alerts' ``atoms``) to shade, with the
    bonds between them."""
    from rdkit.Chem.Draw import rdMolDraw2D  # here: the drawing package takes 0.1 s to import

    mol, reason = parse_smiles(smiles)
    if mol is None:
        raise ValueError(reason)
    drawer = rdMolDraw2D.MolDraw2DSVG(size, size)
    options = drawer.drawOptions()
    options.clearBackground = False
    options.addStereoAnnotation = True
    options.fixedBondLength = 28
    options.bondLineWidth = 1.5
    options.useBWAtomPalette()  # atoms in black, told apart by their letters: cards and sheets print in black
    atoms = sorted({i for i in highlight if 0 <= i < mol.GetNumAtoms()})
    if atoms:
        marked = set(atoms)
        bonds = sorted(b.GetIdx() for b in mol.GetBonds()
                       if b.GetBeginAtomIdx() in marked and b.GetEndAtomIdx() in marked)
        rdMolDraw2D.PrepareAndDrawMolecule(
            drawer, mol, highlightAtoms=atoms, highlightBonds=bonds,
            highlightAtomColors={i: HIGHLIGHT_COLOUR for i in atoms},
            highlightBondColors={i: HIGHLIGHT_COLOUR for i in bonds})
    else:
        rdMolDraw2D.PrepareAndDrawMolecule(drawer, mol)
    drawer.FinishDrawing()
    return drawer.GetDrawingText()
