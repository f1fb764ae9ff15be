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
