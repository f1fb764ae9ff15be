"""The schema against the case reader, value by value: for every quantity and contaminant key of the
registry, values the reader accepts (every unit of its kind, and the key's own notations: blow-by as a
meter shows it, NOx at an O2 reference, oil consumption from top-up logs, starts per week) validate
against docs/case-format.schema.json, and values the reader refuses for their form do not."""
import copy

import pytest

from conftest import ROOT, need, need_acidload

BASE = {"format-version": 1, "fuel": {"composition": {"CH4": "55 %", "CO2": "45 %"}, "h2s": "300 ppmv"},
        "engine": {"power": "1 MW", "electrical-efficiency": "40 %"}, "oil": {"volume": "600 L"}}
# the key's own notations, beyond its kind's units (case_sections.cpp reads them)
OWN = {
    "engine.blow-by": ["60 L/min", "3.6 m3/h", "0.9 l/min", "200 L/h"],
    "engine.nox": ["500 mg/Nm3 at 5 % O2", "500 mg/Nm3 @ 5% O2", "250 ppm at 5 % O2", "1.2 g/kWh"],
    "oil.consumption": ["0.3 L/h", "0.25 kg/h", "250 g/h", "0.2 g/kWh"],
    "engine.start-every": ["3 per week", "2 per day", "3 /week", "2 /d", "3/week", "2/day", "48 h"],
    "precision.oxidation": ["0.8 A/cm", "0.008 A/0.1mm"],
    "lab-entry.oxidation-baseline": ["1.1 A/cm", "0.011 A/0.1mm"],
    "fuel.chlorine": ["60 mg Cl/Nm3 CH4", "20 mg Cl/Nm3", "20 mg/Nm3"],
    "fuel.h2s": ["300 ppmv", "450 mg/Nm3 dry", "40 ppm wet", "600 mg H2S/Nm3", "70 mg/m3 CH4"],
}
REFUSED = {  # well-formed strings the reader refuses for their form (not their range)
    "engine.blow-by": ["60 L"], "engine.nox": ["500 mg/Nm3"], "oil.consumption": ["0.3 L"],
    "engine.start-every": ["3 per month", "3per week", "3/month"],
    "precision.tan": ["0.1"],  # a precision is written with its unit
    # which species a 'mg X/…' figure may name depends on the key, which the shared contaminant
    # definition of the schema cannot tell: "60 mg F/Nm3" for fuel.chlorine is the reader's to refuse
}


# registry sections that sit inside another section of the file: where their keys go
NESTED = {"precision": ("lab", "precision"), "lab-entry": ("lab", "labs", "Some Lab")}


def with_value(path, value):
    d = copy.deepcopy(BASE)
    section, key = path.split(".")
    node = d
    for part in NESTED.get(section, (section,)):
        node = node.setdefault(part, {})
    node[key] = value
    return d


def reader_accepts(acidload, yaml, data):
    try:
        acidload.load_case_text(yaml.safe_dump(data, allow_unicode=True))
        return True, ""
    except acidload.InputError as e:
        return False, str(e)


def cases():
    acidload = need_acidload()
    out = []
    for k in acidload._core.case_keys():
        if "." not in k["path"] or k["section"] not in ("fuel", "engine", "oil", "model", "limits", "precision", "lab-entry"):
            continue
        if k["type"] == "quantity" and k["kind"] not in ("count", "number", "fraction") and k["default"] not in ("–", "required", ""):
            # the default in each unit of the kind: same figure, another spelling where the unit allows
            out.append((k["path"], k["default"]))
        out += [(k["path"], v) for v in OWN.get(k["path"], [])]
    return out


@pytest.mark.parametrize("path,value", cases())
def test_what_the_reader_accepts_the_schema_accepts(path, value):
    acidload, yaml, jsonschema = need_acidload(), need("yaml"), need("jsonschema")
    import json
    schema = json.loads((ROOT / "docs" / "case-format.schema.json").read_text(encoding="utf-8"))
    data = with_value(path, value)
    ok, why = reader_accepts(acidload, yaml, data)
    if not ok:
        pytest.skip(f"the reader refuses {value!r} here (a range or a combination): {why}")
    errors = list(jsonschema.Draft202012Validator(schema).iter_errors(data))
    assert not errors, (path, value, [e.message for e in errors])


@pytest.mark.parametrize("path,value", [(p, v) for p, vs in REFUSED.items() for v in vs])
def test_what_the_reader_refuses_for_its_form_the_schema_refuses(path, value):
    acidload, yaml, jsonschema = need_acidload(), need("yaml"), need("jsonschema")
    import json
    schema = json.loads((ROOT / "docs" / "case-format.schema.json").read_text(encoding="utf-8"))
    data = with_value(path, value)
    assert not reader_accepts(acidload, yaml, data)[0], (path, value)
    assert list(jsonschema.Draft202012Validator(schema).iter_errors(data)), (path, value)
