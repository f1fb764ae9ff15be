"""The latest lab sample against the case's oil-life limits, in the program's forecast and in Python:
viscosity change over fresh (limits.viscosity-change), antioxidant remaining (limits.antioxidant-
remaining), water (limits.water) and i-pH (limits.initial-ph), each passed and not passed, and the
i-pH threshold moved through the case. The alarm levels of the trend for these four are bound to the
same limits (critical at the limit, caution before it, never beyond).

The thresholds are the case's own; their defaults are common practice (docs/references.md
[CondemningLimits], [ASTM-D7590], [ASTM-D7946], [LabAlarmLevels]). The viscosity change is checked by
hand from its definition, (ν − ν_fresh)/ν_fresh (16.0 cSt against 13.2 cSt fresh: +21.2 %).
The demo history and lab file are invented data; the extra readings added here are invented too."""
import subprocess

import pytest

from conftest import ROOT, acidload_program, need_acidload

PARAMS = ["model.liner-uptake", "model.oxidation-rate", "model.organic-acid-yield"]
PASSING = {"viscosity-100": "16.0", "antioxidant-remaining": "20", "water": "0.7", "i-ph": "4.4"}
WITHIN = {"viscosity-100": "14.0", "antioxidant-remaining": "60", "water": "0.3", "i-ph": "5.2"}


def lab_file(tmp_path, latest, name="lab.csv"):
    """The demo lab file with viscosity, fresh viscosity, antioxidant and water columns; `latest`
    sets the latest sample's (charge 4, 450 h) readings, its i-pH included."""
    out = []
    for line in (ROOT / "cases" / "demo-site-lab.csv").read_text().splitlines():
        if line.startswith("charge,"):
            line += ",viscosity-100 [cSt],viscosity-100-fresh [cSt],antioxidant-remaining [%],water [%]"
        elif line.startswith("4,450,"):
            cells = line.split(",")
            cells[7] = latest["i-ph"]
            line = ",".join(cells) + f",{latest['viscosity-100']},13.2,{latest['antioxidant-remaining']},{latest['water']}"
        elif line.startswith("4,"):
            line += ",13.4,,85,0.05"  # the fresh viscosity comes from the charge's other row
        elif not line.startswith("#"):
            line += ",,,,"
        out.append(line)
    p = tmp_path / name
    p.write_text("\n".join(out) + "\n")
    return p


def case_file(tmp_path, limits=""):
    """The demo history with extra lines in its limits section."""
    text = (ROOT / "cases" / "demo-site-history.yaml").read_text()
    assert "  max-hours: 8000 h\n" in text
    p = tmp_path / "case.yaml"
    p.write_text(text.replace("  max-hours: 8000 h\n", limits + "  max-hours: 8000 h\n", 1))
    return p


def forecast(acidload, tmp_path, latest, limits="", **kw):
    case = acidload.load_case(str(case_file(tmp_path, limits)))
    fit = acidload.fit(case, acidload.read_lab_samples(lab_file(tmp_path, latest)), PARAMS)
    return fit, acidload.forecast(fit, **kw)


def by_limit(fc):
    return {f["limit"]: f for f in fc}


def test_each_limit_passed_by_the_latest_sample_is_already_and_says_measured_against_limit(tmp_path):
    acidload = need_acidload()
    _, fc = forecast(acidload, tmp_path, PASSING)
    f = by_limit(fc)
    assert fc.change_now
    for key in ("viscosity", "antioxidant", "water", "i-ph"):
        assert f[key]["already"] and f[key]["reached"] and f[key]["remaining_h"] == 0, key
    # by hand: (16.0 − 13.2)/13.2 = 21.2 % over fresh against +20 % (the default, common practice)
    assert "21.2 % over fresh (13.2 cSt)" in f["viscosity"]["why"] and "+20 %" in f["viscosity"]["why"]
    assert "20 % of fresh" in f["antioxidant"]["why"] and "limit 25 %" in f["antioxidant"]["why"]
    assert "water 0.7 %" in f["water"]["why"] and "limit 0.5 %" in f["water"]["why"]
    assert "i-pH 4.4" in f["i-ph"]["why"] and "limit 4.5 (limits.initial-ph)" in f["i-ph"]["why"]


def test_none_passed_when_the_latest_sample_is_within_every_limit(tmp_path):
    acidload = need_acidload()
    _, fc = forecast(acidload, tmp_path, WITHIN)
    f = by_limit(fc)
    for key in ("viscosity", "antioxidant", "water", "i-ph"):
        assert not f[key]["already"], (key, f[key]["why"])
    assert not fc.change_now  # the demo's other limits lie ahead too
    assert f["i-ph"]["remaining_h"] == float("inf") and f["water"]["remaining_h"] == float("inf")


@pytest.mark.parametrize("limits, key", [
    ("  viscosity-change: 5 %\n", "viscosity"),          # 14.0/13.2 − 1 = 6.1 % ≥ 5 %
    ("  antioxidant-remaining: 70 %\n", "antioxidant"),  # 60 % ≤ 70 %
    ("  water: 0.2 %\n", "water"),                       # 0.3 % > 0.2 %
    ("  initial-ph: 5.5\n", "i-ph"),                     # 5.2 ≤ 5.5: the threshold follows the case
])
def test_a_limit_moved_through_the_case_moves_the_verdict(tmp_path, limits, key):
    acidload = need_acidload()
    _, fc = forecast(acidload, tmp_path, WITHIN, limits)
    f = by_limit(fc)
    assert f[key]["already"], f[key]
    assert [k for k in ("viscosity", "antioxidant", "water", "i-ph") if f[k]["already"]] == [key]


def test_the_ph_threshold_is_the_case_s_unless_the_call_overrides_it(tmp_path):
    acidload = need_acidload()
    latest = dict(WITHIN, **{"i-ph": "4.7"})
    fit, fc = forecast(acidload, tmp_path, latest, "  initial-ph: 4.0\n")
    assert not by_limit(fc)["i-ph"]["already"]  # 4.7 > 4.0: the case's threshold, not 4.5 or any fixed figure
    fit, fc = forecast(acidload, tmp_path, latest, "  initial-ph: 4.8\n")
    assert by_limit(fc)["i-ph"]["already"] and "limit 4.8" in by_limit(fc)["i-ph"]["why"]
    over = acidload.forecast(fit, initial_ph_limit=4.2)
    assert not by_limit(over)["i-ph"]["already"]
    with pytest.raises(acidload.InputError):
        acidload.forecast(fit, initial_ph_limit=15)
    assert acidload.predict(fit, draws=20)["current"].change_now  # predict's forecast takes the case's too


def test_trend_levels_follow_the_case_s_limits_and_refuse_a_level_beyond_them(tmp_path):
    acidload = need_acidload()
    fit, _ = forecast(acidload, tmp_path, WITHIN, "  water: 0.2 %\n  initial-ph: 5.0\n")
    t = acidload.trend(fit)
    water = [a for a in t["alarms"] if a["quantity"] == "water" and a["sample"] == 13]
    assert water and water[0]["level"] == "critical" and water[0]["limit"] == pytest.approx(0.2)
    ph = [a for a in t["alarms"] if a["quantity"] == "i-ph" and a["sample"] == 13]
    assert ph and ph[0]["level"] == "caution" and ph[0]["limit"] == pytest.approx(5.5)  # 5.2: within 0.5 of 5.0
    levels = {q: (c, k, rising) for q, c, k, rising, _ in acidload.default_alarm_levels()}
    for q, limit in (("water", 0.5), ("viscosity-100", 20), ("antioxidant-remaining", 25), ("i-ph", 4.5)):
        caution, critical, rising = levels[q]
        assert critical == pytest.approx(limit), q  # the default limits (docs/references.md)
        assert (caution <= critical) if rising else (caution >= critical), q  # caution never beyond the limit
    with pytest.raises(acidload.InputError, match="never beyond the limit"):
        acidload.trend(fit, {"water": (0.1, 0.3)})  # a critical level past limits.water 0.2 %
    with pytest.raises(acidload.InputError, match="never beyond the limit"):
        acidload.trend(fit, {"i-ph": (4.8, 4.5)})  # below limits.initial-ph 5.0
    assert acidload.trend(fit, {"water": (0.05, 0.15)})["alarms"]  # before the limit: taken


def test_the_program_prints_change_the_oil_now_with_each_limit_and_its_reading(tmp_path):
    case = case_file(tmp_path)

    def run(latest):
        lab = lab_file(tmp_path, latest)
        return subprocess.run([str(acidload_program()), "forecast", str(case), "--lab", str(lab), "--parameters",
                               ",".join(PARAMS)], capture_output=True, text=True, timeout=300)

    r = run(PASSING)
    assert r.returncode == 0, r.stderr
    assert "CHANGE THE OIL NOW: the latest sample has already passed" in r.stdout
    for line in ("- viscosity: viscosity at 100 degC 16 cSt", "is 21.2 % over fresh (13.2 cSt): at or above the limit +20 %",
                 "- antioxidant: antioxidant remaining 20 % of fresh", "at or below the limit 25 %",
                 "- water: water 0.7 %", "above the limit 0.5 %", "- i-ph: i-pH 4.4", "at or below the limit 4.5"):
        assert line in r.stdout, line
    assert "CRITICAL water 0.7 %" in r.stdout  # the trend's critical level is the same limit
    r = run(WITHIN)
    assert r.returncode == 0, r.stderr
    assert "CHANGE THE OIL NOW" not in r.stdout
    assert "lab only   (not passed by the latest sample)" in r.stdout
    # the planned maximum is the horizon, not an oil limit: no band beside it, said so
    hours = [l for l in r.stdout.splitlines() if l.startswith("  max-hours")]
    assert len(hours) == 1 and "the planned maximum (limits.max-hours), not an oil limit" in hours[0], hours
    assert " to " not in hours[0]
    moved = subprocess.run([str(acidload_program()), "forecast", str(case_file(tmp_path, "  initial-ph: 5.5\n")), "--lab",
                            str(lab_file(tmp_path, WITHIN)), "--parameters", ",".join(PARAMS)],
                           capture_output=True, text=True, timeout=300)
    assert moved.returncode == 0, moved.stderr
    assert "- i-ph: i-pH 5.2" in moved.stdout and "at or below the limit 5.5 (limits.initial-ph)" in moved.stdout


def test_the_issue_s_last_sample_is_read_against_each_limit_in_its_own_words(tmp_path):
    # issue 15's plant: last sample TBN 2.40 (D4739; limit 50 % of fresh), TAN 3.6 (fresh 1.5 + 2 = 3.5
    # and above TBN), SAN 0.4 (limit: any SAN > 0), i-pH 3.8 (limit 4.5): every one of them reached now,
    # each "why" naming the measured reading (not only that the model passes it)
    acidload = need_acidload()
    lines = (ROOT / "cases" / "demo-site-lab.csv").read_text().splitlines()
    lines = [l for l in lines if not l.startswith("4,450,")] + ["4,450,Southgate Analytical,2.40,D4739,3.6,0.4,3.8,5.1,5.2"]
    lab = tmp_path / "lab.csv"
    lab.write_text("\n".join(lines) + "\n")
    fit = acidload.fit(acidload.load_case(str(ROOT / "cases" / "demo-site-history.yaml")), lab)
    f = by_limit(acidload.forecast(fit))
    assert all(f[k]["already"] for k in ("tbn-fall", "tan-rise", "crossover", "san", "i-ph"))
    assert "TBN 2.4 " in f["tbn-fall"]["why"]
    assert "TAN 3.6 " in f["tan-rise"]["why"] and "3.5" in f["tan-rise"]["why"]
    assert "TAN 3.6 " in f["crossover"]["why"] and "at or above TBN" in f["crossover"]["why"], f["crossover"]["why"]
    assert "SAN 0.4 " in f["san"]["why"] and "free strong acid" in f["san"]["why"], f["san"]["why"]
    assert "i-pH 3.8" in f["i-ph"]["why"]
