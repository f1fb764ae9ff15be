"""No zero-width band (docs/lab-results.md, the lab-first forecast, step 3; docs/model.md §13.1): a
limit driven by parameters nobody fitted (the antioxidant reserve by its induction time) gets the
band of their weak prior, marked prior-driven, in Python and in the program. The expected direction
is the model's own physics as documented (a longer induction time keeps the antioxidant longer,
docs/model.md §16), not a figure from acidload's output. The demo data are invented."""
import math
import subprocess

from conftest import ROOT, need_acidload

CASE = ROOT / "cases" / "demo-site-history.yaml"
LAB = ROOT / "cases" / "demo-site-lab.csv"


def test_the_antioxidant_band_has_width_from_the_induction_time_s_prior_and_says_so():
    acidload = need_acidload()
    f = acidload.fit(acidload.load_case(CASE), LAB)
    assert "model.induction-time" not in f.keys  # not fitted: the lab reports no antioxidant
    fc = acidload.forecast(f)
    ao = [x for x in fc if x["limit"] == "antioxidant"][0]
    assert ao["reached"] and not ao["already"]
    assert ao["high_h"] - ao["low_h"] > 0.1 * ao["remaining_h"], ao
    assert ao["low_h"] <= ao["remaining_h"] <= ao["high_h"]
    assert ao["prior_driven"] and ao["prior_from"] == ["model.induction-time"], ao
    # a limit the fitted parameters drive keeps a band of its own and is not marked
    tbn = [x for x in fc if x["limit"] == "tbn-fall"][0]
    assert tbn["high_h"] > tbn["low_h"] and not tbn["prior_driven"] and tbn["prior_from"] == []
    # with the induction time fitted (its prior the only thing holding it) the prior comes from the fit
    g = acidload.fit(acidload.load_case(CASE), LAB, ["model.liner-uptake", "model.oxidation-rate", "model.induction-time"])
    ao2 = [x for x in acidload.forecast(g) if x["limit"] == "antioxidant"][0]
    assert "model.induction-time" not in ao2["prior_from"]
    assert ao2["high_h"] - ao2["low_h"] > 0


def test_every_reached_limit_s_band_has_width():
    acidload = need_acidload()
    fc = acidload.forecast(acidload.fit(acidload.load_case(CASE), LAB))
    for x in fc:
        if x["reached"] and not x["already"] and x["limit"] != "max-hours" and math.isfinite(x["remaining_h"]):
            assert x["high_h"] > x["low_h"], x


def test_the_program_labels_a_prior_driven_band():
    import os
    program = os.environ.get("ACIDLOAD_PROGRAM") or str(ROOT / "build" / "bindings" / "cli" / "acidload")
    r = subprocess.run([program, "forecast", str(CASE), "--lab", str(LAB)], capture_output=True, text=True, timeout=120)
    assert r.returncode == 0, r.stderr
    line = [l for l in r.stdout.splitlines() if l.strip().startswith("antioxidant")][0]
    assert "PRIOR-DRIVEN" in line and "model.induction-time" in line, line
    low, high = [float(v) for v in line.split("h   ")[1].split(" h")[0].split(" to ")]
    assert high > low, line


def test_uncertainty_of_the_next_charge_is_predict_s_draws_with_p10_and_p90():
    # `uncertainty --next-charge` percentiles the draws `predict` makes: the same seed and draws give
    # the same P5/P50/P95 (the band predict prints), and P10/P90 lie inside them
    import os
    import re
    program = os.environ.get("ACIDLOAD_PROGRAM") or str(ROOT / "build" / "bindings" / "cli" / "acidload")
    args = [str(CASE), "--lab", str(LAB), "--draws", "200", "--seed", "5"]
    u = subprocess.run([program, "uncertainty", *args, "--next-charge"], capture_output=True, text=True, timeout=300)
    p = subprocess.run([program, "predict", *args], capture_output=True, text=True, timeout=300)
    assert u.returncode == 0 and p.returncode == 0, u.stderr + p.stderr
    row = [l for l in u.stdout.splitlines() if "drain interval, next charge" in l][0]
    p5, p10, p50, p90, p95 = [int(x) for x in re.findall(r"(\d+) h", row)]
    band = re.search(r"P5 (\d+) h.*P50 (\d+) h.*P95 (\d+) h", p.stdout)
    assert (p5, p50, p95) == tuple(int(x) for x in band.groups()), (row, band.group(0))
    assert p5 <= p10 <= p50 <= p90 <= p95
