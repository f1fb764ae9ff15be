"""Properties of a site (docs/model.md §18.4; docs/case-format.md, "Sites"), over invented sites of
random engines in the accepted ranges (none is measured):

  - adding an engine never lengthens the shared bed's changeout interval (the first bed's life and
    the running hours per bed): the bed loads with the summed gas flow, which only grows;
  - for a constant inlet the first bed's life is the hand formula of docs/model.md §18.3–18.4,
    t* = φ*·q₀·M / (η·Σṅ_H2S·M_S) with φ* = 1 − ln(1/F* − 1)/β, F* = (level/inlet − (1 − η))/η,
    β = 2·ln 9 / w, so it scales as 1/Σflow; M_S = 32.06 g/mol (IUPAC standard atomic weight of S);
  - a mutated site file is either read or refused with an InputError naming its file, line and
    column — never another exception."""
import copy
import importlib.util
import math
import pathlib

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

_spec = importlib.util.spec_from_file_location(
    "acidload_suite_helpers", pathlib.Path(__file__).resolve().parents[1] / "python" / "conftest.py")
_helpers = importlib.util.module_from_spec(_spec)
_spec.loader.exec_module(_helpers)
need, need_acidload = _helpers.need, _helpers.need_acidload

acidload = need_acidload()

PROPERTY = settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
ROOT = pathlib.Path(__file__).resolve().parents[2]
M_S = 0.03206  # kg/mol, sulfur (IUPAC standard atomic weight 32.06)


def figure(lo, hi):
    return st.floats(lo, hi, allow_nan=False, allow_infinity=False).map(lambda x: float(f"{x:.6g}"))


engine = st.fixed_dictionaries({"power_kw": figure(100, 3000), "eff": figure(30, 45), "hours": figure(500, 8000)})


def site(engines, h2s, bed, hours=None):
    """A site dict: `engines` [{power_kw, eff, hours}], constant raw gas of `h2s` ppmv, one iron-oxide bed."""
    return {
        "fuel": {"composition": {"CH4": "55 %", "CO2": "45 %"}, "h2s": f"{h2s} ppmv"},
        "engine": {"electrical-efficiency": "40 %"},
        "oil": {"volume": "600 L"},
        "scrubbing": {"stages": [{"name": "bed", "kind": "iron-oxide", "bed-mass": f"{bed['mass_kg']} kg",
                                  "capacity": f"{bed['q0']} kg/kg", "efficiency": f"{bed['eta']} %",
                                  "breakthrough-width": f"{bed['width']} %", "changeout-at": f"{bed['level']} ppmv"}]},
        "site": {"name": "property site (invented)", "engines": [
            {"name": f"e{i}", "engine": {"power": f"{e['power_kw']} kW", "electrical-efficiency": f"{e['eff']} %"},
             "record": {"segments": [{"hours": f"{hours or e['hours']} h"}]}} for i, e in enumerate(engines)]},
    }


beds = st.fixed_dictionaries({"mass_kg": figure(50, 5000), "q0": figure(0.05, 0.5), "eta": figure(90, 99.9),
                              "width": figure(5, 60), "level_share": figure(0.2, 0.9)})


def bed_of(b, h2s):
    # a changeout level above what the fresh bed lets through, (1 − η)·inlet, and below the inlet
    fresh = (1 - b["eta"] / 100) * h2s
    return dict(b, level=float(f"{fresh + b['level_share'] * (h2s - fresh):.6g}"))


def first_life(r):
    return r.site["stages"][0]["first_bed_life_h"]


@PROPERTY
@given(st.lists(engine, min_size=1, max_size=4), engine, figure(50, 3000), beds)
def test_adding_an_engine_never_lengthens_the_bed_interval(engines, extra, h2s, b):
    bed = bed_of(b, h2s)
    common = max(e["hours"] for e in engines)  # the site's engines run the same hours; the new one no longer
    extra = dict(extra, hours=min(extra["hours"], common))
    a = acidload.Site(site(engines, h2s, bed, hours=common)).run()
    d = site(engines, h2s, bed, hours=common)
    d["site"]["engines"].append(site([extra], h2s, bed)["site"]["engines"][0] | {"name": "added"})
    more = acidload.Site(d).run()
    la, lb = first_life(a), first_life(more)
    if lb is None:
        assert la is None  # the bed outlasts the record with more gas: so with less
    elif la is not None:
        assert lb <= la * (1 + 1e-9)
    assert more.site["stages"][0]["bed_interval_h"] <= a.site["stages"][0]["bed_interval_h"] * (1 + 1e-9)


@PROPERTY
@given(st.lists(engine, min_size=1, max_size=5), figure(50, 3000), beds)
def test_the_first_bed_life_is_the_hand_formula_and_scales_with_the_total_flow(engines, h2s, b):
    bed = bed_of(b, h2s)
    big = dict(bed, mass_kg=float(f"{bed['mass_kg'] * 1e3:.6g}"))  # so that the first bed ends inside the record
    r = acidload.Site(site(engines, h2s, big, hours=8000)).run()
    flow = r.site["mean_h2s_flow_mol_per_h"]  # Σṅ_H2S [mol/h]: each engine's fuel flow × the H2S mole fraction
    # the summed flow is the sum of each engine's alone (the bed loads with the sum: docs/model.md §18.4)
    alone = [acidload.Site(site([e], h2s, big, hours=8000)).run().site["mean_h2s_flow_mol_per_h"] for e in engines]
    assert math.isclose(flow, sum(alone), rel_tol=1e-9)
    eta, beta = bed["eta"] / 100, 2 * math.log(9) / (bed["width"] / 100)
    f_star = (bed["level"] / h2s - (1 - eta)) / eta
    phi_star = 1 - math.log(1 / f_star - 1) / beta
    hand = phi_star * bed["q0"] * big["mass_kg"] / (eta * flow * M_S)
    life = first_life(r)
    if hand < 8000 * 0.999:
        assert life is not None and math.isclose(life, hand, rel_tol=2e-3), (life, hand)  # M_S to 4 digits
    elif hand > 8000 * 1.001:
        assert life is None


DEMO = (ROOT / "cases" / "demo-landfill-site.yaml").read_text(encoding="utf-8")
LINES = [i for i, line in enumerate(DEMO.split("\n")) if ":" in line and not line.lstrip().startswith("#")]
HOSTILE = ["-1 h", "abc", "1e999 ppmv", "[]", "{}", "''", "300 ppmw", ".nan", "0", "1e-300 t", "{hours: x}",
           "[{hours: 1 h, h2s: 90 %}]", "- a", "&a x", "*a", "\"\\x00\"", "9e15 h", "-0 kg", "true"]


@PROPERTY
@given(st.sampled_from(LINES), st.sampled_from(HOSTILE))
def test_a_mutated_site_file_is_read_or_refused_with_its_place(line_no, value):
    lines = DEMO.split("\n")
    line = lines[line_no]
    key, _, rest = line.partition(":")
    lines[line_no] = f"{key}: {value}" + ("  # " + rest.split("#", 1)[1] if "#" in rest else "")
    text = "\n".join(lines)
    try:
        acidload._core.load_site_text(text, "mutated-site.yaml", str(ROOT / "cases"))
    except acidload.InputError as e:
        assert e.file == "mutated-site.yaml" and e.line is not None and e.column is not None, (line, value, str(e))
        assert e.expected, (line, value, str(e))
