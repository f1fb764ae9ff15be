"""Example tier: the shipped cases run through the program.
- Golden results: the summaries of cases/demo-site.yaml and cases/drifting-gas.yaml and the site.json of
  cases/demo-landfill-site.yaml against
  tests/example/golden.json (regression values written by acidload itself when the physics was
  validated; they guard against unintended change, they are not a validation — that is the
  reference tier's job). Tolerance: 1e-9 relative on every number.
- A failed run leaves an existing output folder byte-identical (checksums compared).
- --help of every command answers with its usage and exit code 0; usage errors give exit code 2.
Usage: run.py PROGRAM [--update]"""
import hashlib
import json
import math
import pathlib
import shutil
import subprocess
import sys
import tempfile

program = sys.argv[1]
update = "--update" in sys.argv
root = pathlib.Path(__file__).resolve().parents[2]
golden_path = pathlib.Path(__file__).parent / "golden.json"
failures = []
checks = 0


def fail(msg):
    failures.append(msg)


def run(*args, cwd=root):
    return subprocess.run([program, *args], capture_output=True, text=True, cwd=cwd, timeout=300)


def compare(path, a, b):
    global checks
    if isinstance(b, dict):
        if not isinstance(a, dict) or set(a) != set(b):
            fail(f"{path}: keys differ: {sorted(set(a) ^ set(b)) if isinstance(a, dict) else type(a)}")
            return
        for k in b:
            compare(f"{path}.{k}", a[k], b[k])
    elif isinstance(b, list):
        if not isinstance(a, list) or len(a) != len(b):
            fail(f"{path}: list lengths differ")
            return
        for i, (x, y) in enumerate(zip(a, b)):
            compare(f"{path}[{i}]", x, y)
    elif isinstance(b, float) or isinstance(a, float):
        checks += 1
        if not (isinstance(a, (int, float)) and math.isclose(a, b, rel_tol=1e-9, abs_tol=1e-12)):
            fail(f"{path}: {a} != golden {b}")
    else:
        checks += 1
        if a != b:
            fail(f"{path}: {a!r} != golden {b!r}")


def tree_digest(folder):
    h = hashlib.sha256()
    for p in sorted(pathlib.Path(folder).rglob("*")):
        h.update(str(p.relative_to(folder)).encode())
        if p.is_file():
            h.update(p.read_bytes())
    return h.hexdigest()


with tempfile.TemporaryDirectory() as tmp:
    tmp = pathlib.Path(tmp)
    results = {}
    for case in ("demo-site", "drifting-gas"):
        out = tmp / case
        r = run("run", f"cases/{case}.yaml", "--out", str(out))
        if r.returncode != 0:
            fail(f"{case}: exit {r.returncode}: {r.stderr}")
            continue
        if "Caution:" not in r.stdout:
            fail(f"{case}: no caution line in the output")
        summary = json.loads((out / "summary.json").read_text())
        summary.pop("acidload-version")
        summary.pop("case-file")
        results[case] = summary
        header = (out / "trajectories.csv").read_text().split("\n", 1)[0]
        if not header.startswith("variant,charge,engine_hours_h,oil_hours_h"):
            fail(f"{case}: trajectories.csv header {header!r}")
    # the demo site (cases/demo-landfill-site.yaml): its site.json, and its files
    out = tmp / "demo-landfill-site"
    r = run("run", "cases/demo-landfill-site.yaml", "--out", str(out))
    if r.returncode != 0:
        fail(f"demo-landfill-site: exit {r.returncode}: {r.stderr}")
    else:
        site = json.loads((out / "site.json").read_text())
        site.pop("acidload-version")
        site.pop("site-file")
        results["demo-landfill-site"] = site
        if not (out / "engines.csv").read_text().startswith("engine,gas_share,"):
            fail("demo-landfill-site: engines.csv header")
        if "Caution:" not in r.stdout:
            fail("demo-landfill-site: no caution line in the output")
        before = tree_digest(out)  # a failed site run leaves the previous results untouched
        bad = tmp / "bad-site.yaml"
        bad.write_text((root / "cases" / "demo-landfill-site.yaml").read_text().replace("h2s: 350 ppmv", "h2s: 350 ppmw"))
        r = run("run", str(bad), "--out", str(out))
        if r.returncode != 3 or tree_digest(out) != before:
            fail(f"bad site: exit {r.returncode} (expected 3), folder changed: {tree_digest(out) != before}")
        foreign = tmp / "foreign"
        foreign.mkdir()
        (foreign / "notes.txt").write_text("mine")
        r = run("costs", "cases/demo-landfill-site.yaml", "--out", str(foreign))
        if r.returncode != 3 or (foreign / "notes.txt").read_text() != "mine" or len(list(foreign.iterdir())) != 1:
            fail(f"site costs --out a foreign folder: exit {r.returncode}, expected 3 and the folder left as it was")
    if update:
        golden_path.write_text(json.dumps(results, indent=1, sort_keys=True) + "\n")
        print(f"golden results written to {golden_path}")
    else:
        golden = json.loads(golden_path.read_text())
        compare("golden", results, golden)

    # a failed run leaves the previous results untouched
    out = tmp / "keep"
    r = run("run", "cases/demo-site.yaml", "--out", str(out))
    before = tree_digest(out)
    bad = tmp / "bad.yaml"
    bad.write_text((root / "cases" / "demo-site.yaml").read_text().replace("h2s: 300 ppmv", "h2s: 300 ppmw"))
    r = run("run", str(bad), "--out", str(out))
    if r.returncode != 3:
        fail(f"bad case: exit {r.returncode}, expected 3")
    if r.stdout:
        fail("bad case: wrote a result to standard output")
    if tree_digest(out) != before:
        fail("a failed run changed the existing output folder")
    checks += 3
    # and a run to a path that is a file refuses without writing anything
    blocker = tmp / "blocker"
    blocker.write_text("keep me")
    r = run("run", "cases/demo-site.yaml", "--out", str(blocker))
    if r.returncode == 0 or blocker.read_text() != "keep me":
        fail("an output path that is a file was overwritten")
    if any(p.name.startswith(".acidload-tmp-") for p in tmp.iterdir()):
        fail("a failed write left a temporary folder behind")
    checks += 2

# --help of every command, usage errors
for cmd in ("check", "run", "solve", "convert", "demo", "fit", "forecast", "predict", "uncertainty"):
    r = run(cmd, "--help")
    checks += 1
    if r.returncode != 0 or f"usage: acidload {cmd}" not in r.stdout:
        fail(f"{cmd} --help: exit {r.returncode}, output {r.stdout[:80]!r}")
for args, code in ((["--help"], 0), (["--version"], 0), ([], 2), (["frobnicate"], 2), (["run"], 2),
                   (["run", "cases/demo-site.yaml", "--bogus"], 2), (["solve", "cases/demo-site.yaml", "--for", "wind"], 2),
                   (["check", "no-such-file.yaml"], 3)):
    r = run(*args)
    checks += 1
    if r.returncode != code:
        fail(f"acidload {' '.join(args)}: exit {r.returncode}, expected {code}")
# calibration, forecast and Monte Carlo on the invented demo history
params = "model.liner-uptake,model.oxidation-rate,model.organic-acid-yield"
with tempfile.TemporaryDirectory() as tmp:
    ov = pathlib.Path(tmp) / "fitted.yaml"
    r = run("fit", "cases/demo-site-history.yaml", "--lab", "cases/demo-site-lab.csv", "--parameters", params,
            "--write-overlay", str(ov))
    checks += 1
    if r.returncode != 0 or "reduced chi-square" not in r.stdout or not ov.exists():
        fail(f"fit: exit {r.returncode}: {r.stderr[:300]}")
    else:
        r = run("run", "cases/demo-site.yaml", "--overlay", str(ov))
        checks += 1
        if r.returncode != 0:
            fail(f"run with the fitted overlay: exit {r.returncode}: {r.stderr[:300]}")
    r = run("fit", "cases/demo-site-history.yaml", "--lab", "cases/demo-site-lab.csv", "--parameters", "model.nitration-yield,model.nitration-yield")
    checks += 1
    if r.returncode != 3:
        fail(f"fit with a repeated parameter: exit {r.returncode}, expected 3")
    r = run("fit", "cases/demo-site-history.yaml", "--lab", "cases/demo-site-lab.csv", "--parameters", "model.capture-hcl")
    checks += 1
    if r.returncode != 3:
        fail(f"fit of a parameter that is not fittable: exit {r.returncode}, expected 3")
    r = run("forecast", "cases/demo-site-history.yaml", "--lab", "cases/demo-site-lab.csv", "--parameters", params)
    checks += 1
    if r.returncode != 0 or "tbn-fall" not in r.stdout:
        fail(f"forecast: exit {r.returncode}: {r.stderr[:300]}")
    r = run("fit", "cases/demo-site-history.yaml", "--lab", "cases/demo-site-lab.csv")  # parameters chosen for the lab
    checks += 1
    if r.returncode != 0 or "parameters chosen for what the lab reports" not in r.stdout:
        fail(f"fit without --parameters: exit {r.returncode}: {r.stderr[:300]}")
    r = run("predict", "cases/demo-site-history.yaml", "--lab", "cases/demo-site-lab.csv", "--draws", "50")
    checks += 1
    if r.returncode != 0 or "Next charge: drain interval" not in r.stdout or "P5" not in r.stdout or "(pessimistic)" not in r.stdout:
        fail(f"predict: exit {r.returncode}: {r.stdout[:300]} {r.stderr[:300]}")
    one = run("uncertainty", "cases/demo-site-history.yaml", "--draws", "300", "--threads", "1")
    two = run("uncertainty", "cases/demo-site-history.yaml", "--draws", "300", "--threads", "2")
    checks += 1
    if one.returncode != 0 or one.stdout != two.stdout:
        fail(f"uncertainty with 1 and 2 threads differ or failed: {one.stderr[:200]}")

# The exit-code rule (README "Using the program", bindings/cli/cli.cpp): 2 when the command line
# cannot be parsed, 3 when a file or a well-formed value is not acceptable — every command, and for
# each an option it does not take. A failing command writes nothing to standard output.
D, H, L = "cases/demo-site.yaml", "cases/demo-site-history.yaml", "cases/demo-site-lab.csv"
P = "model.liner-uptake"
exit_rule = [
    # check
    (["check", D, "--draws", "5"], 2), (["check", D, "--lab", "x"], 2), (["check", D, "--for", "h2s"], 2),
    (["check"], 2), (["check", D, D], 2), (["check", ""], 2), (["check", D, "--overlay"], 2),
    (["check", D, "--overlay", ""], 2), (["check", "no-such-file.yaml"], 3), (["check", "cases"], 3),
    # run
    (["run", D, "--out", ""], 2), (["run", D, "--draws", "5"], 2), (["run", D, "--out"], 2),
    (["run", D, "--variant", "x"], 2), (["run", "no-such-file.yaml"], 3),
    # solve
    (["solve", D, "--target", "4000 h"], 2), (["solve", D, "--for", "h2s"], 2),
    (["solve", D, "--for", "wind", "--target", "4000 h"], 2), (["solve", D, "--for", "h2s", "--target", "abc"], 2),
    (["solve", D, "--for", "h2s", "--target", "4000 parsecs"], 2), (["solve", D, "--for", "h2s", "--target", "-5 h"], 3),
    (["solve", D, "--for", "h2s", "--target", "0 h"], 3),
    (["solve", D, "--for", "jacket-water-out", "--target", "4000 h", "--range", "-300 degC", "100 degC"], 3),
    (["solve", D, "--for", "jacket-water-out", "--target", "4000 h", "--range", "1 K", "100 degC"], 3),
    (["solve", D, "--for", "jacket-water-out", "--target", "4000 h", "--range", "warm", "100 degC"], 2),
    (["solve", D, "--for", "h2s", "--target", "4000 h", "--range", "0 ppmv"], 2),
    (["solve", D, "--for", "h2s", "--target", "4000 h", "--range", "0 furlongs", "5 ppmv"], 2),
    (["solve", D, "--for", "h2s", "--target", "4000 h", "--range", "800 ppmv", "0 ppmv"], 3),
    (["solve", D, "--for", "h2s", "--target", "4000 h", "--variant", "no such variant"], 3),
    (["solve", D, "--for", "h2s", "--target", "4000 h", "--draws", "5"], 2),
    (["solve", D, "--for", "h2s", "--target", "4000 h", "--target", "5000 h"], 2),
    # convert
    (["convert", "300 ppmv"], 2), (["convert", "--case", D], 2), (["convert", "300 ppmv", "--case", D, "--out", "x"], 2),
    (["convert", "lots", "--case", D], 3), (["convert", "300 ppmv", "--case", D, "--as", "unobtainium"], 3),
    (["convert", "300 ppmv", "--case", "no-such-file.yaml"], 3),
    # fit and forecast
    (["fit", H, "--parameters", P], 2), (["fit", H, "--lab", L, "--parameters", P, "--draws", "5"], 2),
    (["fit", H, "--lab", L, "--precision", "tan"], 2), (["fit", H, "--lab", L, "--precision", "tan=0"], 2),
    (["fit", H, "--lab", L, "--precision", "colour=1"], 2),
    (["fit", H, "--lab", L, "--parameters", ","], 2), (["fit", H, "--lab", L, "--parameters", "model.no-such-key"], 3),
    (["fit", H, "--lab", "no-such-file.csv", "--parameters", P], 3),
    (["forecast", H], 2), (["forecast", H, "--lab", L, "--parameters", P, "--write-overlay", "x.yaml"], 2),
    (["forecast", H, "--lab", "no-such-file.csv", "--parameters", P], 3),
    # predict
    (["predict", H], 2), (["predict", H, "--lab", L, "--write-overlay", "x.yaml"], 2), (["predict", H, "--lab", L, "--draws", "5"], 3),
    (["predict", H, "--lab", L, "--current", "yes"], 2), (["predict", H, "--lab", "no-such-file.csv"], 3),
    (["predict", H, "--lab", L, "--plan", "no-such-file.yaml"], 3),
    # uncertainty
    (["uncertainty", H, "--draws", "1.5"], 2), (["uncertainty", H, "--seed", "2.5"], 2), (["uncertainty", H, "--draws", "many"], 2),
    (["uncertainty", H, "--draws", "1e400"], 2), (["uncertainty", H, "--out", "x"], 2), (["uncertainty", H, "--draws", "0"], 3),
    (["uncertainty", H, "--draws", "100000000"], 3), (["uncertainty", H, "--threads", "-5"], 3),
    (["uncertainty", D], 3), (["uncertainty", H, "--next-charge"], 2),
    # demo
    (["demo", D], 2), (["demo", "--overlay", D], 2),
]
for args, code in exit_rule:
    r = run(*args)
    checks += 1
    if r.returncode != code or (code and r.stdout) or (code and "acidload:" not in r.stderr):
        fail(f"acidload {args}: exit {r.returncode}, expected {code}; stdout {r.stdout[:80]!r}; stderr {r.stderr[:200]!r}")
for args, option in ((["check", D, "--draws", "5"], "--draws"), (["run", D, "--variant", "x"], "--variant"),
                     (["demo", "--overlay", D], "--overlay"), (["run", D, "--out", ""], "--out")):
    r = run(*args)
    checks += 1
    if f"'{option}'" not in r.stderr and f"{option} ''" not in r.stderr:
        fail(f"acidload {args}: the message does not name {option}: {r.stderr[:200]!r}")
# every help text states the exit codes; the main help the whole rule
r = run("--help")
checks += 1
if "2  the command line cannot be parsed" not in r.stdout or "3  a file or a well-formed value" not in r.stdout:
    fail("acidload --help does not state the exit-code rule")

# charges numbered from 1 in trajectories.csv (as the console and the lab CSV); long variant names
# keep the table's columns; "an acid or base number" (issue rules, README)
with tempfile.TemporaryDirectory() as tmp:
    tmp = pathlib.Path(tmp)
    r = run("run", "cases/drifting-gas.yaml", "--out", str(tmp / "o"))
    rows = (tmp / "o" / "trajectories.csv").read_text().splitlines()[1:]
    charges = sorted({int(x.split(",")[1]) for x in rows})
    checks += 1
    if not charges or charges[0] != 1:
        fail(f"trajectories.csv numbers charges {charges[:3]}, expected from 1")
    long_case = tmp / "long.yaml"
    long_case.write_text((root / "cases" / "demo-site.yaml").read_text().replace(
        "name: TBN 9 oil ", "name: TBN 9 oil with a very long variant name that goes on and on "))
    r = run("run", str(long_case))
    table = [x for x in r.stdout.splitlines() if x.endswith(("113.2", "99.4", "86.8"))]
    checks += 1
    if len({x.index(" h ") for x in table if " h " in x}) != 1:
        fail(f"a long variant name breaks the table's columns: {table}")
    bad = tmp / "tbn.yaml"
    bad.write_text((root / "cases" / "demo-site.yaml").read_text().replace("fresh-tbn: 6.0 mg KOH/g", "fresh-tbn: six"))
    r = run("check", str(bad))
    checks += 1
    if "an acid or base number" not in r.stderr:
        fail(f"expected 'an acid or base number' in: {r.stderr[:200]}")

r = run("--version")
cmake = (root / "CMakeLists.txt").read_text()
import re
v = re.search(r"project\(acidload VERSION ([0-9.]+)", cmake).group(1)
checks += 1
if r.stdout.strip() != f"acidload {v}":
    fail(f"--version says {r.stdout.strip()!r}, CMake says {v}")

for f in failures:
    print("FAIL", f)
print(f"{checks - len(failures)} passed, {len(failures)} failed")
sys.exit(1 if failures else 0)
