"""Adversarial inputs for the acidload program, generated from the shipped cases by a seeded random
generator of our own. Families:

  case      case YAML with values, units, keys and structure mutated (junk bytes, control characters,
            deep nesting, huge and tiny numbers, wrong units, duplicated keys, truncation)
  csv       CSV record files (drifting-gas) with cells, headers and rows mutated
  lab       lab CSV files (demo-site history) with cells, headers and rows mutated
  args      command lines: every command with random options, values and files
  paths     --out and --write-overlay targets: input folders, foreign folders and files, links,
            '.', '..', trailing '/', long names, FIFOs, devices
  signals   SIGINT, SIGTERM and SIGKILL at random moments of a `run --out` over an earlier result
  parallel  4 runs at once on one --out
  impossible physically impossible inputs (each must be refused): negative volumes, H2S of 20 % or
            more, temperatures below absolute zero, shares over 100 %, negative TBN …

It counts, over every input:
  crashes            an exit code other than 0, 2 or 3, death by a signal we did not send, or
                     "internal error" in the message
  hangs              no answer within the time limit
  data-loss events   a file or folder acidload did not write changed or vanished; a results folder
                     missing or incomplete after a signal; temporaries left after the next run
  impossible accepted  an input of the 'impossible' family that exited 0

Usage: run.py PROGRAM [--count N] [--seed S] [--timeout SECONDS]
  --count: inputs per family (short form in scripts/test: 12; full form, scripts/adversarial: 80).
Exit code 1 when any of the four counts is not zero."""
import argparse
import hashlib
import os
import pathlib
import random
import shutil
import signal
import stat
import subprocess
import sys
import tempfile
import time

ROOT = pathlib.Path(__file__).resolve().parents[2]
CASES = ROOT / "cases"

ap = argparse.ArgumentParser()
ap.add_argument("program")
ap.add_argument("--count", type=int, default=12)
ap.add_argument("--seed", type=int, default=20261202)
ap.add_argument("--timeout", type=float, default=60)
opt = ap.parse_args()
rng = random.Random(opt.seed)
program = str(pathlib.Path(opt.program).resolve())

figures = {"inputs": 0, "crashes": 0, "hangs": 0, "data-loss": 0, "impossible-accepted": 0}
per_family = {}
problems = []


def note(kind, family, what):
    figures[kind] += 1
    problems.append(f"{kind} [{family}]: {what}")


def digest(path: pathlib.Path) -> str:
    h = hashlib.sha256()
    if path.is_symlink():
        h.update(b"link:" + os.readlink(path).encode())
    elif path.is_dir():
        for p in sorted(path.rglob("*")):
            h.update(str(p.relative_to(path)).encode())
            if p.is_file() and not p.is_symlink():
                h.update(p.read_bytes())
    elif path.is_file():
        h.update(path.read_bytes())
    else:
        h.update(b"missing" if not path.exists() else b"other")
    return h.hexdigest()


def call(family, args, cwd, expect=None, timeout=None):
    """Runs the program once; counts the input and classifies the outcome. Returns the exit code
    (None on a hang)."""
    figures["inputs"] += 1
    per_family[family] = per_family.get(family, 0) + 1
    try:
        r = subprocess.run([program, *map(str, args)], capture_output=True, cwd=cwd, timeout=timeout or opt.timeout,
                           stdin=subprocess.DEVNULL)
    except subprocess.TimeoutExpired:
        note("hangs", family, " ".join(map(str, args))[:200])
        return None
    err = r.stderr.decode("utf-8", "replace")
    if r.returncode not in (0, 2, 3) or "acidload: internal error" in err:
        note("crashes", family, f"exit {r.returncode}: {' '.join(map(str, args))[:200]}: {err[:200]}")
    elif r.returncode != 0 and r.stdout:
        note("data-loss", family, f"half a result on standard output: {' '.join(map(str, args))[:160]}")
    if expect == "refused" and r.returncode == 0:
        note("impossible-accepted", family, " ".join(map(str, args))[:200])
    return r.returncode


# ---- mutations of text ---------------------------------------------------------------------
NUMBERS = ["0", "-0", "-1", "1e-300", "1e300", "1e309", "-1e300", "nan", ".nan", "inf", "-inf", "1e", "0x10", "1,5",
           "1_000", "٣", "99999999999999999999999", "-273.16", "5e-324", "", "''", "~", "[]", "{}", "1 2"]
UNITS = ["", "ppmv", "mg/Nm3", "degC", "K", "L", "m3", "kW", "MW", "%", "h", "mg KOH/g", "g/kWh", "furlongs",
         "ppmv wet", "mg/Nm3 dry dry", "A/cm", "1/h", "kPa", "bar"]
JUNK = ["\x00", "\x1b[2J", "\t", "\r", "\u202e", "\ufeff", "\xff", "&a", "*a", "!!python/object", "---", "...",
        "{", "[", "\"", "'", "#", ": :", "- -", "%YAML 1.2"]


def mutate_text(text: str) -> str:
    lines = text.split("\n")
    for _ in range(rng.randint(1, 3)):
        i = rng.randrange(len(lines))
        line = lines[i]
        k = rng.random()
        if k < 0.35 and ":" in line:  # a value
            key, _, rest = line.partition(":")
            lines[i] = f"{key}: {rng.choice(NUMBERS)} {rng.choice(UNITS)}".rstrip()
        elif k < 0.5:
            pos = rng.randrange(len(line) + 1)
            lines[i] = line[:pos] + rng.choice(JUNK) + line[pos:]
        elif k < 0.6:
            lines.insert(i, line)  # a duplicated key
        elif k < 0.7:
            del lines[i]
        elif k < 0.8:
            depth = rng.choice([30, 200])
            lines.insert(i, "deep: " + "[" * depth + "]" * depth)
        elif k < 0.9:
            lines = lines[: rng.randrange(len(lines))]  # truncated
            break
        else:
            lines[i] = " " * rng.randint(0, 7) + line.lstrip()  # indentation
    return "\n".join(lines)


def mutate_csv(text: str) -> str:
    rows = text.split("\n")
    data = [i for i, r in enumerate(rows) if r and not r.startswith("#")]
    for _ in range(rng.randint(1, 3)):
        i = rng.choice(data)
        cells = rows[i].split(",")
        k = rng.random()
        if k < 0.5:
            c = rng.randrange(len(cells))
            cells[c] = rng.choice(NUMBERS + ["<0.1", ">5", "x", "\"unclosed", "1e6", "-5", "2e6 ppmv", "50 %"])
        elif k < 0.65:
            cells.append("extra")
        elif k < 0.75:
            cells = cells[:-1]
        elif k < 0.85:
            cells[rng.randrange(len(cells))] += rng.choice(JUNK)
        else:
            rows.insert(i, rows[i])  # a repeated row
            continue
        rows[i] = ",".join(cells)
    return "\n".join(rows)


# ---- physically impossible values (each must be refused) -----------------------------------
IMPOSSIBLE = [
    ("  volume: 720 L", "  volume: -720 L"), ("  volume: 720 L", "  volume: 0 L"),
    ("  h2s: 300 ppmv", "  h2s: 250000 ppmv"), ("  h2s: 300 ppmv", "  h2s: 2000000 ppmv"),
    ("  h2s: 300 ppmv", "  h2s: 1e7 mg/Nm3"), ("  h2s: 300 ppmv", "  h2s: -5 ppmv"),
    ("  jacket-water-out: 90 degC", "  jacket-water-out: -300 degC"),
    ("  oil-temperature: 88 degC", "  oil-temperature: 0 K"),
    ("  fresh-tbn: 6.0 mg KOH/g", "  fresh-tbn: -6 mg KOH/g"), ("  blow-by: 1 %", "  blow-by: 150 %"),
    ("    CH4: 52 %", "    CH4: 152 %"), ("    CH4: 52 %", "    CH4: -52 %"),
    ("  density: 880 kg/m3", "  density: 0 kg/m3"), ("  density: 880 kg/m3", "  density: -880 kg/m3"),
    ("  electrical-efficiency: 41 %", "  electrical-efficiency: 140 %"),
    ("  electrical-efficiency: 41 %", "  electrical-efficiency: 0 %"),
    ("  rated-power: 1.2 MW", "  rated-power: -1.2 MW"), ("  load: 100 %", "  load: -10 %"),
    ("  air-humidity: 60 %", "  air-humidity: 160 %"), ("  gas-pressure: 109.3 kPa", "  gas-pressure: -1 kPa"),
    ("  consumption: 0.25 g/kWh", "  consumption: -0.25 g/kWh"), ("  residual-share: 10 %", "  residual-share: 110 %"),
    ("  max-hours: 8000 h", "  max-hours: -8000 h"), ("  excess-air-ratio: 1.8", "  excess-air-ratio: -1.8"),
    ("  other-sulfur: 12 mg/Nm3", "  other-sulfur: -12 mg/Nm3"),
    ("    tetrachloroethene: 9 mg/Nm3", "    tetrachloroethene: -9 mg/Nm3"),
    ("  water-dew-point: 30 degC", "  water-dew-point: -300 degC"),
    ("  start-every: 300 h", "  start-every: -300 h"), ("  fresh-tan: 1.5 mg KOH/g", "  fresh-tan: -1.5 mg KOH/g"),
]


def main():
    demo = (CASES / "demo-site.yaml").read_text()
    history = (CASES / "demo-site-history.yaml").read_text()
    drifting = (CASES / "drifting-gas.yaml").read_text()
    record = (CASES / "drifting-gas-record.csv").read_text()
    lab = (CASES / "demo-site-lab.csv").read_text()
    with tempfile.TemporaryDirectory(prefix="acidload-adversarial-") as tmp:
        tmp = pathlib.Path(tmp)
        work = tmp / "work"
        work.mkdir()
        for p in CASES.iterdir():
            shutil.copy(p, work / p.name)
        # a sentinel: files acidload did not write, beside every input; checked after each family
        sentinel = tmp / "sentinel"
        sentinel.mkdir()
        (sentinel / "notes.txt").write_text("a user's file")
        sentinel_digest = digest(sentinel)
        inputs_digest = {p.name: digest(p) for p in work.iterdir()}

        def check_untouched(family):
            if digest(sentinel) != sentinel_digest:
                note("data-loss", family, "the sentinel folder changed")
            for name, d in inputs_digest.items():
                if digest(work / name) != d:
                    note("data-loss", family, f"the input {name} changed")
                    inputs_digest[name] = digest(work / name)

        n = opt.count
        # -- case
        for i in range(n):
            f = tmp / f"case-{i}.yaml"
            f.write_bytes(mutate_text(demo).encode("utf-8", "surrogatepass"))
            call("case", [rng.choice(["check", "run"]), f], work)
        check_untouched("case")
        # -- csv record
        for i in range(n):
            (work / "drifting-gas-record.csv").write_text(mutate_csv(record))
            inputs_digest["drifting-gas-record.csv"] = digest(work / "drifting-gas-record.csv")
            call("csv", ["run", "drifting-gas.yaml"], work)
        (work / "drifting-gas-record.csv").write_text(record)
        inputs_digest["drifting-gas-record.csv"] = digest(work / "drifting-gas-record.csv")
        check_untouched("csv")
        # -- lab
        for i in range(n):
            f = tmp / f"lab-{i}.csv"
            f.write_text(mutate_csv(lab))
            call("lab", ["fit", "demo-site-history.yaml", "--lab", f, "--parameters", "model.liner-uptake"], work)
        check_untouched("lab")
        # -- args
        commands = ["check", "run", "solve", "convert", "fit", "forecast", "uncertainty", "demo", "frob", ""]
        options = ["--overlay", "--out", "--for", "--target", "--range", "--variant", "--as", "--case", "--lab",
                   "--parameters", "--write-overlay", "--draws", "--seed", "--threads", "--help", "-h", "--", "-x",
                   "--out=", "--draws=5"]
        values = ["demo-site.yaml", "h2s", "fresh-tbn", "4000 h", "-5 h", "abc", "0 ppmv wet", "800 ppmv", "1.5", "0",
                  "-5", "1e400", "100", "", "model.liner-uptake", "demo-site-lab.csv", "raw gas", "no such",
                  "300 ppmv", "Cl", "-300 degC", "1 K", "\x1b[31m", "x" * 300]
        for i in range(n * 3):
            args = [rng.choice(commands)]
            for _ in range(rng.randint(0, 6)):
                args.append(rng.choice(options + values))
            args = [a for a in args if not a.startswith("--out") and a != "--write-overlay"] or ["check"]
            args = [a for a in args if a != ""] if rng.random() < 0.5 else args
            call("args", args, work)
        check_untouched("args")
        # -- paths
        out_root = tmp / "outs"
        out_root.mkdir()
        fifo = out_root / "fifo"
        os.mkfifo(fifo)
        link_ok = out_root / "link-ok"
        prev = out_root / "previous"
        call("paths", ["run", "demo-site.yaml", "--out", prev], work)
        link_ok.symlink_to(prev)
        (out_root / "dangling").symlink_to(out_root / "nowhere")
        targets = [work, work / ".", work / "..", sentinel, sentinel / "notes.txt", str(sentinel) + "/", fifo,
                   "/dev/null", "/", out_root / ("n" * 250), out_root / ("n" * 256), link_ok, out_root / "dangling",
                   out_root / "new" / "deeper", prev, str(prev) + "/", out_root / "a b", out_root / "\x1b[2J",
                   work / "demo-site.yaml"]
        for i in range(n):
            t = rng.choice(targets)
            before = digest(prev)
            code = call("paths", ["run", "demo-site.yaml", "--out", t], work)
            if code == 0 and not (pathlib.Path(t) / ".acidload-results").is_file():
                note("data-loss", "paths", f"a run to {t} exited 0 without a results folder there")
            if link_ok.exists() and not link_ok.is_symlink():
                note("data-loss", "paths", "the symbolic link was replaced")
            del before
            ov = rng.choice(targets + [work / "demo-site-history.yaml", work / "demo-site-lab.csv"])
            call("paths", ["fit", "demo-site-history.yaml", "--lab", "demo-site-lab.csv", "--parameters",
                           "model.liner-uptake", "--write-overlay", ov], work)
            check_untouched("paths")
        # case paths that are not plain files
        for t in (fifo, "/dev/zero", out_root, sentinel / "notes.txt"):
            call("paths", ["check", t], work, timeout=10)
        # -- impossible
        for i in range(max(n, len(IMPOSSIBLE))):
            old, new = IMPOSSIBLE[i % len(IMPOSSIBLE)]
            assert old in demo, old
            f = tmp / f"impossible-{i}.yaml"
            f.write_text(demo.replace(old, new, 1))
            call("impossible", [rng.choice(["check", "run"]), f], work, expect="refused")
        # -- signals
        sig_out = tmp / "sig-out"
        t0 = time.monotonic()
        call("signals", ["run", "drifting-gas.yaml", "--out", sig_out], work)
        duration = time.monotonic() - t0  # signals land anywhere from the start to just after the end
        good = digest(sig_out)
        for i in range(n):
            sig = rng.choice([signal.SIGINT, signal.SIGTERM, signal.SIGKILL])
            figures["inputs"] += 1
            per_family["signals"] = per_family.get("signals", 0) + 1
            p = subprocess.Popen([program, "run", "drifting-gas.yaml", "--out", str(sig_out)], cwd=work,
                                 stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
            time.sleep(rng.uniform(0, 1.1 * duration))
            p.send_signal(sig)
            try:
                code = p.wait(timeout=opt.timeout)
            except subprocess.TimeoutExpired:
                p.kill()
                note("hangs", "signals", f"no exit after {sig.name}")
                continue
            if code not in (0, -sig, 128 + sig):
                note("crashes", "signals", f"exit {code} after {sig.name}")
            now = digest(sig_out)
            if not (sig_out / ".acidload-results").is_file() or not (sig_out / "summary.json").is_file() or \
                    not (sig_out / "trajectories.csv").is_file():
                note("data-loss", "signals", f"the results folder is missing or incomplete after {sig.name}")
            elif now != good and code != 0:
                # a run finished between the signal and the check is a new complete result; anything
                # else must be the old one byte for byte
                csv = (sig_out / "trajectories.csv").read_bytes()
                if not csv.endswith(b"\n"):
                    note("data-loss", "signals", f"a truncated trajectories.csv after {sig.name}")
            # this run's own temporaries (its pid in the name); a killed earlier run's are the next write's to clean
            if sig != signal.SIGKILL and any(x.name.startswith(f".acidload-tmp-{p.pid}-") for x in tmp.iterdir()):
                note("data-loss", "signals", f"temporaries left after {sig.name}")
        call("signals", ["run", "drifting-gas.yaml", "--out", sig_out], work)
        left = [x.name for x in tmp.iterdir() if x.name.startswith(".acidload-tmp-")]
        if left:
            note("data-loss", "signals", f"temporaries of killed runs left after the next run: {left}")
        # -- parallel: 4 runs at once on one --out
        par = tmp / "par-out"
        for i in range(max(1, n // 2)):
            procs = [subprocess.Popen([program, "run", "demo-site.yaml", "--out", str(par)], cwd=work,
                                      stdout=subprocess.DEVNULL, stderr=subprocess.PIPE) for _ in range(4)]
            for p in procs:
                figures["inputs"] += 1
                per_family["parallel"] = per_family.get("parallel", 0) + 1
                try:
                    code = p.wait(timeout=opt.timeout * 2)
                except subprocess.TimeoutExpired:
                    p.kill()
                    note("hangs", "parallel", "a parallel run did not finish")
                    continue
                if code != 0:
                    note("crashes" if code not in (2, 3) else "data-loss", "parallel",
                         f"a parallel run failed with {code}: {p.stderr.read()[:200]!r}")
            names = sorted(x.name for x in par.iterdir()) if par.is_dir() else "nothing (no folder)"
            if names != [".acidload-results", "summary.json", "trajectories.csv"]:
                note("data-loss", "parallel", f"the folder holds {names}")
            if any(x.name.startswith(".acidload-tmp-") for x in tmp.iterdir()):
                note("data-loss", "parallel", "temporaries left")
        check_untouched("all")

    print("adversarial inputs by family: " + ", ".join(f"{k} {v}" for k, v in per_family.items()))
    print(f"inputs {figures['inputs']}; crashes {figures['crashes']}; hangs {figures['hangs']}; "
          f"data-loss events {figures['data-loss']}; impossible inputs accepted {figures['impossible-accepted']}")
    for p in problems[:60]:
        print("  " + p)
    bad = figures["crashes"] + figures["hangs"] + figures["data-loss"] + figures["impossible-accepted"]
    return 1 if bad else 0


sys.exit(main())
