"""Calibration and Monte Carlo through the Python package, checked against SciPy and numpy:
- the estimates and standard errors of acidload's Levenberg–Marquardt equal scipy.optimize.least_squares
  driving the same residual function through the binding (the readings and the weak prior rows, same
  weights, same s², an interior optimum);
- Monte Carlo percentiles equal numpy.percentile of the per-draw values, and 1 and 2 threads agree;
- a fit the data cannot identify raises FitRefusedError.
The demo history and lab file are invented data."""
import numpy as np
import pytest

from conftest import ROOT, need, need_acidload

PARAMS = ["model.liner-uptake", "model.oxidation-rate", "model.organic-acid-yield"]


def _setup():
    acidload = need_acidload()
    case = acidload.load_case(str(ROOT / "cases" / "demo-site-history.yaml"))
    lab = acidload.read_lab_samples(ROOT / "cases" / "demo-site-lab.csv")
    return acidload, case, lab


@pytest.mark.reference(quantity="fit estimates and standard errors", tolerance="rel 1e-5", unit="core units", source="scipy.optimize.least_squares")
def test_estimates_and_standard_errors_equal_scipy_least_squares():
    optimize = need("scipy.optimize")
    acidload, case, lab = _setup()
    fit = acidload.fit(case, lab, PARAMS)
    assert fit.converged
    core = acidload._core
    variant = case.variants[0]
    start = [core.to_fit_space(k, core.get_parameter(variant._engine_case, k)) for k in PARAMS]

    def residuals(phi):
        return acidload.fit_residuals(case, lab, PARAMS, phi)  # readings, then one prior row per parameter

    # scipy.optimize.least_squares (trust region reflective), tight tolerances, same residuals
    res = optimize.least_squares(residuals, np.array(start), method="trf", xtol=1e-15, ftol=1e-15, gtol=1e-15,
                                 diff_step=1e-7, max_nfev=2000)
    assert res.success
    p = len(PARAMS)
    data = res.fun[:-p]  # the prior rows do not count as observations
    n = data.size
    s2 = float(data @ data) / (n - p - len(fit.baselines))  # a fitted FTIR baseline takes a degree of freedom
    cov = max(1.0, s2) * np.linalg.inv(res.jac.T @ res.jac)
    phi = res.x
    dx = np.array([core.dx_dphi(k, f) for k, f in zip(PARAMS, phi)])
    se = dx * np.sqrt(np.diag(cov))
    est = np.array([core.from_fit_space(k, f) for k, f in zip(PARAMS, phi)])
    np.testing.assert_allclose([fit.estimates[k] for k in PARAMS], est, rtol=1e-5)
    np.testing.assert_allclose([fit.standard_errors[k] for k in PARAMS], se, rtol=1e-5)
    assert fit.s2 == pytest.approx(s2, rel=1e-6)
    assert 0 < min(est)  # an interior optimum: every parameter well inside its bounds


@pytest.mark.reference(quantity="Monte Carlo P10/P50/P90", tolerance="rel 1e-12", unit="h", source="numpy.percentile (linear)")
def test_monte_carlo_percentiles_equal_numpy_and_do_not_depend_on_threads():
    acidload, case, _ = _setup()
    one = acidload.monte_carlo(case, draws=300, threads=1)
    two = acidload.monte_carlo(case, draws=300, threads=2)
    np.testing.assert_array_equal(one["drain_interval_h"], two["drain_interval_h"])
    d = one["drain_interval_h"]
    # numpy.percentile, default linear method, is the definition acidload states
    assert one["interval_p10_h"] == pytest.approx(np.percentile(d, 10), rel=1e-12)
    assert one["interval_p50_h"] == pytest.approx(np.percentile(d, 50), rel=1e-12)
    assert one["interval_p90_h"] == pytest.approx(np.percentile(d, 90), rel=1e-12)


def test_too_few_readings_are_refused_with_the_reason():
    acidload, case, lab = _setup()
    six = PARAMS + ["model.capture-so2", "model.so3-share", "model.nitration-yield"]
    with pytest.raises(acidload.FitRefusedError, match="more readings than parameters"):
        acidload.fit(case, lab[:1], six)  # one sample: five readings for six parameters


def test_the_issue_s_eleven_parameter_fit_keeps_every_estimate_in_range():
    acidload, case, lab = _setup()
    keys = ["model.so3-share", "model.liner-uptake", "model.capture-so2", "model.wet-so2-factor", "model.oxidation-rate",
            "model.organic-acid-yield", "model.nitration-yield", "model.weak-base-d2896", "model.base-floor",
            "model.additive-depletion", "model.salt-titration-share"]
    fit = acidload.fit(case, lab, keys)
    for k, v in fit.estimates.items():
        low, high, _, _ = acidload._core.parameter_range(k)
        if acidload._core.parameter_bound(k) == "interval":
            assert low <= v <= high, k
        assert np.isfinite(fit.standard_errors[k]), k


def test_default_parameters_and_lab_table():
    acidload, case, _ = _setup()
    table = acidload.read_lab(ROOT / "cases" / "demo-site-lab.csv")
    fit = acidload.fit(case, table)  # the table carries its samples
    assert fit.keys == ["model.liner-uptake", "model.oxidation-rate", "model.organic-acid-yield", "model.nitration-yield"]
    assert any("nitration" in n for n in fit.notes)
    assert not any(fit.held.values())
    n = len(table["charge"])
    assert n == len(acidload.read_lab_samples(ROOT / "cases" / "demo-site-lab.csv"))
    assert np.asarray(table["tbn"], dtype=float).shape == (n,)


def test_predict_gives_one_labelled_band_and_the_lab_first_forecast():
    acidload, case, lab = _setup()
    fit = acidload.fit(case, lab, PARAMS)
    p = acidload.predict(fit, draws=100)
    assert p["p5_h"] < p["p50_h"] < p["p95_h"]
    assert p["limit"] in {"tbn-fall", "crossover", "tan-rise", "san", "oxidation", "nitration", "max-hours", "none"}
    assert len(p["held_out"]) >= 2 and p["model_form_spread"] > 0
    assert p["intervals_h"].shape == (100,)
    assert p["current"].lab_first and not p["current"].change_now
    cur = acidload.predict(fit, draws=100, next_charge=False)
    assert cur["remaining_p50_h"] == pytest.approx(cur["p50_h"] - cur["current"].end_oil_hours)


def test_forecast_and_overlay(tmp_path):
    acidload, case, lab = _setup()
    fit = acidload.fit(case, lab, PARAMS)
    fc = {f["limit"]: f for f in acidload.forecast(fit)}
    assert not any(f["already"] for f in fc.values())
    assert fc["tbn-fall"]["low_h"] < fc["tbn-fall"]["remaining_h"] < fc["tbn-fall"]["high_h"]
    ov = tmp_path / "fitted.yaml"
    fit.write_overlay(ov, "cases/demo-site-history.yaml", "cases/demo-site-lab.csv")
    again = acidload.load_case(str(ROOT / "cases" / "demo-site.yaml"), overlays=[str(ov)])
    assert acidload._core.get_parameter(again.variants[0]._engine_case, "model.liner-uptake") == pytest.approx(
        fit.estimates["model.liner-uptake"], rel=1e-8)


def test_trend_and_alarm_levels():
    acidload, case, lab = _setup()
    fit = acidload.fit(case, lab, PARAMS)
    t = acidload.trend(fit)
    assert t["tbn_slope"] < 0 and t["tbn_slope_model"] < 0 and t["implied_h2s_ppmv"] > 0
    assert all(set(a) >= {"sample", "quantity", "level", "message"} for a in t["alarms"])
    levels = {q: (c, k) for q, c, k, _, basis in acidload.default_alarm_levels()}
    assert levels["fe"][0] < levels["fe"][1]
    with pytest.raises(acidload.InputError):
        acidload.trend(fit, {"fe": (50, float("nan"))})


def test_monte_carlo_every_charge_with_the_fit_s_correlated_draws():
    acidload, case, lab = _setup()
    fit = acidload.fit(case, lab, PARAMS)
    r = acidload.monte_carlo(case, draws=100, fit=fit, every_charge=True, threads=1)
    assert r["fitted_parameters"] == 3 and len(r["charges"]) == 4
    for c in r["charges"]:
        # numpy.percentile (linear) is the definition acidload states
        assert c["p5_h"] == pytest.approx(np.percentile(c["drain_interval_h"], 5), rel=1e-12)
        assert c["p95_h"] == pytest.approx(np.percentile(c["drain_interval_h"], 95), rel=1e-12)
    assert r["interval_p5_h"] <= r["interval_p10_h"] <= r["interval_p50_h"] <= r["interval_p90_h"] <= r["interval_p95_h"]
    two = acidload.monte_carlo(case, draws=100, fit=fit, every_charge=True, threads=2)
    np.testing.assert_array_equal(two["charges"][2]["drain_interval_h"], r["charges"][2]["drain_interval_h"])


@pytest.mark.reference(quantity="lab-first state update (joint Kalman update with cross-terms)", tolerance="abs 1e-12",
                       unit="mg KOH/g, A/cm", source="Kalman 1960 update written in NumPy here")
def test_lab_first_update_equals_a_numpy_kalman_update_with_cross_terms():
    acidload, case, lab = _setup()
    fit = acidload.fit(case, lab, PARAMS)
    k = acidload.forecast(fit).kalman
    names = k["state"]
    # H written here from the reading equations of docs/model.md §8.1: TBN = b + b_weak,
    # TAN = t_add + a_w + s + beta*c_n (titrating salts as one component), SAN = s, FTIR o and n
    rows = {"tbn": ["base", "weak-base"], "tan": ["additive-acidity", "weak-acid", "strong-acid", "titrating-salts"],
            "san": ["strong-acid"], "oxidation": ["oxidation"], "nitration": ["nitration"]}
    H = np.array([[1.0 if n in rows[r] else 0.0 for n in names] for r in k["readings"]])
    assert np.array_equal(H, np.array(k["reading_matrix"]))
    # the prior covariance: the fit's parameter covariance carried to the state, J C J^T, plus the
    # scatter beyond the lab precision, pinv(H) D pinv(H)^T with D = (chi2_r - 1)+ diag(sigma^2)
    J, C = np.array(k["sensitivity"]), np.array(fit.covariance)
    sigma = np.array(k["sigma"])
    D = np.diag(k["extra_variance_factor"] * sigma ** 2)
    Hp = np.linalg.pinv(H)
    P = J @ C @ J.T + Hp @ D @ Hp.T
    assert np.allclose(P, np.array(k["covariance"]), rtol=0, atol=1e-12 * max(1.0, np.abs(P).max()))
    # cross-terms: TBN's base and TAN's acids share the acid inflow, so they are correlated
    assert abs(P[names.index("base"), names.index("weak-acid")]) + abs(P[names.index("base"), names.index("strong-acid")]) + \
        abs(P[names.index("base"), names.index("titrating-salts")]) > 0
    # the textbook update, v+ = v + P H^T (H P H^T + R)^-1 (y - H v)
    v, y, R = np.array(k["prior"]), np.array(k["measured"]), np.diag(sigma ** 2)
    K = P @ H.T @ np.linalg.inv(H @ P @ H.T + R)
    expected = v + K @ (y - H @ v)
    assert np.max(np.abs(np.array(k["posterior"]) - expected)) < 1e-12
    assert np.max(np.abs(np.array(k["gain"]) - K)) < 1e-12



@pytest.mark.reference(quantity="FTIR baseline fitted per lab", tolerance="3 standard errors", unit="A/cm",
                       source="a known offset added to synthetic readings here")
def test_a_known_ftir_baseline_offset_is_recovered_when_no_fresh_oil_sample_is_given(tmp_path):
    # synthetic readings: the demo case at known parameters, sampled from 150 h on (no fresh-oil
    # sample), seeded noise of the lab precision, and a known baseline added to one lab's oxidation
    acidload, case, _ = _setup()
    core = acidload._core
    keys = ["model.oxidation-rate", "model.liner-uptake"]
    truth = core.with_parameter(core.with_parameter(case.variants[0]._engine_case, keys[0], 0.010), keys[1], 3e-4)
    header = "charge,oil-hours,lab,tbn [mg KOH/g],tan [mg KOH/g],oxidation [A/cm]"
    hours = list(range(75, 901, 75))  # twelve samples a charge, the first at 75 h
    rows = [(c, h, "Eastbrook Lab" if c == 2 else "Westfield Lab") for c in (1, 2, 3) for h in hours]
    lab = tmp_path / "lab.csv"
    lab.write_text("\n".join([header] + [f"{c},{h},{n},0,0,0" for c, h, n in rows]) + "\n")
    pred = core.predict(truth, acidload.read_lab_samples(lab))
    y = np.asarray(pred["predicted"]) + np.asarray(pred["sigma"]) * np.random.default_rng(7).standard_normal(len(pred["predicted"]))
    offset = 2.5  # A/cm: Eastbrook's FTIR reads this much above the model's oxidation (invented)
    out = [header]
    for j, (c, h, n) in enumerate(rows):
        tbn, tan, ox = y[3 * j:3 * j + 3]
        out.append(f"{c},{h},{n},{tbn:.4f},{tan:.4f},{ox + (offset if n == 'Eastbrook Lab' else 0):.4f}")
    lab.write_text("\n".join(out) + "\n")
    fit = acidload.fit(case, lab, keys)
    b = {x["lab"]: x for x in fit.baselines if x["reading"] == "oxidation"}
    assert set(b) == {"Eastbrook Lab", "Westfield Lab"}
    assert abs(b["Eastbrook Lab"]["value"] - offset) < 3 * b["Eastbrook Lab"]["standard_error"]
    assert abs(b["Westfield Lab"]["value"]) < 3 * b["Westfield Lab"]["standard_error"]
    # twelve readings of 1 A/cm on 75-900 h: an intercept beside a slope, about 0.6 A/cm
    assert 0.29 < b["Eastbrook Lab"]["standard_error"] < 1.0
    assert fit.estimates["model.oxidation-rate"] == pytest.approx(0.010, rel=0.15)
    assert any("baseline" in n for n in fit.notes)
    # a stated baseline (the lab file's column) is taken as given: nothing fitted
    stated = lab.read_text().replace("oxidation [A/cm]", "oxidation [A/cm],oxidation-baseline [A/cm]")
    stated = "\n".join([stated.splitlines()[0]] + [r + ",0" for r in stated.splitlines()[1:]]) + "\n"
    lab.write_text(stated)
    assert acidload.fit(case, lab, keys).baselines == []
