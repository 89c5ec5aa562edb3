"""Joback & Reid (1987) first-order groups and their normal-boiling-point sum.

Contents
--------
- ``JOBACK_TB``: the 41 first-order groups, their Tb increments [K] and the
  SMARTS that assigns heavy atoms to each group.
- ``joback_groups(mol)``: split a molecule into groups; every heavy atom goes
  to exactly one group, atoms that fit no group are reported, never guessed.
- ``joback_tb(counts)``: Tb = 198.2 K + sum of increments.
- ``joback(mol_or_smiles)``: both steps, returning a ``JobackResult``.

Group assignment
----------------
Groups are tried in a fixed order (multi-atom groups such as -COOH, -COO-,
O=CH-, >C=O, -CN and -NO2 first, then single atoms).  In each SMARTS the
atoms that belong to the group carry an atom-map number; unmapped atoms are
context only.  A match is accepted only if none of its group atoms has been
assigned already, so each heavy atom ends up in one group at most.

Choices where the original table is silent (documented, not guessed):

- aromatic carbons use the ring groups =CH- (ring) and =C< (ring);
- lactones use -COO- and cyclic anhydrides -COO- plus >C=O (ring);
- formate esters use -COO- (the hydrogen is not counted);
- a tertiary nitrogen inside a ring has no group (Joback lists >N- only
  outside rings) and is reported as unassigned;
- a carbon double-bonded to oxygen is only ever part of a carbonyl group,
  so formaldehyde and formamides have no group for their carbon;
- methane and atoms other than C, H, N, O, S and halogens, or
  in valence states the table lacks (sulfoxides, phosphates...), are reported
  as unassigned.

References
----------
.. [1] Joback, K. G.; Reid, R. C. "Estimation of Pure-Component Properties
   from Group-Contributions." Chem. Eng. Commun. 1987, 57, 233-243.
   doi:10.1080/00986448708960487.
.. [2] Poling, B. E.; Prausnitz, J. M.; O'Connell, J. P. The Properties of
   Gases and Liquids, 5th ed.; McGraw-Hill, 2001; Table C-1.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import lru_cache

from rdkit import Chem

TB_BASE = 198.2
"""Constant of the Joback Tb sum [K]."""

# (group name, Tb increment [K], SMARTS with mapped group atoms), in the
# order the groups are tried.
JOBACK_TB: tuple[tuple[str, float, str], ...] = (
    ("-COOH", 169.09, "[#6X3:1](=[OX1:2])[#8X2H1:3]"),
    ("-COO-", 81.10, "[#6X3:1](=[OX1:2])[#8X2H0:3]"),
    ("O=CH-", 72.24, "[#6X3H1;!R:1](=[OX1:2])[#6]"),
    (">C=O (ring)", 94.97, "[#6X3;R:1]=[OX1:2]"),
    (">C=O (nonring)", 76.75, "[#6X3H0;!R:1]=[OX1:2]"),
    ("-CN", 125.66, "[#6X2:1]#[#7X1:2]"),
    ("-NO2", 152.54, "[#7X3:1](~[OX1:2])~[OX1:3]"),
    ("-CH3", 23.58, "[CX4H3:1]"),
    ("-CH2-", 22.88, "[CX4H2;!R:1]"),
    (">CH-", 21.74, "[CX4H1;!R:1]"),
    (">C<", 18.25, "[CX4H0;!R:1]"),
    ("=CH2", 18.18, "[CX3H2:1]=[!#8]"),
    ("=CH-", 24.96, "[CX3H1;!R:1]=[!#8]"),
    ("=C<", 24.14, "[CX3H0;!R:1]=[!#8]"),
    ("=C=", 26.15, "[#6X2H0:1](=*)=*"),
    ("#CH", 9.20, "[#6X2H1:1]#*"),
    ("#C-", 27.38, "[#6X2H0:1]#*"),
    ("-CH2- (ring)", 27.15, "[CX4H2;R:1]"),
    (">CH- (ring)", 21.78, "[CX4H1;R:1]"),
    (">C< (ring)", 21.32, "[CX4H0;R:1]"),
    ("=CH- (ring)", 26.73, "[#6X3H1;R:1]"),
    ("=C< (ring)", 31.01, "[#6X3H0;R:1]"),
    ("-F", -0.03, "[F:1]"),
    ("-Cl", 38.13, "[Cl:1]"),
    ("-Br", 66.86, "[Br:1]"),
    ("-I", 93.84, "[I:1]"),
    ("-OH (phenol)", 76.34, "[OX2H1:1]-a"),
    ("-OH (alcohol)", 92.88, "[OX2H1:1]-[!a]"),
    ("-O- (nonring)", 22.42, "[OX2H0;!R:1]"),
    ("-O- (ring)", 31.22, "[#8X2H0;R:1]"),
    ("=O (other)", -10.50, "[OX1:1]"),
    ("-NH2", 73.23, "[NX3H2:1]"),
    (">NH (nonring)", 50.17, "[NX3H1;!R:1]"),
    (">NH (ring)", 52.82, "[#7X3H1;R:1]"),
    (">N- (nonring)", 11.74, "[#7X3H0;!R:1]"),
    ("-N= (nonring)", 74.60, "[#7X2H0;!R:1]"),
    ("-N= (ring)", 57.55, "[#7X2H0;R:1]"),
    ("=NH", 83.08, "[#7X2H1:1]"),
    ("-SH", 63.56, "[SX2H1:1]"),
    ("-S- (nonring)", 68.78, "[#16X2H0;!R:1]"),
    ("-S- (ring)", 52.10, "[#16X2H0;R:1]"),
)
"""Joback Tb groups: (name, increment [K], SMARTS), in assignment order [1]_."""

TB_INCREMENT: dict[str, float] = {name: tb for name, tb, _ in JOBACK_TB}
"""Tb increment [K] by group name."""

STATUS_OK = "OK"


@dataclass(frozen=True)
class JobackResult:
    """Outcome of a Joback Tb estimate.

    ``tb_K`` is None unless every heavy atom was assigned to a group;
    ``unassigned`` lists the indices of the heavy atoms left over.
    """

    tb_K: float | None
    counts: dict[str, int] = field(default_factory=dict)
    unassigned: tuple[int, ...] = ()
    status: str = STATUS_OK


@lru_cache(maxsize=1)
def _patterns() -> tuple[tuple[str, Chem.Mol, tuple[int, ...]], ...]:
    """Compile the SMARTS once; return (name, pattern, mapped positions)."""
    compiled = []
    for name, _, smarts in JOBACK_TB:
        pattern = Chem.MolFromSmarts(smarts)
        if pattern is None:
            raise ValueError(f"Joback group {name!r}: bad SMARTS {smarts!r}")
        mapped = tuple(a.GetIdx() for a in pattern.GetAtoms() if a.GetAtomMapNum())
        compiled.append((name, pattern, mapped))
    return tuple(compiled)


def joback_groups(mol: Chem.Mol) -> tuple[dict[str, int], tuple[int, ...]]:
    """Assign heavy atoms of ``mol`` to Joback groups.

    Returns the group counts (only groups present, sorted by name) and the
    sorted indices of heavy atoms that fit no group.
    """
    owner: dict[int, str] = {}
    counts: dict[str, int] = {}
    for name, pattern, mapped in _patterns():
        for match in mol.GetSubstructMatches(pattern, uniquify=False, maxMatches=100000):
            atoms = tuple(match[i] for i in mapped)
            if any(a in owner for a in atoms):
                continue
            for a in atoms:
                owner[a] = name
            counts[name] = counts.get(name, 0) + 1
    unassigned = tuple(
        a.GetIdx() for a in mol.GetAtoms() if a.GetAtomicNum() > 1 and a.GetIdx() not in owner
    )
    return dict(sorted(counts.items())), unassigned


def joback_sum(counts: dict[str, int]) -> float:
    """Return the sum of Joback Tb increments, sum(n_k * dTb_k) [K]."""
    return sum(n * TB_INCREMENT[name] for name, n in counts.items())


def joback_tb(counts: dict[str, int]) -> float:
    r"""Estimate the normal boiling point by Joback & Reid (1987).

    .. math::
        T_b = 198.2 + \sum_k N_k \Delta T_{b,k}

    Parameters
    ----------
    counts : dict[str, int]
        Number of each Joback group, keyed by the names in ``JOBACK_TB`` [-]

    Returns
    -------
    float
        Normal boiling point [K]

    Notes
    -----
    Reported average absolute error 12.9 K (standard deviation 17.9 K,
    3.6 %) over 438 compounds [1]_; valid for organic compounds of
    C, H, N, O, S and halogens, with large over-estimates above about 500 K.
    On the CRC Handbook held-out set used in this package the error is about
    twice the published figure (see ``boiling_validation.json``).

    Examples
    --------
    Acetone, two -CH3 and one >C=O (nonring); 322.1 K (measured 329.2 K):

    >>> round(joback_tb({"-CH3": 2, ">C=O (nonring)": 1}), 2)
    322.11

    References
    ----------
    .. [1] Joback, K. G.; Reid, R. C. Chem. Eng. Commun. 1987, 57, 233-243.
       doi:10.1080/00986448708960487.
    """
    return TB_BASE + joback_sum(counts)


def to_mol(mol_or_smiles: Chem.Mol | str) -> Chem.Mol | None:
    """Return an RDKit molecule from a SMILES string or pass a molecule through."""
    if isinstance(mol_or_smiles, Chem.Mol):
        return mol_or_smiles
    return Chem.MolFromSmiles(mol_or_smiles)


def joback(mol_or_smiles: Chem.Mol | str) -> JobackResult:
    """Split a molecule into Joback groups and estimate Tb [K].

    The estimate is withheld (``tb_K`` None) if any heavy atom is left
    unassigned; the status then names those atoms.
    """
    mol = to_mol(mol_or_smiles)
    if mol is None:
        return JobackResult(None, status="SMILES did not parse")
    counts, unassigned = joback_groups(mol)
    if unassigned:
        symbols = ", ".join(f"{mol.GetAtomWithIdx(i).GetSymbol()}{i}" for i in unassigned)
        return JobackResult(None, counts, unassigned, f"no Joback group for atoms {symbols}")
    if not counts:
        return JobackResult(None, counts, unassigned, "no heavy atoms")
    return JobackResult(round(joback_tb(counts), 10), counts, unassigned, STATUS_OK)


# --------------------------------------------------------------- Tc and Tf

TC_TF_INCREMENT: dict[str, tuple[float | None, float | None]] = {
    "-CH3": (0.0141, -5.10), "-CH2-": (0.0189, 11.27), ">CH-": (0.0164, 12.64), ">C<": (0.0067, 46.43),
    "=CH2": (0.0113, -4.32), "=CH-": (0.0129, 8.73), "=C<": (0.0117, 11.14), "=C=": (0.0026, 17.78),
    "#CH": (0.0027, -11.18), "#C-": (0.0020, 64.32),
    "-CH2- (ring)": (0.0100, 7.75), ">CH- (ring)": (0.0122, 19.88), ">C< (ring)": (0.0042, 60.15),
    "=CH- (ring)": (0.0082, 8.13), "=C< (ring)": (0.0143, 37.02),
    "-F": (0.0111, -15.78), "-Cl": (0.0105, 13.55), "-Br": (0.0133, 43.43), "-I": (0.0068, 41.69),
    "-OH (alcohol)": (0.0741, 44.45), "-OH (phenol)": (0.0240, 82.83),
    "-O- (nonring)": (0.0168, 22.23), "-O- (ring)": (0.0098, 23.05),
    ">C=O (nonring)": (0.0380, 61.20), ">C=O (ring)": (0.0284, 75.97), "O=CH-": (0.0379, 36.90),
    "-COOH": (0.0791, 155.50), "-COO-": (0.0481, 53.60), "=O (other)": (0.0143, 2.08),
    "-NH2": (0.0243, 66.89), ">NH (nonring)": (0.0295, 52.66), ">NH (ring)": (0.0130, 101.51),
    ">N- (nonring)": (0.0169, 48.84), "-N= (nonring)": (0.0255, None), "-N= (ring)": (0.0085, 68.40),
    "=NH": (None, 68.91), "-CN": (0.0496, 59.89), "-NO2": (0.0437, 127.24),
    "-SH": (0.0031, 20.09), "-S- (nonring)": (0.0119, 34.40), "-S- (ring)": (0.0019, 79.93),
}
"""Joback & Reid (1987) increments (ΔTc [-], ΔTf [K]) by group name, as tabulated in Poling et
al. (2001) Table C-1 and checked against thermo 0.6.1's ``JOBACK_GROUPS`` by a test; None where
the table has no value (no estimate is given for a molecule with such a group)."""

TF_BASE = 122.5
"""Constant of the Joback melting-point sum [K]."""


def joback_tf(counts: dict[str, int]) -> float | None:
    r"""Estimate the normal melting (freezing) point by Joback & Reid (1987).

    .. math::
        T_f = 122.5 + \sum_k N_k \Delta T_{f,k}

    ``counts``: Joback group counts [-]; returns Tf [K], or None if a group has no ΔTf.
    Reported error: average absolute error 22.6 K over 388 compounds [1]_ (from memory); on
    the CRC Handbook held-out set of this package it is much larger (see
    ``melting_validation.json``).  Valid range: organic compounds of C, H, N, O, S and
    halogens; symmetry and crystal packing are not represented.

    >>> round(joback_tf({"-CH3": 2, ">C=O (nonring)": 1}), 2)  # acetone; CRC 178.5 K
    173.5
    """
    total = 0.0
    for name, n in counts.items():
        tf = TC_TF_INCREMENT[name][1]
        if tf is None:
            return None
        total += n * tf
    return TF_BASE + total


def joback_tc(counts: dict[str, int], tb_K: float) -> float | None:
    r"""Estimate the critical temperature by Joback & Reid (1987) from the normal boiling point.

    .. math::
        T_c = T_b \left[0.584 + 0.965 \sum_k N_k \Delta T_{c,k} - \left(\sum_k N_k \Delta T_{c,k}\right)^2\right]^{-1}

    ``counts``: Joback group counts [-]; ``tb_K``: normal boiling point, measured or
    estimated [K]; returns Tc [K], or None if a group has no ΔTc.  Reported error with a
    measured Tb: average absolute error 4.76 K (0.81 %) over 409 compounds [1]_ (as quoted
    in thermo 0.6.1's documentation); an estimated Tb carries its error through in
    proportion (Tc/Tb is about 1.5).

    >>> round(joback_tc({"-CH3": 2, ">C=O (nonring)": 1}, 329.2), 1)  # acetone; measured 508.1 K
    511.6
    """
    total = 0.0
    for name, n in counts.items():
        tc = TC_TF_INCREMENT[name][0]
        if tc is None:
            return None
        total += n * tc
    return tb_K / (0.584 + 0.965 * total - total * total)
