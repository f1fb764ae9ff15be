"""The portable wheel, built as a user builds it and installed where yaml-cpp is absent.

scripts/wheel runs `pip wheel .` (scikit-build-core through the project's CMake build: the same build as
`pip install .`, a full build of the library — slow, so marked `slow`; scripts/test runs it once, on its
own) and `auditwheel repair`. The test then checks, from the ELF files themselves, that neither the
module nor the program needs the system's libyaml-cpp (the only yaml-cpp they need is the copy inside
the wheel, found through an $ORIGIN RPATH), installs the wheel into a fresh virtual environment, and runs
a case there with the package and with the program — once as it is, and once in a private mount
namespace where the system's libyaml-cpp is replaced by an empty file (so that a hidden dependency on
it would fail to load). Expected values: the in-tree program's summary for the demo case (invented data).
"""
import json
import os
import pathlib
import shutil
import subprocess
import sys
import zipfile

import pytest

from conftest import ROOT, acidload_program

pytestmark = pytest.mark.slow

SYSTEM_YAML_CPP = sorted(pathlib.Path("/usr/lib/x86_64-linux-gnu").glob("libyaml-cpp.so.*"))


def clean_env():
    env = {k: v for k, v in os.environ.items() if k not in ("PYTHONPATH", "PYTHONHOME", "VIRTUAL_ENV")}
    env["PIP_DISABLE_PIP_VERSION_CHECK"] = "1"
    return env


def dynamic_section(path):
    """NEEDED entries and RPATH/RUNPATH of an ELF file, read by binutils' readelf."""
    out = subprocess.run(["readelf", "-d", str(path)], capture_output=True, text=True, check=True).stdout
    needed = [line.split("[", 1)[1].rstrip("]") for line in out.splitlines() if "(NEEDED)" in line]
    rpath = [line.split("[", 1)[1].rstrip("]") for line in out.splitlines() if "PATH)" in line]
    return needed, rpath


def is_elf(path):
    with open(path, "rb") as f:
        return f.read(4) == b"\x7fELF"


@pytest.fixture(scope="module")
def wheel(tmp_path_factory):
    out = tmp_path_factory.mktemp("wheelhouse")
    r = subprocess.run([str(ROOT / "scripts" / "wheel"), str(out)], capture_output=True, text=True, timeout=2400,
                       env=clean_env())
    assert r.returncode == 0, r.stdout[-4000:] + r.stderr[-4000:]
    wheels = list(out.glob("acidload-*.whl"))
    assert len(wheels) == 1, wheels
    return wheels[0]


def test_the_wheel_carries_its_own_yaml_cpp(wheel, tmp_path):
    assert "manylinux" in wheel.name, wheel.name  # auditwheel's tag: the wheel passed its policy check
    unpacked = tmp_path / "unpacked"
    with zipfile.ZipFile(wheel) as z:
        z.extractall(unpacked)
    elves = [p for p in unpacked.rglob("*") if p.is_file() and is_elf(p)]
    module = [p for p in elves if p.name.startswith("_core.")]
    program = [p for p in elves if p.name == "acidload"]
    vendored = [p for p in elves if p.name.startswith("libyaml-cpp")]
    assert len(module) == 1 and len(program) == 1 and len(vendored) == 1, elves
    for binary in module + program:
        needed, rpath = dynamic_section(binary)
        yaml = [n for n in needed if "yaml-cpp" in n]
        # exactly the vendored copy (hashed name), never the system's libyaml-cpp.so.0.7
        assert yaml == [vendored[0].name], (binary, needed)
        assert rpath and all(entry.startswith("$ORIGIN") for entry in rpath), (binary, rpath)
        assert (binary.parent / rpath[0].replace("$ORIGIN", ".") / vendored[0].name).resolve().is_file()


def run_in_venv(python, exe, case, hide_system_yaml_cpp):
    """Runs the package and the program from the venv; with hide_system_yaml_cpp, inside a private mount
    namespace where every system libyaml-cpp.so.* is an empty file (root and unshare(1) needed)."""
    script = (
        "import json, sys, acidload\n"
        "case = acidload.load_case(sys.argv[1])\n"
        "r = acidload.run(case)\n"
        "print(json.dumps({'file': acidload.__file__, 'version': acidload.__version__, 'summary': r.summary,\n"
        "                  'sweep': acidload.drain_interval(case, h2s_ppmv=[50, 300]).tolist()}))\n")
    commands = [[str(python), "-c", script, str(case)], [str(exe), "--version"], [str(exe), "run", str(case)]]
    if hide_system_yaml_cpp:
        binds = " && ".join(f"mount --bind /dev/null {lib}" for lib in SYSTEM_YAML_CPP)
        wrapped = []
        for cmd in commands:
            quoted = " ".join("'" + c.replace("'", "'\\''") + "'" for c in cmd)
            wrapped.append(["unshare", "--mount", "sh", "-c", f"{binds} && exec {quoted}"])
        commands = wrapped
    return [subprocess.run(cmd, capture_output=True, text=True, timeout=300, env=clean_env()) for cmd in commands]


def can_hide_system_libraries():
    if os.geteuid() != 0 or shutil.which("unshare") is None or not SYSTEM_YAML_CPP:
        return False
    r = subprocess.run(["unshare", "--mount", "sh", "-c", f"mount --bind /dev/null {SYSTEM_YAML_CPP[0]}"],
                       capture_output=True)
    return r.returncode == 0


def test_the_wheel_installs_and_runs_where_yaml_cpp_is_absent(wheel, tmp_path):
    program = acidload_program()
    case = ROOT / "cases" / "demo-site.yaml"
    venv = tmp_path / "venv"
    subprocess.run([sys.executable, "-m", "venv", str(venv)], check=True, timeout=300)
    python = venv / "bin" / "python"
    r = subprocess.run([str(python), "-m", "pip", "install", str(wheel)], capture_output=True, text=True,
                       timeout=900, env=clean_env(), cwd=tmp_path)
    assert r.returncode == 0, r.stdout[-4000:] + r.stderr[-4000:]
    exe = venv / "bin" / "acidload"
    assert exe.is_file()
    # only the Python component is installed: no C++ headers or CMake package in the venv
    assert not list(venv.rglob("acidload.hpp")) and not list(venv.rglob("acidloadConfig.cmake"))

    out = tmp_path / "program"
    p = subprocess.run([str(program), "run", str(case), "--out", str(out)], capture_output=True, text=True,
                       timeout=300)
    assert p.returncode == 0, p.stderr
    expected = json.loads((out / "summary.json").read_text(encoding="utf-8"))  # the in-tree program

    modes = [False]
    if can_hide_system_libraries():
        modes.append(True)
    elif os.environ.get("CI", "").lower() == "true":
        pytest.fail("CI=true: cannot hide the system libyaml-cpp (needs root and unshare --mount)")
    for hide in modes:
        package, version, run = run_in_venv(python, exe, case, hide)
        assert package.returncode == 0, (hide, package.stderr)
        got = json.loads(package.stdout)
        assert got["file"].startswith(str(venv)), got["file"]
        assert got["summary"] == expected
        assert got["sweep"][1] == pytest.approx(expected["variants"][0]["drain-interval-h"], rel=1e-9)
        assert version.returncode == 0 and version.stdout.strip() == f"acidload {got['version']}", version
        assert run.returncode == 0 and "raw gas" in run.stdout, (hide, run.stderr)
    if len(modes) == 2:
        # and the hiding is real: the in-tree program, linked to the system library, cannot start there
        hidden = run_in_venv(python, program, case, True)[1]
        assert hidden.returncode != 0 and "yaml-cpp" in hidden.stderr, hidden
