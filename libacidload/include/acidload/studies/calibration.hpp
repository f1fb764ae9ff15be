#pragma once
// Calibration to the plant's own oil-analysis history: weighted nonlinear least squares by
// Levenberg–Marquardt, bounded parameters fitted in log/logit space, standard errors by the delta
// method. The forecast is in forecast.hpp, Monte Carlo in monte_carlo.hpp.
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

}  // namespace acidload
