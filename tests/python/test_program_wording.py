"""The program's words for a charge that reaches no oil-condition limit: the plant's planned maximum
(limits.max-hours) is a horizon, never printed as if it were a result or as a "cap" (docs/model.md §9).
The cases are the shipped demo cases (invented data)."""
import subprocess

from conftest import ROOT, acidload_program

HISTORY = ROOT / "cases" / "demo-site-history.yaml"


def run(*args, timeout=300):
    return subprocess.run([str(acidload_program()), *map(str, args)], capture_output=True, text=True, timeout=timeout)


def test_monte_carlo_text_speaks_of_the_planned_maximum():
    r = run("uncertainty", HISTORY, "--draws", "20", "--seed", "3")
    assert r.returncode == 0, r.stderr
    assert "hours cap" not in r.stdout and " cap " not in r.stdout
    assert "planned maximum" in r.stdout and "no limit within 8000 h" in r.stdout


DEMO = ROOT / "cases" / "demo-site.yaml"


def test_sweeps_and_solve_say_no_limit_within_the_planned_maximum(tmp_path):
    # The demo case with a planned maximum of 300 h: clean gas reaches no oil-condition limit by then,
    # 3000 ppmv H2S does (hand reasoning: at 300 ppmv the demo's TBN falls ~0.37 mg KOH/g per 100 h
    # from 5.5, so ten times the H2S ends the charge in a few hundred hours at most).
    import math
    import numpy as np
    import acidload
    case_file = tmp_path / "short.yaml"
    case_file.write_text(DEMO.read_text(encoding="utf-8").replace("max-hours: 8000 h", "max-hours: 300 h", 1), encoding="utf-8")
    case = acidload.load_case(case_file)
    assert acidload.drain_interval(case, h2s_ppmv=0.0) is None  # never 300 h counted as an interval
    swept = acidload.drain_interval(case, h2s_ppmv=[0.0, 3000.0])
    assert math.isnan(swept[0]) and 0 < swept[1] < 300
    a = acidload.solve_for_interval(case, target_h=300, h2s_ppmv=None)
    assert not a.found and "planned maximum" in a.reason and a.interval_at_low_h is None
    b = acidload.solve_for_interval(case, target_h=250, h2s_ppmv=(0, 1))
    assert not b.found and b.interval_at_low_h is None and b.interval_at_high_h is None
    assert "no limit within 300 h" in b.reason
    r = run("solve", case_file, "--for", "h2s", "--target", "250 h", "--range", "0 ppmv", "1 ppmv")
    assert r.returncode == 0, r.stderr
    assert "no limit within 300 h at 0 ppmv dry" in r.stdout and "300 h and 300 h" not in r.stdout
    r = run("solve", case_file, "--for", "h2s", "--target", "300 h")
    assert "no answer" in r.stdout and "planned maximum" in r.stdout


JUMPING_CASE = """# Invented data: a test case whose TBN curve steps up where 5 % of the oil is drained and made up fresh.
format-version: 1
case: a partial drain at 1000 h
fuel:
  basis: dry
  composition: {CH4: 50 %, CO2: 50 %}
  h2s: 300 ppmv
engine:
  power: 1 MW
  electrical-efficiency: 40 %
  nox: 500 mg/Nm3 at 5 % O2
oil:
  volume: 600 L
  fresh-tbn: 6 mg KOH/g
  consumption: 0.2 g/kWh
limits:
  ignore: [tan-rise, crossover, san, oxidation, nitration, viscosity, antioxidant]
record:
  segments:
    - {hours: 1000 h}
    - {hours: 7000 h, event: partial-drain, event-amount: 5 %}
"""


def test_solve_refuses_a_target_the_interval_jumps_over(tmp_path):
    # TBN fall the only limit; the partial drain at 1000 h steps TBN up, so an H2S that brings TBN to
    # its limit just after 1000 h lasts tens of hours longer: the interval jumps down to 1000 h and the
    # hours in between are given by no H2S (docs/model.md §11). The jump is found by a sweep here.
    import numpy as np
    import acidload
    case_file = tmp_path / "jump.yaml"
    case_file.write_text(JUMPING_CASE, encoding="utf-8")
    case = acidload.load_case(case_file)
    h2s = np.linspace(100, 600, 501)
    swept = acidload.drain_interval(case, h2s_ppmv=h2s)
    steps = np.diff(swept)
    k = int(np.argmin(steps))
    assert swept[k] > 1000 >= swept[k + 1] and -steps[k] > 30  # a real jump, to the partial drain
    target = 0.5 * (swept[k] + swept[k + 1])
    a = acidload.solve_for_interval(case, target_h=target, h2s_ppmv=(0, 3000))
    assert not a.found and a.value is None and a.jump and "jumps from" in a.reason and "past the target" in a.reason
    assert h2s[k] <= a.jump_at <= h2s[k + 1]
    assert a.jump_from_h > target > a.jump_to_h and abs(a.jump_to_h - 1000) < 0.5
    r = run("solve", case_file, "--for", "h2s", "--target", f"{target:.1f} h")
    assert r.returncode == 0, r.stderr
    assert "no answer: near" in r.stdout and "the interval jumps from" in r.stdout and "to 1000 h" in r.stdout
    assert "where no limit is reached" not in r.stdout  # both sides of this jump reach a limit
