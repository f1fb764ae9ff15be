"""The case's `lab` section (docs/lab-results.md "Lab settings in the case"): the default precision
per reading, per-lab precision and FTIR baselines by the lab's name, alarm levels per quantity; and
the precedence a row's *-sd > the call's precision (CLI --precision, Python precision=) > the case's
per-lab > the case's default > the built-in defaults. The expected figures are the ones the test
itself writes into the case, the call and the lab file (a precedence rule checked on inputs, not
on acidload's output); the built-in defaults are those docs/lab-results.md tabulates (D4739 TBN
0.20 mg KOH/g, from memory of the ASTM precision statement's order, docs/references.md [LabPrecision]).
The site and the readings are invented."""
import os
import pathlib
import re
import subprocess

import pytest

from conftest import ROOT, need_acidload

CASE = ROOT / "cases" / "demo-site-history.yaml"
LAB = """charge,oil-hours,lab,tbn [mg KOH/g],tbn-method,tan [mg KOH/g],tan-sd,oxidation [A/cm],oxidation-baseline [A/cm],fe [ppm]
1,250,North Lab,4.51,D4739,1.50,,1.6,,12
1,500,North Lab,3.62,D4739,1.88,0.05,5.4,2.5,14
1,750,South Lab,3.03,D4739,2.26,,5.5,,16
2,250,South Lab,4.13,D4739,1.53,,2.2,,18
2,500,North Lab,3.41,D4739,2.21,,5.2,,20
2,800,South Lab,2.61,D4739,2.36,,6.7,,25
"""
SECTION = """
lab:
  precision:
    tan: 0.12 mg KOH/g
    oxidation: 0.008 A/0.1mm
  labs:
    North Lab:
      precision: {tan: 0.3 mg KOH/g}
      oxidation-baseline: 1.5 A/cm
  alarm-levels:
    fe: {caution: 20 ppm, critical: 40 ppm}
"""


@pytest.fixture()
def files(tmp_path):
    text = CASE.read_text(encoding="utf-8")
    case = tmp_path / "case.yaml"
    case.write_text(text + SECTION, encoding="utf-8")
    plain = tmp_path / "plain.yaml"
    plain.write_text(text, encoding="utf-8")
    lab = tmp_path / "lab.csv"
    lab.write_text(LAB, encoding="utf-8")
    return case, plain, lab


def sigmas(fit, reading):
    """(lab, row number in the file, sigma) of each residual of one reading."""
    r = fit.residuals
    out = []
    for i, name, s in zip(r["sample"], r["reading"], r["sigma"]):
        if name == reading:
            sample = fit._r.samples[int(i)]
            out.append((sample.lab, int(i) + 2, float(s)))
    return out


def test_the_section_is_visible_in_python_in_the_readings_units(files):
    acidload = need_acidload()
    case, plain, _ = files
    lab = acidload.load_case(case).lab
    # 1 A/0.1mm = 100 A/cm (the per-0.1-mm absorbance scaled to 1 cm): 0.008 A/0.1mm = 0.8 A/cm
    assert lab["precision"] == pytest.approx({"tan": 0.12, "oxidation": 0.8})
    assert lab["labs"]["North Lab"]["precision"] == pytest.approx({"tan": 0.3})
    assert lab["labs"]["North Lab"]["oxidation_baseline"] == pytest.approx(1.5)
    assert lab["labs"]["North Lab"]["nitration_baseline"] is None
    assert lab["alarm_levels"] == {"fe": (20.0, 40.0)}
    assert acidload.load_case(plain).lab == {"precision": {}, "labs": {}, "alarm_levels": {}}


def test_precedence_row_then_call_then_case_lab_then_case_default_then_built_in(files):
    acidload = need_acidload()
    case, plain, lab = files
    c = acidload.load_case(case)
    # the case alone: the row's tan-sd 0.05, North Lab's 0.3, South Lab the case default 0.12
    got = sigmas(acidload.fit(c, lab), "tan")
    assert [s for _, _, s in got] == pytest.approx([0.3, 0.05, 0.12, 0.12, 0.3, 0.12])
    # TBN by D4739 stated nowhere: the built-in 0.20 (docs/lab-results.md)
    assert [s for _, _, s in sigmas(acidload.fit(c, lab), "tbn")] == pytest.approx([0.20] * 6)
    # oxidation: the case default 0.8 for both labs (North Lab's entry states no oxidation precision)
    assert [s for _, _, s in sigmas(acidload.fit(c, lab), "oxidation")] == pytest.approx([0.8] * 6)
    # the call's precision over the case's per-lab and default; the row's own still wins
    got = sigmas(acidload.fit(c, lab, precision={"tan": 0.2}), "tan")
    assert [s for _, _, s in got] == pytest.approx([0.2, 0.05, 0.2, 0.2, 0.2, 0.2])
    # the call's per-lab figure over the call's default for that lab
    got = sigmas(acidload.fit(c, lab, precision={"tan": 0.2}, lab_precision={"South Lab": {"tan": 0.25}}), "tan")
    assert [s for _, _, s in got] == pytest.approx([0.2, 0.05, 0.25, 0.25, 0.2, 0.25])
    # without a lab section: the built-in TAN 0.15 (docs/lab-results.md) and the row's 0.05
    got = sigmas(acidload.fit(acidload.load_case(plain), lab), "tan")
    assert [s for _, _, s in got] == pytest.approx([0.15, 0.05, 0.15, 0.15, 0.15, 0.15])


def test_a_lab_s_baseline_goes_to_its_rows_that_state_none(files):
    acidload = need_acidload()
    case, plain, lab = files
    f = acidload.fit(acidload.load_case(case), lab)
    got = [(s.lab, s.oxidation_baseline) for s in f._r.samples]
    # North Lab rows: the case's 1.5, but row 3 states 2.5 (the row wins); South Lab: none stated, fitted
    assert got[0] == ("North Lab", pytest.approx(1.5)) and got[1] == ("North Lab", pytest.approx(2.5))
    assert got[4] == ("North Lab", pytest.approx(1.5))
    assert [b["lab"] for b in f.baselines if b["reading"] == "oxidation"] == ["South Lab"]
    # without the section North Lab's baseline is fitted too (no fresh-oil sample, 3 rows, one stating
    # its own: the fit is per lab where no row is stated, docs/lab-results.md)
    g = acidload.fit(acidload.load_case(plain), lab)
    assert [s.oxidation_baseline for s in g._r.samples][0] != pytest.approx(1.5)


def test_the_case_s_alarm_levels_replace_the_defaults_and_a_call_s_replace_both(files):
    acidload = need_acidload()
    case, plain, lab = files
    # fe 20 and 25 ppm in the last two samples: below the common-practice caution 30 ppm, at and above the case's 20
    t = acidload.trend(acidload.fit(acidload.load_case(plain), lab))
    assert not [a for a in t["alarms"] if a["quantity"] == "fe"]
    f = acidload.fit(acidload.load_case(case), lab)
    fe = [a for a in acidload.trend(f)["alarms"] if a["quantity"] == "fe"]
    assert [(a["level"], a["value"], a["limit"]) for a in fe] == [("caution", 20.0, 20.0), ("caution", 25.0, 20.0)]
    assert "lab.alarm-levels" in fe[0]["message"]
    assert not [a for a in acidload.trend(f, levels={"fe": (26, 60)})["alarms"] if a["quantity"] == "fe"]


def program():
    p = os.environ.get("ACIDLOAD_PROGRAM")
    if not p:
        for c in (ROOT / "build" / "bindings" / "cli" / "acidload",):
            if c.exists():
                return str(c)
        pytest.skip("no acidload program (set ACIDLOAD_PROGRAM)")
    return p


def cli_tan_sigmas(*args):
    r = subprocess.run([program(), "fit", *map(str, args)], capture_output=True, text=True, timeout=120)
    assert r.returncode == 0, r.stderr
    out = []
    for m in re.finditer(r"^\s+(\d+)\s+tan\s+(\S+)\s+(\S+)\s+(\S+)", r.stdout, re.M):
        measured, fitted, z = float(m.group(2)), float(m.group(3)), float(m.group(4))
        out.append((measured - fitted) / z if abs(z) >= 0.3 else None)  # σ from the printed residual
    return out


def test_the_program_takes_the_same_precedence(files):
    case, plain, lab = files
    # (measured − fitted)/residual recovers σ to the printed digits (3 decimals): within 10 %
    def close(got, want):
        assert len(got) == len(want)
        for g, w in zip(got, want):
            if g is not None:
                assert g == pytest.approx(w, rel=0.1), (got, want)
    close(cli_tan_sigmas(case, "--lab", lab), [0.3, 0.05, 0.12, 0.12, 0.3, 0.12])
    close(cli_tan_sigmas(case, "--lab", lab, "--precision", "tan=0.2"), [0.2, 0.05, 0.2, 0.2, 0.2, 0.2])
    r = subprocess.run([program(), "forecast", str(case), "--lab", str(lab)], capture_output=True, text=True, timeout=120)
    assert r.returncode == 0, r.stderr
    assert "fe 25 ppm" in r.stdout and "caution level 20" in r.stdout, r.stdout


def test_the_schema_takes_the_section_and_refuses_a_misspelt_reading(files):
    import json

    from conftest import need
    yaml, jsonschema = need("yaml"), need("jsonschema")
    case, _, _ = files
    schema = json.loads((ROOT / "docs" / "case-format.schema.json").read_text(encoding="utf-8"))
    data = yaml.safe_load(case.read_text(encoding="utf-8"))
    assert not list(jsonschema.Draft202012Validator(schema).iter_errors(data))
    data["lab"]["precision"]["tbn"] = "0.2 mg KOH/g"  # the reader refuses it too (tests/badinput)
    assert list(jsonschema.Draft202012Validator(schema).iter_errors(data))
