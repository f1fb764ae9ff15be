"""Output safety of the program and the package: results folders are acidload's own, overlays never
replace a file acidload did not write, writes are atomic and leave no debris (issue rules in
README.md "Using the program" and io/results.hpp). The expectations are the project's own rules, not
values from its output; the folder digests compare bytes before and after."""
import hashlib
import os
import pathlib
import shutil
import signal
import subprocess
import time

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from conftest import ROOT, acidload_program, need_acidload

DEMO = ROOT / "cases" / "demo-site.yaml"
HISTORY = ROOT / "cases" / "demo-site-history.yaml"
LAB = ROOT / "cases" / "demo-site-lab.csv"
MARKER = ".acidload-results"


def digest(folder: pathlib.Path) -> str:
    h = hashlib.sha256()
    for p in sorted(folder.rglob("*")):
        h.update(str(p.relative_to(folder)).encode())
        if p.is_file() and not p.is_symlink():
            h.update(p.read_bytes())
    return h.hexdigest()


def debris(folder: pathlib.Path):
    return [p.name for p in folder.iterdir() if p.name.startswith(".acidload-tmp-")]


def run(*args, cwd=None, timeout=120):
    return subprocess.run([str(acidload_program()), *map(str, args)], capture_output=True, text=True, cwd=cwd,
                          timeout=timeout)


@pytest.fixture
def site(tmp_path):
    """A copy of the demo case in a folder of its own."""
    d = tmp_path / "site"
    d.mkdir()
    shutil.copy(DEMO, d / "case.yaml")
    return d


def test_the_folder_of_the_inputs_is_never_a_target(site):
    before = digest(site)
    for out in (site, site / ".", site / "sub" / ".."):
        r = run("run", site / "case.yaml", "--out", out)
        assert r.returncode == 3 and "holds the input" in r.stderr and not r.stdout
    r = run("run", "case.yaml", "--out", ".", cwd=site)
    assert r.returncode == 3
    assert digest(site) == before


def test_a_folder_acidload_did_not_write_is_refused_and_untouched(site, tmp_path):
    other = tmp_path / "papers"
    other.mkdir()
    (other / "report.docx").write_bytes(b"\x00keep")
    before = digest(other)
    r = run("run", site / "case.yaml", "--out", other)
    assert r.returncode == 3 and "did not write" in r.stderr
    assert digest(other) == before and not debris(tmp_path)


def test_results_folder_replaced_whole_but_not_with_foreign_files(site, tmp_path):
    out = tmp_path / "out"
    assert run("run", site / "case.yaml", "--out", out).returncode == 0
    assert sorted(p.name for p in out.iterdir()) == [MARKER, "summary.json", "trajectories.csv"]
    assert run("run", site / "case.yaml", "--out", out).returncode == 0  # its own folder: replaced
    (out / "notes.txt").write_text("mine")
    before = digest(out)
    r = run("run", site / "case.yaml", "--out", out)
    assert r.returncode == 3 and "notes.txt" in r.stderr
    assert digest(out) == before and not debris(tmp_path)


def test_empty_folder_trailing_slash_dot_and_long_names(site, tmp_path):
    empty = tmp_path / "empty"
    empty.mkdir()
    assert run("run", site / "case.yaml", "--out", str(empty) + "/").returncode == 0
    assert (empty / MARKER).is_file()
    here = tmp_path / "here"
    here.mkdir()
    assert run("run", site / "case.yaml", "--out", ".", cwd=here).returncode == 0
    assert (here / "summary.json").is_file()
    long_name = tmp_path / ("r" * 250)
    assert run("run", site / "case.yaml", "--out", long_name).returncode == 0
    assert (long_name / "summary.json").is_file()
    r = run("run", site / "case.yaml", "--out", tmp_path / ("r" * 256))
    assert r.returncode == 3 and "255" in r.stderr
    assert run("run", site / "case.yaml", "--out", "/").returncode == 3
    assert not debris(tmp_path)


def test_symlinked_out_is_written_through(site, tmp_path):
    real = tmp_path / "real"
    assert run("run", site / "case.yaml", "--out", real).returncode == 0
    link = tmp_path / "link"
    link.symlink_to(real)
    assert run("run", site / "case.yaml", "--out", link).returncode == 0
    assert link.is_symlink() and os.readlink(link) == str(real) and (real / "summary.json").is_file()
    dangling = tmp_path / "dangling"
    dangling.symlink_to(tmp_path / "nowhere")
    assert run("run", site / "case.yaml", "--out", dangling).returncode == 3
    assert dangling.is_symlink() and not (tmp_path / "nowhere").exists()


def test_stale_temporaries_of_a_killed_run_are_removed(site, tmp_path):
    dead = subprocess.Popen(["true"])
    dead.wait()
    stale = tmp_path / f".acidload-tmp-{dead.pid}-0"
    stale.mkdir()
    (stale / MARKER).write_text("acidload results folder\nfiles:\nsummary.json\n")
    (stale / "summary.json").write_text("{")
    assert run("run", site / "case.yaml", "--out", tmp_path / "out").returncode == 0
    assert not stale.exists()


@pytest.mark.parametrize("sig", [signal.SIGINT, signal.SIGTERM, signal.SIGKILL])
def test_a_signal_mid_run_leaves_the_old_result_or_the_new_one(site, tmp_path, sig):
    out = tmp_path / "out"
    assert run("run", site / "case.yaml", "--out", out).returncode == 0
    good = (out / "summary.json").read_text()
    for delay in (0.0, 0.02, 0.05, 0.1, 0.2):
        p = subprocess.Popen([str(acidload_program()), "run", str(site / "case.yaml"), "--out", str(out)],
                             stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        time.sleep(delay)
        p.send_signal(sig)
        p.wait(timeout=60)
        if sig != signal.SIGKILL:
            assert not debris(tmp_path)
        assert (out / "summary.json").read_text() == good and (out / MARKER).is_file()
    assert run("run", site / "case.yaml", "--out", out).returncode == 0
    left = debris(tmp_path)
    assert not left, [(n, sorted(p.name for p in (tmp_path / n).iterdir()), (tmp_path / n / MARKER).read_text() if (tmp_path / n / MARKER).exists() else None) for n in left]  # a killed run's temporary is gone after the next run


def test_four_parallel_runs_on_one_folder(site, tmp_path):
    out = tmp_path / "out"
    procs = [subprocess.Popen([str(acidload_program()), "run", str(site / "case.yaml"), "--out", str(out)],
                              stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, text=True) for _ in range(4)]
    codes = [(p.wait(timeout=120), p.stderr.read()) for p in procs]
    assert all(c == 0 for c, _ in codes), codes
    assert sorted(p.name for p in out.iterdir()) == [MARKER, "summary.json", "trajectories.csv"]
    assert not debris(tmp_path)


def test_write_overlay_refuses_what_the_command_read(tmp_path):
    case = tmp_path / "case.yaml"
    lab = tmp_path / "lab.csv"
    shutil.copy(HISTORY, case)
    shutil.copy(LAB, lab)
    for p in ROOT.glob("cases/*.csv"):  # the record file the history case names
        if not (tmp_path / p.name).exists():
            shutil.copy(p, tmp_path / p.name)
    before = digest(tmp_path)
    args = ["fit", case, "--lab", lab, "--parameters", "model.liner-uptake"]
    for target in (case, lab, tmp_path / "." / "case.yaml"):
        r = run(*args, "--write-overlay", target)
        assert r.returncode == 3 and "read" in r.stderr and not r.stdout
    other = tmp_path / "notes.yaml"
    other.write_text("mine: 1\n")
    before = digest(tmp_path)
    r = run(*args, "--write-overlay", other)
    assert r.returncode == 3 and "did not write" in r.stderr
    assert digest(tmp_path) == before
    ov = tmp_path / "fitted.yaml"
    assert run(*args, "--write-overlay", ov).returncode == 0
    assert run(*args, "--write-overlay", ov).returncode == 0  # its own overlay: replaced
    link = tmp_path / "link.yaml"
    link.symlink_to(ov)
    assert run(*args, "--write-overlay", link).returncode == 0 and link.is_symlink()
    assert not debris(tmp_path)


def test_python_write_follows_the_same_rules(tmp_path):
    acidload = need_acidload()
    result = acidload.run(acidload.load_case(DEMO))
    other = tmp_path / "papers"
    other.mkdir()
    (other / "a.txt").write_text("keep")
    with pytest.raises(acidload.Error, match="did not write"):
        result.write(other)
    assert (other / "a.txt").read_text() == "keep"
    with pytest.raises(acidload.Error, match="holds the input"):
        result.write(DEMO.parent)
    result.write(tmp_path / "out")
    assert (tmp_path / "out" / MARKER).is_file()
    with pytest.raises(TypeError):
        result.write(5)
    fit = acidload.fit(acidload.load_case(HISTORY), str(LAB), ["model.liner-uptake"])
    notes = tmp_path / "notes.yaml"
    notes.write_text("mine: 1\n")
    with pytest.raises(acidload.Error, match="did not write"):
        fit.write_overlay(notes)
    with pytest.raises(acidload.Error, match="read"):
        fit.write_overlay(notes, case_file=str(notes))
    assert notes.read_text() == "mine: 1\n"
    fit.write_overlay(tmp_path / "fitted.yaml")
    assert not debris(tmp_path)


names = st.text(alphabet=st.characters(min_codepoint=0x21, max_codepoint=0x7e, blacklist_characters="/\\"),
                min_size=1, max_size=12).filter(lambda s: s not in (".", "..", MARKER))


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(contents=st.dictionaries(names, st.binary(max_size=64), max_size=4), marker=st.booleans(), tmp_path_seed=st.integers(0, 10**9))
def test_property_a_write_never_loses_a_file_acidload_did_not_write(tmp_path, contents, marker, tmp_path_seed):
    """For any folder contents, with or without a marker: Result.write either refuses and leaves the
    folder byte-identical, or the folder held nothing but what acidload wrote."""
    acidload = need_acidload()
    result = _demo_result(acidload)
    out = tmp_path / f"t{tmp_path_seed}"
    out.mkdir()
    for n, b in contents.items():
        (out / n).write_bytes(b)
    if marker:
        (out / MARKER).write_text("acidload results folder\nfiles:\nsummary.json\ntrajectories.csv\n")
    before = digest(out)
    foreign = [n for n in contents if n not in ("summary.json", "trajectories.csv", MARKER)]
    try:
        result.write(out)
        wrote = True
    except acidload.Error:
        wrote = False
    if foreign or (contents and not marker):
        assert not wrote and digest(out) == before
    else:
        assert wrote and (out / MARKER).is_file()
    assert not debris(tmp_path)
    shutil.rmtree(out)


_cached = {}


def _demo_result(acidload):
    if "r" not in _cached:
        _cached["r"] = acidload.run(acidload.load_case(DEMO))
    return _cached["r"]
