#pragma once
// Calibration to the plant's own oil-analysis history: weighted nonlinear least squares by
// Levenberg–Marquardt with a weak prior per parameter, bounded parameters fitted in log/logit space
// (a step can never leave a parameter's range), standard errors by the delta method; parameters the
// samples do not respond to are held at their prior and reported. The model is in docs/lab-results.md.
// The forecast is in forecast.hpp, Monte Carlo in monte_carlo.hpp.
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "acidload/core/condemning_limits.hpp"
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
  //! This row's precision where the lab file states it (one standard deviation, as the readings).
  std::optional<double> sd_tbn, sd_tan, sd_san, sd_oxidation, sd_nitration;
  //! The lab's FTIR reading of the fresh oil (its baseline), added to the model's oxidation and
  //! nitration, which start from 0 [A/cm].
  double oxidation_baseline = 0, nitration_baseline = 0;
  bool oxidation_baseline_given = false, nitration_baseline_given = false;  //!< the lab file stated it for this row
  //! Readings trended but not modelled (wear metals, silicon, viscosity, water …), by column name,
  //! in the unit of lab_trend_columns(); and columns the reader did not know, as written.
  std::map<std::string, double> trended;
  std::map<std::string, std::string> other;
  std::string date;                //!< as written (ISO 8601), for the reader's eye
};

//! Measurement precision (one standard deviation) per reading, the weights of the fit.
//! Defaults: of the order of the repeatability r of the methods' ASTM precision statements at used-oil
//! levels as σ = r/2.77 (D664: r = 0.117·X, seen; D2896, D4739 from memory); SAN and FTIR common
//! practice, no source (docs/references.md [LabPrecision]). Put your lab's own (lab file, CLI or Python).
struct Precision {
  double tbn_d2896 = 0.15;  //!< [mg KOH/g]
  double tbn_d4739 = 0.20;  //!< [mg KOH/g]
  double tan = 0.15;        //!< [mg KOH/g]
  double san = 0.10;        //!< [mg KOH/g]
  double oxidation = 1.0;   //!< [A/cm]
  double nitration = 1.0;   //!< [A/cm]
};

struct FitSettings {
  std::vector<std::string> parameters;  //!< keys from parameter_table(); empty: default_parameters()
  Precision precision;                  //!< for every lab not in lab_precision
  std::map<std::string, Precision> lab_precision;  //!< by the lab's name as the lab file writes it
  bool priors = true;                   //!< the weak prior per parameter (ParameterInfo::prior_sd)
  //! Fit an FTIR baseline per lab and reading (oxidation, nitration) where the lab file states none
  //! and the lab has no fresh-oil sample (oil hours ≤ fresh_sample_hours) but at least 3 readings.
  bool fit_ftir_baseline = true;
  double fresh_sample_hours = 24;
  int max_iterations = 200;
  double outlier_threshold = 3;  //!< |residual| / (σ·s) above this is flagged
};

struct FittedParameter {
  std::string key;
  double initial = 0, estimate = 0, standard_error = 0;  //!< in the parameter's core unit
  double fit_estimate = 0, fit_standard_error = 0;       //!< in fit space (log or logit)
  double prior = 0, prior_sd = 0;  //!< the prior: centre (fit space, the case's value) and σ (fit space)
  bool held = false;  //!< the samples do not respond to it: held at its prior, σ the prior's
};

struct SampleResidual {
  std::size_t sample = 0;  //!< index into the samples
  std::string reading;     //!< "tbn", "tan", "san", "oxidation", "nitration"
  double measured = 0, predicted = 0, sigma = 0;
  double standardized = 0;  //!< (measured − predicted)/σ; 0 for a censored reading that is met
  bool censored = false, outlier = false;
};

//! An FTIR baseline the fit estimated (docs/model.md §12): the weighted mean offset of a lab's
//! readings from the model, profiled out at every step.
struct FittedBaseline {
  std::string lab;           //!< as the lab file writes it ("" when it names none)
  std::string reading;       //!< "oxidation" or "nitration"
  double value = 0;          //!< [A/cm]
  double standard_error = 0; //!< [A/cm]: the readings' precisions (widened by max(1, χ²ᵣ)) and the fitted parameters' covariance
  int readings = 0;
};

struct FitResult {
  std::vector<FittedParameter> parameters;
  std::vector<FittedBaseline> baselines;  //!< FTIR baselines fitted (their labs' samples carry them)
  std::vector<std::vector<double>> correlation;        //!< of the estimates
  std::vector<std::vector<double>> covariance;         //!< in fit space (s² (JᵀJ)⁻¹)
  std::vector<SampleResidual> residuals;
  double sum_of_squares = 0;   //!< Σ standardized² at the optimum
  int observations = 0;        //!< residuals that count
  int degrees_of_freedom = 0;  //!< observations − parameters − fitted baselines
  double s2 = 0;               //!< reduced χ² = sum_of_squares / degrees_of_freedom (goodness of fit)
  int iterations = 0;
  bool converged = false;
  std::vector<std::string> flags;  //!< outliers, lab changes, held and confounded parameters, in plain words
  std::vector<std::string> notes;  //!< why these parameters (when chosen by default_parameters())
  std::vector<std::string> warnings;  //!< a poor fit (χ²), a weak-base offset fitted across methods …
  double chi2_p = 1;               //!< P(χ² ≥ the sum of squares) for the degrees of freedom: small = the model misfits
  std::vector<LabSample> samples;  //!< the samples fitted
  Precision precision;             //!< the default precision used
  std::map<std::string, Precision> lab_precision;
  EngineCase fitted;               //!< the case with the estimates put in
};

//! The parameters a fit takes when none are named, matched to what the lab reports, with the
//! reason for each in `why` (plain words): the liner uptake (the acid load) when the gas carries
//! sulfur and TBN or TAN is reported; oxidation rate with oxidation readings; organic-acid yield
//! with TAN and oxidation; nitration yield with nitration readings; the weak-base offset of the
//! lab's TBN method only when it differs from the limit's method (and then with a warning).
std::vector<std::string> default_parameters(const EngineCase& c, const std::vector<LabSample>& samples,
                                            std::vector<std::string>& why, std::vector<std::string>& warnings);

//! The precision of one reading of a sample: the row's own figure, else its lab's, else the default.
double reading_sigma(const LabSample& s, const std::string& reading, const Precision& fallback,
                     const std::map<std::string, Precision>& by_lab);

//! The FTIR baselines a fit estimates, as (lab, reading): those with no stated baseline, no fresh-oil
//! sample and at least 3 readings (FitSettings::fit_ftir_baseline).
std::vector<std::pair<std::string, std::string>> baseline_groups(const std::vector<LabSample>& samples, const FitSettings& s);
//! Profiles those baselines out of residuals (docs/model.md §12): b̂ = Σ(y − ŷ)/σ² / Σ1/σ² per group,
//! its predictions raised and residuals lowered by b̂; returns (b̂, Σ1/σ²) per group.
std::vector<std::pair<double, double>> profile_baselines(std::vector<SampleResidual>& r, const std::vector<LabSample>& samples,
                                                         const std::vector<std::pair<std::string, std::string>>& groups);

//! The upper tail P(X ≥ x) of a χ² distribution with k degrees of freedom.
double chi2_upper_tail(double x, int k);

//! Predicted readings of every sample for a case (the forward model at the sample times).
std::vector<SampleResidual> predict(const EngineCase& c, const std::vector<LabSample>& samples,
                                    const Precision& precision,
                                    const std::map<std::string, Precision>& lab_precision = {});

//! Fits the parameters (all listed, or default_parameters() when none). Refuses (FitRefusedError)
//! only fewer readings than parameters; a parameter the samples do not respond to (or a sulfur
//! parameter without sulfur in the gas) is held at its prior and flagged; a pair the samples cannot
//! tell apart is flagged (the prior keeps it defined).
FitResult calibrate(const EngineCase& c, const std::vector<LabSample>& samples, const FitSettings& s);

namespace detail {
//! One element of a Jacobian column by finite differences of step h around `at`: central where the
//! model accepted both steps, one-sided where it refused one (null), zero where it refused both
//! (the difference quotients of any numerical-analysis text).
inline double finite_difference(const double* up, const double* down, double at, double h) {
  if (up && down) return (*up - *down) / (2 * h);
  if (up) return (*up - at) / h;  // one-sided where the model refuses the step below (a fit on a range limit)
  if (down) return (at - *down) / h;
  return 0;
}
}  // namespace detail

}  // namespace acidload
