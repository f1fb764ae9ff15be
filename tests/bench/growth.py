"""Growth tables (run by scripts/bench; not by the tests): how time and peak memory grow with the
size of the work, each size one run of the program in a child process (wall time, and the child's
peak resident memory from GNU time). Sizes: record length 1e2–1e7 rows (`acidload check` and
`acidload run` of the demo site with the record as a CSV file, and Python's acidload.load_case of it), Monte Carlo draws 1e2–1e6
(`acidload uncertainty` of the demo history), lab samples 10–1e4 (`acidload fit` of three parameters),
fleet size 1–1000 (that many case files in one `acidload run`, a fleet; and that many variants of one case),
variants read by `acidload check` 1e2–1e4 (reading is linear in their number).
Usage: growth.py ACIDLOAD_PROGRAM [--quick] [--records] (--records: the record table only)"""
import os
import shutil
import pathlib
import subprocess
import sys
import tempfile
import time

import numpy as np

root = pathlib.Path(__file__).resolve().parents[2]
sys.path.insert(0, str(pathlib.Path(__file__).parent))
import acidload  # noqa: E402
from bench import case_with_record  # noqa: E402

program = os.path.abspath(sys.argv[1])
PRLIMIT = shutil.which("prlimit")
TIME = "/usr/bin/time"  # GNU time (the Debian package time, installed by scripts/setup)
quick = "--quick" in sys.argv
TIMEOUT = 240  # s per run; a run over it is shown as such
MEMORY_CAP = 6 << 30  # bytes of address space per run (the machine is shared): a run over it fails, shown as such


def run_rss(cmd):
    """(seconds, peak resident MB, exit code, first line of stderr) of one run of cmd; GNU time
    reports the program's own peak (a child forked from this Python would count its memory too),
    prlimit caps its address space."""
    with tempfile.NamedTemporaryFile() as rss, tempfile.TemporaryFile() as err:
        t = time.perf_counter()
        p = subprocess.Popen([TIME, "-q", "-f", "%M", "-o", rss.name, PRLIMIT, f"--as={MEMORY_CAP}", *cmd],
                             stdout=subprocess.DEVNULL, stderr=err)
        try:
            p.wait(timeout=TIMEOUT)
        except subprocess.TimeoutExpired:
            p.kill()
            p.wait()
            return TIMEOUT, float("nan"), "timeout", ""
        dt = time.perf_counter() - t
        err.seek(0)
        msg = err.read().decode(errors="replace").strip().split("\n")
        text = pathlib.Path(rss.name).read_text().split()
    kb = float(text[-1]) if text and text[-1].isdigit() else float("nan")
    first = msg[0] if msg else ""
    return dt, kb / 1024, p.returncode, first if len(first) <= 100 else "…" + first[-99:]


def row(label, size, res, per=None):
    dt, rss, rc, msg = res
    note = "" if rc == 0 else f"  exit {rc}: {msg}"
    per_s = f"{dt / size * 1e6:10.2f} us/{per}" if per and rc == 0 else " " * 18
    print(f"   {label:>10} {size:>10.0e} {dt:9.2f} s {rss:9.0f} MB  {per_s}{note}")


def records(tmp):
    print("Record length: the demo site with its record as a CSV file (hours, H2S, load), every row 1 h")
    print(f"   {'command':>10} {'rows':>10} {'time':>11} {'peak':>12}")
    sizes = [100, 1000, 10_000, 100_000] + ([] if quick else [1_000_000, 10_000_000])
    case = (root / "cases" / "demo-site.yaml").read_text()
    for n in sizes:
        csv_path = pathlib.Path(tmp) / f"rec-{n}.csv"
        with open(csv_path, "w") as f:
            f.write("hours [h],h2s [ppmv],load [%]\n")
            hour = np.arange(n)
            h2s = 300 + 120 * np.sin(hour / 24 * 2 * np.pi)
            load = 85 + 15 * np.sin(hour / 24 * 2 * np.pi + 1)
            for i in range(0, n, 100_000):
                f.writelines(f"1,{a:.1f},{b:.1f}\n" for a, b in zip(h2s[i:i + 100_000], load[i:i + 100_000]))
        case_path = pathlib.Path(tmp) / f"rec-{n}.yaml"
        case_path.write_text(case_with_record(case, csv_path) + "run:\n  output-interval: 24 h\n")
        row("check", n, run_rss([program, "check", str(case_path)]), "row")
        row("run", n, run_rss([program, "run", str(case_path)]), "row")
        # Python loading the case, and loading and running it (a fresh interpreter importing acidload:
        # about 30 MB of the peak)
        row("Python", n, run_rss([sys.executable, "-c", "import sys, acidload; acidload.load_case(sys.argv[1])",
                                  str(case_path)]), "row")
        row("Python run", n, run_rss([sys.executable, "-c", "import sys, acidload; acidload.load_case(sys.argv[1]).run()",
                                      str(case_path)]), "row")
        csv_path.unlink()
    print()


def draws():
    print("Monte Carlo draws: acidload uncertainty cases/demo-site-history.yaml (its 4 inputs), every core")
    print(f"   {'':>10} {'draws':>10} {'time':>11} {'peak':>12}")
    for n in [100, 1000, 10_000, 100_000] + ([] if quick else [1_000_000]):
        row("", n, run_rss([program, "uncertainty", str(root / "cases" / "demo-site-history.yaml"), "--draws", str(n)]), "draw")
    print()


def lab_samples(tmp):
    print("Lab samples: acidload fit of three parameters (oxidation rate, acid yield, salt share) to N samples")
    print("over a record of 4 charges of 2500 h (invented readings: the model at chosen parameters plus noise)")
    print(f"   {'':>10} {'samples':>10} {'time':>11} {'peak':>12}")
    text = (root / "cases" / "demo-site-history.yaml").read_text().split("record:")[0]
    text += "record:\n  segments:\n" + "".join(
        f"    - {{hours: 2500 h, h2s: {h} ppmv{', event: oil-change' if i else ''}}}\n" for i, h in enumerate((280, 330, 250, 310)))
    case_path = pathlib.Path(tmp) / "fit.yaml"
    case_path.write_text(text)
    case = acidload.load_case(str(case_path))
    ec = case.variants[0]._engine_case
    truth = acidload._core.with_parameter(acidload._core.with_parameter(ec, "model.oxidation-rate", 0.010),
                                          "model.organic-acid-yield", 0.10)
    rng = np.random.default_rng(3)
    header = "charge,oil-hours,tbn [mg KOH/g],tan [mg KOH/g],oxidation [A/cm]"
    for n in [10, 100, 1000] + ([] if quick else [10_000]):
        per = -(-n // 4)  # samples per charge, rounded up: n samples in all, the last charges one fewer where n is not a multiple of 4
        where = sorted((i % 4, 2500 * (i // 4 + 1) / (per + 1)) for i in range(n))
        lab = pathlib.Path(tmp) / f"lab-{n}.csv"
        lab.write_text("\n".join([header] + [f"{c + 1},{h:.4f},0,0,0" for c, h in where]) + "\n")
        samples = acidload.read_lab_samples(lab)  # read_lab gives a table now; predict takes the samples
        pred = acidload._core.predict(truth, getattr(samples, "_samples", samples))
        vals = np.asarray(pred["predicted"]) + np.asarray(pred["sigma"]) * 0.5 * rng.standard_normal(len(pred["predicted"]))
        vals = np.maximum(vals, 0.0)  # readings are never negative
        lab.write_text("\n".join([header] + [f"{c + 1},{h:.4f},{vals[3 * i]:.5f},{vals[3 * i + 1]:.5f},{vals[3 * i + 2]:.5f}"
                                             for i, (c, h) in enumerate(where)]) + "\n")
        row("", len(where), run_rss([program, "fit", str(case_path), "--lab", str(lab), "--parameters",
                                     "model.oxidation-rate,model.organic-acid-yield,model.salt-titration-share"]), "sample")
    print()


def fleet(tmp):
    case = (root / "cases" / "demo-site.yaml").read_text()
    base = case_with_record(case, "x").split("\nrecord:")[0]
    print("Fleet size: N case files (the demo site without variants, each its own H2S) in one acidload run")
    print(f"   {'':>10} {'cases':>10} {'time':>11} {'peak':>12}")
    folder = pathlib.Path(tmp) / "fleet"
    folder.mkdir()
    for n in [1, 10, 100, 1000]:
        for i in range(len(list(folder.iterdir())), n):
            (folder / f"engine-{i:04d}.yaml").write_text(base.replace("h2s: 300 ppmv", f"h2s: {50 + i * 0.5} ppmv", 1) + "\n")
        row("", n, run_rss([program, "run", str(folder)]), "case")
    print()
    print("Fleet size: N variants of the demo site (each its own H2S) in one acidload run; and read only (check)")
    print(f"   {'':>10} {'variants':>10} {'time':>11} {'peak':>12}")
    for n in [1, 10, 100, 1000, 10000]:
        text = base + "\nvariants:\n" + "".join(f"  - name: h2s {i}\n    fuel:\n      h2s: {50 + i * 0.5} ppmv\n" for i in range(n - 1))
        path = pathlib.Path(tmp) / f"fleet-{n}.yaml"
        path.write_text(text if n > 1 else base + "\n")
        if n <= 1000:
            row("run", n, run_rss([program, "run", str(path)]), "variant")
        row("check", n, run_rss([program, "check", str(path)]), "variant")
    print()


if __name__ == "__main__":
    print(f"acidload {acidload.__version__} growth tables: one child run per size; wall time and peak resident memory "
          f"(the machine may be shared: times are upper bounds)\n")
    with tempfile.TemporaryDirectory() as tmp:
        records(tmp)
        if "--records" not in sys.argv:
            draws()
            lab_samples(tmp)
            fleet(tmp)
