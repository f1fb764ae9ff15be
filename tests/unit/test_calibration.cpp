// Calibration, forecast and Monte Carlo.
#include <doctest/doctest.h>

#include <algorithm>
#include <cmath>

#include "../support/lab_history.hpp"
#include "acidload/core/error.hpp"
#include "acidload/studies/calibration.hpp"
#include "acidload/studies/forecast.hpp"
#include "acidload/studies/monte_carlo.hpp"

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
  const FitResult f = calibrate(history_case(), s, fs);
  CHECK(f.converged);
  CHECK(f.parameters[0].estimate == doctest::Approx(3.5e-4).epsilon(1e-6));
  CHECK(f.parameters[1].estimate == doctest::Approx(0.010).epsilon(1e-6));
  CHECK(f.parameters[2].estimate == doctest::Approx(0.10).epsilon(1e-6));
  CHECK(f.s2 < 1e-10);
  CHECK(f.observations == 90);
  CHECK(f.degrees_of_freedom == 87);
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

TEST_CASE("ill-posed fits are refused with their reasons") {
  const EngineCase c = history_case();
  Precision p;
  const auto samples = history_samples(truth(), 7, p);
  FitSettings fs;
  SUBCASE("fewer readings than parameters") {
    std::vector<LabSample> few(samples.begin(), samples.begin() + 1);
    few[0].oxidation.reset();
    fs.parameters = three;
    CHECK_THROWS_WITH_AS(calibrate(c, few, fs), doctest::Contains("more readings than parameters"), FitRefusedError);
  }
  SUBCASE("a rank-deficient pair: oxidation rate and acid yield without oxidation readings") {
    auto s = samples;
    for (auto& x : s) x.oxidation.reset();
    fs.parameters = {"model.oxidation-rate", "model.organic-acid-yield"};
    CHECK_THROWS_WITH_AS(calibrate(c, s, fs), doctest::Contains("cannot tell them apart"), FitRefusedError);
  }
  SUBCASE("a flat direction: nitration yield without nitration readings") {
    fs.parameters = {"model.nitration-yield"};
    CHECK_THROWS_WITH_AS(calibrate(c, samples, fs), doctest::Contains("do not depend on it"), FitRefusedError);
  }
  SUBCASE("no contaminant signal") {
    EngineCase clean = c;
    set_parameter(clean, "fuel.h2s", 1e-9);
    for (Segment& seg : clean.record) seg.fuel = with_h2s(seg.fuel, 0);
    fs.parameters = {"model.liner-uptake"};
    CHECK_THROWS_WITH_AS(calibrate(clean, samples, fs), doctest::Contains("no contaminant signal"), FitRefusedError);
  }
  SUBCASE("a starting value on the bound of a log-fitted parameter") {
    fs.parameters = {"model.weak-base-d4739"};  // its default is 0: log(0) is no start
    CHECK_THROWS_WITH_AS(calibrate(c, samples, fs), doctest::Contains("starting value inside"), InputError);
  }
  SUBCASE("a sample outside its charge") {
    auto s = samples;
    s[0].oil_hours = 5000;
    fs.parameters = {"model.liner-uptake"};
    CHECK_THROWS_AS(calibrate(c, s, fs), InputError);
  }
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
