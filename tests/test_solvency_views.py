"""Hansen parameters on the datasheet, in profile JSON and the exports; the ``substitute`` command;
the solvency page. The estimators themselves are tested in tests/chem/test_hansen.py and
test_solvency.py (against the Hansen sets in ``chemicals`` and hand-computed cases)."""
from __future__ import annotations

import json
import math

import pytest

from builder.chem import solvency
from builder.cli import main
from builder.derive.catalog import derive_catalog
from builder.load.entries import load_catalog

from conftest import DEMO

TOLUENE = """\
name: Toluene
smiles: Cc1ccccc1
properties:
  boiling_point: {value: 110.6 °C, source: crc-95}
  density: {value: 0.8669 g/cm3, source: crc-95}
  hansen: {delta_d: 18.0, delta_p: 1.4, delta_h: 2.0, source: crc-95}
"""
ACETONE = """\
name: Acetone
smiles: CC(C)=O
properties:
  boiling_point: {value: 56.05 °C, source: crc-95}
  density: {value: 0.7845 g/cm3, source: crc-95}
  hansen: {delta_d: 15.5, delta_p: 10.4, delta_h: 7.0, source: crc-95}
"""
BLEND = """\
name: Blend
type: mixture
composition:
  - component: toluene
    fraction: 50 % v/v
  - component: acetone
    fraction: balance
"""


def test_stated_parameters_win_and_a_blend_is_their_volume_average(make_entries):
    # the toluene and acetone sets are C. M. Hansen's handbook values (Hansen 2007, from memory)
    folder = make_entries({"toluene.yaml": TOLUENE, "acetone.yaml": ACETONE, "blend.yaml": BLEND})
    catalog, diags = load_catalog(folder)
    assert catalog is not None, [str(d) for d in diags]
    by_id = {d.entry.id: d for d in derive_catalog(catalog)}
    tol = by_id["toluene"]
    assert tol.get("hansen_delta_d").value == 18.0 and tol.get("hansen_delta_d").kind == "literature"
    shares = [tol.get(f"cohesive_share_{k}").value for k in ("dispersion", "polar", "hbond")]
    assert sum(shares) == pytest.approx(100.0)
    assert shares[0] == pytest.approx(100 * 18.0**2 / (18.0**2 + 1.4**2 + 2.0**2))
    blend = by_id["blend"]
    # 50 % v/v of each, volumes additive (the composition is stated by volume): the plain average
    for key, a, b in (("hansen_delta_d", 18.0, 15.5), ("hansen_delta_p", 1.4, 10.4), ("hansen_delta_h", 2.0, 7.0)):
        assert blend.get(key).value == pytest.approx((a + b) / 2, abs=1e-6), key
        assert blend.get(key).provenance.method == "hansen-blend"


def test_profile_json_carries_hansen_values(capsys):
    assert main(["profile", "CCO", "--json"]) == 0
    result = json.loads(capsys.readouterr().out)
    h = result["hansen"]
    assert set(h) == {"delta_d", "delta_p", "delta_h"}
    for v in h.values():
        assert v["unit"] == "MPa^0.5" and v["provenance"]["kind"] == "estimated" and v["uncertainty"] > 0
    # ethanol: δD 15.8, δP 8.8, δH 19.4 MPa½ (Hansen 2007, from memory): within 3 standard uncertainties
    for key, ref in (("delta_d", 15.8), ("delta_p", 8.8), ("delta_h", 19.4)):
        assert abs(h[key]["value"] - ref) <= 3 * h[key]["uncertainty"], key


@pytest.mark.slow
def test_substitute_on_a_demo_solvent_lists_a_safer_candidate(capsys):
    assert main(["substitute", "toluene", "--entries", str(DEMO), "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    assert out["target"] == "toluene" and out["candidates"]
    assert "one criterion" in out["caution"]
    catalog, _ = load_catalog(DEMO)
    by_id = {d.entry.id: d for d in derive_catalog(catalog)}
    target = by_id["toluene"]
    tp = tuple(target.get(k).value for k in ("hansen_delta_d", "hansen_delta_p", "hansen_delta_h"))
    safer = []
    for c in out["candidates"]:
        if "id" not in c:
            continue
        other = by_id[c["id"]]
        op = tuple(other.get(k).value for k in ("hansen_delta_d", "hansen_delta_p", "hansen_delta_h"))
        # Ra = √(4ΔδD² + ΔδP² + ΔδH²), computed here by hand from the two entries' values
        ra = math.sqrt(4 * (tp[0] - op[0]) ** 2 + (tp[1] - op[1]) ** 2 + (tp[2] - op[2]) ** 2)
        assert c["ra"] == pytest.approx(ra, abs=1e-3) and ra <= out["max_ra"]
        cat_t, cat_o = target.label("flammable_category").code, other.label("flammable_category")
        if cat_o is None or (cat_o.code is not None and cat_o.code > cat_t):
            safer.append(c["id"])
            assert any(b["criterion"] == "flammable_category" for b in c["better"])
    assert safer, "no candidate with a less severe flammable category"


@pytest.mark.slow
def test_substitute_on_a_resin_lists_the_liquids_inside_its_sphere(capsys):
    assert main(["substitute", "hm-alkyd-resin", "--entries", str(DEMO), "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    inside = [m for m in out["liquids"] if m["verdict"] == "inside"]
    assert inside and all(m["red"] < 1 for m in inside)
    assert [m["red"] for m in out["liquids"]] == sorted(m["red"] for m in out["liquids"])
    for m in out["liquids"]:
        assert m["verdict"] == solvency.red_class(m["red"])


def test_site_has_the_solvency_page_and_substitutes(make_entries, tmp_path):
    folder = make_entries({"toluene.yaml": TOLUENE, "acetone.yaml": ACETONE})
    out = tmp_path / "site"
    assert main(["build", "--entries", str(folder), "--out", str(out), "--quiet"]) == 0
    page = (out / "solvency.html").read_text(encoding="utf-8")
    assert "solvency-map.svg" in page and "one criterion" in page
    chart = (out / "charts" / "solvency-map.svg").read_text(encoding="utf-8")
    assert chart.startswith("<svg") and ">Toluene</text>" in chart and ">Acetone</text>" in chart
    sheet = (out / "materials" / "toluene.html").read_text(encoding="utf-8")
    assert "Hansen dispersion parameter" in sheet
    data = json.loads((out / "data" / "toluene.json").read_text(encoding="utf-8"))["entry"]
    assert data["hansen"]["delta_p"]["value"] == 1.4


@pytest.mark.parametrize("blends", [False, True])
def test_leaving_out_the_less_safe_first_changes_no_safer_list(blends):
    """``substitutes_for`` drops the less safe candidates before ranking; the safer list must be
    exactly what ranking everything and then keeping the safer ones gives (the demo catalog,
    every liquid as target, with and without blends), and taking only the first few gives the
    head of that list."""
    from builder.derive import solvency as derived_solvency

    catalog, problems = load_catalog(DEMO)
    assert not [p for p in problems if p.severity == "error"]
    derived = derive_catalog(catalog)
    solvents = derived_solvency.catalog_solvents(derived)
    checked = 0
    for d in derived:
        me = solvents.get(d.entry.id)
        if me is None:
            continue
        fast = derived_solvency.substitutes_for(d, derived, blends=blends, solvents=solvents)
        ranked = solvency.rank_substitutes(me, [s for k, s in solvents.items() if k != me.id],
                                           derived_solvency.DEFAULT_MAX_RA, blends=blends)
        mine = solvency.safety_key(me, 0.0)[:-2]
        slow = [c for c in ranked if c.better
                and solvency.safety_key(derived_solvency._record(c, solvents), c.ra)[:-2] < mine]
        assert fast == slow, d.entry.id
        assert derived_solvency.substitutes_for(d, derived, blends=blends, solvents=solvents, limit=2) == slow[:2]
        checked += bool(slow)
    assert checked >= 3  # the demo has solvents with safer neighbours: the comparison is not empty


@pytest.fixture(scope="module")
def demo():
    catalog, problems = load_catalog(DEMO)
    assert not [p for p in problems if p.severity == "error"]
    derived = derive_catalog(catalog)
    return {d.entry.id: d for d in derived}, derived


def test_a_mixture_without_hazard_statements_carries_its_components_health_statements(demo):
    # the resin reducer declares no hazard statements; its components p-xylene and 2-butoxyethanol
    # do (their entries, from CLP Annex VI): the ranking must not see the mixture as free of them
    from builder.derive import solvency as derived_solvency

    by_id, derived = demo
    reducer = by_id["hm-resin-reducer"]
    assert not reducer.entry.hazard_statements
    parts = [c.entry_id for c in reducer.entry.composition if c.entry_id]
    expected = set()
    for part in parts:
        expected |= {h for h in by_id[part].entry.hazard_statements if h.startswith("H3")}
    assert expected
    record = derived_solvency.catalog_solvents(derived)["hm-resin-reducer"]
    assert record.health_h_codes == expected
    # a substance keeps exactly what it declares
    assert derived_solvency.catalog_solvents(derived)["toluene"].health_h_codes == {
        h for h in by_id["toluene"].entry.hazard_statements if h.startswith("H3")}


def test_no_substitute_list_offers_a_candidate_with_more_serious_health_statements(demo):
    # the safety order puts serious health statements first (builder/chem/solvency.py): no
    # datasheet list may offer, as safer, a liquid with more of them than the target
    from builder.derive import solvency as derived_solvency

    by_id, derived = demo
    solvents = derived_solvency.catalog_solvents(derived)
    relations = derived_solvency._relations(derived, solvents)
    assert relations.substitutes
    for target, found in relations.substitutes.items():
        mine = len(solvency.serious_health(solvents[target].health_h_codes))
        for c in found:
            theirs = len(solvency.serious_health(derived_solvency._record(c, solvents).health_h_codes))
            assert theirs <= mine, (target, c.id)
    # dichloromethane (H351) is offered as safer to none of the liquids without a serious statement
    for target, found in relations.substitutes.items():
        if not solvency.serious_health(solvents[target].health_h_codes):
            assert "dichloromethane" not in [c.id for c in found], target


def test_gases_and_solids_get_no_liquid_molar_volume(demo):
    by_id, _ = demo
    for gas in ("nitrogen", "propane"):
        assert by_id[gas].label("physical_state").code == "gas"
        assert by_id[gas].get("molar_volume") is None, gas
        assert by_id[gas].get("density") is None or by_id[gas].get("density").kind != "estimated", gas
    salt = by_id["potassium-persulfate"]
    assert salt.label("physical_state").code == "solid" and salt.get("density") is not None
    assert salt.get("molar_volume") is None  # its stated density is the solid's
    # a liquid keeps it: molar mass over density
    tol = by_id["toluene"]
    assert tol.get("molar_volume").value == pytest.approx(
        tol.get("molar_mass").value / (tol.get("density").value / 1000.0))


def test_water_states_its_parameters_and_the_resin_lists_every_liquid(demo, capsys):
    # water is outside the structure estimate (no carbon): the demo entry states Hansen's values
    # as shipped in chemicals 1.5.2 (15.5, 16.0, 42.3 MPa½)
    from chemicals.solubility import hansen_delta_d, hansen_delta_h, hansen_delta_p

    by_id, _ = demo
    water = by_id["water"]
    for key, f in (("hansen_delta_d", hansen_delta_d), ("hansen_delta_p", hansen_delta_p),
                   ("hansen_delta_h", hansen_delta_h)):
        assert water.get(key).value == pytest.approx(f("7732-18-5") / 1000.0)
    liquids = {i for i, d in by_id.items() if d.label("physical_state") is not None
               and d.label("physical_state").code == "liquid" and d.entry.hansen_sphere is None}
    assert main(["substitute", "hm-alkyd-resin", "--entries", str(DEMO), "--json"]) == 0
    listed = {m["id"] for m in json.loads(capsys.readouterr().out)["liquids"]}
    assert listed == liquids


@pytest.mark.parametrize("bad", ["-1", "0", "nan", "inf"])
def test_substitute_refuses_a_max_ra_that_is_not_a_positive_number(bad, capsys):
    assert main(["substitute", "toluene", "--entries", str(DEMO), f"--max-ra={bad}"]) == 2
    assert "--max-ra must be a positive number" in capsys.readouterr().err


def test_comparison_text_names_the_codes_a_candidate_drops_or_adds():
    from builder.publish.templating import comparison_text

    target = solvency.Solvent("t", (18.0, 6.3, 6.1), None, None, "high", frozenset(),
                              frozenset({"H315", "H319", "H336", "H351"}))
    cand = solvency.Solvent("c", (17.8, 1.0, 3.1), 300.0, 3, "medium", frozenset(), frozenset({"H312", "H332"}))
    better, worse = solvency.compare(cand, target)
    assert "health H-codes without H315 H319 H336 H351" in comparison_text(better)
    assert "health H-codes adds H312 H332" in comparison_text(worse, worse=True)
    assert "flammable category 3 (this material: none)" in comparison_text(worse, worse=True)


def test_datasheet_shows_the_density_estimated_where_none_is_stated(make_entries, tmp_path):
    # butyl acetate without a stated density: the structure estimate is shown, tagged as estimated,
    # beside the liquid molar volume; within 4 % (about twice the method's mean error against CRC,
    # builder/data/methods.yaml) of the CRC density in chemicals 1.5.2 (CRC_organic_data, 123-86-4)
    import re

    from chemicals.miscdata import CRC_organic_data

    folder = make_entries({"butyl-acetate.yaml": "name: Butyl acetate\nsmiles: CCCCOC(C)=O\nproperties:\n"
                                                 "  boiling_point: {value: 126.1 °C, source: crc-95}\n"})
    out = tmp_path / "site"
    assert main(["build", "--entries", str(folder), "--out", str(out), "--quiet"]) == 0
    sheet = (out / "materials" / "butyl-acetate.html").read_text(encoding="utf-8")
    row = re.search(r'<th scope="row">Density</th>\s*<td>(.*?)</td>', sheet, re.S)
    assert row and "tag-estimated" in row[1]
    shown = float(re.search(r"([\d.]+)(?: ± [\d.]+)? g/cm³", row[1])[1])
    assert shown == pytest.approx(CRC_organic_data.loc["123-86-4", "rho"] / 1000.0, rel=0.04)
    assert re.search(r'<th scope="row">Liquid molar volume</th>', sheet)


@pytest.mark.slow
def test_listed_blends_form_one_liquid_or_say_they_were_not_checked(demo, capsys):
    # p-xylene with water separates (common practice): no such blend is listed, and each listed
    # blend is either one liquid by UNIFAC's gap, moved out of the gap, or marked as not checked
    from builder.derive.blends import MOVED, NOT_CHECKED, ONE_PHASE, blend_separates

    by_id, _ = demo
    assert main(["substitute", "dichloromethane", "--entries", str(DEMO), "--blends", "--json"]) == 0
    out = json.loads(capsys.readouterr().out)
    blends = [c for c in out["candidates"] if "blend" in c]
    assert blends and out["blends_left_out"] >= 1
    assert not [c for c in blends if {i for i, _ in c["blend"]} == {"p-xylene", "water"}]
    seen = set()
    for c in blends:
        verdict = blend_separates(solvency.Candidate(None, tuple((i, phi) for i, phi in c["blend"]), (0, 0, 0), 0.0),
                                  by_id)
        seen.add(c["mixing"])
        assert verdict is not True
        assert (verdict is None) == (c["mixing"] == NOT_CHECKED)
        assert ("optimal_fraction" in c) == (c["mixing"] == MOVED)
        if c["mixing"] == MOVED:  # the optimum itself lay inside the gap
            optimum = ((c["blend"][0][0], c["optimal_fraction"]), (c["blend"][1][0], 1 - c["optimal_fraction"]))
            assert blend_separates(solvency.Candidate(None, optimum, (0, 0, 0), 0.0), by_id) is True
    assert seen == {ONE_PHASE, MOVED, NOT_CHECKED}
    assert main(["substitute", "dichloromethane", "--entries", str(DEMO), "--blends"]) == 0
    assert f"{out['blends_left_out']} blends left out" in capsys.readouterr().out


BUTANOL = """\
name: Butan-1-ol
smiles: CCCCO
properties:
  boiling_point: {value: 117.7 °C, source: crc-95}
  density: {value: 0.8098 g/cm3, source: crc-95}
  hansen: {delta_d: 16.0, delta_p: 5.7, delta_h: 15.8, source: crc-95}
"""
WATER = """\
name: Water
smiles: O
properties:
  boiling_point: {value: 100.0 °C, source: crc-95}
  density: {value: 0.997 g/cm3, source: crc-95}
  hansen: {delta_d: 15.5, delta_p: 16.0, delta_h: 42.3, source: crc-95}
"""


def test_a_blend_whose_best_match_would_separate_moves_to_the_one_phase_edge(make_entries, capsys):
    # An invented target at the 50/50 volume blend of butan-1-ol and water (Hansen values of both
    # as in Hansen's handbook tables, from memory): that composition lies inside their
    # miscibility gap, so the blend moves to the nearer useful edge, water-saturated butanol.
    # Measured at 25 °C the butanol-rich phase holds about 20 % water by mass (common handbook
    # value, from memory): x(butanol) ≈ 0.49, φ(butanol) ≈ 0.83 with the molar volumes above.
    target = """\
name: Invented target
smiles: OCCO
properties:
  boiling_point: {value: 197.3 °C, source: crc-95}
  hansen: {delta_d: 15.75, delta_p: 10.85, delta_h: 29.05, source: crc-95, note: invented}
"""
    folder = make_entries({"butanol.yaml": BUTANOL, "water.yaml": WATER, "target.yaml": target})
    assert main(["substitute", "target", "--entries", str(folder), "--blends", "--max-ra", "12", "--json"]) == 0
    (blend,) = json.loads(capsys.readouterr().out)["candidates"]
    assert blend["mixing"] == "moved to one phase"
    assert blend["optimal_fraction"] == pytest.approx(0.5, abs=0.005)
    fractions = dict(blend["blend"])
    assert fractions["butanol"] == pytest.approx(0.83, abs=0.02)
    # Ra along the blend line is |φ − 0.5| times Ra(butanol, water), by hand
    ra_parts = math.sqrt(4 * 0.5**2 + 10.3**2 + 26.5**2)
    assert blend["ra"] == pytest.approx(abs(fractions["butanol"] - 0.5) * ra_parts, abs=0.01)


def test_cohesive_shares_carry_the_propagated_uncertainty():
    # first-order propagation (JCGM 100:2008 eq. 10) with the sensitivities taken numerically
    # (central differences), against the closed-form derivatives in cohesive_shares
    from builder.core.values import estimated
    from builder.derive.solvency import cohesive_shares

    deltas, us = (18.1, 1.5, 2.5), (0.7, 2.0, 1.9)
    params = {k: estimated(x, "MPa**0.5", "hansen-mathieu-trees", u)
              for k, x, u in zip(("hansen_delta_d", "hansen_delta_p", "hansen_delta_h"), deltas, us)}
    shares = cohesive_shares(params)

    def share(i, xs):
        return 100 * xs[i] ** 2 / sum(x * x for x in xs)

    for i, name in enumerate(("dispersion", "polar", "hbond")):
        grads = []
        for j in range(3):
            hi, lo = list(deltas), list(deltas)
            hi[j] += 1e-6
            lo[j] -= 1e-6
            grads.append((share(i, hi) - share(i, lo)) / 2e-6)
        expected = math.sqrt(sum((g * u) ** 2 for g, u in zip(grads, us)))
        assert shares[f"cohesive_share_{name}"].uncertainty == pytest.approx(expected, rel=1e-6)
    # stated parameters without uncertainty: shares without one
    stated = {k: v.__class__(v.value, v.unit, v.provenance) for k, v in params.items()}
    assert all(v.uncertainty is None for v in cohesive_shares(stated).values())


def test_text_profile_shows_the_hansen_parameters(capsys):
    from builder.core.units import format_value

    assert main(["profile", "CCO", "--json"]) == 0
    h = json.loads(capsys.readouterr().out)["hansen"]
    assert main(["profile", "CCO"]) == 0
    text = capsys.readouterr().out
    for key, label in (("delta_d", "Hansen dispersion parameter δD"), ("delta_p", "Hansen polar parameter δP"),
                       ("delta_h", "Hansen hydrogen-bonding parameter δH")):
        line = next(line for line in text.splitlines() if label in line)
        assert format_value(h[key]["value"], "MPa**0.5", h[key]["uncertainty"]) in line
        assert "[estimated:" in line
