"""The Python package's results equal the program's for every shipped case: `acidload run CASE --out DIR`
writes summary.json and trajectories.csv; the same case loaded and run from Python must give the same
summary (as a dict, every number) and the same trajectories. Source of the expected values: the
acidload program (bindings/cli), run as a separate process. Cases are invented data."""
import csv
import io
import json
import math
import subprocess

import pytest

from conftest import ROOT, acidload_program, need_acidload

CASES = [p for p in sorted((ROOT / "cases").glob("*.yaml")) + sorted((ROOT / "tests" / "cases").rglob("*.yaml"))
         if "\nsite:" not in p.read_text(encoding="utf-8")]  # site files: tests/python/test_site.py


def test_there_are_shipped_cases():
    assert len(CASES) >= 4


@pytest.mark.parametrize("path", CASES, ids=[p.name for p in CASES])
def test_python_summary_equals_the_programs(path, tmp_path):
    acidload = need_acidload()
    program = acidload_program()
    out = tmp_path / "out"
    r = subprocess.run([str(program), "run", str(path), "--out", str(out)], capture_output=True, text=True,
                       timeout=300)
    assert r.returncode == 0, r.stderr
    expected = json.loads((out / "summary.json").read_text(encoding="utf-8"))  # the program
    result = acidload.run(acidload.load_case(str(path)))
    assert result.summary == expected
    assert result.trajectories_csv() == (out / "trajectories.csv").read_text(encoding="utf-8")
    # the numpy arrays against the program's CSV (10 significant digits there)
    table = list(csv.reader(io.StringIO((out / "trajectories.csv").read_text(encoding="utf-8"))))
    header, rows = table[0], table[1:]
    for v in result.variants:
        mine = [row for row in rows if row[0] == v.name]
        t = v.trajectory
        assert len(mine) == len(t["tan"]), v.name
        for col, key in (("engine_hours_h", "engine_hours"), ("tan_mg_koh_per_g", "tan"),
                         ("san_mg_koh_per_g", "san"), ("tbn_d2896_mg_koh_per_g", "tbn_d2896"),
                         ("oxidation_a_per_cm", "oxidation"), ("oil_mass_kg", "oil_mass"),
                         ("antioxidant_remaining_pct_of_fresh", "antioxidant_remaining"),
                         ("viscosity_change_100c_pct", "viscosity_change")):
            j = header.index(col)
            for row, x in zip(mine, t[key]):
                assert math.isclose(float(row[j]), x, rel_tol=1e-9, abs_tol=1e-12), (v.name, col, row[j], x)
