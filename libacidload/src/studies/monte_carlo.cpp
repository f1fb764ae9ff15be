#include "acidload/studies/monte_carlo.hpp"

#include <algorithm>
#include <cmath>
#include <exception>
#include <limits>
#include <thread>

#include "acidload/core/error.hpp"
#include "acidload/studies/calibration.hpp"
#include "acidload/studies/parameters.hpp"

#include <Eigen/Dense>

namespace acidload {

// ---- Monte Carlo ----------------------------------------------------------------------------

double uniform01(std::uint64_t seed, std::uint64_t draw, std::uint64_t dim) {
  // SplitMix64 finaliser (Steele, Lea & Flood 2014) of a counter built from (seed, draw, dimension)
  std::uint64_t z = seed * 0x9E3779B97F4A7C15ull + draw * 0xD1B54A32D192ED03ull + dim * 0x8CB92BA72F3D8DD7ull;
  for (int round = 0; round < 2; ++round) {
    z += 0x9E3779B97F4A7C15ull;
    z = (z ^ (z >> 30)) * 0xBF58476D1CE4E5B9ull;
    z = (z ^ (z >> 27)) * 0x94D049BB133111EBull;
    z ^= z >> 31;
  }
  return (static_cast<double>(z >> 11) + 0.5) * (1.0 / 9007199254740992.0);  // (0, 1), 53 bits
}

double sample(const Distribution& d, double u1, double u2) {
  constexpr double two_pi = 6.283185307179586;
  switch (d.kind) {
    case Distribution::Kind::normal: return d.a + d.b * std::sqrt(-2 * std::log(u1)) * std::cos(two_pi * u2);
    case Distribution::Kind::lognormal: return d.a * std::exp(d.b * std::sqrt(-2 * std::log(u1)) * std::cos(two_pi * u2));
    case Distribution::Kind::uniform: return d.a + (d.b - d.a) * u1;
    case Distribution::Kind::triangular: {
      const double lo = d.a, mode = d.b, hi = d.c, fc = (mode - lo) / (hi - lo);
      return u1 < fc ? lo + std::sqrt(u1 * (hi - lo) * (mode - lo)) : hi - std::sqrt((1 - u1) * (hi - lo) * (hi - mode));
    }
  }
  return 0;
}

double percentile(std::vector<double> v, double p) {
  if (v.empty()) throw InputError("percentile", "(no values)", "at least one value");
  check::in_range("percentile", p, 0.0, 100.0, "%");
  std::sort(v.begin(), v.end());
  const double h = (static_cast<double>(v.size()) - 1) * p / 100;
  const std::size_t lo = static_cast<std::size_t>(std::floor(h));
  const std::size_t hi = std::min(lo + 1, v.size() - 1);
  if (!std::isfinite(v[hi]) || !std::isfinite(v[lo])) return v[hi] == v[lo] ? v[lo] : std::numeric_limits<double>::infinity();
  return v[lo] + (h - static_cast<double>(lo)) * (v[hi] - v[lo]);
}

namespace {
// The first charge as it ran, continued under its last conditions up to the planned maximum: the drain
// interval of a record with oil changes is that of its first charge, not cut short by the change.
EngineCase first_charge_to_cap(const EngineCase& c) {
  EngineCase x = c;
  x.record.clear();
  double hours = 0;
  for (std::size_t i = 0; i < c.record.size(); ++i) {
    bool change = false;
    for (const OilEvent& e : c.record[i].events) change |= e.kind == OilEvent::Kind::oil_change;
    if (change && i > 0) break;
    x.record.push_back(c.record[i]);
    hours += c.record[i].hours;
  }
  if (hours < c.model.limits.max_hours) {
    Segment more = x.record.back();
    more.events.clear();
    more.starts = more.hours > 0 ? more.starts / more.hours * (c.model.limits.max_hours - hours) : 0;
    more.hours = c.model.limits.max_hours - hours;
    more.calendar_hours = -1;
    x.record.push_back(more);
  }
  return x;
}
}  // namespace

IntervalBand band_of(const std::vector<double>& v) {
  return {percentile(v, 5), percentile(v, 10), percentile(v, 50), percentile(v, 90), percentile(v, 95)};
}

namespace {
// Charge k of the record (with the charges before it), continued under its last segment to the cap.
std::vector<Segment> charge_to_cap(const EngineCase& c, int k) {
  std::vector<Segment> rec;
  int charge = 0;
  double hours = 0;
  for (std::size_t i = 0; i < c.record.size(); ++i) {
    bool change = false;
    for (const OilEvent& e : c.record[i].events) change |= e.kind == OilEvent::Kind::oil_change;
    if (change && i > 0) ++charge, hours = 0;
    if (charge > k) break;
    rec.push_back(c.record[i]);
    hours += c.record[i].hours;
  }
  Segment more = rec.back();
  more.events.clear();
  more.starts = more.hours > 0 ? more.starts / more.hours * c.model.limits.max_hours : 0;
  more.hours = c.model.limits.max_hours;  // past the cap whatever the charge ran already
  more.calendar_hours = -1;
  rec.push_back(more);
  return rec;
}
int charge_count(const EngineCase& c) {
  int n = 1;
  for (std::size_t i = 1; i < c.record.size(); ++i)
    for (const OilEvent& e : c.record[i].events) n += e.kind == OilEvent::Kind::oil_change;
  return n;
}
// A draw the model refuses, named by the input, its distribution and the value in the user's unit.
InputError refused_draw(const UncertainInput& in, int draw, double drawn, const InputError& e) {
  static const char* const kinds[] = {"normal", "lognormal", "uniform", "triangular"};
  const auto shown = [&](double v) {
    return format_value(in.shown_at_zero + v * in.shown_per_core) + (in.unit.empty() ? "" : " " + in.unit);
  };
  const Distribution& d = in.distribution;
  std::string dist = std::string(kinds[static_cast<int>(d.kind)]) + "(" + shown(d.a) + ", ";
  dist += d.kind == Distribution::Kind::lognormal ? format_value(d.b) : shown(d.b);
  if (d.kind == Distribution::Kind::triangular) dist += ", " + shown(d.c);
  dist += ")";
  return InputError("uncertainty input " + in.key + (in.where.empty() ? "" : " (" + in.where + ")"),
                    shown(drawn) + " in draw " + std::to_string(draw + 1),
                    "draws the model accepts (" + e.expected() + "): the " + dist +
                        " distribution reaches past it; narrow it or use a bounded one (uniform, triangular)");
}
}  // namespace

MonteCarloResult monte_carlo(const EngineCase& c0, const std::vector<UncertainInput>& inputs, int draws,
                             std::uint64_t seed, int threads) {
  return monte_carlo(c0, inputs, nullptr, false, draws, seed, threads);
}

MonteCarloResult monte_carlo(const EngineCase& c_in, const std::vector<UncertainInput>& inputs, const FitResult* fit,
                             bool every_charge, int draws, std::uint64_t seed, int threads) {
  const EngineCase& c0 = fit ? fit->fitted : c_in;
  check::in_range("draws", draws, 1, max_draws, "");
  for (const UncertainInput& in : inputs) {
    parameter(in.key);
    const Distribution& d = in.distribution;
    const bool ok = d.kind == Distribution::Kind::normal ? d.b >= 0
                    : d.kind == Distribution::Kind::lognormal ? d.a > 0 && d.b >= 0
                    : d.kind == Distribution::Kind::uniform ? d.a < d.b
                                                            : d.a <= d.b && d.b <= d.c && d.a < d.c;
    if (!ok) throw InputError("uncertain " + in.key, "(distribution)", "a distribution with consistent parameters");
  }
  const EngineCase c = first_charge_to_cap(c0);
  MonteCarloResult out;
  out.draws = draws;
  out.drain_interval.assign(static_cast<std::size_t>(draws), 0);
  out.first_san.assign(static_cast<std::size_t>(draws), 0);
  const int charges = every_charge ? charge_count(c0) : 0;
  out.charge_intervals.assign(static_cast<std::size_t>(charges), std::vector<double>(static_cast<std::size_t>(draws), 0));
  std::vector<char> clipped(static_cast<std::size_t>(draws), 0);
  // a fit's parameters: φ = φ̂ + L·z, L from the covariance's eigen-decomposition (its dimensions
  // come after the inputs' in the stream)
  const std::size_t p = fit ? fit->parameters.size() : 0;
  out.fitted_parameters = static_cast<int>(p);
  Eigen::MatrixXd L = Eigen::MatrixXd::Zero(static_cast<Eigen::Index>(p), static_cast<Eigen::Index>(p));
  if (p > 0) {
    Eigen::MatrixXd S(L.rows(), L.cols());
    for (std::size_t i = 0; i < p; ++i)
      for (std::size_t j = 0; j < p; ++j) S(static_cast<Eigen::Index>(i), static_cast<Eigen::Index>(j)) = fit->covariance[i][j];
    Eigen::SelfAdjointEigenSolver<Eigen::MatrixXd> es(S);
    L = es.eigenvectors() * es.eigenvalues().cwiseMax(0.0).cwiseSqrt().asDiagonal();
  }
  const auto draw_case = [&](EngineCase& x, int i) {
    if (p > 0) {
      Eigen::VectorXd z(static_cast<Eigen::Index>(p));
      for (std::size_t j = 0; j < p; ++j) {
        const std::size_t d = 2 * (inputs.size() + j);
        z[static_cast<Eigen::Index>(j)] = sample({Distribution::Kind::normal, 0, 1, 0}, uniform01(seed, static_cast<std::uint64_t>(i), d),
                                                 uniform01(seed, static_cast<std::uint64_t>(i), d + 1));
      }
      const Eigen::VectorXd dphi = L * z;
      for (std::size_t j = 0; j < p; ++j) {
        const ParameterInfo& info = parameter(fit->parameters[j].key);
        set_parameter(x, info.key, from_fit_space(info, fit->parameters[j].fit_estimate + dphi[static_cast<Eigen::Index>(j)]));
      }
    }
    for (std::size_t k = 0; k < inputs.size(); ++k) {
      const double u1 = uniform01(seed, static_cast<std::uint64_t>(i), 2 * k);
      const double u2 = uniform01(seed, static_cast<std::uint64_t>(i), 2 * k + 1);
      const ParameterInfo& info = parameter(inputs[k].key);
      const double v = sample(inputs[k].distribution, u1, u2);
      const double in = info.bound == Bound::interval ? std::clamp(v, info.low, info.high)
                        : info.bound == Bound::share    ? (v <= 0 ? 1e-6 : v >= 1 ? 1 - 1e-6 : v)
                        : info.bound == Bound::positive ? (v > 0 ? v : 1e-9)
                                                        : v;
      if (in != v) clipped[static_cast<std::size_t>(i)] = 1;  // outside the range: clipped into it, counted
      try {
        set_parameter(x, inputs[k].key, in);
      } catch (const InputError& e) {
        throw refused_draw(inputs[k], i, in, e);
      }
    }
  };
  const auto one = [&](int i) {
    EngineCase x = c;
    draw_case(x, i);
    for (int k = 0; k < charges; ++k) {
      EngineCase y = c0;
      draw_case(y, i);
      RunOptions o = y.options;
      o.output_interval = 0;
      o.keep_segment_ends = false;
      const RunResult r = simulate(y.charge, y.model, charge_to_cap(y, k), o);
      const ChargeSummary& ch = r.charges.back();
      out.charge_intervals[static_cast<std::size_t>(k)][static_cast<std::size_t>(i)] = ch.first ? ch.drain_interval : y.model.limits.max_hours;
    }
    RunOptions o = x.options;
    o.output_interval = 0;
    o.keep_segment_ends = false;  // no trajectory is needed, only the limits
    o.stop_when_interval_and_san_known = true;  // both figures reported are fixed from there on
    const RunResult r = simulate(x.charge, x.model, x.record, o);
    const ChargeSummary& ch = r.charges.front();
    out.drain_interval[static_cast<std::size_t>(i)] = ch.first ? ch.drain_interval : x.model.limits.max_hours;
    const double san = ch.reached_at[static_cast<std::size_t>(Limit::san)];
    out.first_san[static_cast<std::size_t>(i)] = san >= 0 ? san : std::numeric_limits<double>::infinity();
  };
  int n = threads > 0 ? threads : static_cast<int>(std::max(1u, std::thread::hardware_concurrency()));
  n = std::min(n, draws);
  std::vector<std::thread> pool;
  std::vector<std::exception_ptr> errors(static_cast<std::size_t>(n));
  for (int t = 0; t < n; ++t)
    pool.emplace_back([&, t] {
      try {
        for (int i = t; i < draws; i += n) one(i);  // each draw's numbers depend on its index only
      } catch (...) {
        errors[static_cast<std::size_t>(t)] = std::current_exception();
      }
    });
  for (auto& th : pool) th.join();
  for (auto& e : errors)
    if (e) std::rethrow_exception(e);
  out.interval_p10 = percentile(out.drain_interval, 10);
  out.interval_p50 = percentile(out.drain_interval, 50);
  out.interval_p90 = percentile(out.drain_interval, 90);
  out.san_p10 = percentile(out.first_san, 10);
  out.san_p50 = percentile(out.first_san, 50);
  out.san_p90 = percentile(out.first_san, 90);
  out.interval_p5 = percentile(out.drain_interval, 5);
  out.interval_p95 = percentile(out.drain_interval, 95);
  out.san_p5 = percentile(out.first_san, 5);
  out.san_p95 = percentile(out.first_san, 95);
  for (const auto& v : out.charge_intervals) out.charge_bands.push_back(band_of(v));
  for (char x : clipped) out.clipped += x;
  return out;
}

}  // namespace acidload
