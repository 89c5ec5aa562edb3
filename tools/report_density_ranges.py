"""How many CRC Handbook liquids fall inside ``builder.review.plausibility.density_range`` (a report, not a test).

Data: "Physical Constants of Organic Compounds", CRC Handbook 95th ed., as shipped in chemicals
1.5.2 (``chemicals.miscdata.CRC_organic_data``: Tm, Tb, rho); SMILES from
``chemicals.identifiers.search_chemical``.  Draws 400 compounds liquid at 20 °C (seed 1) and
prints those outside their range.  Takes about a minute and a half (3D dipole ensembles).

    python tools/report_density_ranges.py
"""
from __future__ import annotations

import random


def main() -> None:
    from chemicals import miscdata
    from chemicals.identifiers import search_chemical

    from builder.chem.identity import parse_smiles
    from builder.core.values import Provenance, Value
    from builder.derive.forces import forces_of
    from builder.review.plausibility import density_range, heavy_mass_fraction

    table = miscdata.CRC_organic_data
    table = table[(table.Tm < 293) & (table.Tb > 300) & table.rho.notna()]
    random.seed(1)
    inside = total = 0
    for cas in random.sample(list(table.index), 400):
        try:
            smiles = search_chemical(cas).smiles
        except Exception:  # not in the identifier database
            continue
        mol, _ = parse_smiles(smiles)
        if mol is None:
            continue
        row = table.loc[cas]
        force = forces_of(mol, Value(float(row.Tb), "K", Provenance("literature", source="crc-95"))).dominant.code
        low, high = density_range(force, heavy_mass_fraction(smiles))
        total += 1
        if low <= row.rho <= high:
            inside += 1
        else:
            print(f"outside: {row.Name} ({cas}) {row.rho:.0f} kg/m³, {force}, range {low:.0f}-{high:.0f}")
    print(f"{inside} of {total} inside")


if __name__ == "__main__":
    main()
