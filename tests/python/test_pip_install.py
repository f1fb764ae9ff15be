"""`pip install .` into a fresh virtual environment: the wheel builds with scikit-build-core through the
project's CMake (a full build of the library: slow, so marked `slow`; scripts/test runs it once, on its
own), then `import acidload` runs a case there and the installed `acidload` program answers --version.
Only PyPI is needed (scikit-build-core, pybind11 and numpy); the C++ dependencies come from the system.
Expected values: the in-tree program's summary for the demo case (invented data)."""
import json
import os
import subprocess
import sys

import pytest

from conftest import ROOT, acidload_program

pytestmark = pytest.mark.slow


def clean_env():
    env = {k: v for k, v in os.environ.items() if k not in ("PYTHONPATH", "PYTHONHOME", "VIRTUAL_ENV")}
    env["PIP_DISABLE_PIP_VERSION_CHECK"] = "1"
    return env


def test_pip_install_into_a_fresh_venv(tmp_path):
    program = acidload_program()
    venv = tmp_path / "venv"
    subprocess.run([sys.executable, "-m", "venv", str(venv)], check=True, timeout=300)
    python = venv / "bin" / "python"
    r = subprocess.run([str(python), "-m", "pip", "install", str(ROOT)], capture_output=True, text=True,
                       timeout=1800, env=clean_env(), cwd=tmp_path)
    assert r.returncode == 0, r.stdout[-4000:] + r.stderr[-4000:]

    # the package, from the venv (not from a build folder), runs the demo case
    script = (
        "import json, sys, acidload\n"
        "case = acidload.load_case(sys.argv[1])\n"
        "r = acidload.run(case)\n"
        "print(json.dumps({'file': acidload.__file__, 'version': acidload.__version__, 'summary': r.summary,\n"
        "                  'sweep': acidload.drain_interval(case, h2s_ppmv=[50, 300]).tolist()}))\n")
    r = subprocess.run([str(python), "-c", script, str(ROOT / "cases" / "demo-site.yaml")], capture_output=True,
                       text=True, timeout=300, env=clean_env(), cwd=tmp_path)
    assert r.returncode == 0, r.stderr
    got = json.loads(r.stdout)
    assert got["file"].startswith(str(venv)), got["file"]
    out = tmp_path / "program"
    p = subprocess.run([str(program), "run", str(ROOT / "cases" / "demo-site.yaml"), "--out", str(out)],
                       capture_output=True, text=True, timeout=300)
    assert p.returncode == 0, p.stderr
    expected = json.loads((out / "summary.json").read_text(encoding="utf-8"))  # the in-tree program
    assert got["summary"] == expected
    assert got["sweep"][1] == pytest.approx(expected["variants"][0]["drain-interval-h"], rel=1e-9)

    # the program rides along in the venv's scripts folder, with the one version
    exe = venv / "bin" / "acidload"
    assert exe.is_file()
    v = subprocess.run([str(exe), "--version"], capture_output=True, text=True, timeout=60, env=clean_env())
    assert v.returncode == 0 and v.stdout.strip() == f"acidload {got['version']}", v.stdout
    run = subprocess.run([str(exe), "run", str(ROOT / "cases" / "demo-site.yaml")], capture_output=True, text=True,
                         timeout=300, env=clean_env())
    assert run.returncode == 0 and "raw gas" in run.stdout, run.stderr

    # only the Python component is installed: no C++ headers or CMake package in the venv
    assert not list(venv.rglob("acidload.hpp")) and not list(venv.rglob("acidloadConfig.cmake"))
