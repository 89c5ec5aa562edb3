"""Plausibility checks (builder/plausibility.py): each rule fires on a bad value and stays quiet on a good one.

Reference numbers come from the chemicals 1.5.2 package: CRC Handbook 95th ed. "Physical
Constants of Organic Compounds" (``chemicals.miscdata.CRC_organic_data``: Tm, Tb, rho),
IEC 60079-20-1 (2010) flash points (``chemicals.safety.T_flash``), Poling et al. 5th ed.
Antoine coefficients (``chemicals.vapor_pressure.Psat_data_AntoinePoling``) and
``chemicals.identifiers.search_chemical`` (formula, molecular weight).
"""
from __future__ import annotations

import pytest

# chemicals is a pinned test dependency: imported plainly so that its absence fails
from chemicals import miscdata
from chemicals.identifiers import search_chemical
from chemicals.safety import T_flash
from chemicals.vapor_pressure import Antoine, Psat_data_AntoinePoling

from builder.cli import main
from builder.core.diagnostics import CatalogError
from builder.derive.catalog import derive_catalog
from builder.load.entries import load_catalog
from builder.pipeline import build
from builder.review.plausibility import (
    check_catalog,
    density_range,
    heavy_mass_fraction,
)

CRC = miscdata.CRC_organic_data
SOURCES = """\
crc-95:
  title: CRC Handbook of Chemistry and Physics
  kind: handbook
iec:
  title: IEC 60079-20-1
  kind: standard
poling:
  title: The Properties of Gases and Liquids
  kind: handbook
"""
ETHANOL, HEXANE, DCM, BROMOFORM = "64-17-5", "110-54-3", "75-09-2", "75-25-2"


def _crc(cas, column):
    return float(CRC.loc[cas, column])


def _entry(name, smiles, props="", extra=""):
    text = f"name: {name}\nsmiles: '{smiles}'\n{extra}"
    if props:
        text += "properties:\n" + props
    return text


def _run(make_entries, files, sources=SOURCES):
    folder = make_entries(files, sources=sources)
    catalog, diags = load_catalog(folder)
    assert catalog is not None, [str(d) for d in diags]
    return check_catalog(catalog, derive_catalog(catalog))


def _messages(diags, fragment):
    return [d for d in diags if fragment in d.message]


def _ethanol_props(tb=None, fp=None, tm=None):
    tb = tb or f"{_crc(ETHANOL, 'Tb')} K"
    fp = fp or f"{T_flash(ETHANOL, method='IEC 60079-20-1 (2010)')} K"
    tm = tm or f"{_crc(ETHANOL, 'Tm')} K"
    return (f"  boiling_point: {{value: {tb}, source: crc-95}}\n"
            f"  melting_point: {{value: {tm}, source: crc-95}}\n"
            f"  flash_point: {{value: {fp}, source: iec}}\n")


def test_handbook_ethanol_is_plausible(make_entries):
    # ethanol: Tb 351.39 K, Tm 159.01 K (CRC), flash point 285.15 K (IEC 60079-20-1)
    diags = _run(make_entries, {"ethanol.yaml": _entry("Ethanol", "CCO", _ethanol_props())},
                 sources=SOURCES.split("poling:")[0])
    assert diags == []


def test_flash_point_above_boiling_point_is_an_error(make_entries):
    diags = _run(make_entries, {"ethanol.yaml": _entry("Ethanol", "CCO", _ethanol_props(fp="90 °C"))})
    (d,) = _messages(diags, "at or above the boiling point")
    assert d.severity == "error" and (d.line, d.col) == (6, 24)  # the flash point's value


def test_flash_point_above_the_estimated_boiling_point_warns(make_entries):
    text = _entry("Ethanol", "CCO", "  flash_point: {value: 120 °C, source: iec}\n")
    (d,) = _messages(_run(make_entries, {"ethanol.yaml": text}), "estimated boiling point")
    assert d.severity == "warning"


def test_melting_point_above_boiling_point_is_an_error(make_entries):
    # a melting point typed in °C where the handbook gives K (159.01 K → "159.01 °C") lands above Tb
    diags = _run(make_entries, {"ethanol.yaml": _entry("Ethanol", "CCO", _ethanol_props(tm="159.01 °C"))})
    (d,) = _messages(diags, "melting point")
    assert d.severity == "error" and d.line == 5


@pytest.mark.parametrize("cas, smiles", [(HEXANE, "CCCCCC"), (DCM, "ClCCl"), (BROMOFORM, "BrC(Br)Br")])
def test_handbook_densities_are_inside_their_range(make_entries, cas, smiles):
    rho = _crc(cas, "rho")  # n-hexane 660.6, dichloromethane 1326.6, bromoform 2878.8 kg/m³ (CRC)
    text = _entry(cas, smiles, f"  density: {{value: {rho} kg/m3, source: crc-95}}\n")
    assert _messages(_run(make_entries, {"x.yaml": text}), "density") == []


def test_density_in_the_wrong_unit_warns(make_entries):
    rho = _crc(HEXANE, "rho") / 1000  # 0.6606: g/cm³ written as kg/m³
    text = _entry("n-Hexane", "CCCCCC", f"  density: {{value: {rho} kg/m3, source: crc-95}}\n")
    (d,) = _messages(_run(make_entries, {"x.yaml": text}), "density")
    assert d.severity == "warning" and "outside the plausible range" in d.message and d.line == 4


def test_halogens_raise_the_density_ceiling():
    # dichloromethane's CRC density would be implausible for a hydrocarbon, not for its chlorine content
    rho = _crc(DCM, "rho")
    assert rho > density_range("dispersion", 0.0)[1]
    assert density_range("dipole-dipole", heavy_mass_fraction("ClCCl"))[1] > rho
    assert heavy_mass_fraction("CCO") == 0.0


def test_declared_formula_and_molar_mass_are_checked(make_entries):
    ref = search_chemical(ETHANOL)  # C2H6O, 46.06844 g/mol
    good = _entry("Ethanol", "CCO", extra=f"formula: CH3CH2OH\nmolar_mass: {ref.MW:.2f} g/mol\n")
    assert ref.formula == "C2H6O"
    assert _messages(_run(make_entries, {"ethanol.yaml": good}), "declared") == []
    bad = _entry("Ethanol", "CCO", extra=f"formula: C2H5O\nmolar_mass: {ref.MW + 14.03:.2f} g/mol\n")
    diags = _run(make_entries, {"ethanol.yaml": bad})
    (f,) = _messages(diags, "declared formula C2H5O disagrees")
    (m,) = _messages(diags, "declared molar mass")
    assert (f.line, m.line) == (3, 4) and f.severity == m.severity == "warning"


def test_same_structure_twice_is_an_error_at_the_second_smiles(make_entries):
    files = {"a-ethanol.yaml": _entry("Ethanol", "CCO"), "b-alcohol.yaml": _entry("Alcohol", "OCC")}
    (d,) = _messages(_run(make_entries, files), "same structure")
    assert d.severity == "error" and d.path.endswith("b-alcohol.yaml") and (d.line, d.col) == (2, 9)
    files = {"a-ethanol.yaml": _entry("Ethanol", "CCO"), "b-alcohol.yaml": _entry("Methanol", "CO")}
    assert _messages(_run(make_entries, files), "same structure") == []


def test_uncited_source_warns_at_its_line(make_entries):
    text = _entry("Ethanol", "CCO", f"  boiling_point: {{value: {_crc(ETHANOL, 'Tb')} K, source: crc-95}}\n",
                  extra="notes: flash point from source iec, not yet entered\n")
    diags = _run(make_entries, {"ethanol.yaml": text})
    (d,) = _messages(diags, "cited by no entry")
    assert "'poling'" in d.message and d.path.endswith("sources.yaml") and d.line == 7
    assert _messages(diags, "'iec'") == []  # named in the notes: counts as cited


def test_hazard_source_counts_as_cited(make_entries):
    sources = SOURCES + "clp:\n  title: CLP Regulation, Annex VI\n  kind: standard\n"
    text = _entry("Ethanol", "CCO", extra="hazard_statements: [H225, H319]\nhazard_source: clp\n")
    assert _messages(_run(make_entries, {"ethanol.yaml": text}, sources), "'clp'") == []
    bare = _entry("Ethanol", "CCO", extra="hazard_statements: [H225, H319]\n")
    diags = _run(make_entries, {"ethanol.yaml": bare}, sources)
    assert _messages(diags, "'clp' is cited by no entry")
    (d,) = _messages(diags, "hazard statements name no source")
    assert d.severity == "warning" and d.line == 3


def _antoine_props(vp_text, at):
    row = Psat_data_AntoinePoling.loc[ETHANOL]
    return (f"  vapor_pressure: {{value: {vp_text}, source: crc-95, conditions: {{at: {at}}}}}\n"
            f"  antoine: {{form: log10, pressure_unit: Pa, temperature_unit: K, A: {row.A}, B: {row.B}, "
            f"C: {row.C}, t_min: {row.Tmin} K, t_max: {row.Tmax} K, source: poling}}\n")


def test_vapor_pressure_against_the_antoine_equation(make_entries):
    row = Psat_data_AntoinePoling.loc[ETHANOL]  # valid 276.5-369.54 K
    p20 = Antoine(293.15, row.A, row.B, row.C)  # chemicals' own evaluation, Pa
    ok = _run(make_entries, {"e.yaml": _entry("Ethanol", "CCO", _antoine_props(f"{p20 * 1.1:.1f} Pa", "20 °C"))})
    assert _messages(ok, "vapor pressure") == []
    off = _run(make_entries, {"e.yaml": _entry("Ethanol", "CCO", _antoine_props(f"{p20 * 1.5:.1f} Pa", "20 °C"))})
    (d,) = _messages(off, "from the Antoine equation")
    assert d.severity == "warning" and "+50 %" in d.message and d.line == 4
    out = _run(make_entries, {"e.yaml": _entry("Ethanol", "CCO", _antoine_props("1.6 kPa", "0 °C"))})
    (d,) = _messages(out, "outside the Antoine equation's valid range")
    assert d.severity == "warning"


def test_check_of_named_files_still_sees_the_whole_folder(make_entries, capsys):
    folder = make_entries({"a-ethanol.yaml": _entry("Ethanol", "CCO"), "b-alcohol.yaml": _entry("Alcohol", "OCC")},
                          sources=SOURCES.split("iec:")[0])
    # the duplicate involves the checked file, so checking it alone fails as the build would
    assert main(["check", "--entries", str(folder), str(folder / "a-ethanol.yaml")]) == 1
    err = capsys.readouterr().err
    assert "a-ethanol.yaml:2:9: error: same structure" in err and "'b-alcohol'" in err
    assert main(["check", "--entries", str(folder), str(folder / "b-alcohol.yaml")]) == 1
    err = capsys.readouterr().err
    assert "b-alcohol.yaml:2:9: error: same structure" in err and "a-ethanol" in err


def test_strict_check_fails_on_a_plausibility_warning_and_build_refuses_errors(make_entries, capsys, tmp_path):
    rho = _crc(HEXANE, "rho") / 1000
    folder = make_entries({"hexane.yaml": _entry("n-Hexane", "CCCCCC",
                                                 f"  density: {{value: {rho} kg/m3, source: crc-95}}\n")},
                          sources=SOURCES.split("iec:")[0])
    assert main(["check", "--entries", str(folder)]) == 0
    assert main(["check", "--entries", str(folder), "--strict"]) == 1
    (folder / "hexane-2.yaml").write_text(_entry("Hexane", "CCCCCC"), encoding="utf-8")
    with pytest.raises(CatalogError) as exc:
        build(folder, tmp_path / "site")
    assert any("same structure" in d.message for d in exc.value.diagnostics)
    assert not (tmp_path / "site").exists()
