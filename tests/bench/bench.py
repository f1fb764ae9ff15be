"""acidload benchmarks, Python side (run by scripts/bench; not by the tests). Prints figures and
ratios, each timing the median of several runs, each ratio measured side by side in this run:
  1. the one-year hourly record's oil balance: acidload's exact segments (the C++ loop behind
     acidload._core.oil.advance_record) against the SciPy reference (solve_ivp, LSODA, rtol 1e-9),
     end states compared to 1e-7 relative;
  3. a three-parameter calibration on 30 samples over 5 charges: acidload.fit against
     scipy.optimize.least_squares driving the SciPy reference;
  4. a vectorised Python sweep of 100 000 H2S values (acidload.drain_interval) against the same loop
     called directly in C++ (acidload._core.sweep_drain_interval).
Usage: bench.py BENCH_PROGRAM   (the C++ acidload_bench, which writes the record's rates)"""
import pathlib
import statistics
import subprocess
import sys
import tempfile
import time

import numpy as np
from scipy.optimize import least_squares

root = pathlib.Path(__file__).resolve().parents[2]
sys.path.insert(0, str(root / "tests" / "reference" / "python"))
import acidload  # noqa: E402
import oil_reference as ref  # noqa: E402

core = acidload._core
RUNS = 5


def median_time(f, runs=RUNS):
    times, out = [], None
    for _ in range(runs):
        t = time.perf_counter()
        out = f()
        times.append(time.perf_counter() - t)
    return statistics.median(times), out


def charge_constants(fresh_tbn):
    props = core.oil.OilProperties()
    props.fresh_tbn = fresh_tbn
    return props, core.oil.balance_constants(props)


def to_ref_constants(k):
    return ref.Constants(fresh_base=k.fresh_base, base_floor=k.base_floor, fresh_additive=k.fresh_additive,
                         additive_depletion=k.additive_depletion, organic_neutralised_share=k.organic_neutralised_share)


def to_ref_state(s):
    return ref.State(mass=s.mass, base=s.base, strong_acid=s.strong_acid, weak_acid=s.weak_acid, salts=s.salts,
                     oxidation=s.oxidation, nitration=s.nitration, additive_acidity=s.additive_acidity)


names = ("strong_acid", "sulfurous_fresh", "nitration", "oxidation", "organic_acid", "consumption")


def part1(bench_program):
    with tempfile.TemporaryDirectory() as tmp:
        csv = pathlib.Path(tmp) / "year.csv"
        subprocess.run([bench_program, "--record-csv", str(csv)], check=True, capture_output=True)
        table = np.loadtxt(csv, delimiter=",", skiprows=1)
    props, k = charge_constants(9.0)  # as the C++ benchmark's charge: TBN 9, 600 L at 880 kg/m3
    start = core.oil.fresh_oil(props, 0.6 * props.density_15)
    t_acid, end = median_time(lambda: core.oil.advance_record(start, k, table, True), runs=RUNS)
    kr = to_ref_constants(k)

    def scipy_year():
        s = to_ref_state(start)
        for row in table:
            rates = ref.Rates(**dict(zip(names, row[1:])), continuous_makeup=True)
            s = ref.integrate(rates, kr, s, row[0], rtol=1e-9, method="LSODA").state
        return s

    t_ref, ref_end = median_time(scipy_year)
    worst = 0.0
    for f in ("base", "strong_acid", "weak_acid", "salts", "oxidation", "nitration", "additive_acidity"):
        a, b = getattr(end, f), getattr(ref_end, f)
        worst = max(worst, abs(a - b) / max(abs(b), 1e-2))
    n = len(table)
    print(f"1. one-year hourly record, {n} segments: the oil balance")
    print(f"   acidload exact segments    {t_acid / n * 1e6:10.3f} us/segment")
    print(f"   SciPy reference (LSODA)    {t_ref / n * 1e6:10.1f} us/segment")
    print(f"   ratio SciPy / acidload     {t_ref / t_acid:10.0f}   (target >= 1000)   end states agree to {worst:.1e}"
          f"   (target 1e-7)")
    print()


def part3():
    # five charges of 1200 h, six samples each: 30 samples (invented), noise from numpy's seeded generator
    rec_text = (root / "cases" / "demo-site-history.yaml").read_text().split("record:")[0]
    rec_text += "record:\n  segments:\n"
    for i, h2s in enumerate((250, 320, 280, 360, 300)):
        rec_text += f"    - {{hours: 1200 h, h2s: {h2s} ppmv{', event: oil-change' if i else ''}}}\n"
    case5 = acidload.load_case_text(rec_text, file_name="bench.yaml", base_dir=str(root / "cases"))
    params = ["model.oxidation-rate", "model.organic-acid-yield", "model.salt-titration-share"]
    truth = {"model.oxidation-rate": 0.010, "model.organic-acid-yield": 0.10, "model.salt-titration-share": 0.3}
    ec = case5.variants[0]._engine_case
    true_case = ec
    for key, v in truth.items():
        true_case = core.with_parameter(true_case, key, v)
    rng = np.random.default_rng(5)
    with tempfile.TemporaryDirectory() as tmp:
        lab = pathlib.Path(tmp) / "lab.csv"
        rows = ["charge,oil-hours,tbn [mg KOH/g],tan [mg KOH/g],oxidation [A/cm]"]
        rows += [f"{c + 1},{h},0,0,0" for c in range(5) for h in range(200, 1201, 200)]
        lab.write_text("\n".join(rows) + "\n")
        pred = core.predict(true_case, acidload.read_lab_samples(lab))
        truth_predicted = np.asarray(pred["predicted"])
        vals = np.asarray(pred["predicted"]) + np.asarray(pred["sigma"]) * rng.standard_normal(len(pred["predicted"]))
        rows = ["charge,oil-hours,tbn [mg KOH/g],tan [mg KOH/g],oxidation [A/cm]"]
        for j, (c, h) in enumerate((c, h) for c in range(5) for h in range(200, 1201, 200)):
            rows.append(f"{c + 1},{h},{vals[3 * j]:.6f},{vals[3 * j + 1]:.6f},{vals[3 * j + 2]:.6f}")
        lab.write_text("\n".join(rows) + "\n")
        samples = acidload.read_lab_samples(lab)
    t_acid, fit = median_time(lambda: acidload.fit(case5, samples, params, priors=False))  # plain least squares, as SciPy

    # the SciPy side: the same 30 samples, the reference's balance for each charge, least_squares
    seg_rates = []  # each charge's rates at acidload's default oxidation rate and acid yield
    for i, h2s in enumerate((250, 320, 280, 360, 300)):
        one = acidload.load_case_text(rec_text.split("record:")[0] + f"record:\n  segments:\n    - {{hours: 1200 h, h2s: {h2s} ppmv}}\n",
                                      file_name="one.yaml", base_dir=str(root / "cases"))
        r = core.run_case(one._file).first_rates(0)
        seg_rates.append(ref.Rates(**{n: r[n] for n in names}, continuous_makeup=True))
    props = core.oil.OilProperties()
    props.fresh_tbn = 6.0
    props.fresh_tbn_method = core.oil.BaseNumberMethod.D2896
    mass = 0.72 * props.density_15
    measured = np.array([(s.tbn, s.tan, s.oxidation) for s in samples]).ravel()
    sig = np.tile([0.20, 0.15, 1.0], 30)
    k_ox0, alpha0 = 0.008, 0.08  # the defaults the rates above were made with

    def model_readings(phi):
        kox, alpha, beta = np.exp(phi[0]), np.exp(phi[1]), 1 / (1 + np.exp(-phi[2]))
        props.salt_titration_share = beta
        k = to_ref_constants(core.oil.balance_constants(props))
        rates = [ref.Rates(strong_acid=r.strong_acid, sulfurous_fresh=r.sulfurous_fresh, nitration=r.nitration,
                           oxidation=r.oxidation * kox / k_ox0, organic_acid=r.organic_acid * kox / k_ox0 * alpha / alpha0,
                           consumption=r.consumption, continuous_makeup=True) for r in seg_rates]
        out = []
        state = None
        for c in range(5):
            fresh = ref.State(mass=mass, base=k.fresh_base, additive_acidity=k.fresh_additive)
            if state is None:
                state = fresh
            else:  # oil change: 10 % stays, fresh oil to the full charge
                kept = ref.State(**{f: (getattr(state, f) if f != "mass" else mass * 0.1)
                                    for f in ("mass", "base", "strong_acid", "weak_acid", "salts", "oxidation",
                                              "nitration", "additive_acidity")})  # the same oil, a tenth of it
                state = ref.add_fresh_oil(kept, k, mass * 0.9)
            t = 0
            for h in range(200, 1201, 200):
                state = ref.integrate(rates[c], k, state, h - t, rtol=1e-10).state
                t = h
                tbn = state.base + props.weak_base_d4739
                tan = state.additive_acidity + state.weak_acid + state.strong_acid + beta * state.salts
                out += [tbn, tan, state.oxidation]
        return np.array(out)

    phi_truth = [np.log(truth["model.oxidation-rate"]), np.log(truth["model.organic-acid-yield"]), np.log(0.3 / 0.7)]
    forward = np.max(np.abs(model_readings(phi_truth) - truth_predicted) / sig)
    phi0 = [np.log(k_ox0), np.log(alpha0), np.log(0.2 / 0.8)]  # acidload's defaults, as its fit starts
    t_scipy, res = median_time(lambda: least_squares(lambda p: (measured - model_readings(p)) / sig, phi0,
                                                     xtol=1e-10, ftol=1e-10))
    est = [np.exp(res.x[0]), np.exp(res.x[1]), 1 / (1 + np.exp(-res.x[2]))]
    agree = max(abs(a - b) / abs(b) for a, b in zip([fit.estimates[p] for p in params], est))
    print("3. three-parameter calibration, 30 samples over 5 charges (invented data)")
    print(f"   acidload.fit               {t_acid * 1e3:10.2f} ms")
    print(f"   SciPy least_squares + ref  {t_scipy * 1e3:10.0f} ms")
    print(f"   ratio SciPy / acidload     {t_scipy / t_acid:10.0f}   (target >= 100)   estimates agree to {agree:.1e}")
    print(f"   (the two forward models agree to {forward:.1e} sigma at the true parameters)")
    print()


def part4():
    case = acidload.load_case(str(root / "cases" / "demo-site.yaml"))
    values = np.linspace(0.0, 1000.0, 100_000)
    ec = case.variants[0]._engine_case
    t_py, a = median_time(lambda: acidload.drain_interval(case, h2s_ppmv=values))
    t_cpp, b = median_time(lambda: core.sweep_drain_interval(ec, "h2s", values))
    same = np.array_equal(np.asarray(a), np.asarray(b))
    print("4. sweep of 100 000 H2S values (drain interval of the demo site)")
    print(f"   Python acidload.drain_interval {t_py:8.3f} s")
    print(f"   the C++ loop directly          {t_cpp:8.3f} s")
    print(f"   ratio Python / C++             {t_py / t_cpp:8.3f}   (target <= 1.2)   identical answers: {'yes' if same else 'NO'}")
    print()


if __name__ == "__main__":
    print(f"acidload {acidload.__version__} benchmarks, Python side (median of {RUNS} runs unless stated)\n")
    part1(sys.argv[1])
    part3()
    part4()
