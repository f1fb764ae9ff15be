"""The report from Python (Result.report) is the program's page; its plots parse as XML with Python's
own parser (expat through xml.etree); the summary CSV equals `acidload run --summary-csv`; a file that is
not an acidload report is never replaced."""
import csv
import io
import re
import subprocess
import xml.etree.ElementTree as ET

import pytest

from conftest import acidload_program, need_acidload, ROOT

SVG = "{http://www.w3.org/2000/svg}"


def _undated(html: str) -> str:
    return re.sub(r"\d{4}-\d\d-\d\d \d\d:\d\d UTC", "(date)", html)


def test_python_report_is_the_programs_page(tmp_path):
    acidload = need_acidload()
    program = acidload_program()
    case = ROOT / "cases" / "demo-site.yaml"
    mine = tmp_path / "python.html"
    acidload.run(acidload.load_case(str(case))).report(mine)
    theirs = tmp_path / "program.html"
    subprocess.run([str(program), "report", str(case), "--out", str(theirs)], check=True, capture_output=True)
    assert _undated(mine.read_text()) == _undated(theirs.read_text())


def test_every_plot_parses_as_svg_with_text_alternatives():
    acidload = need_acidload()
    html = acidload.run(acidload.load_case(str(ROOT / "cases" / "demo-site.yaml"))).report_html()
    svgs = re.findall(r"<svg .*?</svg>", html, re.S)
    assert len(svgs) == 8  # TBN, TAN, SAN, oxidation, viscosity, antioxidant, H2S, acids
    for s in svgs:
        root = ET.fromstring(s)  # raises on anything not well-formed
        assert root.tag == SVG + "svg"
        assert root.find(SVG + "title").text and root.find(SVG + "desc").text
        labels = [t.text for t in root.iter(SVG + "text") if "axis-label" in (t.get("class") or "")]
        assert len(labels) == 2 and all(labels)


def test_report_with_lab_draws_the_readings():
    acidload = need_acidload()
    history = acidload.load_case(str(ROOT / "cases" / "demo-site-history.yaml"))
    html = acidload.run(history).report_html(lab=ROOT / "cases" / "demo-site-lab.csv")
    assert "Lab results and the model" in html
    assert 'id="lab-tbn"' in html and 'id="lab-oxidation"' in html
    assert "90 % band" in html


def test_report_never_replaces_a_file_acidload_did_not_write(tmp_path):
    acidload = need_acidload()
    other = tmp_path / "notes.html"
    other.write_text("<p>the plant's own notes</p>")
    result = acidload.run(acidload.load_case(str(ROOT / "cases" / "demo-site.yaml")))
    with pytest.raises(acidload.Error, match="acidload did not write it"):
        result.report(other)
    assert other.read_text() == "<p>the plant's own notes</p>"
    assert sorted(p.name for p in tmp_path.iterdir() if not p.name.startswith(".")) == ["notes.html"]


def test_summary_csv_is_the_programs_and_numbers_charges_from_1(tmp_path):
    acidload = need_acidload()
    program = acidload_program()
    case = ROOT / "cases" / "drifting-gas.yaml"
    out = tmp_path / "table.csv"
    subprocess.run([str(program), "run", str(case), "--summary-csv", str(out)], check=True, capture_output=True)
    text = acidload.run(acidload.load_case(str(case))).summary_csv()
    assert out.read_text() == text
    rows = list(csv.DictReader(io.StringIO(text)))
    assert rows and all(re.search(r"\[.+\]", h) for h in rows[0] if h not in ("variant", "charge", "limit reached",
                                                                                 "ended by oil change"))
    assert min(int(r["charge"]) for r in rows) == 1
    summary = acidload.run(acidload.load_case(str(case))).summary
    assert len(rows) == sum(len(v["charges"]) for v in summary["variants"])
    for r in rows:  # the first charge's interval equals summary.json's
        if r["charge"] == "1":
            v = next(v for v in summary["variants"] if v["name"] == r["variant"])
            want = v["drain-interval-h"]
            assert (r["drain interval [h]"] == "") == (want is None)
            if want is not None:
                assert float(r["drain interval [h]"]) == pytest.approx(want, rel=1e-9)


def test_python_report_of_a_case_with_costs_has_the_cost_plot():
    acidload = need_acidload()
    html = acidload.run(acidload.load_case(str(ROOT / "cases" / "demo-site-costs.yaml"))).report_html()
    svgs = {ET.fromstring(s).get("id"): ET.fromstring(s) for s in re.findall(r"<svg .*?</svg>", html, re.S)}
    assert {"chart-costs", "chart-viscosity", "chart-antioxidant"} <= set(svgs)
    labels = [t.text for t in svgs["chart-costs"].iter(SVG + "text") if "axis-label" in (t.get("class") or "")]
    assert any("H2S at the engine" in t for t in labels) and any("per MWh" in t for t in labels)
