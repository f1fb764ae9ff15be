"""`acidload run A.yaml B.yaml … | FOLDER`: a fleet in one process.

What is checked: every case's result file in the fleet's folder equals, byte for byte, the summary of
that case run alone (`acidload run CASE --out`), whatever the thread count; the fleet summary (CSV and
JSON) carries the same figures; a mistake in any case stops the run before anything is written; the
folder rules of single runs hold (never an input's folder, never a folder acidload did not write).
The cases are the shipped demo cases (invented data) and copies of them.
"""
import csv
import json
import math
import subprocess

import pytest

from conftest import ROOT, acidload_program

DEMO = ROOT / "cases" / "demo-site.yaml"
DRIFT = ROOT / "cases" / "drifting-gas.yaml"


def run(*args, timeout=300):
    return subprocess.run([str(acidload_program()), *map(str, args)], capture_output=True, text=True, timeout=timeout)


@pytest.fixture
def fleet_folder(tmp_path):
    cases = tmp_path / "site"
    cases.mkdir()
    text = DEMO.read_text(encoding="utf-8")
    (cases / "engine-1.yaml").write_text(text, encoding="utf-8")
    (cases / "engine-2.yaml").write_text(text.replace("h2s: 300 ppmv", "h2s: 120 ppmv", 1), encoding="utf-8")
    (cases / "readme.txt").write_text("not a case", encoding="utf-8")
    return cases


def test_a_fleet_equals_its_cases_run_alone(fleet_folder, tmp_path):
    singles = {}
    for f in [fleet_folder / "engine-1.yaml", fleet_folder / "engine-2.yaml", DRIFT]:
        r = run("run", f, "--out", tmp_path / f"alone-{f.stem}")
        assert r.returncode == 0, r.stderr
        singles[f.stem] = (tmp_path / f"alone-{f.stem}" / "summary.json").read_text(encoding="utf-8")
    for threads in ("1", "2", "3"):
        out = tmp_path / f"fleet-{threads}"
        r = run("run", fleet_folder, DRIFT, "--out", out, "--threads", threads)
        assert r.returncode == 0, r.stderr
        for stem, text in singles.items():
            assert (out / f"{stem}.summary.json").read_text(encoding="utf-8") == text, (threads, stem)
        assert (out / ".acidload-results").is_file()
    assert "Fleet: 3 cases" in r.stdout and "Shortest interval" in r.stdout

    # the fleet summary carries the cases' own figures
    rows = list(csv.DictReader((out / "fleet-summary.csv").open(encoding="utf-8")))
    fleet = json.loads((out / "fleet-summary.json").read_text(encoding="utf-8"))
    expected = []
    for stem in ("engine-1", "engine-2", "drifting-gas"):
        s = json.loads(singles[stem])
        expected += [(s["case-file"], v["name"], v["drain-interval-h"], v["limit-reached"]) for v in s["variants"]]
    assert len(rows) == len(expected) == fleet["variants"]
    for row, (file, name, interval, limit) in zip(rows, expected):
        assert row["case-file"] == file and row["variant"] == name
        assert (row["limit-reached"] or None) == limit
        if interval is None:
            assert row["drain-interval [h]"] == ""
        else:
            assert math.isclose(float(row["drain-interval [h]"]), interval, rel_tol=1e-9)
    got = [(c["case-file"], v["name"], v["drain-interval-h"]) for c in fleet["fleet"] for v in c["variants"]]
    assert got == [e[:3] for e in expected]


def test_a_mistake_in_one_case_stops_the_fleet_before_anything_is_written(fleet_folder, tmp_path):
    bad = tmp_path / "bad.yaml"
    bad.write_text(DEMO.read_text(encoding="utf-8").replace("h2s: 300 ppmv", "h2s: lots", 1), encoding="utf-8")
    out = tmp_path / "out"
    r = run("run", fleet_folder, bad, "--out", out)
    assert r.returncode == 3 and r.stdout == ""
    assert "bad.yaml:" in r.stderr and "h2s" in r.stderr
    assert not out.exists()


def test_fleet_output_rules(fleet_folder, tmp_path):
    # never into the folder holding the inputs
    r = run("run", fleet_folder, "--out", fleet_folder)
    assert r.returncode == 3 and "input" in r.stderr
    assert sorted(p.name for p in fleet_folder.iterdir()) == ["engine-1.yaml", "engine-2.yaml", "readme.txt"]
    # never over a folder acidload did not write
    theirs = tmp_path / "theirs"
    theirs.mkdir()
    (theirs / "notes.txt").write_text("keep me", encoding="utf-8")
    r = run("run", fleet_folder, "--out", theirs)
    assert r.returncode == 3 and (theirs / "notes.txt").read_text(encoding="utf-8") == "keep me"
    # two cases of one name get apart
    other = tmp_path / "other"
    other.mkdir()
    (other / "engine-1.yaml").write_text(DEMO.read_text(encoding="utf-8"), encoding="utf-8")
    out = tmp_path / "two"
    assert run("run", fleet_folder / "engine-1.yaml", other / "engine-1.yaml", "--out", out).returncode == 0
    assert (out / "engine-1.summary.json").is_file() and (out / "engine-1-2.summary.json").is_file()


def test_fleet_command_line_mistakes(tmp_path):
    empty = tmp_path / "empty"
    empty.mkdir()
    r = run("run", empty)
    assert r.returncode == 3 and "no case files" in r.stderr
    assert run("run").returncode == 2
    for bad in ("0", "1.5", "many"):
        r = run("run", DEMO, DRIFT, "--threads", bad)
        assert r.returncode in (2, 3) and "--threads" in r.stderr, (bad, r.stderr)
    assert run("run", DEMO, DRIFT, "--threads", "1.5").returncode == 2  # not a whole number: the line cannot be parsed
    assert run("run", DEMO, DRIFT, "--threads", "0").returncode == 3    # a whole number out of range


def test_fleet_and_single_case_tables_say_the_same_when_no_limit_is_reached(tmp_path):
    # A planned maximum of 300 h ends every demo variant before any oil-condition limit: both tables
    # must say "no limit within 300 h" (never "not reached" or a bare 300 h read as a result), and the
    # outcome must fit its column so the TBN column stays aligned.
    case = tmp_path / "short.yaml"
    case.write_text(DEMO.read_text(encoding="utf-8").replace("max-hours: 8000 h", "max-hours: 300 h", 1), encoding="utf-8")
    alone = run("run", case)
    fleet = run("run", case, DEMO, "--out", tmp_path / "fleet")
    assert alone.returncode == 0 and fleet.returncode == 0, alone.stderr + fleet.stderr
    assert "not reached" not in fleet.stdout and "not reached" not in alone.stdout
    short_rows = [l for l in fleet.stdout.splitlines() if l.startswith("short ")]
    assert short_rows and all("no limit within 300 h" in l for l in short_rows)
    rows = [l for l in alone.stdout.splitlines() if "no limit within 300 h" in l]
    assert len(rows) == len(short_rows)
    header = next(l for l in alone.stdout.splitlines() if l.startswith("variant "))
    tbn_end = header.index("and the limit reached") + 34  # the outcome column is 33 wide
    assert header[tbn_end:tbn_end + 5].strip() == "end"
    for l in rows:  # the outcome never runs into the TBN column
        assert l[tbn_end - 1] == " " and l[tbn_end:tbn_end + 5].strip().replace(".", "").isdigit()
    # the longest outcome, a record that ends before any limit, fits too
    drift = run("run", DRIFT).stdout.splitlines()
    longest = [l for l in drift if l.startswith("scrubber held") and "no limit in the record (3000 h)" in l]
    assert longest and all(l[tbn_end - 1] == " " and l[tbn_end:tbn_end + 5].strip().replace(".", "").isdigit() for l in longest)
    fleet_header = next(l for l in fleet.stdout.splitlines() if l.startswith("case "))
    column = fleet_header.index("drain interval")
    for l in short_rows:  # the outcome column is 33 wide, then TBN
        assert l[column:column + 33].rstrip() == "no limit within 300 h" and float(l[column + 33:].split()[0]) > 0
