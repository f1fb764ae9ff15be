"""The Python examples run: the notebook examples/compare_scrubbing.ipynb executed headless (nbclient) with
its outputs checked, and the script examples/compare_scrubbing.py writing its PNG. The drain intervals
they show are compared with the acidload program's summary.json for the demo case (the program is the
source of those values; the demo case is invented data)."""
import ast
import json
import os
import pathlib
import subprocess
import sys

from conftest import ROOT, acidload_program, need, need_acidload

EXAMPLES = ROOT / "examples"
DEMO = ROOT / "cases" / "demo-site.yaml"
SCRUBBING = ["raw gas", "iron oxide to 50 ppmv", "iron oxide + carbon to 10 ppmv"]


def program_intervals(tmp_path):
    out = tmp_path / "program"
    r = subprocess.run([str(acidload_program()), "run", str(DEMO), "--out", str(out)], capture_output=True,
                       text=True, timeout=300)
    assert r.returncode == 0, r.stderr
    summary = json.loads((out / "summary.json").read_text(encoding="utf-8"))
    return {v["name"]: v["drain-interval-h"] for v in summary["variants"]}


def env_with_acidload(acidload):
    """The environment for a child Python: the acidload found here first on its path, no GUI backend."""
    env = dict(os.environ)
    where = str(pathlib.Path(acidload.__file__).resolve().parents[1])
    env["PYTHONPATH"] = where + (os.pathsep + env["PYTHONPATH"] if env.get("PYTHONPATH") else "")
    env["MPLBACKEND"] = "Agg"
    return env


def test_notebook_runs_headless_and_shows_the_programs_intervals(tmp_path, monkeypatch):
    acidload = need_acidload()
    nbformat = need("nbformat")
    nbclient = need("nbclient")
    need("ipykernel")
    need("matplotlib")
    env = env_with_acidload(acidload)
    env.pop("MPLBACKEND")  # the notebook's inline backend makes the figures
    for k, v in env.items():
        monkeypatch.setenv(k, v)  # the kernel inherits this environment
    nb = nbformat.read(EXAMPLES / "compare_scrubbing.ipynb", as_version=4)
    assert all(not c.get("outputs") for c in nb.cells if c.cell_type == "code"), "the notebook is kept without outputs"
    client = nbclient.NotebookClient(nb, timeout=300, kernel_name="python3",
                                     resources={"metadata": {"path": str(EXAMPLES)}})
    client.execute()
    code = [c for c in nb.cells if c.cell_type == "code"]
    errors = [o for c in code for o in c.outputs if o.output_type == "error"]
    assert not errors, errors
    images = [o for c in code for o in c.outputs if o.output_type == "display_data" and "image/png" in o.data]
    assert len(images) == 6, ("the TBN/TAN/SAN/oxidation figure, viscosity and antioxidant, the H2S sweep, the acids by "
                              "species, the cost per MWh against the H2S at the engine and against the changeout level")
    text = "".join(o.get("text", "") for c in code for o in c.outputs if o.output_type == "stream")
    assert acidload.__version__ in text and "Harrowfield" in text
    expected = program_intervals(tmp_path)
    for name in SCRUBBING:
        assert name in text
    assert f"drain interval {expected['raw gas']:6.0f} h" in text
    last = code[-1].outputs[-1]
    assert last.output_type == "execute_result"
    shown = ast.literal_eval(last.data["text/plain"])
    assert set(shown) == set(SCRUBBING)
    for name in SCRUBBING:
        assert abs(shown[name] - expected[name]) <= 5e-4, (name, shown[name], expected[name])
    assert "H2S for 1500 h:" in text
    report = ROOT / "out" / "demo-site-report.html"  # the notebook's result.report()
    assert "report written to out/demo-site-report.html" in text and report.is_file()
    assert 'content="acidload report"' in report.read_text(encoding="utf-8")[:400]
    # the costs: the cheapest option and the cheapest changeout level are the program's
    costs = program_costs(tmp_path)
    assert f"cheapest: {costs['cheapest']}" in text
    assert f"cheapest changeout level of the bed: {costs['level']:.1f} ppmv" in text


def program_costs(tmp_path):
    """The cheapest option of cases/demo-site-costs.yaml (its summary.json) and the cheapest changeout level
    of its iron-oxide bed, as the acidload program gives them."""
    prog = acidload_program()
    out = tmp_path / "costs-out"
    subprocess.run([str(prog), "run", str(ROOT / "cases" / "demo-site-costs.yaml"), "--out", str(out)], check=True,
                   capture_output=True, timeout=300)
    summary = json.loads((out / "summary.json").read_text(encoding="utf-8"))
    r = subprocess.run([str(prog), "costs", str(ROOT / "cases" / "demo-site-costs.yaml"), "--cheapest-level", "--variant",
                        "iron-oxide bed"], check=True, capture_output=True, text=True, timeout=300)
    answer = next(l for l in r.stdout.splitlines() if l.startswith("answer:"))
    return {"cheapest": summary["economics"]["cheapest"], "level": float(answer.split()[1])}


def test_script_writes_a_png(tmp_path):
    acidload = need_acidload()
    need("matplotlib")
    png = tmp_path / "compare.png"
    r = subprocess.run([sys.executable, str(EXAMPLES / "compare_scrubbing.py"), "--out", str(png)],
                       capture_output=True, text=True, timeout=300, env=env_with_acidload(acidload), cwd=tmp_path)
    assert r.returncode == 0, r.stderr
    data = png.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n" and len(data) > 20000
    costs_png = (tmp_path / "compare-costs.png").read_bytes()
    assert costs_png[:8] == b"\x89PNG\r\n\x1a\n" and len(costs_png) > 20000
    costs = program_costs(tmp_path)
    assert f"cheapest changeout level of the bed: {costs['level']:.1f} ppmv" in r.stdout
    expected = program_intervals(tmp_path)
    for name in SCRUBBING:
        line = next(l for l in r.stdout.splitlines() if l.startswith(name + " "))
        assert f"{expected[name]:.0f} h" in line, (line, expected[name])
