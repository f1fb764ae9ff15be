#pragma once
// Calibration to the plant's own oil-analysis history (weighted nonlinear least squares by
// Levenberg–Marquardt, bounded parameters fitted in log/logit space, standard errors by the delta
// method), the forecast of the current charge with a band, and Monte Carlo over uncertain inputs.
#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "acidload/core/limits.hpp"
#include "acidload/core/oil.hpp"
#include "acidload/studies/parameters.hpp"
#include "acidload/studies/whatif.hpp"

namespace acidload {

//! One lab report of a used-oil sample. Absent readings are empty.
struct LabSample {
  int charge = 0;                  //!< which charge of the record (0 = the one it starts with)
  double oil_hours = 0;            //!< hours on that charge when sampled [h]
  std::optional<double> tbn;       //!< base number [mg KOH/g] …
  BaseNumberMethod tbn_method = BaseNumberMethod::d4739;  //!< … by this method
  std::optional<double> tan;       //!< acid number, D664 [mg KOH/g]
  std::optional<double> san;       //!< strong acid number [mg KOH/g]; with san_censored, the reporting limit
  bool san_censored = false;       //!< reported "<x" or "0": below the reporting limit `san`
  std::optional<double> oxidation; //!< FTIR oxidation [A/cm]
  std::optional<double> nitration; //!< FTIR nitration [A/cm]
  std::optional<double> initial_ph;  //!< i-pH (ASTM D7946), read but not modelled
  std::string lab;                 //!< the laboratory (a change is flagged)
  std::string where;               //!< where it came from, for messages ("lab.csv:12")
};

//! Measurement precision (one standard deviation) per reading, the weights of the fit.
//! Defaults from memory of typical repeatability of the methods (ASTM D4739, D2896, D664, FTIR);
//! put your lab's figures here.
struct Precision {
  double tbn_d2896 = 0.15;  //!< [mg KOH/g]
  double tbn_d4739 = 0.20;  //!< [mg KOH/g]
  double tan = 0.15;        //!< [mg KOH/g]
  double san = 0.10;        //!< [mg KOH/g]
  double oxidation = 1.0;   //!< [A/cm]
  double nitration = 1.0;   //!< [A/cm]
};

struct FitSettings {
  std::vector<std::string> parameters;  //!< keys from parameter_table()
  Precision precision;
  int max_iterations = 200;
  double outlier_threshold = 3;  //!< |residual| / (σ·s) above this is flagged
};

struct FittedParameter {
  std::string key;
  double initial = 0, estimate = 0, standard_error = 0;  //!< in the parameter's core unit
  double fit_estimate = 0, fit_standard_error = 0;       //!< in fit space (log or logit)
};

struct SampleResidual {
  std::size_t sample = 0;  //!< index into the samples
  std::string reading;     //!< "tbn", "tan", "san", "oxidation", "nitration"
  double measured = 0, predicted = 0, sigma = 0;
  double standardized = 0;  //!< (measured − predicted)/σ; 0 for a censored reading that is met
  bool censored = false, outlier = false;
};

struct FitResult {
  std::vector<FittedParameter> parameters;
  std::vector<std::vector<double>> correlation;        //!< of the estimates
  std::vector<std::vector<double>> covariance;         //!< in fit space (s² (JᵀJ)⁻¹)
  std::vector<SampleResidual> residuals;
  double sum_of_squares = 0;   //!< Σ standardized² at the optimum
  int observations = 0;        //!< residuals that count
  int degrees_of_freedom = 0;  //!< observations − parameters
  double s2 = 0;               //!< reduced χ² = sum_of_squares / degrees_of_freedom (goodness of fit)
  int iterations = 0;
  bool converged = false;
  std::vector<std::string> flags;  //!< outliers and lab changes, in plain words
  EngineCase fitted;               //!< the case with the estimates put in
};

//! Predicted readings of every sample for a case (the forward model at the sample times).
std::vector<SampleResidual> predict(const EngineCase& c, const std::vector<LabSample>& samples,
                                    const Precision& precision);

//! Fits the parameters. Refuses (FitRefusedError, with the reason) fewer observations than
//! parameters, a direction the data do not constrain, and sulfur parameters without sulfur in the gas.
FitResult calibrate(const EngineCase& c, const std::vector<LabSample>& samples, const FitSettings& s);

//! Remaining hours of the current (last) charge to each limit, running on under the record's last
//! segment, with a 90 % band from the parameter covariance (linearised, ±1.645 σ).
struct LimitForecast {
  Limit limit = Limit::tbn_fall;
  bool reached = false;          //!< reached within the hours cap
  bool already = false;          //!< reached before the end of the record (remaining is then 0)
  double remaining = 0;          //!< hours from the end of the record [h]
  double low = 0, high = 0;      //!< 90 % band [h]
};
std::vector<LimitForecast> forecast(const FitResult& fit);

//! An uncertain input for Monte Carlo.
struct Distribution {
  enum class Kind { normal, lognormal, uniform, triangular };
  Kind kind = Kind::normal;
  double a = 0, b = 0, c = 0;  //!< normal: mean, sd; lognormal: median, σ of ln; uniform: low, high; triangular: low, mode, high
};
struct UncertainInput {
  std::string key;  //!< from parameter_table()
  Distribution distribution;
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

struct MonteCarloResult {
  int draws = 0;
  std::vector<double> drain_interval;  //!< per draw [h]; the hours cap where no limit is reached
  std::vector<double> first_san;       //!< per draw, oil hours of the first free strong acid [h]; +∞ if none
  double interval_p10 = 0, interval_p50 = 0, interval_p90 = 0;  //!< [h]
  double san_p10 = 0, san_p50 = 0, san_p90 = 0;                 //!< [h], +∞ where more than that share has none
};
//! Monte Carlo over the inputs: each draw's values from the counter-based stream, so the result is
//! identical for any number of threads (0 = every core). The drain interval is that of the first
//! charge of the record, continued under its last conditions up to the hours cap.
MonteCarloResult monte_carlo(const EngineCase& c, const std::vector<UncertainInput>& inputs, int draws,
                             std::uint64_t seed, int threads = 0);

}  // namespace acidload
