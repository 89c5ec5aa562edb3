"""Intermolecular-force profile: which attractions hold a pure substance together, and why.

Contents
--------
- :func:`force_profile` -- classification, the structural facts behind it and supporting numbers.
- :class:`ForceProfile` -- the frozen result; :class:`StereoSpread` -- what unspecified stereo
  does to the dipole moment.
- :func:`is_chain`, :func:`is_flat`, :func:`heavy_atoms` -- structural facts the explanation uses.
- :func:`hbond_donors`, :func:`hbond_acceptors` -- own SMARTS-based counts.
- :func:`n_alkane_boiling_point` -- reference line for the "force excess".
- :data:`FORCE_KINDS`, :data:`FORCE_EXCESS_NOTABLE_K`.

Classification (common practice for pure substances)
----------------------------------------------------
- *dispersion*: always present.
- *dipole-dipole*: net dipole moment above :data:`builder.chem.dipole.POLAR_THRESHOLD_D`
  (0.5 D), estimated from 3D geometry (:mod:`builder.chem.dipole`), so symmetric
  molecules whose bond dipoles cancel come out non-polar.
- *hydrogen-bonding*: an H on N, O or F (donor) and an N, O or F lone pair (acceptor)
  in the same molecule. Molecules with acceptors only (ethers, ketones, tertiary
  amines) cannot hydrogen-bond to themselves, but accept H-bonds from water or alcohols
  (``acceptor_atoms`` says which atoms).
- *ionic*: a fragment with a net charge (salts, ions), a zwitterion whose opposite
  charges sit three or more bonds apart, or a bond between an alkali or alkaline-earth
  metal and an atom at least 1.7 more electronegative (Pauling scale).

``dominant`` is the strongest kind of contact present, in the order ionic >
hydrogen-bonding > dipole-dipole > dispersion. In large molecules dispersion may still
supply most of the total attraction; the force excess (boiling point minus that of the
n-alkane of equal molar mass) shows how much the polar forces add.

Stereo and mixtures: stereo given in the SMILES is used. When a double bond or centre
is unspecified, the conformer ensemble samples several stereoisomers; the largest
isomer moment is reported and ``stereo`` (a :class:`StereoSpread`) says whether the stereo
decides the polarity. For dot-separated structures the dipole and shape refer to the largest
fragment (a note says so); an ion has no dipole value. This module returns facts (numbers,
codes, counts); the sentences a datasheet shows are written from them in
``builder/derive/forces.py``.

Size: above the heavy-atom limit of the 3D work (:func:`builder.chem.structure3d.max_3d_atoms`)
no conformers are built, so the dipole moment and shape are not computed;
``not_computed`` names them with the reason, a note says so, and
dipole–dipole attraction is then not assessed (it is never claimed without a moment).

References
----------
.. [1] Haynes, W. M. (ed.) CRC Handbook of Chemistry and Physics, 95th ed.; CRC Press,
   2014 (n-alkane boiling points, via ``builder/data/n_alkanes.json``).
.. [2] Pauling, L. The Nature of the Chemical Bond, 3rd ed.; Cornell University Press,
   1960 (electronegativity scale).
"""

from __future__ import annotations

import functools
import json
import math
from dataclasses import dataclass, field, replace
from pathlib import Path

import numpy as np
from rdkit import Chem

from builder.chem.dipole import POLAR_THRESHOLD_D, DipoleEstimate, ensemble_dipole
from builder.chem.features import (
    acceptor_atoms,
    donor_groups,
    hbond_acceptors,
    hbond_donors,
    ionic_kind,
    largest_fragment,
    polar_bonds,
)
from builder.chem.molar_mass import molar_mass
from builder.chem.shape import (
    electron_count,
    polarizability,
    principal_moment_ratios,
    shape_class,
    surface_area,
)
from builder.chem.structure3d import (
    TOO_LARGE,
    canonical_smiles,
    conformer_ensemble,
    conformer_stereo,
    unspecified_stereo,
)

__all__ = [
    "FORCE_EXCESS_NOTABLE_K",
    "FORCE_KINDS",
    "ForceProfile",
    "StereoSpread",
    "force_profile",
    "hbond_acceptors",
    "hbond_donors",
    "n_alkane_boiling_point",
]

FORCE_KINDS = ("dispersion", "dipole-dipole", "hydrogen-bonding", "ionic")
"""Kinds of attraction, weakest contact first."""

FORCE_EXCESS_NOTABLE_K = 20.0
"""Force excess [K] beyond which (either way) it counts as notable: polar forces add noticeably, or
the molecule falls well short of the n-alkane line (our choice)."""

_DATA = Path(__file__).resolve().parent.parent / "data" / "n_alkanes.json"


@dataclass(frozen=True)
class StereoSpread:
    """Unspecified stereo and the dipole moments of the stereoisomers the 3D embedding sampled.

    ``unspecified`` holds one code per unspecified element, ``"centre"`` or ``"double bond"``.
    ``isomer_moments_D`` [D] holds one moment per sampled stereoisomer (the Boltzmann RMS over
    its conformers); it is empty when the only unspecified element is a single stereocentre,
    whose two mirror-image forms have the same moment.

    >>> StereoSpread(("double bond",), (0.0, 2.1)).decides_polarity
    True
    """

    unspecified: tuple[str, ...]
    isomer_moments_D: tuple[float, ...] = ()

    @property
    def mirror_images_only(self) -> bool:
        """One unspecified stereocentre and nothing else: its two forms are mirror images."""
        return self.unspecified == ("centre",)

    @property
    def decides_polarity(self) -> bool:
        """Some sampled stereoisomers are polar (above the threshold) and others are not."""
        if not self.isomer_moments_D:
            return False
        low, high = min(self.isomer_moments_D), max(self.isomer_moments_D)
        return (low > POLAR_THRESHOLD_D) != (high > POLAR_THRESHOLD_D)


@dataclass(frozen=True)
class ForceProfile:
    """Intermolecular-force profile of one substance (SI-style plain numbers).

    ``methods`` maps each number's field name to its method and reference; ``kinds``
    maps it to "computed" (exact from the structure), "estimated" or "reference data".
    The structural facts (``polar_bonds``, ``donor_groups``, ``acceptor_atoms``, ``chain``,
    ``flat``, ``heavy_elements``, ``stereo``) are what an explanation of the classification
    rests on; they refer to the whole structure as given.
    """

    smiles: str
    dominant: str
    present: tuple[str, ...]
    electron_count: int
    polarizability_A3: float | None
    dipole_D: float | None
    dipole_uncertainty_D: float | None
    dipole_method: str
    hbond_donors: int
    hbond_acceptors: int
    npr1: float | None
    npr2: float | None
    shape: str | None
    surface_area_A2: float
    molar_mass_g_mol: float
    boiling_point_K: float | None
    force_excess_K: float | None
    methods: dict[str, str] = field(default_factory=dict)
    kinds: dict[str, str] = field(default_factory=dict)
    notes: tuple[str, ...] = ()
    #: field name → why it has no value ("not computed: too large ..."), for skipped 3D work
    not_computed: dict[str, str] = field(default_factory=dict)
    #: bonds between atoms differing enough in electronegativity, as "C–Cl", "C=O", each once
    polar_bonds: tuple[str, ...] = ()
    #: donor groups and their hydrogen counts, e.g. (("O–H", 1),)
    donor_groups: tuple[tuple[str, int], ...] = ()
    #: acceptor atoms by element and their counts, e.g. (("O", 1),)
    acceptor_atoms: tuple[tuple[str, int], ...] = ()
    #: an open chain of at least four carbons (:func:`is_chain`)
    chain: bool = False
    #: aromatic or disc-like (:func:`is_flat`)
    flat: bool = False
    #: halogens, S, P, Si present (:func:`heavy_atoms`)
    heavy_elements: tuple[str, ...] = ()
    heavy_atom_count: int = 0
    atom_count: int = 0
    #: unspecified stereo and its effect on the moment; None when all stereo is given (or for an ion)
    stereo: StereoSpread | None = None

    def __post_init__(self) -> None:
        if self.present[:1] != ("dispersion",) or self.dominant != self.present[-1]:
            raise ValueError(f"dispersion must come first and dominant last: {self.present}")
        if any(kind not in FORCE_KINDS for kind in self.present):
            raise ValueError(f"unknown force kind in {self.present}; allowed: {FORCE_KINDS}")


def _stereo_dipoles(mol: Chem.Mol) -> tuple[DipoleEstimate, StereoSpread | None]:
    """Return the dipole estimate and, with unspecified stereo, the moments of the isomers.

    With unspecified stereo the ensemble's conformers fall into several stereoisomers
    (see :func:`conformer_stereo`); each isomer's moment is the Boltzmann RMS over its
    own conformers, and the largest is reported, so "polar" reads "at least one
    sampled stereoisomer is polar".
    """
    ensemble = conformer_ensemble(canonical_smiles(mol))
    estimate = ensemble_dipole(ensemble)
    unspecified = unspecified_stereo(mol)
    if not unspecified or estimate.value_D is None or not estimate.conformer_moments_D:
        return estimate, None
    if unspecified == ["centre"]:
        return estimate, StereoSpread(("centre",))
    labels = conformer_stereo(ensemble)
    moments = np.array(estimate.conformer_moments_D)
    weights = np.array(estimate.weights)
    per_isomer = {}
    for label in sorted(set(labels)):
        chosen = np.array([lab == label for lab in labels])
        w = weights[chosen] / weights[chosen].sum()
        per_isomer[label] = math.sqrt(float(w @ moments[chosen] ** 2))
    reported = replace(estimate, value_D=max(per_isomer.values()))
    return reported, StereoSpread(tuple(unspecified), tuple(per_isomer[label] for label in sorted(per_isomer)))


def force_profile(mol_or_smiles: str | Chem.Mol, boiling_point_K: float | None = None) -> ForceProfile:
    """Classify the intermolecular forces of a pure substance and give the evidence.

    Parameters
    ----------
    mol_or_smiles : str or rdkit.Chem.Mol
        Structure; stereo in the SMILES is respected. Salts as dot-separated ions.
    boiling_point_K : float, optional
        Normal boiling point [K]; enables ``force_excess_K``.

    Returns
    -------
    ForceProfile
        Classification, the structural facts behind it and numbers; see the module docstring.

    >>> p = force_profile("CCOCC")  # diethyl ether: accepts H-bonds, cannot donate them
    >>> p.dominant, p.hbond_donors, p.acceptor_atoms, p.polar_bonds
    ('dipole-dipole', 0, (('O', 1),), ('C–O',))

    Raises
    ------
    ValueError
        If the SMILES does not parse.
    """
    smiles = canonical_smiles(mol_or_smiles)
    mol = Chem.MolFromSmiles(smiles)
    main = largest_fragment(mol)
    ionic = ionic_kind(mol)
    donors, acceptors = hbond_donors(mol), hbond_acceptors(mol)
    alpha, alpha_note = polarizability(mol)
    n_electrons = electron_count(mol)
    if ionic and Chem.GetFormalCharge(main) != 0:
        dipole = DipoleEstimate(None, None, "not applicable",
                                "not defined for an ion (depends on the origin)")
        stereo = None
    else:
        dipole, stereo = _stereo_dipoles(main)
    ensemble = conformer_ensemble(canonical_smiles(main))
    npr1 = npr2 = None
    if ensemble.ok:
        cid = ensemble.lowest_conformer_id
        masses = np.array([a.GetMass() for a in ensemble.mol.GetAtoms()])
        npr1, npr2 = principal_moment_ratios(ensemble.coordinates(cid), masses)
    shape = shape_class(npr1, npr2) if npr1 is not None else None
    mass = molar_mass(mol)
    excess, excess_note = _force_excess(boiling_point_K, mass)

    polar = dipole.value_D is not None and dipole.value_D > POLAR_THRESHOLD_D
    hbond = donors > 0 and acceptors > 0
    present = ["dispersion"]
    if polar:
        present.append("dipole-dipole")
    if hbond:
        present.append("hydrogen-bonding")
    if ionic:
        present.append("ionic")
    not_computed = {}
    if dipole.value_D is None and dipole.status.startswith(TOO_LARGE):
        not_computed["dipole_D"] = dipole.status
    if npr1 is None and ensemble.status.startswith(TOO_LARGE):
        not_computed.update(npr1=ensemble.status, npr2=ensemble.status)
    notes = tuple(n for n in (
        f"dipole: {dipole.status}" if dipole.status not in ("ok", ensemble.status) else "",
        f"polarizability: {alpha_note}" if alpha_note != "ok" else "",
        (f"3D structure (dipole moment, shape): {ensemble.status}" if ensemble.status.startswith(TOO_LARGE)
         else f"3D structure: {ensemble.status}") if ensemble.status != "ok" else "",
        "shape and dipole computed on the largest fragment" if len(Chem.GetMolFrags(mol)) > 1 else "",
        f"force excess: {excess_note}" if excess_note else "",
    ) if n)
    return ForceProfile(
        smiles=smiles, dominant=present[-1], present=tuple(present),
        electron_count=n_electrons, polarizability_A3=alpha, dipole_D=dipole.value_D,
        dipole_uncertainty_D=dipole.uncertainty_D, dipole_method=dipole.method,
        hbond_donors=donors, hbond_acceptors=acceptors, npr1=npr1, npr2=npr2, shape=shape,
        surface_area_A2=surface_area(Chem.AddHs(mol)), molar_mass_g_mol=mass,
        boiling_point_K=boiling_point_K, force_excess_K=excess,
        methods=dict(_METHODS, dipole_D=dipole.method), kinds=dict(_KINDS), notes=notes,
        not_computed=not_computed, polar_bonds=tuple(polar_bonds(mol)),
        donor_groups=tuple(donor_groups(mol).items()), acceptor_atoms=tuple(acceptor_atoms(mol).items()),
        chain=is_chain(mol), flat=is_flat(mol, shape), heavy_elements=tuple(heavy_atoms(mol)),
        heavy_atom_count=mol.GetNumHeavyAtoms(), atom_count=mol.GetNumAtoms(), stereo=stereo,
    )


_METHODS = {
    "electron_count": "sum of atomic numbers (H included) minus net charge",
    "polarizability_A3": "Lorentz-Lorenz over Wildman-Crippen molar refractivity "
                         "(J. Chem. Inf. Comput. Sci. 1999, 39, 868)",
    "hbond_donors": "H atoms on N, O or F (own SMARTS)",
    "hbond_acceptors": "N, O, F atoms with a free lone pair (own SMARTS)",
    "npr1": "normalised principal moment ratio I1/I3, lowest-energy conformer "
            "(Sauer & Schwarz, J. Chem. Inf. Comput. Sci. 2003, 43, 987)",
    "npr2": "normalised principal moment ratio I2/I3, lowest-energy conformer "
            "(Sauer & Schwarz 2003)",
    "surface_area_A2": "Labute approximate surface area (J. Mol. Graph. Model. 2000, 18, 464)",
    "molar_mass_g_mol": "IUPAC standard atomic weights (RDKit)",
    "force_excess_K": "boiling point minus n-alkane Tb at equal molar mass, "
                      "CRC Handbook 95th ed. n-alkanes, linear in ln M",
}
_KINDS = {
    "electron_count": "computed", "hbond_donors": "computed", "hbond_acceptors": "computed",
    "molar_mass_g_mol": "computed", "polarizability_A3": "estimated", "dipole_D": "estimated",
    "npr1": "estimated", "npr2": "estimated", "surface_area_A2": "estimated",
    "force_excess_K": "reference data",
}


def is_chain(mol: Chem.Mol) -> bool:
    r"""An open chain: no ring, and a run of at least four carbon atoms bonded one to the next.

    >>> is_chain(Chem.MolFromSmiles("CCCCO")), is_chain(Chem.MolFromSmiles("Cl/C=C\\Cl"))
    (True, False)
    """
    if mol.GetRingInfo().NumRings():
        return False
    return mol.HasSubstructMatch(Chem.MolFromSmarts("[#6]~[#6]~[#6]~[#6]"))


def is_flat(mol: Chem.Mol, shape: str | None) -> bool:
    """Aromatic (a ring of at least five aromatic atoms), or disc-like by its moments of inertia."""
    ring_info = mol.GetRingInfo()
    aromatic = any(len(ring) >= 5 and all(mol.GetAtomWithIdx(i).GetIsAromatic() for i in ring)
                   for ring in ring_info.AtomRings())
    return aromatic or shape == "disc-like"


#: atoms that carry fewer electrons per gram than CH2 does: the n-alkane of equal mass then has
#: more electrons (and contact) than the molecule, so the comparison by mass understates it
_HEAVY_SYMBOLS = ("F", "Cl", "Br", "I", "S", "P", "Si")


def heavy_atoms(mol: Chem.Mol) -> list[str]:
    """The heavy-atom symbols of ``mol`` (halogens, S, P, Si), each once, in formula order."""
    found = {a.GetSymbol() for a in mol.GetAtoms()}
    return [s for s in _HEAVY_SYMBOLS if s in found]


def _force_excess(boiling_point_K: float | None, molar_mass: float) -> tuple[float | None, str]:
    if boiling_point_K is None:
        return None, ""
    try:
        return boiling_point_K - n_alkane_boiling_point(molar_mass), ""
    except ValueError as error:
        return None, str(error)


@functools.lru_cache(maxsize=1)
def _alkane_table() -> tuple[np.ndarray, np.ndarray]:
    """Return (molar masses [g/mol], boiling points [K]) of the tabulated n-alkanes."""
    data = json.loads(_DATA.read_text(encoding="utf-8"))["data"]
    masses = [molar_mass(Chem.MolFromSmiles("C" * row["carbons"])) for row in data]
    return np.array(masses), np.array([row["boiling_point_K"] for row in data])


def n_alkane_boiling_point(molar_mass_g_mol: float) -> float:
    """Return the normal boiling point of a (hypothetical) n-alkane of the given molar mass.

    Piecewise-linear interpolation of Tb against ln M between the tabulated n-alkanes
    C1-C26 (CRC Handbook [1]_, ``builder/data/n_alkanes.json``); exact at the table points.
    Leave-one-out check (each member from its neighbours two carbons apart, twice the
    real spacing): at most 4.7 K off (propane), median 0.7 K.

    Parameters
    ----------
    molar_mass_g_mol : float
        Molar mass [g/mol], between methane (16.04) and hexacosane (366.7).

    Returns
    -------
    float
        Boiling point [K].

    Raises
    ------
    ValueError
        Outside the tabulated range (no extrapolation).
    """
    masses, tb = _alkane_table()
    if not masses[0] <= molar_mass_g_mol <= masses[-1] or math.isnan(molar_mass_g_mol):
        raise ValueError(f"molar mass {molar_mass_g_mol:.1f} g/mol outside the n-alkane table "
                         f"({masses[0]:.1f}-{masses[-1]:.1f} g/mol)")
    return float(np.interp(math.log(molar_mass_g_mol), np.log(masses), tb))
