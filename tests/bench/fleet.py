"""Fleet benchmarks: what a batch in one process saves over one process per engine, how the fleet
Monte Carlo scales over cores, on threads and on a Dask LocalCluster, and what a site of N engines in
one run costs against the same engines run as separate cases.

usage: PYTHONPATH=build/python python3 tests/bench/fleet.py build/bindings/cli/acidload [--engines N]

Every figure is a median of at least 5 rounds with its spread (min–max), the sides timed interleaved
(ABAB…) in one run. The peers are what an operator does today: a shell loop that starts the program once
per engine, and a Python loop that runs one engine after another. Each side computes the same answer
(the fleet's summaries are compared before timing), so the ratios are of cost, not of accuracy.
The engines are the demo case (invented data) at H2S levels spread from 20 to 600 ppmv.
The site line: N engines (invented loads from 60 to 100 %) on one gas supply and one train, as one
site file (`acidload run SITE`; Python `acidload.Site(...).run()`) against the same engines written as
N separate cases, each with the whole train (`acidload run E1 … EN`, one batch on all cores; one process
per engine). The answers differ by design: separate cases give every engine a bed of its own, the site
loads one bed with the summed flow; so that line compares the cost of the two ways of writing a site,
not their accuracy (the site's own checks are in tests/python/test_site.py).
"""
import argparse
import os
import pathlib
import statistics
import subprocess
import sys
import tempfile
import time

import acidload
from acidload import _yaml

ROOT = pathlib.Path(__file__).resolve().parents[2]
DEMO = ROOT / "cases" / "demo-site.yaml"
HISTORY = ROOT / "cases" / "demo-site-history.yaml"


def rounds(sides, n=5):
    """Times each side once per round, interleaved; returns {name: [seconds…]}."""
    times = {name: [] for name in sides}
    for _ in range(n):
        for name, fn in sides.items():
            t = time.perf_counter()
            fn()
            times[name].append(time.perf_counter() - t)
    return times


def fmt(ts, per=1, unit="ms", scale=1e3):
    med = statistics.median(ts) / per * scale
    return f"{med:8.3f} {unit} (spread {min(ts) / per * scale:.3f}–{max(ts) / per * scale:.3f})"


def make_fleet(folder, n):
    text = DEMO.read_text(encoding="utf-8")
    files = []
    for i in range(n):
        h2s = 20 + (580 * i) / max(1, n - 1)
        f = folder / f"engine-{i:04d}.yaml"
        f.write_text(text.replace("h2s: 300 ppmv", f"h2s: {h2s:.1f} ppmv", 1), encoding="utf-8")
        files.append(f)
    return files


SHARED = {
    "fuel": {"composition": {"CH4": "52 %", "CO2": "40 %", "N2": "7 %", "O2": "1 %"}, "h2s": "300 ppmv",
             "other-sulfur": "12 mg/Nm3", "chlorine": "30 mg/Nm3"},
    "limits": {"tbn-share-of-fresh": "50 %", "tan-rise": "2 mg KOH/g", "max-hours": "8000 h"},
    "economics": {"currency": "EUR", "iron-oxide-price": "1.1 per kg", "disposal-price": "0.35 per kg",
                  "changeout-labour": 900, "oil-price": "3.2 per L", "oil-change-labour": 600},
}


def site_engine(i, n):
    load = 60 + 40 * i / max(1, n - 1)
    return {"engine": {"rated-power": "1.2 MW", "electrical-efficiency": "41 %", "load": f"{load:.1f} %"},
            "oil": {"volume": "720 L"}, "record": {"segments": [{"hours": "4000 h"}, {"hours": "4000 h", "load": "80 %"}]}}


def site_line(program, n):
    train = {"stages": [{"name": "iron oxide", "kind": "iron-oxide", "bed-mass": f"{2 * n} t", "changeout-at": "50 ppmv",
                         "capital": 70000}]}
    site = dict(SHARED, **{"format-version": 1, "scrubbing": train,
                           "site": {"name": "bench site (invented)",
                                    "engines": [dict(site_engine(i, n), name=f"engine {i + 1}") for i in range(n)]}})
    print(f"== a site of {n} engines (one gas supply, one train) against the same engines as {n} separate cases")
    with tempfile.TemporaryDirectory() as tmp:
        tmp = pathlib.Path(tmp)
        site_file = tmp / "site.yaml"
        site_file.write_text(_yaml.dump(site), encoding="utf-8")
        cases = []
        for i in range(n):
            f = tmp / f"engine-{i:03d}.yaml"
            f.write_text(_yaml.dump(dict(SHARED, **{"format-version": 1, "scrubbing": train}, **site_engine(i, n))), encoding="utf-8")
            cases.append(str(f))
        subprocess.run([program, "run", str(site_file)], check=True, capture_output=True)
        loaded = [acidload.load_case(f) for f in cases]
        sides = {
            "site, one run (program)": lambda: subprocess.run([program, "run", str(site_file)], check=True, capture_output=True),
            "separate cases, one batch (program, all cores)": lambda: subprocess.run([program, "run", *cases], check=True,
                                                                                        capture_output=True),
            "separate cases, one process each (program)": lambda: [subprocess.run([program, "run", f], check=True,
                                                                                  capture_output=True) for f in cases],
            "acidload.Site(file).run() (Python)": lambda: acidload.Site(site_file).run(),
            "acidload.costs per case, a loop (Python)": lambda: [acidload.costs(c) for c in loaded],
        }
        t = rounds(sides)
        for name, ts in t.items():
            print(f"  {name:50s} {fmt(ts, per=n)} per engine")
        base = statistics.median(t["site, one run (program)"])
        for name, ts in list(t.items())[1:3]:
            print(f"  ratio: {name} / site, one run: {statistics.median(ts) / base:.2f}")


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("program")
    ap.add_argument("--engines", type=int, default=100)
    ap.add_argument("--draws", type=int, default=2000)
    ap.add_argument("--site-engines", type=int, default=20)
    args = ap.parse_args()
    cores = os.cpu_count() or 1
    print(f"== fleets ({args.engines} engines, each the demo case with 5 variants; {cores} cores)")
    with tempfile.TemporaryDirectory() as tmp:
        tmp = pathlib.Path(tmp)
        files = make_fleet(tmp, args.engines)
        names = [str(f) for f in files]
        batch_ok = subprocess.run([args.program, "run", *names[:2]], capture_output=True).returncode == 0

        def separate_processes():
            for f in names:
                subprocess.run([args.program, "run", f], check=True, capture_output=True)

        def one_batch():
            subprocess.run([args.program, "run", *names], check=True, capture_output=True)

        def python_loop():
            for f in names:
                acidload.run(acidload.load_case(f)).summary

        def run_many_threads():
            acidload.run_many(names)

        serial = [acidload.run(acidload.load_case(f)).summary for f in names]
        assert [c.summary for c in acidload.run_many(names)] == serial
        sides = {"one process per engine (program)": separate_processes}
        if batch_ok:
            sides["one batch (program, all cores)"] = one_batch
        sides["Python loop, one engine after another"] = python_loop
        sides[f"run_many ({cores} threads)"] = run_many_threads
        t = rounds(sides)
        for name, ts in t.items():
            print(f"  {name:44s} {fmt(ts, per=args.engines)} per engine")
        base = statistics.median(t["one process per engine (program)"])
        for name, ts in list(t.items())[1:]:
            print(f"  ratio: one process per engine / {name}: {base / statistics.median(ts):.2f}")
        if not batch_ok:
            print("  (the program takes one case per run here: no batch figure)")

    site_line(args.program, args.site_engines)

    print(f"== fleet Monte Carlo (engines × draws: 4 × {args.draws} draws of {HISTORY.name})")
    cases = [acidload.case(HISTORY, h2s_ppmv=h) for h in (100, 200, 300, 400)]
    reference = acidload.monte_carlo_many(cases, draws=args.draws, threads=1)
    sides = {f"{k} thread(s)": (lambda k=k: acidload.monte_carlo_many(cases, draws=args.draws, threads=k))
             for k in sorted({1, 2, cores})}
    client = cluster = None
    try:
        from dask.distributed import Client, LocalCluster

        cluster = LocalCluster(n_workers=min(2, cores), processes=True, threads_per_worker=1, dashboard_address=None)
        client = Client(cluster)
        got = acidload.monte_carlo_many(cases, draws=args.draws, client=client)
        assert all((a["drain_interval_h"] == b["drain_interval_h"]).all() for a, b in zip(got, reference))
        sides[f"LocalCluster ({min(2, cores)} worker processes)"] = \
            lambda: acidload.monte_carlo_many(cases, draws=args.draws, client=client)
    except ImportError:
        print("  (dask.distributed not installed: no cluster figure)")
    t = rounds(sides)
    total = len(cases) * args.draws
    one = statistics.median(t["1 thread(s)"])
    for name, ts in t.items():
        print(f"  {name:44s} {total / statistics.median(ts):10.0f} draws/s "
              f"(spread {total / max(ts):.0f}–{total / min(ts):.0f}); speed-up {one / statistics.median(ts):.2f}")
    if client is not None:
        client.close()
        cluster.close()


if __name__ == "__main__":
    sys.exit(main())
