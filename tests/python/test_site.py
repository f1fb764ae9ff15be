"""A site (docs/model.md §18.4, docs/case-format.md "Sites"): the Python acidload.Site against the
program's site.json, a site read from a dict against the same site read from its file, errors with
their place, and hand checks of what the site form promises: the gas record laid on each engine's
running hours, gas shares by flow, shared costs split so that they sum to the site's, and a site of one
engine equal to that engine's own case. The sites are invented."""
import copy
import json
import math
import subprocess

import pytest

from conftest import ROOT, acidload_program, need, need_acidload

DEMO = ROOT / "cases" / "demo-landfill-site.yaml"


def close(a, b, rel=1e-9, path="site"):
    """Every number of the program's JSON (kebab-case keys) equals Python's (snake case)."""
    if isinstance(a, dict):
        for k, v in a.items():
            close(v, b[k] if k in b else b[k.replace("-", "_")], rel, f"{path}.{k}")  # cost items keep their names
    elif isinstance(a, list):
        assert len(a) == len(b), path
        for i, (x, y) in enumerate(zip(a, b)):
            close(x, y, rel, f"{path}[{i}]")
    elif isinstance(a, float) or isinstance(b, float):
        assert a is not None and b is not None and math.isclose(a, b, rel_tol=rel, abs_tol=1e-12), (path, a, b)
    else:
        assert a == b, (path, a, b)


def run_program(*args):
    return subprocess.run([str(acidload_program()), *args], capture_output=True, text=True, timeout=300)


def test_python_site_equals_the_programs_site_json(tmp_path):
    acidload = need_acidload()
    out = tmp_path / "out"
    r = run_program("run", str(DEMO), "--out", str(out))
    assert r.returncode == 0, r.stderr
    j = json.loads((out / "site.json").read_text(encoding="utf-8"))
    py = acidload.Site(DEMO).run()
    assert [e["name"] for e in j["engines"]] == py.engine_names == ["engine 1", "engine 2", "engine 3"]
    for e in j["engines"]:
        close(e, py.engines[e["name"]], path=e["name"])
    for k, s in enumerate(j["stages"]):
        close(s, py.site["stages"][k], path=f"stages[{k}]")
    close(j["shared-per-year"], py.site["shared_per_year"])
    assert math.isclose(j["total-per-year"], py.site["total_per_year"], rel_tol=1e-9)
    assert math.isclose(j["raw-gas"]["mean-h2s-flow-mol-per-h"], py.site["mean_h2s_flow_mol_per_h"], rel_tol=1e-9)
    assert math.isclose(j["sulfur-mol"]["raw"], py.site["sulfur_raw_mol"], rel_tol=1e-9)
    # the program's tables name the same figures
    engines_csv = (out / "engines.csv").read_text().splitlines()
    assert engines_csv[0].startswith("engine,gas_share,") and len(engines_csv) == 4
    assert (out / "train.csv").read_text().startswith("stage,kind,changeouts,")


def test_costs_of_a_site_prints_every_engine_and_writes_the_same_json(tmp_path):
    out = tmp_path / "costs"
    r = run_program("costs", str(DEMO), "--out", str(out))
    assert r.returncode == 0, r.stderr
    for name in ("engine 1", "engine 2", "engine 3", "total per MWh", "Shared train"):
        assert name in r.stdout
    j = json.loads((out / "site.json").read_text())
    assert len(j["engines"]) == 3
    assert run_program("check", str(DEMO)).returncode == 0


def test_a_site_from_a_dict_is_the_site_from_its_file():
    acidload = need_acidload()
    yaml = need("yaml")
    data = yaml.safe_load(DEMO.read_text(encoding="utf-8"))
    a = acidload.Site(DEMO).run()
    b = acidload.Site(data, base_dir=ROOT / "cases").run()
    for name in a.engine_names:
        assert a.engines[name] == b.engines[name]
    assert a.site == b.site


def test_errors_name_their_place_in_a_file_and_their_key_in_a_dict(tmp_path):
    acidload = need_acidload()
    yaml = need("yaml")
    bad = tmp_path / "bad-site.yaml"
    bad.write_text(DEMO.read_text().replace("h2s: 350 ppmv", "h2s: 350 ppmw"))
    with pytest.raises(acidload.InputError) as e:
        acidload.Site(bad)
    assert e.value.file.endswith("bad-site.yaml") and e.value.line is not None and "ppmv" in e.value.expected
    data = yaml.safe_load(DEMO.read_text())
    data["site"]["engines"][1]["economics"] = {"iron-oxide-price": "2 per kg"}  # the train's price: the site's
    with pytest.raises(acidload.InputError) as e:
        acidload.Site(data, base_dir=ROOT / "cases")
    assert e.value.key == "site.engines[1].economics.iron-oxide-price" and e.value.line is None
    with pytest.raises(acidload.InputError):  # a site file is not a case
        acidload.load_case(DEMO)


BASE = {
    "fuel": {"composition": {"CH4": "55 %", "CO2": "45 %"}, "h2s": "200 ppmv"},
    "engine": {"rated-power": "1 MW", "electrical-efficiency": "40 %", "load": "100 %"},
    "oil": {"volume": "600 L"},
    "limits": {"max-hours": "8000 h"},
}


def site(engines, gas=None, train=None, economics=None):
    d = copy.deepcopy(BASE)
    d["site"] = {"name": "test site (invented)", "engines": engines}
    if gas:
        d["site"]["gas-record"] = {"segments": gas}
    if train:
        d["scrubbing"] = {"stages": train}
    if economics:
        d["economics"] = economics
    return d


def test_the_gas_record_is_laid_on_each_engine_s_running_hours():
    """docs/case-format.md, "Sites": engine hour t meets the gas of the site clock's hour t. Hand:
    an engine of 2000 h over 1000 h at 100 ppmv and 1000 h at 400 ppmv sees (100 + 400)/2 = 250 ppmv;
    one of 1000 h sees 100 ppmv only; with no train the engine's H2S is the raw gas's."""
    acidload = need_acidload()
    gas = [{"hours": "1000 h", "h2s": "100 ppmv"}, {"hours": "1000 h", "h2s": "400 ppmv"}]
    r = acidload.Site(site([{"name": "a", "record": {"segments": [{"hours": "1500 h"}, {"hours": "500 h", "load": "80 %"}]}},
                            {"name": "b", "record": {"segments": [{"hours": "1000 h"}]}}], gas=gas)).run()
    assert math.isclose(r.engines["a"]["mean_h2s_ppmv"], 250, rel_tol=1e-9)
    assert math.isclose(r.engines["b"]["mean_h2s_ppmv"], 100, rel_tol=1e-9)
    with pytest.raises(acidload.InputError) as e:  # a record past the gas record's end
        acidload.Site(site([{"name": "c", "record": {"segments": [{"hours": "2500 h"}]}}], gas=gas))
    assert "no longer than the site's gas record" in str(e.value)


def test_gas_shares_follow_the_flows_and_shared_costs_sum_to_the_site_s():
    """Same gas and efficiency: the fuel flow is proportional to the power (docs/model.md §4), so the
    gas share of engine i is P_i·h_i / Σ P_j·h_j (hand); the shared items split by share sum to the site's."""
    acidload = need_acidload()
    engines = [{"name": "a", "engine": {"load": "100 %"}, "record": {"segments": [{"hours": "4000 h"}]}},
               {"name": "b", "engine": {"load": "50 %"}, "record": {"segments": [{"hours": "4000 h"}]}},
               {"name": "c", "engine": {"load": "80 %"}, "record": {"segments": [{"hours": "2000 h"}]}}]
    train = [{"name": "bed", "kind": "iron-oxide", "bed-mass": "2 t", "changeout-at": "20 ppmv", "capital": 20000}]
    econ = {"currency": "EUR", "iron-oxide-price": "1 per kg", "disposal-price": "0.3 per kg", "changeout-labour": 500,
            "oil-price": "3 per L"}
    r = acidload.Site(site(engines, train=train, economics=econ)).run()
    energy = {"a": 1.0 * 4000, "b": 0.5 * 4000, "c": 0.8 * 2000}
    for n, e in r.engines.items():
        assert math.isclose(e["gas_share"], energy[n] / sum(energy.values()), rel_tol=1e-9), n
    shared = ("media", "media-disposal", "changeout-labour", "consumables", "capital")  # docs/model.md §18.4
    assert r.site["shared_per_year"]["media"] > 0 and r.site["shared_per_year"]["oil-changes"] == 0
    for item in shared:
        v = r.site["shared_per_year"][item]
        assert math.isclose(sum(e["per_year"][item] for e in r.engines.values()), v, rel_tol=1e-9, abs_tol=1e-9), item
    assert r.site["sulfur_balance_error"] < 1e-9


def test_a_site_of_one_engine_is_that_engine_s_case():
    """docs/model.md §18.4: a site of one engine is exactly that engine's case (the case path,
    acidload.costs, is separate code: studies/economics.cpp)."""
    acidload = need_acidload()
    train = [{"name": "bed", "kind": "iron-oxide", "bed-mass": "3 t", "changeout-at": "30 ppmv", "capital": 40000}]
    econ = {"currency": "EUR", "iron-oxide-price": "1.1 per kg", "oil-price": "3 per L", "oil-change-labour": 400,
            "changeout-labour": 700, "electricity-price": "100 per MWh", "oil-change-downtime": "6 h"}
    one = acidload.Site(site([{"name": "only", "record": {"segments": [{"hours": "6000 h"}]}}], train=train, economics=econ)).run()
    case = copy.deepcopy(BASE)
    case.update({"scrubbing": {"stages": train}, "economics": econ, "record": {"segments": [{"hours": "6000 h"}]}})
    c = acidload.costs(acidload.case_from_dict(case))
    e = one.engines["only"]
    assert math.isclose(e["total_per_year"], c.summary["variants"][0]["total-per-year"], rel_tol=1e-9)
    for item, v in c.per_year()["base"].items():
        assert math.isclose(e["per_year"][item], v, rel_tol=1e-9, abs_tol=1e-9), item


def test_the_program_s_exit_codes_for_a_site():
    bad_usage = run_program("run", str(DEMO), "--overlay", str(DEMO))
    assert bad_usage.returncode == 2 and "site file" in bad_usage.stderr  # a usage error
    fleet = run_program("run", str(ROOT / "cases" / "demo-site.yaml"), str(DEMO))
    assert fleet.returncode == 3 and "demo-landfill-site.yaml:" in fleet.stderr and not fleet.stdout  # a site runs alone
    assert run_program("costs", str(DEMO), "--monte-carlo").returncode == 2


def test_the_schema_takes_the_demo_site_and_refuses_what_the_site_reader_refuses():
    yaml = need("yaml")
    jsonschema = need("jsonschema")
    validator = jsonschema.Draft202012Validator(json.loads((ROOT / "docs" / "case-format.schema.json").read_text()))
    good = yaml.safe_load(DEMO.read_text())
    assert not list(validator.iter_errors(good))
    for mutate in (
        lambda d: d.__setitem__("variants", [{"name": "x"}]),                    # no variants in a site file
        lambda d: d.__setitem__("lab", {"precision": {"tan": "0.1 mg KOH/g"}}),  # no lab settings in a site file
        lambda d: d["site"]["engines"][0].__setitem__("fuel", {"h2s": "5 ppmv"}),  # one gas supply
        lambda d: d["site"]["engines"][0].pop("name"),                           # every engine named
        lambda d: d["site"]["gas-record"]["segments"][0].__setitem__("load", "50 %"),  # gas figures only
    ):
        bad = copy.deepcopy(good)
        mutate(bad)
        assert list(validator.iter_errors(bad)), mutate
