#pragma once
// Monte Carlo over uncertain inputs, with the project's counter-based random stream and percentiles.
#include <cstdint>
#include <string>
#include <vector>
#include <utility>

#include "acidload/studies/whatif.hpp"

namespace acidload {

//! The most draws one Monte Carlo run takes: about 2 min of one core for a single-segment case,
//! about 3 h for a one-year hourly record (docs/case-format.md, "Limits on work").
inline constexpr int max_draws = 1000000;

//! An uncertain input for Monte Carlo.
struct Distribution {
  enum class Kind { normal, lognormal, uniform, triangular };
  Kind kind = Kind::normal;
  double a = 0, b = 0, c = 0;  //!< normal: mean, sd; lognormal: median, σ of ln; uniform: low, high; triangular: low, mode, high
};
struct UncertainInput {
  UncertainInput() = default;
  //! An input shown in core units, with no position (the case reader fills the rest).
  UncertainInput(std::string k, Distribution d) : key(std::move(k)), distribution(d) {}
  std::string key;  //!< from parameter_table()
  Distribution distribution;
  //! How a refused draw is shown to the user: in `unit`, as shown_at_zero + core value × shown_per_core
  //! (the case reader sets these from the unit the distribution was written in; default: core units).
  std::string unit;
  double shown_at_zero = 0, shown_per_core = 1;
  std::string where;  //!< where the input was written ("case.yaml:12:7"), for messages
};

//! The project's counter-based random stream: a uniform in (0, 1) for (seed, draw, dimension),
//! the same whatever the order or thread it is asked in (SplitMix64 finaliser of the counter).
double uniform01(std::uint64_t seed, std::uint64_t draw, std::uint64_t dimension);
//! A draw of the distribution from two uniforms of the stream (Box–Muller for the normal ones,
//! inverse CDF for the others).
double sample(const Distribution& d, double u1, double u2);
//! Percentile p ∈ [0, 100] of values, linear interpolation between order statistics
//! (the definition numpy's percentile uses by default).
double percentile(std::vector<double> values, double p);

//! Percentiles of a drain interval over the draws [h]. The low end is the pessimistic one (the
//! earlier oil change), the high end the optimistic one.
struct IntervalBand {
  double p5 = 0, p10 = 0, p50 = 0, p90 = 0, p95 = 0;
};
IntervalBand band_of(const std::vector<double>& values);

struct MonteCarloResult {
  int draws = 0;
  std::vector<double> drain_interval;  //!< per draw [h]; the planned maximum where no limit is reached
  std::vector<double> first_san;       //!< per draw, oil hours of the first free strong acid [h]; +∞ if none
  double interval_p10 = 0, interval_p50 = 0, interval_p90 = 0;  //!< [h]
  double san_p10 = 0, san_p50 = 0, san_p90 = 0;                 //!< [h], +∞ where more than that share has none
  double interval_p5 = 0, interval_p95 = 0, san_p5 = 0, san_p95 = 0;  //!< [h]
  //! Every charge of the record (when asked for), each continued under its own last conditions to the
  //! planned maximum: per charge, per draw [h], and its band.
  std::vector<std::vector<double>> charge_intervals;
  std::vector<IntervalBand> charge_bands;
  int clipped = 0;  //!< draws with an input drawn outside its parameter's range, clipped into it
  int fitted_parameters = 0;  //!< parameters drawn jointly from a fit's covariance
};
//! Monte Carlo over the inputs: each draw's values from the counter-based stream, so the result is
//! identical for any number of threads (0 = every core). The drain interval is that of the first
//! charge of the record, continued under its last conditions up to the planned maximum.
MonteCarloResult monte_carlo(const EngineCase& c, const std::vector<UncertainInput>& inputs, int draws,
                             std::uint64_t seed, int threads = 0);

struct FitResult;
//! Monte Carlo as above, and: with `fit`, its parameters drawn jointly (correlated) from its
//! covariance in fit space, always within their ranges, over its fitted case (the inputs on top);
//! with `every_charge`, every charge of the record continued to the planned maximum. A draw of an input
//! outside its parameter's range is clipped into it and counted, never an abort.
MonteCarloResult monte_carlo(const EngineCase& c, const std::vector<UncertainInput>& inputs, const FitResult* fit,
                             bool every_charge, int draws, std::uint64_t seed, int threads = 0);

}  // namespace acidload
