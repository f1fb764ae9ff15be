"""The registry of case keys (acidload/io/keys.hpp) against what is derived from it or must agree
with it: the key tables of docs/case-format.md (written by scripts/case-keys), the JSON Schema
docs/case-format.schema.json, and the parameter names of fit and uncertainty."""
import json
import os
import pathlib
import subprocess
import sys

from conftest import ROOT, need_acidload


def registry():
    return need_acidload()._core.case_keys()


def by_section():
    out = {}
    for k in registry():
        out.setdefault(k["section"], {})[k["key"]] = k
    return out


def schema_sections():
    s = json.loads((ROOT / "docs" / "case-format.schema.json").read_text(encoding="utf-8"))
    d = s["$defs"]
    ref_state = [a for a in s["properties"]["reference-state"]["anyOf"] if a.get("type") == "object"][0]
    sections = {"": s["properties"], "reference-state": ref_state["properties"]}
    for name in ("fuel", "engine", "oil", "model", "limits", "run", "record", "segment", "uncertainty", "uncertain-input",
                 "scrubbing", "stage", "economics", "site", "gas-record", "gas-segment", "site-engine", "lab", "precision",
                 "lab-entry", "alarm-level"):
        sections[name] = d[name]["properties"]
    return sections


def test_the_page_s_key_tables_are_the_registry_s():
    acidload = need_acidload()
    env = dict(os.environ, PYTHONPATH=str(pathlib.Path(acidload.__file__).parent.parent))
    r = subprocess.run([sys.executable, str(ROOT / "scripts" / "case-keys"), "--check"], env=env,
                       capture_output=True, text=True, timeout=60)
    assert r.returncode == 0, r.stderr


def test_the_schema_has_every_key_of_the_registry_and_no_other():
    reg = by_section()
    for section, props in schema_sections().items():
        assert set(props) == set(reg[section]), (section, set(props) ^ set(reg[section]))


def test_the_schema_gives_each_key_its_kind_and_words():
    sections = schema_sections()
    for k in registry():
        prop = sections[k["section"]][k["key"]]
        if k["type"] == "quantity":
            if k["kind"] == "count":  # a bare count: an integer, or a number
                assert prop.get("type") == "integer" or prop.get("$ref") == "#/$defs/number", (k["path"], prop)
            else:  # the kind, or the kind beside a key's own notations (blow-by as a flow, starts per week)
                refs = [prop.get("$ref")] + [a.get("$ref") for a in prop.get("anyOf", [])]
                assert f"#/$defs/{k['kind']}" in refs, (k["path"], prop)
        elif k["type"] == "word":
            assert prop.get("enum") == k["words"], (k["path"], prop)
        elif k["type"] == "contaminant":
            assert prop.get("$ref") == "#/$defs/contaminant", (k["path"], prop)
        elif k["type"] == "section":
            assert "$ref" in prop, (k["path"], prop)
        elif k["type"] == "list":
            assert prop.get("type") == "array", (k["path"], prop)


def test_uncertainty_parameters_are_the_calibratable_keys_and_the_prices():
    calibratable = [k["path"] for k in registry() if k["calibratable"]]
    prices = list(need_acidload()._core.price_keys())  # the prices a cost Monte Carlo varies (studies/economics)
    assert all(p in {k["path"] for k in registry()} for p in prices)
    enum = schema_sections()["uncertain-input"]["parameter"]["enum"]
    assert sorted(enum) == sorted(calibratable + prices)


def test_fit_parameters_are_the_calibratable_keys():
    # the names fit (--parameters) and uncertainty accept are the parameter table's
    # (studies/parameters.cpp); the registry's calibratable rows must be exactly those, oil.consumption
    # included, and a name either side lacks fails here
    acidload = need_acidload()
    calibratable = [k["path"] for k in registry() if k["calibratable"]]
    fit = list(acidload._core.parameter_keys())
    assert len(set(fit)) == len(fit) and len(set(calibratable)) == len(calibratable)
    assert set(fit) == set(calibratable), {"only in the parameter table": set(fit) - set(calibratable),
                                           "only in the registry": set(calibratable) - set(fit)}
    assert "oil.consumption" in calibratable


def test_solve_levers_set_calibratable_keys():
    # each lever of solve sets one case key, the same one fit and uncertainty vary under that name
    acidload = need_acidload()
    calibratable = {k["path"] for k in registry() if k["calibratable"]}
    levers = dict(acidload._core.lever_keys())
    assert set(levers) == {"h2s", "fresh-tbn", "jacket-water-out", "oil-volume"}
    assert set(levers.values()) <= calibratable, set(levers.values()) - calibratable
    assert set(levers.values()) <= set(acidload._core.parameter_keys())


def test_alternatives_are_pairs():
    reg = {k["path"]: k for k in registry()}
    for k in reg.values():
        if k["alternative"]:
            other = reg[f"{k['section']}.{k['alternative']}" if k["section"] else k["alternative"]]
            assert other["alternative"] == k["key"], k["path"]


def test_the_schema_s_alarm_quantities_are_the_reader_s():
    # the reader lists the quantities it takes alarm levels for when it refuses another (case_lab.cpp)
    acidload = need_acidload()
    text = ("format-version: 1\nfuel:\n  composition: {CH4: 55 %, CO2: 45 %}\nengine:\n  power: 1 MW\n"
            "  electrical-efficiency: 40 %\noil:\n  volume: 600 L\nlab:\n  alarm-levels:\n    zz: {caution: 1, critical: 2}\n")
    try:
        acidload.load_case_text(text)
    except acidload.InputError as e:
        listed = str(e).split("one of: ", 1)[1].split("\n")[0].split(" (closest")[0].split(", ")
    else:
        raise AssertionError("an unknown alarm quantity was accepted")
    s = json.loads((ROOT / "docs" / "case-format.schema.json").read_text(encoding="utf-8"))
    assert s["$defs"]["lab"]["properties"]["alarm-levels"]["propertyNames"]["enum"] == listed


def test_the_schema_gives_each_calibratable_key_its_prior():
    # each calibratable key's weak prior (σ in fit space and its basis) lives with the key in the
    # registry; the schema's description of the key must say the same
    sections = schema_sections()
    for k in registry():
        if not k["calibratable"]:
            assert k["prior_sd"] == 0 and not k["prior_basis"], k["path"]
            continue
        sd = "ln 10" if abs(k["prior_sd"] - 2.302585092994046) < 1e-12 else f"{k['prior_sd']:g}"
        assert k["prior_sd"] > 0 and k["prior_basis"], k["path"]
        want = f"calibratable; fit prior σ {sd} in {k['prior_space']} around the case's value: {k['prior_basis']}"
        assert sections[k["section"]][k["key"]].get("description") == want, k["path"]


def test_the_fit_uses_the_registry_s_prior():
    # the prior row a fit minimises, (φ − φ0)/σ0 (fit_residuals, docs/lab-results.md), uses the
    # registry's σ: a step of 1.5 σ in fit space from the case's value gives a prior row of exactly 1.5
    acidload = need_acidload()
    case = acidload.load_case(ROOT / "cases" / "demo-site-history.yaml")
    lab = ROOT / "cases" / "demo-site-lab.csv"
    reg = {k["path"]: k for k in registry()}
    for key in ("model.liner-uptake", "model.induction-time", "oil.volume", "model.so3-share"):
        phi0 = acidload._core.to_fit_space(key, acidload._core.get_parameter(case.variant()._engine_case, key))
        r = acidload.fit_residuals(case, lab, [key], [phi0 + 1.5 * reg[key]["prior_sd"]])
        assert abs(r[-1] - 1.5) < 1e-9, (key, r[-1])
