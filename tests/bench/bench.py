"""acidload benchmarks, Python side (run by scripts/bench; not by the tests). Each part times every
side once per round, the sides interleaved (A B C … A B C …), and prints the median of the rounds
with its spread [lowest – highest]; ratios are taken within each round. Each peer is what an
engineer would really write or pick, and its accuracy is stated as its largest deviation from the
exact answer.
  1. a year of hourly segments of the oil balance: acidload's exact segments (the C++ loop behind
     acidload._core.oil.advance_record) against NumPy vectorised hourly explicit Euler, the exact
     closed form vectorised in NumPy, and one whole-year scipy.integrate.solve_ivp at rtol 1e-6;
  2. a three-parameter fit to 30 lab samples: acidload.fit against scipy.optimize.least_squares on
     acidload's residuals and on an independent NumPy model;
  3. a sweep of the demo site's drain interval over H2S: acidload's threaded sweep against a Python
     loop of scalar calls and against multiprocessing; the sweep's thread scaling;
  4. reading an operating record: acidload (the C++ io::load_case, Python load_case and the program's
     `check`) against pandas.read_csv and Python's csv module on the same file, and the limit: reading
     the file's bytes; with each side's peak memory and what it produces.
Usage: bench.py BENCH_PROGRAM ACIDLOAD_PROGRAM   (the C++ acidload_bench writes the year's rates)"""
import csv
import multiprocessing
import os
import pathlib
import random
import statistics
import subprocess
import sys
import tempfile
import time

import numpy as np
from scipy.integrate import solve_ivp
from scipy.optimize import least_squares

root = pathlib.Path(__file__).resolve().parents[2]
sys.path.insert(0, str(root / "tests" / "reference" / "python"))
import acidload  # noqa: E402
import oil_reference as ref  # noqa: E402

core = acidload._core
ROUNDS = 5


def interleaved(sides, rounds=ROUNDS, clock=time.perf_counter):
    """Times each side once per round, in turn; returns {name: [seconds per round]} and the last results.
    The order is shuffled each round (a fixed seed), so that no side always follows the same one: a
    side run right after a heavy one finds its caches cold (acidload's year took 0.048 us per segment
    right after solve_ivp, 0.039 right after itself, and in a fixed order it always came after it;
    turning the order each round keeps every side's neighbours, so it would not help).
    clock=time.thread_time times the CPU of this thread only, for sides that run on it alone: on a
    shared machine it leaves out the time the thread waits for a core."""
    times = {name: [] for name in sides}
    results = {}
    order = list(sides.items())
    shuffle = random.Random(19)
    for _ in range(rounds):
        shuffle.shuffle(order)
        for name, f in order:
            t = clock()
            results[name] = f()
            times[name].append(clock() - t)
    return times, results


def fmt(values, scale=1.0, digits=3):
    v = sorted(x * scale for x in values)
    return f"{statistics.median(v):.{digits}f} [{v[0]:.{digits}f} – {v[-1]:.{digits}f}]"


def ratios(times, a, b):
    """Per-round ratios a / b."""
    return [x / y for x, y in zip(times[a], times[b])]


# ---- 1. the oil balance over a year of hourly segments ---------------------------------------

names = ("strong_acid", "sulfurous_fresh", "nitration", "oxidation", "organic_acid", "consumption")


def coefficients(table, k, mass):
    """dy/dt = A − L·y for each state over each segment (continuous makeup, above the base floor), from
    the balance's equations (tests/reference/python/oil_reference.py): states b, w, u = b + salts,
    oxidation, nitration, additive acidity. Returns hours, A (6 × n), L (6 × n)."""
    h, R, so2, rn, kox, rw, c = table.T
    km = c / mass
    l1 = so2 / (k.fresh_base - k.base_floor) / mass
    phi = k.organic_neutralised_share
    A = np.array([-R / mass - phi * rw + l1 * k.base_floor + km * k.fresh_base, (1 - phi) * rw, km * k.fresh_base, kox,
                  rn / mass, km * k.fresh_additive])
    L = np.array([km + l1, km, km, km, km, km + k.additive_depletion])
    return h, A, L


def linear_recurrence(a, c, y0):
    """y[n+1] = a[n]·y[n] + c[n] for every row at once, vectorised over time: y_N = P (y0 + Σ c_k / P_k),
    P_k the cumulative product of a; returns the whole trajectory (n + 1 points per row)."""
    P = np.cumprod(a, axis=1)
    y = P * (y0[:, None] + np.cumsum(c / P, axis=1))
    return np.concatenate([y0[:, None], y], axis=1)


def numpy_euler(h, A, L, y0):
    return linear_recurrence(1 - L * h, A * h, y0)


def numpy_exact(h, A, L, y0):
    e = np.exp(-L * h)
    return linear_recurrence(e, -np.expm1(-L * h) / L * A, y0)


def scipy_year(h, A, L, y0):
    edges = np.concatenate([[0.0], np.cumsum(h)])

    def rhs(t, y):
        i = min(int(np.searchsorted(edges, t, side="right")) - 1, len(h) - 1)
        return A[:, i] - L[:, i] * y

    sol = solve_ivp(rhs, (0.0, edges[-1]), y0, rtol=1e-6, atol=1e-9)
    return sol.y[:, -1], sol.nfev


def part1(bench_program):
    with tempfile.TemporaryDirectory() as tmp:
        path = pathlib.Path(tmp) / "year.csv"
        subprocess.run([bench_program, "--record-csv", str(path)], check=True, capture_output=True)
        table = np.loadtxt(path, delimiter=",", skiprows=1)
    props = core.oil.OilProperties()
    props.fresh_tbn = 12.0  # as the C++ benchmark's charge: TBN 12, 600 L at 880 kg/m3
    k = core.oil.balance_constants(props)
    start = core.oil.fresh_oil(props, 0.6 * props.density_15)
    mass = start.mass
    h, A, L = coefficients(table, k, mass)
    y0 = np.array([start.base, start.weak_acid, start.base + start.salts, start.oxidation, start.nitration,
                   start.additive_acidity])
    n = len(table)

    def acid():
        s = core.oil.advance_record(start, k, table, True)
        return np.array([s.base, s.weak_acid, s.base + s.salts, s.oxidation, s.nitration, s.additive_acidity])

    sides = {"acidload": acid, "euler": lambda: numpy_euler(h, A, L, y0)[:, -1],
             "exact": lambda: numpy_exact(h, A, L, y0)[:, -1], "scipy": lambda: scipy_year(h, A, L, y0)}
    times, res = interleaved(sides, rounds=2 * ROUNDS + 1, clock=time.thread_time)
    exact_traj = numpy_exact(h, A, L, y0)
    exact = exact_traj[:, -1]
    assert exact_traj[0].min() > k.base_floor, "the year stays above the base floor (the peers assume it)"
    # the exact closed form checked against the SciPy reference, segment by segment at rtol 1e-10
    kr = ref.Constants(fresh_base=k.fresh_base, base_floor=k.base_floor, fresh_additive=k.fresh_additive,
                       additive_depletion=k.additive_depletion, organic_neutralised_share=k.organic_neutralised_share)
    s = ref.State(mass=mass, base=start.base, additive_acidity=start.additive_acidity)
    for row in table:
        s = ref.integrate(ref.Rates(**dict(zip(names, row[1:])), continuous_makeup=True), kr, s, row[0],
                          rtol=1e-10, method="LSODA").state
    ref_end = np.array([s.base, s.weak_acid, s.base + s.salts, s.oxidation, s.nitration, s.additive_acidity])

    def dev(y):
        return np.max(np.abs(np.asarray(y) - exact))

    euler_traj = numpy_euler(h, A, L, y0)
    print(f"1. a year of hourly segments ({n}; H2S and load vary every hour): the oil balance, from its rates")
    print("   (every side on one thread; CPU time of that thread, so that waiting for a shared core does not count)")
    print(f"   {'side':44s} {'us/segment':>26s}   largest deviation of the end state from the exact one")
    print(f"   {'acidload (exact segments, C++)':44s} {fmt(times['acidload'], 1e6 / n):>26s}   {dev(res['acidload']):.1e}")
    print(f"   {'NumPy vectorised hourly explicit Euler':44s} {fmt(times['euler'], 1e6 / n):>26s}   {dev(res['euler']):.1e}"
          f" (over the year's TBN: {np.max(np.abs(euler_traj[0] - exact_traj[0])):.1e} mg KOH/g)")
    print(f"   {'NumPy vectorised exact closed form':44s} {fmt(times['exact'], 1e6 / n):>26s}   (the exact answer; "
          f"against SciPy LSODA rtol 1e-10 per segment: {np.max(np.abs(exact - ref_end)):.1e})")
    print(f"   {'SciPy solve_ivp, whole year, RK45 rtol 1e-6':44s} {fmt(times['scipy'], 1e6 / n):>26s}   "
          f"{dev(res['scipy'][0]):.1e} ({res['scipy'][1]} right-hand-side calls)")
    print(f"   ratio Euler / acidload            {fmt(ratios(times, 'euler', 'acidload'), digits=2)}   (target >= 2, at better accuracy)")
    print(f"   ratio exact NumPy / acidload      {fmt(ratios(times, 'exact', 'acidload'), digits=2)}")
    print(f"   ratio solve_ivp / acidload        {fmt(ratios(times, 'scipy', 'acidload'), digits=0)}")
    print("   (deviations in the states' units: mg KOH/g for base, acids and salts, A/cm for oxidation and nitration)")
    print()


# ---- 2. the fit ---------------------------------------------------------------------------------


def part2():
    # five charges of 1200 h, six samples each: 30 samples (invented), noise from numpy's seeded generator
    rec_text = (root / "cases" / "demo-site-history.yaml").read_text().split("record:")[0]
    rec_text += "record:\n  segments:\n"
    h2s_levels = (250, 320, 280, 360, 300)
    for i, h2s in enumerate(h2s_levels):
        rec_text += f"    - {{hours: 1200 h, h2s: {h2s} ppmv{', event: oil-change' if i else ''}}}\n"
    case5 = acidload.load_case_text(rec_text, file_name="bench.yaml", base_dir=str(root / "cases"))
    params = ["model.oxidation-rate", "model.organic-acid-yield", "model.salt-titration-share"]
    truth = {"model.oxidation-rate": 0.010, "model.organic-acid-yield": 0.10, "model.salt-titration-share": 0.3}
    ec = case5.variants[0]._engine_case
    true_case = ec
    for key, v in truth.items():
        true_case = core.with_parameter(true_case, key, v)
    rng = np.random.default_rng(5)
    header = "charge,oil-hours,tbn [mg KOH/g],tan [mg KOH/g],oxidation [A/cm]"
    hours = list(range(200, 1201, 200))
    with tempfile.TemporaryDirectory() as tmp:
        lab = pathlib.Path(tmp) / "lab.csv"
        lab.write_text("\n".join([header] + [f"{c + 1},{h},0,0,0" for c in range(5) for h in hours]) + "\n")
        pred = core.predict(true_case, acidload.read_lab_samples(lab))
        truth_predicted = np.asarray(pred["predicted"])
        vals = truth_predicted + np.asarray(pred["sigma"]) * rng.standard_normal(len(truth_predicted))
        rows = [header]
        for j, (c, h) in enumerate((c, h) for c in range(5) for h in hours):
            rows.append(f"{c + 1},{h},{vals[3 * j]:.6f},{vals[3 * j + 1]:.6f},{vals[3 * j + 2]:.6f}")
        lab.write_text("\n".join(rows) + "\n")
        samples = acidload.read_lab_samples(lab)
    core_samples = samples._samples if hasattr(samples, "_samples") else samples

    # the independent NumPy model: each charge one segment of constant rates (from acidload's rates at
    # the default oxidation law, scaled by the fitted oxidation rate and acid yield), closed forms
    seg_rates = []
    for h2s in h2s_levels:
        one = acidload.load_case_text(rec_text.split("record:")[0] + f"record:\n  segments:\n    - {{hours: 1200 h, h2s: {h2s} ppmv}}\n",
                                      file_name="one.yaml", base_dir=str(root / "cases"))
        r = core.run_case(one._file).first_rates(0)
        seg_rates.append(np.array([r[n] for n in names]))
    props = core.oil.OilProperties()
    props.fresh_tbn = 6.0
    props.fresh_tbn_method = core.oil.BaseNumberMethod.D2896
    kc = core.oil.balance_constants(props)
    mass = 0.72 * props.density_15
    measured = np.array([(s.tbn, s.tan, s.oxidation) for s in samples]).ravel()
    sig = np.tile([0.20, 0.15, 1.0], 30)
    k_ox0, alpha0 = 0.008, 0.08  # the defaults the rates above were made with
    t = np.array(hours, float)

    def numpy_readings(phi):
        kox, alpha, beta = np.exp(phi[0]), np.exp(phi[1]), 1 / (1 + np.exp(-phi[2]))
        y = np.array([kc.fresh_base, 0.0, kc.fresh_base, 0.0, 0.0, kc.fresh_additive])  # b, w, u, ox, n, add
        out = []
        for c in range(5):
            R, so2, rn, ox, rw, cons = seg_rates[c]
            ox, rw = ox * kox / k_ox0, rw * kox / k_ox0 * alpha / alpha0
            if c:  # oil change: 10 % of the oil stays, fresh oil to the full charge
                fresh = np.array([kc.fresh_base, 0.0, kc.fresh_base, 0.0, 0.0, kc.fresh_additive])
                y = 0.1 * y + 0.9 * fresh
            _, A, L = coefficients(np.array([[1.0, R, so2, rn, ox, rw, cons]]), kc, mass)
            A, L = A[:, 0], L[:, 0]
            yt = A[:, None] / L[:, None] + (y[:, None] - A[:, None] / L[:, None]) * np.exp(-L[:, None] * t[None, :])
            b, w, u, o, _n, add = yt
            tbn = b + props.weak_base_d4739
            tan = add + w + beta * (u - b)
            out.append(np.stack([tbn, tan, o], axis=1).ravel())
            y = yt[:, -1]
        return np.concatenate(out)

    phi_truth = [np.log(truth["model.oxidation-rate"]), np.log(truth["model.organic-acid-yield"]), np.log(0.3 / 0.7)]
    forward_gap = np.max(np.abs(numpy_readings(phi_truth) - truth_predicted) / sig)
    phi0 = np.array([np.log(k_ox0), np.log(alpha0), np.log(0.2 / 0.8)])  # the NumPy model's start: acidload's defaults
    # acidload's residuals take each parameter in its own fit space (the registry's range transform)
    own0 = np.array([core.to_fit_space(k, v) for k, v in zip(params, (k_ox0, alpha0, 0.2))])

    def from_own(x):
        return np.array([core.from_fit_space(k, v) for k, v in zip(params, x)])
    evals = {"own": 0}

    def own_residuals(p):
        evals["own"] += 1
        return core.fit_residuals(ec, core_samples, params, list(p))

    sides = {"acidload": lambda: acidload.fit(case5, samples, params),
             "ls_own": lambda: least_squares(own_residuals, own0),
             "ls_numpy": lambda: least_squares(lambda p: (measured - numpy_readings(p)) / sig, phi0)}
    times, res = interleaved(sides, clock=time.thread_time)
    fit = res["acidload"]
    est = {"acidload": np.array([fit.estimates[p] for p in params])}
    est["ls_own"] = from_own(res["ls_own"].x)
    x = res["ls_numpy"].x
    est["ls_numpy"] = np.array([np.exp(x[0]), np.exp(x[1]), 1 / (1 + np.exp(-x[2]))])
    # the exact answer: least_squares on acidload's residuals driven to its tightest tolerances
    tight = least_squares(lambda p: core.fit_residuals(ec, core_samples, params, list(p)), res["ls_own"].x,
                          xtol=1e-15, ftol=1e-15, gtol=1e-15)
    exact = from_own(tight.x)

    def dev(e):
        return np.max(np.abs(e - exact) / np.abs(exact))

    # the forward model's cost, for the fit's overhead: one evaluation of the residuals
    phi_fit = [core.to_fit_space(k, v) for k, v in zip(params, est["acidload"])]
    fwd = []
    for _ in range(ROUNDS):
        t0 = time.thread_time()
        for _ in range(20):
            core.fit_residuals(ec, core_samples, params, phi_fit)
        fwd.append((time.thread_time() - t0) / 20)
    p = len(params)
    # forward runs of acidload's Levenberg–Marquardt: the start and its Jacobian (1 + 2p), then per
    # iteration at least one trial and a new central-difference Jacobian (1 + 2p): a lower bound
    runs = (1 + 2 * p) * (1 + fit.iterations)
    print("2. a three-parameter fit (oxidation rate, organic-acid yield, salt titration share), 30 samples over 5 charges (invented)")
    print("   (one thread; CPU time of that thread)")
    print(f"   {'side':52s} {'ms':>22s}   largest relative deviation of the estimates from the exact optimum")
    print(f"   {'acidload.fit':52s} {fmt(times['acidload'], 1e3, 2):>22s}   {dev(est['acidload']):.1e}   ({fit.iterations} iterations)")
    print(f"   {'least_squares on acidload residuals (defaults)':52s} {fmt(times['ls_own'], 1e3, 2):>22s}   {dev(est['ls_own']):.1e}"
          f"   ({evals['own'] // ROUNDS} residual calls)")
    print(f"   {'least_squares on an independent NumPy model':52s} {fmt(times['ls_numpy'], 1e3, 2):>22s}   {dev(est['ls_numpy']):.1e}"
          f"   (its readings at the truth differ from acidload's by {forward_gap:.1e} sigma; it has no weak-prior rows,"
          f" which move the optimum by about this much)")
    print(f"   ratio least_squares (acidload residuals) / acidload.fit   {fmt(ratios(times, 'ls_own', 'acidload'), digits=2)}")
    print(f"   ratio least_squares (NumPy model) / acidload.fit          {fmt(ratios(times, 'ls_numpy', 'acidload'), digits=2)}")
    print(f"   fit / (forward model {statistics.median(fwd) * 1e3:.3f} ms x at least {runs} forward runs)   "
          f"{fmt([a / (statistics.median(fwd) * runs) for a in times['acidload']], digits=2)}   (target <= 2)")
    print()


# ---- 3. sweeps -------------------------------------------------------------------------------

_worker_case = None


def _worker_init(path):
    global _worker_case
    _worker_case = acidload.load_case(path)


def _worker(values):
    return [float(acidload.drain_interval(_worker_case, h2s_ppmv=float(v))) for v in values]


def part3():
    path = str(root / "cases" / "demo-site.yaml")
    case = acidload.load_case(path)
    ec = case.variants[0]._engine_case
    n = 4000
    values = np.linspace(0.0, 1000.0, n)
    small = values[::10]  # the Python loop of scalar calls: per value, on a tenth of the values
    cores = os.cpu_count() or 1
    pool = multiprocessing.get_context("fork").Pool(cores, initializer=_worker_init, initargs=(path,))
    chunks = np.array_split(values, cores * 4)

    sides = {"acidload": lambda: np.asarray(acidload.drain_interval(case, h2s_ppmv=values)),
             "loop": lambda: [float(acidload.drain_interval(case, h2s_ppmv=float(v))) for v in small],
             "mp": lambda: np.concatenate([np.asarray(x) for x in pool.map(_worker, chunks)]),
             "t1": lambda: np.asarray(core.sweep_drain_interval(ec, "h2s", values, threads=1)),
             "t2": lambda: np.asarray(core.sweep_drain_interval(ec, "h2s", values, threads=cores))}
    times, res = interleaved(sides)
    pool.close()
    pool.join()
    times["loop"] = [t * 10 for t in times["loop"]]  # per the full n values
    same = (np.array_equal(res["acidload"], res["mp"]) and np.array_equal(res["acidload"][::10], np.asarray(res["loop"]))
            and np.array_equal(res["t1"], res["t2"]))
    print(f"3. a sweep of the demo site's drain interval over {n} H2S values (0 to 1000 ppmv)")
    print(f"   {'side':52s} {'us/value':>22s}")
    print(f"   {'acidload.drain_interval(case, h2s_ppmv=array)':52s} {fmt(times['acidload'], 1e6 / n, 1):>22s}   (every core)")
    print(f"   {'Python loop of scalar acidload.drain_interval calls':52s} {fmt(times['loop'], 1e6 / n, 1):>22s}   (on every 10th value)")
    print(f"   {'multiprocessing.Pool(%d), scalar calls' % cores:52s} {fmt(times['mp'], 1e6 / n, 1):>22s}")
    print(f"   ratio Python loop / acidload        {fmt(ratios(times, 'loop', 'acidload'), digits=2)}")
    print(f"   ratio multiprocessing / acidload    {fmt(ratios(times, 'mp', 'acidload'), digits=2)}")
    print(f"   the sweep on {cores} threads against 1: speed-up {fmt(ratios(times, 't1', 't2'), digits=2)}   "
          f"(target >= {0.9 * cores:.1f} on an idle machine; this one is shared)")
    print(f"   identical answers on every side and thread count: {'yes' if same else 'NO'}   (accuracy: the same exact model)")
    print()


# ---- 4. reading a record -----------------------------------------------------------------------


def run_peak(cmd):
    """Runs a command; returns (seconds, peak resident memory in MB, return code). GNU time reports the
    program's own peak (a child forked from this Python would count its memory too)."""
    with tempfile.NamedTemporaryFile() as rss:
        t = time.perf_counter()
        rc = subprocess.run(["/usr/bin/time", "-q", "-f", "%M", "-o", rss.name, *cmd], stdout=subprocess.DEVNULL,
                            stderr=subprocess.DEVNULL).returncode
        dt = time.perf_counter() - t
        return dt, float(pathlib.Path(rss.name).read_text().split()[-1]) / 1024, rc


def record_files(tmp, rows, distinct=False):
    """A record of hourly rows (hours, H2S, load) on a daily cycle, and its case. The cycle's values to one
    decimal repeat every day (24 distinct rows: readings quantised by the instrument); with `distinct` a
    seeded noise of a few ppmv and tenths of a percent, written to three decimals, makes every row new."""
    csv_path = pathlib.Path(tmp) / f"record-{rows}{'-distinct' if distinct else ''}.csv"
    hour = np.arange(rows)
    h2s = 300 + 120 * np.sin(hour / 24 * 2 * np.pi)
    load = 85 + 15 * np.sin(hour / 24 * 2 * np.pi + 1)
    with open(csv_path, "w") as f:
        f.write("hours [h],h2s [ppmv],load [%]\n")
        if distinct:
            rng = np.random.default_rng(7)
            h2s = h2s + rng.uniform(-5, 5, rows)
            load = np.clip(load + rng.uniform(-0.5, 0.5, rows), 1, 100)
            f.writelines(f"1,{a:.3f},{b:.3f}\n" for a, b in zip(h2s, load))
        else:
            f.writelines(f"1,{a:.1f},{b:.1f}\n" for a, b in zip(h2s, load))
    case = (root / "cases" / "demo-site.yaml").read_text()
    case_path = csv_path.with_suffix(".yaml")
    case_path.write_text(case_with_record(case, csv_path))
    return csv_path, case_path


def case_with_record(case_text, csv_path):
    """The demo site's case with its record replaced by the CSV file (its variants and run settings dropped)."""
    keep = []
    skip = False
    for line in case_text.splitlines():
        if line and not line.startswith((" ", "#")):
            skip = line.split(":")[0] in ("record", "variants", "uncertainty", "run")
        if not skip:
            keep.append(line)
    return "\n".join(keep) + f"\nrecord:\n  file: {csv_path}\n"


def child_figures(cmd):
    """Runs a benchmark child that prints its own figures (CPU seconds first); returns them as floats."""
    out = subprocess.run(cmd, capture_output=True, text=True, check=True).stdout.split()
    return [float(x) for x in out]


def python_peak_mb(case_path):
    """Peak resident memory of a Python process that imports acidload and loads the case, and of one
    that only imports it (GNU time, the child's own peak)."""
    code = "import sys, acidload\nif len(sys.argv) > 1: acidload.load_case(sys.argv[1])"
    return (run_peak([sys.executable, "-c", code, str(case_path)])[1], run_peak([sys.executable, "-c", code])[1])


def part4(bench_program, program):
    rows = 200_000
    for distinct in (False, True):
        part4_record(bench_program, program, rows, distinct)


def part4_record(bench_program, program, rows, distinct):
    with tempfile.TemporaryDirectory() as tmp:
        csv_path, case_path = record_files(tmp, rows, distinct)

        def with_csv():
            with open(csv_path, newline="") as f:
                r = csv.reader(f)
                next(r)
                return [(float(a), float(b), float(c)) for a, b, c in r]

        pandas = __import__("pandas")
        own = {"cpp": [], "bytes": []}  # the children time themselves: CPU of their thread, no process start

        def child(name, cmd):
            own[name].append(child_figures(cmd))
            return own[name][-1]

        sides = {"cpp": lambda: child("cpp", [bench_program, "--load-record", str(case_path)]),
                 "acidload": lambda: acidload.load_case(str(case_path)),
                 "check": lambda: run_peak([program, "check", str(case_path)]),
                 "pandas": lambda: pandas.read_csv(csv_path),
                 "csv": with_csv,
                 "bytes": lambda: child("bytes", [bench_program, "--read-bytes", str(csv_path)])}
        times, res = interleaved(sides)
        for name in own:
            times[name] = [f[0] for f in own[name]]
        segments = res["cpp"][1]
        # its peak through GNU time: a child forked from this Python keeps the fork's peak across exec
        cpp_peak = run_peak([bench_program, "--load-record", str(case_path)])[1]
        mb = csv_path.stat().st_size / 1e6
        peak = res["check"][1]
        py_peak, py_base = python_peak_mb(case_path)
        # accuracy of pandas' default float parser against Python's float() (correctly rounded)
        ref = np.array(with_csv())
        df = res["pandas"].to_numpy()
        ulps = np.abs(df - ref) / np.spacing(np.abs(ref))
        kind = ("every row distinct (H2S and load to three decimals, seeded noise)" if distinct else
                "a daily cycle to one decimal: 24 distinct rows, repeating")
        print(f"4{'b' if distinct else 'a'}. reading a record of {rows} rows ({mb:.1f} MB: hours, H2S, load; {kind}) "
              "into what each side computes with")
        print(f"   {'side':52s} {'thousand rows/s':>22s}")
        for name, label in (("cpp", "acidload io::load_case (C++, CPU time of its thread)"),
                            ("acidload", "acidload.load_case (Python)"), ("check", "acidload check (the program)"),
                            ("pandas", "pandas.read_csv"), ("csv", "csv.reader + float()"),
                            ("bytes", "the limit: reading the bytes, lines counted (C++)")):
            print(f"   {label:52s} {fmt([rows / t / 1e3 for t in times[name]], digits=0):>22s}")
        print(f"   ratio pandas / acidload.load_case  {fmt(ratios(times, 'pandas', 'acidload'), digits=3)}   (target > 1: acidload ahead)")
        print(f"   ratio bytes / C++ load_case        {fmt(ratios(times, 'bytes', 'cpp'), digits=4)}   (the share of the limit reached)")
        print(f"   peak memory: acidload check {peak:.0f} MB; C++ load_case {cpp_peak:.0f} MB; Python load_case "
              f"{py_peak:.0f} MB ({py_base:.0f} MB of it Python with acidload imported); "
              f"about {(peak - 5) * 1e3 / rows:.2f} kB per row   (target: >= 1 million rows/s; 1e7 rows under 100 MB)")
        print(f"   what each produces: acidload the record checked ({int(segments)} rows made into segments: values in SI "
              "units, every value range-checked, the gas resolved, each row's operation put through the model's checks) "
              "and kept as its description, no segment held (a run reads the file again);")
        print(f"   pandas a DataFrame of 3 float64 columns, {np.count_nonzero(ulps)} of {ulps.size} values off the "
              f"correctly rounded float (largest {ulps.max():.0f} ulp); csv.reader + float(): correctly rounded floats, "
              "no check; the bytes side only counts lines")
        print()


if __name__ == "__main__":
    print(f"acidload {acidload.__version__} benchmarks, Python side: every side timed once per round, the sides "
          f"interleaved, {ROUNDS} rounds; a figure is the median [lowest – highest]\n")
    only = set(sys.argv[3:])  # part numbers to run (all when none is given)
    if not only or "1" in only:
        part1(sys.argv[1])
    if not only or "2" in only:
        part2()
    if not only or "3" in only:
        part3()
    if not only or "4" in only:
        part4(sys.argv[1], sys.argv[2])
