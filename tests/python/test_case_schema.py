"""The JSON Schema of the case format against the shipped cases and the format's reference page."""
import json
import re

from conftest import ROOT, need


def load_schema():
    return json.loads((ROOT / "docs" / "case-format.schema.json").read_text(encoding="utf-8"))


def shipped_cases():
    return sorted((ROOT / "cases").glob("*.yaml")) + sorted((ROOT / "tests" / "cases").rglob("*.yaml"))


def test_shipped_cases_validate_against_the_schema():
    yaml = need("yaml")
    jsonschema = need("jsonschema")
    schema = load_schema()
    jsonschema.Draft202012Validator.check_schema(schema)
    validator = jsonschema.Draft202012Validator(schema)
    cases = shipped_cases()
    assert len(cases) >= 3
    for path in cases:
        data = yaml.safe_load(path.read_text(encoding="utf-8"))
        errors = sorted(validator.iter_errors(data), key=lambda e: list(e.path))
        assert not errors, f"{path}: " + "; ".join(f"{list(e.path)}: {e.message}" for e in errors[:5])


def test_schema_refuses_what_the_reader_refuses():
    yaml = need("yaml")
    jsonschema = need("jsonschema")
    validator = jsonschema.Draft202012Validator(load_schema())
    good = yaml.safe_load((ROOT / "tests" / "cases" / "format-v1" / "minimal.yaml").read_text())
    assert not list(validator.iter_errors(good))
    for mutate in (
        lambda d: d["engine"].__setitem__("power", "600 L"),       # wrong kind of unit
        lambda d: d["fuel"].__setitem__("h2z", "300 ppmv"),        # unknown key
        lambda d: d.__setitem__("format-version", 7),              # newer version
        lambda d: d["oil"].__setitem__("tbn-method", "D664"),      # not a base-number method
    ):
        bad = json.loads(json.dumps(good))
        mutate(bad)
        assert list(validator.iter_errors(bad)), mutate


def test_every_documented_key_is_in_the_schema():
    doc = (ROOT / "docs" / "case-format.md").read_text(encoding="utf-8")
    schema_text = json.dumps(load_schema())
    keys = set(re.findall(r"^\| `([a-z0-9-]+)`", doc, flags=re.M))
    assert len(keys) > 50
    missing = [k for k in keys if f'"{k}"' not in schema_text]
    assert not missing, f"documented but not in the schema: {missing}"
