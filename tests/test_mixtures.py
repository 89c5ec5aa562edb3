"""Mixtures end to end: the composition format, its checks, the derived datasheet, links, pages,
``profile --mix`` and ``new --mix``.

The phase-equilibrium science itself (UNIFAC against ``thermo``, azeotropes, mixture flash points
against measurements) is tested in tests/chem/test_unifac.py, test_vle.py and test_mixture_flash.py;
here the wiring is checked against independent computations of the same definitions.
"""
from __future__ import annotations

import itertools
import json
import math

import pytest

from builder.chem import mixture as mix
from builder.chem import vle
from builder.cli import main
from builder.derive.catalog import derive_catalog
from builder.derive.profile import profile_mixture
from builder.load.composition import FractionProblem, composition_of_pairs, parse_fraction, sum_problem
from builder.load.entries import load_catalog

# --- the fraction syntax -------------------------------------------------------------------------


@pytest.mark.parametrize("text, low, high, basis", [
    ("40 % w/w", 0.40, 0.40, "mass"),
    ("10-20 % w/w", 0.10, 0.20, "mass"),
    ("10 – 20 % v/v", 0.10, 0.20, "volume"),
    ("0.5 mol/mol", 0.5, 0.5, "mole"),
    ("5 to 7.5 % mol/mol", 0.05, 0.075, "mole"),
])
def test_fraction_text_is_read(text, low, high, basis):
    f = parse_fraction(text)
    assert (f.low, f.high, f.basis, f.balance) == (pytest.approx(low), pytest.approx(high), basis, False)


@pytest.mark.parametrize("text, fragment", [
    ("40 %", "has no basis"), ("40", "has no basis"), ("40 % m/m", "unknown basis"),
    ("20-10 % w/w", "runs backwards"), ("140 % w/w", "more than 100 %"), ("40 w/w", "more than 100 %"),
    ("about half", "cannot read"),
])
def test_bad_fraction_text_is_refused(text, fragment):
    with pytest.raises(FractionProblem, match=fragment):
        parse_fraction(text)


def test_ranges_that_admit_some_composition_pass():
    # 60-70 % + 30-40 %: 60 + 40 = 100 is consistent; 65 + 40 is not needed to exist
    assert sum_problem([parse_fraction("60-70 % w/w"), parse_fraction("30-40 % w/w")]) is None
    assert "at most 90 %" in sum_problem([parse_fraction("50-60 % w/w"), parse_fraction("30 % w/w")])


# --- composition arithmetic against brute force and the definitions ------------------------------


def test_corners_bound_every_allowed_composition():
    """Each fraction's extremes over all allowed compositions (a 1 % grid search) are found among
    the corners: a property monotone in each fraction takes its worst case at a corner."""
    lows, highs = [0.2, 0.1, 0.0], [0.5, 0.3, 1.0]
    corners = mix.composition_corners(lows, highs)
    for c in corners:
        assert sum(c) == pytest.approx(1.0)
        assert all(lo - 1e-9 <= w <= hi + 1e-9 for w, lo, hi in zip(c, lows, highs))
    grid = [(a / 100, b / 100, 1 - a / 100 - b / 100) for a, b in itertools.product(range(101), repeat=2)
            if 0 <= 1 - a / 100 - b / 100 and all(lo - 1e-9 <= w <= hi + 1e-9 for w, lo, hi in
                                                  zip((a / 100, b / 100, 1 - a / 100 - b / 100), lows, highs))]
    for i in range(3):
        assert min(c[i] for c in corners) == pytest.approx(min(g[i] for g in grid), abs=1e-9)
        assert max(c[i] for c in corners) == pytest.approx(max(g[i] for g in grid), abs=1e-9)


def test_basis_conversions_follow_the_definitions():
    # 40 % w/w ethanol in water, molar masses 46.069 and 18.015 g/mol (IUPAC atomic weights):
    # x = (0.4/46.069) / (0.4/46.069 + 0.6/18.015), worked by hand = 0.20677
    x = mix.mass_to_mole_fractions([0.4, 0.6], [46.069, 18.015])
    assert x[0] == pytest.approx(0.20677, abs=5e-5)
    assert mix.to_mass_fractions(x, "mole", [46.069, 18.015]) == pytest.approx([0.4, 0.6])
    # volume fractions with pure densities 789.3 and 997.0 kg/m³ (CRC), ideal mixing
    phi = mix.mass_to_volume_fractions([0.4, 0.6], [789.3, 997.0])
    assert mix.to_mass_fractions(phi, "volume", [46.069, 18.015], [789.3, 997.0]) == pytest.approx([0.4, 0.6])


# --- a small catalog with the demo's Antoine coefficients (entries/acetone.yaml, water.yaml) ---------

ACETONE = """\
name: Acetone
smiles: CC(C)=O
properties:
  boiling_point: {value: 56.05 °C, source: crc-95}
  flash_point: {value: -20 °C, source: crc-95}
  density: {value: 0.7845 g/cm3, source: crc-95}
  antoine: {form: log10, pressure_unit: Pa, temperature_unit: K, A: 9.2184, B: 1197.01, C: -45.09,
            t_min: 247.38 K, t_max: 350.65 K, source: crc-95}
"""
WATER = """\
name: Water
smiles: O
properties:
  boiling_point: {value: 100 °C, source: crc-95}
  density: {value: 0.9970 g/cm3, source: crc-95}
  antoine: {form: log10, pressure_unit: Pa, temperature_unit: K, A: 10.11564, B: 1687.537, C: -42.98,
            t_min: 273.2 K, t_max: 473.2 K, source: crc-95}
"""
BLEND = """\
name: Acetone wash
type: mixture
composition:
  - component: acetone
    fraction: {acetone}
  - component: water
    fraction: {water}
catalog:
  locations: [store-a]
"""


def _derive(make_entries, files):
    folder = make_entries(files)
    catalog, diags = load_catalog(folder)
    assert catalog is not None, [str(d) for d in diags]
    return {d.entry.id: d for d in derive_catalog(catalog)}, folder


def test_mixture_values_follow_raoult_with_the_components_own_curves(make_entries):
    derived, _ = _derive(make_entries, {"acetone.yaml": ACETONE, "water.yaml": WATER,
                                        "wash.yaml": BLEND.format(acetone="30 % w/w", water="balance")})
    d = derived["wash"]
    assert d.mixture is not None
    x = mix.mass_to_mole_fractions([0.3, 0.7], [58.08, 18.015])
    rows = {r.entry_id: r for r in d.mixture.rows}
    assert rows["acetone"].mole_fraction.value == pytest.approx(100 * x[0], rel=1e-3)
    # the bubble pressure at 20 °C is the sum of x_i γ_i P_i over the components' Antoine pressures
    gammas = [1.0, 1.0] if d.mixture.activity_note else None
    p = d.get("vapor_pressure_20C").value
    assert p > 0
    psat = [10 ** (9.2184 - 1197.01 / (293.15 - 45.09)), 10 ** (10.11564 - 1687.537 / (293.15 - 42.98))]
    if gammas is not None:  # ideal fallback: exactly Raoult's law
        assert p == pytest.approx(sum(xi * ps for xi, ps in zip(x, psat)), rel=1e-6)
    else:  # UNIFAC: acetone–water deviates positively from Raoult's law
        assert p > sum(xi * ps for xi, ps in zip(x, psat))
    # the vapor shares sum to 100 % and acetone, the volatile one, dominates the vapor
    shares = [r.vapor_fraction_20C.value for r in d.mixture.rows]
    assert sum(shares) == pytest.approx(100.0, abs=1e-6)
    assert rows["acetone"].vapor_fraction_20C.value > 80
    # bubble point between the two boiling points, dew point above it
    tb, td = d.get("boiling_point").value, d.get("dew_point").value
    assert 329.2 - 1 < tb < td < 373.15 + 1
    assert d.get("boiling_point").provenance.method == "mixture-bubble-point"


def test_category_follows_the_un_ghs_criteria_from_flash_and_initial_boiling_point(make_entries):
    derived, _ = _derive(make_entries, {"acetone.yaml": ACETONE, "water.yaml": WATER,
                                        "wash.yaml": BLEND.format(acetone="30 % w/w", water="balance")})
    d = derived["wash"]
    fp, ibp = d.get("flash_point").value - 273.15, d.get("boiling_point").value - 273.15
    # UN GHS Rev. 10, 2.6.2: category 1 FP < 23 °C and IBP <= 35 °C; 2 FP < 23 °C and IBP > 35 °C;
    # 3 FP 23–60 °C
    expected = 1 if fp < 23 and ibp <= 35 else 2 if fp < 23 else 3 if fp <= 60 else None
    assert d.label("flammable_category").code == expected
    assert d.label("volatility_band") is not None


def test_ranges_are_carried_to_the_worst_case(make_entries):
    """A ranged mixture reports the lowest bubble and flash points and the highest vapor pressure of
    the exact mixtures at the ends of its ranges, each derived on its own."""
    files = {"acetone.yaml": ACETONE, "water.yaml": WATER,
             "wash.yaml": BLEND.format(acetone="20-40 % w/w", water="balance"),
             "low.yaml": BLEND.format(acetone="20 % w/w", water="balance").replace("Acetone wash", "Low"),
             "high.yaml": BLEND.format(acetone="40 % w/w", water="balance").replace("Acetone wash", "High")}
    derived, _ = _derive(make_entries, files)
    ranged, ends = derived["wash"], (derived["low"], derived["high"])
    assert ranged.mixture.ranged
    assert ranged.get("boiling_point").value == pytest.approx(min(e.get("boiling_point").value for e in ends), abs=1e-6)
    assert ranged.get("vapor_pressure_20C").value == pytest.approx(max(e.get("vapor_pressure_20C").value for e in ends),
                                                                   rel=1e-9)
    assert ranged.get("flash_point").value == pytest.approx(min(e.get("flash_point").value for e in ends), abs=1e-6)
    assert "lowest over the composition ranges" in ranged.get("boiling_point").provenance.note


def test_stated_flash_point_wins(make_entries):
    blend = BLEND.format(acetone="30 % w/w", water="balance") + \
        "properties:\n  flash_point: {value: 5 °C, source: lab, method: closed cup}\n"
    derived, _ = _derive(make_entries, {"acetone.yaml": ACETONE, "water.yaml": WATER, "wash.yaml": blend})
    d = derived["wash"]
    assert d.get("flash_point").value == pytest.approx(278.15)
    assert d.get("flash_point").kind == "measured"
    assert d.get("flash_point_estimate").provenance.method == "liaw-mixture-flash-point"


def test_a_nested_mixture_is_opened_into_its_components(make_entries):
    inner = BLEND.format(acetone="50 % w/w", water="balance").replace("Acetone wash", "Inner")
    outer = """\
name: Outer
type: mixture
composition:
  - component: inner
    fraction: 50 % w/w
  - component: acetone
    fraction: balance
"""
    flat = BLEND.format(acetone="75 % w/w", water="balance").replace("Acetone wash", "Flat")
    derived, _ = _derive(make_entries, {"acetone.yaml": ACETONE, "water.yaml": WATER, "inner.yaml": inner,
                                        "outer.yaml": outer, "flat.yaml": flat})
    mass = {}
    for r in derived["outer"].mixture.rows:
        mass[r.entry_id] = mass.get(r.entry_id, 0.0) + r.mass_fraction.value
    assert mass == pytest.approx({"acetone": 75.0, "water": 25.0})
    # the same substances in the same amounts boil alike, however the composition is written
    assert derived["outer"].get("boiling_point").value == pytest.approx(derived["flat"].get("boiling_point").value,
                                                                       abs=0.05)


def test_pages_link_components_both_ways_and_draw_the_boiling_diagram(make_entries, tmp_path):
    folder = make_entries({"acetone.yaml": ACETONE, "water.yaml": WATER,
                           "wash.yaml": BLEND.format(acetone="30 % w/w", water="balance")})
    out = tmp_path / "site"
    assert main(["build", "--entries", str(folder), "--out", str(out), "--quiet"]) == 0
    page = (out / "materials" / "wash.html").read_text(encoding="utf-8")
    assert "Composition" in page and 'href="acetone.html"' in page
    assert "mixture-wash-txy.svg" in page
    assert (out / "charts" / "mixture-wash-txy.svg").read_text(encoding="utf-8").startswith("<?xml")
    component = (out / "materials" / "acetone.html").read_text(encoding="utf-8")
    assert "Contained in" in component and 'href="wash.html"' in component
    data = json.loads((out / "data" / "wash.json").read_text(encoding="utf-8"))["entry"]
    assert {r["id"] for r in data["composition"]} == {"acetone", "water"}
    assert data["bubble_point"]["unit"] == "K" and data["dew_point"]["provenance"]["kind"] == "estimated"
    index = (out / "index.html").read_text(encoding="utf-8")
    assert 'href="materials/wash.html"' in index


def test_profile_mix_json(capsys):
    assert main(["profile", "--mix", "CCO=40 % w/w", "--mix", "O=balance", "--json"]) == 0
    result = json.loads(capsys.readouterr().out)
    for key in ("composition", "bubble_point", "dew_point", "vapor_composition_20C", "flash_point",
                "flammable_category", "handling_notes"):
        assert key in result, key
    assert result["bubble_point"]["unit"] == "K" and result["bubble_point"]["uncertainty"] > 0
    assert result["bubble_point"]["provenance"]["kind"] == "estimated"
    assert sum(v["value"] for v in result["vapor_composition_20C"].values()) == pytest.approx(100.0, abs=1e-6)
    # 40 % w/w ethanol in water starts to boil near 83 °C (ethanol–water vapor–liquid equilibrium at
    # 101.325 kPa, handbook tables, from memory). Inline structures carry no stated data, so ethanol's
    # boiling point is itself an estimate: the measured figure must lie within two standard uncertainties.
    bp = result["bubble_point"]
    assert abs(bp["value"] - 356.2) <= 2 * bp["uncertainty"]


def test_profile_mix_refuses_bad_compositions(capsys):
    assert main(["profile", "--mix", "CCO=60 % w/w", "--mix", "O=50 % w/w", "--json"]) == 1
    assert "add up to 110 %" in json.loads(capsys.readouterr().out)["error"]
    assert main(["profile", "--mix", "CCO 40 % w/w"]) == 2


def test_new_mix_writes_an_entry_that_builds(make_entries, tmp_path, capsys):
    folder = make_entries({"acetone.yaml": ACETONE, "water.yaml": WATER})
    assert main(["new", "Rinse blend", "--entries", str(folder), "--mix", "acetone=10-20 % w/w",
                 "--mix", "O=balance"]) == 0
    text = (folder / "rinse-blend.yaml").read_text(encoding="utf-8")
    assert "type: mixture" in text and "component: acetone" in text and "smiles: 'O'" in text
    catalog, diags = load_catalog(folder)
    assert catalog is not None, [str(d) for d in diags]
    assert main(["new", "Bad blend", "--entries", str(folder), "--mix", "acetone=90 % w/w",
                 "--mix", "O=20 % w/w"]) == 1


def test_ideal_fallback_is_raoult_exactly():
    """With no activity model the bubble pressure is Σ x_i P_i and y_i = x_i P_i / P (Raoult 1887)."""
    psats = [lambda T: 1.0e5 * math.exp(10 * (1 - 330.0 / T)), lambda T: 1.0e5 * math.exp(12 * (1 - 370.0 / T))]
    x = [0.3, 0.7]
    p, y = vle.bubble_pressure(300.0, x, psats, None)
    expected = [xi * f(300.0) for xi, f in zip(x, psats)]
    assert p == pytest.approx(sum(expected), rel=1e-12)
    assert list(y) == pytest.approx([e / sum(expected) for e in expected], rel=1e-12)


def test_mixture_datasheet_via_profile_has_notes_and_alerts():
    # diethyl ether carries the peroxide-former alert; in a mixture it is carried with its concentration
    result = profile_mixture(composition_of_pairs([("CCOCC", "30 % w/w"), ("CCCCCCC", "balance")]))
    texts = [a["text"] for a in result["hazard_alerts"]]
    assert any(t.startswith("CCOCC (30 % w/w)") for t in texts), texts
