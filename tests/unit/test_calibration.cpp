// Calibration, forecast and Monte Carlo.
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>

#include "../support/lab_history.hpp"
#include "../support/reference_check.hpp"
#include "acidload/core/error.hpp"
#include "acidload/studies/calibration.hpp"
#include "acidload/studies/forecast.hpp"
#include "acidload/studies/monte_carlo.hpp"
#include "acidload/studies/trend.hpp"

using namespace acidload;
using acidload_test::history_case;
using acidload_test::history_samples;

namespace {
const std::vector<std::string> three = {"model.liner-uptake", "model.oxidation-rate", "model.organic-acid-yield"};
EngineCase truth() {
  EngineCase t = history_case();
  set_parameter(t, "model.liner-uptake", 3.5e-4);
  set_parameter(t, "model.oxidation-rate", 0.010);
  set_parameter(t, "model.organic-acid-yield", 0.10);
  return t;
}
}  // namespace

TEST_CASE("a fit to noise-free data returns the true parameters") {
  const EngineCase t = truth();
  Precision p;
  std::vector<LabSample> s = history_samples(t, 1, p);
  // remove the noise: readings exactly as predicted
  for (const SampleResidual& r : predict(t, s, p)) {
    LabSample& x = s[r.sample];
    if (r.reading == "tbn") x.tbn = r.predicted;
    if (r.reading == "tan") x.tan = r.predicted;
    if (r.reading == "oxidation") x.oxidation = r.predicted;
  }
  FitSettings fs;
  fs.parameters = three;
  fs.priors = false;  // the optimiser alone: exact data give the exact optimum
  const FitResult f = calibrate(history_case(), s, fs);
  CHECK(f.converged);
  CHECK(f.parameters[0].estimate == doctest::Approx(3.5e-4).epsilon(1e-6));
  CHECK(f.parameters[1].estimate == doctest::Approx(0.010).epsilon(1e-6));
  CHECK(f.parameters[2].estimate == doctest::Approx(0.10).epsilon(1e-6));
  CHECK(f.s2 < 1e-10);
  CHECK(f.observations == 90);
  CHECK(f.degrees_of_freedom == 87);
  // the weak priors (a factor of about 7 at one sigma) move well-measured estimates by far less than their errors
  fs.priors = true;
  const FitResult g = calibrate(history_case(), s, fs);
  for (std::size_t j = 0; j < 3; ++j) {
    INFO(three[j]);
    CHECK(std::fabs(g.parameters[j].estimate - f.parameters[j].estimate) < 1e-3 * f.parameters[j].estimate);
    CHECK(!g.parameters[j].held);
  }
}

TEST_CASE("parameter recovery: the truth lies within two standard errors in at least 90 % of 200 trials") {
  const EngineCase t = truth();
  const EngineCase start = history_case();
  Precision p;
  FitSettings fs;
  fs.parameters = three;
  const double true_values[] = {3.5e-4, 0.010, 0.10};
  int within[3] = {0, 0, 0};
  const int trials = 200;
  for (int trial = 0; trial < trials; ++trial) {
    const FitResult f = calibrate(start, history_samples(t, 1000 + trial, p), fs);
    for (int j = 0; j < 3; ++j)
      if (std::fabs(f.parameters[j].estimate - true_values[j]) <= 2 * f.parameters[j].standard_error) ++within[j];
  }
  for (int j = 0; j < 3; ++j) {
    INFO(three[j] << ": " << within[j] << " of " << trials);
    CHECK(within[j] >= 0.9 * trials);  // 2 SE covers 95.4 % for a normal estimate; 90 % allows for sampling
  }
}

TEST_CASE("fits on ordinary data: flat parameters held at their prior, confounded pairs flagged, ranges kept") {
  const EngineCase c = history_case();
  Precision p;
  const auto samples = history_samples(truth(), 7, p);
  FitSettings fs;
  const auto has_flag = [](const FitResult& f, const std::string& text) {
    for (const auto& fl : f.flags)
      if (fl.find(text) != std::string::npos) return true;
    return false;
  };
  SUBCASE("fewer readings than parameters is still refused") {
    std::vector<LabSample> few(samples.begin(), samples.begin() + 1);
    few[0].oxidation.reset();
    fs.parameters = three;
    CHECK_THROWS_WITH_AS(calibrate(c, few, fs), doctest::Contains("more readings than parameters"), FitRefusedError);
  }
  SUBCASE("a confounded pair: oxidation rate and acid yield without oxidation readings") {
    auto s = samples;
    for (auto& x : s) x.oxidation.reset();
    fs.parameters = {"model.oxidation-rate", "model.organic-acid-yield"};
    const FitResult f = calibrate(c, s, fs);
    CHECK(f.converged);
    CHECK(has_flag(f, "can hardly tell them apart"));
  }
  SUBCASE("a flat direction: nitration yield without nitration readings is held at its prior") {
    fs.parameters = {"model.liner-uptake", "model.nitration-yield"};
    const FitResult f = calibrate(c, samples, fs);
    CHECK(!f.parameters[0].held);
    CHECK(f.parameters[1].held);
    CHECK(f.parameters[1].estimate == doctest::Approx(get_parameter(c, "model.nitration-yield")));
    CHECK(f.parameters[1].fit_standard_error == doctest::Approx(f.parameters[1].prior_sd));  // it keeps its prior's spread
    CHECK(has_flag(f, "model.nitration-yield held at its prior"));
    CHECK(f.degrees_of_freedom == f.observations - 1);
  }
  SUBCASE("no contaminant signal: a sulfur parameter is held, not refused") {
    EngineCase clean = c;
    for (Segment& seg : clean.record) seg.fuel = with_h2s(seg.fuel, 0);
    fs.parameters = {"model.liner-uptake", "model.oxidation-rate"};
    const FitResult f = calibrate(clean, samples, fs);
    CHECK(f.parameters[0].held);
    CHECK(has_flag(f, "no contaminant signal"));
  }
  SUBCASE("a starting value on a bound (a weak base of 0) starts just inside it") {
    fs.parameters = {"model.liner-uptake", "model.weak-base-d4739"};
    const FitResult f = calibrate(c, samples, fs);
    CHECK(f.parameters[1].estimate >= 0);
    CHECK(f.parameters[1].estimate <= 10);
  }
  SUBCASE("every calibratable model parameter at once: no step leaves a range") {
    fs.parameters = {"model.so3-share", "model.liner-uptake", "model.capture-so2", "model.wet-so2-factor",
                     "model.oxidation-rate", "model.organic-acid-yield", "model.nitration-yield", "model.weak-base-d2896",
                     "model.base-floor", "model.additive-depletion", "model.salt-titration-share"};
    const FitResult f = calibrate(c, samples, fs);
    for (const FittedParameter& x : f.parameters) {
      const ParameterInfo& info = parameter(x.key);
      INFO(x.key << " = " << x.estimate);
      if (info.bound == Bound::interval) CHECK((x.estimate >= info.low && x.estimate <= info.high));
      CHECK(std::isfinite(x.standard_error));
    }
  }
  SUBCASE("no parameters named: chosen for what the lab reports, and said why") {
    fs.parameters = {};
    const FitResult f = calibrate(c, samples, fs);
    std::vector<std::string> keys;
    for (const auto& x : f.parameters) keys.push_back(x.key);
    CHECK(keys == three);  // TBN, TAN and oxidation reported; no nitration, the limit's TBN method
    CHECK(f.notes.size() == 4);
    auto s = samples;
    for (auto& x : s) x.nitration = 0.0, x.tbn_method = BaseNumberMethod::d2896;
    const FitResult g = calibrate(c, s, fs);
    CHECK(g.parameters.size() == 5);
    CHECK(g.parameters[3].key == "model.nitration-yield");
    CHECK(g.parameters[4].key == "model.weak-base-d2896");
    REQUIRE(!g.warnings.empty());
    CHECK(g.warnings.back().find("differs from the limit's") != std::string::npos);
  }
  SUBCASE("a sample outside its charge") {
    auto s = samples;
    s[0].oil_hours = 5000;
    fs.parameters = {"model.liner-uptake"};
    CHECK_THROWS_AS(calibrate(c, s, fs), InputError);
  }
}

TEST_CASE("a fit to a plant the model does not describe warns (chi-square)") {
  Precision p;
  auto s = history_samples(truth(), 5, p);
  for (std::size_t i = 0; i < s.size(); ++i) *s[i].tbn += (i % 2 ? 1.5 : -1.5);  // 7.5 sigma of scatter
  FitSettings fs;
  fs.parameters = three;
  const FitResult f = calibrate(history_case(), s, fs);
  CHECK(f.s2 > 10);
  CHECK(f.chi2_p < 1e-6);
  REQUIRE(!f.warnings.empty());
  CHECK(f.warnings.back().find("does not describe this plant") != std::string::npos);
}

TEST_CASE("chi-square tail against tabulated critical values") {
  // upper-tail critical values chi2(0.05; 10) = 18.307, chi2(0.01; 30) = 50.892 (tabulated to 3 decimals)
  REFERENCE_CHECK("chi-square tail at chi2(0.05; 10) = 18.307", chi2_upper_tail(18.307, 10), 0.05, relative, 1e-3, "-",
                  "docs/references.md [NISTHandbook] (from memory)");
  REFERENCE_CHECK("chi-square tail at chi2(0.01; 30) = 50.892", chi2_upper_tail(50.892, 30), 0.01, relative, 2e-3, "-",
                  "docs/references.md [NISTHandbook] (from memory)");
}

TEST_CASE("outliers and lab changes are flagged; censored SAN counts only when exceeded") {
  const EngineCase t = truth();
  Precision p;
  auto s = history_samples(t, 3, p);
  *s[7].tan += 3.0;  // 20 sigma off
  s[12].lab = "lab A";
  s[13].lab = "lab B";
  s[20].san = 0.1, s[20].san_censored = true;  // reported "<0.1"
  FitSettings fs;
  fs.parameters = three;
  const FitResult f = calibrate(history_case(), s, fs);
  bool outlier = false, lab = false;
  for (const auto& fl : f.flags) {
    outlier |= fl.find("outlier: tan") != std::string::npos;
    lab |= fl.find("lab change") != std::string::npos;
  }
  CHECK(outlier);
  CHECK(lab);
  for (const auto& r : f.residuals)
    if (r.reading == "san") CHECK(r.standardized == 0);  // predicted below the reporting limit
}

TEST_CASE("forecast of the current charge: remaining hours with a band") {
  const EngineCase t = truth();
  Precision p;
  EngineCase c = history_case();
  c.record.back().hours = 300;  // the last charge is a quarter of the way
  EngineCase tt = t;
  tt.record.back().hours = 300;
  auto s = history_samples(t, 11, p);  // the first 300 h of the last charge are the same in t and tt
  s.erase(std::remove_if(s.begin(), s.end(), [](const LabSample& x) { return x.charge == 4 && x.oil_hours > 300; }), s.end());
  FitSettings fs;
  fs.parameters = three;
  const FitResult f = calibrate(c, s, fs);
  const auto fc = forecast(f);
  const LimitForecast& tbn = fc[static_cast<std::size_t>(Limit::tbn_fall)];
  REQUIRE(tbn.reached);
  CHECK(!tbn.already);
  CHECK(tbn.remaining > 0);
  CHECK(tbn.low < tbn.remaining);
  CHECK(tbn.high > tbn.remaining);
  // the truth's remaining hours lie in a sensible neighbourhood of the band
  FitResult at_truth = f;
  at_truth.fitted = tt;
  const double truth_remaining = forecast(at_truth)[static_cast<std::size_t>(Limit::tbn_fall)].remaining;
  CHECK(std::fabs(truth_remaining - tbn.remaining) < 3 * (tbn.high - tbn.low));
}

TEST_CASE("Monte Carlo: identical percentiles with 1 and 2 threads; samplers and percentiles") {
  EngineCase c = history_case();
  c.record = {acidload_test::sanity_segment(8000)};
  const std::vector<UncertainInput> in = {
      {"fuel.h2s", {Distribution::Kind::lognormal, 300, 0.3, 0}},
      {"model.so3-share", {Distribution::Kind::triangular, 0.005, 0.02, 0.035}},
      {"engine.blow-by", {Distribution::Kind::uniform, 0.006, 0.014, 0}},
      {"oil.fresh-tbn", {Distribution::Kind::normal, 6.0, 0.2, 0}},
  };
  const MonteCarloResult one = monte_carlo(c, in, 400, 42, 1), two = monte_carlo(c, in, 400, 42, 2);
  CHECK(one.drain_interval == two.drain_interval);
  CHECK(one.interval_p50 == two.interval_p50);
  CHECK(one.san_p90 == two.san_p90);
  CHECK(one.interval_p10 < one.interval_p50);
  CHECK(one.interval_p50 < one.interval_p90);
  // percentile: linear between order statistics (numpy's default): 1..10 → P10 = 1.9, P50 = 5.5
  CHECK(percentile({10, 9, 8, 7, 6, 5, 4, 3, 2, 1}, 10) == doctest::Approx(1.9));
  CHECK(percentile({10, 9, 8, 7, 6, 5, 4, 3, 2, 1}, 50) == doctest::Approx(5.5));
  // samplers: moments of 200 000 draws (sampling error ~ 0.2 % of a standard deviation)
  double sum = 0, sum2 = 0, tri = 0;
  const int n = 200000;
  for (int i = 0; i < n; ++i) {
    const double u1 = uniform01(9, i, 0), u2 = uniform01(9, i, 1);
    const double z = sample({Distribution::Kind::normal, 0, 1, 0}, u1, u2);
    sum += z, sum2 += z * z;
    tri += sample({Distribution::Kind::triangular, 1, 2, 6}, u1, u2);
  }
  CHECK(std::fabs(sum / n) < 0.01);
  CHECK(std::fabs(sum2 / n - 1) < 0.01);
  CHECK(std::fabs(tri / n - 3.0) < 0.01);  // mean of a triangular = (a + b + c)/3
  CHECK(uniform01(1, 2, 3) == uniform01(1, 2, 3));
  CHECK(uniform01(1, 2, 3) != uniform01(1, 3, 2));
}

TEST_CASE("lab-first forecast: limits the latest sample has passed are reached now, SAN and i-pH included") {
  const EngineCase t = truth();
  Precision p;
  EngineCase c = history_case();
  c.record.back().hours = 300;
  auto s = history_samples(t, 21, p);
  s.erase(std::remove_if(s.begin(), s.end(), [](const LabSample& x) { return x.charge == 4 && x.oil_hours > 300; }), s.end());
  FitSettings fs;
  fs.parameters = three;
  SUBCASE("an ordinary latest sample: nothing reached, the state moves toward the readings") {
    const FitResult f = calibrate(c, s, fs);
    const Forecast fc = forecast_current(f);
    CHECK(fc.lab_first);
    for (const LimitForecast& x : fc.limits) CHECK_MESSAGE(!x.already, x.key << ": " << x.why);
    CHECK(!fc.change_now);
    CHECK(fc.start_oil_hours == 200);  // samples every 200 h
    REQUIRE(!fc.update.empty());
    for (const StateUpdate& u : fc.update) {
      INFO(u.reading);
      CHECK(u.gain > 0);
      CHECK(u.gain < 1);
      CHECK(std::fabs(u.updated - u.measured) <= std::fabs(u.model - u.measured) + 1e-12);  // toward the reading
    }
    CHECK(fc.next_sample_in > 0);
    CHECK(fc.next_sample_in <= 250);
  }
  SUBCASE("a latest sample past TBN, TAN, SAN and i-pH limits") {
    LabSample& last = s.back();
    last.tbn = 2.40;  // limit: 50 % of fresh by D4739 (2.7 for the sanity oil)
    last.tan = 3.6;   // fresh 1.5 + 2 = 3.5, and above the TBN
    last.san = 0.4, last.san_censored = false;
    last.initial_ph = 3.8;
    const FitResult f = calibrate(c, s, fs);
    const Forecast fc = forecast_current(f);
    CHECK(fc.change_now);
    std::vector<std::string> already;
    for (const LimitForecast& x : fc.limits)
      if (x.already) {
        already.push_back(x.key);
        CHECK(x.remaining == 0);
        CHECK(!x.why.empty());
      }
    for (const char* k : {"tbn-fall", "tan-rise", "crossover", "san", "i-ph"}) {
      INFO(k);
      CHECK(std::find(already.begin(), already.end(), k) != already.end());
    }
  }
}

TEST_CASE("predict: the next charge's interval with one band; the current one continued") {
  const EngineCase t = truth();
  Precision p;
  EngineCase c = history_case();
  c.record.back().hours = 300;
  auto s = history_samples(t, 31, p);
  s.erase(std::remove_if(s.begin(), s.end(), [](const LabSample& x) { return x.charge == 4 && x.oil_hours > 300; }), s.end());
  FitSettings fs;
  fs.parameters = three;
  const FitResult f = calibrate(c, s, fs);
  PredictSettings ps;
  ps.draws = 200;
  const Prediction next = predict_charge(f, ps);
  CHECK(next.limit.has_value());
  CHECK(next.p5 < next.p50);
  CHECK(next.p50 < next.p95);
  CHECK(next.held_out.size() >= 4);
  CHECK(next.model_form_spread > 0);
  CHECK(next.draws == 200);
  // the truth's next charge under the same conditions (the last segment continued), run directly
  EngineCase tt = t;
  tt.record.back().hours = 300;
  Segment more = tt.record.back();
  more.events = {{OilEvent::Kind::oil_change, -1}};
  more.hours = tt.model.limits.max_hours;
  more.starts = 0;
  tt.record.push_back(more);
  const RunResult r = simulate(tt.charge, tt.model, tt.record);
  const double truth_next = r.charges.back().drain_interval;
  CHECK(truth_next > next.p5);
  CHECK(truth_next < next.p95);
  // the same draws are reproducible; the current charge continued ends later in oil hours than now
  CHECK(predict_charge(f, ps).intervals == next.intervals);
  ps.next_charge = false;
  const Prediction cur = predict_charge(f, ps);
  CHECK(cur.p50 > 300);
  CHECK(cur.remaining_p50 == doctest::Approx(cur.p50 - 300));
}

TEST_CASE("Monte Carlo's early stop per draw gives what a full run of each draw gives") {
  // each draw stops once its interval and first free acid are known; a plain run of the same draw
  // (the same counter-based numbers, no stop, every limit watched) must give the same two figures
  EngineCase c = history_case();
  c.record = {acidload_test::sanity_segment(8000)};
  const std::vector<UncertainInput> in = {{"fuel.h2s", {Distribution::Kind::lognormal, 300, 0.3, 0}},
                                          {"oil.fresh-tbn", {Distribution::Kind::normal, 6.0, 0.2, 0}}};
  const int draws = 60;
  const MonteCarloResult mc = monte_carlo(c, in, draws, 11, 1);
  int with_san = 0;
  for (int i = 0; i < draws; ++i) {
    EngineCase x = c;
    for (std::size_t k = 0; k < in.size(); ++k)
      set_parameter(x, in[k].key, sample(in[k].distribution, uniform01(11, i, 2 * k), uniform01(11, i, 2 * k + 1)));
    const RunResult r = simulate(x.charge, x.model, x.record, x.options);
    const ChargeSummary& ch = r.charges.front();
    const double interval = ch.first ? ch.drain_interval : x.model.limits.max_hours;
    const double san = ch.reached_at[static_cast<std::size_t>(Limit::san)];
    CHECK(mc.drain_interval[static_cast<std::size_t>(i)] == doctest::Approx(interval).epsilon(1e-10));
    if (san >= 0) {
      ++with_san;
      CHECK(mc.first_san[static_cast<std::size_t>(i)] == doctest::Approx(san).epsilon(1e-10));
    } else {
      CHECK(std::isinf(mc.first_san[static_cast<std::size_t>(i)]));
    }
  }
  CHECK(with_san > 0);          // the check covers draws that stop at the first free acid…
  CHECK(with_san < draws);      // …and draws that run to the cap without it
}

TEST_CASE("trend: a TBN falling faster than the model's band says what to check; alarm levels") {
  const EngineCase t = truth();
  Precision p;
  EngineCase c = history_case();
  auto s = history_samples(t, 41, p);
  FitSettings fs;
  fs.parameters = three;
  // the last charge's TBN falls 60 % faster than the others: an acid load above the model
  const double fresh_reading = *s[24].tbn;  // its first sample (200 h)
  for (LabSample& x : s)
    if (x.charge == 4) *x.tbn -= 0.6 * (fresh_reading - *x.tbn) + 0.6 * 0.002 * (x.oil_hours - 200);
  s[29].trended["fe"] = 60;  // critical (default 50 ppm, common practice)
  s[28].trended["si"] = 18;  // caution (15)
  const FitResult f = calibrate(c, s, fs);
  const TrendResult tr = trend(f);
  REQUIRE(tr.tbn_slope);
  REQUIRE(tr.tbn_slope_model);
  CHECK(*tr.tbn_slope < *tr.tbn_slope_model);
  INFO("slopes " << *tr.tbn_slope << " model " << *tr.tbn_slope_model << " se " << *tr.tbn_slope_error << " s2 " << f.s2);
  REQUIRE(tr.implied_h2s);
  CHECK(*tr.implied_h2s > get_parameter(c, "fuel.h2s"));
  bool acid = false, fe = false, si = false;
  for (const Alarm& a : tr.alarms) {
    acid |= a.message.find("acid load above the model: check H2S and scrubber breakthrough") != std::string::npos;
    fe |= a.quantity == "fe" && a.level == "critical";
    si |= a.quantity == "si" && a.level == "caution";
  }
  CHECK(acid);
  CHECK(fe);
  CHECK(si);
  // user levels replace the defaults
  const TrendResult tu = trend(f, {{"fe", 70, 90, true, "set by the user"}});
  for (const Alarm& a : tu.alarms) CHECK(a.quantity != "fe");
}

TEST_CASE("Monte Carlo over every charge, with a fit's correlated draws; out-of-range draws clipped, never an abort") {
  const EngineCase t = truth();
  Precision p;
  FitSettings fs;
  fs.parameters = three;
  const FitResult f = calibrate(history_case(), history_samples(t, 51, p), fs);
  const std::vector<UncertainInput> in = {{"model.so3-share", {Distribution::Kind::normal, 0.02, 0.05, 0}}};  // often below 0
  const MonteCarloResult r = monte_carlo(history_case(), in, &f, true, 200, 3, 2);
  CHECK(r.clipped > 0);
  CHECK(r.clipped < 200);
  CHECK(r.fitted_parameters == 3);
  REQUIRE(r.charge_bands.size() == 5);
  for (const IntervalBand& b : r.charge_bands) {
    CHECK(b.p5 <= b.p10);
    CHECK(b.p10 <= b.p50);
    CHECK(b.p50 <= b.p90);
    CHECK(b.p90 <= b.p95);
  }
  CHECK(r.charge_bands[0].p50 == doctest::Approx(r.interval_p50).epsilon(1e-9));  // the first charge both ways
  // the same with one thread
  const MonteCarloResult one = monte_carlo(history_case(), in, &f, true, 200, 3, 1);
  CHECK(one.charge_intervals == r.charge_intervals);
}

TEST_CASE("an FTIR baseline is fitted per lab only where none is stated and no fresh-oil sample is given") {
  // a known offset on synthetic readings (docs/model.md §12): recovered within 3 standard errors
  const EngineCase t = truth();
  Precision p;
  std::vector<LabSample> s = history_samples(t, 3, p);
  for (LabSample& x : s) {
    x.oxidation_baseline_given = x.nitration_baseline_given = false;
    x.lab = x.charge == 2 ? "B" : "A";
    if (x.lab == "B") *x.oxidation += 3.0;
  }
  FitSettings fs;
  fs.parameters = three;
  const FitResult f = calibrate(history_case(), s, fs);
  REQUIRE(f.baselines.size() == 2);
  for (const FittedBaseline& b : f.baselines) {
    INFO(b.lab << " " << b.value << " +- " << b.standard_error);
    CHECK(b.reading == "oxidation");
    CHECK(std::fabs(b.value - (b.lab == "B" ? 3.0 : 0.0)) < 3 * b.standard_error);
  }
  CHECK(f.degrees_of_freedom == f.observations - 3 - 2);
  // the fitted baseline travels with the lab's samples
  for (const LabSample& x : f.samples) CHECK(x.oxidation_baseline_given);
  // a fresh-oil sample (oil hours <= 24) of a lab: its baseline is not fitted
  LabSample fresh = s.front();
  fresh.oil_hours = 1;
  s.push_back(fresh);
  CHECK(baseline_groups(s, fs).size() == 1);
  fs.fit_ftir_baseline = false;
  CHECK(calibrate(history_case(), s, fs).baselines.empty());
}

TEST_CASE("a fit whose optimum lies on a parameter's range limit: one-sided differences there, converged inside the range") {
  // The depleted-oxidation factor m (docs/model.md §16) is accepted only from 1 (the antioxidant spent
  // cannot slow oxidation down); it is fitted in logit space of its range (1 to 100), so no step can
  // go below 1 (it used to be fitted on a log scale, where a step below 1 was refused). Readings made with half the oxidation rate and m = 1, fitted with the case's rate
  // and only m free, want m below 1: the optimum sits on the limit. The fit must stop on it, inside
  // the range, with a finite slope taken one-sided (a central difference would ask the model for
  // m < 1 and get a refusal; a zero column instead would leave the standard error infinite).
  EngineCase base = history_case();
  set_parameter(base, "model.induction-time", 200);
  EngineCase t = base;
  set_parameter(t, "model.oxidation-rate", 0.5 * get_parameter(base, "model.oxidation-rate"));
  set_parameter(t, "model.depleted-oxidation-factor", 1.0);
  Precision p;
  std::vector<LabSample> s = history_samples(t, 1, p);
  for (const SampleResidual& r : predict(t, s, p)) {  // noise-free readings
    LabSample& x = s[r.sample];
    if (r.reading == "tbn") x.tbn = r.predicted;
    if (r.reading == "tan") x.tan = r.predicted;
    if (r.reading == "oxidation") x.oxidation = r.predicted;
  }
  {  // the limit is the model's: a value below it is refused (by the parameter's range now, before a run)
    EngineCase below = base;
    CHECK_THROWS_AS(set_parameter(below, "model.depleted-oxidation-factor", 0.999), InputError);
    below.model.oxidation.depleted_factor = 0.999;
    CHECK_THROWS_AS(predict(below, s, p), InputError);
  }
  FitSettings fs;
  fs.parameters = {"model.depleted-oxidation-factor"};
  fs.priors = false;
  const FitResult f = calibrate(base, s, fs);
  REQUIRE(f.parameters.size() == 1);
  const FittedParameter& m = f.parameters[0];
  INFO("estimate " << m.estimate << ", standard error " << m.standard_error << ", " << f.iterations << " iterations");
  CHECK(f.converged);
  CHECK(!m.held);
  CHECK(m.estimate >= 1.0);
  // on the limit to within 1e-5: the logit runs out towards it
  CHECK(m.estimate < 1.0 + 1e-5);
  // without a prior the readings leave no curvature there (fit space runs flat to the bound); with the
  // weak prior (the default) the error is finite and positive
  fs.priors = true;
  const FitResult g = calibrate(base, s, fs);
  INFO("with the prior: estimate " << g.parameters[0].estimate << ", standard error " << g.parameters[0].standard_error);
  CHECK(g.converged);
  CHECK(g.parameters[0].estimate >= 1.0);
  CHECK(g.parameters[0].estimate < 1.2);
  CHECK(std::isfinite(g.parameters[0].standard_error));
  CHECK(g.parameters[0].standard_error > 0);
}

TEST_CASE("the fit's finite differences: central, one-sided where a step is refused, zero where both are") {
  // f(x) = 3x^2 + 1 at x = 2, h = 1e-3 (hand values, the difference quotients of any numerical-analysis
  // text, from memory): central (f(2+h) - f(2-h)) / 2h = 12 exactly for a quadratic; forward
  // (f(2+h) - f(2)) / h = 12 + 3h; backward (f(2) - f(2-h)) / h = 12 - 3h.
  const auto f = [](double x) { return 3 * x * x + 1; };
  const double h = 1e-3, at = f(2), up = f(2 + h), down = f(2 - h);
  CHECK(detail::finite_difference(&up, &down, at, h) == doctest::Approx(12).epsilon(1e-9));
  CHECK(detail::finite_difference(&up, nullptr, at, h) == doctest::Approx(12 + 3 * h).epsilon(1e-9));
  CHECK(detail::finite_difference(nullptr, &down, at, h) == doctest::Approx(12 - 3 * h).epsilon(1e-9));
  CHECK(detail::finite_difference(nullptr, nullptr, at, h) == 0);
}
