"""Write ``builder/data/unifac_parameters.json`` from the ``thermo`` package's copy of the published tables.

Run: ``.venv/bin/python tools/export_unifac_parameters.py`` (needs the test extra, thermo 0.6.1).

The numbers are those of the original UNIFAC (Fredenslund, Jones, Prausnitz 1975) in the
revision of Hansen et al. 1991 and its extension by Wittig et al. 2003, as transcribed by
thermo (``thermo.unifac.UFSG``, ``UFMG``, ``UFIP``) from the parameter table DDBST publishes.
Main groups 84 and 85 (imidazolium and bis(trifluoromethylsulfonyl)imide ionic-liquid groups,
from later work) are left out: nothing in a solvent store needs them.
"""
from __future__ import annotations

import json
from pathlib import Path

OUT = Path(__file__).resolve().parents[1] / "builder" / "data" / "unifac_parameters.json"
LEFT_OUT_MAIN_GROUPS = {84, 85}


def build() -> dict:
    import thermo
    from thermo.unifac import UFIP, UFMG, UFSG

    subgroups = []
    for sid, sg in sorted(UFSG.items()):
        if sg.main_group_id in LEFT_OUT_MAIN_GROUPS:
            continue
        subgroups.append({"id": sid, "name": sg.group, "main": sg.main_group_id,
                          "R": float(sg.R), "Q": float(sg.Q)})
    mains = {str(m): name for m, (name, _subs) in sorted(UFMG.items()) if m not in LEFT_OUT_MAIN_GROUPS}
    interactions = []
    for m, row in sorted(UFIP.items()):
        for n, a in sorted(row.items()):
            if m in LEFT_OUT_MAIN_GROUPS or n in LEFT_OUT_MAIN_GROUPS or m == n:
                continue
            interactions.append([m, n, float(a)])
    return {
        "description": (
            "Original UNIFAC: subgroup volume (R) and area (Q) parameters and main-group "
            "interaction parameters a_mn [K] (psi_mn = exp(-a_mn / T)). interactions rows are "
            "[m, n, a_mn]; a pair that is not listed has no published parameter."),
        "sources": [
            "A. Fredenslund, R. L. Jones, J. M. Prausnitz, AIChE J. 21 (1975) 1086, doi:10.1002/aic.690210607 (the method; DOI from memory)",
            "H. K. Hansen, P. Rasmussen, A. Fredenslund, M. Schiller, J. Gmehling, Ind. Eng. Chem. Res. 30 (1991) 2352, doi:10.1021/ie00058a017 (revision and extension, 5th table; DOI from memory)",
            "R. Wittig, J. Lohmann, J. Gmehling, Ind. Eng. Chem. Res. 42 (2003) 183, doi:10.1021/ie020506l (revision and extension, 6th table; DOI from memory)",
        ],
        "retrieved_via": (
            f"Python package thermo {thermo.__version__}: thermo.unifac.UFSG, UFMG, UFIP, which "
            "transcribe the table published at ddbst.com (published-parameters-unifac); written by "
            "tools/export_unifac_parameters.py. Main groups 84 and 85 (ionic liquids) left out."),
        "main_groups": mains,
        "subgroups": subgroups,
        "interactions": interactions,
    }


def main() -> None:
    data = build()
    OUT.write_text(json.dumps(data, indent=1, ensure_ascii=False) + "\n", encoding="utf-8")
    print(f"wrote {OUT} ({len(data['subgroups'])} subgroups, {len(data['interactions'])} interaction parameters)")


if __name__ == "__main__":
    main()
